"""Claim wording, second audit: several bands in one emission claim, ozone wordings, a cover
that blocks the band on a screening, a stated wavelength far from the technology's lines,
"mold spores" and "H1N1", and reduction percentages that keep their nines.

Every listing and spectrum here is invented for the test. Expected values and their sources
are named beside each test.
"""

from __future__ import annotations

import json

import numpy as np
import pytest
from conftest import gaussian
from typer.testing import CliRunner

from uvcheck.claims import find_organism, judge, pct, readings_from_listing, \
    readings_from_measurement
from uvcheck.cli import app
from uvcheck.conditions import Conditions
from uvcheck.io.listing import parse_claim_text, parse_listing, says_ozone_free, says_ozone_made
from uvcheck.plausibility import screen_listing
from uvcheck.spectrum import Spectrum

runner = CliRunner()


def listing(text: str):
    return parse_listing('format = "uvcheck-listing/1"\n[product]\nname = "test lamp (invented)"\n'
                         'invented = true\n' + text, "test.toml")


def screened(text: str) -> dict:
    lst = listing(text)
    res = judge(lst, readings_from_listing(lst, screen_listing(lst)), measured=False)
    return {v.id: v for v in res.verdicts}


def measured(spec: Spectrum, text: str, d0: float = 0.1) -> dict:
    lst = listing(text)
    res = judge(lst, readings_from_measurement(spec, Conditions(measurement_distance_m=d0)),
                measured=True)
    return {v.id: v for v in res.verdicts}


def claims(*texts: str) -> str:
    return "".join(f'[[claims]]\nid = "c{i}"\ntext = "{t}"\n' for i, t in enumerate(texts, 1))


def violet_led() -> Spectrum:
    """An invented 395 nm LED band (Gaussian, σ = 6 nm, 10 W m⁻²) on 200–800 nm, no UV-C."""
    wl = np.arange(200.0, 800.5, 0.5)
    return Spectrum(wl, gaussian(wl, 395.0, 6.0, 10.0), "irradiance")


MERCURY = '[lamp]\ntechnology = "lp_mercury"\nelectrical_power = "15 W"\ncover = "quartz"\n'


# --- 1. several bands in one emission claim --------------------------------------------------

@pytest.mark.parametrize("text, bands, wavelengths", [
    ("UVA + UVC", ("UV-A", "UV-C"), ()),
    ("UVC and UVA light", ("UV-C", "UV-A"), ()),
    ("UVA+UVC dual band 365nm & 254nm", ("UV-A", "UV-C"), (365.0, 254.0)),
    ("UV-C 254nm", (), ()),                        # one band, one wavelength: as before
    ("UV-C 254nm, no UV-A", (), ()),               # a denied band is not claimed
    ("No UV-A or UV-B, pure UVC", (), ()),
])
def test_every_band_and_wavelength_named_is_read(text, bands, wavelengths):
    c = parse_claim_text(text)
    assert c.kind == "emission"
    assert (c.bands, c.wavelengths_nm) == (bands, wavelengths)
    if text.startswith("No UV-A"):
        assert c.band_name == "UV-C"


def test_structured_claim_may_list_bands_and_wavelengths():
    lst = listing('[[claims]]\nkind = "emission"\nband = ["UV-A", "UV-C"]\n'
                  '[[claims]]\nkind = "emission"\nwavelength = ["365 nm", "254 nm"]\n')
    a, b = lst.claims
    assert a.bands == ("UV-A", "UV-C") and a.band_name == "UV-A"
    assert b.wavelengths_nm == (365.0, 254.0) and b.wavelength_nm == 365.0
    assert lst.to_dict()["claims"][0]["bands"] == ["UV-A", "UV-C"]


def test_uva_plus_uvc_cannot_hold_on_a_lamp_without_uvc():
    """A 395 nm LED band (invented) has UV-A but nothing in UV-C: "UVA + UVC" claims both, so
    it cannot hold, and the basis names UV-C as the band that decides (our own rule: the
    worst part decides, as for several organisms)."""
    v = measured(violet_led(), claims("UVA + UVC", "UVC and UVA light",
                                      "UVA+UVC dual band 365nm & 254nm", "UV-A"))
    assert v["c4"].verdict == "holds"                  # the UV-A part alone is there
    for cid in ("c1", "c2", "c3"):
        assert v[cid].verdict == "cannot-hold", v[cid].basis
        assert v[cid].details["parts"]["UV-A"] == "holds"
        assert v[cid].details["parts"]["UV-C"] == "cannot-hold"
    assert v["c1"].details["decided_by"] == "UV-C"
    assert "UV-C decides it" in v["c1"].basis and "the others: UV-A: holds" in v["c1"].basis
    assert set(v["c3"].details["parts"]) == {"UV-A", "UV-C", "365 nm", "254 nm"}
    assert v["c3"].details["parts"]["365 nm"] == "cannot-hold"   # 30 nm from the 395 nm peak


