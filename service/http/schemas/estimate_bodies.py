"""Requests and answers of the HLB estimates and the required-HLB test
series."""
from __future__ import annotations

from marshmallow import Schema, ValidationError, fields, validate, validates_schema

from service.http.schemas.responses import RangeSchema, RegistryVersionSchema, answer
from service.http.schemas.calculation_requests import OilComponentSchema
from service.http.schemas.common import EMULSION_TYPES, IngredientRefSchema, MassSchema
from service.http.schemas.fields import ID_PATTERN, Boolean, BoundedList, FullMatch, Number, one_of, text
from service.http.schemas.worksheet_bodies import CheckSchema, EquipmentOutSchema, EquipmentSchema, MeasureSchema
from service.usecases.hlb_series import DEFAULT_AQUEOUS_VEHICLE

METHODS = ("griffin_mass_fraction", "griffin_saponification", "griffin_oxyethylene", "davies")
FORMULA_PATTERN = r"^[A-Z(][A-Za-z0-9()]{0,199}$"
NEEDS = {
    "griffin_mass_fraction": ("hydrophile", "molecule"),
    "griffin_saponification": ("saponification_number", "acid_number"),
    "griffin_oxyethylene": ("oxyethylene_percent",),
    "davies": ("groups",),
}
ALLOWED = {
    "griffin_mass_fraction": {"hydrophile", "molecule"},
    "griffin_saponification": {"saponification_number", "acid_number"},
    "griffin_oxyethylene": {"oxyethylene_percent", "polyol_percent"},
    "davies": {"groups"},
}
METHOD_FIELDS = set().union(*ALLOWED.values())


class MolarPartSchema(Schema):
    """A molecule or its hydrophilic part: a molecular formula, or a molar mass."""

    formula = fields.String(validate=FullMatch(FORMULA_PATTERN, error="Must be a molecular formula such as C16H33(OCH2CH2)20OH."))
    molar_mass_g_per_mol = Number(exclusive_minimum=0, maximum=1000000)

    @validates_schema
    def _one(self, data, **kwargs):
        if ("formula" in data) == ("molar_mass_g_per_mol" in data):
            raise ValidationError("Give exactly one of 'formula' or 'molar_mass_g_per_mol'.", field_name="formula")


class GroupCountSchema(Schema):
    group = fields.String(required=True, validate=[validate.Length(min=1, max=80), FullMatch(ID_PATTERN, error="Must be a Davies group id; GET /v1/davies-groups lists them.")])
    count = Number(required=True, exclusive_minimum=0, maximum=1000, metadata={"description": "How many of the group (an average may be fractional)."})


class HlbEstimateRequestSchema(Schema):
    method = one_of(METHODS, required=True)
    name = text(metadata={"description": "What the surfactant is, for the record."})
    ionic_class = one_of(("nonionic", "anionic", "cationic", "amphoteric"), metadata={"description": "Default nonionic. Griffin's formulas refuse any other."})
    has_oxypropylene = Boolean(metadata={"description": "Contains propylene oxide units (outside Griffin's scope)."})
    contains_nitrogen = Boolean(metadata={"description": "Outside Griffin's scope; found from a formula when one is given."})
    contains_sulfur = Boolean(metadata={"description": "Outside Griffin's scope; found from a formula when one is given."})
    hydrophile = fields.Nested(MolarPartSchema)
    molecule = fields.Nested(MolarPartSchema)
    saponification_number = Number(exclusive_minimum=0, maximum=2000, metadata={"description": "mg KOH per g of the ester."})
    acid_number = Number(exclusive_minimum=0, maximum=2000, metadata={"description": "mg KOH per g of the fatty acid."})
    oxyethylene_percent = Number(exclusive_minimum=0, maximum=100, metadata={"description": "E, weight % oxyethylene."})
    polyol_percent = Number(minimum=0, maximum=100, metadata={"description": "P, weight % polyol (sorbitol, glycerol...)."})
    groups = BoundedList(fields.Nested(GroupCountSchema), min_items=1, max_items=30)

    @validates_schema
    def _method_fields(self, data, **kwargs):
        method = data["method"] if "method" in data else None
        if method is None:
            return
        for name in NEEDS[method]:
            if name not in data:
                raise ValidationError(f"Required by method {method}.", field_name=name)
        for name in METHOD_FIELDS - ALLOWED[method]:
            if name in data:
                raise ValidationError(f"Not used by method {method}.", field_name=name)


