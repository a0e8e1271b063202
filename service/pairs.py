"""Candidate surfactant pairs from the registry, for a target HLB or an oil
phase."""
from __future__ import annotations

from registry import Registry
from service import methods
from service.answers import envelope, hlb_display
from service.calculations import oil_phase_rhlb
from service.core.candidates import RULE, Pair, Surfactant, candidate_pairs
from service.lookups import enforce_strict
from service.resolve import Resolved, scalar_value

DEFAULT_IONIC = ("nonionic",)
DEFAULT_LIMIT = 10


def registry_surfactants(registry: Registry, ionic_classes, strict: bool) -> list[Surfactant]:
    """Current surfactants with an HLB, of the ionic classes allowed; no
    hydrocolloids (apparent HLB only); in strict mode, verified HLBs only."""
    out = []
    for ing in registry.ingredients.values():
        if ing.retired or "surfactant" not in ing.roles or ing.hlb_is_apparent or ing.ionic_class not in ionic_classes:
            continue
        record = ing.preferred("hlb")
        if record is None or (strict and not record.is_verified):
            continue
        out.append(Surfactant(ing.id, record.figure, ing.ionic_class, ing.fatty_chain))
    return out


def ranked(registry: Registry, target: float, ionic_classes, strict: bool) -> list[Pair]:
    return candidate_pairs(target, registry_surfactants(registry, ionic_classes, strict))


def _member(registry: Registry, s: Surfactant, share: float) -> dict:
    ing = registry.get(s.id)
    return {"ingredient": s.id, "name": ing.name, "hlb": s.hlb, "ionic_class": s.ionic_class,
            "fatty_chain": s.fatty_chain, "percent_of_blend": share * 100.0}


def candidates(data: dict, registry: Registry, strict: bool = False) -> dict:
    ionic = tuple(data.get("ionic_classes", DEFAULT_IONIC))
    limit = data.get("limit", DEFAULT_LIMIT)
    values_used, warnings = [], []
    if "oil_phase" in data:
        rhlb = oil_phase_rhlb({"emulsion_type": data["emulsion_type"], "oil_phase": data["oil_phase"]}, registry, strict)
        target = rhlb["result"]["required_hlb_unrounded"]
        values_used += rhlb["values_used"]
    else:
        target = data["target_hlb"]
    enforce_strict(values_used, strict)
    pairs = ranked(registry, target, ionic, strict)
    chosen = pairs[:limit]
    for pair in chosen:
        for s in (pair.low, pair.high):
            item = Resolved(s.id, registry.get(s.id).name, s.ionic_class, None, False, registry.get(s.id), path=("candidates",))
            found = scalar_value(item, "hlb", "hlb", registry)
            if found and not any(v["ingredient"] == s.id and v["property"] == "hlb" for v in values_used):
                values_used.append(found[1])
    if not pairs:
        warnings.append({"code": "no_candidate_pair", "subject": None,
                         "message": f"no pair of the allowed ionic classes ({', '.join(ionic)}) reaches HLB {target:.1f}"})
    result = {
        "target_hlb": hlb_display(target), "rule": RULE, "considered": len(pairs),
        "candidates": [{"rank": i + 1, "low": _member(registry, p.low, 1 - p.share_high), "high": _member(registry, p.high, p.share_high),
                        "same_fatty_chain": p.same_chain, "ionic_members": p.ionic_members} for i, p in enumerate(chosen)],
    }
    inputs = {"target_hlb": data.get("target_hlb"), "emulsion_type": data.get("emulsion_type"), "ionic_classes": list(ionic), "limit": limit}
    return envelope(result, inputs, methods.CANDIDATES, values_used, warnings, registry, strict=strict)
