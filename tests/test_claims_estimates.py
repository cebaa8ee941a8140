"""Safety claims on an estimate, and safety claims under the chosen exposure-limit set.

1. On a listing-only screening (a nominal ESTIMATE with min / typical / max cases) a safety
   claim gets no benefit of the doubt: it holds only when every case of every reading the
   listing does not refute stays within the limits. When the most likely case is within the
   limits but another case is not, the verdict is ``not-assessable`` (a measurement is
   needed), naming that case and its time to the limit.
2. Safety verdicts use the assessment's limit set (``--limits``), for ``assess --claims`` and
   for ``screen``, and their basis names a set other than the default.

Every listing here is invented (marked ``invented = true``). Expected figures are worked out
in the tests from the formulas named beside them, not copied from the program's output.
"""

from __future__ import annotations

import json
import math
from pathlib import Path

import numpy as np
import pytest
from typer.testing import CliRunner

from uvcheck.assessment import AssessOptions, assess
from uvcheck.claims import (RULE_SAFETY, RULE_SAFETY_ESTIMATE, judge, readings_from_listing,
                            readings_from_measurement)
from uvcheck.cli import app
from uvcheck.conditions import WORKDAY_S, Conditions
from uvcheck.io.listing import parse_listing, read_listing
from uvcheck.plausibility import screen_listing
from uvcheck.spectrum import Spectrum, integrate
from uvcheck.units import format_duration
from uvcheck.weighting import get_weighting

ROOT = Path(__file__).resolve().parent.parent
EX = ROOT / "examples"
ACGIH = "acgih_2022_far_uvc"
#: ACGIH 2022 eye TLV at 222 nm, 161 mJ/cm² = 1610 J/m² per day (from memory, via a secondary
#: source, as recorded in data/limits/acgih_2022_far_uvc.toml).
ACGIH_EYE_222_J_M2 = 1610.0
#: IEC 62471:2006 clause 4.3.1: E_S·t ≤ 30 J/m² within 8 h.
IEC_ACTINIC_J_M2 = 30.0
runner = CliRunner()


def listing(lamp: str, claims: str) -> object:
    return parse_listing('format = "uvcheck-listing/1"\n[product]\nname = "test lamp (invented)"\n'
                         'invented = true\n[lamp]\n' + lamp + claims, "test.toml")


def screened(lst, limit_set=None):
    readings = readings_from_listing(lst, screen_listing(lst))
    kw = {} if limit_set is None else {"limit_set": limit_set}
    return readings, judge(lst, readings, measured=False, **kw)


def t_max_actinic(reading, d_m):
    return (reading.hazards_at(d_m).get("hazards") or {}).get("actinic_uv", {}).get("t_max_s")


SAFE = '[[claims]]\nid = "s"\ntext = "safe for people and pets"\n'
#: A UV-C LED lamp behind polycarbonate: the cover's typical transmittance at 265 nm is nil,
#: its upper one is not (data/covers: min / typical / max), so the cases differ.
COVERED_UVC = ('technology = "uvc_led"\npeak_wavelength = "265 nm"\nelectrical_power = "10 W"\n'
               'cover = "polycarbonate"\n')


# --- 1. estimates ----------------------------------------------------------------------------

def test_safety_on_an_estimate_is_not_holds_when_the_max_case_exceeds():
    lst = listing(COVERED_UVC, SAFE)
    readings, res = screened(lst)
    by = {r.label: r for r in readings}
    # the premise, from the hazard module on each case at 0.2 m (IEC 62471 assessment distance)
    t_typ, t_max = t_max_actinic(by["as-stated/typical"], 0.2), t_max_actinic(by["as-stated/max"], 0.2)
    assert by["as-stated/typical"].likely
    assert t_typ is None or t_typ >= WORKDAY_S
    assert t_max is not None and t_max < WORKDAY_S
    v = res.verdicts[0]
    assert v.kind == "safety"
    assert v.verdict == "not-assessable"          # was 'holds' on the typical case alone
    assert v.reading == "as-stated/max"
    assert v.available.value == pytest.approx(t_max)
    assert v.ratio == pytest.approx(t_max / WORKDAY_S)
    assert "most likely case (as-stated/typical) only" in v.basis
    assert "as-stated/max case reaches" in v.basis and format_duration(t_max) in v.basis
    assert "0.2" in v.basis and "a measurement is needed" in v.basis
    assert v.missing and "measured spectrum" in v.missing[0]
    assert v.details["cases_exceeding"] == {"as-stated/max": pytest.approx(t_max)}
    assert v.rule == RULE_SAFETY_ESTIMATE


