"""A spectrum that sits below zero (a sign-flipped dark subtraction) is flagged and gives no
hazard figure; a narrow emitter whose noise floor is negative in half of its samples is not
flagged. Invented test data; the rule (more than half negative and the deepest dip more
than 3 times the highest point) is our own."""

from __future__ import annotations

import numpy as np

from uvcheck.conditions import Conditions
from uvcheck.features import negative_dominated
from uvcheck.hazards import evaluate_hazards
from uvcheck.io.reader import read_spectrum
from uvcheck.spectrum import Spectrum

WL = np.arange(250.0, 801.0, 1.0)


def _led(sign: float = 1.0, seed: int = 3) -> np.ndarray:
    rng = np.random.default_rng(seed)
    v = 0.02 * np.exp(-0.5 * ((WL - 405.0) / 6.0) ** 2)
    noise = rng.normal(-1e-5, 2e-5, WL.size)  # a slightly over-subtracted dark: mostly negative
    return sign * v + noise


def test_noise_below_zero_around_a_real_peak_is_not_flagged():
    v = _led()
    assert (v < 0).mean() > 0.5
    assert negative_dominated(v) is None
    ev = evaluate_hazards(Spectrum(WL, v, "irradiance"), Conditions(measurement_distance_m=0.2))
    assert ev.hazard("blue_light").status != "not-assessable"


def test_flipped_spectrum_is_flagged_and_no_hazard_is_computed(tmp_path):
    v = _led(-1.0)
    assert negative_dominated(v) is not None
    ev = evaluate_hazards(Spectrum(WL, v, "irradiance"), Conditions(measurement_distance_m=0.2))
    for h in ev.hazards:
        assert h.status in ("not-assessable", "not-applicable"), h.id
        assert h.risk_group is None
    assert "below zero" in ev.hazard("blue_light").reason
    assert ev.risk_group.group is None
    p = tmp_path / "flipped.csv"
    p.write_text("Wavelength (nm),Irradiance (W/m2/nm)\n"
                 + "\n".join(f"{a:g},{b:.6e}" for a, b in zip(WL, v)) + "\n", encoding="utf-8")
    _, rep = read_spectrum(p)
    assert any("negative" in w and "dark" in w for w in rep.warnings)


def test_noisy_led_file_has_no_negative_warning(tmp_path):
    p = tmp_path / "led.csv"
    p.write_text("Wavelength (nm),Irradiance (W/m2/nm)\n"
                 + "\n".join(f"{a:g},{b:.6e}" for a, b in zip(WL, _led())) + "\n",
                 encoding="utf-8")
    _, rep = read_spectrum(p)
    assert not any("are negative" in w for w in rep.warnings)


def test_noise_only_uvc_on_partial_coverage_is_not_ruled_out():
    # data from 250 nm, nothing in 250-280 nm above the noise: 200-250 nm was never measured,
    # so "no germicidal UV-C" would read missing range as zero
    from uvcheck.germicidal import evaluate_germicidal

    rng = np.random.default_rng(5)
    v = 0.02 * np.exp(-0.5 * ((WL - 405.0) / 6.0) ** 2) + rng.normal(0.0, 2e-5, WL.size)
    g = evaluate_germicidal(Spectrum(WL, v, "irradiance"), Conditions(measurement_distance_m=0.2))
    assert g.status == "not-assessed"
    assert "cannot be ruled out" in g.statement


def test_negative_values_clipped_to_zero_are_flagged(tmp_path):
    rng = np.random.default_rng(9)
    v = np.clip(0.02 * np.exp(-0.5 * ((WL - 405.0) / 6.0) ** 2)
                + rng.normal(0.0, 2e-5, WL.size), 0.0, None)
    p = tmp_path / "clipped.csv"
    p.write_text("Wavelength (nm),Irradiance (W/m2/nm)\n"
                 + "\n".join(f"{a:g},{b:.6e}" for a, b in zip(WL, v)) + "\n", encoding="utf-8")
    _, rep = read_spectrum(p)
    assert any("clip negative values to zero" in w for w in rep.warnings)
    # the same data unclipped: no such warning
    p.write_text("Wavelength (nm),Irradiance (W/m2/nm)\n"
                 + "\n".join(f"{a:g},{b:.6e}" for a, b in zip(WL, _led())) + "\n",
                 encoding="utf-8")
    _, rep = read_spectrum(p)
    assert not any("clip negative values" in w for w in rep.warnings)
