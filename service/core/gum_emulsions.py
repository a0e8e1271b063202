"""Gum (acacia) emulsions: the primary emulsion's proportions of oil, water
and gum by kind of oil, and the quantities for a given amount of oil. Plain
floats: oil and water in mL (the proportions are parts by volume), gum in g
(parts by weight)."""
from __future__ import annotations

from dataclasses import dataclass

from service.core.errors import CalculationError

# Oil : water : gum of the primary emulsion, oil and water by volume, gum by
# weight. Common practice, recalled from memory of standard pharmaceutics
# texts (source practice-gum-primary-emulsion; two teaching pages read agree).
PRIMARY_PARTS = {
    "fixed": (4.0, 2.0, 1.0),
    "mineral": (3.0, 2.0, 1.0),
    "volatile": (2.0, 2.0, 1.0),
}
PARTS_SOURCE = "practice-gum-primary-emulsion"


@dataclass(frozen=True)
class PrimaryEmulsion:
    oil_kind: str
    parts: tuple[float, float, float]
    oil_ml: float
    water_ml: float
    gum_g: float


def primary_emulsion(oil_kind: str, oil_ml: float) -> PrimaryEmulsion:
    """The gum and water that go with `oil_ml` of oil in the primary emulsion."""
    if oil_kind not in PRIMARY_PARTS:
        raise CalculationError(("oil_kind",), "known_oil_kind", f"no primary-emulsion proportions for oil kind '{oil_kind}'")
    if oil_ml <= 0:
        raise CalculationError(("oil_amount",), "positive", "the oil's amount is positive")
    oil, water, gum = PRIMARY_PARTS[oil_kind]
    return PrimaryEmulsion(oil_kind, (oil, water, gum), oil_ml, oil_ml * water / oil, oil_ml * gum / oil)


def rest_of_water_g(final_g: float, oil_g: float, primary_water_g: float, gum_g: float) -> float:
    """The water to add after the primary emulsion to make `final_g`; refused
    when the final mass is no more than the primary emulsion's."""
    rest = final_g - oil_g - primary_water_g - gum_g
    if rest < 0:
        raise CalculationError(("final",), "final_holds_primary_emulsion",
                               f"the final mass, {final_g:g} g, is less than the primary emulsion's {oil_g + primary_water_g + gum_g:.4g} g")
    return rest


def check_final_volume(final_ml: float, oil_ml: float, primary_water_ml: float) -> None:
    """A final volume must hold the oil and the primary emulsion's water."""
    if final_ml < oil_ml + primary_water_ml:
        raise CalculationError(("final",), "final_holds_primary_emulsion",
                               f"the final volume, {final_ml:g} mL, is less than the primary emulsion's oil and water, {oil_ml + primary_water_ml:.4g} mL")
