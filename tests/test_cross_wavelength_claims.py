"""A kill claim judged with organism data measured at another wavelength says so.

Found by trying the tool: a 253.7 nm tube's claim "kills 99.9 % of viruses in the air" was
judged with the OC43 aerosol row, measured under 222 nm light (Buonanno et al. 2020, Sci Rep
10:10285), and the verdict gave a dose without saying that it had been carried over from
222 nm to 253.7 nm by the action spectrum. The organism table already said so; the claim's
verdict now does too.
"""

from __future__ import annotations

import pytest

from uvcheck.claims import judge, readings_from_measurement
from uvcheck.conditions import Conditions
from uvcheck.io.listing import parse_listing
from uvcheck.spectrum import Spectrum

# germicidal_dna table (Kowalski 2009, Ultraviolet Germicidal Irradiation Handbook, p. 26, as
# copied into data/weightings/germicidal_dna_absorption.csv): 0.9335 at 253 nm, 0.9552 at
# 254 nm (linear interpolation to 253.7 nm), 0.6586 at 222 nm.
S_DNA_2537 = 0.9335 + 0.7 * (0.9552 - 0.9335)
S_DNA_222 = 0.6586


def _claim(peak_nm: float, text: str):
    lst = parse_listing('format = "uvcheck-listing/1"\n[product]\nname = "tube (invented)"\n'
                        f'invented = true\n[[claims]]\nid = "c1"\ntext = "{text}"\n', "t.toml")
    spec = Spectrum([200.0, 800.0], [0.0, 0.0], "irradiance", lines=((peak_nm, 1.0),))
    res = judge(lst, readings_from_measurement(spec, Conditions(measurement_distance_m=1.0)),
                measured=True)
    return res.verdicts[0]


def test_data_from_222_nm_carried_to_a_254_nm_lamp_is_named():
    v = _claim(253.7, "kills 99.9% of viruses in the air in 10 minutes at 1 m")
    assert v.details["organism_id"] == "hcov_oc43_air_222_buonanno2020"
    # 1 W/m² at 253.7 nm counts as s(253.7)/s(222) W/m² of 222 nm light by the DNA proxy,
    # the most favourable action spectrum here (see tests/test_germicidal.py)
    assert v.details["irradiance_W_m2"] == pytest.approx(S_DNA_2537 / S_DNA_222, rel=1e-6)
    moved = [a for a in v.assumptions if "transferred by the action spectrum" in a]
    assert moved, v.assumptions
    assert "Human coronavirus OC43" in moved[0]
    assert "measured at 222 nm" in moved[0] and "peak at 253.7 nm" in moved[0]


def test_data_at_the_lamp_wavelength_need_no_such_note():
    v = _claim(222.0, "kills 99.9% of viruses in the air in 10 minutes at 1 m")
    assert v.details["organism_id"] == "hcov_oc43_air_222_buonanno2020"
    assert not [a for a in v.assumptions if "transferred by the action spectrum" in a]


def _line_file(tmp_path, peak_nm: float):
    """A narrow invented band at peak_nm (1 nm FWHM, 1 W/m² at 1 m) on 200–800 nm, as a CSV."""
    import numpy as np

    wl = np.arange(200.0, 800.01, 0.5)
    v = np.exp(-0.5 * ((wl - peak_nm) / 0.425) ** 2) / (0.425 * np.sqrt(2 * np.pi)) + 1e-7
    f = tmp_path / f"line{peak_nm:g}.csv"
    f.write_text("# distance: 1 m\nwavelength_nm,irradiance_W_m2_nm\n"
                 + "".join(f"{a:.2f},{b:.6e}\n" for a, b in zip(wl, v)), encoding="utf-8")
    return f


@pytest.mark.parametrize("peak_nm, moved", [(253.7, True), (222.0, False)])
def test_the_organism_table_and_the_note_mark_carried_over_data(tmp_path, peak_nm, moved):
    from uvcheck.cli_note import note_result
    from uvcheck.report.note import finding
    from uvcheck.report.terminal import render_inactivation

    res, _ = note_result(_line_file(tmp_path, peak_nm), None)
    g = res["germicidal"]
    text = "\n".join(render_inactivation(g["inactivation"]))
    oc43 = next(ln for ln in text.splitlines() if "Human coronavirus OC43" in ln)
    assert ("222 †" in oc43) is moved
    # the other way round, 254-nm rows are carried over to a 222-nm lamp
    assert ("254 †" in text) is not moved
    assert "† data measured more than 10 nm from the lamp's UV-C peak" in text
    f = finding(res)
    assert g["most_susceptible"]["uvc"]["air"]["organism_id"] == "hcov_oc43_air_222_buonanno2020"
    assert "Human coronavirus OC43" in f
    assert ("data measured at 222 nm and carried over" in f) is moved
