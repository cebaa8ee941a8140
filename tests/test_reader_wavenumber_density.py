"""A spectrum given per wavenumber (W m⁻² per cm⁻¹) on a wavenumber axis is converted to per
nm: ν̃ = 10⁷/λ (ν̃ in cm⁻¹, λ in nm), so E_λ = E_ν̃ · |dν̃/dλ| = E_ν̃ · 10⁷/λ² — the change of
variable of a spectral density (any radiometry text; the CIE International Lighting
Vocabulary calls such a density a spectral concentration, from memory). The band integrals
then equal those
of the same spectrum written per nm. The spectrum is invented.
"""

from __future__ import annotations

import numpy as np
import pytest

from uvcheck.io.reader import read_spectrum
from uvcheck.spectrum import integrate


def test_per_wavenumber_values_give_the_per_nm_band_integrals(tmp_path):
    wl = np.arange(300.0, 500.01, 0.25)
    e_nm = 0.05 * np.exp(-0.5 * ((wl - 365.0) / 5.0) ** 2)        # a 365 nm LED, W/m²/nm
    nu = 1e7 / wl
    e_nu = e_nm * wl ** 2 / 1e7                                     # W/m² per cm⁻¹
    rows = "\n".join(f"{a:.6f},{b:.9e}" for a, b in zip(nu, e_nu))
    p = tmp_path / "wn.csv"
    p.write_text("# invented\nWavenumber [cm-1],Irradiance [W/m2/cm-1]\n" + rows + "\n",
                 encoding="utf-8")
    s, rep = read_spectrum(p)
    assert s.quantity == "irradiance"
    assert any("per wavenumber" in w for w in rep.warnings)
    want = np.trapezoid(e_nm[(wl >= 315) & (wl <= 400)], wl[(wl >= 315) & (wl <= 400)])
    # 0.05 × 5 × √(2π) ≈ 0.627 W/m², all within UV-A
    assert want == pytest.approx(0.05 * 5 * np.sqrt(2 * np.pi), rel=1e-3)
    assert integrate(s, 315.0, 400.0).value == pytest.approx(want, rel=1e-3)
