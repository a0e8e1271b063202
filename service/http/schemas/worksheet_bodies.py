"""Request and answer of the batch worksheet, the candidate pairs and the
rescaling of a worksheet."""
from __future__ import annotations

from marshmallow import fields, validate

from service.http.schemas.base_schema import Schema
from service.http.schemas.responses import AmountOutSchema, RangeSchema, answer
from service.http.schemas.calculation_requests import OilComponentSchema
from service.http.schemas.common import (
    EMULSION_TYPES, IONIC_CLASSES, AmountSchema, BalanceCapacitySchema, BatchSizeSchema, DensitySchema, GraduateVolumeSchema,
    IngredientRefSchema, ReadabilitySchema, SensitivitySchema, SubdivisionSchema,
)
from service.http.schemas.fields import Boolean, BoundedList, Integer, Nested, Number, one_of
from service.http.schemas.rules import Rule, RuleChecks, at_most_one, exactly_one, requires, share_or_flag
from service.units import MASS_UNITS, VOLUME_UNITS
from service.http.schemas.enums import enum_field

PHASES = ("oil", "aqueous", "other")
MAX_INGREDIENTS = 40


class FormulaIngredientSchema(IngredientRefSchema):
    phase = one_of(PHASES, required=True, metadata={"description": "oil, aqueous, or other (a preservative, an active ingredient)."})
    share = Nested(AmountSchema, metadata={"description": "% w/w of the formula, or an amount for the batch (a mass; a volume for a liquid with a known density). Not with qs."})
    qs = Boolean(metadata={"description": "true for the one vehicle made up to the batch (q.s.). A formula whose shares, emulsifier included, add up to 100 % w/w needs none: its largest share then takes the rounding residue."})
    counts_toward_rhlb = Boolean(metadata={"description": "For an oil-phase ingredient: false leaves it out of the required-HLB mean. Default true."})

    RULES = IngredientRefSchema.RULES + (share_or_flag("share", "qs"),)


class FixedEmulsifierSchema(IngredientRefSchema):
    percent_w_w = Number(required=True, exclusive_minimum=0, exclusive_maximum=100, metadata={"description": "% w/w of the formula."})


class MinimumEstimateSchema(Schema):
    margin_percent = Number(minimum=0, maximum=500, metadata={"description": "Added to the estimate, % of it. Default 25 (the estimate is a rough lower bound); the answer says when the default was used."})
    surfactant_density = Nested(DensitySchema, metadata={"description": "Density of the surfactant blend; default from the pair's densities."})
    dispersed_phase_density = Nested(DensitySchema, metadata={"description": "Default from the dispersed phase's densities."})


OFF_SCALE_DESCRIPTION = "true also considers surfactants with an HLB above 20, off Griffin's nonionic scale (the poloxamers); default false."


class ProposeSchema(Schema):
    ionic_classes = BoundedList(one_of(IONIC_CLASSES), min_items=1, max_items=4,
                                metadata={"description": "Allowed ionic classes of the pair's members. Default nonionic only."})
    include_off_scale_hlb = Boolean(metadata={"description": OFF_SCALE_DESCRIPTION})


def _req(*names: str) -> dict:
    return {"required": list(names)}


SOLVING = {"anyOf": [_req("pair"), _req("propose")]}
EMULSIFIER_RULES = (
    at_most_one("pair", "propose"),
    Rule("at_least_one_of", "pair", "Give a 'pair', 'propose', or 'fixed' surfactants.",
         lambda d: "pair" in d or "propose" in d or bool(d.get("fixed")),
         {"anyOf": [_req("pair"), _req("propose"), {"required": ["fixed"], "properties": {"fixed": {"minItems": 1}}}]},
         fields=("pair", "propose", "fixed")),
    Rule("exactly_one_of", "total_percent_w_w", "With a pair, give exactly one of 'total_percent_w_w' or 'minimum_estimate'.",
         lambda d: not ("pair" in d or "propose" in d) or (("total_percent_w_w" in d) != ("minimum_estimate" in d)),
         {"if": SOLVING, "then": {"oneOf": [_req("total_percent_w_w"), _req("minimum_estimate")]}},
         fields=("pair", "propose", "total_percent_w_w", "minimum_estimate")),
    Rule("not_without_pair", "total_percent_w_w", "Without a pair, the fixed surfactants are the whole emulsifier system.",
         lambda d: "pair" in d or "propose" in d or not any(k in d for k in ("total_percent_w_w", "minimum_estimate", "target_hlb")),
         {"if": {"not": SOLVING}, "then": {"not": {"anyOf": [_req("total_percent_w_w"), _req("minimum_estimate"), _req("target_hlb")]}}},
         fields=("pair", "propose", "total_percent_w_w", "minimum_estimate", "target_hlb")),
)


