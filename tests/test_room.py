"""The room model and the ``room`` / ``organisms`` commands.

Check values: NOTES.md §7 C14 (eACH), C15 (point source at the centre of a sphere:
3Φ/(4πR²)), C16 (99.9 % in 30 min), §5 (occupant 8-h limit at 254 nm: 0.2 µW/cm²; 100 µW/cm²
reaches it in 60 s). Analytic anchors derived in the comments (energy conservation,
symmetry, Keitz on the bisector, integrating sphere).
"""

import doctest
import json
import math

import numpy as np
import pytest
import typer
from typer.testing import CliRunner

from uvcheck import room as room_mod
from uvcheck.cli_room import organisms_command, room_command
from uvcheck.errors import ConfigurationError, OutputExistsError
from uvcheck.geometry import keitz_irradiance
from uvcheck.inactivation import get_organism
from uvcheck.room import (Box, LampGeometry, Sphere, boundary_flux_per_W,
                          direct_irradiance_per_W, evaluate_room, lamp_from_spectrum,
                          lamp_from_uvc_flux, volume_average_fluence_rate)
from uvcheck.spectrum import Spectrum

ROOM = Box(4.0, 5.0, 2.7)


def test_doctests():
    assert doctest.testmod(room_mod).failed == 0


def test_c15_sphere_centre_analytic():
    # NOTES.md §7 C15: volume-average fluence rate 3Φ/(4πR²); required within 0.5 %
    R = 2.0
    fa = volume_average_fluence_rate(Sphere(R), LampGeometry((0.0, 0.0, 0.0)))
    assert fa.total_per_W == pytest.approx(3 / (4 * math.pi * R * R), rel=5e-3)
    assert fa.total_per_W == pytest.approx(3 / (4 * math.pi * R * R), rel=1e-9)   # in fact exact


def test_sphere_with_reflections_integrating_sphere():
    # derived (integrating sphere): reflected incident E_r = ρΦ/(A(1−ρ)), fluence 4E_r
    R, rho = 1.5, 0.5
    fa = volume_average_fluence_rate(Sphere(R), LampGeometry((0.0, 0.0, 0.0)), reflectance=rho)
    A = 4 * math.pi * R * R
    assert fa.total_per_W == pytest.approx(3 / A + 4 * rho / (A * (1 - rho)))


@pytest.mark.parametrize("geom", [
    LampGeometry((2.0, 2.5, 1.35)),
    LampGeometry((0.3, 4.9, 2.6), "lambertian_down"),
    LampGeometry((2.0, 2.5, 2.7), "lambertian_down"),
    LampGeometry((2.0, 2.5, 2.4), "cylinder", 1.2, "x"),
    LampGeometry((0.01, 0.01, 0.01)),
])
def test_energy_conservation(geom):
    # derived: every watt emitted reaches the walls, floor or ceiling (no absorption in air)
    assert boundary_flux_per_W(ROOM, geom) == pytest.approx(1.0, abs=1e-6)
    fa = volume_average_fluence_rate(ROOM, geom)
    assert fa.error_rel < 1e-4


def test_cube_centre_floor_gets_one_sixth():
    # derived (symmetry): an isotropic source at the centre of a cube sends Φ/6 to each face
    cube = Box(2.0, 2.0, 2.0)
    r = evaluate_room(cube, lamp_from_uvc_flux(1.0, LampGeometry((1.0, 1.0, 1.0))),
                      reflectance=0.0, work_plane_m=0.0)
    assert r.plane["mean_W_m2"] == pytest.approx(1 / 6 / 4.0, rel=1e-9)


def test_tube_reproduces_keitz_on_the_bisector():
    # derived (module docstring): the segmented sin-ψ line source gives the Keitz formula
    geom = LampGeometry((2.0, 2.5, 2.0), "cylinder", 1.2, "x")
    pts = np.array([[2.0, 2.5, 1.0], [2.0, 2.5, 0.2]])
    e = direct_irradiance_per_W(pts, (0.0, 0.0, 1.0), geom)
    assert e == pytest.approx(keitz_irradiance(1.0, np.array([1.0, 1.8]), 1.2), rel=1e-6)


