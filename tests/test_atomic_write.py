"""Nothing lost (issue 7): an output file is replaced only with --force, and only whole.

The kill tests run a child process that writes through
:func:`uvcheck.report.jsonout.write_text_atomic` and SIGKILL it while its temporary ``.part``
file exists: the target must still hold its old content, byte for byte.
"""

from __future__ import annotations

import json
import os
import signal
import subprocess
import sys
import textwrap
import time
from pathlib import Path

import numpy as np
import pytest
from conftest import gaussian
from typer.testing import CliRunner

from uvcheck.cli import app
from uvcheck.errors import OutputExistsError, UvcheckError
from uvcheck.report import jsonout
from uvcheck.report.jsonout import write_text_atomic

OLD = '{"old": "result, to be kept"}\n'
posix_only = pytest.mark.skipif(not hasattr(signal, "SIGKILL"), reason="needs SIGKILL")


def _wait_for_part(folder: Path, proc: subprocess.Popen, timeout_s: float = 60.0) -> Path | None:
    """The first .part file in folder, or None if the child ended before one appeared."""
    t_end = time.monotonic() + timeout_s
    while time.monotonic() < t_end:
        parts = list(folder.glob(".*.part"))
        if parts:
            return parts[0]
        if proc.poll() is not None:
            return None
        time.sleep(0.0005)
    raise AssertionError("the child never started writing")


def _child(code: str) -> subprocess.Popen:
    return subprocess.Popen([sys.executable, "-c", textwrap.dedent(code)],
                            stdout=subprocess.PIPE, stderr=subprocess.PIPE)


@posix_only
def test_kill_while_blocked_in_the_write_keeps_the_old_file(tmp_path):
    # Deterministic: the child's fsync blocks (a stalled disk or network share), so the kill
    # lands for certain between "temporary file written" and "renamed over the target".
    target = tmp_path / "result one.json"
    target.write_text(OLD, encoding="utf-8")
    proc = _child(f"""
        import os, time
        from uvcheck.report import jsonout
        def stalled_fsync(fd):
            time.sleep(600)
        jsonout.os.fsync = stalled_fsync
        jsonout.write_text_atomic({str(target)!r}, '{{"new": ' + '1, ' * 100000 + '1}}', force=True)
    """)
    try:
        part = _wait_for_part(tmp_path, proc)
        assert part is not None, proc.communicate()[1].decode()
        time.sleep(0.2)  # let it reach the stalled fsync
        proc.send_signal(signal.SIGKILL)
        proc.wait(timeout=30)
    finally:
        if proc.poll() is None:
            proc.kill()
    assert proc.returncode == -signal.SIGKILL
    assert target.read_text(encoding="utf-8") == OLD
    # what the kill leaves is a hidden .part beside it, never a partial target
    assert [p.name for p in tmp_path.iterdir() if p != target] == [part.name]
    assert part.name.startswith(".result one.json.") and part.name.endswith(".part")


@posix_only
def test_kill_during_a_large_write_keeps_the_old_file(tmp_path):
    # Realistic: a large JSON written by an unmodified writer, killed as soon as its temporary
    # file appears. The payload doubles until a kill lands mid-write; whatever the timing,
    # the target is the old file or the complete new one, never a mix.
    target = tmp_path / "résultat.json"
    landed = False
    size = 20_000_000
    for _ in range(5):
        target.write_text(OLD, encoding="utf-8")
        for p in tmp_path.glob(".*.part"):
            p.unlink()
        proc = _child(f"""
            import json
            from uvcheck.report.jsonout import write_text_atomic
            payload = json.dumps({{"values": [0.125] * {size // 7}}})
            write_text_atomic({str(target)!r}, payload, force=True)
        """)
        try:
            part = _wait_for_part(tmp_path, proc)
            if part is not None:
                proc.send_signal(signal.SIGKILL)
            proc.wait(timeout=120)
        finally:
            if proc.poll() is None:
                proc.kill()
        text = target.read_text(encoding="utf-8")
        if proc.returncode == -signal.SIGKILL and text == OLD:
            landed = True
            break
        assert text == OLD or json.loads(text)["values"][-1] == 0.125, "a partial file"
        size *= 2
    assert landed, "no kill landed while the temporary file was being written"
    assert target.read_text(encoding="utf-8") == OLD


def test_failed_rename_leaves_old_file_and_no_temporary(tmp_path, monkeypatch):
    target = tmp_path / "r.json"
    target.write_text(OLD, encoding="utf-8")

    def broken_replace(src, dst):
        raise OSError("disk full (simulated)")

    monkeypatch.setattr(jsonout.os, "replace", broken_replace)
    with pytest.raises(OSError, match="simulated"):
        write_text_atomic(target, "{}", force=True)
    assert target.read_text(encoding="utf-8") == OLD
    assert not list(tmp_path.glob(".*.part"))


def test_no_overwrite_without_force(tmp_path):
    target = tmp_path / "r.json"
    target.write_text(OLD, encoding="utf-8")
    with pytest.raises(OutputExistsError, match="exists.*--force"):
        write_text_atomic(target, "{}")
    assert target.read_text(encoding="utf-8") == OLD
    write_text_atomic(target, "{}", force=True)
    assert target.read_text(encoding="utf-8") == "{}"


def test_folder_as_target_is_named_as_a_folder(tmp_path):
    with pytest.raises(UvcheckError, match="the output path is a folder"):
        write_text_atomic(tmp_path, "{}", force=True)
    with pytest.raises(UvcheckError, match="the output path is a folder"):
        write_text_atomic(tmp_path, "{}")


def test_cli_needs_force_to_overwrite(tmp_path):
    wl = np.arange(250.0, 800.0, 1.0)
    spec = tmp_path / "lampe ü.csv"
    spec.write_text("Wavelength (nm),Irradiance (W/m2/nm)\n"
                    + "\n".join(f"{a},{b:.6e}" for a, b in zip(wl, gaussian(wl, 395, 6, 0.01))),
                    encoding="utf-8")
    out = tmp_path / "out put.json"
    out.write_text(OLD, encoding="utf-8")
    runner = CliRunner()
    r = runner.invoke(app, ["assess", str(spec), "--json", str(out), "--quiet"])
    assert r.exit_code == 2 and "exists" in r.stderr and "--force" in r.stderr
    assert len(r.stderr.splitlines()) == 1
    assert out.read_text(encoding="utf-8") == OLD
    r = runner.invoke(app, ["assess", str(spec), "--json", str(out), "--quiet", "--force"])
    assert r.exit_code == 0, r.stderr
    assert json.loads(out.read_text(encoding="utf-8"))["schema"] == "uvcheck.assessment/1"
    assert not list(tmp_path.glob(".*.part"))


def test_bad_input_with_force_keeps_the_old_file(tmp_path):
    # --force allows replacing a file with a *result*; a failed run replaces nothing
    bad = tmp_path / "bad.csv"
    bad.write_text("Wavelength (nm),Irradiance (W/m2/nm)\n", encoding="utf-8")
    out = tmp_path / "r.json"
    out.write_text(OLD, encoding="utf-8")
    r = CliRunner().invoke(app, ["assess", str(bad), "--json", str(out), "--force"])
    assert r.exit_code == 2
    assert out.read_text(encoding="utf-8") == OLD


def test_new_output_has_ordinary_permissions(tmp_path):
    # written through a temporary file, the result still gets the mode any new file gets
    mask = os.umask(0)
    os.umask(mask)
    p = write_text_atomic(tmp_path / "p.json", "{}")
    assert (p.stat().st_mode & 0o777) == 0o666 & ~mask
