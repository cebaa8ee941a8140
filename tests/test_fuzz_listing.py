"""Fuzzing the listing parser (issue 7): generated TOML texts, only two outcomes allowed —
a Listing, or a one-line UvcheckError naming the file. No other exception, ever."""

from __future__ import annotations

from hypothesis import HealthCheck, given, settings, strategies as st

from uvcheck.errors import UvcheckError
from uvcheck.io.listing import parse_listing

KEYS = {
    "product": ["name", "seller_note", "invented", "listing_text", "nmae"],
    "lamp": ["technology", "peak_wavelength", "band", "fwhm", "optical_power", "electrical_power",
             "supply_voltage", "cover", "filtered", "emitter", "tube_length", "source_size",
             "optical_power_band", "colour_temperature", "wattage"],
    "leds": ["count", "series", "strings", "string_voltage", "forward_voltage", "current", "package"],
    "use": ["distance", "area", "room_volume", "room_height"],
}
CLAIM_KEYS = ["id", "text", "kind", "reduction", "log_reduction", "organism", "time", "distance",
              "area", "volume", "medium", "safe_for", "power", "efficiency", "wavelength", "band"]
VALUES = st.one_of(
    st.sampled_from(['"254 nm"', '"30 min"', '"2 m"', '"20 m²"', '"8 W"', '"3.1 V"', '"99.9 %"',
                     '"30 kg"', '"-2 m"', '"0 m"', '"UV-C"', '"germs"', '"air"', '"quartz"',
                     '"lp_mercury"', '"violet_led"', '"tube"', 'true', '12', '-3', '1e400',
                     '["people", "pets"]', '"kills 99.9% of germs in 30 s"', '""', '"nan nm"',
                     '"1e308 W"', '"inf m"', '[]', '{}', '"safe for pets"', '"emission"',
                     '"inactivation"', '"254nm"', '"0,5 m"']),
    st.text(max_size=12).map(lambda t: '"' + t.replace("\\", "").replace('"', "") + '"'),
    st.integers(-10**6, 10**6).map(str),
    st.floats(allow_nan=False, allow_infinity=False).map(repr),
)


@st.composite
def listings(draw):
    lines = []
    if draw(st.booleans()):
        lines.append('format = "uvcheck-listing/1"')
    for table, keys in KEYS.items():
        if draw(st.booleans()):
            lines.append(f"[{table}]")
            for k in draw(st.lists(st.sampled_from(keys), max_size=5, unique=True)):
                lines.append(f"{k} = {draw(VALUES)}")
    for _ in range(draw(st.integers(0, 3))):
        lines.append("[[claims]]")
        for k in draw(st.lists(st.sampled_from(CLAIM_KEYS), max_size=6, unique=True)):
            lines.append(f"{k} = {draw(VALUES)}")
    if draw(st.integers(0, 9)) == 0:
        lines.insert(draw(st.integers(0, len(lines))), draw(st.text(max_size=30)))
    return "\n".join(lines) + "\n"


@settings(max_examples=700, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(listings())
def test_listing_parser_never_crashes(text):
    try:
        lst = parse_listing(text, "fuzz.toml")
    except UvcheckError as exc:
        msg = exc.one_line()
        assert "\n" not in msg and msg.startswith("fuzz.toml")
        return
    assert lst.name
    for c in lst.claims:
        c.to_dict()
    lst.to_dict()


@settings(max_examples=300, deadline=None)
@given(st.text(max_size=400))
def test_listing_parser_on_arbitrary_text(text):
    try:
        parse_listing(text, "fuzz.toml")
    except UvcheckError as exc:
        assert "\n" not in exc.one_line()
