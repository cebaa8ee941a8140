"""Claim verdict wording (audit of issue 5): the decision rule and its hard-bound exception,
the rule named in every basis, no repeated texts, 'exceeds' for a ceiling, vague times, the
nominal min / typical / max cases in the terminal, and no estimate labelled 'measured'.

Expected values and their sources are named beside each test; the listings are invented.
"""

from __future__ import annotations

import json
import re
from pathlib import Path

import numpy as np
import pytest
from conftest import gaussian
from typer.testing import CliRunner

from uvcheck.claims import MARGIN, judge, readings_from_listing, readings_from_measurement
from uvcheck.cli import app
from uvcheck.conditions import Conditions
from uvcheck.io.listing import VAGUE_TIMES, parse_claim_text, parse_listing, read_listing
from uvcheck.plausibility import check_power_per_led, screen_listing
from uvcheck.spectrum import Spectrum

ROOT = Path(__file__).resolve().parent.parent
LISTINGS = ROOT / "examples" / "listings"
runner = CliRunner()


def listing(text: str):
    return parse_listing('format = "uvcheck-listing/1"\n[product]\nname = "test lamp (invented)"\n'
                         + text, "test.toml")


def screen_verdicts(lst):
    return judge(lst, readings_from_listing(lst, screen_listing(lst)), measured=False)


#: Invented listing with a UV-C LED claim of 5 W optical from 8 W, said twice (lamp data and
#: claim), and a vague time ("in seconds").
VAGUE = """
[lamp]
peak_wavelength = "254nm"
electrical_power = "8 W"
optical_power = "5 W"
[leds]
count = 4
[[claims]]
id = "p"
text = "5 W UV-C output"
[[claims]]
id = "e"
text = "60 % efficient"
[[claims]]
id = "sterile"
text = "sterilises in seconds"
"""


# --- 1. the decision rule and its exception -------------------------------------------------

def test_hard_bound_is_stated_and_decides_within_the_margin():
    # E = hc/λ (scipy.constants): 254 nm needs 4.881 eV; 3.1 V per die gives 3.1/4.881 = 0.635,
    # short by 1.57×, which is within the 2× margin (common practice) yet a hard physical bound.
    lst = read_listing(LISTINGS / "uvc_box_48_leds_8w.toml")
    res = screen_verdicts(lst)
    em = next(v for v in res.verdicts if v.kind == "emission")
    assert em.verdict == "cannot-hold"
    assert 1.0 / MARGIN < em.ratio < 1.0
    assert em.ratio == pytest.approx(3.1 / 4.881, rel=2e-3)
    assert "hard bound" in em.rule and "photon energy" in em.rule
    assert em.basis.endswith("decided by " + em.rule)
    rule = res.decision_rule
    assert "more than 2.0×" in rule and "hard bound" in rule and "at any shortfall" in rule
    kill = next(v for v in res.verdicts if v.kind == "inactivation")
    assert "benefit-of-the-doubt" in kill.rule and "2.0×" in kill.rule


@pytest.mark.parametrize("name", sorted(p.name for p in LISTINGS.glob("*.toml")))
def test_every_verdict_names_its_rule(name):
    lst = read_listing(LISTINGS / name)
    for v in screen_verdicts(lst).verdicts:
        if v.verdict == "not-assessable":
            continue
        assert v.rule, (v.id, v.basis)
        assert v.basis.endswith(f"decided by {v.rule}")
        assert v.basis.count("decided by") == 1
        assert v.to_dict()["rule"] == v.rule


def test_rule_of_thumb_and_technology_data_never_cannot_hold():
    # check_power_per_led is a rule of thumb (common practice): at most 'unlikely'
    f = check_power_per_led(60.0, 4, "uvc_led")
    assert f.status == "unlikely" and "rule of thumb" in f.rule


# --- 3. no duplicated texts -------------------------------------------------------------------

def test_coverage_does_not_repeat_the_kill_claim():
    lst = read_listing(LISTINGS / "uvc_box_48_leds_8w.toml")
    vs = {v.kind: v for v in screen_verdicts(lst).verdicts}
    kill, cov = vs["inactivation"], vs["coverage"]
    assert cov.basis != kill.basis
    assert kill.basis.split("; decided by")[0] not in cov.basis
    assert "20 m²" in cov.basis and "same room" in cov.basis and kill.id in cov.basis
    assert cov.ratio == pytest.approx(kill.ratio)      # the same room, the same numbers
    assert cov.details["same_room_as_claim"] is True


