"""Listing files (uvcheck.io.listing): parsing, free-text claims, errors that name line and key.

Expected values are unit conversions by definition (1 min = 60 s, 1 ft = 0.3048 m exactly,
99.9 % = 3 log since log10(1/0.001) = 3) or the text of the listing itself.
"""

import json
import math
from pathlib import Path

import pytest

from uvcheck.errors import InputFormatError
from uvcheck.io.listing import (BANDS_NM, CLAIM_KINDS, Claim, _find_quantities, key_lines,
                                parse_claim_text, parse_listing, read_listing)

EXAMPLES = Path(__file__).resolve().parents[1] / "examples" / "listings"
HEAD = '[product]\nname = "Test lamp (invented)"\ninvented = true\n'


def _parse(body: str):
    return parse_listing(HEAD + body, "t.toml")


# --------------------------------------------------------------------------------------------
# The shipped examples
# --------------------------------------------------------------------------------------------

@pytest.mark.parametrize("path", sorted(EXAMPLES.glob("*.toml")), ids=lambda p: p.name)
def test_examples_parse_and_are_marked_invented(path):
    L = read_listing(path)
    assert L.invented and "invented" in L.name.lower()
    assert "INVENTED EXAMPLE" in path.read_text(encoding="utf-8").splitlines()[0]
    assert L.claims, "every example carries claims"
    assert all(c.kind != "unrecognised" for c in L.claims)
    assert len(L.sha256) == 64
    json.dumps(L.to_dict(), allow_nan=False)


def test_required_examples_exist():
    # the brief's list of example products
    names = {p.name for p in EXAMPLES.glob("*.toml")}
    assert {"wand_395nm_sold_as_uvc.toml", "mercury_tube_sold_pet_safe.toml",
            "faruv_222nm_ceiling_unit.toml", "uvc_box_48_leds_8w.toml"} <= names
    assert (EXAMPLES / "README.md").is_file()


def test_box_listing_reads_as_sold():
    # examples/listings/uvc_box_48_leds_8w.toml: the statement of issue 5
    L = read_listing(EXAMPLES / "uvc_box_48_leds_8w.toml")
    assert L.peak_wavelength_nm == 254.0
    assert L.electrical_power_W == 8.0
    assert L.leds.count == 48 and L.leds.series == 4 and L.leds.strings == 12
    assert L.leds.string_voltage_V == pytest.approx(12.4)
    assert L.area_m2 == pytest.approx(20.0)
    assert L.cover == "glass" and L.cover_text == "tempered glass"
    kinds = {c.id: c.kind for c in L.claims}
    assert kinds == {"uvc": "emission", "kill": "inactivation", "room": "coverage",
                     "ozone": "ozone-free"}
    kill = L.claim("kill")
    assert kill.time_s == 1800.0                     # 30 min × 60 s
    assert kill.log_reduction == pytest.approx(3.0)  # 99.9 % = 3 log
    assert kill.organism == "germs" and kill.organism_generic
    assert kill.line == L.line_of("claims[2]")
    assert L.line_of("claims[2].text") == kill.line + 2


def test_band_edges_agree_with_bands_module():
    from uvcheck.bands import BAND_RANGES

    for name, edges in BANDS_NM.items():
        assert BAND_RANGES[name] == edges


# --------------------------------------------------------------------------------------------
# Free text
# --------------------------------------------------------------------------------------------

