"""The registry as the read-only endpoints show it."""
from __future__ import annotations

from registry import Ingredient, Registry, ValueRecord
from registry.lookup import search
from registry.model import PROPERTIES, UNITS
from service.usecases.answers import registry_version
from service.usecases.provenance import source_block


def _figure(ing: Ingredient, prop: str) -> float | None:
    record = ing.preferred(prop)
    return record.figure if record else None


def summary(ing: Ingredient) -> dict:
    return {
        "id": ing.id, "name": ing.name, "roles": list(ing.roles), "ionic_class": ing.ionic_class,
        "physical_state": ing.physical_state, "functions": list(ing.functions), "fatty_chain": ing.fatty_chain, "hlb": _figure(ing, "hlb"),
        "required_hlb_ow": _figure(ing, "required_hlb_ow"), "required_hlb_wo": _figure(ing, "required_hlb_wo"),
        "density_g_per_ml": _figure(ing, "density"), "molar_mass_g_per_mol": _figure(ing, "molar_mass"),
        "all_values_verified": all(r.is_verified for prop in ing.values for r in ing.active(prop)),
        "local": ing.uses_local_values,
    }


def _record(registry: Registry, r: ValueRecord) -> dict:
    source = registry.sources[r.source_id]
    return {
        "figure": r.figure, "low": r.low, "high": r.high, "unit": UNITS.get(r.property),
        # Floats as the published schema has them: a data file may write 25 for 25.0.
        "recorded": {k: float(v) for k, v in r.recorded.items()}, "recorded_unit": r.unit, "basis": r.basis,
        "temperature_c": None if r.temperature_c is None else float(r.temperature_c),
        "conditions": r.conditions, "source": source_block(source),
        "locator": r.locator, "kind": r.kind, "method": r.method, "status": r.status,
        "reviewed_by": r.reviewed_by, "reviewed_on": r.reviewed_on, "recalled_from_memory": r.recalled_from_memory,
        "preferred": r.preferred, "preferred_reason": r.preferred_reason, "midpoint_of_range": r.midpoint_of_range,
        "doubtful": r.doubtful, "doubtful_reason": r.doubtful_reason,
        "note": r.note, "retired": r.retired, "retired_on": r.retired_on, "retired_reason": r.retired_reason, "local": r.local,
    }


def ingredient_list(registry: Registry, query: dict) -> dict:
    """Current ingredients that pass every filter given, sorted by name."""
    chosen = []
    found = search(registry, query.get("q", ""))
    for ing in found:
        if "role" in query and query["role"] not in ing.roles:
            continue
        if "ionic_class" in query and query["ionic_class"] != ing.ionic_class:
            continue
        if "function" in query and query["function"] not in ing.functions:
            continue
        if "hlb_min" in query or "hlb_max" in query:
            hlb = _figure(ing, "hlb")
            if hlb is None or hlb < query.get("hlb_min", hlb) or hlb > query.get("hlb_max", hlb):
                continue
        chosen.append(summary(ing))
    return {"count": len(chosen), "ingredients": chosen, "registry": registry_version(registry)}


def _functions(registry: Registry, ing: Ingredient) -> dict | None:
    f = ing.functions_record
    if f is None:
        return None
    source = registry.sources[f.source_id]
    return {"list": list(f.functions), "source": source_block(source),
            "locator": f.locator, "status": f.status, "recalled_from_memory": f.recalled_from_memory,
            "reviewed_by": f.reviewed_by, "reviewed_on": f.reviewed_on, "note": f.note}


def ingredient_detail(registry: Registry, ingredient_id: str) -> dict | None:
    ing = registry.get(ingredient_id)
    if ing is None:
        return None
    detail = summary(ing) | {
        "functions_provenance": _functions(registry, ing),
        "synonyms": list(ing.synonyms), "molecular_formula": ing.molecular_formula, "hlb_is_apparent": ing.hlb_is_apparent,
        "note": ing.note, "retired": ing.retired, "retired_on": ing.retired_on, "retired_reason": ing.retired_reason,
        "values": {prop: [_record(registry, r) for r in ing.values.get(prop, ())] for prop in PROPERTIES},
    }
    return {"ingredient": detail, "registry": registry_version(registry)}


def source_list(registry: Registry) -> dict:
    sources = [source_block(s) | {"year": s.year, "note": s.note, "local": s.local}
               for s in registry.sources.values()]
    return {"count": len(sources), "sources": sources, "registry": registry_version(registry)}
