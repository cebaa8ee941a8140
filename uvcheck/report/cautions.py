"""The caution catalogue of the consumer-safety note: what to tell a buyer, and when.

Each caution is written in our own words from the project's practice notes (PRACTICE.md §4,
"Cautions the consumer-safety note should carry", items 1–13) and carries the condition under
which it applies, as a pure function of ``Assessment.to_dict()`` (plus the listing, where one
was given). The note shows only the cautions that apply, each with the reason it is shown,
and always shows the block on what the check does not cover (:data:`DOES_NOT_COVER`) and the
line deferring to local codes (:data:`LOCAL_CODES`).

Thresholds here are ours and marked "common practice"; regulatory facts are summarised from
public agency guidance as collected in PRACTICE.md §4 and are not legal advice.

Examples
--------
>>> ids = [c["id"] for c in applicable({"germicidal": {"status": "no-uvc"}})]
>>> ids[:1]
['violet-glow']
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any, Callable, Mapping

from uvcheck.germicidal import UVC_EMITTING
from uvcheck.conditions import WORKDAY_S
from uvcheck.limits import GROUPS

Result = Mapping[str, Any]

#: Always shown (PRACTICE.md §4 item 13, in our words).
DOES_NOT_COVER = (
    "This is a screening assessment of the measured sample, not a certification. The results "
    "apply to that sample, at the stated distance and operating conditions, with the stated "
    "uncertainty. The check does not show that the lamp works against a particular germ on a "
    "particular surface, and it does not measure ozone or assess mercury, electrical or "
    "mechanical hazards. Exposure limits are guidance values, not a sharp line between safe and harmful."
)

#: Shown instead of :data:`DOES_NOT_COVER` for a note of a listing alone (nothing measured).
DOES_NOT_COVER_ESTIMATE = (
    "This is a screening estimate from the seller's stated data, not a measurement and not a "
    "certification. The results are what a lamp of the stated kind and output would give at "
    "the stated distance; the lamp as sold can differ in either direction, and only a "
    "measurement shows which. The check does not show that the lamp works against a particular "
    "germ on a particular surface, and it does not measure ozone or assess mercury, electrical "
    "or mechanical hazards. Exposure limits are guidance values, not a sharp line between safe "
    "and harmful."
)

#: Shown instead of :data:`DOES_NOT_COVER` for a listing with no lamp model (claims only).
DOES_NOT_COVER_LISTING = (
    "This is a screening of the seller's statements alone: nothing was measured, and the "
    "listing states too little to model the lamp, so there are no figures. It shows which "
    "claims can be checked and what would decide them; it says nothing about whether the lamp "
    "is safe or works. It is not a certification, and it does not measure ozone or assess "
    "mercury, electrical or mechanical hazards."
)

#: The caution on an overview of several notes (each note has its own, chosen for its lamp).
OVERVIEW_CAUTION = (
    "UV-C and strong UV-A or violet light can injure the eyes and skin without being felt at "
    "the time. Never look at a lit lamp or shine it at people or animals, keep lamps away from "
    "children, and read each product's own note for its cautions and exposure times."
)

#: Always shown.
LOCAL_CODES = ("Local codes, regulations and the advice of licensed professionals take "
               "precedence over this note.")

#: Hazard ids on the UV side of IEC 62471 (actinic, UV-A to the eye).
_UV_HAZARDS = ("actinic_uv", "near_uv")
_GROUP_RANK = {g: k for k, g in enumerate(GROUPS)}


# ---------------------------------------------------------------------------------------------
# Facts the conditions ask about (each a pure function of the result dict)
# ---------------------------------------------------------------------------------------------

def _germ(d: Result) -> Mapping[str, Any]:
    return d.get("germicidal") or {}


def _hazard(d: Result, hid: str) -> Mapping[str, Any]:
    return (d.get("hazards") or {}).get(hid) or {}


def _listing(d: Result, listing: Mapping[str, Any] | None) -> Mapping[str, Any]:
    return listing or d.get("listing") or {}


def _claims(d: Result, listing: Mapping[str, Any] | None) -> list[Mapping[str, Any]]:
    """Claims with verdicts where evaluated, else the listing's claims (kind and text only)."""
    if d.get("claims"):
        return list(d["claims"])
    return list(_listing(d, listing).get("claims") or [])


def emits_uvc(d: Result) -> bool:
    """Germicidal UV-C was found (also a partly measured UV-C band)."""
    g = _germ(d)
    if g:
        return g.get("status") in UVC_EMITTING
    b = (d.get("bands") or {}).get("UV-C") or {}
    return b.get("status") in ("complete", "partial") and (b.get("fraction") or 0) >= 1e-3


