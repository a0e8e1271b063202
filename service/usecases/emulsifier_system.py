"""The emulsifier system of a worksheet: the pair (given or proposed) and
fixed surfactants, its total (given, or the minimum estimate plus a margin),
and the proportions that reach the target HLB."""
from __future__ import annotations

from dataclasses import dataclass, field

from registry import Registry
from service.core.batch import mixture_mass_for_volume
from service.core.emulsifier import OIL_LOAD_NOTE, constant_part, estimate_limits, plausibility_finding, sized_with_margin
from service.core.errors import CalculationError
from service.core.findings import ceil_to, off_scale_findings
from service.core.mixing import Term, weighted_mean
from service.core.phases import CONTINUOUS, DISPERSED
from service.core.split import split_for_target
from service.usecases.answers import UNPUBLISHED_METHOD, finding_warnings, hlb_display
from service.usecases.measuring import Row, row_density
from service.usecases.pairs import DEFAULT_IONIC, oil_chain, ranked
from service.usecases.provenance import ValuesUsed
from service.usecases.resolution import (DEFAULT_ESTIMATE_MARGIN_PERCENT, Faults, checked_density, invalid, required_value, resolve,
                                         usual_emulsifier_high_percent)

ESTIMATE = ("emulsifier", "minimum_estimate")


@dataclass
class Formula:
    """What the emulsifier system is worked out from: the request, the
    formula's own rows, and where values used and warnings are collected."""

    data: dict
    rows: list[Row]
    registry: Registry
    strict: bool
    values_used: ValuesUsed
    warnings: list = field(default_factory=list)

    @property
    def spec(self) -> dict:
        return self.data["emulsifier"]

    def hlb(self, item):
        return required_value(item, "hlb", "hlb", self.registry, self.values_used, "HLB")


def _phase_density(rows: list[Row], f: Formula, path: tuple) -> float:
    """Density of a phase from its rows' densities, volumes assumed additive."""
    total = sum(r.percent for r in rows)
    densities = [row_density(r, f.registry, f.values_used) for r in rows]
    return mixture_mass_for_volume(1.0, [r.percent / total for r in rows], densities, path)


def _pair_refs(f: Formula, target: float) -> tuple[list[dict], bool]:
    """The pair as given, or the top-ranked candidate pair; and whether it was proposed."""
    if "propose" not in f.spec:
        return f.spec.get("pair") or [], False
    propose = f.spec["propose"]
    ionic = tuple(propose.get("ionic_classes", DEFAULT_IONIC))
    chain = oil_chain(f.registry, [(r.item.ingredient_id, r.percent) for r in f.rows if r.phase == "oil" and r.percent is not None])
    pairs = ranked(f.registry, target, ionic, f.strict, propose.get("include_off_scale_hlb", False), chain, limit=1)
    if not pairs:
        raise invalid(("emulsifier", "propose"), "candidate_pair_exists", f"no registry pair of the allowed ionic classes ({', '.join(ionic)}) reaches HLB {target:.1f}")
    return [{"ingredient": pairs[0].low.id}, {"ingredient": pairs[0].high.id}], True


def emulsifier_rows(f: Formula, rhlb) -> tuple[list[Row], dict]:
    """The emulsifier rows (% w/w of the formula) and what the answer reports of them."""
    spec = f.spec
    # Solved on the required HLB as printed (to 0.1), so that a hand check
    # from the printed figures gives the printed masses.
    target = spec.get("target_hlb", hlb_display(rhlb.required_hlb.figure))
    fixed = [resolve(x, ("emulsifier", "fixed", i), f.registry) for i, x in enumerate(spec.get("fixed", []))]
    fixed_pct = [x["percent_w_w"] for x in spec.get("fixed", [])]
    fixed_hlb = [f.hlb(it) for it in fixed]
    pair_refs, proposed = _pair_refs(f, target)
    pair = [resolve(p, ("emulsifier", "pair", i), f.registry) for i, p in enumerate(pair_refs)]
    pair_hlb = [f.hlb(it) for it in pair]
    estimate = None
    if pair:
        if "total_percent_w_w" in spec:
            total, basis = spec["total_percent_w_w"], "given as % w/w of the formula"
        else:
            total, estimate, basis = _minimum_total(f, rhlb, pair, pair_hlb, target)
        members, member_hlbs = pair + fixed, pair_hlb + fixed_hlb
        fractions, mean = _solved(target, total, pair_hlb, fixed_pct, fixed_hlb)
    else:
        total, basis, members, member_hlbs = sum(fixed_pct), "the fixed surfactants", fixed, fixed_hlb
        mean = weighted_mean([Term(p, h.figure, h.low, h.high) for p, h in zip(fixed_pct, fixed_hlb)])
        fractions = mean.fractions
        target = None if "target_hlb" not in spec else target
    f.warnings.extend(finding_warnings(off_scale_findings([(it.label, h.figure, it.ionic_class) for it, h in zip(members, member_hlbs)])))
    # A pair member with no share (a target at the pair's end) is left out, not weighed as 0 g.
    new_rows = [Row(it, "emulsifier", "emulsifier", percent=x * total, path=it.path) for it, x in zip(members, fractions) if x > 1e-12]
    info = {
        "surfactants": [it.ingredient_id or it.name for it in members], "proposed": proposed,
        "target_hlb": hlb_display(target) if target is not None else None, "hlb_reached": hlb_display(mean.figure),
        "hlb_range": {"low": hlb_display(mean.low), "high": hlb_display(mean.high)}, "total_percent_w_w": total,
        "basis": basis, "minimum_estimate_g_per_100g": estimate, "_mean": mean.figure,
    }
    if proposed:
        f.warnings.append({"code": "pair_proposed", "subject": ", ".join(info["surfactants"][:2]),
                           "message": f"the service chose the pair {info['surfactants'][0]} / {info['surfactants'][1]} by its ranking rule; "
                                      "confirm the choice suits the product"})
    return new_rows, info


