"""Regenerate the spectrum files of the bad-input catalogue (tests/data/bad/spectrum/).

All data are invented: a Gaussian of area 0.012 W m⁻² (σ = 6 nm) centred at 395 nm, sampled
every 5 nm from 250 to 800 nm and written to 7 significant figures; each file then breaks
it in one way. The expected outcomes are in catalogue.toml. Run: python make_spectrum_cases.py
"""
import math
from pathlib import Path

OUT = Path(__file__).resolve().parent / "spectrum"
OUT.mkdir(parents=True, exist_ok=True)

WL = [250.0 + 5.0 * k for k in range(111)]          # 250..800 nm
def g(w):  # invented Gaussian, 6 nm sigma, area 0.012 W/m2 at 395 nm
    return 0.012 / (6 * math.sqrt(2 * math.pi)) * math.exp(-0.5 * ((w - 395) / 6) ** 2)
V = [g(w) for w in WL]
HDR = "Wavelength (nm),Irradiance (W/m2/nm)"
def rows(wl=WL, v=V, fmt="{:.1f},{:.6e}"):
    return [fmt.format(a, b) for a, b in zip(wl, v)]
def put(name, text, enc="utf-8"):
    data = text if isinstance(text, bytes) else text.encode(enc)
    (OUT / name).write_bytes(data)

put("empty.csv", b"")
put("blank_lines_only.csv", "\n   \n\t\n\n")
put("binary.dat", bytes(range(256)) * 4)
put("header_only.csv", HDR + "\n")
put("metadata_only.txt", "Instrument: invented test spectrometer\nIntegration time: 100 ms\nDate: 2026-01-01\n")
put("one_data_row.csv", HDR + "\n395.0,1.0e-3\n")
put("single_column.csv", "Irradiance (W/m2/nm)\n" + "\n".join(f"{b:.6e}" for b in V) + "\n")
r = rows(); r[20] = "350.0,n.d."; r[40] = "450.0,overflow"
put("text_in_value_column.csv", HDR + "\n" + "\n".join(r) + "\n")
put("text_values_only.csv", HDR + "\n" + "\n".join(f"{a:.1f},low" for a in WL) + "\n")
r = rows(fmt="{:.1f};{:.6e}"); r = [x if k % 3 else x.replace(".", ",") for k, x in enumerate(r)]
put("mixed_decimal_marks.csv", "Wavelength (nm);Irradiance (W/m2/nm)\n" + "\n".join(r) + "\n")
r = rows(); r[10] = "300.0,NaN"; r[11] = "305.0,inf"; r[12] = "310.0,-inf"; r[13] = "315.0,#VALUE!"
put("nan_inf_values.csv", HDR + "\n" + "\n".join(r) + "\n")
put("all_nan_values.csv", HDR + "\n" + "\n".join(f"{a:.1f},NaN" for a in WL) + "\n")
r = rows(); r[5] = "NaN,1.0e-6"
put("nan_wavelength.csv", HDR + "\n" + "\n".join(r) + "\n")
put("negative_wavelengths.csv", HDR + "\n" + "\n".join(rows(wl=[w - 400 for w in WL])) + "\n")
r = rows(); r[0] = "0.0,0.0"
put("zero_wavelength.csv", HDR + "\n" + "\n".join(r) + "\n")
put("wavelength_um_no_unit.csv", "\n".join(rows(wl=[w / 1000 for w in WL], fmt="{:.4f},{:.6e}")) + "\n")
put("wavelength_m_no_unit.csv", "\n".join(rows(wl=[w * 1e-9 for w in WL], fmt="{:.4e},{:.6e}")) + "\n")
put("wavelength_um_header.csv", "Wavelength (µm),Irradiance (W/m2/nm)\n" + "\n".join(rows(wl=[w / 1000 for w in WL], fmt="{:.4f},{:.6e}")) + "\n")
put("um_header_nm_values.csv", "Wavelength (um),Irradiance (W/m2/nm)\n" + "\n".join(rows()) + "\n")
put("pixel_index_header.csv", "Pixel,Counts\n" + "\n".join(f"{k},{1000 + 50 * math.sin(k / 7):.0f}" for k in range(512)) + "\n")
put("pixel_index_no_header.csv", "\n".join(f"{k};{1000 + 50 * math.sin(k / 7):.1f}" for k in range(1, 513)) + "\n")
WN = [1e7 / w for w in WL][::-1]
put("wavenumber_header.csv", "Wavenumber (cm-1),Irradiance (W/m2/nm)\n" + "\n".join(rows(wl=[1e7 / w for w in WL], fmt="{:.3f},{:.6e}")) + "\n")
put("wavenumber_no_unit_uv.csv", "\n".join(rows(wl=[1e7 / w for w in WL[:31]], v=V[:31], fmt="{:.3f},{:.6e}")) + "\n")   # 40000..25000
put("wavenumber_no_unit_vis.csv", "\n".join(rows(wl=[1e7 / w for w in WL[61:]], v=V[61:], fmt="{:.3f},{:.6e}")) + "\n")  # 18182..12500
r = rows(); r[30] = "400.0,1.0e+300"
put("huge_value.csv", HDR + "\n" + "\n".join(r) + "\n")
r = rows(); r[30] = "400.0,1e999"
put("overflow_value.csv", HDR + "\n" + "\n".join(r) + "\n")
r = rows(); r[30] = "1e30,1.0e-3"
put("huge_wavelength.csv", HDR + "\n" + "\n".join(r) + "\n")
put("truncated_last_line.csv", HDR + "\n" + "\n".join(rows()) + "\n800.5,")
put("truncated_mid_number.csv", HDR + "\n" + "\n".join(rows()[:-1]) + "\n800.0,1.2e")
r = rows(); r[7] = r[7] + ",9.9"; r[9] = r[9].split(",")[0]
put("ragged_rows.csv", HDR + "\n" + "\n".join(r) + "\n")
put("side_by_side.csv", "Wavelength (nm),Irradiance (W/m2/nm),Wavelength (nm),Irradiance (W/m2/nm)\n"
    + "\n".join(f"{a:.1f},{b:.6e},{a + 0.5:.1f},{b:.6e}" for a, b in zip(WL, V)) + "\n")
