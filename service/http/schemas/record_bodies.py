"""Request and answer of the compounding record: the worksheet request with
what only the pharmacy knows (the preparation, each component's supplier,
lot and expiry, the compounding date and the people), and the record that
comes back."""
from __future__ import annotations

from marshmallow import fields

from service.http.schemas.base_schema import Schema
from service.http.schemas.fields import Boolean, BoundedList, FullMatch, Nested, Number, ingredient_id, one_of, text
from service.http.schemas.responses import AmountOutSchema, CitationSchema, answer
from service.http.schemas.amounts_taken_bodies import MAX_ROWS, AmountsTakenResultSchema, TakenSchema
from service.http.schemas.common import MassSchema
from service.http.schemas.enums import enum_field
from service.http.schemas.rules import RuleChecks, exactly_one, not_above
from service.http.schemas.worksheet_bodies import CheckSchema, WorksheetRequestSchema, WorksheetResultSchema

DOSAGE_FORMS = ("cream", "lotion", "emulsion")
ROUTES = ("topical", "oral", "rectal", "vaginal", "mucosal")
STORAGES = ("refrigerator", "controlled_room_temperature")
PAPERS = ("A4", "Letter")
DAY_PATTERN = r"^[0-9]{4}-[0-9]{2}-[0-9]{2}$"
EXPIRY_PATTERN = r"^[0-9]{4}-[0-9]{2}(-[0-9]{2})?$"


def _day(**kwargs) -> fields.String:
    return fields.String(validate=FullMatch(DAY_PATTERN, error="Must be a date, YYYY-MM-DD."), metadata={"format": "date", **kwargs.pop("metadata", {})}, **kwargs)


class PhRangeSchema(RuleChecks):
    low = Number(required=True, minimum=0, maximum=14)
    high = Number(required=True, minimum=0, maximum=14)

    RULES = (not_above("low", "high"),)


class PreparationSchema(Schema):
    name = text(160, required=True, metadata={"description": "The preparation's name as the label shows it."})
    dosage_form = one_of(DOSAGE_FORMS, required=True, metadata={"description": "cream (semisolid), lotion or emulsion (liquids: labelled 'shake well')."})
    route = one_of(ROUTES, required=True, metadata={"description": "oral takes an emulsion only."})
    container = text(160, metadata={"description": "The container closure system, e.g. 'white polypropylene jar, 100 g, screw cap'."})
    storage = one_of(STORAGES, metadata={"description": "Must be one the beyond-use category allows; default its first."})
    formula_reference = text(240, metadata={"description": "The formula's source or the master formulation record it follows."})
    internal_id = text(60, metadata={"description": "Prescription, order or lot number."})
    description = text(240, metadata={"description": "Physical description of the finished preparation (what the appearance check expects)."})
    water_activity = Number(minimum=0, maximum=1, metadata={"description": "A measured water activity; decides aqueous (at or above the registry's threshold) or not."})
    preserved = Boolean(metadata={"description": "Default: preserved when a component is marked preservative. true needs one marked."})
    ph_range = Nested(PhRangeSchema, metadata={"description": "The pH the quality check expects."})


class RecordComponentSchema(RuleChecks):
    ingredient = ingredient_id(metadata={"description": "The worksheet component, by its registry id."})
    name = text(120, metadata={"description": "An inline worksheet component, by its name."})
    supplier = text(120, metadata={"description": "Manufacturer or supplier."})
    lot = text(60)
    expiry = fields.String(validate=FullMatch(EXPIRY_PATTERN, error="Must be YYYY-MM-DD, or YYYY-MM for a month-only expiry."),
                           metadata={"description": "The lot's expiry date; YYYY-MM is read as the month's last day."})
    active = Boolean(metadata={"description": "An active ingredient: its % w/w is the label's strength."})
    preservative = Boolean(metadata={"description": "An antimicrobial preservative: makes an aqueous preparation 'preserved'."})
    volatile = Boolean(metadata={"description": "Added on cooling (also when the registry records it volatile)."})
    heat_sensitive = Boolean(metadata={"description": "Added on cooling (also when the registry records it so)."})

    RULES = (exactly_one("ingredient", "name", "Give exactly one of 'ingredient' (a registry id) or 'name' (an inline component)."),)


class CompoundingSchema(Schema):
    date = _day(required=True, metadata={"description": "The day compounding starts; the beyond-use date counts from it."})
    prepared_by = text(120, metadata={"description": "Who compounds it (initials or an id)."})
    checked_by = text(120, metadata={"description": "Who verifies it."})


