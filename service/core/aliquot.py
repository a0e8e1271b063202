"""The aliquot method of weighing, for an amount below the balance's minimum
weighable quantity (USP <1176>), as pharmaceutical calculations texts teach
it:

1. weigh a whole multiple (the factor) of the amount wanted, at least the
   minimum weighable quantity;
2. mix it with an inert diluent (a solid such as lactose for trituration, a
   miscible solvent for a liquid) to a mixture the same multiple of the
   aliquot;
3. weigh the aliquot, which holds the amount wanted.

Every weighing (the substance, the diluent, the aliquot) is itself at least
the minimum weighable quantity and a whole number of the balance's readings."""
from __future__ import annotations

import math
from dataclasses import dataclass

from service.core.errors import CalculationError
from service.core.measure import relative_error_percent, round_to

# How far past the least factor to look for one whose multiple the balance
# can read exactly (e.g. 15 mg x 8 = 120 mg at a 10 mg reading).
FACTOR_SEARCH = 200


@dataclass(frozen=True)
class AliquotPlan:
    """Masses in g. `delivered_g` is the substance the aliquot holds; it
    equals `desired_g` unless the balance cannot read an exact multiple."""

    desired_g: float
    factor: int
    substance_g: float
    diluent_g: float
    mixture_g: float
    aliquot_g: float
    delivered_g: float

    @property
    def error_percent(self) -> float:
        return relative_error_percent(self.desired_g, self.delivered_g)

    @property
    def diluent_in_aliquot_g(self) -> float:
        """Diluent that goes into the batch with the aliquot."""
        return self.aliquot_g - self.delivered_g


def _multiple_of(value: float, increment: float) -> bool:
    steps = value / increment
    return abs(steps - round(steps)) < 1e-6


def _up_to(value: float, increment: float) -> float:
    return round(math.ceil(value / increment * (1.0 - 1e-12)) * increment, 10)


def aliquot_plan(desired_g: float, minimum_weighable_g: float, readability_g: float, aliquot_g: float | None = None) -> AliquotPlan:
    """The aliquot method for `desired_g`, with a balance whose minimum
    weighable quantity and readability are given; `aliquot_g` chooses the
    aliquot (default: the least that keeps every weighing weighable). Raises
    CalculationError for an amount that needs no aliquot or is not positive,
    or a chosen aliquot below the minimum weighable quantity."""
    if desired_g <= 0.0:
        raise CalculationError(("desired_g",), "positive", "an aliquot is planned for a positive amount")
    if desired_g >= minimum_weighable_g:
        raise CalculationError(("desired_g",), "below_minimum_weighable", "the amount can be weighed directly")
    least = math.ceil(minimum_weighable_g / desired_g * (1.0 - 1e-12))
    factor = next((f for f in range(least, least + FACTOR_SEARCH) if _multiple_of(f * desired_g, readability_g)), least)
    substance_g = _up_to(factor * desired_g, readability_g)
    # The aliquot is weighable, and large enough that the diluent is too:
    # diluent = factor x (aliquot - desired) >= MWQ.
    least_aliquot_g = _up_to(max(minimum_weighable_g, desired_g + minimum_weighable_g / factor), readability_g)
    if aliquot_g is not None and aliquot_g < minimum_weighable_g:
        raise CalculationError(("aliquot_g",), "aliquot_weighable", "the aliquot must be at least the minimum weighable quantity")
    aliquot_g = least_aliquot_g if aliquot_g is None else aliquot_g
    while True:
        mixture_g = round_to(substance_g * aliquot_g / desired_g, readability_g)
        if mixture_g - substance_g >= minimum_weighable_g - 1e-12:
            break
        aliquot_g = round(aliquot_g + readability_g, 10)
    return AliquotPlan(desired_g=desired_g, factor=factor, substance_g=substance_g, diluent_g=round(mixture_g - substance_g, 10),
                       mixture_g=mixture_g, aliquot_g=aliquot_g, delivered_g=substance_g * aliquot_g / mixture_g)