@pytest.mark.parametrize("text,kind,fields", [
    ("kills 99.9% of germs in 30 minutes", "inactivation",
     {"reduction_fraction": 0.999, "log_reduction": 3.0, "organism": "germs", "time_s": 1800.0}),
    ("Eliminates 99.99 % of bacteria and viruses within 10 s at 5 cm", "inactivation",
     {"log_reduction": 4.0, "time_s": 10.0, "distance_m": 0.05}),
    ("3-log reduction of E. coli on surfaces in 20 min at 1 m", "inactivation",
     {"log_reduction": 3.0, "organism": "E. coli", "organism_generic": False, "time_s": 1200.0,
      "distance_m": 1.0, "medium": "surface"}),
    ("kills 99% of airborne germs in 1 h in 30 m3 rooms", "inactivation",
     {"log_reduction": 2.0, "time_s": 3600.0, "volume_m3": 30.0, "medium": "air"}),
    ("for rooms up to 20 m²", "coverage", {"area_m2": 20.0}),
    ("for rooms up to 20 m2", "coverage", {"area_m2": 20.0}),
    ("suitable for 200 sq ft", "coverage", {"area_m2": 200 * 0.3048 ** 2}),  # ft exact
    ("covers 50 m³", "coverage", {"volume_m3": 50.0}),
    ("ozone-free", "ozone-free", {}),
    ("No ozone produced", "ozone-free", {}),
    ("safe for pets", "safety", {"safe_for": ("pets",)}),
    ("Safe for people and pets in occupied rooms", "safety",
     {"safe_for": ("people", "pets", "occupied-rooms")}),
    ("254nm", "emission", {"wavelength_nm": 254.0}),
    ("UV-C 254 nm", "emission", {"wavelength_nm": 254.0, "band_name": "UV-C"}),
    ("222 nm far-UVC", "emission", {"wavelength_nm": 222.0, "band_name": "far-UVC"}),
    ("germicidal UVC light", "emission", {"band_name": "UV-C", "band_nm": (200.0, 280.0)}),
    ("UV-C output 2.5 W", "optical-power", {"power_W": 2.5, "band_name": "UV-C"}),
    ("radiant power 150 mW", "optical-power", {"power_W": 0.15}),
    ("40 % UV-C efficiency", "efficiency", {"efficiency_fraction": 0.4, "efficiency_of": "UV-C"}),
])
def test_free_text_patterns(text, kind, fields):
    c = parse_claim_text(text)
    assert c.kind == kind
    assert not c.structured and c.text == text
    for k, v in fields.items():
        got = getattr(c, k)
        assert got == (pytest.approx(v) if isinstance(v, float) else v), k


@pytest.mark.parametrize("text", ["8 W", "48 LEDs", "Do not look at the lamp; not safe for eyes",
                                  "premium quality", "produces ozone"])
def test_unrecognised_text_is_kept(text):
    c = parse_claim_text(text)
    assert c.kind == "unrecognised" and c.text == text and c.note
    assert c.missing() == ("a statement of a kind uvcheck can check",)


def test_bare_wattage_hint():
    assert "electrical" in parse_claim_text("8W").note


def test_mixed_text_names_the_other_claims():
    c = parse_claim_text("kills 99.9 % of germs in 30 minutes, ozone-free, safe for pets")
    assert c.kind == "inactivation"
    assert "ozone-free" in c.note and "safety" in c.note


def test_claim_without_organism_time_or_place_names_what_is_missing():
    # the issue's test: "a claim with no organism, time or distance -> not-assessable naming
    # what is missing"; the listing layer reports the missing data
    c = parse_claim_text("sterilises 99.9 %")
    assert c.kind == "inactivation"
    assert c.missing() == ("organism (or 'germs')", "time", "distance, area or room volume")


def test_place_may_come_from_the_listing():
    L = _parse('[use]\ndistance = "1 m"\n[[claims]]\ntext = "kills 99.9 % of germs in 30 min"\n')
    assert L.claims[0].missing() == ("distance, area or room volume",)
    assert L.claims[0].missing(L) == ()


def test_hundred_percent_has_no_finite_log():
    c = parse_claim_text("kills 100% of viruses in 5 minutes")
    assert c.reduction_fraction == 1.0 and c.log_reduction is None
    assert "100 %" in c.note


# --------------------------------------------------------------------------------------------
# Structured claims
# --------------------------------------------------------------------------------------------

