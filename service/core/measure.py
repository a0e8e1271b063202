"""Whether an amount can be weighed or measured with the equipment at hand.

Balances (USP <1176>): the minimum weighable quantity is the sensitivity
requirement x 100 / acceptable % error; below it, use an aliquot (liquids) or
trituration (solids) method, or a finer balance.

Graduates (Allen on USP <1176>; Newton 2003): choose the graduate equal to or
just above the volume; do not measure below about 20 % of its capacity; below
1 mL use a pipette or syringe; weigh viscous or oily liquids."""
from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Sequence

from service.core.findings import minimum_weighable_quantity_g

MIN_FRACTION_OF_CAPACITY = 0.20
MIN_GRADUATE_VOLUME_ML = 1.0


@dataclass(frozen=True)
class Balance:
    sensitivity_g: float
    acceptable_error_percent: float
    readability_g: float

    @property
    def minimum_weighable_g(self) -> float:
        return minimum_weighable_quantity_g(self.sensitivity_g, self.acceptable_error_percent)


@dataclass(frozen=True)
class Graduate:
    capacity_ml: float
    subdivision_ml: float
    conical: bool = False


# Conical graduates under this capacity are not used (Allen on USP <1176>).
MIN_CONICAL_CAPACITY_ML = 25.0


@dataclass(frozen=True)
class Check:
    code: str
    ok: bool
    message: str


def round_to(value: float, increment: float) -> float:
    """Nearest whole number of increments (what a balance or graduate reads),
    halves rounded up as a balance reading is (not to even), with an allowance
    for float error (0.025 / 0.01 is 2.4999999999999996)."""
    return round(math.floor(value / increment + 0.5 + 1e-9) * increment, 10)


def weighing_checks(mass_g: float, balance: Balance, solid: bool) -> list[Check]:
    mwq = balance.minimum_weighable_g
    if mass_g >= mwq:
        return [Check("minimum_weighable_quantity", True, f"{mass_g:g} g is at or above the minimum weighable quantity, {mwq:g} g")]
    remedy = "trituration" if solid else "an aliquot method"
    return [Check("minimum_weighable_quantity", False,
                  f"{mass_g:g} g is below the minimum weighable quantity of {mwq:g} g (sensitivity {balance.sensitivity_g * 1000:g} mg at "
                  f"{balance.acceptable_error_percent:g} % error): use {remedy}, or a finer balance")]


def choose_graduate(volume_ml: float, graduates: Sequence[Graduate]) -> tuple[Graduate | None, list[Check]]:
    """The graduate to measure `volume_ml` in, and the checks that decide it.
    None when the volume should not be measured in a graduate."""
    if volume_ml < MIN_GRADUATE_VOLUME_ML:
        return None, [Check("graduate_at_least_1_ml", False, f"{volume_ml:.3g} mL is below 1 mL: use a pipette or a syringe, or weigh it")]
    usable = [g for g in graduates if not (g.conical and g.capacity_ml < MIN_CONICAL_CAPACITY_ML)]
    fitting = sorted((g for g in usable if g.capacity_ml >= volume_ml), key=lambda g: g.capacity_ml)
    if not fitting:
        return None, [Check("graduate_large_enough", False, f"no graduate at hand holds {volume_ml:g} mL: weigh it, or measure in portions")]
    graduate = fitting[0]
    share = volume_ml / graduate.capacity_ml
    if share < MIN_FRACTION_OF_CAPACITY:
        return None, [Check("graduate_at_least_20_percent", False,
                            f"{volume_ml:g} mL is {share * 100:.0f} % of the smallest graduate that holds it ({graduate.capacity_ml:g} mL), "
                            "below the 20 % limit: use a smaller graduate, a pipette or syringe, or weigh it")]
    return graduate, [Check("graduate_at_least_20_percent", True,
                            f"{volume_ml:g} mL in a {graduate.capacity_ml:g} mL graduate ({share * 100:.0f} % of capacity)")]
