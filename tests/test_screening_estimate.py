"""A listing screened without a spectrum is an estimate: worded as one, and without the
measurement-uncertainty evaluation (whose inputs describe an instrument, not a model)."""

from __future__ import annotations

import json
from pathlib import Path

import pytest
from typer.testing import CliRunner

from uvcheck.cli import app

LISTINGS = Path(__file__).resolve().parent.parent / "examples" / "listings"


def _screen_json(name: str) -> dict:
    r = CliRunner().invoke(app, ["screen", str(LISTINGS / name), "--json", "-", "--quiet"])
    assert r.exit_code in (0, 1), r.output
    return json.loads(r.stdout[r.stdout.index("{"):])


def test_screening_runs_no_monte_carlo_and_says_why():
    d = _screen_json("uvc_box_48_leds_8w.toml")
    assert d.get("uncertainty") is None  # absent: not evaluated
    assert any("does not apply to a model" in w for w in d["warnings"])


def test_estimate_is_not_called_measured_in_germicidal_wording():
    d = _screen_json("uvc_box_48_leds_8w.toml")
    g = d["germicidal"]
    assert g["ozone"]["basis"] != "measured"
    assert "measured" not in g["ozone"]["note"]
    assert "measured output" not in (g.get("statement") or "")


def test_rows_per_case_use_the_chosen_limit_set():
    # the most likely case's row must agree with the main result under any limit set
    from uvcheck.io.listing import read_listing
    from uvcheck.screening import screen_listing_file

    for lset in ("iec62471_2006", "acgih_2022_far_uvc"):
        d = screen_listing_file(read_listing(LISTINGS / "faruv_222nm_ceiling_unit.toml"),
                                limit_set=lset).to_dict()
        likely = next(r for r in d["nominal"]["readings"] if r["likely"])
        assert likely["risk_group"] == d["risk_group"]["group"], lset
        assert likely["t_max_s"]["actinic_uv"] == d["hazards"]["actinic_uv"]["t_max_s"], lset


def test_a_modelled_line_source_reports_its_lines_and_no_spectrometer_artefacts():
    """A nominal low-pressure mercury model (lines beside a sampled continuum) lists its
    mercury lines, 253.7 nm first among them, and says the line is modelled (it printed
    "Mercury 253.7 nm line: not found" under "Peak 253.7 nm" before). The second-order
    check is for grating spectrometers: a model gets no such warning. Mercury line positions
    (253.7, 365.0, 404.7, 435.8, 546.1 nm) are those of the NIST Atomic Spectra Database,
    from memory."""
    from uvcheck.report.terminal import render_assessment as render

    d = _screen_json("mercury_tube_sold_pet_safe.toml")
    sp = d["spectral"]
    names = {ln["identified_as"] for ln in sp["lines"]}
    assert {"Hg 253.7 nm", "Hg 365.0 nm", "Hg 404.7 nm", "Hg 435.8 nm", "Hg 546.1 nm"} <= names
    assert sp["hg_253_7_present"] is True and sp["peak_nm"] == 253.7
    assert not any("second diffraction order" in w for w in d["warnings"])
    text = render(d)
    assert "Mercury 253.7 nm line: modelled" in text and "Emission lines modelled: 253.7" in text
    assert "Emission peaks found" not in text


def test_a_listing_alone_note_never_calls_the_lamp_measured():
    """A note of a listing alone (an ESTIMATE) had 'screening assessment of the measured
    sample', 'Measurement distance 20 cm', 'no measurable emission', 'of the measured
    180–3000 nm output' and 'Where: measurement position (20 cm)'; only the estimate banner may use the word, to say nothing was
    measured."""
    import re

    from uvcheck.io.listing import read_listing
    from uvcheck.report.note import build_note
    from uvcheck.screening import screen_listing_file

    lst = read_listing(LISTINGS / "uvc_box_48_leds_8w.toml")
    d = json.loads(json.dumps(screen_listing_file(lst).to_dict(), default=str))
    view = build_note(d, lst.to_dict() if hasattr(lst, "to_dict") else None)
    text = json.dumps({k: v for k, v in view.items() if k != "finding"}, ensure_ascii=False)
    hits = [m.group(0) for m in re.finditer(r".{40}\bmeasur(?:ed|able|ement position|ement distance)\b.{20}", text)
            if "organism was measured" not in m.group(0) and "nothing was measured" not in m.group(0)]
    assert not hits, hits
    assert "screening estimate from the seller's stated data" in view["does_not_cover"]