def uvc_unknown(d: Result) -> bool:
    """UV-C could not be assessed (not measured, a relative shape only, or a listing with no
    lamp model)."""
    if (d.get("input") or {}).get("origin") == "listing-only":
        return True
    g = _germ(d)
    if g:
        return g.get("status") in ("not-assessed", "shape-only")
    b = (d.get("bands") or {}).get("UV-C") or {}
    return b.get("status") in ("not-covered", None) and bool(d.get("bands"))


def _hazards_at_both(d: Result, hid: str) -> list[Mapping[str, Any]]:
    """The hazard's entries at the assessment distance and at the distance of use."""
    out = [_hazard(d, hid)]
    u = ((d.get("use_distance") or {}).get("hazards") or {}).get(hid)
    if u:
        out.append(u)
    return [h for h in out if h]


def group_rank(d: Result, hids: tuple[str, ...]) -> int | None:
    """Highest risk-group rank (0 Exempt … 3 RG3) among the hazards, at the assessment
    distance or at the distance of use; None if none is known."""
    ranks = [_GROUP_RANK[h.get("risk_group")] for hid in hids for h in _hazards_at_both(d, hid)
             if h.get("risk_group") in _GROUP_RANK]
    return max(ranks) if ranks else None


def uv_group_rank(d: Result) -> int | None:
    """Highest risk-group rank among the UV hazards (0 Exempt … 3 RG3), None if none known."""
    return group_rank(d, _UV_HAZARDS)


def actinic_time_s(d: Result) -> float | None:
    """Permissible exposure time for the actinic UV hazard at the assessed distance. [s]"""
    return _hazard(d, "actinic_uv").get("t_max_s")


#: Hazards of the retina and skin from visible and infrared light (IEC 62471:2006).
_BLUE_HAZARDS = ("blue_light",)
_THERMAL_HAZARDS = ("retinal_thermal", "retinal_thermal_weak_stimulus", "ir_eye")


def peak_nm(d: Result) -> float | None:
    return (d.get("spectral") or {}).get("peak_nm")


def sold_as_germicidal(d: Result, listing: Mapping[str, Any] | None = None) -> bool:
    """Sold as UV-C, or with germ-killing claims."""
    return claims_uvc(d, listing) or bool(kinds(d, listing) & {"inactivation", "coverage"})


def uv_hazard_present(d: Result) -> bool:
    """A UV hazard above Exempt, or an actinic time limit under 8 h."""
    t = actinic_time_s(d)
    rank = uv_group_rank(d)
    return (rank is not None and rank >= 1) or (t is not None and t < WORKDAY_S)


def far_uvc_lamp(d: Result, listing: Mapping[str, Any] | None = None) -> bool:
    """Most of the UV-C lies in 200–235 nm, or the lamp is (stated or detected as) KrCl*."""
    g = _germ(d)
    tech = (g.get("technology") or {}).get("id") or _listing(d, listing).get("technology")
    if tech == "krcl_excimer":
        return True
    b = d.get("bands") or {}
    far, uvc = (b.get("far-UVC") or {}).get("value"), (b.get("UV-C") or {}).get("value")
    return bool(far and uvc and far > 0.5 * uvc)  # "most of the UV-C" (ours)


def mercury_lamp(d: Result, listing: Mapping[str, Any] | None = None) -> bool:
    tech = (_germ(d).get("technology") or {}).get("id") or _listing(d, listing).get("technology")
    return tech in ("lp_mercury", "medium_pressure_mercury") or bool(
        (d.get("spectral") or {}).get("hg_253_7_present"))


def no_uvc(d: Result) -> bool:
    return _germ(d).get("status") == "no-uvc"


def claims_uvc(d: Result, listing: Mapping[str, Any] | None = None) -> bool:
    """The product is sold as UV-C (stated band, wavelength or an emission claim)."""
    li = _listing(d, listing)
    if li.get("band_name") in ("UV-C", "far-UVC"):
        return True
    if (li.get("peak_wavelength_nm") or 999.0) < 280.0:
        return True
    for c in _claims(d, listing):
        if c.get("kind") == "emission":
            wl = c.get("wavelength_nm")
            if (wl is not None and wl < 280.0) or c.get("band_name") in ("UV-C", "far-UVC"):
                return True
            if "uv-c" in (c.get("text") or "").lower() or "uvc" in (c.get("text") or "").lower():
                return True
    return False


