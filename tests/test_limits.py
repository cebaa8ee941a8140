"""Limit sets as data: checksums, provenance labels, Table 6.1 against the limit formulas.

Expected values and their sources:
- IEC 62471:2006 Table 6.1 cells and time bases, as recorded in the project reference notes
  (section 3): only the L_B row was read in a document, the other cells are from memory; each
  must equal its clause 4.3 limit formula at the group's time base, to the printed precision.
- Exposure-limit formulas: IEC 62471:2006 clause 4.3 (reference notes section 2).
- ICNIRP 2013 retinal thermal: 2.0e4/(α t^0.25), flattening at 2.8e4/α from 0.25 s, weak
  visual stimulus 6300/α (reference notes section 2, "doc").
- ACGIH 2022 far-UVC TLVs at 222 nm: eye 161 mJ/cm², skin 479 mJ/cm² (reference notes, "from
  memory, secondary").
"""

from __future__ import annotations

import math
import tomllib

import pytest

from uvcheck.data_files import data_path, read_toml, sha256_of
from uvcheck.errors import ConfigurationError
from uvcheck.limits import (DEFAULT_LIMIT_SET, GROUPS, HAZARD_IDS, available_limit_sets,
                            get_limit_set, solid_angle_sr)


def round_sig(x: float, n: int) -> float:
    """x rounded to n significant figures (to compare with a printed table cell)."""
    return float(f"{x:.{n}g}")


# ---------------------------------------------------------------------------------------------
# Registry and provenance
# ---------------------------------------------------------------------------------------------

def test_registry_checksums_match_files():
    reg = read_toml("limits/limits.toml")
    assert set(reg) == {"iec62471_2006", "icnirp_2013", "acgih_2022_far_uvc"}
    for set_id, entry in reg.items():
        assert sha256_of("limits/" + entry["file"]) == entry["sha256"], set_id


def test_files_parse_and_carry_a_provenance_header():
    for set_id in available_limit_sets():
        path = data_path("limits", read_toml("limits/limits.toml")[set_id]["file"])
        text = path.read_text(encoding="utf-8")
        assert text.startswith("#"), "provenance header first"
        assert "from memory" in text.lower()
        tomllib.loads(text)  # valid TOML


def test_default_set_first_and_all_load():
    ids = available_limit_sets()
    assert ids[0] == DEFAULT_LIMIT_SET == "iec62471_2006"
    for set_id in ids:
        ls = get_limit_set(set_id)
        assert {e.hazard_id for e in ls.entries.values()} == set(HAZARD_IDS)
        assert ls.describe()["sha256"]


def test_unknown_set_names_the_available_ones():
    with pytest.raises(ConfigurationError, match="unknown limit set 'iec62471'.*available: "
                                                 "iec62471_2006"):
        get_limit_set("iec62471")


def test_values_from_memory_are_marked():
    # reference notes section 2: small-source blue light, retinal thermal, weak stimulus and IR
    # eye limits are [memory]; the data must say so beside them.
    ls = get_limit_set("iec62471_2006")
    for key in ("blue_light_small_source", "retinal_thermal", "retinal_thermal_weak_stimulus",
                "ir_eye"):
        assert "from memory" in ls.hazard(key).source, key
    # Table 6.1: only the L_B row was read in a document
    for key, e in ls.entries.items():
        for g in e.groups:
            if key == "blue_light":
                assert g.source.startswith("doc"), (key, g.group)
            else:
                assert "from memory" in g.source, (key, g.group)
    # documented limits
    for key in ("actinic_uv", "near_uv", "blue_light", "skin_thermal"):
        assert ls.hazard(key).source.startswith("doc"), key


def test_derived_sets_say_their_groups_are_derived():
    for set_id in ("icnirp_2013", "acgih_2022_far_uvc"):
        ls = get_limit_set(set_id)
        assert ls.classification == "derived"
        assert "derived" in ls.provenance["risk_groups_from"]
        assert any("not a classification" in n for n in ls.notes)


# ---------------------------------------------------------------------------------------------
# IEC 62471:2006 Table 6.1 against the clause 4.3 formulas (check value C5)
# ---------------------------------------------------------------------------------------------

