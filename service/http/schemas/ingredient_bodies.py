"""The registry's read-only resources: ingredients, their values with
provenance, and the bibliography."""
from __future__ import annotations

from marshmallow import fields, validate

from service.http.schemas.base_schema import Schema

from registry.model import FUNCTIONS
from service.http.schemas.responses import CitationSchema, RegistryVersionSchema
from service.http.schemas.fields import QueryNumber, one_of, text
from service.http.schemas.rules import RuleChecks, not_above
from service.http.schemas.enums import enum_field

ROLES = ("surfactant", "oil_phase", "aqueous_phase", "hydrocolloid")
IONIC_CLASSES = ("nonionic", "anionic", "cationic", "amphoteric", "not_applicable")


# Longer than any name or synonym the registry holds (ids are at most 80).
MAX_SEARCH_LENGTH = 120


class IngredientQuerySchema(RuleChecks):
    q = text(MAX_SEARCH_LENGTH, metadata={
        "description": "Ingredients whose name, a synonym or the id holds this text, ignoring case (e.g. `oleate`)."})
    role = one_of(ROLES)
    ionic_class = one_of(IONIC_CLASSES)
    function = enum_field("IngredientFunction", request=True, metadata={"description": "Ingredients with this function in a formula (e.g. emulsifier)."})
    hlb_min = QueryNumber(minimum=0, maximum=60, metadata={"description": "Surfactants whose preferred HLB is at least this."})
    hlb_max = QueryNumber(minimum=0, maximum=60, metadata={"description": "Surfactants whose preferred HLB is at most this."})

    RULES = (not_above("hlb_min", "hlb_max"),)


class ValueRecordSchema(Schema):
    figure = fields.Float(required=True, metadata={"description": "The figure a calculation uses: the value, or the midpoint of a range."})
    low = fields.Float(required=True)
    high = fields.Float(required=True)
    unit = fields.String(required=True, allow_none=True, metadata={"description": "g/mL for densities, g/mol for molar masses, degC for melting ranges and cloud points, mg KOH/g for acid values, nm2 for areas per molecule, mmol/L for critical micelle concentrations; null for HLB values."})
    recorded = fields.Dict(keys=fields.String(), values=fields.Float(), required=True, metadata={"description": "The value as written in the data file (a specific gravity stays a specific gravity)."})
    recorded_unit = fields.String(required=True, allow_none=True, metadata={"description": "The unit it was written in, where it has one."})
    basis = fields.String(required=True, allow_none=True)
    temperature_c = fields.Float(required=True, allow_none=True)
    conditions = fields.String(required=True, allow_none=True)
    source = fields.Nested(CitationSchema, required=True)
    locator = fields.String(required=True, allow_none=True)
    kind = enum_field("ValueKind", required=True)
    method = fields.String(required=True, allow_none=True, metadata={"description": "For a calculated value, the method."})
    status = enum_field("ValueStatus", required=True)
    reviewed_by = fields.String(required=True, allow_none=True)
    reviewed_on = fields.String(required=True, allow_none=True)
    recalled_from_memory = fields.Boolean(required=True)
    preferred = fields.Boolean(required=True)
    preferred_reason = fields.String(required=True, allow_none=True)
    midpoint_of_range = fields.Boolean(required=True)
    doubtful = fields.Boolean(required=True, metadata={"description": "Flagged doubtful by the steward: never preferred, and left out of the ranges answers give."})
    doubtful_reason = fields.String(required=True, allow_none=True)
    note = fields.String(required=True, allow_none=True)
    retired = fields.Boolean(required=True)
    retired_on = fields.String(required=True, allow_none=True)
    retired_reason = fields.String(required=True, allow_none=True)
    local = fields.Boolean(required=True, metadata={"description": "From the pharmacy's site overlay."})