def test_audit_style_listing_cli_no_longer_says_holds(tmp_path):
    # the reported case: a "253.7 nm" UV-C LED bulb behind polycarbonate, listing only
    p = tmp_path / "bulb.toml"
    p.write_text('format = "uvcheck-listing/1"\n[product]\nname = "LED bulb (invented)"\n'
                 'invented = true\n[lamp]\npeak_wavelength = "253.7 nm"\n'
                 'electrical_power = "60 W"\ncover = "polycarbonate"\n[leds]\ncount = 72\n'
                 '[[claims]]\ntext = "safe for humans and pets"\n')
    out = tmp_path / "s.json"
    r = runner.invoke(app, ["screen", str(p), "--json", str(out), "--quiet"])
    assert r.exit_code in (0, 1), r.output
    d = json.loads(out.read_text())
    v = next(c for c in d["claims"] if c["kind"] == "safety")
    rows = {row["label"]: row for row in d["nominal"]["readings"]}
    t_max = rows["as-stated/max"]["t_max_s"]["actinic_uv"]
    assert rows["as-stated/max"]["risk_group"] == "RG3" and t_max < WORKDAY_S
    assert v["verdict"] == "not-assessable"
    assert v["reading"] == "as-stated/max" and format_duration(t_max) in v["basis"]
    assert "every case" in d["claims_summary"]["decision_rule"]


def test_safety_on_an_estimate_holds_when_every_case_is_within():
    lst = listing(COVERED_UVC.replace('"10 W"', '"0.5 W"'), SAFE)
    readings, res = screened(lst)
    for r in readings:
        t = t_max_actinic(r, 0.2)
        assert t is None or t >= WORKDAY_S, r.label
    v = res.verdicts[0]
    assert v.verdict == "holds"
    assert "in every case of the estimate" in v.basis
    assert all(r.label in v.basis for r in readings)
    assert v.rule == RULE_SAFETY_ESTIMATE


def test_safety_on_an_estimate_still_cannot_hold_when_the_likely_case_exceeds():
    # unchanged: the typical case alone already exceeds (no cover, E_S t_max < 8 h at 0.2 m)
    lst = listing('technology = "uvc_led"\npeak_wavelength = "265 nm"\nelectrical_power = "0.01 W"\n',
                  SAFE)
    readings, res = screened(lst)
    typ = next(r for r in readings if r.likely)
    t_typ = t_max_actinic(typ, 0.2)
    assert t_typ is not None and t_typ < WORKDAY_S
    v = res.verdicts[0]
    assert v.verdict == "cannot-hold" and v.reading == typ.label
    assert v.available.value == pytest.approx(t_typ) and v.rule == RULE_SAFETY


def test_refuted_readings_do_not_count_for_safety():
    # "254 nm" from 3.1 V dies: the LED voltage refutes the as-stated reading (photon energy
    # hc/λ = 4.88 eV at 254 nm > 3.1 eV), whose max case would exceed E_S within 8 h at 2 m;
    # the electrical-evidence reading stays within every limit in every case
    lst = listing('peak_wavelength = "254 nm"\nelectrical_power = "2 W"\nsource_size = "5 mm"\n'
                  '[leds]\ncount = 4\nforward_voltage = "3.1 V"\n',
                  '[[claims]]\nid = "s"\nkind = "safety"\nsafe_for = ["people"]\ndistance = "2 m"\n')
    readings, res = screened(lst)
    refuted = [r for r in readings if r.refuted]
    assert refuted and any((t_max_actinic(r, 2.0) or np.inf) < WORKDAY_S for r in refuted)
    v = res.verdicts[0]
    assert v.verdict == "holds"
    assert all(r.label not in v.basis for r in refuted)