def test_uva_plus_uvc_on_the_example_wand_spectrum(tmp_path):
    """The invented wand spectrum (examples/spectra, a 395 nm LED) printed [HOLDS] for
    "UVA + UVC" from its UV-A alone."""
    from pathlib import Path

    root = Path(__file__).resolve().parent.parent
    lst, out = tmp_path / "wand.toml", tmp_path / "out.json"
    lst.write_text('format = "uvcheck-listing/1"\n[product]\nname = "wand (invented)"\n'
                   'invented = true\n' + claims("UVA + UVC"), encoding="utf-8")
    r = runner.invoke(app, ["assess", str(root / "examples" / "spectra" / "wand_395nm_led.csv"),
                            "--claims", str(lst), "--no-uncertainty", "--json", str(out)])
    assert r.exit_code in (0, 1), r.output
    d = json.loads(out.read_text(encoding="utf-8"))
    em = d["claims"][0]
    assert em["verdict"] == "cannot-hold", em["basis"]
    assert em["details"]["decided_by"] == "UV-C"


def test_uva_plus_uvc_on_a_screening():
    """365 nm LEDs at 3.3 V per die (invented): the UV-C part needs at least 4.43 eV at
    280 nm (E = hc/λ, scipy.constants), a hard bound; a mercury tube emits in both bands."""
    led = screened('[lamp]\npeak_wavelength = "365 nm"\nelectrical_power = "5 W"\n'
                   '[leds]\ncount = 30\nseries = 1\nstrings = 30\nforward_voltage = "3.3 V"\n'
                   + claims("UVA + UVC"))
    assert led["c1"].verdict == "cannot-hold", led["c1"].basis
    assert led["c1"].details["decided_by"] == "UV-C"
    assert led["c1"].ratio == pytest.approx(3.3 / 4.428, rel=2e-3)
    hg = screened(MERCURY + claims("UVA + UVC", "UVC and UVA light"))
    assert hg["c1"].verdict == hg["c2"].verdict == "holds"


# --- 2. ozone wording --------------------------------------------------------------------------

@pytest.mark.parametrize("text", ["0 ozone", "0 ozone emission", "zero ozone", "Ozonfrei",
                                  "sans ozone", "ozon free", "ozone: none", "no ozone",
                                  "does not produce ozone", "NON-OZONE",
                                  "100% free of ozone", "free from ozone", "ozone-less",
                                  "Ozoneless", "no harmful ozone", "ozone is not produced"])
def test_ozone_free_wordings(text):
    c = parse_claim_text(text)
    assert c.kind == "ozone-free", c.note
    assert says_ozone_free(text) and not says_ozone_made(text)


@pytest.mark.parametrize("text", ["not ozone free", "not ozone-free: produces ozone",
                                  "produces ozone", "generates ozone", "this lamp makes ozone"])
def test_wordings_that_the_lamp_makes_ozone(text):
    c = parse_claim_text(text)
    assert c.kind != "ozone-free"
    assert "makes ozone" in c.note
    assert says_ozone_made(text) and not says_ozone_free(text)


@pytest.mark.parametrize("text, made", [
    ("UV-C + ozone", True), ("with ozone for odours", True), ("ozone mode", True),
    ("254nm + 185nm", True), ("ozone sterilization", True),
    ("ozone level tested", False), ("ozone concentration meets the standard", False)])
def test_a_bare_mention_of_ozone_is_no_statement_that_the_lamp_makes_it(text, made):
    """Only a wording that puts ozone (or the 184.9 nm line) among what the lamp gives says
    the lamp makes ozone (our own reading); a mention alone does not, so it cannot turn a
    mercury model into an ozone-producing one."""
    assert says_ozone_made(text) is made


def test_free_of_ozone_is_no_statement_that_the_lamp_makes_ozone():
    """Before, '100% free of ozone' was read as the seller saying the lamp makes ozone: the
    model gained the 184.9 nm line and the plain 'Ozone free' claim beside it became
    'unlikely'. Both are ozone-free claims, not assessable on a mercury listing (the envelope
    glass decides, technologies.toml below_240 = "possible")."""
    v = screened(MERCURY + claims("Ozone free", "100% free of ozone, doped quartz glass"))
    assert v["c1"].verdict == v["c2"].verdict == "not-assessable", v["c1"].basis
    assert "contradicted_by" not in v["c1"].details


