"""Proportions of two surfactants that give a target HLB.

The algebra of the mass-weighted mean (the alligation of pharmaceutical
calculations): with a low-HLB surfactant L and a high-HLB one H, the mass
fraction of H is x = (T - HLB_L) / (HLB_H - HLB_L). With further surfactants
at fixed fractions fᵢ of the blend, the pair shares the remainder
R = 1 - Σfᵢ and must supply T - Σfᵢ·HLBᵢ."""
from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence

from service.core.batch import mixture_mass_for_volume
from service.core.blend import HlbValue
from service.core.errors import CalculationError, InfeasibleTarget
from service.core.mixing import Mean, Term, weighted_mean

# Fixed shares must leave the pair something to vary.
MAX_FIXED_FRACTION = 1.0 - 1e-9


@dataclass(frozen=True)
class Split:
    """Mass fractions of the whole blend, pair first (in the caller's order),
    then the fixed surfactants; and the blend HLB they give, with its span."""

    fractions: tuple[float, ...]
    hlb: Mean
    reachable_low: float
    reachable_high: float


def split_for_target(target_hlb: float, pair: Sequence[HlbValue], fixed: Sequence[tuple[float, HlbValue]] = ()) -> Split:
    """Solve the pair's proportions for `target_hlb`. `fixed` holds (fraction
    of the blend, HLB) for surfactants whose share is set. Raises
    InfeasibleTarget naming the reachable range, or CalculationError."""
    a, b = pair
    if a.figure == b.figure:
        raise CalculationError(("pair",), "pair_hlbs_differ", "the two surfactants of the pair have the same HLB, so no proportion changes the blend HLB")
    fixed_fraction = sum(f for f, _ in fixed)
    if fixed_fraction >= MAX_FIXED_FRACTION:
        raise CalculationError(("fixed",), "fixed_share_below_100", f"fixed surfactants take {fixed_fraction * 100:g} % of the blend, leaving nothing for the pair")
    remainder = 1.0 - fixed_fraction
    contribution = sum(f * h.figure for f, h in fixed)
    low, high = sorted((a.figure, b.figure))
    reach_low, reach_high = contribution + remainder * low, contribution + remainder * high
    # A relative allowance absorbs float error at the ends of the range.
    slack = 1e-9 * max(1.0, abs(target_hlb))
    if not reach_low - slack <= target_hlb <= reach_high + slack:
        raise InfeasibleTarget(("target_hlb",), target_hlb, reach_low, reach_high)
    share_b = (target_hlb - contribution - remainder * a.figure) / (remainder * (b.figure - a.figure))
    share_b = min(max(share_b, 0.0), 1.0)
    fractions = (remainder * (1.0 - share_b), remainder * share_b, *(f for f, _ in fixed))
    values = (a, b, *(h for _, h in fixed))
    # Zero-fraction terms are kept: they weigh nothing in the mean.
    terms = [Term(max(f, 0.0), v.figure, v.low, v.high) for f, v in zip(fractions, values)]
    return Split(tuple(fractions), weighted_mean(terms), reach_low, reach_high)


def total_mass_from_volume(volume_ml: float, fractions: Sequence[float], densities_g_per_ml: Sequence[float | None]) -> float:
    """Mass of a blend of the given mass fractions that fills `volume_ml`
    (volumes assumed additive). Raises CalculationError on a missing density."""
    return mixture_mass_for_volume(volume_ml, fractions, densities_g_per_ml, ("surfactants",))
