"""The spectrum as assessed, written out for exchange.

What uvcheck assessed is often not the file it was given: the mean of repeat scans, a dark
scan subtracted, a relative spectrum scaled by a radiometer reading. A laboratory passing
the result on wants that spectrum, with where it came from. :func:`write_spectrum` writes it
in one of two formats, chosen by the file name:

* ``.spdx`` or ``.xml``: an IES TM-27-14 document (the IES's open XML exchange format for
  spectra), written by colour-science (``colour.SpectralDistribution_IESTM2714``, imported
  only here). The format names the spectral quantity but no unit: the values are written in
  the SI unit per nanometre (W m⁻² nm⁻¹ for irradiance), the unit uvcheck's own TM-27-14
  reader assumes (from memory, not read in the document), and the header's comments say so.
* anything else (``.csv``, ``.txt``): a comma-separated table with a header row naming the
  unit, after ``#`` lines with the provenance; uvcheck's reader (and a spreadsheet) reads it
  back as it is.

Both carry the provenance: the source file and its sha256, the steps between the file and
the spectrum (repeats, dark, scaling), the tool and version, and whether the data are
invented. Missing ranges stay missing: only the assessed samples are written.
"""

from __future__ import annotations

import datetime as _dt
from pathlib import Path
from typing import Any, Mapping

from uvcheck.errors import UvcheckError

#: The unit of each quantity in the written files (a text uvcheck's unit parser reads).
UNIT_TEXT = {"irradiance": "W m-2 nm-1", "radiance": "W m-2 sr-1 nm-1", "flux": "W nm-1",
             "relative": "relative"}
QUANTITY_NAMES = {"irradiance": "Irradiance", "radiance": "Radiance", "flux": "Spectral flux",
                  "relative": "Relative spectrum"}


def provenance(spectrum: Any, result: Mapping[str, Any] | None = None) -> list[str]:
    """Lines that say where the assessed spectrum came from (``result``: the assessment's
    dict, for the file, its sha256, the scaling, repeats, dark scan and distance)."""
    from uvcheck import __version__

    inp = (result or {}).get("input") or {}
    meta = spectrum.meta or {}
    out = [f"spectrum as assessed by uvcheck {__version__} on "
           f"{_dt.date.today().isoformat()}; a screening assessment, not a certification"]
    src = inp.get("path") or meta.get("file_name")
    if src:
        out.append(f"source: {Path(str(src)).name}; sha256 of what was assessed: "
                   f"{inp.get('sha256') or meta.get('sha256') or 'unknown'}")
    rep = inp.get("repeats") or meta.get("repeats")
    if rep:
        out.append("mean of " + str(rep.get("n")) + " repeat scans: "
                   + ", ".join(Path(str(f)).name for f in rep.get("files") or []))
    dark = inp.get("dark") or meta.get("dark")
    if dark:
        out.append(f"dark scan subtracted: {Path(str(dark.get('file'))).name}")
    for s in inp.get("scaling") or meta.get("scaling") or []:
        if isinstance(s, Mapping):
            out.append(f"scaling: {s.get('method')}" + (f" ({s['text']})" if s.get("text") else ""))
        else:
            out.append(f"scaling: {s}")
    d = ((result or {}).get("conditions") or {}).get("measurement_distance_m")
    if d is not None:
        out.append(f"Measurement distance: {d:g} m")
    if inp.get("invented") or meta.get("invented"):
        out.append("INVENTED data: made up to show the tool; it describes no real lamp")
    out.append(f"values in {UNIT_TEXT.get(spectrum.quantity, spectrum.quantity)} "
               f"({spectrum.quantity}); only the assessed samples are written (no gap filled)")
    return out


def write_spectrum(spectrum: Any, path: str | Path, result: Mapping[str, Any] | None = None,
                   force: bool = False) -> Path:
    """Write the assessed spectrum to ``path`` (see the module notes), with the provenance
    that ``result`` (the assessment's dict) gives; returns the path. Raises
    OutputExistsError when it exists and ``force`` is False."""
    from uvcheck.report.jsonout import write_text_atomic

    p = Path(path)
    lines = provenance(spectrum, result)
    if p.suffix.lower() in (".spdx", ".xml"):
        return write_text_atomic(p, _tm2714_text(spectrum, lines), force=force)
    q = spectrum.quantity
    head = [f"# {ln}" for ln in lines]
    head.append(f"Wavelength (nm),{QUANTITY_NAMES.get(q, q)} ({UNIT_TEXT.get(q, q)})")
    body = [f"{w!r},{v!r}" for w, v in zip(spectrum.wavelength_nm.tolist(),
                                           spectrum.values.tolist())]
    return write_text_atomic(p, "\n".join(head + body) + "\n", force=force)


def _tm2714_text(spectrum: Any, lines: list[str]) -> str:
    """The TM-27-14 document of a spectrum, as text (written by colour-science to a
    temporary file, which it needs)."""
    import tempfile
    import warnings

    try:
        from colour import SpectralDistribution_IESTM2714
        from colour.io.tm2714 import Header_IESTM2714
    except ImportError as exc:  # colour-science is a dependency; kept as a safety net
        raise UvcheckError(f"writing IES TM-27-14 needs colour-science ({exc})",
                           todo="install uvcheck with its dependencies") from None
    from uvcheck import __version__

    header = Header_IESTM2714(description=lines[0], document_creator=f"uvcheck {__version__}",
                              document_creation_date=_dt.date.today().isoformat(),
                              comments="; ".join(lines[1:]))
    sd = SpectralDistribution_IESTM2714(
        header=header, spectral_quantity=spectrum.quantity,
        data=dict(zip(spectrum.wavelength_nm.tolist(), spectrum.values.tolist())))
    with tempfile.TemporaryDirectory() as tmp:
        sd.path = str(Path(tmp) / "spectrum.spdx")
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")  # colour's notes on unset header fields
            sd.write()
        # colour-science writes an unset field (a header field, the reflection geometry, the
        # bandwidth) as the text "None": an empty element says "not stated"
        return Path(sd.path).read_text(encoding="utf-8").replace(">None</", "></")
