"""Soaps made in place, end to end: the acid's acid value (the registry's or
the request's), the alkali's molar mass (the registry's), and the
neutralisation's stoichiometry. Molar masses of KOH and of the coproducts
come from formulas, here at the edge, with molmass."""
from __future__ import annotations

from molmass import Formula

from registry import Registry
from service.core import soaps
from service.core.findings import Finding
from service.usecases import methods
from service.usecases.answers import envelope, finding_warnings
from service.usecases.provenance import ValuesUsed
from service.usecases.resolution import (Faults, Resolved, _caller_value, _registry_value, amount, check_references, enforce_strict,
                                         invalid, resolve)

# Acid values are mg of KOH per g: 56.1056 g/mol by standard atomic weights.
KOH_G_PER_MOL = Formula("KOH").mass
WATER = soaps.Coproduct("water", "H2O", 1.0, Formula("H2O").mass)
# The alkalis the service knows the reaction of: registry id -> (equivalents
# per mole, coproducts per mole of acid, the soap's name).
REACTIONS = {
    "triethanolamine": (1.0, (), "triethanolamine soap", "RCOOH + N(CH2CH2OH)3 -> RCOO- HN+(CH2CH2OH)3"),
    "potassium-hydroxide": (1.0, (WATER,), "potassium soap", "RCOOH + KOH -> RCOOK + H2O"),
    "sodium-hydroxide": (1.0, (WATER,), "sodium soap", "RCOOH + NaOH -> RCOONa + H2O"),
    "sodium-borate": (2.0, (soaps.Coproduct("boric acid", "H3BO3", 2.0, Formula("H3BO3").mass),
                            soaps.Coproduct("water (of crystallisation, released)", "H2O", 2.5, Formula("H2O").mass)),
                      "sodium soap", "Na2B4O7.10H2O + 2 RCOOH -> 2 RCOONa + 4 H3BO3 + 5 H2O"),
}
ALKALI_IDS = tuple(REACTIONS)
MATERIAL_KINDS = ("fatty_acid", "material_with_free_acids")


def _acid_value(item: Resolved, data: dict, registry: Registry, values_used: ValuesUsed) -> float:
    if "acid_value" in data:
        values_used.add(_caller_value(item, "acid_value", data["acid_value"], "mg KOH/g"))
        return data["acid_value"]
    record = item.record.preferred("acid_value") if item.record else None
    if record is None:
        raise invalid(("ingredient",), "acid_value_known", f"no acid value is known for {item.label}: give 'acid_value' from the lot's "
                      "certificate or the monograph")
    values_used.add(_registry_value(item, record, registry, "mg KOH/g"))
    return record.figure


def _alkali(data: dict, registry: Registry, values_used: ValuesUsed) -> tuple[soaps.Alkali, Resolved, str, str]:
    base = resolve({"ingredient": data["base"]}, ("base",), registry)
    record = base.record.preferred("molar_mass")
    values_used.add(_registry_value(base, record, registry, "g/mol"))
    equivalents, coproducts, soap_name, equation = REACTIONS[base.ingredient_id]
    return soaps.Alkali(base.name, record.figure, equivalents, coproducts), base, soap_name, equation


def _material_kind(data: dict, item: Resolved) -> str:
    """Given, or from the registry: a record with a molecular formula is a
    defined acid; one without (a wax) holds free acids among other matter."""
    if "material_kind" in data:
        return data["material_kind"]
    if item.record is not None and not item.record.molecular_formula:
        return "material_with_free_acids"
    return "fatty_acid"


def in_place(data: dict, registry: Registry, strict: bool = False) -> dict:
    check_references(data, registry)
    values_used, faults = ValuesUsed(), Faults()
    ref = {"ingredient": data["ingredient"]} if "ingredient" in data else {"inline": {"name": data.get("name", "fatty acid")}}
    acid = resolve(ref, (), registry)
    av = faults.run(_acid_value, acid, data, registry, values_used)
    alkali, base, soap_name, equation = _alkali(data, registry, values_used)
    faults.raise_any()
    enforce_strict(values_used, strict)
    kind = _material_kind(data, acid)
    mass_g = amount(data["acid_mass"]).value
    n_acid = soaps.acid_mol(av, mass_g, KOH_G_PER_MOL)
    per_mole_of_acid = soaps.mean_acid_molar_mass(av, KOH_G_PER_MOL)
    acid_molar = data.get("free_acid_molar_mass_g_per_mol", per_mole_of_acid if kind == "fatty_acid" else None)
    base_mass_g = amount(data["base_mass"]).value if "base_mass" in data else None
    assay = data.get("base_assay_percent", 100.0) / 100.0
    result = soaps.neutralise(n_acid, alkali, fraction=data.get("neutralised_fraction"), alkali_weighed_g=base_mass_g,
                              assay_fraction=assay, acid_molar_mass_g_per_mol=acid_molar)
    findings: list[Finding] = [soaps.anionic_soap_finding(f"{soap_name} of {acid.name}"), *result.findings]
    if acid_molar is None:
        findings.append(Finding("soap_mass_needs_acid_molar_mass", "the material is not all free acid, so the masses of soap and of "
                                "free acid left need the free acids' mean molar mass (free_acid_molar_mass_g_per_mol); moles are given",
                                acid.label))
    if "base_assay_percent" not in data and base.ingredient_id in ("potassium-hydroxide", "sodium-hydroxide"):
        findings.append(Finding("alkali_assay_assumed", f"{base.name} was taken as 100 % pure; the pharmacopeial material is less "
                                "(it holds water and carbonate): give its assay as base_assay_percent", base.ingredient_id))
    out = {
        "acid": {"ingredient": acid.ingredient_id, "name": acid.name, "mass_g": mass_g, "material_kind": kind,
                 "acid_value_mg_koh_per_g": av, "acid_mol": n_acid, "mass_per_mol_free_acid_g": per_mole_of_acid,
                 "free_acid_molar_mass_g_per_mol": acid_molar,
                 "free_acid_molar_mass_basis": ("given" if "free_acid_molar_mass_g_per_mol" in data else
                                                "saponification-equivalent mean, 1000·M(KOH)/AV" if acid_molar is not None else None)},
        "base": {"ingredient": base.ingredient_id, "name": base.name, "molar_mass_g_per_mol": alkali.molar_mass_g_per_mol,
                 "equivalents_per_mol": alkali.equivalents_per_mol, "assay_percent": assay * 100.0,
                 "mass_g": result.alkali_weighed_g, "pure_mass_g": result.alkali_pure_g, "mol": result.alkali_mol,
                 "excess_pure_mass_g": result.excess_alkali_g},
        "neutralised_fraction": result.neutralised_fraction,
        "neutralised_percent": result.neutralised_fraction * 100.0,
        "acid_neutralised_mol": result.acid_neutralised_mol,
        "acid_neutralised_g": result.acid_neutralised_g,
        "free_acid_mol": result.free_acid_mol,
        "free_acid_g": result.free_acid_g,
        "soap": {"name": soap_name, "ionic_class": "anionic", "mol": result.acid_neutralised_mol, "mass_g": result.soap_g},
        "coproducts": [{"name": c.name, "formula": c.formula, "mol": result.acid_neutralised_mol * c.mol_per_mol_acid, "mass_g": g}
                       for c, g in result.coproducts_g],
        "reaction": equation,
        "ionic_class": "anionic",
    }
    inputs = {"request": data, "koh_molar_mass_g_per_mol": KOH_G_PER_MOL}
    return envelope(out, inputs, methods.SOAP_IN_PLACE, values_used, finding_warnings(findings), registry, strict=strict)
