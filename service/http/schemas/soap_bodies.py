"""Requests and answers of the soaps made in place and the gum emulsions."""
from __future__ import annotations

from marshmallow import fields

from service.http.schemas.base_schema import Schema
from service.http.schemas.common import AbsoluteAmountSchema, BatchSizeSchema, IngredientRefSchema, MassSchema
from service.http.schemas.fields import Boolean, Nested, Number, ingredient_id, one_of, text
from service.http.schemas.responses import AmountOutSchema, answer
from service.http.schemas.rules import RuleChecks, at_least_one, at_most_one, exactly_one
from service.usecases.gum_emulsions import OIL_KINDS
from service.usecases.soaps import ALKALI_IDS, MATERIAL_KINDS

NullableNumber = lambda **kw: fields.Float(allow_none=True, **kw)  # noqa: E731


class SoapRequestSchema(RuleChecks):
    ingredient = ingredient_id(metadata={"description": "Registry id of the fatty acid or wax, e.g. `stearic-acid`, `white-wax`."})
    name = text(metadata={"description": "What the acid is, when it is not a registry ingredient."})
    acid_value = Number(minimum=0.1, maximum=700, metadata={"description": "mg KOH per g, 0.1 to 700; overrides the registry's (e.g. the lot's certificate). Required without `ingredient`."})
    material_kind = one_of(MATERIAL_KINDS, metadata={"description": "`fatty_acid`: the whole material is acid; `material_with_free_acids`: a wax or fat whose free acids are a part. "
                                                     "Default: from the registry (a record with a molecular formula is a fatty acid), else fatty_acid."})
    free_acid_molar_mass_g_per_mol = Number(minimum=40, maximum=2000, metadata={"description": "The free acids' mean molar mass; default for a fatty acid 1000·M(KOH)/AV. Needed for a wax's soap mass."})
    acid_mass = Nested(MassSchema, required=True, metadata={"description": "Mass of the fatty acid or wax in the batch."})
    base = one_of(ALKALI_IDS, required=True, metadata={"description": "The alkali, by registry id."})
    base_assay_percent = Number(exclusive_minimum=0, maximum=100, metadata={"description": "The alkali's assay, % (default 100)."})
    neutralised_fraction = Number(exclusive_minimum=0, maximum=1, metadata={"description": "Share of the free acid to neutralise, above 0 and at most 1."})
    base_mass = Nested(MassSchema, metadata={"description": "Mass of alkali (as weighed) instead of a fraction: the fraction it neutralises is found."})
    strict = Boolean()

    RULES = (
        exactly_one("neutralised_fraction", "base_mass", "Give exactly one of 'neutralised_fraction' or 'base_mass'."),
        at_least_one("ingredient", "acid_value", message="Give 'ingredient' (a registry id) or the 'acid_value'."),
        at_most_one("ingredient", "name", "Give 'ingredient' or 'name', not both: a registry ingredient has its name."),
    )


class SoapAcidSchema(Schema):
    ingredient = fields.String(required=True, allow_none=True)
    name = fields.String(required=True)
    mass_g = fields.Float(required=True)
    material_kind = fields.String(required=True)
    acid_value_mg_koh_per_g = fields.Float(required=True)
    acid_mol = fields.Float(required=True, metadata={"description": "Moles of free acid: AV × mass / M(KOH) / 1000."})
    mass_per_mol_free_acid_g = fields.Float(required=True, metadata={"description": "1000·M(KOH)/AV: the saponification-equivalent mean."})
    free_acid_molar_mass_g_per_mol = NullableNumber(required=True, metadata={"description": "The molar mass used for the acid's masses; null for a wax without one given."})
    free_acid_molar_mass_basis = fields.String(required=True, allow_none=True)


class SoapBaseSchema(Schema):
    ingredient = fields.String(required=True)
    name = fields.String(required=True)
    molar_mass_g_per_mol = fields.Float(required=True)
    equivalents_per_mol = fields.Float(required=True, metadata={"description": "Moles of acid one mole neutralises: 2 for borax decahydrate."})
    assay_percent = fields.Float(required=True)
    mass_g = fields.Float(required=True, metadata={"description": "As weighed, at its assay."})
    pure_mass_g = fields.Float(required=True)
    mol = fields.Float(required=True)
    excess_pure_mass_g = fields.Float(required=True, metadata={"description": "Alkali beyond what the free acid takes, left unreacted."})