def test_an_ozone_free_wording_is_not_a_statement_of_ozone():
    """'0 ozone emission' is one more ozone-free claim, not the seller saying the lamp makes
    ozone: the other ozone-free claims of a mercury listing stay not-assessable (the envelope
    glass decides, technologies.toml below_240 = "possible"); 'produces ozone' makes them at
    most 'unlikely' (our own rule: the seller's own words)."""
    v = screened(MERCURY + claims("ozone free", "0 ozone emission"))
    assert v["c1"].verdict == v["c2"].verdict == "not-assessable", v["c1"].basis
    v = screened(MERCURY + claims("ozone free", "not ozone-free: produces ozone"))
    assert v["c1"].verdict == "unlikely"
    assert v["c1"].details["contradicted_by"] == "c2"


# --- 3. a cover that blocks the band, on a screening -------------------------------------------

@pytest.mark.parametrize("cover, text, verdict", [
    ("soda-lime glass", "UV-C 254 nm germicidal", "cannot-hold"),
    ("soda-lime glass", "germicidal UVC light", "cannot-hold"),
    ("soda-lime glass", "UV-A", "holds"),            # the glass passes UV-A
    ("quartz", "UV-C 254 nm germicidal", "holds"),
])
def test_a_cover_that_blocks_the_band_is_a_hard_bound(cover, text, verdict):
    """Soda-lime glass passes at most 0.5 % below 310 nm (data/emitters/lamp_models.toml,
    from memory / common practice): under 1 % is a hard bound (plausibility.check_cover)."""
    v = screened(f'[lamp]\ntechnology = "lp_mercury"\nelectrical_power = "20 W"\n'
                 f'cover = "{cover}"\n' + claims(text))["c1"]
    assert v.verdict == verdict, v.basis
    if verdict == "cannot-hold":
        assert "hard bound" in v.rule and "cover" in v.rule
        assert v.details["finding"] == "cover-transmission"


# --- 4. a stated wavelength against the technology's lines, on a screening ---------------------

@pytest.mark.parametrize("tech, text, verdict", [
    ("lp_mercury", "UVC 245nm", "unlikely"),       # 6.7 nm below the 251.7–255.7 nm window
    ("lp_mercury", "UVC 254nm", "holds"),          # 0.3 nm from 253.7 nm
    ("lp_mercury", "UVC 185nm ozone line", "holds"),   # the 184.9 nm line
    ("uvc_led", "UV-C 275nm", "holds"),            # inside the 230–290 nm peak window
    ("uvc_led", "365nm UV-A", "unlikely"),
    ("uvc_led", "UV-A", "unlikely"),               # the nominal LED band has nothing there
    ("krcl_excimer", "222nm far-UVC", "holds"),
])
def test_stated_wavelength_against_the_technology(tech, text, verdict):
    """Lines and peak windows of data/technologies.toml; the tolerance is the measured path's
    (PEAK_TOLERANCE_NM = 3 nm, ours); technology data give at most 'unlikely'."""
    v = screened(f'[lamp]\ntechnology = "{tech}"\nelectrical_power = "15 W"\n' + claims(text))
    v = v["c1"]
    assert v.verdict == verdict, v.basis
    if verdict == "unlikely":
        assert "technology" in v.rule and "hard bound" in v.rule   # "... not a hard bound"
        assert "not a hard bound" in v.rule


def test_245nm_on_mercury_names_the_distance():
    """lp_mercury: lines 184.9 and 253.7 nm, peak window 251.7–255.7 nm (technologies.toml):
    the nearest is the window's edge, 6.7 nm from 245 nm."""
    v = screened(MERCURY + claims("UVC 245nm"))["c1"]
    assert "within 3.0 nm of the stated 245 nm" in v.basis
    assert v.details["distance_nm"] == pytest.approx(251.7 - 245.0)


# --- 5. organisms ----------------------------------------------------------------------------

def test_mold_spores_are_fungal_spores_only():
    """"mold spores" are fungal spores: judged with Aspergillus niger spores (the only
    fungal_spore group in data/organisms/organisms.csv), not with Bacillus subtilis."""
    c = parse_claim_text("kills 99% of mold spores in 1 hour at 1 m")
    assert c.organism == "mold spores" and c.organism_generic
    v = screened(MERCURY + claims("kills 99% of mold spores in 1 hour at 1 m",
                                  "kills 99% of spores in 1 hour at 1 m"))
    assert "Aspergillus" in v["c1"].basis and "subtilis" not in v["c1"].basis
    assert "spores" in v["c1"].details["organism_id"]
    assert "subtilis" in v["c2"].basis       # "spores" alone: bacterial or fungal


def test_h1n1_and_flu_are_influenza():
    c = parse_claim_text("Eliminates MRSA, H1N1 and E.coli")
    assert c.organism == "MRSA, H1N1, E.coli" and not c.organism_generic
    assert parse_claim_text("kills flu in 5 min at 1 m").organism == "flu"
    assert any("H1N1" in o.organism for o in find_organism("H1N1"))
    assert any("Influenza" in o.organism for o in find_organism("flu"))
    v = screened(MERCURY + claims("kills 99.9% of MRSA, H1N1 and E.coli in 10 min at 20 cm"))
    assert set(v["c1"].details["organisms"]) == {"MRSA", "H1N1", "E.coli"}


