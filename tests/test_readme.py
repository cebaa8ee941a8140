"""README.md and .ci/run stay in step (the developers' guide asks for both)."""

import re
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent


def _commands():
    text = (ROOT / "README.md").read_text(encoding="utf-8")
    return re.findall(r"```\n(.+?)\n```", text)


def test_readme_has_the_two_commands_first():
    cmds = _commands()
    assert "pip install" in cmds[0] and "uvcheck" in cmds[0]
    assert "pip install" in cmds[1] and "pytest" in cmds[1]


def test_ci_runs_the_readme_test_command():
    ci = (ROOT / ".ci" / "run").read_text(encoding="utf-8")
    assert _commands()[1] in ci.splitlines()
