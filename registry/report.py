"""The steward's report: provenance coverage and where sources disagree, as
data (the `report` command prints it, or dumps it with --json)."""
from __future__ import annotations

from collections import Counter

from registry.coverage import hlb_coverage
from registry.model import Registry


def report_data(registry: Registry, hlb_threshold: float, density_threshold: float) -> dict:
    """Counts by status and kind, what lacks a value, unverified functions,
    doubtful values, and properties whose current values span more than
    `hlb_threshold` HLB units or `density_threshold` g/mL; the processing
    records, and the shared tables (beyond-use dates, water dispersibility)
    by status."""
    records = [r for ing in registry.ingredients.values() for prop in ing.values for r in ing.active(prop)]
    records += [r for g in registry.davies_groups.values() for r in g.values if not r.retired]
    current = [ing for ing in registry.ingredients.values() if not ing.retired]
    disagreements = []
    for ing in current:
        for prop in ing.values:
            # Densities at other temperatures differ by nature, not by dispute.
            active = ing.comparable(prop)
            if len(active) < 2:
                continue
            low, high = ing.span(prop)
            limit = density_threshold if prop == "density" else hlb_threshold
            if high - low > limit:
                disagreements.append({"ingredient": ing.id, "property": prop, "low": low, "high": high,
                                      "sources": sorted({r.source_id for r in active}),
                                      "without_doubtful": ing.span_without_doubtful(prop) if ing.has_doubtful(prop) else None})
    return {
        "release": registry.release, "version": registry.version,
        "values": len(records),
        "by_status": dict(sorted(Counter(r.status for r in records).items())),
        "by_kind": dict(sorted(Counter(r.kind for r in records).items())),
        "recalled_from_memory": sum(r.recalled_from_memory for r in records),
        "lacking_density": sorted(i.id for i in current if not i.active("density")),
        "oil_phase_lacking_required_hlb_ow": sorted(i.id for i in current if "oil_phase" in i.roles and not i.active("required_hlb_ow")),
        "oil_phase_lacking_required_hlb_wo": sorted(i.id for i in current if "oil_phase" in i.roles and not i.active("required_hlb_wo")),
        "surfactants_lacking_hlb": sorted(i.id for i in current if "surfactant" in i.roles and not i.active("hlb")),
        "current_ingredients": len(current),
        "functions_unverified": sorted(i.id for i in current if i.functions_record and not i.functions_record.is_verified),
        "doubtful_values": [{"ingredient": ing.id, "property": prop, "source": r.source_id, "reason": r.doubtful_reason}
                            for ing in current for prop in ing.values for r in ing.active(prop) if r.doubtful],
        "disagreements": disagreements,
        "solid_lacking_melting_range": sorted(i.id for i in current if i.physical_state != "liquid" and not i.active("melting_range")),
        "processing": _processing(current),
        "tables": _tables(registry),
        "hlb_coverage": hlb_coverage(registry).as_dict(),
        "thresholds": {"hlb": hlb_threshold, "density_g_per_ml": density_threshold},
    }


def _processing(current: list) -> dict:
    records = [i.processing for i in current if i.processing]
    return {"records": len(records), "unverified": sum(not r.is_verified for r in records),
            "volatile": sorted(i.id for i in current if i.processing and i.processing.volatile),
            "heat_sensitive": sorted(i.id for i in current if i.processing and i.processing.heat_sensitive),
            "surfactants_lacking_dissolves_in": sorted(i.id for i in current if "surfactant" in i.roles
                                                       and not (i.processing and i.processing.dissolves_in))}


def _tables(registry: Registry) -> dict:
    """Each shared table's entries (a table-level statement counts as one)
    by status, and how many were recalled from memory."""
    out = {}
    buds = registry.beyond_use_dates
    if buds is not None:
        origins = [buds.provenance] + [c.provenance for c in buds.categories] + [r.provenance for r in buds.rules.values()]
        out["beyond_use_dates"] = {"entries": len(origins), "categories": len(buds.categories), "rules": len(buds.rules),
                                   "by_status": dict(sorted(Counter(o.status for o in origins).items())),
                                   "recalled_from_memory": sum(o.recalled_from_memory for o in origins)}
    bands = registry.water_dispersibility
    if bands is not None:
        out["water_dispersibility"] = {"entries": len(bands.bands), "by_status": {bands.status: len(bands.bands)},
                                       "recalled_from_memory": len(bands.bands) if bands.recalled_from_memory else 0}
    return out
