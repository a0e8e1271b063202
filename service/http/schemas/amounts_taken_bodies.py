"""Request and answer of the amounts actually taken for a worksheet's batch."""
from __future__ import annotations

from marshmallow import fields

from service.http.schemas.base_schema import Schema
from service.http.schemas.common import AbsoluteAmountSchema, MassSchema
from service.http.schemas.fields import BoundedList, Integer, Nested, Number, ingredient_id
from service.http.schemas.responses import AmountOutSchema, answer
from service.http.schemas.worksheet_bodies import MAX_INGREDIENTS, CheckSchema, GlobalCheckSchema, WorksheetRequestSchema

# A worksheet's rows: its ingredients, and the emulsifier rows it adds (a
# pair and up to ten fixed surfactants).
MAX_ROWS = MAX_INGREDIENTS + 12


class TakenSchema(Schema):
    row = Integer(required=True, minimum=0, maximum=MAX_ROWS - 1,
                  metadata={"description": "Index into the worksheet answer's result.rows."})
    ingredient = ingredient_id(metadata={"description": "The row's registry id, to guard against a list in the wrong order: another id is refused."})
    amount = Nested(AbsoluteAmountSchema, required=True, metadata={
        "description": "The amount taken: a mass, or a volume for a row measured by volume. The other measure is converted with the row's "
                       "density where the worksheet knows one, and refused where it does not (a solid's volume always)."})


class AmountsTakenRequestSchema(Schema):
    worksheet = Nested(WorksheetRequestSchema, required=True, metadata={
        "description": "The worksheet request (as sent, or as echoed in a worksheet answer's inputs); the worksheet is recomputed from it."})
    taken = BoundedList(Nested(TakenSchema), required=True, min_items=1, max_items=MAX_ROWS,
                        metadata={"description": "The amounts actually weighed or measured, each row at most once."})
    final_weight = Nested(MassSchema, metadata={"description": "The finished preparation, weighed."})
    final_weight_tolerance_percent = Number(minimum=0.1, maximum=50, metadata={
        "description": "How far the final weight may be from the batch mass, %. Default: the balance's acceptable error."})


# Answers
class TakenRowSchema(Schema):
    row = fields.Integer(required=True)
    ingredient = fields.String(required=True, allow_none=True)
    name = fields.String(required=True)
    role = fields.String(required=True)
    how = fields.String(required=True, metadata={"description": "How the worksheet measures the row: weigh, graduate, or pipette_or_syringe."})
    unit = fields.String(required=True, metadata={"description": "g for a weighed row, mL for one measured by volume: the unit of target, taken and deviation."})
    target_unrounded = fields.Float(required=True, metadata={"description": "The worksheet's unrounded amount; the deviation is taken against it."})
    target_displayed = fields.Float(required=True, metadata={"description": "The amount as the worksheet shows it, rounded to the balance or graduate."})
    taken = fields.Float(required=True, metadata={"description": "The amount taken, in `unit` (converted with the row's density where given in the other measure)."})
    taken_as_given = Nested(AmountOutSchema, required=True)
    taken_mass_g = fields.Float(required=True)
    converted_with_density_g_per_ml = fields.Float(required=True, allow_none=True, metadata={"description": "The density a conversion used; null when none was needed."})
    deviation = fields.Float(required=True, metadata={"description": "taken - target_unrounded, in `unit`."})
    deviation_percent = fields.Float(required=True, metadata={"description": "deviation / target_unrounded x 100."})
    allowed_percent = fields.Float(required=True)
    checks = fields.List(Nested(CheckSchema), required=True)


class NotTakenSchema(Schema):
    row = fields.Integer(required=True)
    ingredient = fields.String(required=True, allow_none=True)
    name = fields.String(required=True)


class TakenTotalsSchema(Schema):
    batch_mass_g = fields.Float(required=True, metadata={"description": "The worksheet's batch mass, the target."})
    taken_mass_g = fields.Float(required=True, metadata={"description": "The sum of the masses taken, volumes converted."})
    final_weight_g = fields.Float(required=True, allow_none=True)
    yield_percent = fields.Float(required=True, allow_none=True, metadata={"description": "final weight / batch mass x 100."})
    final_weight_deviation_g = fields.Float(required=True, allow_none=True)
    final_weight_deviation_percent = fields.Float(required=True, allow_none=True)
    tolerance_percent = fields.Float(required=True)
    tolerance_from = fields.String(required=True)


class AmountsTakenResultSchema(Schema):
    rows = fields.List(Nested(TakenRowSchema), required=True, metadata={"description": "The rows taken, in the worksheet's order."})
    not_taken = fields.List(Nested(NotTakenSchema), required=True)
    totals = Nested(TakenTotalsSchema, required=True)
    checks = fields.List(Nested(GlobalCheckSchema), required=True)
    worksheet_checks_failed = fields.Integer(required=True, metadata={"description": "Failed checks of the worksheet itself (warned about, not repeated)."})
    may_pass_to_checker = fields.Boolean(required=True, metadata={"description": "true when every check here passed."})
    reasons = fields.List(fields.String(), required=True, metadata={"description": "Every failed check, in words; empty when the record may pass."})


class AmountsTakenInputsSchema(Schema):
    request = fields.Dict(required=True, metadata={"description": "The request as loaded."})


AmountsTakenAnswerSchema = answer("AmountsTakenAnswer", AmountsTakenResultSchema, AmountsTakenInputsSchema)