class RecordRequestSchema(Schema):
    worksheet = Nested(WorksheetRequestSchema, required=True, metadata={"description": "The worksheet request, as for /v1/worksheets."})
    preparation = Nested(PreparationSchema, required=True)
    components = BoundedList(Nested(RecordComponentSchema), max_items=MAX_ROWS,
                             metadata={"description": "Supplier, lot and expiry of each worksheet component; one missing is a field to fill."})
    compounding = Nested(CompoundingSchema, required=True)
    taken = BoundedList(Nested(TakenSchema), max_items=MAX_ROWS, metadata={
        "description": "The amounts actually weighed or measured, as for /v1/worksheets/amounts-taken; checked and shown in the record."})
    final_weight = Nested(MassSchema, metadata={"description": "The finished preparation, weighed: judged in the final-weight check."})
    final_weight_tolerance_percent = Number(minimum=0.1, maximum=50, metadata={"description": "Default: the balance's acceptable error (common practice)."})
    paper = one_of(PAPERS, metadata={"description": "Page size of the PDF form; default A4."})
    strict = Boolean(metadata={"description": "Refuse unverified registry values (the beyond-use category included)."})


# The answer
class ProvenanceOutSchema(Schema):
    source = Nested(CitationSchema, required=True)
    locator = fields.String(required=True, allow_none=True)
    status = fields.String(required=True)
    recalled_from_memory = fields.Boolean(required=True)


class BudCategorySchema(ProvenanceOutSchema):
    id = fields.String(required=True)
    description = fields.String(required=True)
    days = fields.Integer(required=True)
    storage = fields.List(fields.String(), required=True)
    note = fields.String(required=True, allow_none=True)


class BudDecisionsSchema(Schema):
    water = fields.String(required=True, metadata={"description": "aqueous or nonaqueous."})
    water_basis = fields.String(required=True)
    preserved = fields.Boolean(required=True, allow_none=True)
    preserved_basis = fields.String(required=True)
    form = fields.String(required=True, allow_none=True)
    form_basis = fields.String(required=True)


class ExpiryOutSchema(Schema):
    component = fields.String(required=True)
    lot = fields.String(required=True, allow_none=True)
    date = fields.String(required=True)
    month_only = fields.Boolean(required=True)


class BudRuleSchema(ProvenanceOutSchema):
    id = fields.String(required=True)
    text = fields.String(required=True)


class BudTableRulesSchema(ProvenanceOutSchema):
    water_activity_threshold = fields.Float(required=True)
    rules = fields.List(Nested(BudRuleSchema), required=True, metadata={"description": "The rules over every category, each with its provenance."})


class BeyondUseDateSchema(Schema):
    date = fields.String(required=True, metadata={"description": "The beyond-use date, YYYY-MM-DD."})
    provisional = fields.Boolean(required=True, metadata={"description": "true while a component's expiry date is missing."})
    decided_by = fields.String(required=True, metadata={"description": "category_limit or earliest_component_expiry."})
    rule = fields.String(required=True)
    counted_from = fields.String(required=True)
    limit_date = fields.String(required=True)
    earliest_component_expiry = Nested(ExpiryOutSchema, required=True, allow_none=True)
    components_without_expiry = fields.List(fields.String(), required=True)
    category = Nested(BudCategorySchema, required=True)
    decisions = Nested(BudDecisionsSchema, required=True)
    aqueous_implication = fields.String(required=True, allow_none=True)
    storage = fields.String(required=True)
    storage_basis = fields.String(required=True)
    storage_text = fields.String(required=True)
    table_rules = Nested(BudTableRulesSchema, required=True)
    caution = fields.String(required=True)


class RecordComponentOutSchema(Schema):
    row = fields.Integer(required=True, metadata={"description": "Its row in worksheet.rows."})
    ingredient = fields.String(required=True, allow_none=True)
    name = fields.String(required=True)
    phase = fields.String(required=True)
    role = fields.String(required=True)
    percent_w_w = fields.Float(required=True)
    mass_g = fields.Float(required=True)
    mass = Nested(AmountOutSchema, required=True)
    volume = Nested(AmountOutSchema, required=True, allow_none=True)
    how = fields.String(required=True)
    supplier = fields.String(required=True, allow_none=True)
    lot = fields.String(required=True, allow_none=True)
    expiry = fields.String(required=True, allow_none=True)
    expiry_read_as = fields.String(required=True, allow_none=True, metadata={"description": "The expiry as a day (a month-only expiry is its last day)."})
    active = fields.Boolean(required=True)
    preservative = fields.Boolean(required=True)


