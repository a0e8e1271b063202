"""Amounts actually taken against their targets: each deviation, in the
target's own unit and as a percentage of the unrounded target, and the
batch's yield. Plain floats in g and mL; no rounding anywhere here, so that
a figure rounded for display can never tip a verdict."""
from __future__ import annotations

from dataclasses import dataclass

from service.core.errors import CalculationError

# Float slack on a tolerance verdict: 5 % of 6.4 g computed two ways may
# differ in the last bits; this is a billionth of a percent, far below what
# any balance or graduate reads.
TOLERANCE_SLACK_PERCENT = 1e-9


@dataclass(frozen=True)
class Deviation:
    """`taken` and `target_unrounded` in one unit (g or mL); `deviation` in
    that unit; `percent` = deviation / target_unrounded x 100."""

    target_unrounded: float
    taken: float
    deviation: float
    percent: float
    allowed_percent: float

    @property
    def within(self) -> bool:
        return abs(self.percent) <= self.allowed_percent + TOLERANCE_SLACK_PERCENT


def deviation(target_unrounded: float, taken: float, allowed_percent: float, path: tuple = ()) -> Deviation:
    """The taken amount against the unrounded target, both in one unit.
    Raises CalculationError for a target that is not positive."""
    if not target_unrounded > 0:
        raise CalculationError(path, "positive", f"a target of {target_unrounded:g} cannot be compared with: it must be positive")
    off = taken - target_unrounded
    return Deviation(target_unrounded, taken, off, off / target_unrounded * 100.0, allowed_percent)


def mass_g_from_volume(volume_ml: float, density_g_per_ml: float) -> float:
    return volume_ml * density_g_per_ml


def volume_ml_from_mass(mass_g: float, density_g_per_ml: float) -> float:
    return mass_g / density_g_per_ml


def yield_percent(final_g: float, batch_g: float, path: tuple = ()) -> float:
    """Final weight / batch mass x 100: what was recovered of what was made."""
    if not batch_g > 0:
        raise CalculationError(path, "positive", f"a batch of {batch_g:g} g has no yield: it must be positive")
    return final_g / batch_g * 100.0


__all__ = ["Deviation", "TOLERANCE_SLACK_PERCENT", "deviation", "mass_g_from_volume", "volume_ml_from_mass", "yield_percent"]
