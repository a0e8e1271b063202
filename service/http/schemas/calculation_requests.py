"""Request bodies of the four calculations."""
from __future__ import annotations

from service.http.schemas.base_schema import Schema
from service.http.schemas.common import (
    EMULSION_TYPES,
    AbsoluteAmountSchema,
    AmountSchema,
    ComponentSchema,
    DensitySchema,
    IngredientRefSchema,
    MassSchema,
    SensitivitySchema,
)
from service.http.schemas.fields import Boolean, BoundedList, Nested, Number, one_of
from service.http.schemas.enums import enum_field

MAX_COMPONENTS = 30


class BlendRequestSchema(Schema):
    components = BoundedList(Nested(ComponentSchema), required=True, min_items=2, max_items=MAX_COMPONENTS,
                             metadata={"description": "Two or more surfactants with their amounts."})
    emulsion_type = enum_field("EmulsionType", request=True, metadata={"description": "When given, the blend HLB is checked against the range usual for this type."})
    strict = Boolean(metadata={"description": "Refuse registry values not yet checked against their source (strict mode). A service running in strict mode is strict whatever this says."})


class FixedSurfactantSchema(IngredientRefSchema):
    amount = Nested(AmountSchema, required=True, metadata={
        "description": "Its share: `% w/w` of the blend, or a mass when `total` is a mass."})


class SplitRequestSchema(Schema):
    target_hlb = Number(required=True, minimum=0, maximum=60)
    pair = BoundedList(Nested(IngredientRefSchema), required=True, exact_items=2,
                       metadata={"description": "The two surfactants whose proportions are solved for, one of lower and one of higher HLB than the target."})
    fixed = BoundedList(Nested(FixedSurfactantSchema), max_items=MAX_COMPONENTS,
                        metadata={"description": "Further surfactants at fixed shares of the blend."})
    total = Nested(AbsoluteAmountSchema, metadata={"description": "Scale the blend to this total mass or volume."})
    emulsion_type = enum_field("EmulsionType", request=True)
    strict = Boolean(metadata={"description": "Refuse registry values not yet checked against their source (strict mode). A service running in strict mode is strict whatever this says."})


class OilComponentSchema(ComponentSchema):
    counts_toward_rhlb = Boolean(metadata={"description": "false weighs this ingredient in the oil phase but leaves it out of the required-HLB mean (e.g. an oil-soluble emulsifier counted with the emulsifier system). Default true."})


class RequiredHlbRequestSchema(Schema):
    emulsion_type = enum_field("EmulsionType", request=True, required=True)
    oil_phase = BoundedList(Nested(OilComponentSchema), required=True, min_items=1, max_items=MAX_COMPONENTS)
    strict = Boolean(metadata={"description": "Refuse registry values not yet checked against their source (strict mode). A service running in strict mode is strict whatever this says."})


class BalanceSchema(Schema):
    sensitivity = Nested(SensitivitySchema, metadata={"description": "Sensitivity requirement; default 6 mg (Class A prescription balance)."})
    acceptable_error_percent = Number(minimum=0.1, maximum=50, metadata={"description": "Default 5."})


class MinimumEmulsifierRequestSchema(Schema):
    required_hlb = Number(required=True, minimum=0, exclusive_maximum=20, metadata={"description": "Required HLB of the oil phase; the formula is singular at 20."})
    surfactant_density = Nested(DensitySchema, required=True)
    dispersed_phase_density = Nested(DensitySchema, required=True)
    continuous_phase_percent = Number(required=True, exclusive_minimum=0, exclusive_maximum=100)
    batch = Nested(MassSchema, metadata={"description": "Batch mass: the estimate is then also given for the batch, rounded up to a weighable amount."})
    balance = Nested(BalanceSchema)


__all__ = ["BlendRequestSchema", "DensitySchema", "MinimumEmulsifierRequestSchema", "RequiredHlbRequestSchema", "SplitRequestSchema"]
