"""Response bodies. Every calculation answer has the same envelope: the
result, the inputs as normalised (g and mL), the method and its sources, the
values used with their provenance, warnings, cautions, and the registry
version that produced it."""
from __future__ import annotations

from marshmallow import fields

from service.http.schemas.base_schema import Schema
from service.http.schemas.enums import enum_field

NullableNumber = lambda **kw: fields.Float(allow_none=True, **kw)  # noqa: E731

NullableString = lambda **kw: fields.String(allow_none=True, **kw)  # noqa: E731


class CitationSchema(Schema):
    id = fields.String(required=True)
    citation = fields.String(required=True)
    kind = fields.String(required=True)


class MethodSchema(Schema):
    name = fields.String(required=True)
    formula = fields.String(required=True)
    sources = fields.List(fields.Nested(CitationSchema), required=True)
    assumptions = fields.List(fields.String(), required=True)


class ValueUsedSchema(Schema):
    ingredient = NullableString(required=True, metadata={"description": "Registry id, or null for an inline ingredient."})
    name = fields.String(required=True)
    property = enum_field("Property", required=True)
    pointer = fields.String(required=True, metadata={"description": "The request item the value was used for (JSON pointer)."})
    figure = fields.Float(required=True, metadata={"description": "The figure used (the preferred value; the midpoint of a range)."})
    low = fields.Float(required=True)
    high = fields.Float(required=True)
    unit = NullableString(required=True, metadata={"description": "g/mL for density; null for HLB values."})
    origin = enum_field("Origin", required=True)
    source = fields.Nested(CitationSchema, allow_none=True, required=True)
    locator = NullableString(required=True)
    kind = enum_field("ValueKind", required=True, allow_none=True, metadata={"description": "null for caller values."})
    status = enum_field("ValueStatus", required=True)
    local = fields.Boolean(required=True, metadata={"description": "true for a value from the pharmacy's site overlay."})
    recalled_from_memory = fields.Boolean(required=True)
    sources_disagree = fields.Boolean(required=True)
    note = NullableString(required=True)
    range_with_doubtful = fields.Nested("RangeSchema", required=True, allow_none=True, metadata={
        "description": "low and high leave out values the registry flags doubtful; this is the span with them, null when there are none."})


class WarningSchema(Schema):
    code = enum_field("WarningCode", required=True)
    message = fields.String(required=True)
    subject = NullableString(required=True)


class RegistryVersionSchema(Schema):
    release = fields.String(required=True)
    digest = fields.String(required=True, metadata={"description": "sha256 of the registry's data files."})
    site_overlay_digest = NullableString(required=True, metadata={"description": "sha256 of the site overlay's files, or null when none is in use."})
    version = fields.String(required=True, metadata={"description": "release+sha256.<12 hex digits>[.site.<12 hex digits>]; also sent as the Registry-Version header."})


class RangeSchema(Schema):
    low = fields.Float(required=True)
    high = fields.Float(required=True)


class AmountOutSchema(Schema):
    value = fields.Float(required=True)
    unit = fields.String(required=True)


class ComponentInputSchema(Schema):
    ingredient = NullableString(required=True)
    name = fields.String(required=True)
    origin = fields.String(required=True)
    amount = fields.Nested(AmountOutSchema, required=True, metadata={"description": "As given."})
    mass_g = NullableNumber(required=True, metadata={"description": "null when the amounts were relative."})
    volume_ml = NullableNumber(required=True, metadata={"description": "null when no density is known or the amounts were relative."})
    percent_w_w = fields.Float(required=True, metadata={"description": "Share of the blend (or of the oil phase), by mass."})


def answer(name: str, result: type[Schema], inputs: type[Schema]) -> type[Schema]:
    return Schema.from_dict(
        {
            "result": fields.Nested(result, required=True),
            "inputs": fields.Nested(inputs, required=True),
            "method": fields.Nested(MethodSchema, required=True),
            "values_used": fields.List(fields.Nested(ValueUsedSchema), required=True),
            "warnings": fields.List(fields.Nested(WarningSchema), required=True),
            "cautions": fields.List(fields.String(), required=True),
            "strict": fields.Boolean(required=True, metadata={"description": "Whether strict mode (verified registry values only) applied."}),
            "registry": fields.Nested(RegistryVersionSchema, required=True),
        },
        name=name,
    )


# Blend HLB
class BlendResultSchema(Schema):
    hlb = fields.Float(required=True, metadata={"description": "Rounded to 0.1."})
    hlb_unrounded = fields.Float(required=True, metadata={"description": "Before display rounding, to 6 decimals."})
    hlb_range = fields.Nested(RangeSchema, required=True, metadata={"description": "What the blend HLB spans across every source's values."})
    total_mass_g = NullableNumber(required=True)