def test_structured_claim():
    L = _parse('[[claims]]\nid = "k"\nkind = "inactivation"\nreduction = "99.99 %"\n'
               'organism = "MS2"\ntime = "2 h"\ndistance = "50 cm"\nmedium = "air"\n'
               '[[claims]]\nkind = "safety"\nsafe_for = ["people", "pets"]\n'
               '[[claims]]\nkind = "inactivation"\nlog_reduction = 2\n')
    k, s, lg = L.claims
    assert (k.id, k.structured, k.time_s, k.distance_m, k.medium) == ("k", True, 7200.0, 0.5, "air")
    assert k.log_reduction == pytest.approx(4.0) and not k.organism_generic
    assert s.id == "c2" and s.safe_for == ("people", "pets")
    assert lg.reduction_fraction == pytest.approx(0.99)   # 1 − 10⁻²


def test_every_kind_serialises():
    for kind in CLAIM_KINDS:
        d = Claim(id="x", kind=kind).to_dict()
        assert d["kind"] == kind
        json.dumps(d, allow_nan=False)


# --------------------------------------------------------------------------------------------
# Errors name the line and the key
# --------------------------------------------------------------------------------------------

def _error(body: str) -> str:
    with pytest.raises(InputFormatError) as exc:
        _parse(body)
    return exc.value.one_line()


def test_wrong_unit_names_line_and_key():
    msg = _error('[[claims]]\nkind = "inactivation"\ntime = "30 kg"\n')
    assert "t.toml line 6, key 'claims[1].time'" in msg
    assert "'30 kg' is not a time" in msg


def test_bare_number_is_an_error():
    msg = _error('[lamp]\nelectrical_power = 8\n')
    assert "line 5, key 'lamp.electrical_power'" in msg and "unit" in msg


def test_unknown_key_lists_known_and_suggests_nearest():
    msg = _error('[lamp]\npeak_wavelenght = "254 nm"\n')
    assert "line 5, key 'lamp.peak_wavelenght'" in msg
    assert "Did you mean 'peak_wavelength'" in msg
    assert "known keys: technology, peak_wavelength" in msg


def test_unknown_top_level_table():
    msg = _error('[lamps]\ncover = "glass"\n')
    assert "line 4, key 'lamps'" in msg and "Did you mean 'lamp'" in msg


def test_syntax_error_has_line_and_column():
    msg = _error('[lamp]\npeak_wavelength = 254 nm\n')
    assert "t.toml line 5, column" in msg and "not valid TOML" in msg


def test_unknown_claim_kind_suggests():
    msg = _error('[[claims]]\nkind = "ozone free"\n')
    assert "key 'claims[1].kind'" in msg and "Did you mean 'ozone-free'" in msg


def test_field_not_of_the_kind():
    msg = _error('[[claims]]\nkind = "coverage"\ntime = "30 min"\n')
    assert "line 6, key 'claims[1].time'" in msg and "does not belong to a coverage claim" in msg


def test_field_without_kind():
    msg = _error('[[claims]]\ntext = "x"\ntime = "30 min"\n')
    assert "claims[1].time" in msg and "without a kind" in msg


def test_unknown_cover_material():
    msg = _error('[lamp]\ncover = "unobtainium"\n')
    assert "key 'lamp.cover'" in msg and "unknown cover material" in msg and "quartz" in msg


def test_wiring_must_add_up():
    msg = _error('[leds]\ncount = 48\nseries = 4\nstrings = 10\n')
    assert "key 'leds.strings'" in msg and "make 40 dies" in msg


def test_duplicate_claim_id():
    msg = _error('[[claims]]\nid = "a"\ntext = "ozone-free"\n[[claims]]\nid = "a"\ntext = "x"\n')
    assert "line 8, key 'claims[2].id'" in msg and "used twice" in msg


def test_reduction_out_of_range():
    msg = _error('[[claims]]\nkind = "inactivation"\nreduction = "150 %"\n')
    assert "claims[1].reduction" in msg