class ContributionSchema(Schema):
    group = fields.String(required=True)
    formula = fields.String(required=True)
    number = fields.Float(required=True)
    count = fields.Float(required=True)
    contribution = fields.Float(required=True)


class MolarMassesSchema(Schema):
    hydrophile_g_per_mol = fields.Float(required=True)
    molecule_g_per_mol = fields.Float(required=True)
    computed_from_formulas = fields.Boolean(required=True)


class HlbEstimateResultSchema(Schema):
    method = fields.String(required=True)
    hlb = fields.Float(required=True, metadata={"description": "Rounded to 0.1."})
    hlb_unrounded = fields.Float(required=True)
    scope = fields.String(required=True)
    weaknesses = fields.List(fields.String(), required=True)
    contributions = fields.List(fields.Nested(ContributionSchema), required=True, allow_none=True)
    molar_masses = fields.Nested(MolarMassesSchema, required=True, allow_none=True)


class EchoSchema(Schema):
    request = fields.Dict(required=True)


HlbBoundsSchema = Schema.from_dict({"low": Number(required=True, minimum=0, maximum=60),
                                    "high": Number(required=True, minimum=0, maximum=60)}, name="HlbBounds")


class SeriesPlanRequestSchema(Schema):
    emulsion_type = one_of(EMULSION_TYPES, required=True)
    pair = BoundedList(fields.Nested(IngredientRefSchema), required=True, exact_items=2)
    hlb_range = fields.Nested(HlbBoundsSchema, metadata={"description": "Default: all the pair reaches."})
    step_hlb = Number(minimum=0.05, maximum=20, metadata={"description": "HLB units between tests."})
    proportion_step_percent = Number(minimum=1, maximum=50, metadata={"description": "Step in the pair's proportions; default 10 (Griffin's 10 % steps)."})
    oil_phase = BoundedList(fields.Nested(OilComponentSchema), required=True, min_items=1, max_items=20,
                            metadata={"description": "The oil under test; amounts are shares of the oil phase (any basis)."})
    oil_percent = Number(required=True, exclusive_minimum=0, exclusive_maximum=100, metadata={"description": "Oil phase, % w/w of each test emulsion."})
    emulsifier_percent = Number(required=True, exclusive_minimum=0, exclusive_maximum=100, metadata={"description": "Emulsifier, % w/w of each test emulsion."})
    test_batch = fields.Nested(MassSchema, required=True, metadata={"description": "Mass of each test emulsion."})
    vehicle = fields.Nested(IngredientRefSchema, metadata={"description": f"The continuous-phase vehicle made up to the batch; default {DEFAULT_AQUEOUS_VEHICLE}."})
    equipment = fields.Nested(EquipmentSchema)
    strict = Boolean()

    @validates_schema
    def _step(self, data, **kwargs):
        if "step_hlb" in data and "proportion_step_percent" in data:
            raise ValidationError("Give 'step_hlb' or 'proportion_step_percent', not both.", field_name="step_hlb")
        if "hlb_range" in data and data["hlb_range"]["low"] > data["hlb_range"]["high"]:
            raise ValidationError("low must not exceed high.", field_name="hlb_range")


class SeriesRowSchema(Schema):
    ingredient = fields.String(required=True, allow_none=True)
    name = fields.String(required=True)
    role = fields.String(required=True)
    percent_w_w = fields.Float(required=True)
    mass_g_unrounded = fields.Float(required=True)
    mass_g = fields.Float(required=True)
    rounding_error_percent = fields.Float(required=True)
    measure = fields.Nested(MeasureSchema, required=True)
    checks = fields.List(fields.Nested(CheckSchema), required=True)


class SeriesTestSchema(Schema):
    test = fields.Integer(required=True)
    hlb = fields.Float(required=True)
    percent_high_in_blend = fields.Float(required=True)
    rows = fields.List(fields.Nested(SeriesRowSchema), required=True)
    all_measurable = fields.Boolean(required=True)