def _screen_text(tmp_path, wavelength: str) -> dict:
    # an invented listing: a 72-LED "UV-C" bulb with a stated wavelength and an ozone claim
    p = tmp_path / f"bulb_{wavelength.replace(' ', '')}.toml"
    p.write_text(f"""
[product]
name = "invented 72-LED UV-C bulb"
invented = true
[lamp]
electrical_power = "36 W"
peak_wavelength = "{wavelength}"
[leds]
count = 72
[[claims]]
id = "oz"
text = "ozone free"
""", encoding="utf-8")
    r = CliRunner().invoke(app, ["screen", str(p), "--json", "-", "--quiet"])
    assert r.exit_code in (0, 1), r.output
    return json.loads(r.stdout[r.stdout.index("{"):])


def test_a_modelled_led_tail_below_240_nm_does_not_decide_ozone(tmp_path):
    # The nominal model gives a UV-C LED a smooth line shape whose tail reaches below 240 nm;
    # that tail is the model's assumption, not a fact about the lamp (data/technologies.toml:
    # a UV-C LED's output below 240 nm is "possible"), so an ozone-free claim is not
    # assessable on the listing alone. An LED stated at 230 nm has its peak below 240 nm:
    # there the output below 240 nm is the stated emission itself, and the claim cannot hold.
    d = _screen_text(tmp_path, "253.7 nm")
    assert d["germicidal"]["ozone"]["status"] == "unknown"
    assert "model's assumption" in d["germicidal"]["ozone"]["note"]
    oz = next(c for c in d["claims"] if c["id"] == "oz")
    assert oz["verdict"] == "not-assessable"
    d = _screen_text(tmp_path, "230 nm")
    assert d["germicidal"]["ozone"]["status"] == "present"
    assert next(c for c in d["claims"] if c["id"] == "oz")["verdict"] == "cannot-hold"


def test_a_model_without_the_mercury_line_does_not_say_it_was_not_found(tmp_path):
    # an estimate models a line or does not: "not found" would read as a search of a
    # measurement; the terminal and the note say the same
    from uvcheck.report.note import spectral_facts

    d = _screen_text(tmp_path, "265 nm")
    r = CliRunner().invoke(app, ["screen", str(tmp_path / "bulb_265nm.toml")])
    line = next(ln for ln in r.output.splitlines() if ln.startswith("Mercury 253.7 nm line"))
    assert line.endswith("not in the model (no mercury lamp)")
    facts = {f["label"]: f["value"] for f in spectral_facts(d)}
    assert facts["Mercury 253.7 nm line"] == "not in the model (no mercury lamp)"


def test_a_mercury_model_without_its_184_nm_line_does_not_call_ozone_absent():
    # The nominal mercury model assumes an ozone-free envelope, so it has no output below
    # 240 nm; that absence is the model's assumption (data/technologies.toml: the 184.9 nm
    # line leaves the lamp unless the envelope glass blocks it, "possible"). The germicidal
    # section said "absent ... modelled down to 180 nm (including the 184.9 nm mercury line)"
    # while the claims said the ozone could not be judged; both now say it is not known.
    d = _screen_json("mercury_tube_sold_pet_safe.toml")
    oz = d["germicidal"]["ozone"]
    assert oz["status"] == "unknown" and "assumption" in oz["note"]
    assert "184.9 nm" in oz["note"]
    r = CliRunner().invoke(app, ["screen", str(LISTINGS / "mercury_tube_sold_pet_safe.toml")])
    line = next(ln for ln in r.output.splitlines() if "ozone (output below 240 nm)" in ln)
    assert "unknown" in line and "absent" not in line


def test_a_led_model_far_above_240_nm_keeps_its_technology_verdict(tmp_path):
    # the assumption rule is for technologies that may emit below 240 nm; a 405 nm LED
    # emits nothing there whatever the model (data/technologies.toml)
    d = _screen_text(tmp_path, "405 nm")
    assert d["germicidal"]["ozone"]["status"] == "absent"


