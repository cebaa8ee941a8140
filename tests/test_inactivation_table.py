"""The terminal inactivation table and the organisms listing (audit issue 4: rows cut at 14,
duplicate rows without their substrate, a blank 90 % cell; no source column).

Expected values come from the shipped organism table (data/organisms/organisms.csv, with its
sources in organisms.toml): Murdoch et al. 2012 Table 3 gives Listeria on PVC at most 0.93 log.
"""

import numpy as np

from uvcheck.cli_room import render_organisms
from uvcheck.conditions import Conditions
from uvcheck.germicidal import evaluate_germicidal
from uvcheck.inactivation import organisms, select
from uvcheck.report.terminal import ROWS_PER_MEDIUM, render_inactivation
from uvcheck.spectrum import Spectrum

WL = np.arange(200.0, 800.01, 0.5)


def _gauss(c, fwhm, area):
    s = fwhm / 2.3548
    return area / (s * np.sqrt(2 * np.pi)) * np.exp(-0.5 * ((WL - c) / s) ** 2)


def _rows(spec):
    return evaluate_germicidal(spec, Conditions(measurement_distance_m=1.0)).to_dict()["inactivation"]


def test_every_medium_is_shown_and_the_rest_counted():
    # an invented 253.7 nm line (uvcheck's construction): every UV-C row of the table applies
    rows = _rows(Spectrum(WL, _gauss(253.7, 1.2, 0.4), "irradiance"))
    assert len(rows) > 14
    text = "\n".join(render_inactivation(rows))
    for medium in ("air", "surface", "water"):
        if any(r["medium"] == medium for r in rows):
            assert f"  {medium}" in text
    assert "Human coronavirus OC43" in text                     # an air row is not cut off
    assert f"of {len(rows)} rows shown" in text and "germicidal.inactivation" in text
    water = [r for r in rows if r["medium"] == "water"]
    assert f"… {len(water) - ROWS_PER_MEDIUM} more water rows" in text
    assert "(hardest listed)" in text


def test_duplicates_show_their_substrate_and_missing_times_say_why():
    # an invented 405 nm LED: the violet-blue rows, two Salmonella rows on different surfaces
    rows = _rows(Spectrum(WL, _gauss(405, 15, 1.0), "irradiance"))
    text = "\n".join(render_inactivation(rows))
    assert "surface, PVC" in text and "surface, acrylic" in text
    listeria = next(line for line in text.splitlines() if "Listeria" in line)
    assert "not reached (data ≤ 0.93 log)" in listeria and "—" not in listeria
    row = next(r for r in rows if r["organism"].startswith("Listeria"))
    assert row["time_missing_reason"]["90"].startswith("not reached")
    assert row["max_log_reduction"] == 0.93 and row["source_key"] == "murdoch2012"


def test_organisms_listing_has_source_and_memory_columns():
    rows = [o.to_dict() for o in select()]
    text = render_organisms(rows)
    header = text.splitlines()[0]
    assert "source" in header and "from memory" in header
    for o in organisms():
        line = next(line for line in text.splitlines() if line.startswith(o.id + " "))
        assert o.source in line
    partly = next(o for o in organisms() if o.from_memory != "no")
    assert "partly" in next(line for line in text.splitlines() if line.startswith(partly.id + " "))