class IngredientValuesSchema(Schema):
    hlb = fields.List(fields.Nested(ValueRecordSchema), required=True)
    required_hlb_ow = fields.List(fields.Nested(ValueRecordSchema), required=True)
    required_hlb_wo = fields.List(fields.Nested(ValueRecordSchema), required=True)
    density = fields.List(fields.Nested(ValueRecordSchema), required=True)
    molar_mass = fields.List(fields.Nested(ValueRecordSchema), required=True)
    melting_range = fields.List(fields.Nested(ValueRecordSchema), required=True, metadata={
        "description": "Melting, congealing or drop-point ranges, degC (`basis` says which)."})
    acid_value = fields.List(fields.Nested(ValueRecordSchema), required=True, metadata={
        "description": "Acid values, mg KOH per g: the free acids a soap made in place can form from."})
    area_per_molecule = fields.List(fields.Nested(ValueRecordSchema), required=True, metadata={
        "description": "Areas per molecule in a saturated monolayer, nm2 (`basis`: the interface measured, oil_water or air_water)."})
    cmc = fields.List(fields.Nested(ValueRecordSchema), required=True, metadata={
        "description": "Critical micelle concentrations in water, mmol/L (`temperature_c` where the source states it)."})
    cloud_point = fields.List(fields.Nested(ValueRecordSchema), required=True, metadata={
        "description": "Cloud points of ethoxylated surfactants, degC (1 % in water unless `conditions` says otherwise)."})


class IngredientSummarySchema(Schema):
    id = fields.String(required=True)
    name = fields.String(required=True)
    roles = fields.List(fields.String(), required=True)
    ionic_class = fields.String(required=True)
    physical_state = fields.String(required=True)
    functions = fields.List(enum_field("IngredientFunction"), required=True, metadata={"description": "What it does in a formula; only an `emulsifier` is proposed as one."})
    fatty_chain = fields.String(required=True, allow_none=True)
    hlb = fields.Float(required=True, allow_none=True)
    required_hlb_ow = fields.Float(required=True, allow_none=True)
    required_hlb_wo = fields.Float(required=True, allow_none=True)
    density_g_per_ml = fields.Float(required=True, allow_none=True)
    molar_mass_g_per_mol = fields.Float(required=True, allow_none=True)
    all_values_verified = fields.Boolean(required=True)
    local = fields.Boolean(required=True, metadata={"description": "The record is, or has values, from the site overlay."})


class FunctionsProvenanceSchema(Schema):
    list = fields.List(enum_field("IngredientFunction"), required=True)
    source = fields.Nested(CitationSchema, required=True)
    locator = fields.String(required=True, allow_none=True)
    status = enum_field("ValueStatus", required=True)
    recalled_from_memory = fields.Boolean(required=True)
    reviewed_by = fields.String(required=True, allow_none=True)
    reviewed_on = fields.String(required=True, allow_none=True)
    note = fields.String(required=True, allow_none=True)


class IngredientDetailSchema(IngredientSummarySchema):
    functions_provenance = fields.Nested(FunctionsProvenanceSchema, required=True, allow_none=True, metadata={"description": "Where the functions come from."})
    synonyms = fields.List(fields.String(), required=True)
    molecular_formula = fields.String(required=True, allow_none=True)
    hlb_is_apparent = fields.Boolean(required=True)
    note = fields.String(required=True, allow_none=True)
    retired = fields.Boolean(required=True)
    retired_on = fields.String(required=True, allow_none=True)
    retired_reason = fields.String(required=True, allow_none=True)
    values = fields.Nested(IngredientValuesSchema, required=True)


class IngredientListSchema(Schema):
    count = fields.Integer(required=True)
    ingredients = fields.List(fields.Nested(IngredientSummarySchema), required=True)
    registry = fields.Nested(RegistryVersionSchema, required=True)


class IngredientAnswerSchema(Schema):
    ingredient = fields.Nested(IngredientDetailSchema, required=True)
    registry = fields.Nested(RegistryVersionSchema, required=True)


class SourceSchema(Schema):
    id = fields.String(required=True)
    citation = fields.String(required=True)
    kind = fields.String(required=True)
    year = fields.Integer(required=True, allow_none=True)
    note = fields.String(required=True, allow_none=True)
    local = fields.Boolean(required=True)


class SourceListSchema(Schema):
    count = fields.Integer(required=True)
    sources = fields.List(fields.Nested(SourceSchema), required=True)
    registry = fields.Nested(RegistryVersionSchema, required=True)