def test_point_below_lamp_is_inverse_square():
    # NOTES.md §5: isotropic E = Φ/(4πr²) on a plane facing the lamp
    geom = LampGeometry((2.0, 2.5, 2.5))
    e = direct_irradiance_per_W(np.array([[2.0, 2.5, 0.5]]), (0.0, 0.0, 1.0), geom)
    assert e[0] == pytest.approx(1 / (4 * math.pi * 4.0))


def test_c14_each_in_the_room():
    # NOTES.md §5/§7: eACH = 3600·k·E_avg with the room's volume-average fluence rate
    r = evaluate_room(ROOM, lamp_from_uvc_flux(2.0, LampGeometry((2.0, 2.5, 2.4))))
    o = get_organism("mycobacterium_tuberculosis_254_legacy")
    assert r.each_for(o) == pytest.approx(3600 * o.k_e_m2_per_J * r.fluence_rate_avg_W_m2)
    row = next(a for a in r.air if a["organism_id"] == o.id)
    assert row["each_per_h"] == pytest.approx(r.each_for(o))
    # well-mixed air: 99.9 % in 3·ln10/(k·E_avg)
    assert row["time_to_99_9_s"] == pytest.approx(3 * math.log(10) / (o.k_e_m2_per_J * r.fluence_rate_avg_W_m2))
    assert r.to_dict()["each_per_h"][o.id] == row["each_per_h"]
    assert r.air_most_susceptible["note"].startswith("a claim about germs")


def test_c16_requirement_on_the_work_plane():
    # NOTES.md §7 C16: 99.9 % in 30 min with D90 = 3.7 mJ/cm² needs ≥ 6.17 µW/cm² everywhere
    geom = LampGeometry((2.0, 2.5, 2.4), "lambertian_down")
    unit = evaluate_room(ROOM, lamp_from_uvc_flux(1.0, geom), target_dose_J_m2=111.0)
    flux = 0.0617 / unit.plane["min_W_m2"]                 # linear in flux
    r = evaluate_room(ROOM, lamp_from_uvc_flux(flux, geom), target_dose_J_m2=111.0)
    assert r.plane["min_W_m2"] == pytest.approx(0.0617)
    assert r.plane["time_to_target_everywhere_s"] == pytest.approx(111.0 / 0.0617)
    assert r.plane["time_to_target_everywhere_s"] <= 1800 * 1.0001
    assert r.plane["p10_W_m2"] >= r.plane["min_W_m2"]
    assert r.plane["percentile_error_rel"] < 0.02


def test_occupant_limit_at_254():
    # NOTES.md §5: 6 mJ/cm² in 8 h -> 0.208 µW/cm² continuous UV-C at 254 nm (S(254) = 0.5,
    # IEC 62471 Table 4.1); at 100 µW/cm² the limit is reached in 60 s
    geom = LampGeometry((2.0, 2.5, 2.6), "lambertian_down")
    unit = evaluate_room(ROOM, lamp_from_uvc_flux(1.0, geom))
    for target_W_m2, t_expected in ((60 / 28800, 28800.0), (1.0, 60.0)):
        flux = target_W_m2 / unit.occupant["irradiance_W_m2"]
        occ = evaluate_room(ROOM, lamp_from_uvc_flux(flux, geom)).occupant
        assert occ["irradiance_W_m2"] == pytest.approx(target_W_m2)
        # S(253.7) by log-linear interpolation of S(250) = 0.43, S(254) = 0.5: slightly below 0.5
        assert occ["effective_S_W_m2"] / occ["irradiance_W_m2"] == pytest.approx(0.5, rel=0.02)
        assert occ["time_to_limit_s"] == pytest.approx(t_expected, rel=0.02)
        assert occ["effective_S_is_lower_bound"]           # only UV-C was stated
        assert "not a certification" in occ["note"]


def test_more_flux_never_lengthens_a_time():
    geom = LampGeometry((2.0, 2.5, 2.4))
    a = evaluate_room(ROOM, lamp_from_uvc_flux(1.0, geom), target_dose_J_m2=100.0)
    b = evaluate_room(ROOM, lamp_from_uvc_flux(3.0, geom), target_dose_J_m2=100.0)
    assert b.plane["time_to_target_at_p10_s"] < a.plane["time_to_target_at_p10_s"]
    for x, y in zip(a.air, b.air):
        assert y["time_to_99_9_s"] < x["time_to_99_9_s"]
    assert b.occupant["time_to_limit_s"] < a.occupant["time_to_limit_s"]