def any_uv_measured(d: Result) -> bool:
    """UV of any band measured above its detection limit (UV-C, UV-B or UV-A)."""
    if emits_uvc(d):
        return True
    for k in ("UV-B", "UV-A"):
        b = (d.get("bands") or {}).get(k) or {}
        if b.get("status") in ("complete", "partial") and (b.get("fraction") or 0) >= 0.01:
            return True  # 1 % of the output: "a visible share" (common practice)
    return False


def kinds(d: Result, listing: Mapping[str, Any] | None = None) -> set[str]:
    return {c.get("kind") for c in _claims(d, listing)}


def failed_claims(d: Result) -> list[Mapping[str, Any]]:
    return [c for c in d.get("claims") or [] if c.get("verdict") in ("cannot-hold", "unlikely")]


def short_kill_claim(d: Result, listing: Mapping[str, Any] | None = None) -> bool:
    """An inactivation claim within a minute or of 99.9 % or more."""
    for c in _claims(d, listing):
        if c.get("kind") != "inactivation":
            continue
        t, red = c.get("time_s"), c.get("reduction_fraction")
        text = (c.get("text") or "").lower()
        if (t is not None and t <= 60.0) or (red is not None and red >= 0.999) or "99.9" in text:
            return True
    return False


# ---------------------------------------------------------------------------------------------
# The catalogue
# ---------------------------------------------------------------------------------------------

@dataclass(frozen=True)
class Caution:
    """One caution: id, title, text in our words, and when it applies.

    when : (result, listing) -> the reason it applies, in words, or None.
    priority : lower comes first; the first applicable one is the note's key caution.
    source : where the content comes from.
    """

    id: str
    title: str
    text: str
    when: Callable[[Result, Mapping[str, Any] | None], str | None]
    priority: int
    source: str = "PRACTICE.md §4 (project practice notes), in our words"

    def to_dict(self, reason: str) -> dict[str, Any]:
        return {"id": self.id, "title": self.title, "text": self.text, "reason": reason,
                "priority": self.priority, "source": self.source}


def _fmt_t(seconds: float | None) -> str:
    from uvcheck.units import format_duration

    return format_duration(seconds)


def _dist(d: Result) -> str:
    e = (d.get("evaluation") or {}).get("distance_m")
    return f" at {e * 100:.3g} cm" if e is not None and e < 1 else (f" at {e:g} m" if e else "")


def _when_invisible(d: Result, li: Mapping[str, Any] | None) -> str | None:
    t = actinic_time_s(d)
    if emits_uvc(d) and t is not None:
        from uvcheck.report.terminal import tmax_is_upper_bound

        most = "at most " if tmax_is_upper_bound((d.get("hazards") or {}).get("actinic_uv") or {}) else ""
        return (f"UV-C was measured; the actinic UV limit is reached in {most}{_fmt_t(t)}"
                f"{_dist(d)}")
    if emits_uvc(d):
        return "UV-C was measured"
    if uvc_unknown(d) and claims_uvc(d, li):
        return "the product is sold as UV-C and UV-C could not be ruled out"
    return None


def _when_people_pets(d: Result, li: Mapping[str, Any] | None) -> str | None:
    if emits_uvc(d):
        return "the lamp emits germicidal UV-C"
    if uvc_unknown(d) and claims_uvc(d, li):
        return "the product is sold as UV-C and UV-C could not be ruled out"
    if "safety" in kinds(d, li) and (emits_uvc(d) or uvc_unknown(d)):
        return "the product is sold as safe for people or animals"
    return None


def _when_violet(d: Result, li: Mapping[str, Any] | None) -> str | None:
    """No UV-C, and the lamp is sold as germicidal or glows violet (peak below 420 nm, ours:
    the violet end of the visible range); not for, say, a white LED sold as a light."""
    if not no_uvc(d):
        return None
    pk = peak_nm(d)
    if not sold_as_germicidal(d, li) and pk is not None and pk >= 420.0:
        return None
    return ("no germicidal UV-C was found" + (", although the product is sold as UV-C"
                                              if claims_uvc(d, li) else ""))


def relative_only(d: Result) -> bool:
    """A relative (unscaled) spectrum: no hazard could be given a value."""
    inp = d.get("input") or {}
    rel = inp.get("quantity") == "relative" or inp.get("unit") == "relative"
    hz = d.get("hazards") or {}
    return rel and bool(hz) and all(h.get("status") == "not-assessable" for h in hz.values())


def _when_unscaled(d: Result, li: Mapping[str, Any] | None) -> str | None:
    if relative_only(d):
        return "the spectrum is relative, so no hazard could be assessed"
    return None


