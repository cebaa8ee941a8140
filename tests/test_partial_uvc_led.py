"""An invented 275 nm UV-C LED measured from 230 nm only, exported the way a German-language
instrument export might be (Latin-1, semicolons, decimal comma, a metadata block with the
distance). UV-C is partly measured, so germicidal times are upper bounds and are worded so;
hazards below the detection limit get no interval row in the terminal."""

from __future__ import annotations

import numpy as np
import pytest
from typer.testing import CliRunner

from uvcheck.cli import app


@pytest.fixture
def led_file(tmp_path):
    rng = np.random.default_rng(42)
    wl = np.arange(230.0, 850.0, 0.37)
    v = (12.0 * np.exp(-0.5 * ((wl - 276) / 4.8) ** 2)
         + 0.05 * np.exp(-0.5 * ((wl - 610) / 30) ** 2) + rng.normal(0, 0.002, wl.size))
    rows = [f"{a:.2f};{b:.5f}".replace(".", ",") for a, b in zip(wl, v)]
    text = ("[Gerät]\nModell;invented\nAbstand;5 cm\n\n[Daten]\n"
            "Wellenlänge [nm];Bestrahlungsstärke [µW/cm²/nm]\n" + "\n".join(rows) + "\n")
    p = tmp_path / "led.csv"
    p.write_bytes(text.encode("latin-1"))
    return p


def test_terminal_lists_no_interval_for_hazards_below_detection(led_file):
    r = CliRunner().invoke(app, ["assess", str(led_file)])
    assert r.exit_code == 0, r.output
    unc = r.output[r.output.index("Measurement uncertainty"):].split("overall group")[0]
    assert "E_S" in unc
    for sym in ("E_UVA", "E_B"):       # below the detection limit in the hazard table
        assert f"  {sym} " not in unc


def test_note_words_a_bounded_time_as_a_bound(led_file, tmp_path):
    from uvcheck.cli_note import note_result
    from uvcheck.report.note import finding as note_finding

    res, _ = note_result(led_file, None)
    finding = note_finding(res)
    assert "at most about" in finding and "about ≤" not in finding


def test_emission_claim_on_a_partly_measured_uvc_band_is_judged_on_the_emission(led_file, tmp_path):
    # UV-C found (peak 276 nm) but 200-230 nm not measured: the germicidal status is 'partial';
    # the stated 275 nm is within the tolerance of the measured peak, so the claim holds
    import json

    lst = tmp_path / "led.toml"
    lst.write_text('[product]\nname = "invented"\ninvented = true\n\n'
                   '[[claims]]\ntext = "UVC 275nm"\n', encoding="utf-8")
    r = CliRunner().invoke(app, ["assess", str(led_file), "--claims", str(lst), "--json", "-",
                                 "--quiet", "--no-uncertainty"])
    assert r.exit_code == 0, r.output
    d = json.loads(r.stdout[r.stdout.index("{"):])
    assert d["germicidal"]["status"] == "partial"
    assert d["claims"][0]["verdict"] == "holds", d["claims"][0]["basis"]


def test_uncertainty_block_keeps_the_bound_of_organism_times(led_file):
    # UV-C measured only from 230 nm: the organism times are upper bounds (the organism table
    # says '≤'), and the uncertainty block's 99.9 % lines say so too
    r = CliRunner().invoke(app, ["assess", str(led_file)])
    assert r.exit_code == 0, r.output
    lines = [ln for ln in r.output.splitlines() if ln.strip().startswith("99.9 % of")]
    assert lines and all(": ≤ " in ln for ln in lines), lines
