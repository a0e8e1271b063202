"""Findings the calculations report beside their results: things a
pharmacist must see (ionic mixtures, an unusual blend HLB)."""
from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Mapping, Sequence

IONIC = frozenset({"anionic", "cationic", "amphoteric"})

# Griffin's scale for nonionic surfactants runs from 0 to 20 (20 would be all
# hydrophile); a figure above it (poloxamers, ionic surfactants) is off it.
GRIFFIN_SCALE_MAX = 20.0

# The densest packing of uniform spheres, π/(3·√2) ≈ 0.7405 (a geometric
# fact): above it, droplets of one size must deform or the emulsion invert.
MAX_PACKING_FRACTION = math.pi / (3.0 * math.sqrt(2.0))
# Above about this dispersed volume fraction an emulsion is crowded and
# prone to inversion (common practice, no source).
HIGH_PHASE_VOLUME_FRACTION = 0.60

# Which application range of the HLB scale suits which emulsion type.
RANGE_FOR_EMULSION_TYPE = {"O/W": "o_w_emulsifying", "W/O": "w_o_emulsifying"}


@dataclass(frozen=True)
class Finding:
    code: str
    message: str
    subject: str | None = None


def ionic_findings(ionic_classes: Sequence[str]) -> list[Finding]:
    """Anionic with cationic is an incompatibility; an ionic surfactant mixed
    arithmetically with nonionics gives a blend HLB of little meaning, since
    ionic HLBs (about 20 to 40) lie off Griffin's nonionic scale."""
    found = []
    present = set(ionic_classes)
    if {"anionic", "cationic"} <= present:
        found.append(Finding(
            "ionic_incompatibility",
            "an anionic and a cationic surfactant are combined: they are expected to interact and lose "
            "emulsifying power, or precipitate",
        ))
    if present & IONIC and "nonionic" in present:
        found.append(Finding(
            "ionic_with_nonionic",
            "an ionic surfactant is blended arithmetically with nonionic ones; ionic HLB values are poorly "
            "defined and lie off the nonionic scale, so the blend HLB is a rough guide only",
        ))
    if "unspecified" in present:
        found.append(Finding(
            "ionic_class_unknown",
            "an inline ingredient has no ionic class, so ionic compatibility could not be checked",
        ))
    return found


def off_scale_findings(members: Sequence[tuple[str, float, str]]) -> list[Finding]:
    """A finding naming the nonionic members (label, HLB, ionic class) whose
    HLB is above Griffin's 0 to 20 scale; ionic ones get ionic_findings'."""
    off = [(label, hlb) for label, hlb, ionic in members if hlb > GRIFFIN_SCALE_MAX and ionic not in IONIC]
    if not off:
        return []
    names = ", ".join(f"{label} ({hlb:g})" for label, hlb in off)
    return [Finding("hlb_off_griffin_scale",
                    f"HLB above 20, off Griffin's nonionic scale of 0 to 20: {names}; such a figure is nominal, and a blend HLB "
                    "computed with it arithmetically is a rough guide only", ", ".join(label for label, _ in off))]


def usual_range_finding(
    hlb: float, emulsion_type: str | None, ranges: Mapping[str, tuple[float, float]], what: str = "blend HLB"
) -> Finding | None:
    """A finding when a blend's (or an estimated) HLB lies outside the range
    usual for the emulsion type (ranges: name -> (low, high))."""
    if emulsion_type is None:
        return None
    low, high = ranges[RANGE_FOR_EMULSION_TYPE[emulsion_type]]
    if low <= hlb <= high:
        return None
    return Finding(
        "hlb_outside_usual_range",
        f"{what} {hlb:.1f} is outside the range usual for {emulsion_type} emulsifiers, {low:g} to {high:g}",
    )


def minimum_weighable_quantity_g(sensitivity_g: float, acceptable_error_percent: float) -> float:
    """USP <1176>: the least mass a balance weighs within the acceptable error,
    sensitivity requirement x 100 / acceptable % error."""
    return sensitivity_g * 100.0 / acceptable_error_percent


def ceil_to(value: float, increment: float) -> float:
    """Round up to a whole number of increments. A relative allowance of 1e-9
    keeps 1.2000000000000002 from becoming 1.3."""
    steps = math.ceil(value / increment * (1.0 - 1e-9))
    return round(steps * increment, 10)


def phase_volume_findings(dispersed_fraction: float, basis: str) -> list[Finding]:
    """Findings on the dispersed phase's share (a volume fraction, or a mass
    fraction when `basis` says so): above the packing limit of uniform
    spheres, and above the crowded threshold."""
    share = f"{dispersed_fraction * 100:.1f} % ({basis})"
    if dispersed_fraction > MAX_PACKING_FRACTION:
        return [Finding("dispersed_phase_above_packing_limit",
                        f"the dispersed phase is {share} of the emulsion, more than uniform spherical droplets can fill "
                        f"({MAX_PACKING_FRACTION * 100:.1f} %): droplets must deform, and the emulsion may invert; reconsider the phase ratio",
                        "dispersed_phase")]
    if dispersed_fraction > HIGH_PHASE_VOLUME_FRACTION:
        return [Finding("dispersed_phase_high",
                        f"the dispersed phase is {share} of the emulsion, above about {HIGH_PHASE_VOLUME_FRACTION * 100:g} %: "
                        "a crowded emulsion, viscous and prone to inversion", "dispersed_phase")]
    return []