def test_occupied_room_estimate_names_the_exceeding_case():
    # the invented far-UVC ceiling unit under the ACGIH set: typical case within, max not
    lst = read_listing(EX / "listings" / "faruv_222nm_ceiling_unit.toml")
    readings, res = screened(lst, ACGIH)
    v = next(x for x in res.verdicts if x.id == "occupied")
    c = next(x for x in lst.claims if x.id == "occupied")
    from uvcheck.claims import _room_box

    box = _room_box(c, lst)[0]
    times = {r.label: r.occupant_exposure(box, ACGIH)["time_to_limit_s"] for r in readings
             if not r.refuted}
    likely = next(r.label for r in readings if r.likely)
    assert times[likely] is None or times[likely] >= 8 * 3600
    worst = min((t, k) for k, t in times.items() if t is not None)
    assert worst[0] < 8 * 3600
    assert v.verdict == "not-assessable" and v.reading == worst[1]
    assert format_duration(worst[0]) in v.basis and ACGIH in v.basis


# --- 2. the limit set ------------------------------------------------------------------------

def line_222(e_W_m2: float) -> Spectrum:
    """A 222 nm line of irradiance e on an empty 180–3000 nm continuum (noise-free)."""
    return Spectrum(np.array([180.0, 3000.0]), np.zeros(2), "irradiance", lines=((222.0, e_W_m2),))


SAFE_1M = '[[claims]]\nid = "s"\nkind = "safety"\nsafe_for = ["people"]\ndistance = "1 m"\n'


@pytest.mark.parametrize("e", [0.1, 0.3])
def test_measured_222nm_line_uses_the_chosen_limit_set(e):
    # IEC 62471: t = 30 J/m² / (S(222)·E), S from uvcheck's S(λ) table (IEC 62471:2006 Table 4.1)
    # ACGIH 2022 (from memory): t = 1610 J/m² / E at 222 nm
    lst = listing("", SAFE_1M)
    rd = readings_from_measurement(line_222(e), Conditions(measurement_distance_m=1.0))
    s222 = float(get_weighting("S_actinic")(np.array([222.0]))[0])
    iec = judge(lst, rd, measured=True).verdicts[0]
    acg = judge(lst, rd, measured=True, limit_set=ACGIH).verdicts[0]
    assert iec.available.value == pytest.approx(IEC_ACTINIC_J_M2 / (s222 * e), rel=1e-6)
    assert acg.available.value == pytest.approx(ACGIH_EYE_222_J_M2 / e, rel=1e-6)
    assert iec.verdict == acg.verdict == "cannot-hold"
    assert ACGIH in acg.basis and "E_S,eq" in acg.basis
    assert "limit set" not in iec.basis            # the default set is not named
    assert acg.details["limit_set"] == ACGIH


def test_limit_set_can_turn_the_verdict():
    # 0.02 W/m² at 222 nm: IEC t = 30/(0.131·0.02) ≈ 3.2 h < 8 h; ACGIH 1610/0.02 s ≈ 22 h
    lst = listing("", SAFE_1M)
    rd = readings_from_measurement(line_222(0.02), Conditions(measurement_distance_m=1.0))
    assert judge(lst, rd, measured=True).verdicts[0].verdict == "cannot-hold"
    v = judge(lst, rd, measured=True, limit_set=ACGIH).verdicts[0]
    assert v.verdict == "holds" and ACGIH in v.basis


def test_assess_passes_its_limit_set_to_the_claims():
    lst = listing("", SAFE_1M)
    spec = line_222(0.1)
    cond = Conditions(measurement_distance_m=1.0)
    a = assess(spec, cond, options=AssessOptions(limit_set=ACGIH, uncertainty=False), listing=lst)
    v = a.sections["claims"].verdicts[0]
    assert v.available.value == pytest.approx(ACGIH_EYE_222_J_M2 / 0.1, rel=1e-6)
    assert ACGIH in v.basis


