"""Cells below a detection limit ("<LOD", "n.d.", "<0.002") and empty value cells ("302.0,").

Laboratory and instrument exports write a mark instead of a number where a value lies under the
detection or quantitation limit, and some leave the value cell empty where nothing was
resolved. Before this rule such rows were no data rows: a run of them at the start made the
reader take a data row for the header (the unit was lost and the spectrum read as relative), and
a run at the end was cut off as a "footer" with one "truncated row" warning (found by trying
such files). Such a value is not known, only that it lies under a limit, so it is read as
missing: the wavelength counts as not measured, never as zero emission (DESIGN.md, "missing
range is never read as zero emission"). The abbreviations are the ones laboratories use
(common practice). The spectra here are invented for the tests.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from uvcheck.io import reader
from uvcheck.io.reader import read_spectrum

WL = np.arange(240.0, 320.0, 1.0)
E = 1e-3 * np.exp(-0.5 * ((WL - 275.0) / 5.0) ** 2)  # W/m²/nm, an invented 275 nm LED
RESOLVED = E >= 1e-7  # 254–296 nm; the tails are "below the limit"


def _write(path: Path, mark: str, sep: str = ",", header: str = "Irradiance [uW/cm2/nm]") -> Path:
    lines = ["# invented test data", f"Wavelength [nm]{sep}{header}"]
    for w, e, ok in zip(WL, E, RESOLVED):
        lines.append(f"{w:.1f}{sep}{e * 100:.6e}" if ok else f"{w:.1f}{sep}{mark}")
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")
    return path


@pytest.mark.parametrize("mark", ["<LOD", "< LOD", "<DL", "BDL", "n.d.", "ND", "<0.0001",
                                  "<1e-5", "below LOD", "<LOQ"])
def test_below_limit_cells_are_missing_values_and_the_header_stays(tmp_path, mark):
    spec, rep = read_spectrum(_write(tmp_path / "lod.csv", mark))
    # the header is still the header: the unit is kept (µW/cm²/nm -> W/m²/nm is × 0.01)
    assert spec.quantity == "irradiance"
    assert rep.header_line == 2
    np.testing.assert_allclose(spec.wavelength_nm, WL[RESOLVED])
    np.testing.assert_allclose(spec.values, E[RESOLVED], rtol=1e-5)
    text = " ".join(rep.warnings)
    assert f"{int((~RESOLVED).sum())} cell(s) are marked below a detection limit" in text
    assert "not as zero emission" in text
    assert not any("truncated or damaged" in w for w in rep.warnings)


def test_below_limit_cells_inside_the_range_leave_a_gap_not_a_zero(tmp_path):
    e = E.copy()
    lines = ["# invented test data", "Wavelength [nm];Irradiance [W/m2/nm]"]
    for w, x in zip(WL, e):
        lines.append(f"{w:.1f};{'<LOD' if 280 <= w <= 284 else f'{x:.6e}'}")
    p = tmp_path / "gap.csv"
    p.write_text("\n".join(lines) + "\n", encoding="utf-8")
    spec, rep = read_spectrum(p)
    assert not np.any((spec.wavelength_nm >= 280) & (spec.wavelength_nm <= 284))
    assert (279.0, 285.0) in [tuple(g) for g in rep.gaps_nm]


def test_empty_value_cells_after_the_delimiter_are_missing_values(tmp_path):
    lines = ["# invented test data", "Wavelength [nm],Irradiance [uW/cm2/nm]"]
    for w, x, ok in zip(WL, E, RESOLVED):
        lines.append(f"{w:.1f},{x * 100:.6e}" if ok else f"{w:.1f},")
    p = tmp_path / "blank.csv"
    p.write_text("\n".join(lines) + "\n", encoding="utf-8")
    spec, rep = read_spectrum(p)
    assert spec.quantity == "irradiance" and rep.header_line == 2
    np.testing.assert_allclose(spec.wavelength_nm, WL[RESOLVED])
    assert rep.rows_read == WL.size and rep.rows_used == int(RESOLVED.sum())
    assert not any("truncated or damaged" in w for w in rep.warnings)
    assert not any("different number of fields" in w for w in rep.warnings)
    assert any(f"{int((~RESOLVED).sum())} row(s) with NaN" in w for w in rep.warnings)


def test_a_lone_number_without_the_delimiter_is_still_no_data_row(tmp_path):
    # "302" on its own line (a row count, a page number) holds no delimiter: not a row
    lines = ["Wavelength [nm],Irradiance [W/m2/nm]"] + [f"{w:.1f},{x:.6e}" for w, x in zip(WL, E)]
    lines += ["", "Total", "302"]
    p = tmp_path / "footer.csv"
    p.write_text("\n".join(lines) + "\n", encoding="utf-8")
    spec, rep = read_spectrum(p)
    assert spec.wavelength_nm.size == WL.size


def test_the_mark_needs_its_limit():
    num = reader._Num(".")
    for t in ["<LOD", "<0.5", "n.d.", "BDL"]:
        assert np.isnan(num(t))
    for t in ["<", "LOD5", "<abc", "lo", "< 0.5 nm"]:
        assert num(t) is None
    assert num.below_limit == 4 and num.below_example == "<LOD"
