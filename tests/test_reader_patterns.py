"""The reader's number patterns must not backtrack exponentially.

A pattern such as ``\\d+\\.?\\d*`` lets a regular-expression engine split a run of digits in
many ways; on a long line of numbers that fails to match at its end (a header or footer line
with a word after the numbers) the engine tries every combination. Found by the reader's
generated-file tests; these cases hung before the patterns were rewritten. Each case runs
under an alarm so a regression fails instead of hanging the suite.
"""

from __future__ import annotations

import signal

import pytest

from uvcheck.io import reader

SEPARATORS = {"space": " ", "comma": ",", "tab": "\t", "semicolon": ";"}


@pytest.fixture
def alarm():
    if not hasattr(signal, "SIGALRM"):
        pytest.skip("needs SIGALRM")

    def boom(*_):
        raise TimeoutError("pattern backtracked for more than 20 s")

    old = signal.signal(signal.SIGALRM, boom)
    signal.alarm(20)
    yield
    signal.alarm(0)
    signal.signal(signal.SIGALRM, old)


@pytest.mark.parametrize("delim", sorted(SEPARATORS))
@pytest.mark.parametrize("decimal", [".", ","])
def test_long_numeric_line_that_fails_at_the_end(alarm, delim, decimal):
    sep = SEPARATORS[delim]
    line = sep.join(["1111111111"] * 60) + sep + "x"
    assert reader._clean_row(delim, decimal).match(line) is None
    ok = sep.join(["12" + decimal + "5"] * 3) if sep != decimal else None
    if ok is not None:
        assert reader._clean_row(delim, decimal).match(ok)


@pytest.mark.parametrize("token", ["1111111111111111111111111111111111x",
                                   "1" * 40 + "e" + "1" * 40 + "e"])
def test_single_number_patterns(alarm, token):
    assert reader._NUM_DOT.match(token) is None
    assert reader._NUM_COMMA.match(token) is None


def test_whole_file_with_such_a_line_reads(alarm, tmp_path):
    p = tmp_path / "s.csv"
    rows = "\n".join(f"{250 + k},{0.1 * k:.3f}" for k in range(50))
    p.write_text("wavelength_nm,irradiance_W_m2_nm\n" + rows + "\n"
                 + ",".join(["1111111111"] * 60) + ",end\n", encoding="utf-8")
    s, rep = reader.read_spectrum(p)
    assert s.wavelength_nm.size == 50