def test_unknown_limit_set_is_refused():
    from uvcheck.errors import ConfigurationError

    lst = listing("", SAFE_1M)
    rd = readings_from_measurement(line_222(0.1), Conditions(measurement_distance_m=1.0))
    with pytest.raises(ConfigurationError, match="available"):
        judge(lst, rd, measured=True, limit_set="no_such_set")


def _safety_basis(args, tmp_path):
    out = tmp_path / f"o{len(list(tmp_path.iterdir()))}.json"
    r = runner.invoke(app, args + ["--json", str(out), "--quiet"])
    assert r.exit_code in (0, 1), r.output
    d = json.loads(out.read_text())
    return next(c for c in d["claims"] if c["id"] == "occupied")


def test_cli_assess_occupied_room_claim_follows_limits(tmp_path):
    # the invented far-UVC unit measured 1 m below it; occupant worst case from the room model.
    # Under ACGIH (data/limits/acgih_2022_far_uvc.toml header): E_S,eq = 30 J/m² ×
    # (E(200–235 nm)/1610 J/m² + E_S(235–400 nm)/30 J/m²); both this and the room model's
    # E_S (S(λ) over 180–400 nm) scale with the same eye irradiance, so the ACGIH 8-h share
    # is the IEC one × E_S,eq/E_S of the measured spectrum.
    from uvcheck.io.reader import read_spectrum

    base = ["assess", str(EX / "spectra" / "faruv_222nm_unit.csv"), "--claims",
            str(EX / "listings" / "faruv_222nm_ceiling_unit.toml"), "--no-uncertainty"]
    iec = _safety_basis(base, tmp_path)
    acg = _safety_basis(base + ["--limits", ACGIH], tmp_path)
    assert iec["verdict"] == "cannot-hold" and "limit set" not in iec["basis"]
    assert ACGIH in acg["basis"] and acg["basis"] != iec["basis"]
    t_iec = iec["available"]["value"]
    spec, _ = read_spectrum(EX / "spectra" / "faruv_222nm_unit.csv")
    s = get_weighting("S_actinic")
    e_s = integrate(spec, 180.0, 400.0, s).value
    e_eq = (IEC_ACTINIC_J_M2 * integrate(spec, 200.0, 235.0).value / ACGIH_EYE_222_J_M2
            + integrate(spec, 235.0, 400.0, s).value)
    share = (8 * 3600 / t_iec) * e_eq / e_s
    assert acg["details"]["share_of_limit"] == pytest.approx(share, rel=2e-2)
    assert acg["verdict"] == ("holds" if share <= 1 else "cannot-hold")


def test_cli_screen_follows_limits(tmp_path):
    base = ["screen", str(EX / "listings" / "faruv_222nm_ceiling_unit.toml")]
    iec = _safety_basis(base, tmp_path)
    acg = _safety_basis(base + ["--limits", ACGIH], tmp_path)
    assert "limit set" not in iec["basis"] and ACGIH in acg["basis"]
    assert iec["basis"] != acg["basis"]


def test_a_safety_claim_resting_on_a_stated_far_uvc_filter_is_not_confirmed():
    """An estimate of a filtered KrCl* lamp is within the limits because the listing says a
    filter removes the longer-wavelength UV-C; a listing cannot show that filter, so the safety
    claim is not-assessable, not 'holds' (our own rule, as for a mercury lamp's ozone-free
    envelope). Invented listing; far-UVC limits of the ACGIH 2022 set are from memory."""
    from uvcheck.io.listing import parse_listing
    from uvcheck.screening import screen_listing_file

    text = '''format = "uvcheck-listing/1"
[product]
name = "filtered far-UVC test unit (invented)"
invented = true
[lamp]
technology = "krcl_excimer"
peak_wavelength = "222 nm"
electrical_power = "5 W"
filtered = true
cover = "quartz"
[use]
distance = "2.5 m"
[[claims]]
id = "safe"
text = "safe for people and pets"
'''
    res = screen_listing_file(parse_listing(text, "f.toml"), limit_set="acgih_2022_far_uvc")
    v = {x["id"]: x for x in res.to_dict()["claims"]}["safe"]
    assert v["verdict"] == "not-assessable"
    assert "filter the listing states" in v["basis"]
    assert v["missing"] == ["a measured spectrum of the lamp as sold, through its filter"]


