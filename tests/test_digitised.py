"""A curve read off a graph (--digitised): a datasheet's or a listing's picture of a spectrum.

Such a curve is a shape as read by hand or with a digitiser, to about 1 % of full scale
(common practice), and no measurement of the lamp. With --digitised its noise floor is at
least 1 % of its peak, so its read-off floor (here 0.2–0.6 % of the peak) counts as below
detection rather than as UV-A output; every report says it is digitised. The curve is
invented: 24 points of a 275 nm LED band.
"""

from __future__ import annotations

import json

import pytest
from typer.testing import CliRunner

from uvcheck.cli import app
from uvcheck.io.reader import DIGITISED_FLOOR, read_spectrum

POINTS = [(250, 0.0), (255, 0.01), (260, 0.05), (263, 0.12), (266, 0.27), (268, 0.45),
          (270, 0.66), (272, 0.85), (274, 0.98), (275, 1.0), (276, 0.97), (278, 0.84),
          (280, 0.63), (282, 0.44), (284, 0.29), (287, 0.15), (290, 0.08), (295, 0.03),
          (300, 0.015), (310, 0.006), (320, 0.004), (340, 0.003), (380, 0.002), (400, 0.002)]


@pytest.fixture
def curve(tmp_path):
    p = tmp_path / "datasheet.csv"
    p.write_text("Wavelength (nm),Relative intensity\n"
                 + "\n".join(f"{a},{b}" for a, b in POINTS) + "\n", encoding="utf-8")
    return p


def test_the_floor_of_a_digitised_curve_is_a_share_of_its_peak(curve):
    plain, _ = read_spectrum(curve)
    spec, rep = read_spectrum(curve, digitised=True)
    assert spec.noise_floor == pytest.approx(DIGITISED_FLOOR * 1.0)
    assert plain.noise_floor < spec.noise_floor
    assert rep.noise["method"] == "digitised-graph floor"
    assert rep.warnings[0].startswith("DIGITISED curve")
    assert spec.meta["digitised"] is True and "digitised" not in plain.meta


def test_every_report_says_it_is_digitised(curve, tmp_path):
    out = tmp_path / "a.json"
    args = ["assess", str(curve), "--digitised", "--scale-total", "2 W/m2", "--distance",
            "10 cm", "--no-uncertainty"]
    r = CliRunner().invoke(app, args + ["--json", str(out)])
    assert r.exit_code == 0, r.output
    assert "DIGITISED: a curve read off a graph" in r.output
    d = json.loads(out.read_text())
    assert d["input"]["digitised"] is True
    assert d["bands"]["UV-A"]["below_detection"] is True   # the read-off floor is no output
    assert d["position"].startswith("A curve read off a graph, taken to hold at 0.1 m")
    assert "Measured at" not in r.output
    html = tmp_path / "n.html"
    r = CliRunner().invoke(app, ["note", str(curve), "--digitised", "--scale-total", "2 W/m2",
                                 "--distance", "10 cm", "--no-uncertainty", "--out", str(html),
                                 "--no-pdf"])
    assert r.exit_code == 0, r.output
    text = html.read_text(encoding="utf-8")
    assert "read off a graph" in text and "digitised (read off a graph" in text


def test_a_manifest_marks_a_digitised_curve(curve, tmp_path):
    from uvcheck import batch as B

    m = tmp_path / "m.csv"
    m.write_text(f"id,spectrum,digitised\nsheet,{curve.name},yes\nplain,{curve.name},no\n"
                 f"bad,{curve.name},perhaps\n", encoding="utf-8")
    rows = {r["product_id"]: r for r in (B.run_product(p, B.BatchSettings())
                                         for p in B.read_manifest(m))}
    assert rows["sheet"]["first_import_warning"].startswith("DIGITISED curve")
    assert not (rows["plain"]["first_import_warning"] or "").startswith("DIGITISED")
    assert rows["bad"]["status"] == "error" and "digitised 'perhaps'" in rows["bad"]["error"]
