"""Physical constants, from one place, with their source.

h, c and e are exact by definition in the SI since 2019 (the 9th SI Brochure, BIPM, fixes
their numerical values); N_A too. They are written here with those defined values, so no
module needs scipy for them (``uvcheck assess --claims`` stays on numpy only);
tests/test_constants.py checks them against :mod:`scipy.constants` (CODATA). Derived values
are computed, never retyped.
"""

from __future__ import annotations

#: Maximum luminous efficacy for photopic vision, K_m [lm W⁻¹]. The SI candela definition fixes
#: 683 lm/W at 540 THz; CIE and colour-science (CONSTANT_K_M) use 683.
K_M_LM_PER_W = 683.0

#: Planck constant [J s], exact (SI 2019 definition).
PLANCK_J_S = 6.62607015e-34
#: Speed of light in vacuum [m s⁻¹], exact (SI definition of the metre).
SPEED_OF_LIGHT_M_S = 299792458.0
#: Elementary charge [C], exact (SI 2019 definition).
ELEMENTARY_CHARGE_C = 1.602176634e-19
#: Avogadro constant [mol⁻¹], exact (SI 2019 definition).
AVOGADRO_PER_MOL = 6.02214076e23
#: hc/e in eV·nm: E[eV] = HC_EV_NM / λ[nm]. Derived: h·c/e·1e9.
HC_EV_NM = PLANCK_J_S * SPEED_OF_LIGHT_M_S / ELEMENTARY_CHARGE_C * 1e9


def photon_energy_eV(wavelength_nm: float) -> float:
    """Energy of one photon, E = hc/λ. [eV]

    wavelength_nm : vacuum wavelength. [nm]

    Examples
    --------
    >>> round(photon_energy_eV(253.7), 3)
    4.887
    """
    return HC_EV_NM / wavelength_nm


def photon_energy_J(wavelength_nm: float) -> float:
    """Energy of one photon, E = hc/λ. [J]"""
    return PLANCK_J_S * SPEED_OF_LIGHT_M_S / (wavelength_nm * 1e-9)


def shortest_wavelength_nm(voltage_V: float) -> float:
    """Shortest wavelength a photon of energy e·V can have, λ = hc/(eV). [nm]

    Examples
    --------
    >>> round(shortest_wavelength_nm(3.1), 1)
    399.9
    """
    return HC_EV_NM / voltage_V