class EmulsifierSchema(RuleChecks):
    pair = BoundedList(Nested(IngredientRefSchema), exact_items=2,
                       metadata={"description": "The two surfactants whose proportions are solved for the oil phase's required HLB."})
    propose = Nested(ProposeSchema, metadata={"description": "Let the service choose the top-ranked candidate pair."})
    fixed = BoundedList(Nested(FixedEmulsifierSchema), max_items=10,
                        metadata={"description": "Surfactants at fixed % w/w of the formula (alone, or beside the pair)."})
    target_hlb = Number(minimum=0, maximum=60, metadata={"description": "Default: the oil phase's required HLB."})
    total_percent_w_w = Number(exclusive_minimum=0, exclusive_maximum=100, metadata={"description": "The whole emulsifier system, % w/w of the formula."})
    minimum_estimate = Nested(MinimumEstimateSchema, metadata={"description": "Size the emulsifier by the minimum estimate plus a margin."})

    RULES = EMULSIFIER_RULES


class GraduateSchema(Schema):
    capacity = Nested(GraduateVolumeSchema, required=True)
    subdivision = Nested(SubdivisionSchema, metadata={"description": "Its smallest graduation; default capacity / 50."})
    conical = Boolean(metadata={"description": "A conical graduate; one under 25 mL is not used. Default false (cylindrical)."})


class WorksheetBalanceSchema(Schema):
    sensitivity = Nested(SensitivitySchema, metadata={"description": "Default 6 mg (Class A prescription balance)."})
    acceptable_error_percent = Number(minimum=0.1, maximum=50, metadata={"description": "Default 5."})
    readability = Nested(ReadabilitySchema, metadata={"description": "What the balance reads to; masses are rounded to it. Default 10 mg."})
    capacity = Nested(BalanceCapacitySchema, metadata={"description": "The largest load it weighs; a heavier row, or a batch made up to weight on it, is flagged. Default 120 g (Class A prescription balance)."})


class EquipmentSchema(Schema):
    balance = Nested(WorksheetBalanceSchema)
    graduates = BoundedList(Nested(GraduateSchema), max_items=20,
                            metadata={"description": "Graduates at hand. Default cylindrical 10, 25, 50, 100, 250, 500 and 1000 mL."})


class OutputUnitsSchema(Schema):
    mass = enum_field("MassUnit", request=True, metadata={"description": "Default g."})
    volume = enum_field("VolumeUnit", request=True, metadata={"description": "Default mL."})


class WorksheetRequestSchema(Schema):
    emulsion_type = enum_field("EmulsionType", request=True, required=True)
    batch = Nested(BatchSizeSchema, required=True, metadata={"description": "Batch size, a mass or a volume."})
    ingredients = BoundedList(Nested(FormulaIngredientSchema), required=True, min_items=2, max_items=MAX_INGREDIENTS)
    emulsifier = Nested(EmulsifierSchema, required=True)
    equipment = Nested(EquipmentSchema)
    output_units = Nested(OutputUnitsSchema)
    strict = Boolean(metadata={"description": "Refuse unverified registry values."})


class RescaleRequestSchema(Schema):
    worksheet = Nested(WorksheetRequestSchema, required=True, metadata={"description": "The worksheet request to rescale (as sent, or as echoed in an answer's inputs)."})
    batch = Nested(BatchSizeSchema, required=True, metadata={"description": "The new batch size."})


class CandidateRequestSchema(RuleChecks):
    target_hlb = Number(minimum=0, maximum=60)
    emulsion_type = enum_field("EmulsionType", request=True)
    oil_phase = BoundedList(Nested(OilComponentSchema), min_items=1, max_items=30,
                            metadata={"description": "Instead of target_hlb: the oil phase whose required HLB is the target."})
    ionic_classes = BoundedList(one_of(IONIC_CLASSES), min_items=1, max_items=4, metadata={"description": "Default nonionic only."})
    limit = Integer(minimum=1, maximum=50, metadata={"description": "Default 10."})
    include_off_scale_hlb = Boolean(metadata={"description": OFF_SCALE_DESCRIPTION})
    strict = Boolean()

    RULES = (exactly_one("target_hlb", "oil_phase"), requires("oil_phase", "emulsion_type", "An oil phase needs its emulsion_type."))


# Answers
class CheckSchema(Schema):
    code = enum_field("CheckCode", required=True)
    ok = fields.Boolean(required=True)
    message = fields.String(required=True)


class GlobalCheckSchema(CheckSchema):
    subject = fields.String(required=True, allow_none=True)


