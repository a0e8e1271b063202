"""The request and the answer of POST /v1/blends/solve: the shares of two or
more surfactants for a target HLB under bounds, fixed shares and ratios."""
from __future__ import annotations

from marshmallow import fields

from service.http.schemas.base_schema import Schema
from service.http.schemas.calculation_requests import MAX_COMPONENTS
from service.http.schemas.common import AbsoluteAmountSchema, IngredientRefSchema
from service.http.schemas.enums import enum_field
from service.http.schemas.fields import Boolean, BoundedList, Integer, Nested, Number
from service.http.schemas.responses import AmountOutSchema, NullableNumber, NullableString, RangeSchema, answer
from service.http.schemas.rules import at_most_one, not_above

SHARE = "% w/w of the blend"


class BlendMemberSchema(IngredientRefSchema):
    """A member of the blend: a registry id or inline values, and its
    constraints, each a share of the blend by mass."""

    RULES = IngredientRefSchema.RULES + (
        at_most_one("min_percent_w_w", "fixed_percent_w_w", "A fixed share has no bounds: give 'fixed_percent_w_w' or 'min_percent_w_w', not both."),
        at_most_one("max_percent_w_w", "fixed_percent_w_w", "A fixed share has no bounds: give 'fixed_percent_w_w' or 'max_percent_w_w', not both."),
        not_above("min_percent_w_w", "max_percent_w_w"),
    )

    fixed_percent_w_w = Number(minimum=0, maximum=100, metadata={"description": f"The member's share, fixed ({SHARE})."})
    min_percent_w_w = Number(minimum=0, maximum=100, metadata={"description": f"The least share the member may take ({SHARE}); default 0."})
    max_percent_w_w = Number(minimum=0, maximum=100, metadata={"description": f"The largest share the member may take ({SHARE}); default 100."})


class BlendRatioSchema(Schema):
    """share of member `a` : share of member `b` = `a_parts` : `b_parts`."""

    a = Integer(required=True, minimum=0, maximum=MAX_COMPONENTS - 1, metadata={"description": "A member, by its place in `surfactants` (from 0)."})
    b = Integer(required=True, minimum=0, maximum=MAX_COMPONENTS - 1, metadata={"description": "Another member, by its place in `surfactants`."})
    a_parts = Number(required=True, exclusive_minimum=0, maximum=1e6)
    b_parts = Number(required=True, exclusive_minimum=0, maximum=1e6)


class BlendSolveRequestSchema(Schema):
    target_hlb = Number(required=True, minimum=0, maximum=60)
    surfactants = BoundedList(Nested(BlendMemberSchema), required=True, min_items=2, max_items=MAX_COMPONENTS, metadata={
        "description": "The members: three or more is what this is for; two give the same shares as /v1/blends/proportions."})
    ratios = BoundedList(Nested(BlendRatioSchema), max_items=MAX_COMPONENTS, metadata={"description": "Ratios between two members' shares."})
    objective = enum_field("BlendObjective", request=True, metadata={"description": "How the answer is chosen among the many; default most_even."})
    total = Nested(AbsoluteAmountSchema, metadata={"description": "Scale the blend to this total mass or volume."})
    emulsion_type = enum_field("EmulsionType", request=True, metadata={"description": "When given, the blend HLB is checked against the range usual for this type."})
    strict = Boolean(metadata={"description": "Refuse registry values not yet checked against their source (strict mode). A service running in strict mode is strict whatever this says."})


class BlendShareSchema(Schema):
    ingredient = NullableString(required=True)
    name = fields.String(required=True)
    hlb = fields.Float(required=True)
    ionic_class = fields.String(required=True, metadata={"description": "nonionic, anionic, cationic, amphoteric, or unspecified for an inline member without one."})
    percent_w_w = fields.Float(required=True, metadata={"description": f"The share ({SHARE}), unrounded."})
    percent_w_w_rounded = fields.Float(required=True, metadata={"description": "The share rounded to 0.01 %: the rounded shares may not add up to exactly 100."})
    mass_g = NullableNumber(required=True)
    volume_ml = NullableNumber(required=True)


class BlendConstraintSchema(Schema):
    kind = fields.String(required=True, metadata={"description": "fixed, lower_bound, upper_bound or ratio."})
    pointer = fields.String(required=True, metadata={"description": "The request field that states it (JSON pointer)."})
    description = fields.String(required=True)
    given = fields.Boolean(required=True, metadata={"description": "true for the caller's constraints; false for the natural bounds, 0 and 100 %."})
    active = fields.Boolean(required=True, metadata={"description": "Holds with equality at the answer: a bound reached; a fixed share or a ratio always."})


class BlendSolveResultSchema(Schema):
    target_hlb = fields.Float(required=True)
    hlb_reached = fields.Float(required=True, metadata={"description": "The blend HLB of the shares, recomputed from them, rounded to 0.1."})
    hlb_reached_unrounded = fields.Float(required=True, metadata={"description": "Before display rounding, to 6 decimals."})
    hlb_range = Nested(RangeSchema, required=True, metadata={"description": "What the blend HLB of these shares spans across every source's values."})
    objective = enum_field("BlendObjective", required=True)
    objective_description = fields.String(required=True)
    reachable_range = Nested(RangeSchema, required=True, metadata={"description": "The least and the greatest blend HLB under the constraints."})
    ionic_share_percent_w_w = fields.Float(required=True, metadata={"description": f"The ionic members' total share ({SHARE})."})
    surfactants = fields.List(Nested(BlendShareSchema), required=True)
    constraints = fields.List(Nested(BlendConstraintSchema), required=True, metadata={"description": "The caller's constraints, and whether each is active."})
    total_mass_g = NullableNumber(required=True)
    total_volume_ml = NullableNumber(required=True)


class BlendMemberInputSchema(Schema):
    ingredient = NullableString(required=True)
    name = fields.String(required=True)
    origin = fields.String(required=True)
    fixed_percent_w_w = NullableNumber(required=True)
    min_percent_w_w = NullableNumber(required=True)
    max_percent_w_w = NullableNumber(required=True)


class BlendRatioInputSchema(Schema):
    a = fields.Integer(required=True)
    b = fields.Integer(required=True)
    a_parts = fields.Float(required=True)
    b_parts = fields.Float(required=True)


class BlendSolveInputsSchema(Schema):
    target_hlb = fields.Float(required=True)
    objective = enum_field("BlendObjective", required=True)
    surfactants = fields.List(Nested(BlendMemberInputSchema), required=True)
    ratios = fields.List(Nested(BlendRatioInputSchema), required=True)
    total = Nested(AmountOutSchema, allow_none=True, required=True)
    emulsion_type = enum_field("EmulsionType", required=True, allow_none=True)


BlendSolveAnswerSchema = answer("BlendSolveAnswer", BlendSolveResultSchema, BlendSolveInputsSchema)

__all__ = ["BlendSolveAnswerSchema", "BlendSolveRequestSchema"]