def test_missing_name():
    with pytest.raises(InputFormatError, match="no product name"):
        parse_listing('[lamp]\ncover = "glass"\n', "t.toml")


def test_wrong_format_id():
    with pytest.raises(InputFormatError, match="unknown format"):
        parse_listing('format = "other/2"\n' + HEAD, "t.toml")


def test_wavelength_out_of_range():
    msg = _error('[lamp]\npeak_wavelength = "254 m"\n')
    assert "lamp.peak_wavelength" in msg and "between 100 and 3000 nm" in msg


def test_key_lines_counts_claims_from_one():
    text = '[lamp]\ncover = "glass"\n\n[[claims]]\ntext = "a"\n[[claims]]\ntime = "1 s"\n'
    assert key_lines(text) == {"lamp": 1, "lamp.cover": 2, "claims[1]": 4, "claims[1].text": 5,
                               "claims[2]": 6, "claims[2].time": 7}


def test_read_listing_accepts_bom_and_rejects_non_utf8(tmp_path):
    p = tmp_path / "bom.toml"
    p.write_bytes(b"\xef\xbb\xbf" + HEAD.encode())
    assert read_listing(p).name == "Test lamp (invented)"
    q = tmp_path / "latin1.toml"
    q.write_bytes(HEAD.replace("Test", "T\xe9st").encode("latin-1"))
    with pytest.raises(InputFormatError, match="UTF-8"):
        read_listing(q)


def test_quantities_convert_to_si():
    L = _parse('[lamp]\npeak_wavelength = "0.2537 um"\nfwhm = "12nm"\ntube_length = "55 cm"\n'
               'emitter = "tube"\n[leds]\ncurrent = "20 mA"\n[use]\narea = "200 ft2"\n'
               'room_volume = "50 m³"\n')
    assert L.peak_wavelength_nm == 253.7 and L.fwhm_nm == 12.0
    assert L.tube_length_m == pytest.approx(0.55)
    assert L.leds.current_A == pytest.approx(0.020)
    assert math.isclose(L.area_m2, 200 * 0.3048 ** 2)
    assert L.room_volume_m3 == 50.0


@pytest.mark.parametrize("text, field, value", [
    # 1 ft = 0.3048 m exactly (international foot, 1959), so 1 sq ft = 0.09290304 m² and
    # 1 cu ft = 0.028316846592 m³
    ("for rooms up to 1,000 sq ft", "area_m2", 1000 * 0.09290304),
    ("covers 1 000 sq ft", "area_m2", 1000 * 0.09290304),
    ("in a 1,000 cu. ft. room", "volume_m3", 1000 * 0.028316846592),
    ("covers 2,5 m²", "area_m2", 2.5),                      # a decimal comma stays decimal
    ("kills 99.9% germs in 1/2 hour at 1 m", "time_s", 1800.0),
    ("kills 99,9% of germs in 30 min at 2,5 m", "distance_m", 2.5),
])
def test_counts_with_thousands_groups_and_fractions(text, field, value):
    c = parse_claim_text(text)
    assert getattr(c, field) == pytest.approx(value, rel=1e-12)
    if "1,000" in text or "1 000" in text:
        assert "thousands separator" in c.note


@pytest.mark.parametrize("text", ["kills 99.9% of germs, 8000 hrs life",
                                  "Kills 99.9% of germs. Bulb life 10,000 hours",
                                  "lifetime 20000 h; kills 99.9% of germs at 1 m"])
def test_a_lamps_life_is_not_a_treatment_time(text):
    c = parse_claim_text(text)
    assert c.kind == "inactivation" and c.time_s is None
    assert "lamp's life" in c.note


