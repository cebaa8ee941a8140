"""Reader warnings for a dark level subtracted too large, a flat (clipped) top in absolute units,
a measurement distance written in other ways, and a value unit stated twice in disagreement.

All spectra here are invented test data, written by the tests themselves (the catalogue files
for the same cases are in tests/data/bad/spectrum/, run by tests/test_bad_inputs.py).
"""

from __future__ import annotations

import re
from pathlib import Path

import numpy as np
import pytest

from uvcheck.io import reader
from uvcheck.io.reader import read_spectrum

WL = np.arange(200.0, 800.01, 0.5)
HEADER = "Wavelength [nm],Irradiance [W/m2/nm]"


def led(wl: np.ndarray, centre: float = 395.0, fwhm: float = 12.0, area: float = 1.0) -> np.ndarray:
    s = fwhm / 2.3548
    return area / (s * np.sqrt(2 * np.pi)) * np.exp(-0.5 * ((wl - centre) / s) ** 2)


def write(tmp_path: Path, name: str, head: list[str], wl: np.ndarray, v: np.ndarray,
          fmt: str = "{:.6g}") -> Path:
    p = tmp_path / name
    rows = [f"{a:g}," + fmt.format(b) for a, b in zip(wl, v)]
    p.write_text("\n".join(["# invented test data"] + head + rows) + "\n", encoding="utf-8")
    return p


def warnings_of(p: Path) -> tuple[str, ...]:
    return read_spectrum(p)[1].warnings


def matching(ws, pattern: str) -> list[str]:
    return [w for w in ws if re.search(pattern, w)]


# ---------------------------------------------------------------------------------------------
# 1. A constant negative dark offset
# ---------------------------------------------------------------------------------------------

OFFSET = r"most samples are below zero \((\d+) of (\d+); median (\S+) .*a dark level subtracted too large\? Band and hazard values are then understated"


def test_a_constant_negative_offset_is_warned(tmp_path):
    rng = np.random.default_rng(3)
    v = 0.04 * led(WL) + rng.normal(0, 1e-5, WL.size) - 2e-5
    p = write(tmp_path, "offset.csv", ["Distance: 5 cm", HEADER], WL, v)
    got = matching(warnings_of(p), OFFSET)
    assert len(got) == 1, warnings_of(p)
    n_neg, n, med = re.search(OFFSET, got[0]).groups()
    written = np.array([float(f"{x:.6g}") for x in v])
    assert int(n_neg) == int(np.count_nonzero(written < 0)) and int(n) == WL.size
    assert float(med) == pytest.approx(float(np.median(written)), rel=6e-3)  # 3 digits
    # not also the "below zero as a whole" warning: the peak stands far above the dips
    assert not matching(warnings_of(p), r"are negative: a lamp spectrum is mostly positive")


@pytest.mark.parametrize("seed", range(6))
@pytest.mark.parametrize("smooth", [1, 9])
def test_zero_mean_noise_is_not_an_offset(tmp_path, seed, smooth):
    rng = np.random.default_rng(seed)
    noise = np.convolve(rng.normal(0, 1e-5, WL.size + smooth), np.ones(smooth) / smooth,
                        "same")[:WL.size]
    for name, v in (("peak.csv", 0.04 * led(WL) + noise), ("dark.csv", noise)):
        p = write(tmp_path, name, [HEADER], WL, v)
        assert not matching(warnings_of(p), r"most samples are below zero"), name


def test_a_sign_flipped_spectrum_gets_one_negative_warning(tmp_path):
    rng = np.random.default_rng(5)
    v = -(0.04 * led(WL) + rng.normal(0, 1e-5, WL.size))
    ws = warnings_of(write(tmp_path, "flipped.csv", [HEADER], WL, v))
    assert matching(ws, r"are negative: a lamp spectrum is mostly positive")
    assert not matching(ws, r"most samples are below zero")


# ---------------------------------------------------------------------------------------------
# 2. A flat (clipped) top in absolute units
# ---------------------------------------------------------------------------------------------