class StepSchema(Schema):
    number = fields.Integer(required=True)
    stage = fields.String(required=True)
    text = fields.String(required=True)
    basis = fields.String(required=True, metadata={"description": "common_practice, registry_data or pharmacist_to_decide."})
    basis_note = fields.String(required=True)
    confirmed_by = fields.String(required=True, allow_none=True, metadata={"description": "Left for the pharmacist who confirms the step."})


class ProcedureSchema(Schema):
    steps = fields.List(Nested(StepSchema), required=True)
    oil_phase_c = fields.Float(required=True, allow_none=True)
    aqueous_phase_c = fields.Float(required=True, allow_none=True)
    heated = fields.Boolean(required=True)
    highest_melting = fields.String(required=True, allow_none=True)


class LabelLineSchema(Schema):
    element = fields.String(required=True)
    text = fields.String(required=True)


class AuxiliarySchema(Schema):
    text = fields.String(required=True)
    why = fields.String(required=True)


class PlaceholderSchema(Schema):
    field = fields.String(required=True)
    text = fields.String(required=True)


class LabelSchema(Schema):
    lines = fields.List(Nested(LabelLineSchema), required=True)
    auxiliary = fields.List(Nested(AuxiliarySchema), required=True)
    placeholders = fields.List(Nested(PlaceholderSchema), required=True)


class QualityCheckSchema(Schema):
    code = enum_field("QualityCheckCode", required=True)
    check = fields.String(required=True)
    expected = fields.String(required=True)
    result = fields.String(required=True, allow_none=True)
    passed = fields.Boolean(required=True, allow_none=True, metadata={"description": "null until recorded."})
    basis = fields.String(required=True)


class ElementSchema(Schema):
    element = fields.String(required=True)
    where = fields.String(required=True, metadata={"description": "JSON pointer into the answer."})
    filled = fields.Boolean(required=True)
    at_the_bench = fields.Boolean(required=True, metadata={"description": "Filled in by hand after compounding (the quality results), never by the request."})


class RequiredElementsSchema(ProvenanceOutSchema):
    master_formulation_record = fields.List(Nested(ElementSchema), required=True)
    compounding_record = fields.List(Nested(ElementSchema), required=True)
    to_fill = fields.List(fields.String(), required=True)
    to_fill_before_compounding = fields.List(fields.String(), required=True, metadata={"description": "What the request could have given and did not."})
    note = fields.String(required=True)
    locator = fields.String(allow_none=True)


class RecordPreparationOutSchema(Schema):
    name = fields.String(required=True)
    dosage_form = fields.String(required=True)
    route = fields.String(required=True)
    container = fields.String(required=True, allow_none=True)
    storage = fields.String(required=True)
    formula_reference = fields.String(required=True, allow_none=True)
    internal_id = fields.String(required=True, allow_none=True)
    description = fields.String(required=True, allow_none=True)
    strength = fields.List(fields.String(), required=True)


class CompoundingOutSchema(Schema):
    date = fields.String(required=True)
    prepared_by = fields.String(required=True, allow_none=True)
    checked_by = fields.String(required=True, allow_none=True)


class RecordCheckSchema(CheckSchema):
    pass


class RecordResultSchema(Schema):
    preparation = Nested(RecordPreparationOutSchema, required=True)
    compounding = Nested(CompoundingOutSchema, required=True)
    components = fields.List(Nested(RecordComponentOutSchema), required=True)
    beyond_use_date = Nested(BeyondUseDateSchema, required=True)
    procedure = Nested(ProcedureSchema, required=True)
    label = Nested(LabelSchema, required=True)
    quality_checks = fields.List(Nested(QualityCheckSchema), required=True)
    checks = fields.List(Nested(RecordCheckSchema), required=True)
    worksheet = Nested(WorksheetResultSchema, required=True)
    amounts_taken = Nested(AmountsTakenResultSchema, required=True, allow_none=True, metadata={"description": "The amounts taken, checked, where the request gave them."})
    paper = fields.String(required=True)
    required_elements = Nested(RequiredElementsSchema, required=True)
    complete = fields.Boolean(required=True, metadata={"description": "Ready to compound: every element the request can give is given and every record check passed; the quality results are filled in at the bench."})


class RecordInputsSchema(Schema):
    request = fields.Dict(required=True, metadata={"description": "The request as loaded, for the audit trail."})


RecordAnswerSchema = answer("CompoundingRecordAnswer", RecordResultSchema, RecordInputsSchema)
