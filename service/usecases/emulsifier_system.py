"""The emulsifier system of a worksheet: the pair (given or proposed) and
fixed surfactants, its total (given, or the minimum estimate plus a margin),
and the proportions that reach the target HLB."""
from __future__ import annotations

from registry import Registry
from service.core.batch import mixture_mass_for_volume
from service.core.emulsifier import OIL_LOAD_NOTE, constant_part, estimate_limits, plausibility_finding, sized_with_margin
from service.core.errors import CalculationError
from service.core.findings import ceil_to, off_scale_findings
from service.core.phases import CONTINUOUS, DISPERSED
from service.core.mixing import Term, weighted_mean
from service.core.split import split_for_target
from service.usecases.answers import hlb_display, UNPUBLISHED_METHOD, finding_warnings
from service.usecases.provenance import ValuesUsed
from service.usecases.resolution import DEFAULT_ESTIMATE_MARGIN_PERCENT, required_value, usual_emulsifier_high_percent, checked_density, invalid, resolve
from service.usecases.pairs import DEFAULT_IONIC, oil_chain, ranked
from service.usecases.measuring import Row, row_density



def _phase_density(rows: list[Row], registry: Registry, values_used: ValuesUsed, path: tuple) -> float:
    """Density of a phase from its rows' densities, volumes assumed additive."""
    total = sum(r.percent for r in rows)
    densities = [row_density(r, registry, values_used) for r in rows]
    return mixture_mass_for_volume(1.0, [r.percent / total for r in rows], densities, path) / 1.0



def emulsifier_rows(data: dict, rows: list[Row], rhlb, registry: Registry, strict: bool, values_used: ValuesUsed, warnings: list) -> tuple[list[Row], dict]:
    spec = data["emulsifier"]
    # Solved on the required HLB as printed (to 0.1), so that a hand check
    # from the printed figures gives the printed masses.
    target = spec.get("target_hlb", hlb_display(rhlb.required_hlb.figure))
    fixed = [resolve(f, ("emulsifier", "fixed", i), registry) for i, f in enumerate(spec.get("fixed", []))]
    fixed_pct = [f["percent_w_w"] for f in spec.get("fixed", [])]
    fixed_hlb = [required_value(it, "hlb", "hlb", registry, values_used, "HLB") for it in fixed]
    proposed = False
    if "propose" in spec:
        ionic = tuple(spec["propose"].get("ionic_classes", DEFAULT_IONIC))
        chain = oil_chain(registry, [(r.item.ingredient_id, r.percent) for r in rows if r.phase == "oil" and r.percent is not None])
        pairs = ranked(registry, target, ionic, strict, spec["propose"].get("include_off_scale_hlb", False), chain)
        if not pairs:
            raise invalid(("emulsifier", "propose"), "candidate_pair_exists", f"no registry pair of the allowed ionic classes ({', '.join(ionic)}) reaches HLB {target:.1f}")
        best = pairs[0]
        pair_refs = [{"ingredient": best.low.id}, {"ingredient": best.high.id}]
        proposed = True
    else:
        pair_refs = spec.get("pair")
    pair = [resolve(p, ("emulsifier", "pair", i), registry) for i, p in enumerate(pair_refs or [])]
    pair_hlb = [required_value(it, "hlb", "hlb", registry, values_used, "HLB") for it in pair]

    estimate = None
    if pair:
        if "total_percent_w_w" in spec:
            total = spec["total_percent_w_w"]
            basis = "given as % w/w of the formula"
        else:
            total, estimate, basis = _minimum_total(data, rows, rhlb, pair, pair_hlb, target, registry, values_used, warnings)
        if total <= sum(fixed_pct):
            raise invalid(("emulsifier",), "room_for_pair", f"the fixed surfactants take {sum(fixed_pct):g} % w/w, all of the {total:g} % emulsifier system")
        try:
            solved = split_for_target(target, pair_hlb, [(p / total, h) for p, h in zip(fixed_pct, fixed_hlb)])
        except CalculationError as exc:
            raise CalculationError(("emulsifier",) + exc.path, exc.rule, exc.message, **exc.extra) from None
        fractions, mean = solved.fractions, solved.hlb
        members = pair + fixed
    else:
        total = sum(fixed_pct)
        basis = "the fixed surfactants"
        members = fixed
        mean = weighted_mean([Term(p, h.figure, h.low, h.high) for p, h in zip(fixed_pct, fixed_hlb)])
        fractions = mean.fractions
        target = None if "target_hlb" not in spec else target
    member_hlbs = pair_hlb + fixed_hlb if pair else fixed_hlb
    warnings.extend(finding_warnings(off_scale_findings([(it.label, h.figure, it.ionic_class) for it, h in zip(members, member_hlbs)])))
    # A pair member with no share (a target at the pair's end) is left out, not weighed as 0 g.
    new_rows = [Row(it, "emulsifier", "emulsifier", percent=f * total, path=it.path) for it, f in zip(members, fractions) if f > 1e-12]
    info = {
        "surfactants": [it.ingredient_id or it.name for it in members], "proposed": proposed,
        "target_hlb": hlb_display(target) if target is not None else None, "hlb_reached": hlb_display(mean.figure),
        "hlb_range": {"low": hlb_display(mean.low), "high": hlb_display(mean.high)}, "total_percent_w_w": total,
        "basis": basis, "minimum_estimate_g_per_100g": estimate, "_mean": mean.figure,
    }
    if proposed:
        warnings.append({"code": "pair_proposed", "subject": ", ".join(info["surfactants"][:2]),
                         "message": f"the service chose the pair {info['surfactants'][0]} / {info['surfactants'][1]} by its ranking rule; "
                                    "confirm the choice suits the product"})
    return new_rows, info



