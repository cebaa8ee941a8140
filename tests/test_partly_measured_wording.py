"""A band the data cover only in part is never reported as "checked and below detection".

Invented spectra (not real products): a 278 nm LED measured from 220 nm (far-UVC 200–235 nm
is measured in part and nothing is above the detection limit there) and a 365 nm UV-A LED
measured from 250 nm (nothing above the noise in the measured 250–280 nm; 200–250 nm not
measured). Our own rule (the project's "missing range is never read as zero"): what holds in
the measured part is worded "so far" / "partly measured", as the band table words it, in the
terminal, in the note and in the batch summary, and an upper bound used as the favourable
254-nm equivalent is never printed as a value.
"""

from __future__ import annotations

import numpy as np
import pytest

from uvcheck.assessment import assess
from uvcheck.conditions import Conditions
from uvcheck.io.reader import read_spectrum


def _led(tmp, peak_nm: float, start_nm: float, peak: float, seed: int) -> dict:
    """The assessment (as JSON) of an invented LED spectrum, read from a file as the command
    line reads it (the reader sets the noise floor that the detection limits come from)."""
    rng = np.random.default_rng(seed)
    wl = np.arange(start_nm, 800.5, 0.5)
    v = peak * np.exp(-0.5 * ((wl - peak_nm) / 5.0) ** 2) + rng.normal(0, 2e-7, wl.size)
    p = tmp / f"led{peak_nm:g}_{start_nm:g}.csv"
    p.write_text("# invented spectrum, not a real product\nwavelength_nm,irradiance_W_m2_nm\n"
                 + "".join(f"{a:.1f},{b:.4e}\n" for a, b in zip(wl, v)), encoding="utf-8")
    spec, report = read_spectrum(p)
    return assess(spec, Conditions(measurement_distance_m=0.05), report).to_dict()


@pytest.fixture(scope="module")
def led278(tmp_path_factory):
    return _led(tmp_path_factory.mktemp("led"), 278.0, 220.0, 1e-3, 3)


@pytest.fixture(scope="module")
def uva365(tmp_path_factory):
    return _led(tmp_path_factory.mktemp("led"), 365.0, 250.0, 1e-2, 4)


def test_far_uvc_below_detection_in_its_measured_part_reads_so_far(led278):
    from uvcheck.report.note import _reading_text
    from uvcheck.report.terminal import _trade

    far = led278["germicidal"]["far_uvc"]
    assert far["status"] == "below-detection" and 0 < far["coverage"] < 1
    t = _trade(far)
    assert "so far" in t and "partly measured" in t and "below detection limit" not in t
    n = _reading_text(far)
    assert "so far" in n and "partly measured" in n and "(below detection)" not in n
    # the band table of the same result says the same: partial, below the limit so far
    band = led278["bands"]["far-UVC"]
    assert band["status"] == "partial" and band["below_detection"]


def test_a_fully_measured_band_keeps_its_wording(tmp_path, led278):
    from uvcheck.report.note import _reading_text
    from uvcheck.report.terminal import _trade

    # the same reading had the data covered its whole band: plainly below the limit
    whole = {**led278["germicidal"]["far_uvc"], "coverage": 1.0}
    assert "below detection limit" in _trade(whole) and "so far" not in _trade(whole)
    assert _reading_text(whole).endswith("(below detection)")
    # a 450 nm LED measured from 200 nm: its UV-C noise is read as stray light, bounded over
    # the whole band
    d = _led(tmp_path, 450.0, 200.0, 1e-2, 5)
    uvc = d["germicidal"]["uvc"]
    assert uvc["status"] == "likely-stray-light" and uvc["coverage"] == pytest.approx(1.0)
    assert "so far" not in _trade(uvc) and "partly measured" not in _reading_text(uvc)
    assert d["germicidal"]["status"] == "no-uvc"


def test_stray_light_uvc_on_a_partly_measured_band(uva365):
    from uvcheck.report.note import _reading_text
    from uvcheck.report.terminal import _trade

    uvc = uva365["germicidal"]["uvc"]
    assert uvc["status"] == "likely-stray-light" and 0 < uvc["coverage"] < 1
    assert uva365["germicidal"]["status"] == "not-assessed"   # UV-C not ruled out
    assert "so far" in _trade(uvc) and "partly measured" in _trade(uvc)
    assert "for the measured part only" in _reading_text(uvc)


