"""Requests and answers of the HLB estimates and the required-HLB test
series."""
from __future__ import annotations

from marshmallow import fields, validate

from service.http.schemas.base_schema import Schema
from service.http.schemas.responses import RangeSchema, RegistryVersionSchema, answer
from service.http.schemas.calculation_requests import OilComponentSchema
from service.http.schemas.common import EMULSION_TYPES, IngredientRefSchema, MassSchema
from service.http.schemas.fields import Boolean, BoundedList, FullMatch, ID_PATTERN, Nested, Number, one_of, text
from service.http.schemas.rules import Rule, RuleChecks, at_least_one, at_most_one, exactly_one, not_above
from service.http.schemas.worksheet_bodies import CheckSchema, EquipmentOutSchema, EquipmentSchema, MeasureSchema
from service.http.schemas.enums import enum_field
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


class MolarPartSchema(RuleChecks):
    """A molecule or its hydrophilic part: a molecular formula, or a molar mass."""

    formula = fields.String(validate=FullMatch(FORMULA_PATTERN, error="Must be a molecular formula such as C16H33(OCH2CH2)20OH."))
    molar_mass_g_per_mol = Number(exclusive_minimum=0, maximum=1000000)

    RULES = (exactly_one("formula", "molar_mass_g_per_mol"),)


class GroupCountSchema(Schema):
    group = fields.String(required=True, validate=[validate.Length(min=1, max=80), FullMatch(ID_PATTERN, error="Must be a Davies group id; GET /v1/davies-groups lists them.")])
    count = Number(required=True, exclusive_minimum=0, maximum=1000, metadata={"description": "How many of the group (an average may be fractional)."})


def _method_rules() -> tuple[Rule, ...]:
    """Per method: the fields it needs, and those it does not use."""
    rules = []
    for method in METHODS:
        unused = sorted(METHOD_FIELDS - ALLOWED[method])
        when = {"properties": {"method": {"const": method}}, "required": ["method"]}
        for name in NEEDS[method]:
            rules.append(Rule("required_by_method", name, f"Required by method {method}.",
                              lambda d, m=method, n=name: d.get("method") != m or n in d,
                              {"if": when, "then": {"required": [name]}}, fields=("method", name)))
        for name in unused:
            rules.append(Rule("not_used_by_method", name, f"Not used by method {method}.",
                              lambda d, m=method, n=name: d.get("method") != m or n not in d,
                              {"if": when, "then": {"not": {"required": [name]}}}, fields=("method", name)))
    return tuple(rules)


class HlbEstimateRequestSchema(RuleChecks):
    method = one_of(METHODS, required=True)
    name = text(metadata={"description": "What the surfactant is, for the record."})
    ionic_class = one_of(("nonionic", "anionic", "cationic", "amphoteric"), metadata={"description": "Default nonionic. Griffin's formulas refuse any other."})
    emulsion_type = enum_field("EmulsionType", request=True, metadata={"description": "When given, the estimate is checked against the HLB range usual for this type's emulsifiers."})
    has_oxypropylene = Boolean(metadata={"description": "Contains propylene oxide units (outside Griffin's scope)."})
    contains_nitrogen = Boolean(metadata={"description": "Outside Griffin's scope; found from a formula when one is given."})
    contains_sulfur = Boolean(metadata={"description": "Outside Griffin's scope; found from a formula when one is given."})
    hydrophile = Nested(MolarPartSchema)
    molecule = Nested(MolarPartSchema)
    saponification_number = Number(exclusive_minimum=0, maximum=2000, metadata={"description": "mg KOH per g of the ester."})
    acid_number = Number(exclusive_minimum=0, maximum=2000, metadata={"description": "mg KOH per g of the fatty acid."})
    oxyethylene_percent = Number(exclusive_minimum=0, maximum=100, metadata={"description": "E, weight % oxyethylene."})
    polyol_percent = Number(minimum=0, maximum=100, metadata={"description": "P, weight % polyol (sorbitol, glycerol...)."})
    groups = BoundedList(Nested(GroupCountSchema), min_items=1, max_items=30)

    RULES = _method_rules()


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
    contributions = fields.List(Nested(ContributionSchema), required=True, allow_none=True)
    molar_masses = Nested(MolarMassesSchema, required=True, allow_none=True)


class EchoSchema(Schema):
    request = fields.Dict(required=True)


class HlbBoundsSchema(RuleChecks):
    low = Number(required=True, minimum=0, maximum=60)
    high = Number(required=True, minimum=0, maximum=60)

    RULES = (not_above("low", "high", "low must not exceed high."),)