def test_a_clipped_top_in_absolute_units_is_warned(tmp_path):
    rng = np.random.default_rng(4)
    v = np.minimum(0.04 * led(WL) + rng.normal(0, 1e-6, WL.size), 2.0e-3)
    p = write(tmp_path, "clipped.csv", [HEADER], WL, v)
    n_top = int(np.count_nonzero(v == 2.0e-3))
    got = matching(warnings_of(p), rf"^{n_top} consecutive samples at 0\.002 \(W/m2/nm\), exactly "
                                   r"the maximum, [\d.]+–[\d.]+ nm: .*probably saturated.*"
                                   r"Band and hazard values are then understated")
    assert n_top >= 5 and len(got) == 1, warnings_of(p)


def test_a_smooth_peak_and_two_equal_samples_at_the_top_are_not_warned(tmp_path):
    rng = np.random.default_rng(4)
    v = 0.04 * led(WL) + rng.normal(0, 1e-6, WL.size)
    assert not matching(warnings_of(write(tmp_path, "smooth.csv", [HEADER], WL, v)),
                        r"consecutive samples at")
    top = int(np.argmax(v))
    v[top + 1] = v[top]  # two equal samples, as a symmetric peak between samples gives
    assert not matching(warnings_of(write(tmp_path, "two.csv", [HEADER], WL, v)),
                        r"consecutive samples at")


@pytest.mark.parametrize("n_clipped", [3, 4])
def test_a_narrow_line_clipped_over_a_few_samples_is_warned(tmp_path, n_clipped):
    """A mercury 253.7 nm line (FWHM 1 nm, invented, 0.5 nm steps) clipped at 0.6 W/m²/nm
    over 3 or 4 samples, as a saturated detector leaves it: before, a run of 5 was needed and
    the line passed unflagged with its band values about halved (FLAT_TOP_RUN, our own rule)."""
    wl = np.arange(230.0, 600.01, 0.5)
    centre = 253.5 if n_clipped % 2 else 253.75   # on a sample (1 + 2) or between two (2 + 2)
    line = 1.5 * np.exp(-0.5 * ((wl - centre) / 0.55) ** 2) + 1e-5
    top = np.sort(line)[::-1]
    v = np.minimum(line, round(0.5 * (top[n_clipped - 1] + top[n_clipped]), 4))
    assert int(np.count_nonzero(v == v.max())) == n_clipped
    p = write(tmp_path, "hg_clipped.csv", [HEADER], wl, v, "{:.6g}")
    assert matching(warnings_of(p), rf"^{n_clipped} consecutive samples at .* exactly the maximum"), \
        warnings_of(p)


def test_a_broad_peak_written_with_3_digits_is_not_clipped_but_its_clipped_twin_is(tmp_path):
    # a broad peak written with 3 significant digits repeats its maximum (0.01) over several
    # samples, its neighbours one rounding step (1e-5) below: that is rounding, not clipping
    wl = np.arange(300.0, 800.01, 0.5)
    v = 0.01 * np.exp(-0.5 * ((wl - 570.0) / 47.0) ** 2)
    rounded = np.array([float(f"{x:.3g}") for x in v])
    top = int(np.argmax(v))
    assert (rounded[top - 2:top + 3] == rounded.max()).all()  # the run is there
    p = write(tmp_path, "broad.csv", [HEADER], wl, v, "{:.3g}")
    assert not matching(warnings_of(p), r"consecutive samples at")
    p = write(tmp_path, "broad_clipped.csv", [HEADER], wl, np.minimum(v, 0.006), "{:.3g}")
    assert matching(warnings_of(p), r"consecutive samples at 0\.006 \(W/m2/nm\), exactly the maximum")


def test_the_counts_saturation_warning_is_kept(tmp_path):
    v = np.minimum(1000 + 2e6 * led(WL), 65535.0)
    p = write(tmp_path, "counts.csv", ["Wavelength,Counts"], WL, v, "{:.0f}")
    ws = warnings_of(p)
    assert len(matching(ws, r"consecutive samples at")) == 1
    assert matching(ws, r"consecutive samples at 65535 counts: the detector is probably saturated")


