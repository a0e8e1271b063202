"""The required-HLB test series: planning it, and reading its results."""
from __future__ import annotations

from registry import Registry
from service.usecases import methods
from service.usecases.answers import envelope, hlb_display, unrounded, finding_warnings
from service.core.amounts import Amount, weigh
from service.core.batch import rows_for_batch
from service.core.errors import CalculationError
from service.core.findings import phase_volume_findings
from service.core.series import Estimate, estimate_from_pass_fail, estimate_from_scores, finer_series, plan_points
from service.usecases.measuring import equipment_from, equipment_out, Row, measure_row, row_density
from service.usecases.provenance import ValuesUsed
from service.usecases.resolution import enforce_strict, required_value, check_references, resolve
from service.units import to_canonical
from service.core.phases import CONTINUOUS

DEFAULT_PROPORTION_STEP_PERCENT = 10.0
# The vehicle a test emulsion is made up with when the request names none.
DEFAULT_AQUEOUS_VEHICLE = "purified-water"


def plan(data: dict, registry: Registry, strict: bool = False) -> dict:
    check_references(data, registry)
    values_used = ValuesUsed()
    pair = [resolve(p, ("pair", i), registry) for i, p in enumerate(data["pair"])]
    hlbs = [required_value(it, "hlb", "hlb", registry, values_used, "HLB") for it in pair]
    if hlbs[0].figure > hlbs[1].figure:
        pair, hlbs = pair[::-1], hlbs[::-1]
    oil = [resolve(c, ("oil_phase", i), registry) for i, c in enumerate(data["oil_phase"])]
    shares = weigh([Amount(*to_canonical(c["amount"]["value"], c["amount"]["unit"])) for c in data["oil_phase"]],
                   [None] * len(oil), ("oil_phase",))
    total_share = sum(s.weight for s in shares)
    vehicle = resolve(data.get("vehicle", {"ingredient": DEFAULT_AQUEOUS_VEHICLE}), ("vehicle",), registry)
    enforce_strict(values_used, strict)
    low, high = hlbs[0].figure, hlbs[1].figure
    r = data.get("hlb_range", {"low": low, "high": high})
    step_hlb = data.get("step_hlb")
    proportion = None if step_hlb is not None else data.get("proportion_step_percent", DEFAULT_PROPORTION_STEP_PERCENT) / 100.0
    points = plan_points(low, high, r["low"], r["high"], step_hlb, proportion)
    balance, graduates, defaults = equipment_from(data.get("equipment", {}))
    batch_g = to_canonical(data["test_batch"]["value"], data["test_batch"]["unit"])[1]
    oil_pct, em_pct = data["oil_percent"], data["emulsifier_percent"]
    if oil_pct + em_pct >= 100.0:
        raise CalculationError(("emulsifier_percent",), "room_for_vehicle", "oil and emulsifier leave nothing for the vehicle")
    tests = []
    # The same ingredient has the same density in every test, and a row of the
    # same mass (the oils, often the vehicle) is measured the same way: each
    # is worked out once for the series, not once a test.
    densities: dict[int, float | None] = {}
    measured: dict[tuple, tuple[dict, list[dict]]] = {}
    for n, point in enumerate(points, 1):
        rows = [Row(it, "oil", "ingredient", percent=oil_pct * s.weight / total_share, path=it.path) for it, s in zip(oil, shares)]
        for it, share in zip(pair, (1.0 - point.share_high, point.share_high)):
            if share > 1e-12:  # a surfactant with no share is simply left out of that test
                rows.append(Row(it, "emulsifier", "emulsifier", percent=em_pct * share, path=it.path))
        rows.append(Row(vehicle, CONTINUOUS[data["emulsion_type"]], "qs", percent=100.0 - oil_pct - em_pct, path=("vehicle",)))
        masses = rows_for_batch([row.percent for row in rows], batch_g, len(rows) - 1, balance.readability_g)
        out_rows = []
        for row, m in zip(rows, masses):
            key = (id(row.item), row.role, row.phase, m.mass_g_unrounded, m.mass_g)
            if key not in measured:
                if id(row.item) not in densities:
                    densities[id(row.item)] = (row_density(row, registry, values_used, strict)
                                               if row.item.physical_state in ("liquid", None) else None)
                measure, checks, _ = measure_row(row, m, densities[id(row.item)], balance, graduates)
                measured[key] = measure, [{"code": k.code, "ok": k.ok, "message": k.message} for k in checks]
            # Shared between tests until the envelope, which builds the answer afresh.
            measure, checks = measured[key]
            out_rows.append({"ingredient": row.item.ingredient_id, "name": row.item.name, "role": row.role, "percent_w_w": m.percent_w_w,
                             "mass_g_unrounded": m.mass_g_unrounded, "mass_g": m.mass_g, "rounding_error_percent": m.rounding_error_percent,
                             "measure": measure, "checks": checks})
        tests.append({"test": n, "hlb": round(point.hlb, 4), "percent_high_in_blend": point.share_high * 100.0, "rows": out_rows,
                      "all_measurable": all(k["ok"] for row in out_rows for k in row["checks"])})
    # Densities are not known for every oil tried here: the share is by mass.
    warnings = finding_warnings(phase_volume_findings(oil_pct / 100.0 if data["emulsion_type"] == "O/W" else 1.0 - (oil_pct + em_pct) / 100.0,
                                                      "by mass"))
    bad = [t["test"] for t in tests if not t["all_measurable"]]
    if bad:
        warnings.append({"code": "not_all_measurable", "subject": ", ".join(map(str, bad)),
                         "message": f"test(s) {', '.join(map(str, bad))} hold an amount the equipment cannot measure as planned: "
                                    "see each row's checks (a larger test batch, an aliquot, or a finer balance)"})
    result = {"pair": [it.ingredient_id or it.name for it in pair], "pair_hlb": {"low": low, "high": high}, "tests": tests,
              "test_batch_mass_g": batch_g,
              "equipment": equipment_out(balance, graduates, defaults)}
    return envelope(result, {"request": data}, methods.SERIES_PLAN, values_used, warnings, registry,
                    strict=strict, extra_cautions=methods.WORKSHEET_CAUTIONS)