def test_a_listing_that_says_its_mercury_lamp_makes_ozone_is_modelled_so(tmp_path):
    # An invented listing of a mercury tube sold for "UV + ozone" at "185nm and 254nm": the
    # model now takes the seller's word and lets the 184.9 nm line out (the ozone-producing,
    # clear fused-silica envelope of data/emitters/lamp_models.toml), so the estimate shows
    # output below 200 nm and ozone "present", on the listing's statement ("stated"). An
    # ozone-free claim in the same listing stays 'unlikely' (examples/listings/README.md:
    # the listing's own statements give at most 'unlikely').
    p = tmp_path / "ozone_tube.toml"
    p.write_text("""
[product]
name = "invented 38 W quartz tube"
invented = true
[lamp]
electrical_power = "38 W"
peak_wavelength = "253.7 nm"
[[claims]]
id = "both"
text = "UV + ozone double sterilization, 185nm and 254nm"
[[claims]]
id = "free"
text = "ozone-free"
""", encoding="utf-8")
    r = CliRunner().invoke(app, ["screen", str(p), "--json", "-", "--quiet"])
    d = json.loads(r.stdout[r.stdout.index("{"):])
    oz = d["germicidal"]["ozone"]
    assert oz["status"] == "present" and oz["basis"] == "stated"
    assert "185nm and 254nm" in oz["note"] and "ventilate" in oz["note"]
    assert 184.9 in [ln["wavelength_nm"] for ln in d["spectral"]["lines"]]
    assert d["bands"]["below-200nm"]["value"] > 0
    free = next(c for c in d["claims"] if c["id"] == "free")
    assert free["verdict"] == "unlikely" and free["details"]["contradicted_by"] == "both"
    # UV-C is the same as without the statement: the efficiency range is per UV-C watt
    q = tmp_path / "plain.toml"
    q.write_text(p.read_text(encoding="utf-8").replace(
        'text = "UV + ozone double sterilization, 185nm and 254nm"', 'text = "UV-C 254nm"'),
        encoding="utf-8")
    r = CliRunner().invoke(app, ["screen", str(q), "--json", "-", "--quiet"])
    d2 = json.loads(r.stdout[r.stdout.index("{"):])
    assert d2["germicidal"]["ozone"]["status"] == "unknown"
    assert d2["germicidal"]["uvc"]["value"] == pytest.approx(d["germicidal"]["uvc"]["value"])


def test_the_note_names_each_identified_line_once():
    # the mercury model has both lines of the 312.6/313.2 nm doublet, which carry one name
    # (data/emitters/emission_lines.csv); the note listed that name twice
    from uvcheck.report.note import spectral_facts

    d = _screen_json("mercury_tube_sold_pet_safe.toml")
    names = [ln["identified_as"] for ln in d["spectral"]["lines"] if ln.get("identified_as")]
    assert len(names) > len(set(names))  # the doublet: one name, two lines
    facts = {f["label"]: f["value"] for f in spectral_facts(d)}
    listed = facts["Lines identified"].split(", Hg ")
    assert len(listed) == len(set(listed)) == len(set(names))


def test_the_finding_says_when_the_lamp_makes_ozone(tmp_path):
    # The finding, the note's first paragraph, said nothing of ozone when the result found
    # output below 240 nm (PRACTICE-style caution: ventilate after use). Measured: an
    # invented mercury spectrum from 180 nm with the 184.9 and 253.7 nm lines; stated: the
    # listing's own words.
    import numpy as np
    from conftest import gaussian

    from uvcheck.assessment import assess
    from uvcheck.conditions import Conditions
    from uvcheck.report.note import finding
    from uvcheck.spectrum import Spectrum

    wl = np.arange(180.0, 400.0, 0.5)
    v = gaussian(wl, 253.7, 1.0, 0.05) + gaussian(wl, 184.9, 1.0, 0.008) + 1e-7
    d = json.loads(json.dumps(assess(Spectrum(wl, v, "irradiance"),
                                     Conditions(measurement_distance_m=0.5)).to_dict(),
                              default=str))
    assert d["germicidal"]["ozone"]["status"] == "present"
    assert "It emits below 240 nm, where light forms ozone" in finding(d)
    p = tmp_path / "oz.toml"
    p.write_text("""
[product]
name = "invented quartz tube"
invented = true
[lamp]
electrical_power = "38 W"
peak_wavelength = "253.7 nm"
[[claims]]
text = "UV + ozone 185nm"
""", encoding="utf-8")
    r = CliRunner().invoke(app, ["screen", str(p), "--json", "-", "--quiet"])
    d = json.loads(r.stdout[r.stdout.index("{"):])
    assert "The listing says the lamp makes ozone" in finding(d)
    d = _screen_json("mercury_tube_sold_pet_safe.toml")  # ozone unknown: no sentence
    assert "ozone" not in finding(d).lower()
