"""Band breakdown: how much of the output is UV-C, UV-B, UV-A, visible, IR-A.

Band edges (ISO 21348 / CIE S 017 ILV): UV-C 100–280 nm, UV-B 280–315 nm, UV-A 315–400 nm,
visible 380/400–780 nm, IR-A 780–1400 nm. uvcheck uses a partition that a spectrometer in air
can measure:

* ``below-200nm`` 100–200 nm: vacuum UV, where the 184.9 nm mercury line sits; absorbed by
  air within centimetres, making ozone; almost no instrument measures it;
* ``UV-C`` 200–280 nm (the practical edge; the CIE definition starts at 100 nm);
* ``UV-B`` 280–315 nm, ``UV-A`` 315–400 nm, ``visible`` 400–780 nm, ``IR-A`` 780–1400 nm;
* ``far-UVC`` 200–235 nm, a sub-band of UV-C (not part of the partition).

Each band reports its value, its fraction of the measured total, its coverage (share of the
band inside the measured range), and a status:

* ``complete``: fully measured;
* ``partial``: partly measured, the value is a lower bound; when the measured part is
  under its detection limit the value is None and ``below_detection`` is true: the measured
  part reads "< detection limit so far" and the unmeasured part is unknown (a band with 3 %
  coverage is never reported as if it had been checked);
* ``not-covered``: not measured at all, the value is None (never 0);
* ``below-detection``: fully measured and under the detection limit (3 σ of the band
  integral from the noise floor), reported as "< detection limit", not as a number.

The noise floor, and so the detection limit, is never below the dynamic-range floor of
:func:`uvcheck.features.estimate_noise` (1e-6 of the peak, common practice): noise-free data
do not turn 1e-270 W m⁻² into a measured value.

``detection_limit`` (3 σ) is the same number that :mod:`uvcheck.germicidal` gives for UV-C
and far-UVC over the same range (both integrate with :func:`uvcheck.spectrum.integrate`);
germicidal readings add an ``upper_bound`` (apparent value + 3 σ, the favourable reading
for claims), which is a different quantity. Bands give the same ``upper_bound``.
"""

from __future__ import annotations

from dataclasses import dataclass

from uvcheck.spectrum import Spectrum, integrate, total_integral
from uvcheck.units import to_trade

#: (name, lo_nm, hi_nm, in_partition, description)
BANDS: tuple[tuple[str, float, float, bool, str], ...] = (
    ("below-200nm", 100.0, 200.0, True, "vacuum UV (184.9 nm Hg line; makes ozone)"),
    ("UV-C", 200.0, 280.0, True, "UV-C, 200–280 nm (CIE: 100–280 nm)"),
    ("far-UVC", 200.0, 235.0, False, "far-UVC, 200–235 nm (sub-band of UV-C)"),
    ("UV-B", 280.0, 315.0, True, "UV-B, 280–315 nm"),
    ("UV-A", 315.0, 400.0, True, "UV-A, 315–400 nm"),
    ("visible", 400.0, 780.0, True, "visible, 400–780 nm"),
    ("IR-A", 780.0, 1400.0, True, "IR-A, 780–1400 nm"),
)
BAND_NAMES = tuple(b[0] for b in BANDS)
BAND_RANGES = {b[0]: (b[1], b[2]) for b in BANDS}
UVC_DEFINITION_NOTE = ("UV-C is integrated from 200 nm, the practical edge for radiation in "
                       "air; the CIE definition of UV-C is 100–280 nm, and 100–200 nm is "
                       "reported separately as below-200nm.")


@dataclass(frozen=True)
class BandResult:
    """One band of the breakdown.

    name : band name (see :data:`BANDS`).
    range_nm : band limits. [nm]
    value : integral over the measured part (None if not covered, below detection or relative).
        [W m⁻²] for irradiance (or W m⁻² sr⁻¹, W).
    unit : unit of ``value``.
    fraction : share of the measured total (None when value is None, except for relative
        spectra, where the fraction is the only result). [-]
    coverage : share of the band inside the measured range. [-]
    status : ``complete`` | ``partial`` | ``not-covered`` | ``below-detection``.
    detection_limit : 3 σ of the band integral over the measured part, same unit as value
        (None if unknown).
    below_detection : the measured part is under the detection limit (status
        ``below-detection``, or ``partial`` with value None).
    upper_bound : where below detection: max(apparent value, 0) + detection limit, the
        highest value the measured part allows (as germicidal readings). [unit of value]
    """

    name: str
    range_nm: tuple[float, float]
    value: float | None
    unit: str
    fraction: float | None
    coverage: float
    status: str
    detection_limit: float | None
    below_detection: bool = False
    upper_bound: float | None = None

    @property
    def is_lower_bound(self) -> bool:
        return self.status == "partial"

    def to_dict(self) -> dict:
        trade, label = to_trade(self.value, self.unit)
        dl_trade, _ = to_trade(self.detection_limit, self.unit)
        ub_trade, _ = to_trade(self.upper_bound, self.unit)
        return {"range_nm": list(self.range_nm), "value": self.value, "unit": self.unit,
                "fraction": self.fraction, "coverage": self.coverage, "status": self.status,
                "detection_limit": self.detection_limit,
                "below_detection": self.below_detection, "upper_bound": self.upper_bound,
                "is_lower_bound": self.is_lower_bound,
                "value_trade": trade, "detection_limit_trade": dl_trade,
                "upper_bound_trade": ub_trade, "trade_unit": label}


def band_breakdown(spectrum: Spectrum) -> dict[str, BandResult]:
    """Integrate every band of :data:`BANDS`, with coverage and detection status.

    Examples
    --------
    >>> import numpy as np
    >>> wl = np.arange(250.0, 451.0)
    >>> b = band_breakdown(Spectrum(wl, np.ones(wl.size), "irradiance"))
    >>> (b["UV-A"].value, b["UV-A"].status, b["UV-C"].status, b["below-200nm"].status)
    (85.0, 'complete', 'partial', 'not-covered')
    """
    total = total_integral(spectrum)
    out: dict[str, BandResult] = {}
    absolute = spectrum.is_absolute
    for name, lo, hi, _part, _desc in BANDS:
        r = integrate(spectrum, lo, hi)
        dl = r.detection_limit
        below, ub = False, None
        if r.coverage <= 0.0:
            status, value, frac = "not-covered", None, None
        elif dl is not None and r.value < dl:
            # under the detection limit; a partly covered band stays partial (a lower bound
            # with nothing detected in the measured part), never "checked and below detection"
            status = "below-detection" if r.complete else "partial"
            value, frac, below = None, None, True
            ub = max(r.value, 0.0) + dl
        else:
            status = "complete" if r.complete else "partial"
            value = r.value
            frac = r.value / total if total > 0 else None
        if not absolute:
            value = None
            dl = ub = None
        out[name] = BandResult(name=name, range_nm=(lo, hi), value=value,
                               unit=spectrum.integrated_unit, fraction=frac,
                               coverage=r.coverage, status=status, detection_limit=dl,
                               below_detection=below, upper_bound=ub)
    return out


def measured_total(spectrum: Spectrum) -> float:
    """∫ over the whole measured range (the denominator of the band fractions)."""
    return total_integral(spectrum)