def test_lamp_from_measured_spectrum():
    # 1 W/m² measured at 1 m on the axis of an isotropic lamp -> Φ = 4π W (NOTES.md §5)
    s = Spectrum([200.0, 800.0], [0.0, 0.0], "irradiance", lines=((253.7, 1.0),))
    lamp = lamp_from_spectrum(s, LampGeometry((2.0, 2.5, 2.4)), measured_at_m=1.0)
    assert lamp.flux_spectrum.lines[0].value == pytest.approx(4 * math.pi)
    down = lamp_from_spectrum(s, LampGeometry((2.0, 2.5, 2.4), "lambertian_down"), measured_at_m=1.0)
    assert down.flux_spectrum.lines[0].value == pytest.approx(math.pi)    # Φ = πd²E
    with pytest.raises(ConfigurationError, match="distance"):
        lamp_from_spectrum(s, LampGeometry((2.0, 2.5, 2.4)))
    with pytest.raises(ConfigurationError, match="relative"):
        lamp_from_spectrum(Spectrum([200.0, 300.0], [1.0, 1.0], "relative"), LampGeometry((1, 1, 1)), 1.0)


def test_occupant_actinic_range_is_the_one_assess_uses():
    # IEC 62471:2006 states E_S over 200-400 nm (the 30 J/m² limit of clause 4.3.1; data/limits
    # records the range): a spectrum measured from 200 nm covers it, so the occupant's E_S is
    # no lower bound, as the hazard table of `uvcheck assess` says for the same file; one
    # measured from 230 nm leaves part of it out and is a lower bound
    geom = LampGeometry((2.0, 2.5, 2.4))
    for start, lower in ((200.0, False), (230.0, True)):
        s = Spectrum([start, 800.0], [0.0, 0.0], "irradiance", lines=((253.7, 1.0),))
        occ = evaluate_room(ROOM, lamp_from_spectrum(s, geom, measured_at_m=1.0)).occupant
        assert occ["effective_S_is_lower_bound"] is lower, start
        assert ("lower bound" in occ["note"]) is lower


def test_room_errors():
    with pytest.raises(ConfigurationError, match="outside the room"):
        evaluate_room(ROOM, lamp_from_uvc_flux(1.0, LampGeometry((5.0, 2.5, 2.4))))
    with pytest.raises(ConfigurationError, match="outside the room"):
        evaluate_room(ROOM, lamp_from_uvc_flux(1.0, LampGeometry((0.3, 2.5, 2.4), "cylinder", 1.2)))
    with pytest.raises(ConfigurationError, match="reflectance"):
        evaluate_room(ROOM, lamp_from_uvc_flux(1.0, LampGeometry((2, 2, 2))), reflectance=1.0)
    with pytest.raises(ConfigurationError, match="not UV-C"):
        lamp_from_uvc_flux(1.0, LampGeometry((2, 2, 2)), wavelength_nm=300.0)
    with pytest.raises(ConfigurationError, match="available: isotropic, lambertian_down, cylinder"):
        LampGeometry((1, 1, 1), "spot")


def test_json_contract():
    r = evaluate_room(ROOM, lamp_from_uvc_flux(2.0, LampGeometry((2.0, 2.5, 2.4))))
    d = json.loads(json.dumps(r.to_dict(), allow_nan=False))
    assert d["dimensions_m"] == {"width": 4.0, "length": 5.0, "height": 2.7}
    for key in ("min_W_m2", "mean_W_m2", "p10_W_m2"):
        assert d["plane"][key] > 0
    assert d["fluence_rate_avg_W_m2"] > 0
    assert d["occupant"]["irradiance_W_m2"] > 0 and d["occupant"]["time_to_limit_s"] > 0
    assert d["each_per_h"]


# --- commands ------------------------------------------------------------------------------

def _app():
    app = typer.Typer()
    app.command("room")(room_command)
    app.command("organisms")(organisms_command)
    return app