def _when_uva_eyes(d: Result, li: Mapping[str, Any] | None) -> str | None:
    rank = uv_group_rank(d)
    if emits_uvc(d) or rank is None or rank < 1:
        return None
    return "a UV hazard above the Exempt group was found, from UV-A or violet light (no UV-C)"


def _when_blue(d: Result, li: Mapping[str, Any] | None) -> str | None:
    rank = group_rank(d, _BLUE_HAZARDS)
    if rank is not None and rank >= 1:
        return "the blue-light hazard to the retina is above the Exempt group"
    return None


def _when_thermal(d: Result, li: Mapping[str, Any] | None) -> str | None:
    rank = group_rank(d, _THERMAL_HAZARDS)
    if rank is not None and rank >= 1:
        return "a thermal or infrared hazard to the eye is above the Exempt group"
    return None


def _when_distance(d: Result, li: Mapping[str, Any] | None) -> str | None:
    if emits_uvc(d):
        return "the lamp emits germicidal UV-C"
    if kinds(d, li) & {"inactivation", "coverage"}:
        return "the product makes disinfection claims"
    return None


def _when_claims(d: Result, li: Mapping[str, Any] | None) -> str | None:
    bad = failed_claims(d)
    if bad:
        return f"{len(bad)} claim{'s' if len(bad) > 1 else ''} cannot hold or {'are' if len(bad) > 1 else 'is'} unlikely"
    if short_kill_claim(d, li):
        return "the product claims a fast or near-total kill"
    return None


def _when_ozone(d: Result, li: Mapping[str, Any] | None) -> str | None:
    oz = _germ(d).get("ozone") or {}
    if oz.get("status") == "present":
        return "output below 240 nm was measured"
    if far_uvc_lamp(d, li) or mercury_lamp(d, li):
        if oz.get("status") == "absent":
            return None
        return "lamps of this type can emit below 240 nm; it could not be ruled out here"
    if "ozone-free" in kinds(d, li):
        return "the product is sold as ozone-free"
    return None


def _when_mercury(d: Result, li: Mapping[str, Any] | None) -> str | None:
    if mercury_lamp(d, li):
        return "the spectrum shows mercury lines or the lamp is stated to be a mercury lamp"
    return None


def _when_sensitive(d: Result, li: Mapping[str, Any] | None) -> str | None:
    if any_uv_measured(d):
        return "the lamp emits UV"
    bl = _hazard(d, "blue_light")
    if bl.get("risk_group") in ("RG1", "RG2", "RG3"):
        return "the blue-light hazard is above the Exempt group"
    return None


def _when_materials(d: Result, li: Mapping[str, Any] | None) -> str | None:
    return "the lamp emits germicidal UV-C" if emits_uvc(d) else None


def _when_far_uvc(d: Result, li: Mapping[str, Any] | None) -> str | None:
    if far_uvc_lamp(d, li):
        return "most of the UV-C lies in the far-UVC band (200–235 nm)"
    return None


def _when_features(d: Result, li: Mapping[str, Any] | None) -> str | None:
    if emits_uvc(d) or uv_hazard_present(d) or claims_uvc(d, li):
        return "the lamp emits UV-C or is sold as a UV-C lamp"
    return None


def _when_legal(d: Result, li: Mapping[str, Any] | None) -> str | None:
    bad = failed_claims(d)
    if bad:
        return "claims were found that cannot hold or are unlikely"
    if kinds(d, li) & {"inactivation", "coverage"}:
        return "the product is sold with germ-killing claims"
    return None


