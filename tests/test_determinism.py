"""The same input gives byte-identical JSON (issue 7), whatever the file is called.

Generated spectra (lines and continua, absolute and relative, several dialects) are written to
files whose names carry spaces and non-ASCII letters, and ``uvcheck assess FILE --json OUT`` is
run twice: the two outputs must be the same bytes. A second test runs the command in fresh
interpreters with different hash seeds, so nothing may depend on set or dict-hash order,
on time, or on the process.
"""

from __future__ import annotations

import os
import subprocess
import sys

import numpy as np
from conftest import gaussian
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from typer.testing import CliRunner

from uvcheck.cli import app

runner = CliRunner()
NAME_CHARS = st.sampled_from(list("abcxyz019 _-.") + ["ü", "é", "µ", "Ω", "中", "ß", "ø", " "])
file_names = st.text(NAME_CHARS, min_size=1, max_size=16).map(str.strip).filter(
    lambda s: s and not s.startswith(("-", ".")))


@st.composite
def spectrum_text(draw) -> str:
    lo = draw(st.sampled_from([200.0, 240.0, 250.0, 300.0, 380.0]))
    hi = draw(st.sampled_from([400.0, 780.0, 800.0, 1100.0]))
    step = draw(st.sampled_from([0.5, 1.0, 2.0]))
    wl = np.arange(lo, hi + step / 2, step)
    v = np.zeros_like(wl)
    for _ in range(draw(st.integers(1, 4))):
        c = draw(st.floats(lo, hi))
        v += gaussian(wl, c, draw(st.sampled_from([0.5, 2.0, 10.0, 40.0])),
                      draw(st.floats(1e-6, 1.0)))
    noise = draw(st.sampled_from([0.0, 1e-7, 1e-5]))
    v += noise * np.random.default_rng(draw(st.integers(0, 2**16))).standard_normal(wl.size)
    unit = draw(st.sampled_from(["W/m2/nm", "uW/cm2/nm", "counts", None]))
    sep = draw(st.sampled_from([",", ";", "\t"]))
    head = f"Wavelength (nm){sep}Irradiance ({unit})\n" if unit else ""
    return head + "\n".join(f"{a:.2f}{sep}{b:.7e}" for a, b in zip(wl, v)) + "\n"


@settings(max_examples=25, deadline=None,
          suppress_health_check=[HealthCheck.function_scoped_fixture, HealthCheck.too_slow])
@given(spectrum_text(), file_names)
def test_same_input_same_bytes(tmp_path, text, name):
    folder = tmp_path / "mesures de la lampe ü"
    folder.mkdir(exist_ok=True)
    src = folder / f"{name} spectre.csv"
    src.write_text(text, encoding="utf-8")
    outs = []
    for k in range(2):
        out = folder / f"résultat {k}.json"
        if out.exists():
            out.unlink()
        r = runner.invoke(app, ["assess", str(src), "--json", str(out), "--quiet"])
        assert r.exit_code == 0, r.stderr
        outs.append(out.read_bytes())
    assert outs[0] == outs[1]
    # the non-ASCII path itself is carried through unchanged
    assert str(src).encode("utf-8") in outs[0]
    # and --json - prints exactly the same bytes
    r = runner.invoke(app, ["assess", str(src), "--json", "-"])
    assert r.stdout_bytes == outs[0]


def test_same_bytes_across_processes_and_hash_seeds(tmp_path):
    wl = np.arange(240.0, 800.0, 0.5)
    v = gaussian(wl, 253.7, 0.6, 0.8) + gaussian(wl, 546.1, 0.6, 0.2) + gaussian(wl, 450, 20, 0.1)
    src = tmp_path / "Küchen Lampe Nr. 2 (µ-Test).csv"
    src.write_text("Wavelength (nm),Irradiance (uW/cm2/nm)\n"
                   + "\n".join(f"{a:.1f},{b * 100:.8e}" for a, b in zip(wl, v)), encoding="utf-8")
    outs = []
    for seed in ("0", "1", "12345"):
        out = tmp_path / f"ergebnis {seed}.json"
        env = {**os.environ, "PYTHONHASHSEED": seed}
        r = subprocess.run([sys.executable, "-m", "uvcheck", "assess", str(src), "--json", str(out),
                            "--quiet"], capture_output=True, env=env)
        assert r.returncode == 0, r.stderr.decode()
        outs.append(out.read_bytes())
    assert outs[0] == outs[1] == outs[2]