def test_room_command_json_matches_the_science(tmp_path):
    out = tmp_path / "room.json"
    res = CliRunner().invoke(_app(), ["room", "--uvc-flux", "2 W", "--size", "4 x 5 x 2.7 m",
                                      "--lamp-at", "2, 2.5, 2.4 m", "--json", str(out)])
    assert res.exit_code == 0, res.output
    assert "µW/cm²" in res.output and "eACH" in res.output
    d = json.loads(out.read_text())["room"]
    direct = evaluate_room(ROOM, lamp_from_uvc_flux(2.0, LampGeometry((2.0, 2.5, 2.4))))
    assert d["fluence_rate_avg_W_m2"] == pytest.approx(direct.fluence_rate_avg_W_m2, rel=1e-6)
    res = CliRunner().invoke(_app(), ["room", "--uvc-flux", "2 W", "--json", str(out)])
    assert isinstance(res.exception, OutputExistsError)


def test_room_command_from_a_spectrum_file(tmp_path):
    f = tmp_path / "lamp.csv"
    wl = np.arange(200.0, 800.01, 0.5)
    v = np.exp(-0.5 * ((wl - 253.7) / 0.6) ** 2) * 0.01
    f.write_text("wavelength_nm,irradiance_W_m2_nm\n" + "\n".join(f"{a:.1f},{b:.6g}" for a, b in zip(wl, v)))
    res = CliRunner().invoke(_app(), ["room", str(f), "--distance", "1 m", "--json", "-", "--quiet"])
    assert res.exit_code == 0, res.output
    d = json.loads(res.output)["room"]
    assert d["lamp"]["germicidal_status"] == "germicidal-uvc"
    assert d["lamp"]["uvc_flux_W"] == pytest.approx(4 * math.pi * 0.01 * 0.6 * math.sqrt(2 * math.pi), rel=0.01)


def test_room_command_errors():
    res = CliRunner().invoke(_app(), ["room"])
    assert isinstance(res.exception, ConfigurationError) and "either" in str(res.exception)
    res = CliRunner().invoke(_app(), ["room", "--uvc-flux", "2 kg"])
    assert res.exception is not None and "power" in str(res.exception)


def test_organisms_command():
    res = CliRunner().invoke(_app(), ["organisms", "--medium", "air", "--json", "-"])
    assert res.exit_code == 0, res.output
    rows = json.loads(res.output)["organisms"]
    assert rows and all(r["medium"] in ("air", "mixed", "unspecified") for r in rows)
    res = CliRunner().invoke(_app(), ["organisms", "--pathway", "violet_blue"])
    assert res.exit_code == 0 and "405" in res.output and "salmonella" in res.output


def test_small_api_and_far_uvc_note():
    r = evaluate_room(ROOM, lamp_from_uvc_flux(1.0, LampGeometry((2.0, 2.5, 2.4)), 222.0))
    o = get_organism("hcov_oc43_air_222_buonanno2020")
    row = next(a for a in r.air if a["organism_id"] == o.id)
    assert r.air_time_s(o, 99.9) == pytest.approx(row["time_to_99_9_s"])
    # a 222 nm line: the most favourable 222-nm equivalent is the flux itself (unweighted UV-C)
    assert r.equivalent_fluence_rate(222.0) == pytest.approx(r.fluence.total_per_W)
    assert "ACGIH 2022" in r.occupant["note"]


# --- stray light, noise and the tube length (audit issues 4 and 6 #3) ----------------------

WL_R = np.arange(200.0, 800.01, 0.5)


def _gauss(c, fwhm, area):
    s = fwhm / 2.3548
    return area / (s * np.sqrt(2 * np.pi)) * np.exp(-0.5 * ((WL_R - c) / s) ** 2)


def _white_with_pedestal():
    # invented white lamp with a flat stray-light level under UV-C (germicidal's pedestal rule)
    rng = np.random.default_rng(3)
    v = _gauss(450, 20, 3.0) + _gauss(560, 100, 7.0) + 2e-4 + rng.normal(0, 1e-5, WL_R.size)
    return Spectrum(WL_R, v, "irradiance")