@pytest.mark.parametrize("seed", range(20))
def test_longest_run_equals_a_plain_count(seed):
    rng = np.random.default_rng(seed)
    mask = rng.random(int(rng.integers(0, 60))) < rng.random()
    best = run = start = best_start = 0
    for k, flag in enumerate(mask):
        run = run + 1 if flag else 0
        if run > best:
            best, best_start = run, k - run + 1
    assert reader._longest_run(mask) == ((best_start, best) if best else (0, 0))


# ---------------------------------------------------------------------------------------------
# 3. The measurement distance in the metadata
# ---------------------------------------------------------------------------------------------

@pytest.mark.parametrize("line, metres", [
    ("d=0.5m", 0.5),
    ("Abstand 20cm", 0.2),
    ("Entfernung: 0,5 m", 0.5),
    ("Messabstand: 30 cm", 0.3),
    ("Distance de mesure : 50 cm", 0.5),
    ("Distance to lamp [cm]: 20", 0.2),
    ("Distance (mm): 200", 0.2),
    ("Abstand [mm] 200", 0.2),
    ("Distance: 20 cm", 0.2),
    ("Distanza: 15 cm", 0.15),
])
def test_distance_is_read(tmp_path, line, metres):
    p = write(tmp_path, "d.csv", [line, HEADER], WL, 0.04 * led(WL))
    spec, rep = read_spectrum(p)
    assert rep.measurement_distance_m == pytest.approx(metres)
    assert not matching(rep.warnings, r"could not be read as a distance")


def test_a_distance_unit_entry_gives_the_unit_of_a_bare_number(tmp_path):
    p = write(tmp_path, "d.csv", ["Distance unit: cm", "Distance: 25", HEADER], WL, 0.04 * led(WL))
    assert read_spectrum(p)[1].measurement_distance_m == pytest.approx(0.25)


@pytest.mark.parametrize("lines", [
    ["Distance unit: cm"],
    ["Wavelength: 254 nm"],
    ["D: 20 mm"],  # D is as often a diameter
    ["Distortion: 2 mm"],
    ["Abstand zur Wand wurde nicht gemessen"],
])
def test_unrelated_keys_are_no_distance(tmp_path, lines):
    p = write(tmp_path, "d.csv", lines + [HEADER], WL, 0.04 * led(WL))
    spec, rep = read_spectrum(p)
    assert rep.measurement_distance_m is None
    assert not matching(rep.warnings, r"could not be read as a distance")


def test_a_bare_distance_without_a_unit_is_still_said(tmp_path):
    p = write(tmp_path, "d.csv", ["Distance: 20", HEADER], WL, 0.04 * led(WL))
    spec, rep = read_spectrum(p)
    assert rep.measurement_distance_m is None
    assert matching(rep.warnings, r"metadata Distance = '20' could not be read as a distance")


# ---------------------------------------------------------------------------------------------
# 4. A value unit stated twice
# ---------------------------------------------------------------------------------------------

def test_a_unit_stated_twice_in_disagreement_is_warned(tmp_path):
    p = write(tmp_path, "u.csv", ["Units: uW/cm2/nm", "Wavelength [nm],Irradiance [mW/m2/nm]"],
              WL, 40 * led(WL))
    spec, rep = read_spectrum(p)
    assert rep.value_unit == "mW/m2/nm"
    got = matching(rep.warnings, r"the value unit is stated twice and the two disagree: "
                                 r"'mW/m2/nm' from the header and 'uW/cm2/nm' from metadata "
                                 r"'Units', a factor 10 apart; 'mW/m2/nm' \(the header\) was used")
    assert len(got) == 1, rep.warnings