def _solved(target: float, total: float, pair_hlb, fixed_pct, fixed_hlb):
    """The pair's and the fixed surfactants' fractions of the system, and the mean reached."""
    if total <= sum(fixed_pct):
        raise invalid(("emulsifier",), "room_for_pair", f"the fixed surfactants take {sum(fixed_pct):g} % w/w, all of the {total:g} % emulsifier system")
    try:
        solved = split_for_target(target, pair_hlb, [(p / total, h) for p, h in zip(fixed_pct, fixed_hlb)])
    except CalculationError as exc:
        raise CalculationError(("emulsifier",) + exc.path, exc.rule, exc.message, **exc.extra) from None
    return solved.fractions, solved.hlb


def _surfactant_density(f: Formula, pair, pair_hlb, target: float) -> float:
    spec = f.spec["minimum_estimate"]
    if "surfactant_density" in spec:
        return checked_density(spec["surfactant_density"], ESTIMATE + ("surfactant_density",))
    x_high = (target - pair_hlb[0].figure) / (pair_hlb[1].figure - pair_hlb[0].figure)
    pair_rows = [Row(it, "emulsifier", "emulsifier", percent=p, path=it.path) for it, p in zip(pair, (1 - x_high, x_high))]
    try:
        return _phase_density(pair_rows, f, ("emulsifier", "pair"))
    except CalculationError as exc:
        raise invalid(ESTIMATE + ("surfactant_density",), "density_needed",
                      "the surfactants' densities are not all known: give surfactant_density") from exc


def _dispersed_density(f: Formula) -> float:
    spec = f.spec["minimum_estimate"]
    if "dispersed_phase_density" in spec:
        return checked_density(spec["dispersed_phase_density"], ESTIMATE + ("dispersed_phase_density",))
    dispersed = [r for r in f.rows if r.phase == DISPERSED[f.data["emulsion_type"]]]
    if any(r.percent is None for r in dispersed):
        raise invalid(ESTIMATE + ("dispersed_phase_density",), "density_needed",
                      "the dispersed phase holds the q.s. vehicle: give dispersed_phase_density")
    try:
        return _phase_density(dispersed, f, ("ingredients",))
    except CalculationError as exc:
        raise invalid(ESTIMATE + ("dispersed_phase_density",), "density_needed",
                      "the dispersed phase's densities are not all known: give dispersed_phase_density") from exc


def _sized(f: Formula, constant_g: float, margin: float):
    """The estimate plus its margin. When the q.s. vehicle is in the continuous
    phase, the emulsifier's share comes out of it (the core solves for that)."""
    continuous = CONTINUOUS[f.data["emulsion_type"]]
    qs_row = next(r for r in f.rows if r.role == "qs")
    if qs_row.phase == continuous:
        sized = sized_with_margin(constant_g, margin, 100.0 - sum(r.percent for r in f.rows if r.role != "qs" and r.phase != continuous), True)
    else:
        sized = sized_with_margin(constant_g, margin, sum(r.percent for r in f.rows if r.phase == continuous), False)
    if not 0.0 < sized.continuous_percent < 100.0:
        raise invalid(("ingredients",), "continuous_phase_share", f"the continuous phase would be {sized.continuous_percent:g} % of the emulsion")
    return sized


def _minimum_total(f: Formula, rhlb, pair, pair_hlb, target: float) -> tuple[float, float, str]:
    """Emulsifier % w/w from the minimum estimate plus a margin, the estimate,
    and the basis as the answer states it."""
    spec = f.spec["minimum_estimate"]
    margin = spec.get("margin_percent", DEFAULT_ESTIMATE_MARGIN_PERCENT) / 100.0
    # Both densities looked up before either is refused, so that both faults are named at once.
    faults = Faults()
    rho_s, rho_d = faults.run(_surfactant_density, f, pair, pair_hlb, target), faults.run(_dispersed_density, f)
    faults.raise_any()
    # On the required HLB as printed (its domain checked by the core).
    try:
        constant_g = constant_part(rho_s, rho_d, hlb_display(rhlb.required_hlb.figure))
    except CalculationError as exc:
        raise invalid(("ingredients",), exc.rule, f"the oil phase's required HLB is outside the estimate's domain: {exc.message}") from None
    sized = _sized(f, constant_g, margin)
    estimate = sized.estimate_g_per_100g
    usual_high = usual_emulsifier_high_percent(f.registry)
    try:
        finding = plausibility_finding(estimate, usual_high, ESTIMATE)
        total = ceil_to(sized.total_percent, 0.1)
        _, ceiling = estimate_limits(usual_high)
        if total > ceiling:
            raise CalculationError(ESTIMATE + ("margin_percent",), "estimate_plausible",
                                   f"the estimate plus its margin is {total:g} % w/w, above the ceiling of {ceiling:g} %: it cannot be a formula")
    except CalculationError as exc:
        raise invalid(exc.path, exc.rule, exc.message) from None
    f.warnings.append({"code": "unpublished_method", "subject": "method", "message": UNPUBLISHED_METHOD})
    f.warnings.append({"code": "estimate_insensitive_to_oil_load", "subject": "method", "message": OIL_LOAD_NOTE})
    f.warnings.extend(finding_warnings([finding]))
    margin_text = f"a {margin * 100:g} % margin" + ("" if "margin_percent" in spec else " (the default margin; give margin_percent to choose another)")
    return total, estimate, f"minimum estimate {estimate:.2f} g per 100 g plus {margin_text}, rounded up to 0.1 %"
