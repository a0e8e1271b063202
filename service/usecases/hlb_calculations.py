"""Each calculation end to end, between the loaded request and the answer:
resolve ingredients, convert amounts, call the core, assemble the envelope.
No Flask here; the API views only load, call one of these, and dump."""
from __future__ import annotations

from typing import Sequence

from registry import Registry
from service.usecases import methods
from service.usecases.answers import envelope, hlb_display, hlb_span_display, unrounded, UNPUBLISHED_METHOD, apparent_hlb_warning, finding_warnings, solid_by_volume_warning
from service.core import findings as core_findings
from service.core.blend import blend_hlb
from service.core.emulsifier import OIL_LOAD_NOTE, continuous_term, estimate_limits, minimum_emulsifier, plausibility_finding
from service.core.split import split_for_target, total_mass_from_volume
from service.usecases.oil_phase import oil_phase_hlb
from service.usecases.provenance import ValuesUsed
from service.usecases.resolution import (
    BATCH_INCREMENT_G,
    DEFAULT_ERROR_PERCENT,
    DEFAULT_SENSITIVITY_G,
    Resolved,
    amount,
    amount_densities,
    check_references,
    Faults,
    checked_density,
    densities_for,
    density_given,
    enforce_strict,
    hlb_ranges,
    required_value,
    resolve,
    usual_emulsifier_high_percent,
)
from service.units import to_canonical

def _component_inputs(items, given, weighed, fractions) -> list[dict]:
    return [
        {"ingredient": it.ingredient_id, "name": it.name, "origin": it.origin, "amount": dict(g),
         "mass_g": w.mass_g, "volume_ml": w.volume_ml, "percent_w_w": f * 100.0}
        for it, g, w, f in zip(items, given, weighed, fractions)
    ]


def _common_warnings(items: Sequence[Resolved], given: Sequence[dict]) -> list[dict]:
    solids = [it.label for it, g in zip(items, given)
              if to_canonical(1.0, g["unit"])[0] == "volume" and it.physical_state in ("solid", "semisolid")]
    return solid_by_volume_warning(solids) + apparent_hlb_warning(it.label for it in items if it.hlb_is_apparent)


def blend(data: dict, registry: Registry, strict: bool = False) -> dict:
    check_references(data, registry)
    components = data["components"]
    items = [resolve(c, ("components", i), registry) for i, c in enumerate(components)]
    values_used = ValuesUsed()
    faults = Faults()
    hlbs = faults.each(lambda it: required_value(it, "hlb", "hlb", registry, values_used, "HLB"), items)
    amounts = [amount(c["amount"]) for c in components]
    densities = amount_densities(items, amounts, registry, values_used, strict, faults)
    faults.raise_any()
    enforce_strict(values_used, strict)
    result = blend_hlb(hlbs, amounts, densities)
    emulsion_type = data.get("emulsion_type")
    warnings = finding_warnings([
        *core_findings.ionic_findings([it.ionic_class for it in items]),
        *core_findings.off_scale_findings([(it.label, h.figure, it.ionic_class) for it, h in zip(items, hlbs)]),
        core_findings.usual_range_finding(result.hlb.figure, emulsion_type, hlb_ranges(registry)),
    ]) + _common_warnings(items, [c["amount"] for c in components])
    return envelope(
        result={"hlb": hlb_display(result.hlb.figure), "hlb_unrounded": unrounded(result.hlb.figure),
                "hlb_range": {"low": hlb_display(result.hlb.low), "high": hlb_display(result.hlb.high)},
                "total_mass_g": result.total_mass_g},
        inputs={"components": _component_inputs(items, [c["amount"] for c in components], result.weighed, result.hlb.fractions),
                "emulsion_type": emulsion_type},
        method=methods.BLEND_HLB, values_used=values_used, warnings=warnings, registry=registry, strict=strict,
    )


def _fixed_fractions(fixed: list[dict], total: dict | None) -> list[float]:
    """Fixed shares as fractions of the blend: % w/w of the blend, or masses
    of a total given as a mass."""
    total_kind, total_value = to_canonical(total["value"], total["unit"]) if total else (None, None)
    out, faults = [], Faults()
    for i, f in enumerate(fixed):
        kind, value = to_canonical(f["amount"]["value"], f["amount"]["unit"])
        if kind == "percent_w_w":
            out.append(value / 100.0)
        elif kind == "mass" and total_kind == "mass":
            out.append(value / total_value)
        else:
            faults.add(("fixed", i, "amount", "unit"), "fixed_share_basis",
                       "a fixed surfactant's share is given as % w/w of the blend, or as a mass when 'total' is a mass")
    faults.raise_any()
    return out