class BlendInputsSchema(Schema):
    components = fields.List(fields.Nested(ComponentInputSchema), required=True)
    emulsion_type = enum_field("EmulsionType", required=True, allow_none=True)


# Proportions for a target
class SplitSurfactantSchema(Schema):
    ingredient = NullableString(required=True)
    name = fields.String(required=True)
    role = fields.String(required=True, metadata={"description": "pair or fixed."})
    hlb = fields.Float(required=True)
    percent_w_w = fields.Float(required=True, metadata={"description": "Share of the blend by mass."})
    mass_g = NullableNumber(required=True)
    volume_ml = NullableNumber(required=True)


class SplitResultSchema(Schema):
    target_hlb = fields.Float(required=True)
    hlb_reached = fields.Float(required=True, metadata={"description": "Blend HLB of the proportions, rounded to 0.1."})
    hlb_range = fields.Nested(RangeSchema, required=True)
    reachable_range = fields.Nested(RangeSchema, required=True)
    surfactants = fields.List(fields.Nested(SplitSurfactantSchema), required=True)
    total_mass_g = NullableNumber(required=True)
    total_volume_ml = NullableNumber(required=True)


class SplitInputsSchema(Schema):
    target_hlb = fields.Float(required=True)
    total = fields.Nested(AmountOutSchema, allow_none=True, required=True)
    emulsion_type = enum_field("EmulsionType", required=True, allow_none=True)


# Required HLB
class OilInputSchema(ComponentInputSchema):
    counts_toward_rhlb = fields.Boolean(required=True)
    percent_of_counted = fields.Float(required=True, metadata={"description": "Weight in the required-HLB mean (0 when left out)."})


class RequiredHlbResultSchema(Schema):
    required_hlb = fields.Float(required=True, metadata={"description": "Rounded to 0.1."})
    required_hlb_unrounded = fields.Float(required=True, metadata={"description": "Before display rounding, to 6 decimals."})
    range = fields.Nested(RangeSchema, required=True, metadata={"description": "What the result spans across every source's values, values flagged doubtful left out."})
    range_with_doubtful = fields.Nested(RangeSchema, required=True, allow_none=True, metadata={"description": "The span with the doubtful values put back; null when none was used."})
    emulsion_type = enum_field("EmulsionType", required=True)
    oil_phase_mass_g = NullableNumber(required=True)


class RequiredHlbInputsSchema(Schema):
    emulsion_type = enum_field("EmulsionType", required=True)
    oil_phase = fields.List(fields.Nested(OilInputSchema), required=True)


# Minimum emulsifier
class BatchEmulsifierSchema(Schema):
    batch_mass_g = fields.Float(required=True)
    emulsifier_mass_g = fields.Float(required=True)
    emulsifier_mass_g_weighable = fields.Float(required=True, metadata={"description": "Rounded up to the balance increment, and to no less than the minimum weighable quantity."})
    minimum_weighable_quantity_g = fields.Float(required=True)


class EstimateLimitsSchema(Schema):
    warning_above = fields.Float(required=True, metadata={"description": "The highest usual emulsifier level the registry holds, % w/w."})
    refused_above = fields.Float(required=True, metadata={"description": "Twice that, and never above 100: an estimate above it is refused."})


class MinimumEmulsifierResultSchema(Schema):
    g_per_100g = fields.Float(required=True, metadata={"description": "The estimate, read as grams of emulsifier per 100 g of emulsion (% w/w)."})
    g_per_100g_rounded_up = fields.Float(required=True, metadata={"description": "Rounded up to 0.1 g."})
    continuous_phase_term_g_per_100g = fields.Float(required=True, metadata={"description": "The part 4·Q/1000 contributes: at most 0.4."})
    oil_load_note = fields.String(required=True)
    limits_g_per_100g = fields.Nested(EstimateLimitsSchema, required=True)
    basis = fields.String(required=True)
    batch = fields.Nested(BatchEmulsifierSchema, allow_none=True, required=True)


class MinimumEmulsifierInputsSchema(Schema):
    required_hlb = fields.Float(required=True)
    surfactant_density_g_per_ml = fields.Float(required=True)
    dispersed_phase_density_g_per_ml = fields.Float(required=True)
    continuous_phase_percent = fields.Float(required=True)
    batch_mass_g = NullableNumber(required=True)
    balance_sensitivity_g = fields.Float(required=True)
    acceptable_error_percent = fields.Float(required=True)


BlendAnswerSchema = answer("BlendAnswer", BlendResultSchema, BlendInputsSchema)
SplitAnswerSchema = answer("SplitAnswer", SplitResultSchema, SplitInputsSchema)
RequiredHlbAnswerSchema = answer("RequiredHlbAnswer", RequiredHlbResultSchema, RequiredHlbInputsSchema)
MinimumEmulsifierAnswerSchema = answer("MinimumEmulsifierAnswer", MinimumEmulsifierResultSchema, MinimumEmulsifierInputsSchema)
