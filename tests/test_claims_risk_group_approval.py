"""Claims of a risk group ("RG0", "Exempt (EN 62471)") and of an agency approval ("EPA
approved", "FDA approved").

Sources:
* IEC 62471:2006 clause 6 and Table 6.1: a lamp's risk group is the highest of its hazards'
  groups at the assessment distance (200 mm for lamps not for general lighting). The E_S
  limits by group (Exempt 0.001 W m⁻², RG1 0.003 W m⁻², RG2 0.03 W m⁻²) are from memory, as
  data/limits/iec62471_2006.toml records them: 30 J m⁻² over the 30 000, 10 000 and 1000 s
  time bases [derived].
* Agency practice, as the project's practice notes summarise public guidance: in the US a UV
  light sold with germ-killing claims is a pesticide device, which carries an EPA
  establishment number, and that number is not an approval. FDA clearance numbers of medical
  devices: from memory. Not legal advice.
Spectra and listings are invented.
"""

from __future__ import annotations

import numpy as np
import pytest

from uvcheck.claims import judge, readings_from_measurement
from uvcheck.conditions import Conditions
from uvcheck.errors import InputFormatError
from uvcheck.io.listing import parse_claim_text, parse_listing
from uvcheck.spectrum import Spectrum


def listing(claims: str):
    return parse_listing('format = "uvcheck-listing/1"\n[product]\nname = "test lamp (invented)"\n'
                         'invented = true\n' + claims, "test.toml")


def hg_line(e_W_m2: float) -> Spectrum:
    """A 253.7 nm line on an empty 200–3000 nm continuum (every hazard's range covered)."""
    return Spectrum([200.0, 3000.0], [0.0, 0.0], "irradiance", lines=((253.7, e_W_m2),))


def verdicts(spec, lst, **cond):
    c = Conditions(measurement_distance_m=0.2, source_size_m=0.02, **cond)
    return {v.id: v for v in judge(lst, readings_from_measurement(spec, c), measured=True).verdicts}


@pytest.mark.parametrize("text,group", [
    ("Risk group: Exempt (EN 62471)", "Exempt"), ("RG0", "Exempt"), ("RG 1", "RG1"),
    ("Risk Group 2", "RG2"), ("risk group III", "RG3"), ("photobiological safety: exempt group", "Exempt"),
])
def test_risk_group_wordings(text, group):
    c = parse_claim_text(text)
    assert c.kind == "risk-group" and c.risk_group == group


@pytest.mark.parametrize("text,agency", [("EPA approved", "EPA"), ("approved by the FDA", "FDA"),
                                         ("FDA-cleared", "FDA"), ("EPA registered", "EPA")])
def test_approval_wordings(text, agency):
    c = parse_claim_text(text)
    assert c.kind == "approval" and c.agency == agency


@pytest.mark.parametrize("text", ["EPA Est. No. 12345-CN-001", "Exempt from tax"])
def test_not_approval_or_risk_group(text):
    assert parse_claim_text(text).kind == "unrecognised"


def test_structured_claims_and_their_errors():
    lst = listing('[[claims]]\nid = "g"\nkind = "risk-group"\nrisk_group = "RG1"\n'
                  '[[claims]]\nid = "a"\nkind = "approval"\nagency = "epa"\n')
    g, a = lst.claims
    assert (g.risk_group, a.agency) == ("RG1", "EPA")
    with pytest.raises(InputFormatError, match="risk group"):
        listing('[[claims]]\nkind = "risk-group"\nrisk_group = "RG7"\n')
    with pytest.raises(InputFormatError, match="agency"):
        listing('[[claims]]\nkind = "approval"\nagency = "ACME"\n')


# E_S of a 253.7 nm line is E·S(253.7) with S(253.7) ≈ 0.4984 (log-linear between S(250) =
# 0.43 and S(254) = 0.5, IEC 62471 Table 4.1): 1e-3 W/m² gives E_S ≈ 5e-4 (Exempt,
# limit 0.001), 4e-3 W/m² gives E_S ≈ 2e-3 (RG1, limit 0.003), 1 W/m² RG3.
CLAIMS = ('[[claims]]\nid = "exempt"\ntext = "Exempt risk group (IEC 62471)"\n'
          '[[claims]]\nid = "rg1"\ntext = "RG1"\n')


def test_stated_group_against_the_measured_group():
    v = verdicts(hg_line(1e-3), listing(CLAIMS))
    assert v["exempt"].verdict == "holds" and v["rg1"].verdict == "holds"
    v = verdicts(hg_line(4e-3), listing(CLAIMS))
    assert v["exempt"].verdict == "cannot-hold" and "RG1" in v["exempt"].basis
    assert "E_S" in v["exempt"].basis
    assert v["rg1"].verdict == "holds"
    v = verdicts(hg_line(1.0), listing(CLAIMS))
    assert v["rg1"].verdict == "cannot-hold" and "RG3" in v["rg1"].basis


def test_a_group_known_only_as_a_lower_bound_is_not_assessable():
    # measured from 200 to 800 nm: the infrared hazards are open, the group a lower bound
    spec = Spectrum([200.0, 800.0], [0.0, 0.0], "irradiance", lines=((253.7, 1e-3),))
    v = verdicts(spec, listing(CLAIMS))
    assert v["exempt"].verdict == "not-assessable"
    assert "could be as high as" in v["exempt"].basis


def test_no_measurement_distance_no_group():
    lst = listing(CLAIMS)
    r = readings_from_measurement(hg_line(1e-3), Conditions())
    v = {x.id: x for x in judge(lst, r, measured=True).verdicts}
    assert v["exempt"].verdict == "not-assessable" and "--distance" in v["exempt"].missing


def test_approval_verdicts_need_no_lamp_data():
    lst = listing('[[claims]]\nid = "epa"\ntext = "EPA approved"\n'
                  '[[claims]]\nid = "fda"\ntext = "FDA approved"\n')
    v = verdicts(hg_line(1e-3), lst)
    assert v["epa"].verdict == "unlikely" and "establishment number" in v["epa"].basis
    assert v["fda"].verdict == "not-assessable" and "from memory" in v["fda"].basis
    # a listing with no lamp data at all gets the same verdicts
    from uvcheck.screening import screen_listing_file

    d = screen_listing_file(lst).to_dict()
    got = {c["id"]: c["verdict"] for c in d["claims"]}
    assert got == {"epa": "unlikely", "fda": "not-assessable"}


def test_estimate_every_case_must_be_within_the_stated_group():
    # an invented 254 nm tube listing with a stated group: min / typical / max cases differ
    from uvcheck.screening import screen_listing_file

    lst = parse_listing('format = "uvcheck-listing/1"\n[product]\nname = "tube (invented)"\n'
                        'invented = true\n[lamp]\ntechnology = "lp_mercury"\n'
                        'electrical_power = "15 W"\n[[claims]]\nid = "g"\ntext = "RG1"\n'
                        '[[claims]]\nid = "g3"\ntext = "RG3"\n', "t.toml")
    d = screen_listing_file(lst).to_dict()
    v = {c["id"]: c for c in d["claims"]}
    assert v["g"]["verdict"] == "cannot-hold"     # a 15 W mercury tube is RG3 at 200 mm
    assert v["g3"]["verdict"] == "holds" and "every case" in v["g3"]["basis"]