@pytest.mark.parametrize("meta, header", [
    ("Units: W/m2/nm", "Wavelength [nm],Irradiance [W m-2 nm-1]"),  # the same unit, written otherwise
    ("Units: uW/cm2/nm", "Wavelength [nm],Irradiance [10 mW/m2/nm]"),  # unreadable header unit
    ("Operator: A. Invented", "Wavelength [nm],Irradiance [mW/m2/nm]"),
])
def test_agreeing_or_single_units_are_not_warned(tmp_path, meta, header):
    p = write(tmp_path, "u.csv", [meta, header], WL, 40 * led(WL))
    assert not matching(read_spectrum(p)[1].warnings, r"stated twice")


def test_a_unit_given_on_the_command_line_is_not_questioned(tmp_path):
    p = write(tmp_path, "u.csv", ["Units: uW/cm2/nm", "Wavelength [nm],Irradiance [mW/m2/nm]"],
              WL, 40 * led(WL))
    rep = read_spectrum(p, unit="mW/m2/nm")[1]
    assert not matching(rep.warnings, r"stated twice")


def test_a_flat_positive_level_under_the_whole_spectrum_is_reported(tmp_path):
    # our own rule (reader.OFFSET_*): both ends of the data on one level far above the noise
    import numpy as np

    from uvcheck.io.reader import read_spectrum

    wl = np.arange(200.0, 1101.0, 1.0)
    rng = np.random.default_rng(3)
    led = 0.01 * np.exp(-0.5 * ((wl - 450) / 10) ** 2) + 0.005 * np.exp(-0.5 * ((wl - 580) / 60) ** 2)

    def read(values, name):
        p = tmp_path / name
        p.write_text("Wavelength (nm),Irradiance (W/m2/nm)\n" + "\n".join(
            f"{a},{b:.6e}" for a, b in zip(wl, values)) + "\n", encoding="utf-8")
        return read_spectrum(p)[1].warnings

    noise = rng.normal(0, 2e-6, wl.size)
    assert any("flat level" in w for w in read(led + 2e-4 + noise, "offset.csv"))
    assert not any("flat level" in w for w in read(led + noise, "clean.csv"))
    # a continuum rising across the range (a 3000 K blackbody shape) has unequal ends
    bb = 1.0 / (wl ** 5 * (np.exp(1.4388e7 / (wl * 3000.0)) - 1.0))
    assert not any("flat level" in w for w in read(bb / bb.max() * 0.01 + noise, "bb.csv"))


@pytest.mark.parametrize("seed", [0, 1, 2])
def test_a_clipped_top_with_noise_on_it_is_reported_and_a_smooth_peak_is_not(tmp_path, seed):
    # our own rule (reader.PLATEAU_*): a plateau within 8 σ of the maximum whose sides have
    # fallen 40 σ at 1.5 times its half-width, where a smooth (parabolic) top falls 18 σ
    import numpy as np

    from uvcheck.io.reader import read_spectrum

    rng = np.random.default_rng(seed)
    wl = np.arange(300.0, 701.0, 0.5)
    g = np.exp(-0.5 * ((wl - 450.0) / 8.0) ** 2)

    def clipped(values, name):
        p = tmp_path / name
        p.write_text("Wavelength (nm),Counts\n" + "\n".join(
            f"{a},{b:.6g}" for a, b in zip(wl, values)) + "\n", encoding="utf-8")
        return any("looks clipped" in w for w in read_spectrum(p)[1].warnings)

    for clip in (0.5, 0.9):
        assert clipped(np.minimum(g * 60000, 60000 * clip) + rng.normal(0, 20, wl.size),
                       f"c{clip}.csv")
    for snr in (30, 300, 3000):
        assert not clipped(g * 50000 + rng.normal(0, 50000 / snr, wl.size), f"g{snr}.csv")


def test_a_header_in_megawatts_is_read_as_milliwatts_and_says_so(tmp_path):
    # 1 mW/cm²/nm = 10 W/m²/nm (SI prefixes): the LED's values are read ×10, not ×1e10
    v = 0.01 * led(WL)
    p = write(tmp_path, "mw.csv", ["Wavelength [nm],E [MW/cm2/nm]"], WL, v)
    s, rep = read_spectrum(p)
    assert np.allclose(s.values, 10 * np.interp(s.wavelength_nm, WL, v), rtol=1e-5, atol=1e-12)
    assert matching(rep.warnings, r"reads as megawatts, which no lamp emits")


