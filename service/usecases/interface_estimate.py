"""The emulsifier an emulsion needs, estimated from its interface (area per
molecule, molar mass and CMC of each surfactant: the registry's or the
request's) beside the practice formula's minimum (service.core.emulsifier,
reused as it stands), each with its assumptions."""
from __future__ import annotations

from registry import Registry, ValueRecord
from service.core import emulsifier as practice
from service.core import interface
from service.usecases import methods
from service.usecases.answers import UNPUBLISHED_METHOD, envelope, finding_warnings
from service.usecases.provenance import ValuesUsed
from service.core.errors import CalculationError
from service.usecases.resolution import (Faults, Resolved, _caller_value, _registry_value, amount, check_references, checked_density,
                                         density_value, enforce_strict, invalid, resolve, usual_emulsifier_high_percent)

# Each figure of a member, as values_used names it, with its unit.
MEMBER_FIGURES = (("area_per_molecule", "nm2"), ("molar_mass", "g/mol"), ("cmc", "mmol/L"))
GIVEN_KEYS = {"molar_mass": "molar_mass_g_per_mol", "cmc": "cmc_mmol_per_l"}


def _area_record(item: Resolved) -> ValueRecord | None:
    """The registry's area per molecule: one measured at an oil-water
    interface before one measured against air (the preferred of each kind)."""
    records = item.record.active("area_per_molecule") if item.record else ()
    oil_water = [r for r in records if r.basis == "oil_water"]
    if oil_water:
        return next((r for r in oil_water if r.preferred), oil_water[0])
    return item.record.preferred("area_per_molecule") if item.record else None


def _given_figure(given: dict, prop: str) -> tuple[float, str | None] | None:
    if prop == "area_per_molecule":
        area = given.get("area_per_molecule")
        return (area["nm2"], area["basis"]) if area else None
    return (given[GIVEN_KEYS[prop]], None) if GIVEN_KEYS[prop] in given else None


def _member_figure(item: Resolved, given: dict, prop: str, unit: str, registry: Registry,
                   values_used: ValuesUsed) -> tuple[float | None, str | None]:
    """(figure, basis) from the request, else the registry; (None, None) for
    an unknown CMC. An area or a molar mass is refused when neither has it."""
    from_request = _given_figure(given, prop)
    if from_request is not None:
        values_used.add(_caller_value(item, prop, from_request[0], unit))
        return from_request
    record = _area_record(item) if prop == "area_per_molecule" else (item.record.preferred(prop) if item.record else None)
    if record is None and prop == "area_per_molecule":
        raise invalid(item.path + ("area_per_molecule",), "area_per_molecule_known",
                      f"no area per molecule is known for {item.label}: give 'area_per_molecule' (nm2 and its interface)")
    if record is None and prop == "molar_mass":
        raise invalid(item.path + ("molar_mass_g_per_mol",), "molar_mass_known",
                      f"no molar mass is known for {item.label}: give 'molar_mass_g_per_mol'")
    if record is None:
        return None, None
    values_used.add(_registry_value(item, record, registry, unit))
    return record.figure, record.basis


def _member(given: dict, path: tuple, registry: Registry, values_used: ValuesUsed, faults: Faults):
    item = resolve(given, path, registry)
    figures = {prop: faults.run(_member_figure, item, given, prop, unit, registry, values_used) for prop, unit in MEMBER_FIGURES}
    return item, figures


def _mole_fractions(surfactants: list[dict], faults: Faults) -> list[float]:
    if len(surfactants) == 1:
        return [surfactants[0].get("mole_fraction", 1.0)]
    missing = [i for i, s in enumerate(surfactants) if "mole_fraction" not in s]
    for i in missing:
        faults.add(("surfactants", i, "mole_fraction"), "mole_fractions_given", "a blend of surfactants needs each member's mole fraction")
    fractions = [s.get("mole_fraction", 0.0) for s in surfactants]
    if not missing and abs(sum(fractions) - 1.0) > interface.MOLE_FRACTION_SLACK:
        faults.add(("surfactants",), "mole_fractions_add_up", f"the mole fractions add up to {sum(fractions):g}, not 1")
    return fractions