def split(data: dict, registry: Registry, strict: bool = False) -> dict:
    check_references(data, registry)
    values_used = ValuesUsed()
    pair = [resolve(r, ("pair", i), registry) for i, r in enumerate(data["pair"])]
    fixed = data.get("fixed", [])
    fixed_items = [resolve(f, ("fixed", i), registry) for i, f in enumerate(fixed)]
    items = pair + fixed_items
    faults = Faults()
    hlbs = faults.each(lambda it: required_value(it, "hlb", "hlb", registry, values_used, "HLB"), items)
    total = data.get("total")
    fixed_fractions = faults.run(_fixed_fractions, fixed, total)
    total_kind, total_value = to_canonical(total["value"], total["unit"]) if total else (None, None)
    densities: list[float | None] = [None] * len(items)
    if total is not None:
        # Looked up before the split is solved, so that every missing or
        # implausible density is named with the request's other faults.
        densities = densities_for(items, [total_kind == "volume"] * len(items), registry, values_used, strict, faults)
        for it, d in zip(items, densities):
            if total_kind == "volume" and d is None and not density_given(it):
                faults.add(it.path, "density_needed_for_volume",
                           f"a total given as a volume needs the density of every surfactant; none is known for {it.label}: give it with 'density'")
    faults.raise_any()
    target = data["target_hlb"]
    solved = split_for_target(target, hlbs[:2], list(zip(fixed_fractions, hlbs[2:])))

    total_mass = total_volume = None
    if total_kind == "mass":
        total_mass = total_value
    elif total_kind is not None:
        total_volume = total_value
        total_mass = total_mass_from_volume(total_value, solved.fractions, densities)
    enforce_strict(values_used, strict)
    surfactants = []
    for i, (it, fraction, h, d) in enumerate(zip(items, solved.fractions, hlbs, densities)):
        mass = fraction * total_mass if total_mass is not None else None
        surfactants.append({
            "ingredient": it.ingredient_id, "name": it.name, "role": "pair" if i < 2 else "fixed", "hlb": h.figure,
            "percent_w_w": fraction * 100.0, "mass_g": mass,
            "volume_ml": mass / d if mass is not None and d is not None else None,
        })
    emulsion_type = data.get("emulsion_type")
    warnings = finding_warnings([
        *core_findings.ionic_findings([it.ionic_class for it in items]),
        *core_findings.off_scale_findings([(it.label, h.figure, it.ionic_class) for it, h in zip(items, hlbs)]),
        core_findings.usual_range_finding(solved.hlb.figure, emulsion_type, hlb_ranges(registry)),
    ]) + apparent_hlb_warning(it.label for it in items if it.hlb_is_apparent)
    return envelope(
        result={"target_hlb": target, "hlb_reached": hlb_display(solved.hlb.figure),
                "hlb_range": {"low": hlb_display(solved.hlb.low), "high": hlb_display(solved.hlb.high)},
                "reachable_range": {"low": solved.reachable_low, "high": solved.reachable_high},
                "surfactants": surfactants, "total_mass_g": total_mass, "total_volume_ml": total_volume},
        inputs={"target_hlb": target, "total": dict(total) if total else None, "emulsion_type": emulsion_type},
        method=methods.SPLIT, values_used=values_used, warnings=warnings, registry=registry, strict=strict,
    )


def oil_phase_request(oil: list[dict], registry: Registry) -> tuple[list[Resolved], list, list[bool]]:
    """The oil phase of a request: its ingredients, amounts and which count."""
    items = [resolve(c, ("oil_phase", i), registry) for i, c in enumerate(oil)]
    return items, [amount(c["amount"]) for c in oil], [c.get("counts_toward_rhlb", True) for c in oil]