class SeriesPlanRequestSchema(RuleChecks):
    emulsion_type = enum_field("EmulsionType", request=True, required=True)
    pair = BoundedList(Nested(IngredientRefSchema), required=True, exact_items=2)
    hlb_range = Nested(HlbBoundsSchema, metadata={"description": "Default: all the pair reaches."})
    step_hlb = Number(minimum=0.05, maximum=20, metadata={"description": "HLB units between tests."})
    proportion_step_percent = Number(minimum=1, maximum=50, metadata={"description": "Step in the pair's proportions; default 10 (Griffin's 10 % steps)."})
    oil_phase = BoundedList(Nested(OilComponentSchema), required=True, min_items=1, max_items=20,
                            metadata={"description": "The oil under test; amounts are shares of the oil phase (any basis)."})
    oil_percent = Number(required=True, exclusive_minimum=0, exclusive_maximum=100, metadata={"description": "Oil phase, % w/w of each test emulsion."})
    emulsifier_percent = Number(required=True, exclusive_minimum=0, exclusive_maximum=100, metadata={"description": "Emulsifier, % w/w of each test emulsion."})
    test_batch = Nested(MassSchema, required=True, metadata={"description": "Mass of each test emulsion."})
    vehicle = Nested(IngredientRefSchema, metadata={"description": f"The continuous-phase vehicle made up to the batch; default {DEFAULT_AQUEOUS_VEHICLE}."})
    equipment = Nested(EquipmentSchema)
    strict = Boolean()

    RULES = (at_most_one("proportion_step_percent", "step_hlb", "Give 'step_hlb' or 'proportion_step_percent', not both."),)


class SeriesRowSchema(Schema):
    ingredient = fields.String(required=True, allow_none=True)
    name = fields.String(required=True)
    role = fields.String(required=True)
    percent_w_w = fields.Float(required=True)
    mass_g_unrounded = fields.Float(required=True)
    mass_g = fields.Float(required=True)
    rounding_error_percent = fields.Float(required=True)
    measure = Nested(MeasureSchema, required=True)
    checks = fields.List(Nested(CheckSchema), required=True)


class SeriesTestSchema(Schema):
    test = fields.Integer(required=True)
    hlb = fields.Float(required=True)
    percent_high_in_blend = fields.Float(required=True)
    rows = fields.List(Nested(SeriesRowSchema), required=True)
    all_measurable = fields.Boolean(required=True)


class SeriesPlanResultSchema(Schema):
    pair = fields.List(fields.String(), required=True)
    pair_hlb = Nested(RangeSchema, required=True)
    tests = fields.List(Nested(SeriesTestSchema), required=True)
    test_batch_mass_g = fields.Float(required=True)
    equipment = Nested(EquipmentOutSchema, required=True)


OBSERVATIONS = ("score", "passed", "mean_droplet_um")


def _same_in_every_test(key: str) -> Rule:
    # JSON Schema could say it (a oneOf of two `items` forms of `tests`), but
    # client generators cannot merge such a fragment with the list's own
    # type, so it is published as a relation.
    return Rule("same_observation_kind", "tests", f"Give '{key}' for every test or for none.",
                lambda d: len({key in t for t in d.get("tests", [])}) <= 1,
                relation=f"`{key}` is given for every test or for none.", fields=("tests",))


class ObservationSchema(RuleChecks):
    hlb = Number(required=True, minimum=0, maximum=60)
    score = Number(minimum=-1000, maximum=1000, metadata={"description": "A stability score (by default higher is better)."})
    passed = Boolean(metadata={"description": "Whether the emulsion passed (no separation in the test period)."})
    mean_droplet_um = Number(exclusive_minimum=0, maximum=100000, metadata={"description": "Measured mean droplet size, µm (smaller is better)."})

    RULES = (at_least_one(*OBSERVATIONS, message="Each test needs an observation: score, passed, or mean_droplet_um."),)


class SeriesEvaluateRequestSchema(RuleChecks):
    strict = Boolean()
    tests = BoundedList(Nested(ObservationSchema), required=True, min_items=2, max_items=41)
    higher_score_is_better = Boolean(metadata={"description": "Default true."})
    pair_hlb_range = Nested(HlbBoundsSchema, metadata={"description": "What the pair reaches, to keep the next series within it."})
    pair = BoundedList(Nested(IngredientRefSchema), exact_items=2,
                       metadata={"description": "The series' surfactant pair: the next series is then also given as the pair's proportions, within its reach."})
    oil = text(metadata={"description": "The oil under test, for the record and the plot's title (image/svg+xml)."})

    RULES = tuple(_same_in_every_test(k) for k in OBSERVATIONS) + (
        Rule("distinct_test_hlb", "tests", "Each test must have its own HLB.",
             lambda d: len({t["hlb"] for t in d.get("tests", [])}) == len(d.get("tests", [])),
             relation="Each test in `tests` has its own `hlb`.", fields=("tests",)),
        at_most_one("pair", "pair_hlb_range", "Give 'pair' or 'pair_hlb_range', not both: the pair sets its own reach."),
    )


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
    status = enum_field("ValueStatus", required=True)
    recalled_from_memory = fields.Boolean(required=True)
    preferred = fields.Boolean(required=True)
    note = fields.String(required=True, allow_none=True)


class DaviesGroupSchema(Schema):
    id = fields.String(required=True)
    formula = fields.String(required=True)
    kind = fields.String(required=True)
    number = fields.Float(required=True)
    values = fields.List(Nested(DaviesGroupValueSchema), required=True)


class DaviesGroupListSchema(Schema):
    count = fields.Integer(required=True)
    groups = fields.List(Nested(DaviesGroupSchema), required=True)
    registry = Nested(RegistryVersionSchema, required=True)


HlbEstimateAnswerSchema = answer("HlbEstimateAnswer", HlbEstimateResultSchema, EchoSchema)
SeriesPlanAnswerSchema = answer("SeriesPlanAnswer", SeriesPlanResultSchema, EchoSchema)
SeriesEvaluateAnswerSchema = answer("SeriesEvaluateAnswer", SeriesEvaluateResultSchema, EchoSchema)