def test_coverage_of_another_room_keeps_its_numbers():
    # the kill claim names its own distance, so the room claim is judged on its own room
    lst = listing("""
[lamp]
technology = "lp_mercury"
optical_power = "4 W"
[[claims]]
id = "kill"
text = "kills 99.9 % of germs in 30 minutes at 1 m"
[[claims]]
id = "room"
text = "for rooms up to 40 m²"
""")
    vs = {v.id: v for v in screen_verdicts(lst).verdicts}
    assert vs["room"].details["same_room_as_claim"] is False
    assert vs["room"].basis.startswith("covering 40 m² means doing what")
    assert "mJ/cm²" in vs["room"].basis and vs["room"].basis != vs["kill"].basis


def test_coverage_takes_the_first_kill_claim_that_can_be_judged():
    # A listing whose first kill claim names an organism uvcheck's table lacks (dust mites)
    # and whose second names bacteria: the room claim used to take the first and stay open
    # ("no data for 'dust mites'"); it now takes the second, which can decide it. With the
    # mites claim alone it stays open, and says why. (uvcheck's own reading of a room claim.)
    base = """
[lamp]
technology = "lp_mercury"
optical_power = "4 W"
[[claims]]
id = "mites"
text = "removes 99.99 % of dust mites in 15 minutes"
"""
    bacteria = """
[[claims]]
id = "bact"
text = "kills 99.9 % of bacteria in 30 minutes"
"""
    room = """
[[claims]]
id = "room"
text = "for rooms up to 40 m²"
"""
    vs = {v.id: v for v in screen_verdicts(listing(base + bacteria + room)).verdicts}
    assert vs["mites"].verdict == "not-assessable"
    assert vs["room"].details["judged_as"] == "bact"
    assert vs["room"].verdict != "not-assessable" and vs["room"].ratio is not None
    assert "'kills 99.9 % of bacteria in 30 minutes'" in vs["room"].basis
    vs = {v.id: v for v in screen_verdicts(listing(base + room)).verdicts}
    assert vs["room"].verdict == "not-assessable"
    assert vs["room"].details["judged_as"] == "mites" and "dust mites" in vs["room"].basis


def test_other_findings_are_listed_once(tmp_path):
    # 5 W optical from 8 W: the UV-C LED flag of 10 % (data/technologies.toml) allows 0.8 W,
    # short by 6.25×; the claim 'p' states the same 5 W as lamp.optical_power.
    path = tmp_path / "vague.toml"
    path.write_text('format = "uvcheck-listing/1"\n[product]\nname = "t (invented)"\n'
                    'invented = true\n' + VAGUE, encoding="utf-8")
    r = runner.invoke(app, ["screen", str(path)])
    assert r.exit_code == 0, r.output
    claims = r.output.split("Claims of")[1].split("\nNominal estimate")[0]
    flat = " ".join(claims.split())
    assert flat.count("short by 6.25×") == 1
    assert flat.count("short by 6×") == 1              # the efficiency claim, not repeated
    msgs = [" ".join(m.split()) for m in re.split(r"\n    - ", claims.split("Other findings")[1])[1:]]
    assert len(msgs) == len(set(msgs)) and msgs


# --- 4. wording ------------------------------------------------------------------------------

def test_power_per_led_says_exceeds():
    # 5 W over 4 LEDs = 1.25 W each; one UV-C package emits about 0.3 W at most (common
    # practice, data/emitters/led_packages.toml): 1.25 / 0.3 = 4.17×
    f = check_power_per_led(5.0, 4, "uvc_led", optical=True)
    assert f.status == "unlikely"
    assert "exceeds it by 4.17×" in f.message and "short by" not in f.message


@pytest.mark.parametrize("text,seconds,word", [
    ("sterilises in seconds", 60.0, "seconds"),
    ("kills 99.9 % of germs within minutes", 3600.0, "minutes"),
    ("kills bacteria in a few seconds", 60.0, "seconds"),
    ("kills germs instantly", 1.0, "instantly"),
    ("kills 99.9 % of germs in 30 seconds", 30.0, None),
])
def test_vague_times_are_read_as_their_longest_time(text, seconds, word):
    # 'in seconds' = less than a minute etc.: uvcheck's reading (VAGUE_TIMES), not a standard
    c = parse_claim_text(text)
    assert c.kind == "inactivation"
    assert c.time_s == seconds and c.time_word == word
    assert "time" not in c.missing()
    if word:
        assert VAGUE_TIMES[word][0] == seconds
        assert "not quantified" in c.note