def test_values_no_lamp_can_give_are_warned(tmp_path):
    # 1e6 W/m²/nm at the peak: far above the bound (IMPLAUSIBLE_W_M2_NM, our own; full
    # sunlight peaks near 2 W/m²/nm, from memory); 1 W/m²/nm is not warned
    for peak, warned in ((1e6, True), (1.0, False)):
        p = write(tmp_path, f"p{peak:g}.csv", [HEADER], WL, peak * led(WL) / led(WL).max())
        assert bool(matching(warnings_of(p), r"no lamp gives that")) is warned, peak


@pytest.mark.parametrize("lines, warned", [
    (["Distance: 50 cm", "Distance: 20 cm"], True),
    (["Lamp distance: 50 cm", "Distance to sensor: 30 cm"], True),
    (["Distance: 50 cm", "Distance: 0.5 m"], False),          # the same distance twice
    (["Distance: 50 cm", "Integration time: 10 ms", "Integration time: 20 ms"], False),
])
def test_metadata_that_state_two_distances_are_warned(tmp_path, lines, warned):
    """A file that states its measurement distance twice, differently: the first is used and
    the import report says so (the distance sets every value at 200 mm by the inverse square,
    so 50 against 20 cm is a factor 6.25). Invented files."""
    p = write(tmp_path, "two.csv", lines + [HEADER], WL, 0.01 * led(WL))
    s, rep = read_spectrum(p)
    assert rep.measurement_distance_m == pytest.approx(0.5)
    got = matching(rep.warnings, r"more than one measurement distance .* the first, 0.5 m, is used")
    assert bool(got) is warned, rep.warnings


def test_duplicated_wavelengths_that_disagree_are_reported_with_the_spread(tmp_path):
    """A segment of the scan written twice, the second time at twice the value (two scans
    joined in one table, invented): the mean at those wavelengths is neither, so the
    warning gives the spread; a row merely written twice (the same values) gets the plain
    averaging warning (DUPLICATE_SPREAD_SHARE, our own rule)."""
    wl = np.arange(230.0, 400.01, 0.5)
    v = 0.01 * led(wl, centre=254.0, fwhm=3.0)
    seg = (wl >= 250.0) & (wl <= 258.0)
    rows = [f"{a:g},{b:.6g}" for a, b in zip(wl, v)]
    twice = rows + [f"{a:g},{2 * b:.6g}" for a, b in zip(wl[seg], v[seg])]
    same = rows + [r for r, s_ in zip(rows, seg) if s_]
    for name, body, spread in (("twice.csv", twice, True), ("same.csv", same, False)):
        p = tmp_path / name
        p.write_text("\n".join(["# invented test data", HEADER] + body) + "\n", encoding="utf-8")
        ws = matching(warnings_of(p), rf"^{int(seg.sum())} duplicated wavelength\(s\): their "
                                      r"values were averaged")
        assert len(ws) == 1
        assert ("but they disagree" in ws[0]) is spread, ws[0]
        if spread:
            assert "2 times" in ws[0]


def test_a_fortran_style_exponent_gets_its_own_error(tmp_path):
    # "1.5D-03" (Fortran's double-precision exponent) is not read; the error says what to
    # change, not to give --delimiter and --decimal as for any other cell that is no number
    p = tmp_path / "fortran.dat"
    p.write_text("# invented\nWavelength Irradiance\n250.0 1.5D-03\n251.0 1.6D-03\n252.0 1.4D-03\n",
                 encoding="utf-8")
    with pytest.raises(reader.InputFormatError) as exc:
        read_spectrum(p)
    assert "Fortran style" in str(exc.value) and "E" in exc.value.todo


