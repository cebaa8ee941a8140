"""IES TM-27-14 spectral data files (the IES's open XML exchange format for spectra).

The XML is parsed by colour-science (``colour.SpectralDistribution_IESTM2714``, imported only
when such a file is read: it costs most of a second), then handed to uvcheck's own reader as a
two-column table with the file's header as ``key: value`` lines, so that the file gets every
check a text export gets (noise, spikes, clipping, gaps, duplicates, units) and the same import
report. The report names the XML file and its sha256, not the table.

The format states the spectral quantity (irradiance, radiance, flux, relative, …) but no unit.
An absolute quantity is read in its SI unit per nanometre (W m⁻² nm⁻¹ for irradiance; from
memory, not read in the document), and the import report says so; ``--unit`` overrides it.
Quantities that are not a lamp's emission (reflectance, transmittance, absorptance, the R and
T factors, exitance, intensity) are refused with the reason.
"""

from __future__ import annotations

import re
from pathlib import Path
from typing import Any

from uvcheck.errors import InputFormatError

#: The SI unit each emission quantity of the format is read in (from memory: TM-27-14 names
#: the quantity, not its unit), as a unit text uvcheck's unit parser reads.
QUANTITY_UNITS = {"irradiance": "W/(m2 nm)", "radiance": "W/(sr m2 nm)", "flux": "W/nm",
                  "relative": "relative"}
#: Said with every TM-27-14 import: the report's line numbers are the table's.
LINES_NOTE = ("; the line numbers in this report count the table made of the file (its header "
              "lines, then one line per spectral point)")
#: Header elements copied into the import report's metadata (colour-science attribute names).
HEADER_FIELDS = ("manufacturer", "catalog_number", "description", "document_creator",
                 "unique_identifier", "measurement_equipment", "laboratory", "report_number",
                 "report_date", "document_creation_date", "comments")


def is_tm2714(head: bytes) -> bool:
    """Whether a file's first bytes open an IES TM-27-14 document (its ``IESTM2714`` root).

    >>> is_tm2714(b'<?xml version="1.0"?>\\n<IESTM2714 xmlns="iestm2714" version="1.0">')
    True
    >>> is_tm2714(b"Wavelength,Irradiance")
    False
    """
    return b"<iestm2714" in head[:4096].lower()


def as_table(path: str | Path, unit: str | None = None) -> tuple[bytes, str]:
    """(the spectrum as a UTF-8 table with its header lines, a warning for the import report)
    of a TM-27-14 file. ``unit``: the value unit given with ``--unit`` (None: the SI unit of the
    stated quantity, :data:`QUANTITY_UNITS`)."""
    where = str(path)
    try:
        from colour import SpectralDistribution_IESTM2714
    except ImportError as exc:  # colour-science is a dependency; kept as a safety net
        raise InputFormatError(f"IES TM-27-14 files need colour-science ({exc})", where,
                               "install uvcheck with its dependencies") from None
    try:
        sd = SpectralDistribution_IESTM2714(str(path)).read()
    except Exception as exc:  # colour raises several kinds for a malformed document
        raise InputFormatError(f"not a readable IES TM-27-14 file ({type(exc).__name__}: {exc})",
                               where, "export the spectrum again, or as a text table") from None
    quantity = str(getattr(sd, "spectral_quantity", "") or "").strip().lower()
    if quantity not in QUANTITY_UNITS:
        raise InputFormatError(
            f"the IES TM-27-14 file holds {quantity or 'an unstated quantity'}, not a lamp's "
            "emission (irradiance, radiance, flux or relative)", where,
            "give a spectral irradiance, radiance or flux of the lamp")
    wl = [float(x) for x in sd.wavelengths]
    values = [float(x) for x in sd.values]
    if len(wl) < 2:
        raise InputFormatError("the IES TM-27-14 file holds fewer than two spectral points",
                               where, "a spectrum needs at least two wavelengths")
    value_unit = unit or QUANTITY_UNITS[quantity]
    lines = ["IES TM-27-14 file: " + Path(path).name]
    header = getattr(sd, "header", None)
    for name in HEADER_FIELDS:
        v = getattr(header, name, None) if header is not None else None
        if v is not None and str(v).strip() not in ("", "None"):
            lines.append(f"{name.replace('_', ' ').capitalize()}: {_one_line(v)}")
            if name == "comments":
                # "Measurement distance: 0.5 m; scaling: …": each "key: value" part of the
                # comments becomes a line of its own, so that the reader sees it as metadata
                lines += [p.strip() for p in str(v).split(";") if _KEY_VALUE.match(p.strip())]
    for name, label in (("bandwidth_FWHM", "Bandwidth FWHM (nm)"),
                        ("bandwidth_corrected", "Bandwidth corrected")):
        v = getattr(sd, name, None)
        if v is not None and str(v).strip() not in ("", "None"):
            lines.append(f"{label}: {v}")
    lines.append("")
    lines.append(f"Wavelength (nm),{quantity.capitalize()} ({value_unit})")
    lines += [f"{a!r},{b!r}" for a, b in zip(wl, values)]
    if unit is not None:
        warning = (f"IES TM-27-14 file ({quantity}), read with colour-science; values in "
                   f"{unit} as given with --unit")
    elif quantity == "relative":
        warning = "IES TM-27-14 file (relative), read with colour-science"
    else:
        warning = (f"IES TM-27-14 file ({quantity}), read with colour-science: the format "
                   f"states the quantity but no unit, so the values are read in "
                   f"{QUANTITY_UNITS[quantity]}, its SI unit (from memory); give --unit if the "
                   "file was written in another one")
    return ("\n".join(lines) + "\n").encode("utf-8"), warning + LINES_NOTE


#: A "key: value" part of a comments element ("Measurement distance: 0.5 m").
_KEY_VALUE = re.compile(r"^[A-Za-z][\w ()/.-]{0,40}:\s*\S")


def _one_line(v: Any) -> str:
    return " ".join(str(v).split())[:200]