put("two_blocks.csv", "[Sample]\n" + HDR + "\n" + "\n".join(rows()) + "\n\n\n[Reference]\nnote one\nnote two\n" + HDR + "\n" + "\n".join(rows()) + "\n")
put("descending.csv", HDR + "\n" + "\n".join(rows()[::-1]) + "\n")
r = rows(); r = r[:50] + r[40:]
put("duplicated_wavelengths.csv", HDR + "\n" + "\n".join(r) + "\n")
r = rows(); r[10], r[60] = r[60], r[10]
put("unsorted.csv", HDR + "\n" + "\n".join(r) + "\n")
put("same_wavelength.csv", HDR + "\n" + "\n".join(f"400.0,{b:.6e}" for b in V) + "\n")
put("utf16_bom_tab.txt", ("Wavelength (nm)\tIrradiance (µW/cm²/nm)\r\n" + "\r\n".join(rows(v=[b * 100 for b in V], fmt="{:.1f}\t{:.6e}")) + "\r\n"), "utf-16")
put("utf16le_no_bom.txt", ("Wavelength (nm)\tIrradiance (W/m2/nm)\n" + "\n".join(rows(fmt="{:.1f}\t{:.6e}")) + "\n").encode("utf-16-le"))
put("latin1_micro.csv", "Wellenlänge (nm);Bestrahlungsstärke (µW/cm²/nm)\n" + "\n".join(x.replace(".", ",") for x in rows(v=[b * 100 for b in V], fmt="{:.1f};{:.6f}")) + "\n", "latin-1")
put("raman_shift.csv", "Raman shift (cm-1),Intensity (counts)\n" + "\n".join(f"{k * 5.0:.1f},{100 + k}" for k in range(1, 200)) + "\n")
put("unit_not_spectral.csv", "Wavelength (nm),Irradiance (W/m2)\n" + "\n".join(rows()) + "\n")
put("unknown_unit.csv", "Wavelength (nm),Irradiance (furlongs/fortnight)\n" + "\n".join(rows()) + "\n")
put("negative_distance_meta.csv", "Distance: -20 cm\n" + HDR + "\n" + "\n".join(rows()) + "\n")
put("good.csv", HDR + "\n" + "\n".join(rows()) + "\n")
put("nul_in_text.csv", (HDR + "\n" + "\n".join(rows()[:50]) + "\n").encode() + b"\x00" * 600 + ("\n".join(rows()[50:]) + "\n").encode())
put("mixed_encoding.csv", (HDR + "\n" + "\n".join(rows()) + "\n").encode() + "Comment: measured at 25 °C by Müller\n".encode("latin-1"))
put("comma_decimal_comma_delim.csv", "Wavelength (nm),Irradiance (W/m2/nm)\n" + "\n".join(f"{a:.1f},{b:.6f}".replace(".", ",") for a, b in zip(WL, V)) + "\n")
put("value_columns_many.csv", "Wavelength (nm),Dark,Reference,Sample\n" + "\n".join(f"{a:.1f},1,2,{b:.6e}" for a, b in zip(WL, V)) + "\n")
put("all_zero_values.csv", HDR + "\n" + "\n".join(f"{a:.1f},0" for a in WL) + "\n")
put("whitespace_garbage_lines.csv", "\x0c\n" + HDR + "\n" + "\n".join(rows()) + "\n")
put("thousands_separators.csv", "Wavelength (nm);Counts\n" + "\n".join(f"{a:.1f};{1000 + 200000 * b:,.1f}" for a, b in zip(WL, V)) + "\n")
put("rows_after_footer.csv", HDR + "\n" + "\n".join(rows()) + "\nEnd of data\nSaved by invented software\nChecksum: none\n900.0,1.0e-3\n")
put("two_rows.csv", HDR + "\n395.0,1.0e-3\n400.0,1.0e-3\n")
put("saturated_counts.csv", "Wavelength (nm),Counts\n" + "\n".join(f"{a:.1f},{min(65535, int(1000 + 3e8 * b))}" for a, b in zip(WL, V)) + "\n")
r = rows(); r[80] = "650.0,5.0e+00"
put("isolated_spike.csv", HDR + "\n" + "\n".join(r) + "\n")
r = rows(); r = r[:40] + r[60:]
put("gap_in_data.csv", HDR + "\n" + "\n".join(r) + "\n")
put("quoted_fields.csv", '"Wavelength (nm)","Irradiance (W/m2/nm)"\n' + "\n".join(f'"{a:.1f}","{b:.6e}"' for a, b in zip(WL, V)) + "\n")
put("Küchenlampe Nr 1.csv", HDR + "\n" + "\n".join(rows()) + "\n")
put("no_header_nm.csv", "\n".join(f"{a:.1f}\t{b:.6e}" for a, b in zip(WL, V)) + "\n")
# thousands separators and a sign-flipped spectrum (cases thousands-*, mostly-negative)
def counts(w, c, top):  # invented counts: a Gaussian of 6 nm sigma peaking at `top` counts
    return round(top * math.exp(-0.5 * ((w - c) / 6) ** 2))
def dots(n):  # 1234567 -> '1.234.567' ('.' as thousands separator)
    return f"{n:,}".replace(",", ".")
put("thousands_ambiguous.csv", "Wavelength (nm);Counts\n" + "\n".join(f"{w:.0f};{dots(counts(w, 395, 20000))}" for w in WL) + "\n")
put("thousands_dot_groups.csv", "Wavelength (nm);Counts\n" + "\n".join(f"{w:.0f};{dots(counts(w, 700, 1200000))}" for w in WL) + "\n")
put("mostly_negative.csv", HDR + "\n" + "\n".join(rows(v=[-b for b in V])) + "\n")