@pytest.mark.parametrize("ref, index", [("Sample [counts]", 1), ("sample", 1), ("Dark", 2),
                                        ("3", 2)])
def test_a_column_is_found_by_its_name_without_the_unit(tmp_path, ref, index):
    # "--column Sample" for "Sample [counts]": the name as a user reads it, without its unit
    names = ["Wavelength [nm]", "Sample [counts]", "Dark [counts]"]
    assert reader._col_ref(ref, names, "value column", "f.csv") == index


def test_a_bare_name_two_columns_share_is_refused():
    with pytest.raises(reader.InputFormatError) as exc:
        reader._col_ref("E", ["Wavelength [nm]", "E [counts]", "E (W/m2/nm)"], "value column",
                        "f.csv")
    assert "2 columns are named 'E'" in str(exc.value)


@pytest.mark.parametrize("value", ["50 ± 1 cm", "50 +/- 1 cm", "50±1cm"])
def test_a_distance_written_with_its_uncertainty_is_read(tmp_path, value):
    p = write(tmp_path, "pm.csv", [f"Distance: {value}", HEADER], WL, 0.01 * led(WL))
    assert read_spectrum(p)[1].measurement_distance_m == pytest.approx(0.5)


def test_a_last_digit_between_zeros_is_no_spike(tmp_path):
    # values written to 6 decimals: far from the band, a lone 0.000001 between zeros is the
    # rounding of the noise, not a cosmic-ray hit (SPIKE_MIN_SHARE, our own rule); a spike
    # of a tenth of the peak there still is one
    wl = np.arange(200.0, 300.01, 0.2)
    v = 0.05 * np.exp(-0.5 * ((wl - 222.0) / 1.0) ** 2)
    v[np.argmin(np.abs(wl - 260.0))] = 1e-6
    p = write(tmp_path, "round.csv", [HEADER], wl, v, "{:.6f}")
    assert not matching(warnings_of(p), r"isolated spike")
    v[np.argmin(np.abs(wl - 280.0))] = 5e-3
    p = write(tmp_path, "spike.csv", [HEADER], wl, v, "{:.6f}")
    assert matching(warnings_of(p), r"isolated spike.* at 280 nm")


def test_unlabelled_wavelengths_that_may_be_angstrom_get_a_hint(tmp_path):
    # 2000–4000 with no unit is read as nm (the rule), and the report says how to read it as
    # ångström (1 Å = 0.1 nm, from memory); 200–800 gets no such hint
    wl = np.arange(2000.0, 4000.01, 5.0)
    p = write(tmp_path, "a.csv", ["Wavelength,Irradiance [W/m2/nm]"], wl, 0.01 * led(wl / 10))
    ws = matching(warnings_of(p), r"if they are ångström \(200–400 nm\), give --wavelength-unit A")
    assert len(ws) == 1
    p = write(tmp_path, "nm.csv", ["Wavelength,Irradiance [W/m2/nm]"], WL, 0.01 * led(WL))
    assert not matching(warnings_of(p), r"ångström")


def test_quoted_decimal_commas_throughout_are_the_files_mark(tmp_path):
    # a comma-separated file whose numbers are all quoted with decimal commas ("240,5"): the
    # comma is its decimal mark, so no "mixed decimal separators" warning (which ranks first
    # in a batch row) and the report says ','; the values are read the same
    wl = np.arange(240.0, 300.01, 0.5)
    v = 0.01 * led(wl, centre=270.0)
    rows = [f'"{a:.1f}","{b:.6f}"'.replace(".", ",") for a, b in zip(wl, v)]
    p = tmp_path / "q.csv"
    p.write_text('# invented\n"Wavelength [nm]","Irradiance [W/m2/nm]"\n' + "\n".join(rows) + "\n",
                 encoding="utf-8")
    s, rep = read_spectrum(p)
    assert not matching(rep.warnings, r"mixed decimal separators")
    assert rep.to_dict()["decimal"] == ","
    assert np.allclose(s.values, np.round(v, 6), atol=1e-12)
