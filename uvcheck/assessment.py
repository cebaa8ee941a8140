"""The Assessment: one object holding every result for one lamp.

``assess(spectrum, conditions, ...) -> Assessment`` runs the evaluators in order (bands,
spectral features, photometry, hazards, germicidal output, claims) and keeps their result
objects. ``Assessment.to_dict()`` is the single source of truth for the JSON, terminal, HTML,
PDF and CSV outputs: every renderer reads this dict, so the printed number and the tested
number are the same number.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from functools import cached_property
from typing import Any

from uvcheck import __version__
from uvcheck.bands import UVC_DEFINITION_NOTE, BandResult, band_breakdown
from uvcheck.conditions import Conditions
from uvcheck.features import (DetectedLine, PeakInfo, find_lines, peak_info,
                               second_order_suspects)
from uvcheck.germicidal import evaluate_germicidal
from uvcheck.hazards import SCREENING_NOTE, evaluate_hazards
from uvcheck.photometry import Photometry, photometry, visible_share
from uvcheck.spectrum import Spectrum

SCHEMA = "uvcheck.assessment/1"

#: The screening caveat every output carries (one wording, from the hazard module).
SCREENING_NOTICE = SCREENING_NOTE


@dataclass(frozen=True)
class AssessOptions:
    """Choices that change what is evaluated.

    limit_set : exposure-limit set id (see ``uvcheck references``).
    exposure_time_s : exposure duration for hazard distances. [s]
    """

    limit_set: str = "iec62471_2006"
    technology: str | None = None
    uncertainty: bool = True
    uncertainty_inputs: Any = None      # uvcheck.uncertainty.UncertaintyInputs; None = defaults
    draws: int | None = None            # Monte Carlo draws; None = the default (4000)


@dataclass(frozen=True)
class Assessment:
    """Every result for one lamp, as result objects; :meth:`to_dict` is the JSON contract."""

    spectrum: Spectrum
    conditions: Conditions
    #: the reader's ImportReport (None for a nominal spectrum), for the ``input`` block
    report: Any
    bands: dict[str, BandResult]
    peak: PeakInfo
    sections: dict[str, Any] = field(default_factory=dict)
    #: warnings found while assessing; :meth:`to_dict` adds :attr:`line_warnings` after them
    warnings: tuple[str, ...] = ()
    notes: tuple[str, ...] = ()

    # --- computed on first use (a batch summary row needs none of them) ---------------------
    @cached_property
    def input(self) -> dict[str, Any]:
        """The ``input`` block of the JSON contract (:func:`input_section`)."""
        return input_section(self.spectrum, self.report)

    @cached_property
    def lines(self) -> list[DetectedLine]:
        """The emission lines found in the spectrum (:func:`uvcheck.features.find_lines`)."""
        return find_lines(self.spectrum)

    @cached_property
    def photometry(self) -> Photometry:
        """Luminous quantity, chromaticity and CCT (:func:`uvcheck.photometry.photometry`)."""
        return photometry(self.spectrum, visible_share(self.spectrum))

    @cached_property
    def scale_shift(self) -> Any:
        """A shift of the wavelength scale that the mercury lines reveal, or None
        (:func:`uvcheck.features.mercury_scale_shift`; measured spectra only)."""
        from uvcheck.features import mercury_scale_shift
        from uvcheck.spectrum import is_nominal

        if is_nominal(self.spectrum) or self.spectrum.lines:
            return None
        return mercury_scale_shift(self.lines, self.spectrum.step_nm)

    @cached_property
    def line_warnings(self) -> tuple[str, ...]:
        """A warning per peak that may be a stronger line's second diffraction order (of a
        measured spectrum only: a nominal model built from a listing has no spectrometer)."""
        from uvcheck.spectrum import is_nominal

        if is_nominal(self.spectrum):
            return ()
        from uvcheck.features import UNDERSAMPLED_STEPS, undersampled_lines

        thin = undersampled_lines(self.spectrum, self.lines)
        sampled = () if not thin else (
            "line" + ("s" if len(thin) > 1 else "") + " at "
            + ", ".join(f"{x.wavelength_nm:.1f} nm (FWHM {x.fwhm_nm:.2g} nm)" for x in thin)
            + f" narrower than {UNDERSAMPLED_STEPS:g} sampling steps: the band and hazard "
            "values of such a line depend on where it falls between samples (by tens of "
            "percent for a step as wide as the line) unless the instrument's bandpass is "
            "matched to the step; check the instrument's bandwidth, or measure with a finer "
            "step",)
        return sampled + tuple(
            f"the peak at {suspect.wavelength_nm:.1f} nm lies at twice the "
            f"{parent.wavelength_nm:.1f} nm line: possibly that line in the "
            "spectrometer's second diffraction order (no order-sorting filter), not "
            "emission; if so, the visible share and the blue-light figures are "
            "overstated. Check with a long-pass filter or the instrument's "
            "order-sorting setting"
            for parent, suspect in second_order_suspects(self.lines, self.spectrum.step_nm)
        ) + self._shift_warning()

    def _shift_warning(self) -> tuple[str, ...]:
        sh = self.scale_shift
        if sh is None:
            return ()
        pk = ", ".join(f"{p:.1f}" for p, _ in sh.matched)
        ref = ", ".join(f"{r:g}" for _, r in sh.matched)
        return (f"the peaks at {pk} nm match the mercury lines at {ref} nm with the wavelength "
                f"scale shifted by {sh.shift_nm:+.1f} nm: the spectrometer's wavelength "
                "calibration is likely off by that much (the values are not corrected: the "
                "weighted hazards and the germicidal figures move with the scale, and lines "
                "are not named); check the calibration, or give --wavelength-correction "
                f"'{-sh.shift_nm:+.1f} nm' once the shift is confirmed",)

    def to_dict(self) -> dict[str, Any]:
        hg: bool | None = any(ln.identified_as == "Hg 253.7 nm" for ln in self.lines)
        if not hg and not any(a <= 253.7 <= b for a, b in self.spectrum.segments()) \
                and not self.spectrum.lines:
            hg = None   # 253.7 nm was not measured: the line can be neither found nor missed
        d: dict[str, Any] = {
            "schema": SCHEMA,
            "tool": {"name": "uvcheck", "version": __version__},
            "input": self.input,
            "conditions": self.conditions.to_dict(),
            "position": position_statement(self.conditions, self.input.get("origin", "measured"),
                                           bool(self.input.get("digitised"))),
            "bands": {k: v.to_dict() for k, v in self.bands.items()},
            "band_convention": UVC_DEFINITION_NOTE,
            "spectral": {
                **self.peak.to_dict(),
                "lines": [ln.to_dict() for ln in self.lines],
                "hg_253_7_present": hg,
                # a shift of the wavelength scale that the mercury lines reveal (or None)
                "wavelength_scale_shift": (self.scale_shift.to_dict()
                                           if self.scale_shift is not None else None),
            },
            "photometry": self.photometry.to_dict(),
        }
        extra_notes: list[str] = []
        for k, v in self.sections.items():
            if k == "uncertainty":
                continue  # merged last, into the hazard entries as well
            part = v.to_dict() if hasattr(v, "to_dict") else v
            if k in ("hazards", "claims"):
                # these evaluations contribute several top-level keys of the contract
                # (hazards, risk_group, evaluation, ...; claims, claims_summary, listing, ...)
                extra_notes += part.pop("notes", [])
                d.update(part)
            else:
                d[k] = part
        d["warnings"] = list(self.warnings) + list(self.line_warnings)
        notes = list(self.notes) + [n for n in extra_notes if n not in self.notes]
        d["notes"] = notes + ([SCREENING_NOTICE] if SCREENING_NOTICE not in notes else [])
        if "uncertainty" in self.sections:
            from uvcheck.uncertainty import merge_into

            merge_into(d, self.sections["uncertainty"])
        elif d.get("risk_group") is not None:
            from uvcheck.uncertainty import apply_rule_to_risk_group

            apply_rule_to_risk_group(d["risk_group"], None)   # the same keys, None
        return d

    def summary_parts(self) -> dict[str, Any]:
        """The parts of :meth:`to_dict` that a batch summary row reads (``input.origin``,
        ``spectral.peak_nm``, ``germicidal.uvc``, ``conditions``, ``risk_group``,
        ``use_distance.risk_group``, ``claims``, ``claims_summary``), from the same
        ``to_dict`` methods,
        without the rest: no organism tables (:class:`uvcheck.germicidal.OrganismPlan`
        evaluates those on first use), lines or photometry. With an uncertainty section (which
        can move the risk group under the guarded rule) it is the whole :meth:`to_dict`.
        tests/test_batch_speed.py checks that a summary row from these parts equals the row
        from :meth:`to_dict`."""
        if "uncertainty" in self.sections:
            return self.to_dict()
        d: dict[str, Any] = {"input": {"origin": self.spectrum.meta.get("origin", "measured"),
                                       "warnings": import_warnings(self.spectrum, self.report)},
                             "spectral": self.peak.to_dict(),
                             "conditions": self.conditions.to_dict()}
        g = self.sections.get("germicidal")
        if g is not None:
            d["germicidal"] = {"uvc": g.uvc.to_dict()}
        hz = self.sections.get("hazards")
        if hz is not None:
            use = hz.use_distance
            d["risk_group"] = hz.risk_group.to_dict()
            d["use_distance"] = None if use is None else {"risk_group": use.risk_group.to_dict()}
        v = self.sections.get("claims")
        if v is not None:
            part = v.to_dict() if hasattr(v, "to_dict") else dict(v)
            part.pop("notes", None)
            d.update(part)
        if d.get("risk_group") is not None:
            from uvcheck.uncertainty import apply_rule_to_risk_group

            apply_rule_to_risk_group(d["risk_group"], None)
        return d


def position_statement(c: Conditions, origin: str = "measured", digitised: bool = False) -> str:
    if origin == "nominal":
        return (f"Nominal estimate placed at {c.measurement_distance_m:g} m from the lamp "
                "(no measurement).")
    if digitised and c.measurement_distance_m is not None:
        return (f"A curve read off a graph, taken to hold at {c.measurement_distance_m:g} m "
                "from the lamp (no measurement).")
    if c.measurement_distance_m is None:
        return ("No measurement distance was given: results apply at the measurement "
                "position only.")
    return f"Measured at {c.measurement_distance_m:g} m from the lamp."


def import_warnings(spectrum: Spectrum, report: Any | None) -> list[str]:
    """``input.warnings``: the reader's warnings (its :class:`~uvcheck.io.reader.ImportReport`,
    None for a nominal model), then those of any scaling."""
    warnings = [] if report is None else list(report.warnings)
    for s in spectrum.meta.get("scaling", []):
        for key in ("warning", "note"):
            if s.get(key):
                warnings.append(s[key])
    return warnings


def input_section(spectrum: Spectrum, report: Any | None) -> dict[str, Any]:
    """The ``input`` block of the JSON contract."""
    meta = dict(spectrum.meta)
    lo, hi = spectrum.range_nm
    inferred = report.to_dict() if report is not None else {}
    warnings = import_warnings(spectrum, report)
    return {
        "path": meta.get("source"),
        "sha256": meta.get("sha256"),
        "origin": meta.get("origin", "measured"),
        "invented": bool(meta.get("invented")),
        # a curve read off a graph (--digitised): no measurement of the lamp
        "digitised": bool(meta.get("digitised")),
        "quantity": spectrum.quantity,
        "unit": spectrum.spectral_unit,
        "range_nm": [lo, hi],
        "step_nm": spectrum.step_nm,
        "noise_floor": spectrum.noise_floor,
        "scaling": list(meta.get("scaling", [])),
        "instrument": dict(meta.get("instrument", {})),
        "test_record": dict(meta.get("test_record", {})),
        "inferred": inferred,
        "warnings": warnings,
        # repeat scans (uvcheck.repeats): how far the scans agree; None for one scan
        "repeats": meta.get("repeats"),
        # a dark scan subtracted (uvcheck.background): which, over what range, its level
        "dark": meta.get("dark"),
    }


def assess(spectrum: Spectrum, conditions: Conditions | None = None, report: Any | None = None,
           options: AssessOptions | None = None, claims: Any | None = None,
           extra: dict[str, Any] | None = None, listing: Any | None = None) -> Assessment:
    """Evaluate a spectrum: bands, features, photometry, hazards, germicidal output.

    spectrum : the spectrum at the measurement position (absolute or relative).
    conditions : distances, source size, exposure time (defaults: none given).
    report : the reader's ImportReport, copied into the ``input`` block.
    options : :class:`AssessOptions`.
    claims : a :class:`uvcheck.claims.ClaimsResult` (verdicts on a listing's claims) judged
        elsewhere (a listing screening).
    extra : further JSON sections (e.g. ``nominal`` for a listing screening).
    listing : a :class:`uvcheck.io.listing.Listing` whose claims are judged against this
        spectrum, using the uncertainty intervals and the decision rule.

    The Monte Carlo uncertainty evaluation (:mod:`uvcheck.uncertainty`) runs by default for
    absolute spectra (``options.uncertainty``); it adds intervals to every hazard and the
    ``uncertainty`` section.
    """
    conditions = conditions or Conditions()
    options = options or AssessOptions()
    bands = band_breakdown(spectrum)
    warnings: list[str] = []
    notes: list[str] = []
    if not spectrum.is_absolute:
        warnings.append("RELATIVE spectrum: only shape results (band fractions, peak, "
                        "centroid) are given; no hazard value, time or dose can be computed "
                        "until it is scaled (--scale-band, --scale-lux or --scale-total).")
    if conditions.measurement_distance_m is None:
        notes.append(position_statement(conditions))
    sections: dict[str, Any] = {}
    hz = evaluate_hazards(spectrum, conditions, limit_set=options.limit_set)
    sections["hazards"] = hz
    g = evaluate_germicidal(spectrum, conditions, technology=options.technology)
    sections["germicidal"] = g
    if any(a.is_stray for a in g.artefacts):
        notes.append("The UV-C signal looks like stray light or noise (see germicidal.artefacts); "
                     "the actinic UV hazard E_S still counts it, which can only overstate that "
                     "hazard, never understate it; a safety or risk-group claim that only this "
                     "UV-C would fail is not assessable.")
    unc = None
    if options.uncertainty and spectrum.is_absolute:
        from uvcheck.uncertainty import evaluate_uncertainty

        unc = evaluate_uncertainty(spectrum, conditions, hz, g, options.uncertainty_inputs,
                                   draws=options.draws)
        sections["uncertainty"] = unc
    if listing is not None and claims is None:
        from uvcheck.claims import judge, readings_from_measurement

        udict = unc.to_dict() if unc is not None else None
        rule = (udict or {}).get("decision_rule", {}).get("rule", "simple") if udict else "simple"
        claims = judge(listing, readings_from_measurement(spectrum, conditions, options.technology),
                       measured=True, uncertainty=udict, rule=rule,
                       limit_set=options.limit_set)
    if claims is not None:
        sections["claims"] = claims
    for k, v in (extra or {}).items():
        sections[k] = v
    return Assessment(spectrum=spectrum, conditions=conditions,
                      report=report, bands=bands,
                      peak=peak_info(spectrum), sections=sections,
                      warnings=tuple(warnings), notes=tuple(notes))
