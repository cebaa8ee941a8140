"""The physical constants (uvcheck.constants) against scipy.constants (CODATA 2018; h, c, e
and N_A exact by the 2019 SI definitions), and the photon-energy helpers against E = hc/λ
computed with scipy's values."""

from __future__ import annotations

import subprocess
import sys

from scipy import constants as sc

from uvcheck import constants as C


def test_defined_constants_equal_scipys():
    assert C.PLANCK_J_S == sc.h
    assert C.SPEED_OF_LIGHT_M_S == sc.c
    assert C.ELEMENTARY_CHARGE_C == sc.e
    assert C.AVOGADRO_PER_MOL == sc.N_A
    assert C.HC_EV_NM == sc.h * sc.c / sc.e * 1e9


def test_photon_energy_helpers_equal_hc_over_lambda():
    for lam in (184.9, 222.0, 253.7, 405.0, 1000.0):
        assert C.photon_energy_eV(lam) == sc.h * sc.c / sc.e * 1e9 / lam
        assert C.photon_energy_J(lam) == sc.h * sc.c / (lam * 1e-9)
    assert C.shortest_wavelength_nm(3.1) == sc.h * sc.c / sc.e * 1e9 / 3.1


def test_the_constants_do_not_import_scipy():
    code = "import sys, uvcheck.constants as c; c.photon_energy_eV(254.0); print('scipy' in sys.modules)"
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == "False"
