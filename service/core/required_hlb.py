"""Required HLB of an oil phase (Griffin 1949): the mass-weighted mean of each
oil-phase ingredient's required HLB, over fractions of the oil phase only.

Which ingredients count is the caller's choice: an oil-soluble emulsifier or
a fatty acid may be weighed in the oil phase yet left out of the mean."""
from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence

from service.core.amounts import Amount, Weighed, weigh
from service.core.blend import HlbValue
from service.core.errors import CalculationError
from service.core.mixing import Mean, Term, weighted_mean


@dataclass(frozen=True)
class OilPhase:
    required_hlb: Mean
    weighed: tuple[Weighed, ...]
    # Share of each ingredient in the whole oil phase (1 in all), and in the
    # part that counts towards the mean (0 for those left out).
    phase_fractions: tuple[float, ...]
    counted_fractions: tuple[float, ...]
    total_mass_g: float | None
    # The span of the mean with the values flagged doubtful put back; None
    # when no counted value has any.
    range_with_doubtful: tuple[float, float] | None = None


def required_hlb(
    rhlbs: Sequence[HlbValue | None],
    amounts: Sequence[Amount],
    densities_g_per_ml: Sequence[float | None],
    counts: Sequence[bool],
) -> OilPhase:
    """`rhlbs[i]` is None only where `counts[i]` is False. Raises
    CalculationError when nothing counts or a counted value is missing."""
    weighed = weigh(amounts, densities_g_per_ml, ("oil_phase",))
    for i, (value, count) in enumerate(zip(rhlbs, counts)):
        if count and value is None:
            raise CalculationError(("oil_phase", i), "required_hlb_known", "no required HLB is known for this ingredient and emulsion type")
    counted = [i for i, c in enumerate(counts) if c]
    if not counted:
        raise CalculationError(("oil_phase",), "something_counts", "no oil-phase ingredient counts towards the required HLB")
    mean = weighted_mean([Term(weighed[i].weight, rhlbs[i].figure, rhlbs[i].low, rhlbs[i].high) for i in counted])
    total_weight = sum(w.weight for w in weighed)
    counted_fractions = [0.0] * len(weighed)
    for i, fraction in zip(counted, mean.fractions):
        counted_fractions[i] = fraction
    total = sum(w.mass_g for w in weighed) if weighed[0].mass_g is not None else None
    wide = None
    if any(rhlbs[i].with_doubtful for i in counted):
        spans = [rhlbs[i].with_doubtful or (rhlbs[i].low, rhlbs[i].high) for i in counted]
        widened = weighted_mean([Term(weighed[i].weight, rhlbs[i].figure, lo, hi) for i, (lo, hi) in zip(counted, spans)])
        wide = (widened.low, widened.high)
    return OilPhase(mean, tuple(weighed), tuple(w.weight / total_weight for w in weighed), tuple(counted_fractions), total, wide)
