"""Request parts shared by the calculations: amounts, densities and the two
ways of naming an ingredient (a registry id, or inline values)."""
from __future__ import annotations

from service.http.schemas.base_schema import Schema
from service.http.schemas.fields import Boolean, Nested, Number, ingredient_id, one_of, text
from service.http.schemas.rules import RuleChecks, exactly_one, within_unit_bounds
from service.usecases.measuring import CAPACITY_G, CAPACITY_ML, READABILITY_G, SENSITIVITY_G, SUBDIVISION_ML
from service.usecases.resolution import DENSITY_RANGE_G_PER_ML
from service.units import ABSOLUTE_UNITS, AMOUNT_UNITS, DENSITY_UNITS, MASS_UNITS, VOLUME_UNITS
from service.http.schemas.enums import enum_field

UNIT_ENUMS = {"mass": "MassUnit", "volume": "VolumeUnit", "density": "DensityUnit", "parts": "RelativeUnit", "percent_w_w": "RelativeUnit"}


def _unit_enums(units) -> list[str]:
    return list(dict.fromkeys(UNIT_ENUMS[u.kind] for u in units.values()))

EMULSION_TYPES = ("O/W", "W/O")
IONIC_CLASSES = ("nonionic", "anionic", "cationic", "amphoteric")
PHYSICAL_STATES = ("liquid", "semisolid", "solid")


# Plausible quantities, in canonical units (g, mL, g/mL, parts, % w/w): a
# figure outside is a slip of unit, refused before any calculation. The same
# numbers are published, per unit, in the OpenAPI document.
AMOUNT_BOUNDS = {"mass": (1e-6, 1e6), "volume": (1e-3, 1e6), "parts": (1e-6, 1e6), "percent_w_w": (1e-6, 100.0)}
BATCH_BOUNDS = {"mass": (0.1, 1e6), "volume": (0.1, 1e6)}
DENSITY_BOUNDS = {"density": DENSITY_RANGE_G_PER_ML}


def _ten_digits(x: float, up: bool) -> float:
    """x to ten significant digits, readable in the spec, rounded inwards (a
    minimum up, a maximum down) so that a value the schema takes is never
    refused by the use cases' own check of the canonical bounds."""
    r = float(f"{x:.10g}")
    if (up and r < x) or (not up and r > x):
        r = float(f"{x * (1 + 1e-10 if up else 1 - 1e-10):.10g}")
    return r


def per_unit(units, bounds_by_kind: dict[str, tuple[float, float]]) -> dict[str, tuple[float, float]]:
    """Canonical bounds restated in each unit of the allow-list."""
    out = {}
    for token, unit in units.items():
        low, high = bounds_by_kind[unit.kind]
        out[token] = (_ten_digits(low / unit.to_canonical, up=True), _ten_digits(high / unit.to_canonical, up=False))
    return out


def quantity(name: str, units, bounds_by_kind: dict[str, tuple[float, float]], what: str, code: str = "plausible_amount") -> type[Schema]:
    """A {value, unit} schema whose value must be plausible for its unit."""
    schema = type(f"{name}Schema", (RuleChecks,), {
        "value": Number(required=True, exclusive_minimum=0, metadata={"description": "A positive, finite number, within the bounds of its unit."}),
        "unit": enum_field(*_unit_enums(units), request=True, required=True, metadata={"description": "A unit from the allow-list; free-text units are never parsed."}),
        "RULES": (within_unit_bounds(code, per_unit(units, bounds_by_kind), what),),
        "__doc__": f"{what[0].upper()}{what[1:]}, as a value and a unit.",
    })
    return schema


AmountSchema = quantity("Amount", AMOUNT_UNITS, AMOUNT_BOUNDS, "amount")
AbsoluteAmountSchema = quantity("AbsoluteAmount", ABSOLUTE_UNITS, AMOUNT_BOUNDS, "amount")
MassSchema = quantity("Mass", MASS_UNITS, AMOUNT_BOUNDS, "mass")
DensitySchema = quantity("Density", DENSITY_UNITS, DENSITY_BOUNDS, "density for a pharmaceutical ingredient", "plausible_density")
BatchSizeSchema = quantity("BatchSize", ABSOLUTE_UNITS, BATCH_BOUNDS, "batch size")


def _equipment(name: str, units, kind: str, bounds: tuple[float, float], what: str) -> type[Schema]:
    return quantity(name, units, {kind: bounds}, what, "plausible_equipment")


GraduateVolumeSchema = _equipment("GraduateVolume", VOLUME_UNITS, "volume", CAPACITY_ML, "graduate capacity")
SubdivisionSchema = _equipment("Subdivision", VOLUME_UNITS, "volume", SUBDIVISION_ML, "graduate subdivision")
SensitivitySchema = _equipment("Sensitivity", MASS_UNITS, "mass", SENSITIVITY_G, "balance sensitivity")
ReadabilitySchema = _equipment("Readability", MASS_UNITS, "mass", READABILITY_G, "balance readability")
BalanceCapacitySchema = _equipment("BalanceCapacity", MASS_UNITS, "mass", CAPACITY_G, "balance capacity")


class InlineIngredientSchema(Schema):
    """An ingredient the registry does not hold, with the caller's values.
    Values given inline are reported as caller-supplied, with no source."""

    name = text(required=True)
    hlb = Number(minimum=0, maximum=60, metadata={"description": "HLB, for a surfactant."})
    required_hlb = Number(minimum=0, maximum=20, metadata={"description": "Required HLB for the emulsion type asked, for an oil-phase ingredient."})
    density = Nested(DensitySchema)
    ionic_class = one_of(IONIC_CLASSES)
    physical_state = one_of(PHYSICAL_STATES)


class IngredientRefSchema(RuleChecks):
    """Exactly one of `ingredient` (a registry id) or `inline`."""

    RULES = (exactly_one("ingredient", "inline", "Give exactly one of 'ingredient' (a registry id) or 'inline' (the ingredient's values)."),)

    ingredient = ingredient_id()
    inline = Nested(InlineIngredientSchema)
    density = Nested(DensitySchema, metadata={"description": "Overrides the registry's density (e.g. a value measured on the lot in hand); reported as caller-supplied."})



class ComponentSchema(IngredientRefSchema):
    amount = Nested(AmountSchema, required=True)


__all__ = [
    "AbsoluteAmountSchema", "AmountSchema", "BatchSizeSchema", "Boolean", "ComponentSchema", "DensitySchema", "EMULSION_TYPES",
    "BalanceCapacitySchema", "GraduateVolumeSchema", "IngredientRefSchema", "InlineIngredientSchema", "MassSchema", "ReadabilitySchema",
    "SensitivitySchema", "SubdivisionSchema", "per_unit", "quantity",
]
