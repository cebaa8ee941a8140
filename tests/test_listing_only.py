"""A listing that states claims but nothing the lamp can be modelled from (no technology,
wavelength or band) is screened, not refused: its claims are listed, each not assessable
with what would decide it (unless the listing's own statements decide it), with the usual
cautions, and no figures at all.

No external check values here: the rules tested are our own honest-results rules
(DEVELOPERS.md: missing data are never read as zero; a result never claims more than its
inputs carry) and the caution catalogue's conditions (uvcheck/report/cautions.py).
"""

from __future__ import annotations

import csv
import json

import pytest
from typer.testing import CliRunner

from uvcheck.claims import NO_LAMP_DATA
from uvcheck.cli import app
from uvcheck.io.listing import parse_listing
from uvcheck.screening import NO_LAMP_MODEL, ListingOnly, screen_listing_file

runner = CliRunner()

CLAIMS_ONLY = '''# INVENTED EXAMPLE - not a real product or seller.
format = "uvcheck-listing/1"
[product]
name = "pocket steriliser (invented)"
invented = true
[[claims]]
id = "uvc"
text = "UV-C 254 nm"
[[claims]]
id = "kill"
text = "kills 99.9 % of germs in 30 seconds at 5 cm"
[[claims]]
id = "pets"
text = "safe for pets"
[[claims]]
id = "oz"
text = "ozone-free"
'''


def _write(tmp_path, text=CLAIMS_ONLY, name="pocket.toml"):
    p = tmp_path / name
    p.write_text(text, encoding="utf-8")
    return p


def test_claims_only_listing_is_screened_with_every_claim_not_assessable(tmp_path):
    a = screen_listing_file(parse_listing(CLAIMS_ONLY, "pocket.toml"))
    assert isinstance(a, ListingOnly) and a.spectrum is None
    d = a.to_dict()
    assert d["input"]["origin"] == "listing-only"
    assert d["lamp_model"]["status"] == "not-built"
    # no figures of any kind: nothing is read as zero
    for key in ("bands", "spectral", "hazards", "risk_group", "germicidal", "photometry"):
        assert key not in d
    verdicts = {c["id"]: c for c in d["claims"]}
    assert {c["verdict"] for c in verdicts.values()} == {"not-assessable"}
    for cid in ("uvc", "kill", "pets", "oz"):
        assert verdicts[cid]["basis"] == NO_LAMP_DATA
        assert verdicts[cid]["evidence"] == "listing"
        assert "a measured spectrum" in verdicts[cid]["missing"]
    assert d["claims_summary"]["counts"]["not-assessable"] == 4
    said = " ".join(d["warnings"])
    assert said.startswith(NO_LAMP_MODEL)
    assert "claim uvc names 254 nm" in said          # the pointer to the claim's wavelength
    assert any(n.startswith("Screening assessment, not a certification") for n in d["notes"])


def test_the_listings_own_ozone_statement_still_decides_an_ozone_free_claim():
    text = CLAIMS_ONLY + '[[claims]]\nid = "o3"\ntext = "produces ozone to clean the air"\n'
    d = screen_listing_file(parse_listing(text, "pocket.toml")).to_dict()
    oz = next(c for c in d["claims"] if c["id"] == "oz")
    assert oz["verdict"] == "unlikely" and "o3" in oz["basis"]


def test_a_listing_with_neither_claims_nor_lamp_data_is_still_refused(tmp_path):
    p = _write(tmp_path, '[product]\nname = "empty (invented)"\ninvented = true\n')
    r = runner.invoke(app, ["screen", str(p)])
    assert r.exit_code == 2
    assert "too little to model the lamp" in r.output


def test_screen_command_prints_the_claims_and_the_cautions(tmp_path):
    p = _write(tmp_path)
    out = tmp_path / "r.json"
    r = runner.invoke(app, ["screen", str(p), "--json", str(out)])
    assert r.exit_code == 0, r.output
    assert "listing screening (no lamp model)" in r.output
    assert "NO LAMP MODEL" in r.output
    assert "judged on the listing alone: no lamp data" in r.output
    # sold as UV-C with UV-C unknown: the UV-C cautions apply (cautions.py conditions)
    assert "UV-C cannot be seen or felt" in r.output
    assert "Not for skin, people or animals" in r.output
    assert "Local codes, regulations and the advice of licensed professionals" in r.output
    assert json.loads(out.read_text())["input"]["origin"] == "listing-only"
    # --fail-on counts the verdicts as usual
    r = runner.invoke(app, ["screen", str(p), "--fail-on", "not-assessable"])
    assert r.exit_code == 1


def test_note_of_a_claims_only_listing(tmp_path):
    p = _write(tmp_path)
    html = tmp_path / "n.html"
    r = runner.invoke(app, ["note", "--listing", str(p), "--out", str(html), "--no-pdf"])
    assert r.exit_code == 0, r.output
    text = html.read_text(encoding="utf-8")
    assert "screening of the listing alone (no lamp data)" in text
    assert "Nothing was measured, and the listing states too little to model the lamp" in text
    assert "screening of the seller&#39;s statements alone" in text or \
        "screening of the seller's statements alone" in text
    assert "Spectrum file" not in text
    assert "UV-C cannot be seen or felt" in text


def test_batch_row_of_a_claims_only_listing(tmp_path):
    folder = tmp_path / "in"
    folder.mkdir()
    _write(folder)
    out = tmp_path / "s.csv"
    r = runner.invoke(app, ["batch", str(folder), "--out", str(out)])
    assert r.exit_code == 0, r.output
    row = next(csv.DictReader(out.open(encoding="utf-8")))
    assert row["status"] == "ok" and row["origin"] == "listing-only"
    assert row["claims_not_assessable"] == "4" and row["peak_nm"] == "" and row["risk_group"] == ""


def test_a_room_model_is_refused_for_a_listing_with_no_lamp_model(tmp_path):
    p = _write(tmp_path)
    r = runner.invoke(app, ["note", "--listing", str(p), "--room", "4 x 3 x 2.5 m",
                            "--out", str(tmp_path / "n.html"), "--no-pdf"])
    assert r.exit_code == 2
    assert "no output to evaluate further" in r.output
    assert not (tmp_path / "n.html").exists()
