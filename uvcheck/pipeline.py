"""One product, from its files to an :class:`~uvcheck.assessment.Assessment`.

``assess_files(spectrum_file, listing, inputs, options) -> Assessment`` is the sequence that
``uvcheck assess``, ``uvcheck note`` and ``uvcheck batch`` share: read the spectrum, scale a
relative one, take the measurement distance (given, else the file's), build the conditions
(the listing fills what the options leave open), and assess it with the listing's claims; or,
for a listing without a spectrum, screen the listing (nominal spectra: an ESTIMATE). The
commands only parse their options into :class:`ProductInputs` and render the result.

A screening assessment, not a certification.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, replace
from pathlib import Path
from typing import Any, Callable, Mapping, Sequence

from uvcheck.errors import ConfigurationError


#: Where an error in a per-product input points: the command-line option (``batch`` passes
#: its manifest's column names instead, :data:`uvcheck.batch.MANIFEST_NAMES`).
CLI_NAMES: dict[str, str] = {
    "distance": "--distance", "scale_band": "--scale-band", "scale_lux": "--scale-lux",
    "scale_total": "--scale-total", "source_size": "--source-size", "alpha": "--alpha",
    "use_distance": "--use-distance", "exposure_time": "--exposure-time",
    "electrical_power": "--electrical-power", "emitter": "--emitter",
    "tube_length": "--tube-length", "meter_response": "--meter-response", "dark": "--dark",
    "dark_column": "--dark-column"}


def emitter_options(emitter: str | None, tube_length: str | None,
                    names: Mapping[str, str] = CLI_NAMES) -> dict[str, Any]:
    """Conditions fields from --emitter and --tube-length (empty when neither is given, so a
    listing's emitter model applies). names : where an error points (:data:`CLI_NAMES`)."""
    from uvcheck.conditions import EMITTERS

    out: dict[str, Any] = {}
    if emitter is not None:
        if emitter not in EMITTERS:
            raise ConfigurationError(f"unknown emitter model {emitter!r}", names["emitter"],
                                     f"use one of: {', '.join(EMITTERS)}")
        out["emitter"] = emitter
    if tube_length is not None:
        if emitter not in (None, "tube"):
            raise ConfigurationError(f"{names['tube_length']} applies to the tube emitter model",
                                     names["tube_length"],
                                     f"give {names['emitter']} tube, or leave it out")
        out["emitter"] = "tube"
        out["tube_length_m"] = _length(tube_length, names["tube_length"])
    return out


def conditions_from_options(d0: float | None, source_size: str | None, alpha: float | None,
                            use_distance: str | None, general_lighting: bool,
                            exposure_time: str, listing: Any | None = None,
                            electrical_power: str | None = None,
                            names: Mapping[str, str] = CLI_NAMES, **extra: Any) -> Any:
    """Conditions from the command-line options; a listing fills what the options leave open
    (emitter model, tube length, source size, electrical power, distance of use).
    names : where an error points (:data:`CLI_NAMES`)."""
    from uvcheck.conditions import Conditions
    from uvcheck.units import parse_quantity

    if source_size is not None and alpha is not None:
        raise ConfigurationError(f"give {names['source_size']} or {names['alpha']}, not both")
    t = parse_quantity(exposure_time, "time", names["exposure_time"]).value_si
    size = _length(source_size, names["source_size"], default_unit="mm")
    power = None if electrical_power is None else parse_quantity(
        electrical_power, "power", names["electrical_power"]).value_si
    if listing is not None:
        if size is None and alpha is None:
            size = listing.source_size_m
        if power is None:
            power = listing.electrical_power_W
        if "emitter" not in extra and listing.emitter:
            extra["emitter"] = listing.emitter
            if listing.emitter == "tube":
                extra.setdefault("tube_length_m", listing.tube_length_m)
    use_m = _length(use_distance, names["use_distance"])
    if use_m is None and listing is not None:
        use_m = listing.use_distance_m  # the listing's stated distance of use
    return Conditions(measurement_distance_m=d0,
                      use_distance_m=use_m,
                      source_size_m=size, alpha_rad=alpha, general_lighting=general_lighting,
                      exposure_time_s=t, electrical_power_W=power, **extra)


def test_record(items: Sequence[str]) -> dict[str, str]:
    """The test's own record from ``KEY=VALUE`` texts (warm-up, supply, cosine corrector,
    calibration date, …), in the order given; kept for the report, used in no computation.

    >>> test_record(["warm-up = 15 min", "cosine corrector=yes"])
    {'warm-up': '15 min', 'cosine corrector': 'yes'}
    """
    out: dict[str, str] = {}
    for item in items:
        key, sep, value = str(item).partition("=")
        if not sep or not key.strip() or not value.strip():
            raise ConfigurationError(f"cannot read the test fact {item!r}", "--test-info",
                                     "write it as KEY=VALUE, e.g. 'warm-up=15 min'")
        out[key.strip()] = value.strip()
    return out


def apply_scaling(spec: Any, scale_band: str | None, scale_lux: str | None,
                  scale_total: str | None, meter_response: str | Path | None = None) -> Any:
    from uvcheck import scaling

    if scale_band:
        response = (scaling.read_meter_response(meter_response) if meter_response is not None
                    else None)
        return scaling.scale_by_band(spec, scale_band, response)
    if scale_lux:
        return scaling.scale_by_lux(spec, scale_lux)
    if scale_total:
        return scaling.scale_by_total(spec, scale_total)
    return spec


def _length(text: str | None, where: str, default_unit: str | None = None) -> float | None:
    if text is None:
        return None
    from uvcheck.units import parse_quantity

    q = parse_quantity(text, "length", where, default_unit=default_unit).value_si
    if not q > 0:
        raise ConfigurationError(f"{text!r} must be a positive distance", where)
    return q


@dataclass(frozen=True)
class ProductInputs:
    """The per-product inputs as texts, as the command line or a manifest row gives them.

    distance : measurement distance ('20 cm'); None: the file's, if it states one.
    scale_band, scale_lux, scale_total : scaling of a relative spectrum (at most one).
    source_size : apparent source size (a bare number is mm); alpha : angular subtense. [rad]
    use_distance : a distance of use; None: the listing's, if it states one.
    general_lighting : a lamp for general lighting service (the 500 lx rule).
    exposure_time : exposure duration for hazard distances ('8 h').
    electrical_power : electrical input power ('8 W').
    emitter, tube_length : the distance model (``point`` | ``lambertian`` | ``tube``) and a
        tube's length; None: the listing's, else a point source.
    meter_response : the relative spectral response of the meter that gave ``scale_band``
        (a table file); None: a flat response over the band.
    repeats : further scans of the same lamp in the same position (files); the mean of all
        scans is assessed (:func:`uvcheck.repeats.combine_scans`).
    dark : a dark (background) scan (a file), subtracted from the (mean) lamp scan
        (:func:`uvcheck.background.subtract_dark`).
    dark_column : the column of the spectrum file that holds the dark scan (a name or a
        number, as ``--column`` takes it), subtracted the same way; not with ``dark``.
    """

    distance: str | None = None
    scale_band: str | None = None
    scale_lux: str | None = None
    scale_total: str | None = None
    source_size: str | None = None
    alpha: float | None = None
    use_distance: str | None = None
    general_lighting: bool = False
    exposure_time: str = "8 h"
    electrical_power: str | None = None
    emitter: str | None = None
    tube_length: str | None = None
    repeats: tuple[Path, ...] = ()
    dark: Path | None = None
    dark_column: str | None = None
    meter_response: str | Path | None = None
    test_info: tuple[str, ...] = ()

    def check(self, names: Mapping[str, str] | None = None) -> None:
        """Refuse a contradictory or unreadable input before any file is read (the texts are
        parsed here and again when used). names : where an error points (default
        :data:`CLI_NAMES`)."""
        names = CLI_NAMES if names is None else names
        given = [k for k in ("scale_band", "scale_lux", "scale_total")
                 if getattr(self, k) is not None]
        if len(given) > 1:
            raise ConfigurationError("give only one of " + ", ".join(
                names[k] for k in ("scale_band", "scale_lux", "scale_total")))
        test_record(self.test_info)
        if self.dark is not None and self.dark_column is not None:
            raise ConfigurationError(f"give one dark scan: {names.get('dark', '--dark')} (a file) "
                                     f"or {names.get('dark_column', '--dark-column')} (a column "
                                     "of the spectrum file)")
        if self.meter_response is not None and self.scale_band is None:
            raise ConfigurationError(f"{names.get('meter_response', '--meter-response')} goes "
                                     f"with {names['scale_band']} (the meter's reading)",
                                     todo=f"give the reading with {names['scale_band']}")
        _length(self.distance or None, names["distance"])
        conditions_from_options(None, self.source_size, self.alpha, self.use_distance,
                                self.general_lighting, self.exposure_time,
                                electrical_power=self.electrical_power, names=names,
                                **emitter_options(self.emitter, self.tube_length, names))


#: A distance option within 1 % of the file's stated distance agrees with it (our own rule:
#: rounding of '10 cm' against '0.1 m'). [-]
DISTANCE_AGREE = 0.01


@dataclass(frozen=True)
class Prepared:
    """One product read and its conditions built, ready for :meth:`assess`: what
    :func:`assess_files` hands to :func:`uvcheck.assessment.assess`, or, for a listing
    screened alone, the finished assessment (``done``)."""

    options: Any
    done: Any = None
    spectrum: Any = None
    conditions: Any = None
    report: Any = None
    listing: Any = None
    extra: Mapping[str, Any] | None = None

    @property
    def samples(self) -> int:
        """How many samples the read spectrum holds (0 for a finished screening)."""
        return 0 if self.spectrum is None else int(self.spectrum.wavelength_nm.size)

    def assess(self) -> Any:
        """The :class:`~uvcheck.assessment.Assessment`."""
        if self.done is not None:
            return self.done
        from uvcheck.assessment import assess

        return assess(self.spectrum, self.conditions, self.report, self.options,
                      extra=dict(self.extra) if self.extra else None, listing=self.listing)


def assess_files(spectrum_file: Path | None, listing: Any | None, inputs: ProductInputs,
                 options: Any, read_opts: Any = None, *,
                 extra: Callable[[Any, Any], Mapping[str, Any] | None] | None = None,
                 names: Mapping[str, str] | None = None) -> Any:
    """The :class:`~uvcheck.assessment.Assessment` of one product: :func:`prepare_files`,
    then :meth:`Prepared.assess`."""
    return prepare_files(spectrum_file, listing, inputs, options, read_opts, extra=extra,
                         names=names).assess()


def prepare_files(spectrum_file: Path | None, listing: Any | None, inputs: ProductInputs,
                  options: Any, read_opts: Any = None, *,
                  extra: Callable[[Any, Any], Mapping[str, Any] | None] | None = None,
                  names: Mapping[str, str] | None = None) -> Prepared:
    """One product up to its assessment (:class:`Prepared`), from the arguments of
    :func:`assess_files`.

    spectrum_file : the measured spectrum, or None to screen the listing alone.
    listing : a :class:`uvcheck.io.listing.Listing` (its claims are judged; it fills the
        conditions the inputs leave open), or the path of one (read after the spectrum), or
        None.
    options : :class:`uvcheck.assessment.AssessOptions` (limit set, uncertainty). A listing
        alone is screened as ``uvcheck screen`` does (no Monte Carlo; its spread is the range
        of its nominal readings).
    read_opts : :class:`uvcheck.io.reader.ReadOptions` (None: infer everything).
    extra : ``extra(spectrum, conditions)`` gives further sections (e.g. the room model's),
        added to the assessment.
    names : where an input error points (default :data:`CLI_NAMES`; ``batch``
        gives its manifest's columns).

    Errors come in this order: the inputs (:meth:`ProductInputs.check`, before any file is
    read), then the spectrum file, then a listing given as a path.
    """
    names = CLI_NAMES if names is None else names
    inputs.check(names)
    if isinstance(listing, (str, Path)) and spectrum_file is None:
        listing = _read_listing(listing)
    if spectrum_file is None and inputs.repeats:
        raise ConfigurationError("repeat scans need the first scan as the spectrum file",
                                 todo="give the spectrum file first, then --repeat for the others")
    if spectrum_file is None and (inputs.dark is not None or inputs.dark_column is not None):
        raise ConfigurationError(f"a dark scan ({names.get('dark', '--dark')}) is subtracted "
                                 "from a lamp scan: give the spectrum file too")
    if spectrum_file is None:
        if listing is None:
            raise ConfigurationError("give a spectrum file, a listing file, or both")
        from uvcheck.screening import screen_listing_file

        a = screen_listing_file(listing, limit_set=options.limit_set)
        if a.spectrum is None and extra is not None:
            # a listing with no lamp model: nothing to place in a room
            from uvcheck.errors import UnmodelledListingError

            raise UnmodelledListingError(f"{a.reason}, so there is no output to evaluate "
                                         "further", listing.source,
                                         "measure the lamp, or state lamp.technology or "
                                         "lamp.peak_wavelength (with its power)")
        more = extra(a.spectrum, a.conditions) if extra is not None else None
        return Prepared(options, done=replace(a, sections={**a.sections, **more}) if more else a)
    from uvcheck.io.reader import read_spectrum

    spec, report = read_spectrum(spectrum_file, read_opts)
    if inputs.repeats:
        spec, report = _with_repeats(spec, report, spectrum_file, inputs.repeats, read_opts)
    if inputs.dark is not None:
        spec, report = _with_dark(spec, report, inputs.dark, read_opts)
    elif inputs.dark_column is not None:
        from uvcheck.io.reader import ReadOptions

        spec, report = _with_dark(spec, report, spectrum_file,
                                  replace(read_opts or ReadOptions(), column=inputs.dark_column),
                                  label=f"{Path(spectrum_file).name}, column "
                                        f"{inputs.dark_column!r}")
    spec = apply_scaling(spec, inputs.scale_band, inputs.scale_lux, inputs.scale_total,
                         inputs.meter_response)
    if inputs.test_info:
        spec = spec.derive(meta={**dict(spec.meta), "test_record": test_record(inputs.test_info)})
    d0 = (_length(inputs.distance, names["distance"]) if inputs.distance
          else report.measurement_distance_m)
    d_file = report.measurement_distance_m
    if inputs.distance and d_file is not None and abs(d0 - d_file) > DISTANCE_AGREE * d_file:
        # the option wins, but a file that states another distance is worth a second look
        report = replace(report, warnings=tuple(report.warnings) + (
            f"the file states a measurement distance of {d_file:g} m, but "
            f"{names['distance']} gives {d0:g} m, which is used: check which is right",))
    if isinstance(listing, (str, Path)):
        listing = _read_listing(listing)
    cond = conditions_from_options(d0, inputs.source_size, inputs.alpha, inputs.use_distance,
                                   inputs.general_lighting, inputs.exposure_time,
                                   listing=listing, electrical_power=inputs.electrical_power,
                                   names=names,
                                   **emitter_options(inputs.emitter, inputs.tube_length, names))
    more = extra(spec, cond) if extra is not None else None
    return Prepared(options, spectrum=spec, conditions=cond, report=report, listing=listing,
                    extra=more or None)


def _with_repeats(spec: Any, report: Any, first: Path, repeats: Sequence[Path],
                  read_opts: Any) -> tuple[Any, Any]:
    """The mean of the first scan and its repeats (each read with the same options), with the
    first scan's report, its warnings joined by the repeats' own and the summary's."""
    from uvcheck.io.reader import read_spectrum
    from uvcheck.repeats import combine_scans

    scans, files, warnings = [spec], [str(first)], list(report.warnings)
    for f in repeats:
        s, r = read_spectrum(f, read_opts)
        scans.append(s)
        files.append(str(f))
        warnings += [f"{Path(f).name}: {w}" for w in r.warnings]
        warnings += _settings_differ(report, r, "repeat scan", Path(f).name)
        d0, d1 = report.measurement_distance_m, r.measurement_distance_m
        if d0 is not None and d1 is not None and abs(d1 - d0) > DISTANCE_AGREE * d0:
            raise ConfigurationError(f"the repeat scan {Path(f).name} states a measurement "
                                     f"distance of {d1:g} m, the first scan {d0:g} m",
                                     str(f), "repeat scans must be taken in one position")
    mean, summary = combine_scans(scans, files)
    lo, hi = summary.range_nm
    warnings.append(f"the mean of {summary.n} scans ({', '.join(Path(f).name for f in files)}) "
                    f"is assessed, over {lo:g}–{hi:g} nm (the range every scan covers); "
                    + (f"their totals differ by {summary.spread:.1%}"
                       if summary.spread is not None else "their totals are zero"))
    if summary.warning():
        warnings.append(summary.warning())
    noise = dict(report.noise)
    noise.update(sigma=mean.noise_floor, basis=summary.noise_basis,
                 method=f"mean of {summary.n} scans, σ/√{summary.n}",
                 n_negative=int((mean.values < 0).sum()))
    return mean, replace(report, warnings=tuple(warnings), noise=noise, sha256=mean.meta["sha256"])


#: Metadata keys that name an acquisition setting a dark or repeat scan must share with the
#: lamp scan (as spectrometer exports write them; our own list): setting → key pattern.
ACQUISITION_KEYS = (
    ("integration time", re.compile(r"integration|exposure\s*time|int\.?\s*time", re.I)),
    ("averaging", re.compile(r"averag|scans?\s*to\s*average|accumulat", re.I)),
    ("smoothing", re.compile(r"boxcar|smooth", re.I)),
)


def acquisition_settings(report: Any) -> dict[str, tuple[str, str]]:
    """The acquisition settings a file's metadata states: setting → (the key as written, the
    value), for the settings of :data:`ACQUISITION_KEYS` (the first key that names each)."""
    out: dict[str, tuple[str, str]] = {}
    for key, value in (getattr(report, "metadata", None) or {}).items():
        for name, rx in ACQUISITION_KEYS:
            if name not in out and rx.search(str(key)):
                out[name] = (str(key), str(value).strip())
    return out


def _settings_differ(first: Any, other: Any, what: str, name: str) -> list[str]:
    """Warnings for each acquisition setting that two files' metadata both state and that
    differs (the same key and value, spaces and case aside, agree)."""
    a, b = acquisition_settings(first), acquisition_settings(other)
    out = []
    for setting in a.keys() & b.keys():
        (ka, va), (kb, vb) = a[setting], b[setting]
        same = (ka.lower() == kb.lower()
                and "".join(va.split()).lower() == "".join(vb.split()).lower())
        if not same:
            out.append(f"the {what} {name} states {kb} = {vb!r}, the lamp scan {ka} = {va!r}: "
                       f"scans taken with different settings ({setting}) do not combine; "
                       "take them with the same settings")
    return out


def _with_dark(spec: Any, report: Any, dark_file: Path, read_opts: Any,
               label: str | None = None) -> tuple[Any, Any]:
    """The lamp scan minus a dark scan (read with the same options), with the lamp scan's
    report: its baseline warnings (an offset that a dark subtraction would remove, or one
    that went wrong) replaced by the same check on the result, the dark scan's own warnings
    and what the subtraction did. label : how the dark scan is named (default: its file
    name; a column of the spectrum file names itself)."""
    from uvcheck.background import subtract_dark
    from uvcheck.io.reader import BASELINE_MARK, baseline_warning, read_spectrum

    dark, r = read_spectrum(dark_file, read_opts)
    name = label or Path(dark_file).name
    out, summary = subtract_dark(spec, dark, label or str(dark_file))
    warnings = [w for w in report.warnings if BASELINE_MARK not in w]
    # the dark scan's own warnings, but what the lamp scan's report says already (a column of
    # the same file: the same wavelength axis) and its being relative where the lamp scan is
    warnings += [f"{name}: {w}" for w in r.warnings
                 if BASELINE_MARK not in w and w not in report.warnings
                 and not (spec.quantity == "relative" and "treated as RELATIVE" in w)]
    warnings += _settings_differ(report, r, "dark scan", name)
    lo, hi = summary.range_nm
    share = (f", {summary.peak_share:.2g} of the lamp scan's peak"
             if summary.peak_share is not None else "")
    warnings.append(f"dark scan {name} subtracted, over {lo:g}–{hi:g} nm (the range both cover):"
                    f" its median level {summary.level_text()}{share}; that it was taken with "
                    "the lamp scan's settings (integration time, averaging, position) cannot be "
                    "checked from the data")
    after = baseline_warning(out.values, out.noise_floor, out.quantity)
    lo_v, hi_v = float(out.values.min()), float(out.values.max())
    if after:
        warnings.append(f"after the dark subtraction: {after}")
    elif -lo_v > max(hi_v, 10.0 * (out.noise_floor or 0.0)):
        # the dark stands above the lamp where the lamp emits (our own rule: the deepest dip
        # beyond both the highest point and 10 σ of the noise)
        warnings.append(f"after the dark subtraction the deepest dip ({lo_v:.3g}) goes further "
                        f"below zero than the highest point ({hi_v:.3g}) rises above it: are the "
                        f"dark scan and the lamp scan swapped, or was the dark taken with the "
                        "lamp on? Check the two files")
    noise = dict(report.noise)
    noise.update(sigma=out.noise_floor, basis=summary.noise_basis,
                 method="lamp scan minus dark scan", n_negative=int((out.values < 0).sum()))
    return out, replace(report, warnings=tuple(warnings), noise=noise, sha256=out.meta["sha256"])


def _read_listing(path: str | Path) -> Any:
    from uvcheck.io.listing import read_listing

    return read_listing(Path(path))
