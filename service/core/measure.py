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
    """`capacity_g` None: no capacity is checked."""

    sensitivity_g: float
    acceptable_error_percent: float
    readability_g: float
    capacity_g: float | None = None

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
    """The minimum weighable quantity and the capacity, checked on the
    unrounded mass: a rounded figure can cross the limit the true one does not."""
    mwq = balance.minimum_weighable_g
    if mass_g >= mwq:
        checks = [Check("minimum_weighable_quantity", True, f"{mass_g:.6g} g is at or above the minimum weighable quantity, {mwq:g} g")]
    else:
        remedy = ("the aliquot method (a trituration, or a solution in part of the vehicle), worked out with the row" if solid
                  else "the aliquot method (dilution with a miscible solvent), worked out with the row")
        checks = [Check("minimum_weighable_quantity", False,
                        f"{mass_g:.6g} g is below the minimum weighable quantity of {mwq:g} g (sensitivity {balance.sensitivity_g * 1000:g} mg at "
                        f"{balance.acceptable_error_percent:g} % error): use {remedy}, or a finer balance")]
    if balance.capacity_g is not None:
        checks.append(capacity_check(mass_g, balance.capacity_g))
    return checks


def capacity_check(mass_g: float, capacity_g: float) -> Check:
    if mass_g <= capacity_g:
        return Check("balance_capacity", True, f"{mass_g:.6g} g is within the balance's capacity of {capacity_g:g} g")
    return Check("balance_capacity", False, f"{mass_g:.6g} g is above the balance's capacity of {capacity_g:g} g: "
                                            "weigh it on a larger balance, or in portions")


def relative_error_percent(unrounded: float, rounded: float) -> float:
    """(rounded - unrounded) / unrounded, in %; 0 for a zero amount."""
    return (rounded - unrounded) / unrounded * 100.0 if unrounded else 0.0


def rounding_check(unrounded: float, rounded: float, acceptable_error_percent: float, unit: str, what: str) -> Check:
    """A figure rounded to what the equipment reads may be further from the
    amount the formula asks for than the acceptable error: flag it."""
    error = relative_error_percent(unrounded, rounded)
    if abs(error) <= acceptable_error_percent + 1e-9:
        return Check("rounding_error", True, f"{what} {rounded:g} {unit} for {unrounded:.6g} {unit} ({error:+.2f} %), within "
                                             f"the acceptable {acceptable_error_percent:g} %")
    return Check("rounding_error", False, f"{what} {rounded:g} {unit} is {error:+.1f} % off the {unrounded:.6g} {unit} the formula asks for, "
                                          f"more than the acceptable {acceptable_error_percent:g} %: use a finer balance or measure, or an aliquot method")


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
