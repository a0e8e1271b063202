"""Candidate surfactant pairs from the registry, for a target HLB or an oil
phase."""
from __future__ import annotations

import weakref
from collections import OrderedDict

from registry import Registry
from service.usecases import methods
from service.usecases.answers import envelope, finding_warnings, hlb_display, unrounded
from service.usecases.hlb_calculations import oil_phase_request
from service.usecases.oil_phase import oil_phase_hlb
from service.core.candidates import RULE, SINGLE_TOLERANCE_HLB, Pair, Surfactant, single_surfactants
from service.core.pair_ranking import PairIndex
from service.core.findings import GRIFFIN_SCALE_MAX, off_scale_findings
from service.usecases.provenance import ValuesUsed
from service.usecases.resolution import enforce_strict, Resolved, check_references, scalar_value

DEFAULT_IONIC = ("nonionic",)
DEFAULT_LIMIT = 10


def registry_surfactants(registry: Registry, ionic_classes, strict: bool, off_scale: bool = False) -> list[Surfactant]:
    """Current emulsifying agents (by their recorded functions) with an HLB,
    of the ionic classes allowed (all when None); no hydrocolloids (apparent HLB only); none
    above Griffin's 0 to 20 scale unless `off_scale`; in strict mode,
    verified HLBs only."""
    out = []
    for ing in registry.ingredients.values():
        if (ing.retired or "surfactant" not in ing.roles or "emulsifier" not in ing.functions or ing.hlb_is_apparent
                or (ionic_classes is not None and ing.ionic_class not in ionic_classes)):
            continue
        record = ing.preferred("hlb")
        if record is None or (strict and not record.is_verified) or (record.figure > GRIFFIN_SCALE_MAX and not off_scale):
            continue
        out.append(Surfactant(ing.id, record.figure, ing.ionic_class, ing.fatty_chain))
    return out


def oil_chain(registry: Registry, oil_shares: list[tuple[str | None, float]]) -> str | None:
    """The fatty chain of the oil phase, where the registry can tell: the
    chain of the registry ingredients (id, share) that make up more than half
    of the oil phase by mass; None otherwise."""
    total = sum(share for _, share in oil_shares)
    by_chain: dict[str, float] = {}
    for ingredient_id, share in oil_shares:
        ing = registry.get(ingredient_id) if ingredient_id else None
        if ing is not None and ing.fatty_chain:
            by_chain[ing.fatty_chain] = by_chain.get(ing.fatty_chain, 0.0) + share
    if not by_chain or total <= 0:
        return None
    chain, share = max(by_chain.items(), key=lambda kv: kv[1])
    return chain if share > total / 2 else None


# Per registry (by identity: a Registry is frozen but holds mappings, so it
# cannot be hashed) and per filter, the surfactants and their pair index,
# built on first use so that a request sorts nothing. An entry goes with its
# registry. The surfactants of every ionic class are listed once per
# (strict, off_scale) and each ionic filter keeps its own from them, so that
# the filters share their Surfactant objects; the least recently used
# filters beyond MAX_FILTERS are dropped, to bound a worker's memory.
MAX_FILTERS = 32
_INDEXES: dict[int, tuple[weakref.ref, OrderedDict]] = {}


def surfactant_index(registry: Registry, ionic_classes, strict: bool, off_scale: bool = False) -> tuple[list[Surfactant], PairIndex]:
    """The surfactants registry_surfactants() gives, and their PairIndex, made once."""
    entry = _INDEXES.get(id(registry))
    if entry is None or entry[0]() is not registry:
        entry = (weakref.ref(registry, lambda _, key=id(registry): _INDEXES.pop(key, None)), OrderedDict())
        _INDEXES[id(registry)] = entry
    cache = entry[1]
    classes = frozenset(ionic_classes)
    key = (classes, bool(strict), bool(off_scale))
    found = cache.get(key)
    if found is None:
        every = cache.get((None, bool(strict), bool(off_scale)))
        if every is None:
            every = cache[(None, bool(strict), bool(off_scale))] = registry_surfactants(registry, None, strict, off_scale)
        surfactants = [s for s in every if s.ionic_class in classes]
        found = cache[key] = (surfactants, PairIndex(surfactants))
        while len(cache) > MAX_FILTERS:
            cache.popitem(last=False)
    else:
        cache.move_to_end(key)
    return found


