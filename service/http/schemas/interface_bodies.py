"""Request and answer of the interface estimate of emulsifier
(POST /v1/emulsifier/interface-estimate)."""
from __future__ import annotations

from marshmallow import fields

from service.http.schemas.base_schema import Schema

from registry.model import AREA_BASES
from service.http.schemas.common import AbsoluteAmountSchema, DensitySchema, IngredientRefSchema
from service.http.schemas.fields import Boolean, BoundedList, Nested, Number, one_of
from service.http.schemas.responses import answer
from service.http.schemas.rules import RuleChecks, exactly_one

NullableNumber = lambda **kw: fields.Float(allow_none=True, **kw)  # noqa: E731
NullableString = lambda **kw: fields.String(allow_none=True, **kw)  # noqa: E731

MAX_SURFACTANTS = 10
MAX_SIZE_CLASSES = 200
# Emulsion droplets run from about 0.01 µm (nanoemulsions) to some hundreds of µm.
DIAMETER_UM = {"exclusive_minimum": 0, "maximum": 1000}


class PhaseSchema(IngredientRefSchema):
    amount = Nested(AbsoluteAmountSchema, required=True, metadata={
        "description": "A volume, or a mass (then its density is needed: the registry's, `density` or the inline one)."})


class SizeClassSchema(Schema):
    diameter_um = Number(required=True, **DIAMETER_UM, metadata={"description": "Droplet diameter, µm."})
    count = Number(required=True, minimum=0, metadata={"description": "Droplets of this diameter: a count or a number fraction."})


class DropletsSchema(RuleChecks):
    d32_um = Number(**DIAMETER_UM, metadata={"description": "The Sauter mean diameter d32, µm (target or measured)."})
    distribution = BoundedList(Nested(SizeClassSchema), min_items=1, max_items=MAX_SIZE_CLASSES, metadata={
        "description": "A number distribution: d32 = Σn·d³ / Σn·d² is computed from it."})

    RULES = (exactly_one("d32_um", "distribution", "Give exactly one of 'd32_um' or 'distribution'."),)


class AreaGivenSchema(Schema):
    nm2 = Number(required=True, exclusive_minimum=0, maximum=20, metadata={"description": "Area per molecule in a saturated monolayer, nm2."})
    basis = one_of(AREA_BASES, required=True, metadata={"description": "The interface it was measured at."})


class InterfaceSurfactantSchema(IngredientRefSchema):
    mole_fraction = Number(exclusive_minimum=0, maximum=1, metadata={"description": "Its mole fraction in the blend; needed for each member of a blend."})
    area_per_molecule = Nested(AreaGivenSchema, metadata={"description": "Overrides the registry's, with the interface it was measured at."})
    molar_mass_g_per_mol = Number(minimum=40, maximum=1e6, metadata={"description": "Overrides the registry's (a lot's certificate)."})
    cmc_mmol_per_l = Number(exclusive_minimum=0, maximum=1000, metadata={"description": "Overrides the registry's critical micelle concentration."})


class InterfaceEstimateRequestSchema(RuleChecks):
    dispersed_phase = Nested(PhaseSchema, required=True, metadata={"description": "The dispersed phase (the oil of an O/W emulsion)."})
    continuous_phase = Nested(PhaseSchema, required=True, metadata={"description": "The continuous phase (e.g. `purified-water`)."})
    droplets = Nested(DropletsSchema, required=True)
    surfactants = BoundedList(Nested(InterfaceSurfactantSchema), required=True, min_items=1, max_items=MAX_SURFACTANTS)
    required_hlb = Number(minimum=0, exclusive_maximum=20, metadata={"description": "Required HLB of the dispersed phase: the practice formula's minimum is then given beside."})
    surfactant_density = Nested(DensitySchema, metadata={"description": "The blend's density for the practice formula; default from the members' registry densities."})
    strict = Boolean(metadata={"description": "Refuse registry values not yet checked against their source (strict mode). A service running in strict mode is strict whatever this says."})


class InterfaceMemberSchema(Schema):
    ingredient = NullableString(required=True)
    name = fields.String(required=True)
    mole_fraction = fields.Float(required=True)
    area_per_molecule_nm2 = fields.Float(required=True)
    area_basis = NullableString(required=True, metadata={"description": "oil_water or air_water: where the area was measured."})
    molar_mass_g_per_mol = fields.Float(required=True)
    cmc_mmol_per_l = NullableNumber(required=True)
    adsorbed_g = fields.Float(required=True)
    dissolved_g = NullableNumber(required=True)


class InterfacePartSchema(Schema):
    sauter_diameter_um = fields.Float(required=True)
    sauter_diameter_from = fields.String(required=True, metadata={"description": "given, or distribution."})
    dispersed_phase_volume_ml = fields.Float(required=True)
    continuous_phase_volume_ml = fields.Float(required=True)
    interfacial_area_m2 = fields.Float(required=True, metadata={"description": "6·V_d/d32."})
    mean_area_per_molecule_nm2 = fields.Float(required=True)
    molecules = fields.Float(required=True)
    mol = fields.Float(required=True)
    mean_molar_mass_g_per_mol = fields.Float(required=True)
    adsorbed_g = fields.Float(required=True, metadata={"description": "One saturated monolayer on the droplets."})
    cmc_mmol_per_l = NullableNumber(required=True, metadata={"description": "The blend's (ideal mixing); null when a member's is unknown."})
    dissolved_g = NullableNumber(required=True, metadata={"description": "Dissolved in the continuous phase at the CMC; null when left out."})
    total_g = fields.Float(required=True)
    g_per_100g = NullableNumber(required=True, metadata={"description": "Per 100 g of emulsion; null when the dispersed phase's mass is unknown."})
    members = fields.List(Nested(InterfaceMemberSchema), required=True)
    assumptions = fields.List(fields.String(), required=True)


class PracticePartSchema(Schema):
    g_per_100g = fields.Float(required=True)
    g_per_100g_rounded_up = fields.Float(required=True)
    mass_g = fields.Float(required=True, metadata={"description": "For the emulsion described."})
    required_hlb = fields.Float(required=True)
    surfactant_density_g_per_ml = fields.Float(required=True)
    dispersed_phase_density_g_per_ml = fields.Float(required=True)
    continuous_phase_percent = fields.Float(required=True, metadata={"description": "By mass, emulsifier left out."})
    assumptions = fields.List(fields.String(), required=True)


class InterfaceResultSchema(Schema):
    interface_estimate = Nested(InterfacePartSchema, required=True)
    practice_estimate = Nested(PracticePartSchema, required=True, allow_none=True, metadata={
        "description": "The practice formula's minimum (POST /v1/emulsifier/minimum) for the same emulsion; null without `required_hlb`."})
    emulsion_mass_g = NullableNumber(required=True)
    basis = fields.String(required=True)
    practice_to_interface_ratio = NullableNumber(required=True)


class InterfaceInputsSchema(Schema):
    request = fields.Dict(required=True)
    avogadro_per_mol = fields.Float(required=True)


InterfaceEstimateAnswerSchema = answer("InterfaceEstimateAnswer", InterfaceResultSchema, InterfaceInputsSchema)