def test_batch_row_says_partial_for_a_partly_measured_uvc(uva365, led278):
    from uvcheck.batch import _fill

    row: dict = {}
    _fill(row, uva365)
    assert row["uvc_status"] == "partial-likely-stray-light" and row["uvc_W_m2"] is None
    row = {}
    _fill(row, led278)
    assert row["uvc_status"] == "partial" and row["uvc_W_m2"] > 0


def test_favourable_equivalent_that_is_an_upper_bound_is_not_shown_as_a_value(uva365, led278):
    from uvcheck.report.terminal import _equivalent_span

    eq = uva365["germicidal"]["effective"]["equivalent_254"]
    assert eq["most_favourable_reads"] == "likely-stray-light"
    text = _equivalent_span(eq)
    assert text.startswith("≤ ") and "upper bound" in text and "measured part only" in text
    eq = led278["germicidal"]["effective"]["equivalent_254"]
    text = _equivalent_span(eq)
    # the unweighted UV-C band starts at 200 nm, below the data: its equivalent is a lower bound
    assert eq["most_favourable_reads"] == "partial" and "≥ " in text and "lower bound" in text


def test_complete_equivalents_print_as_plain_values():
    from uvcheck.report.terminal import _equivalent_span

    eq = {"least_favourable": 0.42, "most_favourable": 0.421,
          "least_favourable_reads": "complete", "most_favourable_reads": "complete",
          "least_favourable_coverage": 1.0, "most_favourable_coverage": 1.0}
    assert _equivalent_span(eq) == "0.420–0.421 W m-2"
    # a result written before these fields existed reads as before
    assert _equivalent_span({"least_favourable": 0.42, "most_favourable": 0.421}) == \
        "0.420–0.421 W m-2"


def test_note_marks_each_equivalent_as_its_reading_is(led278, uva365):
    from uvcheck.report.note import germicidal_block

    for res in (led278, uva365):
        by_id = res["germicidal"]["effective"]["by_action_spectrum"]
        rows = germicidal_block(res)["spectra"]
        assert {r["id"] for r in rows} == set(by_id)
        for r in rows:
            st = by_id[r["id"]]["status"]
            want = {"partial": "≥ ", "below-detection": "≤ ", "likely-stray-light": "≤ "}.get(st)
            if want:
                assert r["equivalent"].startswith(want), (r, st)
            else:
                assert r["equivalent"][0].isdigit(), (r, st)
    assert any(v["status"] == "partial"
               for v in led278["germicidal"]["effective"]["by_action_spectrum"].values())


def test_hazard_figure_marks_a_partly_measured_bound_so_far(led278):
    from uvcheck.report.figures import hazard_points

    pts = {p["id"]: p for p in hazard_points(led278)}
    hz = led278["hazards"]
    partial_below = [h for h, d in hz.items() if d["status"] == "partial" and d["detection_limit"]
                     and (d["value"] is None or d["value"] < d["detection_limit"])]
    assert partial_below, {h: d["status"] for h, d in hz.items()}
    for h in partial_below:
        assert pts[h]["kind"] == "upper" and pts[h]["so_far"]
    for h, d in hz.items():
        if d["status"] in ("complete", "below-detection"):
            assert not pts[h].get("so_far")


def test_equivalents_and_batch_status_of_a_radiance_spectrum(tmp_path):
    # an invented 222 nm band given as a radiance (W m-2 sr-1 nm-1): the equivalents are
    # radiances, and a batch row (whose uvc_W_m2 column is an irradiance) says why it is empty
    from uvcheck.batch import _fill
    from uvcheck.report.terminal import render_germicidal

    wl = np.arange(200.0, 800.5, 0.5)
    v = 1e-3 * np.exp(-0.5 * ((wl - 222.0) / 2.0) ** 2) + 1e-8
    p = tmp_path / "rad.csv"
    p.write_text("# invented radiance spectrum\nwavelength (nm),radiance (W/(m2 sr nm))\n"
                 + "".join(f"{a:.1f},{b:.6e}\n" for a, b in zip(wl, v)), encoding="utf-8")
    spec, report = read_spectrum(p)
    d = assess(spec, Conditions(measurement_distance_m=0.5), report).to_dict()
    g = d["germicidal"]
    assert g["unit"] == "W m-2 sr-1"
    line = next(x for x in render_germicidal(g, d) if "254-nm-equivalent:" in x)
    assert "W m-2 sr-1" in line
    row: dict = {}
    _fill(row, d)
    assert row["uvc_W_m2"] is None and row["uvc_status"] == "not-irradiance (W m-2 sr-1)"
