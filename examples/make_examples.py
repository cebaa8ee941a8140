"""Generate the INVENTED demo spectra in examples/spectra/ (run: python examples/make_examples.py).

Nothing here is a measurement of a real product. The scenario is our own: the practice
manager of a small veterinary clinic checks three lamps before buying one for the kennel
room. Each file imitates a different export dialect so the demo also shows the reader at work.
Line shapes are Gaussians broadened to a typical array-spectrometer resolution; the noise,
stray-light pedestal and dark offsets are typical of such instruments (common practice, not
taken from any instrument's data sheet).
"""

from __future__ import annotations

from pathlib import Path

import numpy as np

OUT = Path(__file__).resolve().parent / "spectra"
HEADER = "INVENTED DEMO DATA - not a measurement of any real product"


def g(wl, c, fwhm, area):
    s = fwhm / 2.3548
    return area / (s * np.sqrt(2 * np.pi)) * np.exp(-0.5 * ((wl - c) / s) ** 2)


def violet_wand(rng):
    """A handheld 'UV-C sterilising wand' that is really a 395 nm LED (measured at 10 cm)."""
    wl = np.arange(200.0, 800.01, 0.5)
    e = g(wl, 396.0, 12.0, 14.0) + g(wl, 405.0, 30.0, 1.2)          # W m^-2 nm^-1, ~15 W/m^2
    e += np.where(wl < 330, 3.0e-5, 0.0)                              # stray-light pedestal in the UV
    e += rng.normal(0.0, 8.0e-6, wl.size)                             # detector noise after dark subtraction
    lines = [f"# {HEADER}", "Messgerät;invented array spectrometer", "Integrationszeit;20 ms",
             "Mittelung;10", "Messabstand;10 cm", "Produkt;handheld UV-C sterilising wand (invented)", "",
             "Wellenlänge [nm];Bestrahlungsstärke [µW/cm²/nm]"]
    lines += [f"{a:.1f};{b * 100:.6f}".replace(".", ",") for a, b in zip(wl, e)]
    (OUT / "wand_395nm_led.csv").write_bytes(("\n".join(lines) + "\n").encode("cp1252"))


def mercury_tube(rng):
    """A genuine low-pressure mercury germicidal tube, 0.55 m arc, measured at 1 m."""
    wl = np.arange(200.0, 800.01, 0.25)
    lines_nm = {253.7: 0.42, 296.7: 0.004, 302.2: 0.002, 312.6: 0.012, 365.0: 0.010,
                404.7: 0.012, 435.8: 0.020, 546.1: 0.018, 577.0: 0.006}  # W m^-2 at 1 m
    e = sum(g(wl, c, 1.4, a) for c, a in lines_nm.items())
    e += rng.normal(0.0, 2.0e-6, wl.size)
    lines = [f"# {HEADER}", "# Instrument: invented scanning spectroradiometer, cosine diffuser",
             "# Lamp: low-pressure mercury germicidal tube, 0.55 m arc (invented product)",
             "# Distance: 1 m on the perpendicular bisector", "# Warm-up: 15 min",
             "Wavelength_nm\tIrradiance_W_m2_nm"]
    lines += [f"{a:.2f}\t{b:.6e}" for a, b in zip(wl, e)]
    (OUT / "mercury_tube_254nm.txt").write_text("\n".join(lines) + "\n", encoding="utf-8")


def krcl_unit(rng):
    """A filtered KrCl* 222 nm 'far-UV' ceiling unit, measured at 1 m below it."""
    wl = np.arange(200.0, 400.01, 0.5)
    e = g(wl, 222.0, 4.0, 0.020) + g(wl, 228.0, 12.0, 0.0012)           # band + skirt
    e += 2.0e-7 * np.exp(-(wl - 240.0) / 25.0) * (wl > 240)             # filter leak tail
    e += rng.normal(0.0, 4.0e-8, wl.size)
    lines = [f"# {HEADER}", "[Header]", "Device=invented double-monochromator spectroradiometer",
             "Distance=1 m", "Product=222 nm far-UV ceiling unit (invented)", "[Data]",
             "Wavelength,Spectral irradiance", "nm,mW/m2/nm"]
    lines += [f"{a:.1f},{b * 1000:.6f}" for a, b in zip(wl, e)]
    (OUT / "faruv_222nm_unit.csv").write_text("\n".join(lines) + "\n", encoding="utf-8")


if __name__ == "__main__":
    OUT.mkdir(exist_ok=True)
    rng = np.random.default_rng(20261201)
    violet_wand(rng)
    mercury_tube(rng)
    krcl_unit(rng)
    print("wrote", ", ".join(sorted(p.name for p in OUT.iterdir())))
