"""Findings the calculations report beside their results: things a
pharmacist must see (ionic mixtures, an unusual blend HLB)."""
from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Mapping, Sequence

IONIC = frozenset({"anionic", "cationic", "amphoteric"})

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


def usual_range_finding(
    hlb: float, emulsion_type: str | None, ranges: Mapping[str, tuple[float, float]]
) -> Finding | None:
    """A finding when a blend HLB lies outside the range usual for the
    emulsion type (ranges: name -> (low, high))."""
    if emulsion_type is None:
        return None
    low, high = ranges[RANGE_FOR_EMULSION_TYPE[emulsion_type]]
    if low <= hlb <= high:
        return None
    return Finding(
        "hlb_outside_usual_range",
        f"blend HLB {hlb:.1f} is outside the range usual for {emulsion_type} emulsifiers, {low:g} to {high:g}",
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