# --- 6. reduction percentages keep their nines ---------------------------------------------------

@pytest.mark.parametrize("p, text", [(90.0, "90.00"), (99.9, "99.90"), (99.99, "99.99"),
                                     (99.999, "99.999"), (99.9999, "99.9999"),
                                     (100.0 * (1.0 - 10.0 ** -5), "99.999")])
def test_pct(p, text):
    assert pct(p) == text


def test_five_and_six_log_print_their_nines():
    v = screened(MERCURY + claims("eliminates 99.999% (5-log) of bacteria in 60 seconds at 5 cm",
                                  "kills 100% of germs in 10 min at 1 m")
                 + '[[claims]]\nid = "six"\nkind = "inactivation"\nlog_reduction = 6\n'
                   'organism = "germs"\ntime = "10 min"\ndistance = "1 m"\n')
    assert "99.999 % of" in v["c1"].basis and "100.00 %" not in v["c1"].basis
    assert "99.9999 % of" in v["c2"].basis       # 100 % judged as 6 log
    assert "99.9999 % of" in v["six"].basis
    assert v["six"].needed.what == "dose for 99.9999 %"


def test_a_band_the_nominal_spectrum_does_not_reach():
    """An incandescent lamp at 2800 K (invented) puts about 1e-5 of its output in UV-C
    (Planck's law through uvcheck.nominal): under the 0.1 % taken as emission (our own rule),
    a UV-C claim is 'unlikely' on a screening; its visible output is most of it."""
    v = screened('[lamp]\ntechnology = "incandescent"\ncolour_temperature = "2800 K"\n'
                 'electrical_power = "60 W"\n' + claims("UV-C germicidal")
                 + '[[claims]]\nid = "vis"\nkind = "emission"\nband = "visible"\n')
    assert v["c1"].verdict == "unlikely", v["c1"].basis
    assert v["c1"].details["share"] < 1e-3
    assert "an incandescent lamp" in v["c1"].basis
    assert v["vis"].verdict == "holds" and v["vis"].details["share"] > 0.05


def test_a_text_that_makes_several_claims_is_judged_on_each():
    """'no ozone, safe for children' was judged on ozone only and shown as holding, while the
    note's caution said to keep the lamp from children. Every kind a text makes is judged and
    the worst decides (our own rule, as for several organisms or bands). Invented listing: a
    violet LED lamp stated at 405 nm, 10 W, used at 10 cm."""
    from uvcheck.io.listing import parse_claim_text, parse_listing
    from uvcheck.screening import screen_listing_file

    c = parse_claim_text("no ozone, safe for children")
    assert c.kind == "ozone-free" and c.also_kinds == ("safety",)
    assert parse_claim_text("no ozone, safe for children", kind="safety").kind == "safety"
    lst = parse_listing('''format = "uvcheck-listing/1"
[product]
name = "violet room lamp (invented)"
invented = true
[lamp]
technology = "violet_led"
peak_wavelength = "405 nm"
electrical_power = "10 W"
[use]
distance = "10 cm"
[[claims]]
id = "both"
text = "no ozone, safe for children"
[[claims]]
id = "ozone"
text = "no ozone"
''', "both.toml")
    v = {x["id"]: x for x in screen_listing_file(lst).to_dict()["claims"]}
    assert v["ozone"]["verdict"] == "holds"
    assert v["both"]["verdict"] != "holds"
    assert set(v["both"]["details"]["parts"]) == {"ozone-free", "safety"}
    assert "the safety part decides it" in v["both"]["basis"]


@pytest.mark.parametrize("text", ["UVC 30W", "30W UVC germicidal lamp"])
def test_a_wattage_beside_a_band_name_is_said_to_be_unchecked(text):
    """"UVC 30W" on a listing that states 5 W electrical: the 30 W is no optical power (a bare
    wattage is the electrical rating, as the listing reader takes it), so the verdict on the
    emission says it was not checked and that the listing's own figures disagree (our own
    reading). Before, the number was dropped without a word."""
    v = screened('[lamp]\ntechnology = "lp_mercury"\nelectrical_power = "5 W"\n'
                 'cover = "quartz"\n' + claims(text))["c1"]
    assert v.kind == "emission"
    assert "30 W in the claim is not checked" in v.basis
    assert "electrical power is 5 W: the two figures disagree" in v.basis, v.basis
    plain = screened(MERCURY + claims("UVC 254nm"))["c1"]
    assert "not checked" not in plain.basis