def ranked(registry: Registry, target: float, ionic_classes, strict: bool, off_scale: bool = False,
           chain: str | None = None, limit: int | None = None) -> list[Pair]:
    """The first `limit` candidate pairs (all when None), ranked by RULE."""
    return surfactant_index(registry, ionic_classes, strict, off_scale)[1].ranked(target, chain, limit)


def _member(registry: Registry, s: Surfactant, share: float) -> dict:
    ing = registry.get(s.id)
    return {"ingredient": s.id, "name": ing.name, "hlb": s.hlb, "ionic_class": s.ionic_class,
            "fatty_chain": s.fatty_chain, "percent_of_blend": share * 100.0}


def candidates(data: dict, registry: Registry, strict: bool = False) -> dict:
    check_references(data, registry)
    ionic = tuple(data.get("ionic_classes", DEFAULT_IONIC))
    limit = data.get("limit", DEFAULT_LIMIT)
    off_scale = data.get("include_off_scale_hlb", False)
    values_used, warnings = ValuesUsed(), []
    chain = None
    if "oil_phase" in data:
        items, amounts, counts = oil_phase_request(data["oil_phase"], registry)
        phase = oil_phase_hlb(items, amounts, counts, data["emulsion_type"], registry, values_used, strict)
        target = unrounded(phase.required_hlb.figure)
        chain = oil_chain(registry, [(it.ingredient_id, f * 100.0) for it, f in zip(items, phase.phase_fractions)])
    else:
        target = data["target_hlb"]
    enforce_strict(values_used, strict)
    surfactants, index = surfactant_index(registry, ionic, strict, off_scale)
    considered = index.count(target)
    chosen = index.ranked(target, chain, limit)
    singles = single_surfactants(target, surfactants)
    # Each HLB once, in order of first use. The keys seen are kept in a set:
    # the single surfactants grow with the registry, and ValuesUsed.add's own
    # key check looks through every value already listed.
    seen = {(v.ingredient, v.property) for v in values_used}
    for s in [m for pair in chosen for m in (pair.low, pair.high)] + singles:
        if (s.id, "hlb") in seen:
            continue
        item = Resolved(s.id, registry.get(s.id).name, s.ionic_class, None, False, registry.get(s.id), path=("candidates",))
        found = scalar_value(item, "hlb", "hlb", registry)
        if found and (found[1].ingredient, found[1].property) not in seen:
            seen.add((found[1].ingredient, found[1].property))
            values_used.add(found[1])
    if off_scale:
        members = {s.id: s for p in chosen for s in (p.low, p.high)}
        warnings += finding_warnings(off_scale_findings([(m.id, m.hlb, m.ionic_class) for m in members.values()]))
    if not considered:
        warnings.append({"code": "no_candidate_pair", "subject": None,
                         "message": f"no pair of the allowed ionic classes ({', '.join(ionic)}) reaches HLB {target:.1f}"})
    result = {
        "target_hlb": hlb_display(target), "rule": RULE, "considered": considered, "oil_fatty_chain": chain,
        "candidates": [{"rank": i + 1, "low": _member(registry, p.low, 1 - p.share_high), "high": _member(registry, p.high, p.share_high),
                        "same_fatty_chain": p.same_chain, "matches_oil_chain": p.matches_oil, "ionic_members": p.ionic_members}
                       for i, p in enumerate(chosen)],
        "single_surfactants": [{**_member(registry, s, 1.0), "difference_hlb": s.hlb - target} for s in singles],
        "single_tolerance_hlb": SINGLE_TOLERANCE_HLB,
    }
    inputs = {"target_hlb": data.get("target_hlb"), "emulsion_type": data.get("emulsion_type"), "ionic_classes": list(ionic), "limit": limit,
              "include_off_scale_hlb": off_scale}
    return envelope(result, inputs, methods.CANDIDATES, values_used, warnings, registry, strict=strict)