def test_stray_light_is_not_room_output():
    lamp = lamp_from_spectrum(_white_with_pedestal(), LampGeometry((2.0, 2.5, 2.4)), 0.3)
    r = evaluate_room(ROOM, lamp, target_dose_J_m2=100.0)
    d = json.loads(json.dumps(r.to_dict(), allow_nan=False))
    st = d["status"]
    assert st["figures_are"] == "upper_bound" and st["uvc_status"] == "likely-stray-light"
    assert [a["kind"] for a in st["artefacts"]] == ["pedestal"]
    assert d["notes"][0].startswith("No germicidal UV-C")        # said first
    # nothing is presented as delivered ...
    assert d["lamp"]["uvc_flux_W"] is None and d["lamp"]["equivalent_254_flux_W"] is None
    assert d["fluence_rate_avg_W_m2"] is None and d["plane"]["p10_W_m2"] is None
    assert d["plane"]["grid"] is None and d["plane"]["time_to_target_at_p10_s"] is None
    assert d["occupant"]["irradiance_W_m2"] is None
    assert all(a["each_per_h"] is None and a["time_to_99_9_s"] is None for a in d["air"])
    assert all(v is None for v in d["each_per_h"].values())
    # ... and the bounds are there under their own names
    assert d["lamp"]["uvc_flux_upper_bound_W"] > 0
    assert all(a["each_per_h_upper_bound"] > 0 for a in d["air"] if a["k_e_m2_per_J"])
    assert d["air_most_susceptible"]["note"].startswith("an upper bound only")
    # claims still get the benefit of the doubt (favourable = the upper bound)
    assert r.air_time_s("hcov_oc43_air_222_buonanno2020") > 0
    text = __import__("uvcheck.cli_room", fromlist=["render_room"]).render_room(d)
    assert text.startswith("NO GERMICIDAL UV-C OUTPUT")
    assert "eACH /h" not in text and "Work plane" not in text and "at most" in text


def test_real_uvc_keeps_its_room_figures():
    s = Spectrum(WL_R, _gauss(253.7, 1.2, 0.01) + np.random.default_rng(4).normal(0, 1e-7, WL_R.size),
                 "irradiance")
    d = evaluate_room(ROOM, lamp_from_spectrum(s, LampGeometry((2.0, 2.5, 2.4)), 1.0)).to_dict()
    assert d["status"]["figures_are"] == "estimate" and d["status"]["artefacts"] == []
    assert d["lamp"]["uvc_flux_W"] > 0 and d["lamp"]["uvc_flux_upper_bound_W"] is None
    assert all(a["each_per_h"] for a in d["air"] if a["k_e_m2_per_J"])
    assert d["fluence_rate_avg_upper_bound_W_m2"] is None and d["warnings"] == []


def test_cylinder_without_tube_length_warns(tmp_path):
    short = evaluate_room(ROOM, lamp_from_uvc_flux(1.0, LampGeometry((2.0, 2.5, 2.4), "cylinder")))
    assert any("tube length" in w for w in short.to_dict()["warnings"])
    tube = evaluate_room(ROOM, lamp_from_uvc_flux(1.0, LampGeometry((2.0, 2.5, 2.4), "cylinder", 0.9)))
    assert tube.to_dict()["warnings"] == []
    res = CliRunner().invoke(_app(), ["room", "--uvc-flux", "1 W", "--pattern", "cylinder"])
    assert res.exit_code == 0 and res.output.startswith("Warning: cylinder pattern without a tube length")


@pytest.mark.parametrize("args, option", [
    (["--reflectance", "150 %"], "--reflectance"),
    (["--pattern", "cylinder", "--tube-length", "1 m", "--axis", "z"], "--axis"),
    (["--eye-height", "3 m"], "--eye-height"),
    (["--work-plane", "3 m"], "--work-plane"),
    (["--size", "4 x 0 x 2.7 m"], "--size"),
])
def test_room_command_errors_name_their_option(args, option):
    # the room command checks its room texts as 'note' does (cli_room.room_spec)
    from typer.testing import CliRunner

    from uvcheck.cli import app

    r = CliRunner().invoke(app, ["room", "--uvc-flux", "2 W", *args])
    assert r.exit_code == 2, r.output
    assert f"error: {option}:" in r.output


