"""Lookups every calculation shares: the values an ingredient brings, with
their provenance recorded in values_used, and strict mode's refusal."""
from __future__ import annotations

from typing import Sequence

from registry import Registry
from service.core.amounts import ABSOLUTE, Amount
from service.core.errors import UnverifiedValuesRefused
from service.resolve import Resolved, density_value, invalid, scalar_value

# Class A prescription balance (USP <1176>): sensitivity requirement 6 mg, and
# the acceptable error pharmacies commonly work to, 5 %.
DEFAULT_SENSITIVITY_G = 0.006
DEFAULT_ERROR_PERCENT = 5.0
# Balance increment a batch amount is rounded up to (common practice, no source).
BATCH_INCREMENT_G = 0.01


# Minimum-estimate margin when the request names none: a rough lower bound
# plus a quarter (common practice, no source). Stated in every answer using it.
DEFAULT_ESTIMATE_MARGIN_PERCENT = 25.0
# Highest usual emulsifier level when a registry holds no table of them: the
# figure the shipped table gives polysorbates and sorbitan esters alone.
FALLBACK_USUAL_EMULSIFIER_HIGH_PERCENT = 15.0


def usual_emulsifier_high_percent(registry: Registry) -> float:
    """The highest usual emulsifier level (% w/w, used alone) the registry holds."""
    levels = registry.emulsifier_levels
    if levels is None or not levels.families:
        return FALLBACK_USUAL_EMULSIFIER_HIGH_PERCENT
    return max(level.alone[1] for level in levels.families)


def enforce_strict(values_used: list[dict], strict: bool) -> None:
    """Strict mode: refuse registry values not yet checked against their
    source, naming each. Caller-supplied values are the caller's to vouch for."""
    if not strict:
        return
    refused = [v for v in values_used if v["origin"] == "registry" and v["status"] == "unverified"]
    if refused:
        errors = [{"pointer": v["pointer"], "rule": "verified_values_only",
                   "detail": f"{v['ingredient']} {v['property']} ({v['figure']:g}, source {v['source']['id']}) is unverified"} for v in refused]
        raise UnverifiedValuesRefused(errors, f"strict mode: {len(refused)} value(s) used here are not yet checked against their source")


def hlb_ranges(registry: Registry) -> dict[str, tuple[float, float]]:
    return {name: (r.low, r.high) for name, r in registry.hlb_ranges.ranges.items()}


def densities_for(items: Sequence[Resolved], needed: Sequence[bool], registry: Registry, values_used: list,
               strict: bool) -> list[float | None]:
    """Each item's density where one is known. `needed[i]` says the result
    depends on it (a volume to convert); otherwise it only reports a volume,
    so in strict mode an unverified one is left out rather than refused."""
    out = []
    for item, need in zip(items, needed):
        found = density_value(item, registry)
        if found is None or (strict and not need and found[1]["status"] == "unverified"):
            out.append(None)
            continue
        out.append(found[0])
        values_used.append(found[1])
    return out


def amount_densities(items, amounts: Sequence[Amount], registry, values_used, strict) -> list[float | None]:
    """Densities for amounts: none at all for relative amounts."""
    if not any(a.kind in ABSOLUTE for a in amounts):
        return [None] * len(items)
    return densities_for(items, [a.kind == "volume" for a in amounts], registry, values_used, strict)


def required_value(item: Resolved, prop: str, inline_key: str, registry: Registry, values_used: list, what: str):
    found = scalar_value(item, prop, inline_key, registry)
    if found is None:
        where = item.path + (("inline", inline_key) if item.record is None else ("ingredient",))
        raise invalid(where, f"{prop}_known", f"no {what} is known for {item.label}: describe the ingredient inline with a value from your own source, or choose another ingredient")
    values_used.append(found[1])
    return found[0]