def _phase(given: dict, path: tuple, registry: Registry, values_used: ValuesUsed) -> dict:
    """A phase's volume (mL) and mass (g), either from the other with its density; None where the density is unknown."""
    item = resolve(given, path, registry)
    given_amount = amount(given["amount"])
    found = density_value(item, registry)
    density = found[0] if found else None
    if found:
        values_used.add(found[1], key=lambda v: (v.pointer, v.property))
    if given_amount.kind == "volume":
        volume, mass = given_amount.value, (given_amount.value * density if density else None)
    else:
        if density is None:
            raise invalid(path + ("density",), "density_needed_for_mass", f"{item.label} is given by mass: its volume needs a density "
                          "(give 'density', or give the amount as a volume)")
        volume, mass = given_amount.value / density, given_amount.value
    return {"item": item, "volume_ml": volume, "mass_g": mass, "density_g_per_ml": density}


def _d32(droplets: dict, faults: Faults) -> tuple[float, str] | None:
    """The Sauter diameter given, or from the distribution; None with the fault kept."""
    if "d32_um" in droplets:
        return droplets["d32_um"], "given"
    rows = droplets["distribution"]
    try:
        return interface.sauter_mean_diameter_um([r["diameter_um"] for r in rows], [r["count"] for r in rows]), "distribution"
    except CalculationError as exc:
        faults.add(exc.path, exc.rule, exc.message)
        return None


def _blend_density(members, fractions, data: dict, registry: Registry, values_used: ValuesUsed) -> float:
    """The surfactant blend's density: the request's, else from its members'
    (masses from mole fractions x molar masses, volumes taken as additive)."""
    if "surfactant_density" in data:
        return checked_density(data["surfactant_density"], ("surfactant_density",))
    masses = [x * figs["molar_mass"][0] for (_, figs), x in zip(members, fractions)]
    volume = 0.0
    for (item, _), mass in zip(members, masses):
        found = density_value(item, registry)
        if found is None:
            raise invalid(item.path + ("density",), "density_needed", f"the practice estimate needs the density of {item.label}: give it, "
                          "or give 'surfactant_density'")
        values_used.add(found[1], key=lambda v: (v.pointer, v.property))
        volume += mass / found[0]
    return sum(masses) / volume


def _practice(data, members, fractions, dispersed, continuous, registry, values_used) -> tuple[dict | None, list[dict]]:
    """The practice formula's minimum for the same emulsion, or None (with a warning) without a required HLB."""
    if "required_hlb" not in data:
        return None, [{"code": "practice_estimate_left_out", "subject": "required_hlb",
                       "message": "no required_hlb was given, so the practice formula's minimum is not computed beside the interface estimate"}]
    for name, phase in (("dispersed_phase", dispersed), ("continuous_phase", continuous)):
        if phase["density_g_per_ml"] is None:
            raise invalid((name, "density"), "density_needed", f"the practice estimate needs the {name.replace('_', ' ')}'s density "
                          "(its share by mass): give it")
    rho_s = _blend_density(members, fractions, data, registry, values_used)
    emulsion_g = dispersed["mass_g"] + continuous["mass_g"]
    q = continuous["mass_g"] / emulsion_g * 100.0
    estimate = practice.minimum_emulsifier(rho_s, dispersed["density_g_per_ml"], data["required_hlb"], q)
    too_much = practice.plausibility_finding(estimate.g_per_100g, usual_emulsifier_high_percent(registry), ("required_hlb",))
    warnings = [{"code": "unpublished_method", "subject": "practice_estimate", "message": UNPUBLISHED_METHOD},
                *finding_warnings([too_much])]
    return {"g_per_100g": estimate.g_per_100g, "g_per_100g_rounded_up": estimate.g_per_100g_rounded_up,
            "mass_g": estimate.g_per_100g * emulsion_g / 100.0, "required_hlb": data["required_hlb"],
            "surfactant_density_g_per_ml": rho_s, "dispersed_phase_density_g_per_ml": dispersed["density_g_per_ml"],
            "continuous_phase_percent": q, "assumptions": list(methods.MINIMUM_EMULSIFIER.assumptions)}, warnings