def test_vague_time_verdict_says_not_quantified():
    lst = listing(VAGUE)
    v = next(x for x in screen_verdicts(lst).verdicts if x.id == "sterile")
    assert v.verdict == "not-assessable"
    assert "time" not in v.missing
    assert "not quantified" in v.basis and "1 min" in v.basis
    # with a reduction, organism and distance it is judged at 1 min, and says so
    lst = listing('[lamp]\ntechnology = "lp_mercury"\noptical_power = "4 W"\n'
                  '[[claims]]\nid = "k"\ntext = "kills 99.9 % of germs in seconds at 1 m"\n')
    v = screen_verdicts(lst).verdicts[0]
    assert v.verdict in ("holds", "unlikely", "cannot-hold")
    assert v.details["time_s"] == 60.0
    assert "in 1 min ('seconds', not quantified)" in v.basis
    assert any("not quantified" in a for a in v.assumptions)


def test_safety_claim_takes_no_vague_time():
    assert parse_claim_text("safe for people in seconds").time_s is None


# --- 5. no doubled parenthesis ---------------------------------------------------------------

def test_no_uvc_basis_has_no_doubled_parenthesis():
    # a 396 nm LED band (invented) with no UV-C at all, stated as 254 nm
    wl = np.arange(200.0, 800.5, 0.5)
    spec = Spectrum(wl, gaussian(wl, 396.0, 5.0, 10.0), "irradiance")
    lst = listing('[[claims]]\nid = "c1"\ntext = "UV-C 254nm"\n')
    v = judge(lst, readings_from_measurement(spec, Conditions(measurement_distance_m=0.1)),
              measured=True).verdicts[0]
    assert v.verdict == "cannot-hold"
    assert v.basis.startswith("stated 254 nm, but the output peaks at 396")
    for bad in (".)", ").)", ".;", "UV-C (No germicidal"):
        assert bad not in v.basis
    assert v.basis.count("(") == v.basis.count(")")
    # the germicidal sentence as a clause: no leading 'No germicidal UV-C:', no final stop
    from dataclasses import replace

    from uvcheck.germicidal import evaluate_germicidal

    g = evaluate_germicidal(Spectrum([200.0, 800.0], [0.0, 0.0], "irradiance",
                                     lines=((253.7, 0.5),)), Conditions(measurement_distance_m=1.0))
    g = replace(g, statement="No germicidal UV-C: the apparent UV-C is likely stray light "
                             "(flat level (x) at y).")
    assert g.statement_clause() == "the apparent UV-C is likely stray light (flat level (x) at y)"
    assert g.statement_clause(keep_head=True) == ("No germicidal UV-C: the apparent UV-C is "
                                                   "likely stray light (flat level (x) at y)")


# --- 2. nominal ranges in the terminal, never 'measured' ------------------------------------

def test_screen_terminal_shows_the_nominal_cases_and_no_measured_status():
    r = runner.invoke(app, ["screen", str(LISTINGS / "uvc_box_48_leds_8w.toml")])
    assert r.exit_code == 0, r.output
    out = r.output
    nom = out.split("\nNominal estimate")[1].split("\nEmission by band")[0]
    assert "min / typical / max" in nom
    rows = {ln.split()[0]: ln for ln in nom.splitlines() if ln.startswith("  as-stated")
            or ln.startswith("  electrical-evidence")}
    assert set(rows) == {"as-stated", "electrical-evidence"}
    # electrical evidence: 8 W × the violet-LED efficiency 30 / 45 / 65 % (data/technologies.toml,
    # where these figures are marked from memory)
    assert "2.4 / 3.6 / 5.2" in rows["electrical-evidence"]
    assert "refuted" in nom and "electrical-evidence/typical" in nom
    bands = out.split("Emission by band")[1].split("(UV-C is integrated")[0]
    haz = out.split("Photobiological hazards")[1].split("Overall risk group")[0]
    for section in (bands, haz):
        assert not re.search(r"\bmeasured\s*$", section, re.M), section
    assert "estimate" in bands


