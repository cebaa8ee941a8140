"""The one product pipeline (uvcheck.pipeline) that `assess`, `note` and `batch` share: each
command must give what the others give for the same inputs, and every input a command takes
must reach the assessment.

The spectra and listings are the bundled examples (invented data, examples/README); the
expected values are the commands' own results for the same inputs (the point is that the
paths agree), or the given inputs themselves.
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest
from typer.testing import CliRunner

from uvcheck import batch as B
from uvcheck.assessment import AssessOptions
from uvcheck.cli import app
from uvcheck.cli_note import note_result
from uvcheck.errors import ConfigurationError
from uvcheck.io.listing import read_listing
from uvcheck.pipeline import ProductInputs, assess_files
from uvcheck.report.jsonout import clean

EXAMPLES = Path(__file__).resolve().parents[1] / "examples"
TUBE = EXAMPLES / "spectra" / "mercury_tube_254nm.txt"
TUBE_LISTING = EXAMPLES / "listings" / "mercury_tube_sold_pet_safe.toml"
runner = CliRunner()


def _assess_json(tmp_path: Path, *args: str) -> dict:
    out = tmp_path / "a.json"
    r = runner.invoke(app, ["assess", str(TUBE), "--json", str(out), "--quiet", "--force",
                            "--no-uncertainty", *args])
    assert r.exit_code == 0, r.output
    return json.loads(out.read_text(encoding="utf-8"))


def test_batch_manifest_emitter_columns_reach_the_conditions(tmp_path):
    # a manifest row's emitter and tube_length are the assess options of the same name
    m = tmp_path / "m.csv"
    m.write_text("id,spectrum,distance,emitter,tube_length,use_distance\n"
                 f"t,{TUBE},1 m,tube,0.55 m,3 m\n", encoding="utf-8")
    (p,) = B.read_manifest(m)
    a = B.assess_product(p, B.BatchSettings())
    want = _assess_json(tmp_path, "--distance", "1 m", "--emitter", "tube",
                        "--tube-length", "0.55 m", "--use-distance", "3 m")
    got = clean(a.to_dict())
    assert got["conditions"]["emitter"] == "tube" and got["conditions"]["tube_length_m"] == 0.55
    assert got["conditions"] == want["conditions"]
    assert got["hazards"] == want["hazards"] and got["use_distance"] == want["use_distance"]
    row = B.summary_row(p, a.summary_parts())
    assert row["risk_group_at_use"] == want["use_distance"]["risk_group"]["group"]


def test_note_and_assess_give_the_same_result(tmp_path):
    want = _assess_json(tmp_path, "--distance", "1 m", "--claims", str(TUBE_LISTING))
    got, _ = note_result(TUBE, TUBE_LISTING, distance="1 m",
                         uncertainty={"no_uncertainty": True})
    for k in ("conditions", "hazards", "risk_group", "germicidal", "claims", "bands"):
        assert got[k] == want[k], k


def test_a_listing_alone_is_screened_and_extra_sections_are_added():
    listing = read_listing(TUBE_LISTING)
    seen = []

    def extra(spec, cond):
        seen.append((spec.meta.get("origin"), cond.measurement_distance_m))
        return {"marker": {"origin": spec.meta.get("origin")}}

    a = assess_files(None, listing, ProductInputs(), AssessOptions(uncertainty=False),
                     extra=extra)
    d = a.to_dict()
    assert d["input"]["origin"] == "nominal" and d["marker"] == {"origin": "nominal"}
    assert seen and seen[0][0] == "nominal"


@pytest.mark.parametrize("names, expected", [
    (None, "give only one of --scale-band, --scale-lux, --scale-total"),
    (B.MANIFEST_NAMES, "give only one of scale_band, scale_lux, scale_total")])
def test_two_scalings_are_refused_naming_the_inputs(names, expected):
    inputs = ProductInputs(scale_band="UVC=1 W/m2", scale_lux="500 lx")
    with pytest.raises(ConfigurationError, match=expected):
        if names is None:
            inputs.check()
        else:
            inputs.check(names)


def test_neither_file_is_refused():
    with pytest.raises(ConfigurationError, match="give a spectrum file, a listing file"):
        assess_files(None, None, ProductInputs(), AssessOptions(uncertainty=False))


def test_an_empty_scaling_option_still_counts_as_given():
    # `--scale-lux "" --scale-total ...` was refused before the pipeline existed: an option
    # given, even empty, is given
    with pytest.raises(ConfigurationError, match="give only one of"):
        ProductInputs(scale_lux="", scale_total="1 W/m2").check()


def test_input_errors_come_before_file_errors_and_the_spectrum_before_the_listing(tmp_path):
    bad_listing = tmp_path / "bad.toml"
    bad_listing.write_text("this is [not toml", encoding="utf-8")
    empty = tmp_path / "empty.csv"
    empty.write_text("", encoding="utf-8")
    # an input error is reported before any file is read (the spectrum does not exist)
    r = runner.invoke(app, ["assess", str(tmp_path / "missing.csv"), "--emitter", "bogus"])
    assert r.exit_code == 2 and "--emitter" in r.output and "not found" not in r.output
    r = runner.invoke(app, ["assess", str(tmp_path / "missing.csv"), "--distance", "xx"])
    assert r.exit_code == 2 and "--distance" in r.output and "not found" not in r.output
    # between two bad files, the spectrum's error comes first (as before the pipeline)
    r = runner.invoke(app, ["assess", str(empty), "--claims", str(bad_listing)])
    assert r.exit_code == 2 and "empty" in r.output


def test_batch_input_errors_name_the_manifest_columns(tmp_path):
    m = tmp_path / "m.csv"
    m.write_text("id,spectrum,listing,emitter,tube_length\n"
                 f"a,{TUBE},,bogus,\n"
                 f"b,{TUBE},,point,1 m\n"
                 f"c,,{TUBE_LISTING},bogus,\n", encoding="utf-8")
    rows = [B.run_product(p, B.BatchSettings()) for p in B.read_manifest(m)]
    assert [r["status"] for r in rows] == ["error", "error", "error"]
    assert rows[0]["error"].startswith("emitter:") and "--emitter" not in rows[0]["error"]
    assert rows[1]["error"].startswith("tube_length:") and "Give emitter tube" in rows[1]["error"]
    assert rows[2]["error"].startswith("emitter:")   # refused for a listing alone too


def test_a_distance_option_that_contradicts_the_file_is_used_and_warned_about():
    # the invented wand example states "Messabstand;10 cm" in its metadata
    from uvcheck.pipeline import ProductInputs, assess_files

    wand = Path(__file__).resolve().parents[1] / "examples" / "spectra" / "wand_395nm_led.csv"
    opts = AssessOptions(uncertainty=False)
    a = assess_files(wand, None, ProductInputs(distance="5 cm"), opts)
    assert a.conditions.measurement_distance_m == pytest.approx(0.05)
    w = [x for x in a.to_dict()["input"]["warnings"] if "states a measurement distance" in x]
    assert w and "0.1 m" in w[0] and "0.05 m" in w[0]
    same = assess_files(wand, None, ProductInputs(distance="10 cm"), opts)
    assert not any("states a measurement distance" in x
                   for x in same.to_dict()["input"]["warnings"])
    own = assess_files(wand, None, ProductInputs(), opts)
    assert own.conditions.measurement_distance_m == pytest.approx(0.1)


def test_test_record_is_kept_for_the_report_and_used_nowhere(tmp_path):
    # PRACTICE: a technical report records the operating conditions and the instrument; the
    # tool keeps what the tester states, in order, and computes nothing from it
    import json as _json

    import numpy as np

    from typer.testing import CliRunner

    from uvcheck.cli import app
    from uvcheck.cli_note import note_result, render_note

    wl = np.arange(300.0, 801.0, 1.0)
    f = tmp_path / "lamp.csv"
    f.write_text("Wavelength (nm),Irradiance (W/m2/nm)\n" + "\n".join(
        f"{a},{1e-3 * np.exp(-0.5 * ((a - 450) / 10) ** 2) + 1e-7:.6e}" for a in wl) + "\n")
    out, plain = tmp_path / "a.json", tmp_path / "b.json"
    args = ["assess", str(f), "--distance", "20 cm", "--no-uncertainty", "--json"]
    r = CliRunner().invoke(app, args + [str(out), "--test-info", "warm-up=15 min",
                                        "--test-info", "cosine corrector = yes"])
    assert r.exit_code == 0, r.output
    CliRunner().invoke(app, args + [str(plain)])
    d, e = _json.loads(out.read_text()), _json.loads(plain.read_text())
    assert d["input"]["test_record"] == {"warm-up": "15 min", "cosine corrector": "yes"}
    assert d["hazards"] == e["hazards"] and d["bands"] == e["bands"]   # used nowhere
    result, spec = note_result(f, None, distance="20 cm", test_info=("warm-up=15 min",),
                               uncertainty={"no_uncertainty": True})
    html, _, _ = render_note(result, spec, pdf=False)
    assert "Test record: warm-up" in html and "15 min" in html