# (entry key, [(group, Table 6.1 cell, printed significant figures, time base s)], α-dependent)
# Cells and time bases: reference notes section 3 (IEC 62471:2006 Table 6.1).
TABLE_6_1 = [
    ("actinic_uv", [("Exempt", 0.001, 1, 30000.0), ("RG1", 0.003, 1, 10000.0),
                    ("RG2", 0.03, 1, 1000.0)], False),
    ("near_uv", [("Exempt", 10.0, 2, 1000.0), ("RG1", 33.0, 2, 300.0),
                 ("RG2", 100.0, 3, 100.0)], False),
    ("blue_light", [("Exempt", 100.0, 3, 10000.0), ("RG1", 10000.0, 5, 100.0),
                    ("RG2", 4000000.0, 7, 0.25)], False),
    ("blue_light_small_source", [("Exempt", 1.0, 2, 10000.0), ("RG1", 1.0, 2, 100.0),
                                 ("RG2", 400.0, 3, 0.25)], False),
    ("retinal_thermal", [("Exempt", 28000.0, 2, 10.0), ("RG1", 28000.0, 2, 10.0),
                         ("RG2", 71000.0, 2, 0.25)], True),
    ("retinal_thermal_weak_stimulus", [("Exempt", 6000.0, 4, 1000.0), ("RG1", 6000.0, 4, 100.0),
                                       ("RG2", 6000.0, 4, 10.0)], True),
    ("ir_eye", [("Exempt", 100.0, 2, 1000.0), ("RG1", 570.0, 2, 100.0),
                ("RG2", 3200.0, 2, 10.0)], False),
]


@pytest.mark.parametrize("key,cells,alpha_dep", TABLE_6_1, ids=[t[0] for t in TABLE_6_1])
def test_table_6_1_cells_in_data(key, cells, alpha_dep):
    e = get_limit_set("iec62471_2006").hazard(key)
    assert [(g.group, g.limit, g.time_base_s) for g in e.groups] == \
        [(g, cell, tb) for g, cell, _, tb in cells]
    assert e.depends_on_alpha == alpha_dep


@pytest.mark.parametrize("key,cells,alpha_dep", TABLE_6_1, ids=[t[0] for t in TABLE_6_1])
def test_table_6_1_equals_limit_formula_at_time_base(key, cells, alpha_dep):
    e = get_limit_set("iec62471_2006").hazard(key)
    alpha = 0.05  # inside both α clamps, so limit · α is the Table 6.1 coefficient
    for group, cell, sig, tb in cells:
        lim = e.limit_at(tb, alpha if alpha_dep else None)
        coef = lim * alpha if alpha_dep else lim
        assert round_sig(coef, sig) == pytest.approx(cell, rel=1e-12), (key, group)


def test_formulas_at_time_bases_from_first_principles():
    # IEC 62471:2006 clause 4.3 (reference notes section 2), recomputed here by hand
    assert 30.0 / 30000.0 == pytest.approx(0.001)
    assert round_sig(1e4 / 300.0, 2) == 33.0
    assert round_sig(50000.0 / 10.0 ** 0.25, 2) == 28000.0       # 28 117
    assert round_sig(50000.0 / 0.25 ** 0.25, 2) == 71000.0       # 70 711
    assert round_sig(18000.0 * 100.0 ** -0.75, 2) == 570.0       # 569.2
    assert round_sig(18000.0 * 10.0 ** -0.75, 2) == 3200.0       # 3201


def test_blue_light_fields_of_view_at_time_bases():
    # Table 6.1 note and reference notes section 2 (from memory): 0.1 rad at 10 000 s,
    # 11 mrad at 100 s, 1.7 mrad at 0.25 s
    e = get_limit_set("iec62471_2006").hazard("blue_light")
    assert e.fov_at(10000.0) == 0.1
    assert e.fov_at(100.0) == pytest.approx(0.011, rel=1e-12)
    assert round_sig(e.fov_at(0.25), 2) == 0.0017
    # continuity of the field where its pieces meet (10 s and 100 s)
    assert e.fov_at(10.0 - 1e-9) == pytest.approx(e.fov_at(10.0), rel=1e-6)
    assert e.fov_at(100.0 - 1e-9) == pytest.approx(e.fov_at(100.0), rel=1e-6)


def test_alpha_clamps():
    # IEC 62471:2006 (reference notes section 2, from memory): L_R 0.0017-0.1 rad, L_IR
    # 0.011-0.1 rad
    ls = get_limit_set("iec62471_2006")
    lr, lir = ls.hazard("retinal_thermal"), ls.hazard("retinal_thermal_weak_stimulus")
    assert lr.limit_at(10.0, 0.0005) == pytest.approx(50000 / 10 ** 0.25 / 0.0017)
    assert lr.limit_at(10.0, 0.5) == pytest.approx(50000 / 10 ** 0.25 / 0.1)
    assert lir.limit_at(1000.0, 0.001) == pytest.approx(6000 / 0.011)
    assert lir.limit_at(1000.0, 0.3) == pytest.approx(6000 / 0.1)
    with pytest.raises(ConfigurationError, match="angular subtense"):
        lr.limit_at(10.0, None)


def test_piece_rule_at_shared_end_points():
    ls = get_limit_set("iec62471_2006")
    # IR eye: 18 000 t^-0.75 = 101.2 at 1000 s; the long-term 100 W m-2 applies there
    assert ls.hazard("ir_eye").limit_at(1000.0) == 100.0
    assert ls.hazard("ir_eye").limit_at(999.0) == pytest.approx(18000 * 999 ** -0.75)
    # retinal thermal: no limit beyond 10 s
    assert ls.hazard("retinal_thermal").limit_at(11.0, 0.05) is None


