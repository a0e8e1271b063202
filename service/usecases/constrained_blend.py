"""Shares of a blend of two or more surfactants for a target HLB under the
caller's constraints (POST /v1/blends/solve): resolve the members, check the
ratios' members, solve in service.core.blend_shares, scale to a total, and
build the envelope."""
from __future__ import annotations

from registry import Registry
from service.core import findings as core_findings
from service.core.blend_shares import Member, Ratio, solve_shares
from service.core.findings import IONIC
from service.core.split import total_mass_from_volume
from service.units import to_canonical
from service.usecases import methods
from service.usecases.answers import apparent_hlb_warning, envelope, finding_warnings, hlb_display, unrounded
from service.usecases.provenance import ValuesUsed
from service.usecases.resolution import Faults, Resolved, check_references, densities_for, density_given, enforce_strict, hlb_ranges, required_value, resolve

DEFAULT_OBJECTIVE = "most_even"
# Shares are shown rounded to this many decimals of a percent, beside the unrounded figure.
PERCENT_DECIMALS = 2


def _member(item: Resolved, given: dict, hlb) -> Member:
    low, high, fixed = (given.get(k) for k in ("min_percent_w_w", "max_percent_w_w", "fixed_percent_w_w"))
    return Member(hlb=hlb, label=item.label, ionic=item.ionic_class in IONIC,
                  low=(low or 0.0) / 100.0, high=(100.0 if high is None else high) / 100.0,
                  fixed=None if fixed is None else fixed / 100.0, given_low=low is not None, given_high=high is not None)


def _ratios(data: dict, faults: Faults) -> list[Ratio]:
    n = len(data["surfactants"])
    out = []
    for k, r in enumerate(data.get("ratios", [])):
        for end in ("a", "b"):
            if r[end] >= n:
                faults.add(("ratios", k, end), "ratio_member_exists",
                           f"member {r[end]} is not in 'surfactants', which holds {n} (counted from 0)")
        if r["a"] == r["b"]:
            faults.add(("ratios", k, "b"), "ratio_members_differ", "a ratio is between two different members")
        out.append(Ratio(r["a"], r["b"], r["a_parts"], r["b_parts"]))
    return out


def _ionic_classes_known(items: list[Resolved], faults: Faults) -> None:
    """least_ionic ranks members by their ionic class: an inline member
    without one cannot be ranked, and is refused rather than guessed."""
    for it in items:
        if it.ionic_class == "unspecified":
            faults.add(it.path + ("inline", "ionic_class"), "ionic_class_known",
                       f"the least_ionic objective needs the ionic class of {it.label}: give it with 'ionic_class'")


def _total_densities(items, total, registry, values_used, strict, faults) -> tuple[str | None, float | None, list]:
    """The total's kind and canonical value, and each member's density: all
    of them needed for a total by volume, otherwise only reported."""
    if total is None:
        return None, None, [None] * len(items)
    kind, value = to_canonical(total["value"], total["unit"])
    by_volume = kind == "volume"
    densities = densities_for(items, [by_volume] * len(items), registry, values_used, strict, faults)
    for it, d in zip(items, densities):
        if by_volume and d is None and not density_given(it):
            faults.add(it.path, "density_needed_for_volume",
                       f"a total given as a volume needs the density of every surfactant; none is known for {it.label}: give it with 'density'")
    return kind, value, densities


def solve(data: dict, registry: Registry, strict: bool = False) -> dict:
    check_references(data, registry)
    given = data["surfactants"]
    items = [resolve(m, ("surfactants", i), registry) for i, m in enumerate(given)]
    objective = data.get("objective", DEFAULT_OBJECTIVE)
    values_used = ValuesUsed()
    faults = Faults()
    hlbs = faults.each(lambda it: required_value(it, "hlb", "hlb", registry, values_used, "HLB"), items)
    ratios = _ratios(data, faults)
    if objective == "least_ionic":
        _ionic_classes_known(items, faults)
    total = data.get("total")
    total_kind, total_value, densities = _total_densities(items, total, registry, values_used, strict, faults)
    faults.raise_any()
    enforce_strict(values_used, strict)
    target = data["target_hlb"]
    solved = solve_shares(target, [_member(it, g, h) for it, g, h in zip(items, given, hlbs)], ratios, objective)

    total_mass = total_volume = None
    if total_kind == "mass":
        total_mass = total_value
    elif total_kind == "volume":
        total_volume = total_value
        total_mass = total_mass_from_volume(total_value, solved.fractions, densities)
    rows = []
    for it, x, h, d in zip(items, solved.fractions, hlbs, densities):
        mass = x * total_mass if total_mass is not None else None
        rows.append({"ingredient": it.ingredient_id, "name": it.name, "hlb": h.figure, "ionic_class": it.ionic_class,
                     "percent_w_w": x * 100.0, "percent_w_w_rounded": round(x * 100.0, PERCENT_DECIMALS), "mass_g": mass,
                     "volume_ml": mass / d if mass is not None and d is not None else None})
    emulsion_type = data.get("emulsion_type")
    # A member the answer leaves at 0 % is not in the blend: it is not judged for compatibility.
    present = [it.ionic_class for it, x in zip(items, solved.fractions) if x > 0.0]
    warnings = finding_warnings([
        *core_findings.ionic_findings(present),
        *core_findings.off_scale_findings([(it.label, h.figure, it.ionic_class) for it, h in zip(items, hlbs)]),
        core_findings.usual_range_finding(solved.hlb.figure, emulsion_type, hlb_ranges(registry)),
    ]) + apparent_hlb_warning(it.label for it in items if it.hlb_is_apparent)
    return envelope(
        result={"target_hlb": target, "hlb_reached": hlb_display(solved.hlb.figure), "hlb_reached_unrounded": unrounded(solved.hlb.figure),
                "hlb_range": {"low": hlb_display(solved.hlb.low), "high": hlb_display(solved.hlb.high)},
                "objective": objective, "objective_description": methods.BLEND_OBJECTIVES[objective],
                "reachable_range": {"low": solved.reachable_low, "high": solved.reachable_high},
                "ionic_share_percent_w_w": solved.ionic_fraction * 100.0,
                "surfactants": rows, "constraints": [c.as_dict() for c in solved.constraints],
                "total_mass_g": total_mass, "total_volume_ml": total_volume},
        inputs={"target_hlb": target, "objective": objective, "surfactants": [_member_input(it, g) for it, g in zip(items, given)],
                "ratios": [dict(r) for r in data.get("ratios", [])], "total": dict(total) if total else None, "emulsion_type": emulsion_type},
        method=methods.BLEND_SOLVE, values_used=values_used, warnings=warnings, registry=registry, strict=strict,
    )


def _member_input(item: Resolved, given: dict) -> dict:
    return {"ingredient": item.ingredient_id, "name": item.name, "origin": item.origin,
            **{k: given.get(k) for k in ("fixed_percent_w_w", "min_percent_w_w", "max_percent_w_w")}}


__all__ = ["DEFAULT_OBJECTIVE", "solve"]
