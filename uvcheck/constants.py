"""Physical constants, from one place, with their source.

h, c, e and N_A come from :mod:`scipy.constants` (CODATA; exact since the 2019 SI). They are
loaded on first use (module ``__getattr__``), so modules that only need K_m do not pull in
scipy on the fast assessment path. Derived values are computed, never retyped.
"""

from __future__ import annotations

from typing import Any

#: Maximum luminous efficacy for photopic vision, K_m [lm W⁻¹]. The SI candela definition fixes
#: 683 lm/W at 540 THz; CIE and colour-science (CONSTANT_K_M) use 683.
K_M_LM_PER_W = 683.0

_SCIPY_NAMES = {"PLANCK_J_S": "h", "SPEED_OF_LIGHT_M_S": "c", "ELEMENTARY_CHARGE_C": "e",
                "AVOGADRO_PER_MOL": "N_A"}


def __getattr__(name: str) -> Any:
    if name in _SCIPY_NAMES:
        from scipy import constants as sc  # SI exact (2019 definition)

        return getattr(sc, _SCIPY_NAMES[name])
    if name == "HC_EV_NM":
        # hc/e in eV·nm: E[eV] = HC_EV_NM / λ[nm]. Derived: h·c/e·1e9.
        from scipy import constants as sc

        return sc.h * sc.c / sc.e * 1e9
    raise AttributeError(name)


def photon_energy_eV(wavelength_nm: float) -> float:
    """Energy of one photon, E = hc/λ. [eV]

    wavelength_nm : vacuum wavelength. [nm]

    Examples
    --------
    >>> round(photon_energy_eV(253.7), 3)
    4.887
    """
    from scipy import constants as sc

    return sc.h * sc.c / sc.e * 1e9 / wavelength_nm


def photon_energy_J(wavelength_nm: float) -> float:
    """Energy of one photon, E = hc/λ. [J]"""
    from scipy import constants as sc

    return sc.h * sc.c / (wavelength_nm * 1e-9)


def shortest_wavelength_nm(voltage_V: float) -> float:
    """Shortest wavelength a photon of energy e·V can have, λ = hc/(eV). [nm]

    Examples
    --------
    >>> round(shortest_wavelength_nm(3.1), 1)
    399.9
    """
    from scipy import constants as sc

    return sc.h * sc.c / sc.e * 1e9 / voltage_V