class SoapFormedSchema(Schema):
    name = fields.String(required=True)
    ionic_class = fields.String(required=True)
    mol = fields.Float(required=True)
    mass_g = NullableNumber(required=True)


class CoproductSchema(Schema):
    name = fields.String(required=True)
    formula = fields.String(required=True)
    mol = fields.Float(required=True)
    mass_g = fields.Float(required=True)


class SoapResultSchema(Schema):
    acid = Nested(SoapAcidSchema, required=True)
    base = Nested(SoapBaseSchema, required=True)
    neutralised_fraction = fields.Float(required=True)
    neutralised_percent = fields.Float(required=True)
    acid_neutralised_mol = fields.Float(required=True)
    acid_neutralised_g = NullableNumber(required=True)
    free_acid_mol = fields.Float(required=True)
    free_acid_g = NullableNumber(required=True)
    soap = Nested(SoapFormedSchema, required=True)
    coproducts = fields.List(Nested(CoproductSchema), required=True)
    reaction = fields.String(required=True)
    ionic_class = fields.String(required=True, metadata={"description": "anionic: the soap counts as an anionic emulsifier."})


class SoapInputsSchema(Schema):
    request = fields.Dict(required=True)
    koh_molar_mass_g_per_mol = fields.Float(required=True)


class GumEmulsionRequestSchema(RuleChecks):
    oil_kind = one_of(OIL_KINDS, required=True, metadata={"description": "fixed (4:2:1), mineral (3:2:1) or volatile (2:2:1)."})
    oil = Nested(IngredientRefSchema, required=True)
    oil_amount = Nested(AbsoluteAmountSchema, required=True, metadata={"description": "A volume, or a mass (then the oil's density is needed)."})
    final = Nested(BatchSizeSchema, metadata={"description": "The final volume (water q.s.) or mass (the rest of the water weighed)."})
    strict = Boolean()


class GumOilSchema(Schema):
    ingredient = fields.String(required=True, allow_none=True)
    name = fields.String(required=True)
    kind = fields.String(required=True)
    volume_ml = fields.Float(required=True)
    mass_g = NullableNumber(required=True)
    density_g_per_ml = NullableNumber(required=True)


class GumNameSchema(Schema):
    ingredient = fields.String(required=True)
    name = fields.String(required=True)


class GumProportionsSchema(Schema):
    oil_parts = fields.Float(required=True)
    water_parts = fields.Float(required=True)
    gum_parts = fields.Float(required=True)
    basis = fields.String(required=True)
    source = fields.String(required=True)
    status = fields.String(required=True)
    recalled_from_memory = fields.Boolean(required=True)


class PrimaryEmulsionSchema(Schema):
    oil_ml = fields.Float(required=True)
    water_ml = fields.Float(required=True)
    water_g = fields.Float(required=True)
    gum_g = fields.Float(required=True)


class RestOfWaterSchema(Schema):
    final = Nested(AmountOutSchema, required=True, allow_none=True)
    mass_g = NullableNumber(required=True, metadata={"description": "To a final mass: the water to weigh in; null otherwise."})
    quantum_satis = fields.Boolean(required=True, metadata={"description": "To a final volume: water q.s. in a calibrated vessel."})


class GumStepsSchema(Schema):
    dry_gum = fields.List(fields.String(), required=True)
    wet_gum = fields.List(fields.String(), required=True)


class GumEmulsionResultSchema(Schema):
    oil = Nested(GumOilSchema, required=True)
    gum = Nested(GumNameSchema, required=True)
    proportions = Nested(GumProportionsSchema, required=True)
    primary_emulsion = Nested(PrimaryEmulsionSchema, required=True)
    rest_of_water = Nested(RestOfWaterSchema, required=True)
    steps = Nested(GumStepsSchema, required=True)


class GumInputsSchema(Schema):
    request = fields.Dict(required=True)


SoapAnswerSchema = answer("SoapInPlaceAnswer", SoapResultSchema, SoapInputsSchema)
GumEmulsionAnswerSchema = answer("GumEmulsionAnswer", GumEmulsionResultSchema, GumInputsSchema)