def _warnings(members) -> list[dict]:
    out = []
    against_air = [item.label for item, figs in members if figs["area_per_molecule"] and figs["area_per_molecule"][1] == "air_water"]
    if against_air:
        out.append({"code": "area_measured_at_air_water", "subject": ", ".join(against_air),
                    "message": f"the area per molecule of {', '.join(against_air)} was measured at the air-water interface and is used "
                               "here for oil-water: a molecule usually takes a different area against oil, so the estimate is approximate"})
    no_cmc = [item.label for item, figs in members if figs["cmc"] is not None and figs["cmc"][0] is None]
    if no_cmc:
        out.append({"code": "cmc_unknown", "subject": ", ".join(no_cmc),
                    "message": f"no CMC is known for {', '.join(no_cmc)}: what stays dissolved in the continuous phase is left out, "
                               "so the interface estimate counts the adsorbed monolayer only (give 'cmc_mmol_per_l' to include it)"})
    return out


def estimate(data: dict, registry: Registry, strict: bool = False) -> dict:
    check_references(data, registry)
    values_used, faults = ValuesUsed(), Faults()
    dispersed = faults.run(_phase, data["dispersed_phase"], ("dispersed_phase",), registry, values_used)
    continuous = faults.run(_phase, data["continuous_phase"], ("continuous_phase",), registry, values_used)
    members = [_member(s, ("surfactants", i), registry, values_used, faults) for i, s in enumerate(data["surfactants"])]
    fractions = _mole_fractions(data["surfactants"], faults)
    d32 = _d32(data["droplets"], faults)
    faults.raise_any()
    d32_um, d32_from = d32
    core_members = [interface.Member(figs["area_per_molecule"][0], figs["molar_mass"][0], x, figs["cmc"][0])
                    for (_, figs), x in zip(members, fractions)]
    est = interface.interface_estimate(dispersed["volume_ml"], d32_um, core_members, continuous["volume_ml"])
    practice_out, practice_warnings = _practice(data, members, fractions, dispersed, continuous, registry, values_used)
    enforce_strict(values_used, strict)
    known = dispersed["mass_g"] is not None and continuous["mass_g"] is not None
    emulsion_g = dispersed["mass_g"] + continuous["mass_g"] if known else None
    result = {
        "interface_estimate": {
            "sauter_diameter_um": d32_um, "sauter_diameter_from": d32_from, "dispersed_phase_volume_ml": dispersed["volume_ml"],
            "continuous_phase_volume_ml": continuous["volume_ml"], "interfacial_area_m2": est.area_m2,
            "mean_area_per_molecule_nm2": est.mean_area_nm2, "molecules": est.molecules, "mol": est.mol,
            "mean_molar_mass_g_per_mol": est.mean_molar_mass_g_per_mol, "adsorbed_g": est.adsorbed_g,
            "cmc_mmol_per_l": est.cmc_mmol_per_l, "dissolved_g": est.dissolved_g, "total_g": est.total_g,
            "g_per_100g": est.total_g / emulsion_g * 100.0 if emulsion_g else None,
            "members": [{"ingredient": item.ingredient_id, "name": item.name, "mole_fraction": x,
                         "area_per_molecule_nm2": figs["area_per_molecule"][0], "area_basis": figs["area_per_molecule"][1],
                         "molar_mass_g_per_mol": figs["molar_mass"][0], "cmc_mmol_per_l": figs["cmc"][0],
                         "adsorbed_g": est.adsorbed_g_by_member[i],
                         "dissolved_g": est.dissolved_g_by_member[i] if est.dissolved_g_by_member else None}
                        for i, ((item, figs), x) in enumerate(zip(members, fractions))],
            "assumptions": list(methods.INTERFACE_ASSUMPTIONS),
        },
        "practice_estimate": practice_out,
        "emulsion_mass_g": emulsion_g,
        "basis": "grams for the emulsion described (dispersed plus continuous phase, emulsifier left out); g_per_100g per 100 g of it",
        "practice_to_interface_ratio": practice_out["mass_g"] / est.total_g if practice_out else None,
    }
    inputs = {"request": data, "avogadro_per_mol": interface.AVOGADRO_PER_MOL}
    warnings = _warnings(members) + practice_warnings
    return envelope(result, inputs, methods.INTERFACE_EMULSIFIER, values_used, warnings, registry, strict=strict)