class SeriesPlanResultSchema(Schema):
    pair = fields.List(fields.String(), required=True)
    pair_hlb = fields.Nested(RangeSchema, required=True)
    tests = fields.List(fields.Nested(SeriesTestSchema), required=True)
    test_batch_mass_g = fields.Float(required=True)
    equipment = fields.Nested(EquipmentOutSchema, required=True)


class ObservationSchema(Schema):
    hlb = Number(required=True, minimum=0, maximum=60)
    score = Number(minimum=-1000, maximum=1000, metadata={"description": "A stability score (by default higher is better)."})
    passed = Boolean(metadata={"description": "Whether the emulsion passed (no separation in the test period)."})
    mean_droplet_um = Number(exclusive_minimum=0, maximum=100000, metadata={"description": "Measured mean droplet size, µm (smaller is better)."})


class SeriesEvaluateRequestSchema(Schema):
    strict = Boolean()
    tests = BoundedList(fields.Nested(ObservationSchema), required=True, min_items=2, max_items=41)
    higher_score_is_better = Boolean(metadata={"description": "Default true."})
    pair_hlb_range = fields.Nested(HlbBoundsSchema, metadata={"description": "What the pair reaches, to keep the next series within it."})
    pair = BoundedList(fields.Nested(IngredientRefSchema), exact_items=2,
                       metadata={"description": "The series' surfactant pair: the next series is then also given as the pair's proportions, within its reach."})

    @validates_schema
    def _same_observations(self, data, **kwargs):
        tests = data.get("tests", [])
        for key in ("score", "passed", "mean_droplet_um"):
            present = [key in t for t in tests]
            if any(present) and not all(present):
                raise ValidationError(f"Give '{key}' for every test or for none.", field_name="tests")
        if tests and not any(k in tests[0] for k in ("score", "passed", "mean_droplet_um")):
            raise ValidationError("Each test needs an observation: score, passed, or mean_droplet_um.", field_name="tests")
        hlbs = [t["hlb"] for t in tests]
        if len(set(hlbs)) != len(hlbs):
            raise ValidationError("Each test must have its own HLB.", field_name="tests")
        if "pair" in data and "pair_hlb_range" in data:
            raise ValidationError("Give 'pair' or 'pair_hlb_range', not both: the pair sets its own reach.", field_name="pair_hlb_range")


class SeriesEvaluateResultSchema(Schema):
    required_hlb = fields.Float(required=True, metadata={"description": "The estimate, rounded to 0.1."})
    required_hlb_unrounded = fields.Float(required=True)
    best_test_hlb = fields.Float(required=True)
    basis = fields.String(required=True, metadata={"description": "score, droplet_size or pass_fail."})
    refined = fields.Boolean(required=True)
    bracketed = fields.Boolean(required=True)
    uncertainty_hlb = fields.Float(required=True, metadata={"description": "About how far the true value may lie from the estimate, from the test spacing."})
    note = fields.String(required=True)
    next_series_hlb = fields.List(fields.Float(), required=True)
    next_series_percent_high_in_blend = fields.List(fields.Float(), required=True, allow_none=True,
                                                    metadata={"description": "With a pair: the higher-HLB member's share of the blend at each next test."})


class DaviesGroupValueSchema(Schema):
    number = fields.Float(required=True)
    source = fields.String(required=True)
    status = fields.String(required=True)
    recalled_from_memory = fields.Boolean(required=True)
    preferred = fields.Boolean(required=True)
    note = fields.String(required=True, allow_none=True)


class DaviesGroupSchema(Schema):
    id = fields.String(required=True)
    formula = fields.String(required=True)
    kind = fields.String(required=True)
    number = fields.Float(required=True)
    values = fields.List(fields.Nested(DaviesGroupValueSchema), required=True)


class DaviesGroupListSchema(Schema):
    count = fields.Integer(required=True)
    groups = fields.List(fields.Nested(DaviesGroupSchema), required=True)
    registry = fields.Nested(RegistryVersionSchema, required=True)


HlbEstimateAnswerSchema = answer("HlbEstimateAnswer", HlbEstimateResultSchema, EchoSchema)
SeriesPlanAnswerSchema = answer("SeriesPlanAnswer", SeriesPlanResultSchema, EchoSchema)
SeriesEvaluateAnswerSchema = answer("SeriesEvaluateAnswer", SeriesEvaluateResultSchema, EchoSchema)