def test_a_lamp_at_eye_height_gives_no_occupant_figure():
    """Within 0.3 m of eye height an eye can come as close to the lamp as it likes: the grid's
    nearest point gave '1.59e+11 W/m²' and a limit 'reached in 0.000381 µs' (r² clamped at
    1e-12 m²), a number that depends on where the grid falls, not a bound. Our own rule: no
    figure, the 8-h limit flagged as exceedable."""
    res = CliRunner().invoke(_app(), ["room", "--uvc-flux", "2 W", "--size", "4 x 5 x 2.7 m",
                                      "--lamp-at", "2, 2.5, 1.7 m", "--json", "-", "--quiet"])
    assert res.exit_code == 0, res.output
    d = json.loads(res.stdout[res.stdout.index("{"):])
    occ = d["room"]["occupant"] if "room" in d else d["occupant"]
    assert occ["unbounded"] is True and occ["exceeds_8h_limit"] is True
    assert occ["irradiance_W_m2"] is None and occ["time_to_limit_s"] is None
    text = CliRunner().invoke(_app(), ["room", "--uvc-flux", "2 W", "--size", "4 x 5 x 2.7 m",
                                       "--lamp-at", "2, 2.5, 1.7 m"]).output
    assert "CAN BE EXCEEDED IN MOMENTS" in text and "e+11" not in text


# A lamp on a room surface. Shares by solid angle [derived]: an isotropic source on a plane
# sends half its flux into it; in the edge of two walls 3/4 (only one quadrant of directions
# points away from both); in a corner of three faces 7/8. A downward Lambertian fitting on the
# ceiling sends nothing into it, the same fitting on the floor everything.
@pytest.mark.parametrize("pos,pattern,share", [
    ((0.0, 2.5, 1.5), "isotropic", 0.5),
    ((0.0, 0.0, 1.5), "isotropic", 0.75),
    ((0.0, 0.0, 0.0), "isotropic", 0.875),
    ((2.0, 2.5, 2.7), "lambertian_down", 0.0),
    ((2.0, 2.5, 0.0), "lambertian_down", 1.0),
    ((2.0, 2.5, 1.5), "isotropic", 0.0),
])
def test_share_of_the_output_heading_into_a_near_surface(pos, pattern, share):
    from uvcheck.room import into_near_surfaces

    got, faces = into_near_surfaces(Box(4.0, 5.0, 2.7), LampGeometry(pos, pattern))
    assert got == pytest.approx(share, abs=2e-3)
    assert bool(faces) == (pos != (2.0, 2.5, 1.5))


def test_room_result_warns_of_a_lamp_on_a_wall():
    box = Box(4.0, 5.0, 2.7)
    on_wall = evaluate_room(box, lamp_from_uvc_flux(2.0, LampGeometry((0.0, 2.5, 1.5))))
    said = " ".join(on_wall.warnings)
    assert "within 0.1 m of the wall at x = 0: 50% of its output" in said
    assert "up to 2× higher" in said
    centre = evaluate_room(box, lamp_from_uvc_flux(2.0, LampGeometry((2.0, 2.5, 2.0))))
    assert not any("heads straight into" in w for w in centre.warnings)


# The 80° field-of-view convention at eye height (common practice, from memory): a detector
# facing horizontally toward the lamp sees sources within 40° of its axis; direct irradiance of
# a point source I·cos θ/R² [derived: the inverse-square law on a tilted plane].
def test_fov_irradiance_of_a_point_source_by_hand():
    from uvcheck.room import fov_irradiance_per_W

    lamp = LampGeometry((2.0, 2.0, 2.5))
    for d in (0.3, 0.9, 1.5, 3.0):
        eye = np.array([[2.0 + d, 2.0, 1.7]])
        dz = 0.8
        theta = math.atan2(dz, d)
        R2 = d * d + dz * dz
        want = (math.cos(theta) / (4 * math.pi * R2)) if theta <= math.radians(40.0) else 0.0
        assert fov_irradiance_per_W(eye, lamp)[0] == pytest.approx(want, rel=1e-12, abs=1e-15)


def test_fov_convention_never_exceeds_the_worst_case():
    res = evaluate_room(ROOM, lamp_from_uvc_flux(0.5, LampGeometry((2.0, 2.5, 2.6), "lambertian_down")),
                        reflectance=0.05)
    occ = res.occupant
    fv = occ["fov_convention"]
    assert fv["fov_deg"] == 80.0
    assert 0.0 < fv["effective_S_W_m2"] <= occ["effective_S_W_m2"]
    assert fv["time_to_limit_s"] == pytest.approx(30.0 / fv["effective_S_W_m2"])   # 30 J/m²