@pytest.mark.parametrize("text, time_s, life_s", [
    # a treatment time before a bracketed aside about the lamp's life stays the treatment's
    ("Kills 99.9% of germs in 30 min (lamp life 8000 h)", 1800.0, 8000 * 3600.0),
    ("8000 h lamp life, kills 99% of germs in 10 min", 600.0, 8000 * 3600.0),
])
def test_a_treatment_time_beside_the_lamps_life_is_kept(text, time_s, life_s):
    q = _find_quantities(text)
    assert q["time_s"] == pytest.approx(time_s) and q["lifetime_s"] == pytest.approx(life_s)
    assert parse_claim_text(text).time_s == pytest.approx(time_s)


@pytest.mark.parametrize("text, time_s", [
    ("kills 99.9% of germs in half an hour", 1800.0), ("99% of germs in 1h30", 5400.0),
    ("in 1 h 30 min at 2 m", 5400.0), ("tötet 99 % der Keime in einer halben Stunde", 1800.0),
    ("élimine 99% des germes en une demi-heure", 1800.0)])
def test_times_written_in_words_or_as_hours_and_minutes(text, time_s):
    assert _find_quantities(text)["time_s"] == pytest.approx(time_s)


@pytest.mark.parametrize("text, field, value", [
    # a thousands dot before exactly 000, or in two or more groups (German, French); "2.500"
    # stays 2.5, being what an English listing writes as well
    ("Für Räume bis 1.000 m³", "volume_m3", 1000.0), ("pour 10.000 m2", "area_m2", 1e4),
    ("1.000.000 m3", "volume_m3", 1e6), ("2.500 m²", "area_m2", 2.5),
    ("in a 1e6 m3 room", "volume_m3", 1e6),         # scientific notation, not "6 m3"
    ("for rooms up to 2.5E2 m2", "area_m2", 250.0),
    ("2x30W UVC", "power_W", 30.0),
])
def test_numbers_in_scientific_notation_are_read_whole(text, field, value):
    assert _find_quantities(text)[field] == pytest.approx(value)


@pytest.mark.parametrize("text, organism, time_s", [
    ("Lampe UV-C 265nm, tue 99,9% des bactéries en 5 min", "bacteria", 300.0),
    ("tötet 99,9 % der Keime in 10 Minuten", "germs", 600.0),
    ("élimine 99% des germes en 2 heures à 1 m", "germs", 7200.0),
])
def test_french_and_german_kill_claims_are_read(text, organism, time_s):
    # a French kill claim beside '265nm' was judged on the wavelength alone and 'held'; the
    # kill words, generic organisms and time units of a short list of our own are now read
    c = parse_claim_text(text)
    assert c.kind == "inactivation" and c.organism == organism and c.time_s == time_s
    assert c.reduction_fraction is not None


@pytest.mark.parametrize("text, safe_for", [
    ("Sicher für Haustiere", ("pets",)),
    ("Unbedenklich für Menschen und Tiere", ("people", "pets")),
    ("Sans danger pour les enfants", ("children",)),
    ("Inoffensif pour la peau et les yeux", ("eyes", "skin")),
    ("sûr pour les animaux", ("pets",)),
])
def test_french_and_german_safety_claims_are_read(text, safe_for):
    # these were 'unrecognised'; as the kill words, a short list of our own
    c = parse_claim_text(text)
    assert c.kind == "safety" and set(c.safe_for) == set(safe_for), (c.kind, c.safe_for)


@pytest.mark.parametrize("text", ["Vorsicht: nicht in die Lampe schauen, nicht sicher für Augen",
                                  "Attention : dangereux pour les yeux"])
def test_french_and_german_warnings_are_no_safety_claims(text):
    assert parse_claim_text(text).kind != "safety"