def test_screen_json_has_the_risk_group_per_case():
    r = runner.invoke(app, ["screen", str(LISTINGS / "uvc_box_48_leds_8w.toml"), "--json", "-"])
    assert r.exit_code == 0
    d = json.loads(r.output[r.output.index("{"):])
    rows = {x["label"]: x for x in d["nominal"]["readings"]}
    assert set(rows) >= {f"electrical-evidence/{c}" for c in ("min", "typical", "max")}
    typ = rows["electrical-evidence/typical"]
    # the most likely case is the one the hazard table shows
    assert typ["risk_group"] == d["risk_group"]["group"]
    assert typ["hazard_distance_m"] == pytest.approx(0.2)


# --- 6. --fail-on is a threshold -------------------------------------------------------------

@pytest.mark.parametrize("command", ["screen", "assess"])
def test_fail_on_help_says_or_worse(command):
    r = runner.invoke(app, [command, "--help"], terminal_width=200)
    text = " ".join(r.output.split())
    assert "this verdict or a worse one" in text


def _mercury_tube_claim(text: str):
    """The verdict on one claim of an invented listing of a 4 W (optical) mercury tube."""
    lst = listing(f"""
[lamp]
technology = "lp_mercury"
optical_power = "4 W"
[[claims]]
id = "s"
text = "{text}"
""")
    return next(x for x in screen_verdicts(lst).verdicts if x.id == "s")


@pytest.mark.parametrize("text", [
    "Safe to use around children when nobody is in the room",
    "safe for pets if no one is present",
    "Safe for your family: use only in unoccupied rooms",
    "harmless to people - leave the room during use",
    "safe for kids as long as the room is empty",
    "Ne pas regarder la lampe, sans danger seulement pièce vide",
    "Sicher für Kinder, nur in leeren Räumen verwenden",
])
def test_a_safety_claim_for_an_empty_room_is_not_decided_by_exposure_limits(text):
    # With nobody in the room nobody is exposed, so the exposure limits cannot decide a
    # claim made for that case: it used to be 'cannot-hold' on the lamp's E_S at 0.2 m. It
    # is 'not-assessable', names the safeguards that decide it, and keeps the lamp's figures
    # for anyone who is there. (uvcheck's own reading of plain English.)
    v = _mercury_tube_claim(text)
    assert v.kind == "safety" and v.verdict == "not-assessable", v.basis
    assert v.basis.startswith("the claim is made for an empty room")
    assert "for anyone who is there:" in v.basis and "limit" in v.basis
    assert any("interlock" in m for m in v.missing)


def test_a_plain_safety_claim_is_still_judged_on_the_limits():
    v = _mercury_tube_claim("safe for children and pets")
    assert v.verdict == "cannot-hold" and "empty room" not in v.basis


@pytest.mark.parametrize("text", ["safe for humans and pets, no need to leave the room",
                                  "You don't have to leave the room, safe for kids",
                                  "Safe for pets (do not look directly at the lamp)"])
def test_a_safety_claim_for_people_who_stay_is_judged_on_the_limits(text):
    # "no need to leave the room" was read as "leave the room", an empty-room claim, and a
    # caution beside a safety claim dropped it: both are judged on the 4 W tube's E_S now
    v = _mercury_tube_claim(text)
    assert v.kind == "safety" and v.verdict == "cannot-hold", v.basis
    assert "empty room" not in v.basis


@pytest.mark.parametrize("text", [
    "Safe design: automatic shut-off when a human body is detected (radar sensor)",
    "safe for pets thanks to the PIR sensor",
    "Child-safe: switches off when the lid is opened",
    "safe for people, with a safety interlock",
])
def test_a_safety_claim_that_rests_on_a_safeguard_is_not_decided_by_exposure_limits(text):
    # A sensor or an interlock that switches the lamp off is what such a claim rests on, and
    # neither a spectrum nor a listing tests it: 'not-assessable', naming the test that
    # would decide it, with the lamp's time to the limit (how fast the safeguard must act).
    # (uvcheck's own reading of plain English.)
    v = _mercury_tube_claim(text)
    assert v.kind == "safety" and v.verdict == "not-assessable", v.basis
    assert v.basis.startswith("the claim rests on a safeguard") and "reached in" in v.basis
    assert any("test of the safeguard" in m for m in v.missing)


def test_safeguard_words_elsewhere_do_not_make_a_safeguard_claim():
    v = _mercury_tube_claim("safe for people: stops germs on surfaces people touch")
    assert v.verdict == "cannot-hold" and "safeguard" not in v.basis