def observation_kind(data: dict) -> str:
    """Which observation the series' tests carry: mean_droplet_um, score or
    passed (the same in every test, by the request's rules; the first of
    these that the tests give, when a test gives several)."""
    first = data["tests"][0]
    return next(k for k in ("mean_droplet_um", "score", "passed") if k in first)


def estimate_of(data: dict) -> Estimate:
    """The required-HLB estimate from the request's tests alone."""
    tests, kind = data["tests"], observation_kind(data)
    hlbs = [t["hlb"] for t in tests]
    if kind == "mean_droplet_um":
        return estimate_from_scores(hlbs, [-t["mean_droplet_um"] for t in tests], "droplet_size")
    if kind == "score":
        sign = 1.0 if data.get("higher_score_is_better", True) else -1.0
        return estimate_from_scores(hlbs, [sign * t["score"] for t in tests], "score")
    return estimate_from_pass_fail(hlbs, [t["passed"] for t in tests])


def evaluate(data: dict, registry: Registry, strict: bool = False) -> dict:
    check_references(data, registry)
    tests = data["tests"]
    values_used = ValuesUsed()
    pair_hlbs = None
    if "pair" in data:
        pair = [resolve(p, ("pair", i), registry) for i, p in enumerate(data["pair"])]
        pair_hlbs = sorted(required_value(it, "hlb", "hlb", registry, values_used, "HLB").figure for it in pair)
        if pair_hlbs[0] == pair_hlbs[1]:
            raise CalculationError(("pair",), "pair_hlbs_differ", "the pair's two HLBs must differ")
        enforce_strict(values_used, strict)
    hlbs = [t["hlb"] for t in tests]
    est = estimate_of(data)
    ordered = sorted(hlbs)
    step = min(b - a for a, b in zip(ordered, ordered[1:]))
    reach = {"low": pair_hlbs[0], "high": pair_hlbs[1]} if pair_hlbs else data.get("pair_hlb_range", {"low": 0.0, "high": 60.0})
    nxt = finer_series(est, step, reach["low"], reach["high"])
    shares = [(h - pair_hlbs[0]) / (pair_hlbs[1] - pair_hlbs[0]) * 100.0 for h in nxt] if pair_hlbs else None
    warnings = []
    if not est.bracketed:
        warnings.append({"code": "optimum_not_bracketed", "subject": None, "message": est.note})
    result = {"required_hlb": hlb_display(est.estimate_hlb), "required_hlb_unrounded": unrounded(est.estimate_hlb),
              "best_test_hlb": est.best_hlb, "basis": est.basis, "refined": est.refined, "bracketed": est.bracketed,
              "uncertainty_hlb": unrounded(est.uncertainty_hlb), "note": est.note, "next_series_hlb": nxt,
              "next_series_percent_high_in_blend": shares}
    return envelope(result, {"request": data}, methods.SERIES_EVALUATE, values_used, warnings, registry, strict=strict)