@pytest.mark.parametrize("text, safe_for", [
    ("Safe for humans and pets (do not look directly at the lamp)", ("people", "pets")),
    ("safe around kids, avoid direct eye exposure", ("children",)),
    ("Vorsicht: nicht direkt in das Licht schauen, sicher für Pflanzen", ("plants",)),
    ("safe for plants, keep pets and people away", ("plants",)),
    ("safe for pets, keep out of reach of children", ("pets",)),
    ("Do not use around children; safe for adults", ("people",)),
])
def test_a_safety_claim_with_a_caution_beside_it_is_still_a_safety_claim(text, safe_for):
    """Sellers add a caution to a safety claim; only a negation in the safety wording's own
    clause ("not safe for eyes") undoes it, and the subjects of the caution ("keep pets
    away") are not what the lamp is said to be safe for (our own reading of plain wording).
    Before, any "do not" or "Vorsicht" in the text dropped the claim as a warning."""
    c = parse_claim_text(text)
    assert c.kind == "safety" and set(c.safe_for) == set(safe_for), (c.kind, c.safe_for, c.note)


@pytest.mark.parametrize("text", [
    "can be used while people are present", "no need to leave the room",
    "You don't have to leave the room during use", "works without leaving the room",
    "Kann verwendet werden, während Personen anwesend sind",
    "safe for humans and pets, no need to leave the room"])
def test_use_while_people_are_in_the_room_is_a_safety_claim_for_occupied_rooms(text):
    """"No need to leave the room" says people may stay: a safety claim for an occupied
    room, never one made for an empty room (our own reading of plain English and German)."""
    c = parse_claim_text(text)
    assert c.kind == "safety" and "occupied-rooms" in c.safe_for, (c.kind, c.safe_for)


def test_french_haut_is_not_skin():
    # 'haut' is French for high; the German noun 'Haut' (skin) is written capitalised
    c = parse_claim_text("sans danger pour les enfants, fixation en haut du mur")
    assert c.kind == "safety" and c.safe_for == ("children",)


# Listing wordings met in marketplace texts (our own reading rules; invented examples).
@pytest.mark.parametrize("text,kind,fields", [
    ("Effective range: 30㎡", "coverage", {"area_m2": 30.0}),                 # U+33A1
    ("Sterilisation distance 10㎝, 99% in 60s", "inactivation",
     {"distance_m": 0.1, "time_s": 60.0, "reduction_fraction": 0.99}),
    ("Germicidal efficacy 99.9% @ 1m / 30min", "inactivation",
     {"distance_m": 1.0, "time_s": 1800.0, "reduction_fraction": 0.999}),
    ("pet friendly", "safety", {"safe_for": ("pets",)}),
    ("Pet-friendly design", "safety", {"safe_for": ("pets",)}),
    ("radiation-free", "safety", {"safe_for": ("people",)}),
    ("No harmful radiation to the human body", "safety", {"safe_for": ("people",)}),
    ("not harmful to pets", "safety", {"safe_for": ("pets",)}),
])
def test_marketplace_wordings(text, kind, fields):
    c = parse_claim_text(text)
    assert c.kind == kind
    assert c.text == text                      # the claim keeps the seller's own characters
    for k, v in fields.items():
        got = getattr(c, k)
        assert got == (pytest.approx(v) if isinstance(v, float) else v), k


@pytest.mark.parametrize("text", ["eco-friendly", "UV light is harmful",
                                  "Warning: harmful UV, not safe for eyes"])
def test_wordings_that_are_not_safety_claims(text):
    assert parse_claim_text(text).kind == "unrecognised"


@pytest.mark.parametrize("text, kind", [("removes odors and smells", "unrecognised"),
                                        ("reduces formaldehyde", "unrecognised"),
                                        ("eliminates 99% of odour-causing bacteria in 30 min",
                                         "inactivation"),
                                        ("kills germs and removes odours in 30 min at 1 m",
                                         "inactivation")])
def test_odour_removal_is_not_a_germicidal_claim(text, kind):
    # a kill word about smells or fumes, with no organism or reduction, is no inactivation
    # claim (uvcheck's reading of plain wording); one that names germs still is
    c = parse_claim_text(text)
    assert c.kind == kind
    if kind == "unrecognised":
        assert "not germs" in c.note
