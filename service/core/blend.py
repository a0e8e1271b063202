"""HLB of a blend of surfactants (Griffin 1949): the mass-weighted mean."""
from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence

from service.core.amounts import Amount, Weighed, weigh
from service.core.errors import CalculationError
from service.core.mixing import Mean, Term, weighted_mean


@dataclass(frozen=True)
class HlbValue:
    """A property's preferred figure and the span its sources give, doubtful
    values left out; `with_doubtful` is the span with them, None when the
    registry flags none."""

    figure: float
    low: float
    high: float
    with_doubtful: tuple[float, float] | None = None


@dataclass(frozen=True)
class Blend:
    hlb: Mean
    weighed: tuple[Weighed, ...]
    total_mass_g: float | None


def blend_hlb(hlbs: Sequence[HlbValue], amounts: Sequence[Amount], densities_g_per_ml: Sequence[float | None]) -> Blend:
    """HLB of two or more surfactants from their amounts (masses, volumes,
    parts or % w/w). Raises CalculationError on an empty or single blend or
    amounts that cannot be put on one basis."""
    if len(hlbs) < 2:
        raise CalculationError(("components",), "at_least_two", "a blend needs at least two surfactants")
    weighed = weigh(amounts, densities_g_per_ml, ("components",))
    mean = weighted_mean([Term(w.weight, h.figure, h.low, h.high) for w, h in zip(weighed, hlbs)])
    total = sum(w.mass_g for w in weighed) if weighed[0].mass_g is not None else None
    return Blend(mean, tuple(weighed), total)
