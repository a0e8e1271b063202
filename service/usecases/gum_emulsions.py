"""Gum (acacia) emulsions, end to end: the oil's volume (with its density
when it is given by mass), the primary emulsion by kind of oil, the dry-gum
and wet-gum methods as steps, and the rest of the water to final amount."""
from __future__ import annotations

from registry import Registry
from service.core import gum_emulsions as gum
from service.core.findings import Finding
from service.usecases import methods
from service.usecases.answers import envelope, finding_warnings
from service.usecases.provenance import ValuesUsed
from service.usecases.resolution import Faults, amount, check_references, density_value, enforce_strict, resolve

GUM_ID = "acacia"
WATER_ID = "purified-water"
OIL_KINDS = tuple(gum.PRIMARY_PARTS)


def _steps(p: gum.PrimaryEmulsion, gum_name: str, rest: str) -> dict[str, list[str]]:
    oil, water, g = f"{p.oil_ml:.4g} mL of oil", f"{p.water_ml:.4g} mL of water", f"{p.gum_g:.4g} g of {gum_name.lower()}"
    return {
        "dry_gum": [
            f"Put {g} in a dry mortar with a rough surface (wet equipment makes the gum lump).",
            f"Add {oil} and triturate lightly, only until the gum is wetted.",
            f"Add {water} at once and triturate quickly, in one direction, until the primary emulsion is thick, white and crackles.",
            rest,
        ],
        "wet_gum": [
            f"Triturate {g} with {water} in a mortar to a smooth mucilage.",
            f"Add {oil} in small portions, triturating after each until it is taken up, until all the oil is emulsified.",
            rest,
        ],
    }


def gum_emulsion(data: dict, registry: Registry, strict: bool = False) -> dict:
    check_references(data, registry)
    values_used, faults = ValuesUsed(), Faults()
    oil = resolve(data["oil"], ("oil",), registry)
    gum_item = resolve({"ingredient": GUM_ID}, ("oil",), registry)
    given = amount(data["oil_amount"])
    final = amount(data["final"]) if "final" in data else None
    needs_density = given.kind == "mass" or (final is not None and final.kind == "mass")
    density = faults.run(density_value, oil, registry)
    if density is None and needs_density and not faults.found:
        faults.add(("oil", "density"), "density_needed_for_volume",
                   f"the proportions are by volume: an oil given by mass (or a final mass) needs the density of {oil.label}; give it with 'density'")
    faults.raise_any()
    if density is not None:
        values_used.add(density[1])
    oil_ml = given.value if given.kind == "volume" else given.value / density[0]
    oil_g = given.value if given.kind == "mass" else (oil_ml * density[0] if density else None)
    primary = gum.primary_emulsion(data["oil_kind"], oil_ml)
    water_density, water_used = density_value(resolve({"ingredient": WATER_ID}, ("oil",), registry), registry)
    values_used.add(water_used)
    enforce_strict(values_used, strict)
    water_g = primary.water_ml * water_density
    rest_g = None
    if final is None:
        rest = "Add the rest of the water (and any other aqueous ingredients, in solution) in portions, with trituration."
    elif final.kind == "mass":
        rest_g = gum.rest_of_water_g(final.value, oil_g, water_g, primary.gum_g)
        rest = (f"Transfer to a tared container and add {rest_g:.4g} g of water (weighed) in portions, with mixing, to {final.value:g} g.")
    else:
        gum.check_final_volume(final.value, oil_ml, primary.water_ml)
        rest = f"Transfer to a calibrated vessel, rinse the mortar with water, and make up to {final.value:g} mL with water (q.s.); mix well."
    findings = [Finding("gum_proportions_common_practice", "the primary-emulsion proportions are common practice, recalled from "
                        "standard pharmaceutics texts and not read in one: check them against your own", gum.PARTS_SOURCE)]
    oil_parts, water_parts, gum_parts = primary.parts
    result = {
        "oil": {"ingredient": oil.ingredient_id, "name": oil.name, "kind": primary.oil_kind, "volume_ml": oil_ml, "mass_g": oil_g,
                "density_g_per_ml": density[0] if density else None},
        "gum": {"ingredient": gum_item.ingredient_id, "name": gum_item.name},
        "proportions": {"oil_parts": oil_parts, "water_parts": water_parts, "gum_parts": gum_parts,
                        "basis": "oil and water in parts by volume, gum in parts by weight", "source": gum.PARTS_SOURCE,
                        "status": "unverified", "recalled_from_memory": True},
        "primary_emulsion": {"oil_ml": oil_ml, "water_ml": primary.water_ml, "water_g": water_g, "gum_g": primary.gum_g},
        "rest_of_water": {"final": ({"value": final.value, "unit": "g" if final.kind == "mass" else "mL"} if final else None),
                          "mass_g": rest_g, "quantum_satis": final is not None and final.kind == "volume"},
        "steps": _steps(primary, gum_item.name, rest),
    }
    return envelope(result, {"request": data}, methods.GUM_EMULSION, values_used, finding_warnings(findings), registry,
                    strict=strict)


__all__ = ["OIL_KINDS", "gum_emulsion"]