class AliquotSchema(Schema):
    factor = fields.Integer(required=True, metadata={"description": "The multiple of the amount wanted that is weighed."})
    substance_g = fields.Float(required=True, metadata={"description": "Weigh this much of the substance (at least the minimum weighable quantity)."})
    diluent_g = fields.Float(required=True, metadata={"description": "Add this much diluent."})
    mixture_g = fields.Float(required=True)
    aliquot_g = fields.Float(required=True, metadata={"description": "Weigh this much of the mixture."})
    delivered_g = fields.Float(required=True, metadata={"description": "The substance the aliquot holds."})
    error_percent = fields.Float(required=True, metadata={"description": "delivered against wanted, %; 0 when the balance reads an exact multiple."})
    diluent_in_aliquot_g = fields.Float(required=True, metadata={"description": "Diluent that goes into the batch with the aliquot."})
    diluent = fields.String(required=True)
    steps = fields.List(fields.String(), required=True)


class MeasureSchema(Schema):
    how = fields.String(required=True, metadata={"description": "weigh, graduate, or pipette_or_syringe."})
    graduate_ml = fields.Float(required=True, allow_none=True)
    volume_ml_rounded = fields.Float(required=True, allow_none=True, metadata={"description": "Rounded to the graduate's subdivision."})
    aliquot = Nested(AliquotSchema, required=True, allow_none=True, metadata={"description": "For an amount below the minimum weighable quantity: the aliquot method worked out."})
    why = fields.String(required=True)


class WorksheetRowSchema(Schema):
    ingredient = fields.String(required=True, allow_none=True)
    name = fields.String(required=True)
    phase = fields.String(required=True)
    role = fields.String(required=True, metadata={"description": "ingredient, emulsifier, or qs."})
    physical_state = fields.String(required=True, allow_none=True)
    percent_w_w = fields.Float(required=True, metadata={"description": "The formula's % w/w; for the q.s. vehicle, the share its rounded mass takes, so that the two agree."})
    mass_g_unrounded = fields.Float(required=True, metadata={"description": "The formula's mass before rounding; every check runs on it."})
    mass_g = fields.Float(required=True, metadata={"description": "Rounded to the balance's readability; the q.s. vehicle takes the rounding residue."})
    rounding_error_percent = fields.Float(required=True, metadata={"description": "(mass_g - mass_g_unrounded) / mass_g_unrounded, %; beyond the acceptable error it is flagged."})
    mass = Nested(AmountOutSchema, required=True, metadata={"description": "The same mass in the unit asked."})
    volume_ml = fields.Float(required=True, allow_none=True)
    volume = Nested(AmountOutSchema, required=True, allow_none=True)
    measure = Nested(MeasureSchema, required=True)
    checks = fields.List(Nested(CheckSchema), required=True)


class EmulsifierOutSchema(Schema):
    surfactants = fields.List(fields.String(), required=True)
    proposed = fields.Boolean(required=True)
    target_hlb = fields.Float(required=True, allow_none=True)
    hlb_reached = fields.Float(required=True)
    hlb_range = Nested(RangeSchema, required=True)
    total_percent_w_w = fields.Float(required=True)
    basis = fields.String(required=True)
    minimum_estimate_g_per_100g = fields.Float(required=True, allow_none=True)


class OilPhaseOutSchema(Schema):
    required_hlb = fields.Float(required=True, metadata={"description": "Rounded to 0.1: the figure the pair is solved for."})
    required_hlb_unrounded = fields.Float(required=True)
    range = Nested(RangeSchema, required=True, metadata={"description": "Values flagged doubtful left out."})
    range_with_doubtful = Nested(RangeSchema, required=True, allow_none=True)
    percent_w_w = fields.Float(required=True)


class BalanceOutSchema(Schema):
    sensitivity_g = fields.Float(required=True)
    acceptable_error_percent = fields.Float(required=True)
    readability_g = fields.Float(required=True)
    capacity_g = fields.Float(required=True)
    minimum_weighable_quantity_g = fields.Float(required=True)


class GraduateOutSchema(Schema):
    capacity_ml = fields.Float(required=True)
    subdivision_ml = fields.Float(required=True)
    conical = fields.Boolean(required=True)


class EquipmentOutSchema(Schema):
    balance = Nested(BalanceOutSchema, required=True)
    graduates = fields.List(Nested(GraduateOutSchema), required=True)
    defaults_assumed = fields.List(fields.String(), required=True)


class DispersedPhaseSchema(Schema):
    fraction = fields.Float(required=True, metadata={"description": "Share of the emulsion the dispersed phase takes, 0 to 1."})
    basis = fields.String(required=True, metadata={"description": "By volume where every density is known, else by mass."})


class TotalsSchema(Schema):
    percent_w_w = fields.Float(required=True, metadata={"description": "The share of the batch the rounded masses make up."})
    mass_g = fields.Float(required=True)
    batch_mass_g = fields.Float(required=True)