def oil_phase_rhlb(data: dict, registry: Registry, strict: bool = False) -> dict:
    check_references(data, registry)
    emulsion_type = data["emulsion_type"]
    oil = data["oil_phase"]
    items, amounts, counts = oil_phase_request(oil, registry)
    values_used = ValuesUsed()
    result = oil_phase_hlb(items, amounts, counts, emulsion_type, registry, values_used, strict)
    enforce_strict(values_used, strict)
    inputs = _component_inputs(items, [c["amount"] for c in oil], result.weighed, result.phase_fractions)
    for row, count, counted in zip(inputs, counts, result.counted_fractions):
        row["counts_toward_rhlb"] = count
        row["percent_of_counted"] = counted * 100.0
    return envelope(
        result={"required_hlb": hlb_display(result.required_hlb.figure), "required_hlb_unrounded": unrounded(result.required_hlb.figure),
                "range": {"low": hlb_display(result.required_hlb.low), "high": hlb_display(result.required_hlb.high)},
                "range_with_doubtful": hlb_span_display(result.range_with_doubtful),
                "emulsion_type": emulsion_type, "oil_phase_mass_g": result.total_mass_g},
        inputs={"emulsion_type": emulsion_type, "oil_phase": inputs},
        method=methods.REQUIRED_HLB, values_used=values_used, warnings=_common_warnings(items, [c["amount"] for c in oil]),
        registry=registry, strict=strict,
    )


def emulsifier_minimum(data: dict, registry: Registry) -> dict:
    rho_s = checked_density(data["surfactant_density"], ("surfactant_density",))
    rho_d = checked_density(data["dispersed_phase_density"], ("dispersed_phase_density",))
    rhlb, q = data["required_hlb"], data["continuous_phase_percent"]
    estimate = minimum_emulsifier(rho_s, rho_d, rhlb, q)
    usual_high = usual_emulsifier_high_percent(registry)
    too_much = plausibility_finding(estimate.g_per_100g, usual_high, ("required_hlb",))
    balance = data.get("balance", {})
    sensitivity_g = to_canonical(balance["sensitivity"]["value"], balance["sensitivity"]["unit"])[1] if "sensitivity" in balance else DEFAULT_SENSITIVITY_G
    error_percent = balance.get("acceptable_error_percent", DEFAULT_ERROR_PERCENT)
    mwq_g = core_findings.minimum_weighable_quantity_g(sensitivity_g, error_percent)
    batch = None
    warnings = [{"code": "unpublished_method", "subject": "method", "message": UNPUBLISHED_METHOD},
                {"code": "estimate_insensitive_to_oil_load", "subject": "method", "message": OIL_LOAD_NOTE}]
    # The continuous phase's density is not asked for: the dispersed share is by mass.
    warnings += finding_warnings([too_much, *core_findings.phase_volume_findings((100.0 - q) / 100.0, "by mass, emulsifier left out")])
    if "batch" in data:
        batch_g = to_canonical(data["batch"]["value"], data["batch"]["unit"])[1]
        need_g = estimate.g_per_100g / 100.0 * batch_g
        weighable_g = max(core_findings.ceil_to(need_g, BATCH_INCREMENT_G), mwq_g)
        if need_g < mwq_g:
            warnings.append({"code": "below_minimum_weighable_quantity", "subject": "batch",
                             "message": f"the estimate for this batch, {need_g:.4g} g, is below the balance's minimum weighable "
                                        f"quantity of {mwq_g:g} g; the weighable amount shown is raised to it. Use a finer balance, "
                                        "or an aliquot method, to weigh less."})
        batch = {"batch_mass_g": batch_g, "emulsifier_mass_g": need_g, "emulsifier_mass_g_weighable": weighable_g,
                 "minimum_weighable_quantity_g": mwq_g}
    if rhlb > 18.0:
        warnings.append({"code": "required_hlb_near_singularity", "subject": "required_hlb",
                         "message": f"a required HLB of {rhlb:g} is near the formula's singularity at 20; the estimate grows without bound there and is unreliable"})
    return envelope(
        result={"g_per_100g": estimate.g_per_100g, "g_per_100g_rounded_up": estimate.g_per_100g_rounded_up,
                "continuous_phase_term_g_per_100g": continuous_term(q), "oil_load_note": OIL_LOAD_NOTE,
                "limits_g_per_100g": dict(zip(("warning_above", "refused_above"), estimate_limits(usual_high))),
                "basis": "grams of emulsifier per 100 g of emulsion (% w/w); the basis is inferred from the formula's percentage inputs",
                "batch": batch},
        inputs={"required_hlb": rhlb, "surfactant_density_g_per_ml": rho_s, "dispersed_phase_density_g_per_ml": rho_d,
                "continuous_phase_percent": q, "batch_mass_g": batch["batch_mass_g"] if batch else None,
                "balance_sensitivity_g": sensitivity_g, "acceptable_error_percent": error_percent},
        method=methods.MINIMUM_EMULSIFIER, values_used=[], warnings=warnings, registry=registry,
    )