# ---------------------------------------------------------------------------------------------
# t_max from the limits (clause 4.3 formulas solved by hand)
# ---------------------------------------------------------------------------------------------

def test_t_max_analytic_cases():
    ls = get_limit_set("iec62471_2006")
    # E_UVA = 100 W m-2: 10 000 J m-2 in 100 s
    assert ls.hazard("near_uv").t_max(lambda f: 100.0)[0] == pytest.approx(100.0)
    # E_UVA = 10 W m-2: within the long-term limit
    t, note = ls.hazard("near_uv").t_max(lambda f: 10.0)
    assert t is None and "long-term" in note
    # E_IR = 569.2 W m-2 (the 100 s value): t_max = 100 s
    e = 18000 * 100 ** -0.75
    assert ls.hazard("ir_eye").t_max(lambda f: e)[0] == pytest.approx(100.0)
    # E_IR = 100.5 W m-2: the formula gives > 1000 s but the long-term limit is 100: 1000 s
    assert ls.hazard("ir_eye").t_max(lambda f: 100.5)[0] == 1000.0
    # L_R = 50 000/(0.05 · 1^0.25) at α = 0.05: t_max = 1 s
    assert ls.hazard("retinal_thermal").t_max(lambda f: 1e6, 0.05)[0] == pytest.approx(1.0)
    # E_H: 20 000 t^0.25 J m-2 reached at 1 s for E_H = 20 000 W m-2
    assert ls.hazard("skin_thermal").t_max(lambda f: 20000.0)[0] == pytest.approx(1.0)
    # small-source blue light: E_B = 10 W m-2: 100 J m-2 in 10 s
    assert ls.hazard("blue_light_small_source").t_max(lambda f: 10.0)[0] == pytest.approx(10.0)


def test_t_max_blue_light_uses_the_field_for_each_duration():
    # A source much smaller than every field: L_B(γ) = E_B / Ω(γ). With γ = 0.0011 √t for
    # 100–10 000 s, L_B · t is constant there, so t_max is below 100 s or at least 10 000 s.
    e = get_limit_set("iec62471_2006").hazard("blue_light")
    for e_b in (0.5, 0.9):
        t, _ = e.t_max(lambda f, e_b=e_b: e_b / solid_angle_sr(f))
        assert t is None or t >= 10000.0
    t, _ = e.t_max(lambda f: 2.0 / solid_angle_sr(f))
    assert t is not None and t < 100.0


def test_solid_angle_small_angle_limit():
    # Ω = 4π sin²(γ/4) → π γ²/4 for small γ (geometry); a hemisphere (γ = π) is 2π
    assert solid_angle_sr(0.011) == pytest.approx(math.pi * 0.011 ** 2 / 4, rel=1e-5)
    assert solid_angle_sr(math.pi) == pytest.approx(2 * math.pi)


# ---------------------------------------------------------------------------------------------
# Alternative sets
# ---------------------------------------------------------------------------------------------

def test_icnirp_2013_retinal_thermal():
    ls = get_limit_set("icnirp_2013")
    lr = ls.hazard("retinal_thermal")
    a = 0.05
    assert lr.limit_at(0.01, a) == pytest.approx(2.0e4 / (a * 0.01 ** 0.25))
    assert lr.limit_at(1.0, a) == pytest.approx(2.8e4 / a)
    assert lr.limit_at(1000.0, a) == pytest.approx(2.8e4 / a)
    # continuity at 0.25 s to the printed 2 significant figures (2.0e4/0.25^0.25 = 28 284)
    assert round_sig(2.0e4 / 0.25 ** 0.25, 2) == 2.8e4
    assert ls.hazard("retinal_thermal_weak_stimulus").limit_at(100.0, a) == pytest.approx(6300 / a)
    # ICNIRP 2004 integrates E_S over 180-400 nm
    assert ls.hazard("actinic_uv").range_nm == (180.0, 400.0)
    assert get_limit_set("iec62471_2006").hazard("actinic_uv").range_nm == (200.0, 400.0)
    # inherited unchanged
    assert ls.hazard("near_uv") is get_limit_set("iec62471_2006").hazard("near_uv")


def test_acgih_far_uvc_scales():
    # eye 161 mJ/cm² = 1610 J/m², skin 479 mJ/cm² = 4790 J/m² at 222 nm (from memory)
    e = get_limit_set("acgih_2022_far_uvc").hazard("actinic_uv")
    assert e.components[0].scale == pytest.approx(30.0 / 1610.0, rel=1e-15)
    assert e.also is not None
    assert e.also.components[0].scale == pytest.approx(30.0 / 4790.0, rel=1e-15)
    assert (e.components[0].lo_nm, e.components[0].hi_nm) == (200.0, 235.0)


def test_groups_constant():
    assert GROUPS == ("Exempt", "RG1", "RG2", "RG3")