class MeltingRangeUsedSchema(Schema):
    name = fields.String(required=True)
    top_c = fields.Float(required=True, metadata={"description": "The top of the melting range (every current source's), degC."})
    basis = fields.String(required=True, metadata={"description": "Source, locator and status of the melting range."})


class ProcessingTemperatureSchema(Schema):
    temperature_c = fields.Float(required=True, allow_none=True, metadata={
        "description": "The temperature the phases are heated to, degC: the usual 70, or 5 above the highest melting range's top, "
                       "rounded up to a whole 5 (common practice, no source); null when nothing needs melting (a cold process)."})
    heated = fields.Boolean(required=True)
    set_by = enum_field("HeatingSetBy", required=True)
    note = fields.String(required=True, metadata={"description": "What set it, in words, with the melting range's source."})
    melting_ranges = fields.List(Nested(MeltingRangeUsedSchema), required=True, metadata={
        "description": "The melting ranges used: every solid or semisolid of the phases that has one."})
    without_melting_range = fields.List(fields.String(), required=True, metadata={
        "description": "Solids and semisolids with no melting range on record: heat until melted."})
    unverified_left_out = fields.List(Nested(MeltingRangeUsedSchema), required=True, metadata={
        "description": "Strict mode: melting ranges on record left out as unverified (each warned about, with the temperature it would set)."})


class WorksheetResultSchema(Schema):
    emulsion_type = enum_field("EmulsionType", required=True)
    batch_mass_g = fields.Float(required=True)
    batch_volume_ml = fields.Float(required=True, allow_none=True)
    checks_failed = fields.Integer(required=True, metadata={"description": "How many checks failed, the worksheet's and every row's; the printed worksheet opens with a banner when any did."})
    oil_phase = Nested(OilPhaseOutSchema, required=True)
    dispersed_phase = Nested(DispersedPhaseSchema, required=True)
    emulsifier = Nested(EmulsifierOutSchema, required=True)
    rows = fields.List(Nested(WorksheetRowSchema), required=True)
    processing_temperature_c = fields.Float(required=True, allow_none=True, metadata={
        "description": "The phases' processing temperature, degC (null: a cold process); what set it is processing_temperature."})
    processing_temperature = Nested(ProcessingTemperatureSchema, required=True)
    totals = Nested(TotalsSchema, required=True)
    equipment = Nested(EquipmentOutSchema, required=True)
    checks = fields.List(Nested(GlobalCheckSchema), required=True)
    rescaled_from = Nested(AmountOutSchema, required=True, allow_none=True, metadata={"description": "The batch size of the worksheet this one was rescaled from."})


class WorksheetInputsSchema(Schema):
    request = fields.Dict(required=True, metadata={"description": "The request as loaded, to resend for a rescale or an audit."})


class CandidateMemberSchema(Schema):
    ingredient = fields.String(required=True)
    name = fields.String(required=True)
    hlb = fields.Float(required=True)
    ionic_class = fields.String(required=True)
    fatty_chain = fields.String(required=True, allow_none=True)
    percent_of_blend = fields.Float(required=True)


class CandidateSchema(Schema):
    rank = fields.Integer(required=True)
    low = Nested(CandidateMemberSchema, required=True)
    high = Nested(CandidateMemberSchema, required=True)
    same_fatty_chain = fields.Boolean(required=True)
    matches_oil_chain = fields.Boolean(required=True, metadata={"description": "Both members share the oil phase's fatty chain."})
    ionic_members = fields.Integer(required=True)


class SingleSurfactantSchema(CandidateMemberSchema):
    difference_hlb = fields.Float(required=True, metadata={"description": "Its HLB less the target."})


class CandidateResultSchema(Schema):
    target_hlb = fields.Float(required=True)
    rule = fields.String(required=True)
    considered = fields.Integer(required=True)
    oil_fatty_chain = fields.String(required=True, allow_none=True, metadata={"description": "The oil phase's fatty chain where the registry can tell (more than half the oil phase by mass); null otherwise."})
    candidates = fields.List(Nested(CandidateSchema), required=True)
    single_surfactants = fields.List(Nested(SingleSurfactantSchema), required=True,
                                     metadata={"description": "Emulsifying agents that meet the target on their own, within single_tolerance_hlb."})
    single_tolerance_hlb = fields.Float(required=True)


class CandidateInputsSchema(Schema):
    target_hlb = fields.Float(required=True, allow_none=True)
    emulsion_type = enum_field("EmulsionType", required=True, allow_none=True)
    ionic_classes = fields.List(fields.String(), required=True)
    limit = fields.Integer(required=True)
    include_off_scale_hlb = fields.Boolean(required=True)


WorksheetAnswerSchema = answer("WorksheetAnswer", WorksheetResultSchema, WorksheetInputsSchema)
CandidateAnswerSchema = answer("CandidateAnswer", CandidateResultSchema, CandidateInputsSchema)