CATALOGUE: tuple[Caution, ...] = (
    Caution("invisible-hazard", "UV-C cannot be seen or felt",
            "The harm shows up hours later: painful, gritty eyes (photokeratitis) and "
            "sunburn-like skin reddening (erythema). Never look at a lit lamp and keep skin out "
            "of its light.", _when_invisible, 10),
    Caution("no-people-pets", "Not for skin, people or animals",
            "Do not use UV-C to disinfect skin or hands. Switch open lamps on only in a room "
            "with no people, pets or plants in it, unless the product is designed and documented "
            "for occupied rooms (shielded upper-room or enclosed units).", _when_people_pets, 20),
    Caution("uva-eyes", "Strong UV-A and violet light can harm the eyes and skin",
            "Near-UV (UV-A) and deep violet light look dim, so the eyes do not turn away from "
            "them. Close up, the lamp can exceed the exposure limits for the eyes (and for the "
            "skin) within minutes. Do not look into the lit lamp or shine it at people or "
            "animals, and keep it away from children.", _when_uva_eyes, 12,
            source="PRACTICE.md §4 item 3 (can still be hazardous to the eyes at close range) "
                   "and the UV hazards of IEC 62471:2006, in our words"),
    Caution("blue-light", "Do not stare into the light",
            "Bright blue or white light can injure the retina (photochemical blue-light "
            "injury) when it is looked into for a long time; glare makes people look away from "
            "brief glances, but not from a steady gaze at close range. Do not stare into the "
            "lamp, and keep children and animals from doing so.", _when_blue, 15,
            source="the blue-light hazard of IEC 62471:2006 (retinal photochemical injury), "
                   "in our words"),
    Caution("thermal-eye", "Heat and infrared",
            "Intense visible and infrared light can burn the retina or heat the eye's "
            "front; the lamp's glare gives some warning, its infrared gives none. Do not look "
            "into the lamp close up.", _when_thermal, 16,
            source="the retinal thermal and infrared eye hazards of IEC 62471:2006, in our words"),
    Caution("unscaled", "Hazards unknown until the spectrum is scaled",
            "Without an absolute scale this check cannot say how hazardous the lamp is. Until "
            "it has been measured in absolute units, treat it as possibly hazardous: do not look "
            "into it and keep skin out of its light at close range.", _when_unscaled, 8,
            source="ours: the honest-results rule that a relative spectrum gives shape results "
                   "only (DEVELOPERS.md)"),
    Caution("violet-glow", "A violet or blue glow is not UV-C",
            "Many lamps sold as UV-C give only UV-A or violet light. It does not disinfect in "
            "any practical time, and close up it can still be hard on the eyes.",
            _when_violet, 5),
    Caution("distance-time-shadow", "Distance, time and shadows decide what is treated",
            "The dose falls off quickly with distance. Shaded, dusty, soiled, porous or hidden "
            "surfaces are not treated. A UV lamp does not replace cleaning, handwashing or "
            "ventilation.", _when_distance, 40),
    Caution("claims-suspicion", "Be wary of \u201cin seconds\u201d and \u201c99.9 %\u201d claims",
            "Either the lamp is too weak to do what is claimed, or it is strong enough to injure "
            "within seconds.", _when_claims, 30),
    Caution("ozone", "Ozone",
            "Lamps that emit below about 240 nm, including some mercury tubes and 222 nm lamps, "
            "can form ozone and other indoor air pollutants. Air the room after use. Whether a "
            "lamp is ozone-free depends on its glass or type; this check does not measure "
            "ozone.", _when_ozone, 50),
    Caution("mercury", "Mercury",
            "Mercury germicidal tubes contain mercury. If one breaks, follow the official "
            "clean-up advice; dispose of used tubes as hazardous waste.", _when_mercury, 60),
    Caution("sensitive-people", "People who are more sensitive",
            "The exposure limits may not protect people who are photosensitive, take "
            "photosensitising medicines, or have had their natural lens removed (aphakic or "
            "pseudophakic eyes).", _when_sensitive, 70),
    Caution("materials", "Materials",
            "UV-C fades and embrittles plastics, fabrics, bedding and artwork.", _when_materials, 80),
    Caution("far-uvc", "Far-UVC (222 nm) is not free of limits",
            "Less hazard per unit dose does not make it harmless. The quality of the lamp's "
            "filter sets the real limit, exposure limits for this band are still being revised, "
            "and the ozone remains.", _when_far_uvc, 35),
    Caution("safety-features", "Look for safety features",
            "An interlock on enclosures, a presence sensor or timer, warning labels, instructions "
            "and stated radiation data. Do not use a product that comes without safety "
            "instructions or radiation information.", _when_features, 45),
    Caution("legal-status", "Legal status and reporting",
            "In the US a UV light sold with germ-killing claims is regulated as a pesticide "
            "device: expect an EPA establishment number (which is not an approval) and claims "
            "backed by data. In the EU and UK lamps must meet the photobiological safety standard "
            "(EN 62471) and the electrical safety rules. Report dangerous or falsely labelled "
            "products to the market-surveillance authority (in the US the FDA; in the EU Safety "
            "Gate).", _when_legal, 90,
            source="PRACTICE.md §4 item 12 (summary of public agency guidance; not legal advice)"),
)


def applicable(result: Result, listing: Mapping[str, Any] | None = None) -> list[dict[str, Any]]:
    """The cautions that apply to a result, most important first, each with its reason.

    result : ``Assessment.to_dict()`` (any subset of its sections).
    listing : the listing dict (``Listing.to_dict()``), if not already in ``result``.
    """
    out = []
    for c in CATALOGUE:
        reason = c.when(result, listing)
        if reason:
            out.append(c.to_dict(reason))
    return sorted(out, key=lambda c: c["priority"])