def test_a_room_claim_uses_the_flux_the_lamp_emits_not_a_point_source_s():
    """The room used for a coverage claim may place the lamp favourably, but its flux comes
    from the irradiance with the lamp's own pattern: a Lambertian emitter's on-axis irradiance
    E at d gives Φ = E·πd², a point source's E·4πd² (NOTES-style formulas, analytic). Before,
    every lamp was turned into flux as a point source: a Lambertian LED got 4× its flux, and an
    invented 0.5 W UV-C LED panel 'held' for a 4000 m² room. Invented listing."""
    from uvcheck import room as rm
    from uvcheck.screening import screen_listing_file
    from uvcheck.spectrum import total_integral

    text = '''format = "uvcheck-listing/1"
[product]
name = "275 nm LED panel (invented)"
invented = true
[lamp]
technology = "uvc_led"
peak_wavelength = "275 nm"
optical_power = "0.5 W"
optical_power_band = "UV-C"
cover = "quartz"
emitter = "lambertian"
[use]
room_height = "2.5 m"
[[claims]]
id = "room"
text = "for rooms up to 4000 m²"
'''
    lst = parse_listing(text, "panel.toml")
    v = {x["id"]: x for x in screen_listing_file(lst).to_dict()["claims"]}["room"]
    assert v["verdict"] == "cannot-hold", v["basis"]
    r = next(x for x in readings_from_listing(lst, screen_listing(lst)) if x.spectrum.is_absolute)
    box = rm.Box(10.0, 10.0, 2.5)
    centre = total_integral(r._room_lamp(box, "centre").flux_spectrum)
    e_axis = total_integral(r.spectrum)
    assert centre == pytest.approx(e_axis * math.pi * r.d_ref ** 2, rel=1e-6)


def test_every_case_rule_is_one_rule_for_distance_and_occupant():
    """Our own rule (DEVELOPERS.md, honest results): on an estimate, a safety claim holds only
    when every case stays within the limits; a case that exceeds a limit, or whose figure is
    not confirmed (not assessed, or a lower bound), leaves it not assessable. One helper,
    claims._other_cases, applies it to the distance and the room-occupant branches alike
    (before, the occupant branch let an unconfirmed case pass)."""
    from types import SimpleNamespace

    from uvcheck.claims import _other_cases

    c = SimpleNamespace(id="s", kind="safety", text="safe in occupied rooms")
    ev = SimpleNamespace(measured=False, readings=(1,), limit_set_id="iec62471_2006",
                         limits_named=lambda: "")
    likely = SimpleNamespace(label="typical", evidence="nominal estimate")
    low, high = SimpleNamespace(label="min"), SimpleNamespace(label="max")
    t = 8 * 3600.0

    def probe(table):
        return lambda x: table[x.label]

    ok = {"min": (9e4, "E_S", True), "max": (4e4, "E_S", True)}
    v, shortest = _other_cases(c, ev, likely, t, "for an occupant", [low, high], probe(ok), [], {})
    assert v is None and shortest == (4e4, high)
    unconfirmed = {"min": (9e4, "E_S", True), "max": (4e4, "E_S", False)}
    v, _ = _other_cases(c, ev, likely, t, "for an occupant", [low, high], probe(unconfirmed),
                        [], {})
    assert v.verdict == "not-assessable" and "max could not be fully assessed" in v.basis
    exceeds = {"min": (9e4, "E_S", True), "max": (600.0, "the daily actinic UV limit", True)}
    v, _ = _other_cases(c, ev, likely, t, "for an occupant", [low, high], probe(exceeds), [], {})
    assert v.verdict == "not-assessable" and "the max case reaches" in v.basis
