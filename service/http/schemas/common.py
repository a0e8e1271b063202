"""Request parts shared by the calculations: amounts, densities and the two
ways of naming an ingredient (a registry id, or inline values)."""
from __future__ import annotations

from marshmallow import Schema, ValidationError, fields, validates_schema

from service.http.schemas.fields import Boolean, Number, ingredient_id, one_of, text
from service.units import ABSOLUTE_UNITS, AMOUNT_UNITS, DENSITY_UNITS, MASS_UNITS

EMULSION_TYPES = ("O/W", "W/O")
IONIC_CLASSES = ("nonionic", "anionic", "cationic", "amphoteric")
PHYSICAL_STATES = ("liquid", "semisolid", "solid")


def _quantity(name: str, units, description: str) -> type[Schema]:
    return Schema.from_dict(
        {
            "value": Number(required=True, exclusive_minimum=0, metadata={"description": "A positive, finite number."}),
            "unit": one_of(units, required=True, metadata={"description": "A unit from the allow-list; free-text units are never parsed."}),
        },
        name=name,
    )


AmountSchema = _quantity("Amount", AMOUNT_UNITS, "An amount: mass, volume, parts, or % w/w of the formula.")
AbsoluteAmountSchema = _quantity("AbsoluteAmount", ABSOLUTE_UNITS, "A mass or a volume.")
MassSchema = _quantity("Mass", MASS_UNITS, "A mass.")
DensitySchema = _quantity("Density", DENSITY_UNITS, "A density.")


class InlineIngredientSchema(Schema):
    """An ingredient the registry does not hold, with the caller's values.
    Values given inline are reported as caller-supplied, with no source."""

    name = text(required=True)
    hlb = Number(minimum=0, maximum=60, metadata={"description": "HLB, for a surfactant."})
    required_hlb = Number(minimum=0, maximum=20, metadata={"description": "Required HLB for the emulsion type asked, for an oil-phase ingredient."})
    density = fields.Nested(DensitySchema)
    ionic_class = one_of(IONIC_CLASSES)
    physical_state = one_of(PHYSICAL_STATES)


class IngredientRefSchema(Schema):
    """Exactly one of `ingredient` (a registry id) or `inline`."""

    ingredient = ingredient_id()
    inline = fields.Nested(InlineIngredientSchema)
    density = fields.Nested(DensitySchema, metadata={"description": "Overrides the registry's density (e.g. a value measured on the lot in hand); reported as caller-supplied."})

    @validates_schema
    def _exactly_one(self, data, **kwargs):
        if ("ingredient" in data) == ("inline" in data):
            raise ValidationError("Give exactly one of 'ingredient' (a registry id) or 'inline' (the ingredient's values).", field_name="ingredient")


class ComponentSchema(IngredientRefSchema):
    amount = fields.Nested(AmountSchema, required=True)


__all__ = [
    "AbsoluteAmountSchema", "AmountSchema", "Boolean", "ComponentSchema", "DensitySchema", "EMULSION_TYPES",
    "IngredientRefSchema", "InlineIngredientSchema", "MassSchema",
]