def _minimum_total(data, rows, rhlb, pair, pair_hlb, target, registry, values_used, warnings):
    """Emulsifier % w/w from the minimum estimate plus a margin. The estimate
    depends on the continuous phase's share, which the emulsifier itself
    takes from when the q.s. vehicle is in the continuous phase:
    the core's sized_with_margin solves for it."""
    spec = data["emulsifier"]["minimum_estimate"]
    etype = data["emulsion_type"]
    margin_given = "margin_percent" in spec
    margin = spec.get("margin_percent", DEFAULT_ESTIMATE_MARGIN_PERCENT) / 100.0
    if "surfactant_density" in spec:
        rho_s = checked_density(spec["surfactant_density"], ("emulsifier", "minimum_estimate", "surfactant_density"))
    else:
        x_high = (target - pair_hlb[0].figure) / (pair_hlb[1].figure - pair_hlb[0].figure)
        pair_rows = [Row(it, "emulsifier", "emulsifier", percent=p, path=it.path) for it, p in zip(pair, (1 - x_high, x_high))]
        try:
            rho_s = _phase_density(pair_rows, registry, values_used, ("emulsifier", "pair"))
        except CalculationError as exc:
            raise invalid(("emulsifier", "minimum_estimate", "surfactant_density"), "density_needed",
                          "the surfactants' densities are not all known: give surfactant_density") from exc
    dispersed = [r for r in rows if r.phase == DISPERSED[etype]]
    if "dispersed_phase_density" in spec:
        rho_d = checked_density(spec["dispersed_phase_density"], ("emulsifier", "minimum_estimate", "dispersed_phase_density"))
    else:
        if any(r.percent is None for r in dispersed):
            raise invalid(("emulsifier", "minimum_estimate", "dispersed_phase_density"), "density_needed",
                          "the dispersed phase holds the q.s. vehicle: give dispersed_phase_density")
        try:
            rho_d = _phase_density(dispersed, registry, values_used, ("ingredients",))
        except CalculationError as exc:
            raise invalid(("emulsifier", "minimum_estimate", "dispersed_phase_density"), "density_needed",
                          "the dispersed phase's densities are not all known: give dispersed_phase_density") from exc
    continuous = CONTINUOUS[etype]
    qs_row = next(r for r in rows if r.role == "qs")
    # On the required HLB as printed (its domain checked by the core).
    try:
        a = constant_part(rho_s, rho_d, hlb_display(rhlb.required_hlb.figure))
    except CalculationError as exc:
        raise invalid(("ingredients",), exc.rule, f"the oil phase's required HLB is outside the estimate's domain: {exc.message}") from None
    if qs_row.phase == continuous:
        sized = sized_with_margin(a, margin, 100.0 - sum(r.percent for r in rows if r.role != "qs" and r.phase != continuous), True)
    else:
        sized = sized_with_margin(a, margin, sum(r.percent for r in rows if r.phase == continuous), False)
    q, estimate, total = sized.continuous_percent, sized.estimate_g_per_100g, sized.total_percent
    if not 0.0 < q < 100.0:
        raise invalid(("ingredients",), "continuous_phase_share", f"the continuous phase would be {q:g} % of the emulsion")
    usual_high = usual_emulsifier_high_percent(registry)
    try:
        finding = plausibility_finding(estimate, usual_high, ("emulsifier", "minimum_estimate"))
        total = ceil_to(total, 0.1)
        _, ceiling = estimate_limits(usual_high)
        if total > ceiling:
            raise CalculationError(("emulsifier", "minimum_estimate", "margin_percent"), "estimate_plausible",
                                   f"the estimate plus its margin is {total:g} % w/w, above the ceiling of {ceiling:g} %: it cannot be a formula")
    except CalculationError as exc:
        raise invalid(exc.path, exc.rule, exc.message) from None
    warnings.append({"code": "unpublished_method", "subject": "method", "message": UNPUBLISHED_METHOD})
    warnings.append({"code": "estimate_insensitive_to_oil_load", "subject": "method", "message": OIL_LOAD_NOTE})
    warnings.extend(finding_warnings([finding]))
    margin_text = f"a {margin * 100:g} % margin" + ("" if margin_given else " (the default margin; give margin_percent to choose another)")
    return total, estimate, f"minimum estimate {estimate:.2f} g per 100 g plus {margin_text}, rounded up to 0.1 %"
