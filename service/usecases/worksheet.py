"""The batch worksheet end to end: from a formula and a batch size to every
quantity to weigh or measure, checked against the equipment. No Flask here."""
from __future__ import annotations

import copy
from dataclasses import dataclass, field

from registry import Registry
from service.usecases import methods
from service.usecases.answers import envelope, hlb_display, hlb_span_display, unrounded, apparent_hlb_warning, finding_warnings
from service.core import findings as core_findings
from service.core.amounts import Amount
from service.core.batch import mixture_mass_for_volume, qs_percent, rows_for_batch
from service.core.errors import CalculationError, FaultList
from service.core.measure import capacity_check
from service.usecases.oil_phase import oil_phase_hlb
from service.usecases.measuring import equipment_from, equipment_out, found_density, Row, measure_row, row_density
from service.usecases.provenance import ValuesUsed
from service.usecases.resolution import Faults, check_references, enforce_strict, hlb_ranges, invalid, resolve
from service.core.phases import DISPERSED
from service.usecases.emulsifier_system import Formula, emulsifier_rows
from service.usecases.heating import worksheet_heating
from service.units import from_canonical, to_canonical

# A blend of fixed surfactants within this of the required HLB is taken to
# match it (common practice, no source).
HLB_MATCH_TOLERANCE = 1.0


@dataclass
class Computed:
    rows: list[Row]
    batch_mass_g: float
    batch_volume_ml: float | None
    rhlb: object
    emulsifier: dict
    values_used: ValuesUsed = field(default_factory=ValuesUsed)
    warnings: list = field(default_factory=list)
    checks: list = field(default_factory=list)


def _share_percent(row: Row, share: dict, registry: Registry, batch_mass_g: float | None, values_used: ValuesUsed) -> float:
    """A row's share as % w/w of the formula; refuses a share it cannot be."""
    item, path = row.item, row.path
    kind, value = to_canonical(share["value"], share["unit"])
    if kind == "volume" and item.physical_state in ("solid", "semisolid"):
        raise invalid(path + ("share", "unit"), "solids_by_weight", f"{item.label} is a {item.physical_state}: give it as a mass or % w/w, never a volume")
    if kind == "percent_w_w":
        return value
    if kind == "parts":
        raise invalid(path + ("share", "unit"), "share_basis", "a worksheet share is % w/w of the formula or an amount for the batch, not parts")
    if batch_mass_g is None:
        raise invalid(path + ("share", "unit"), "share_basis", "with a batch given as a volume, give every share as % w/w")
    if kind == "volume":
        density = row_density(row, registry, values_used)
        if density is None:
            raise invalid(path + ("share",), "density_needed_for_volume", f"no density is known for {item.label}: give it with 'density', or give a mass")
        value = value * density
    return value / batch_mass_g * 100.0


def _formula_rows(data: dict, registry: Registry, batch_mass_g: float | None, values_used: ValuesUsed) -> list[Row]:
    """The formula's own rows with their % w/w (None for the q.s. vehicle).
    Every row's fault is refused with the others', not the first alone."""
    rows, faults = [], Faults()
    for i, x in enumerate(data["ingredients"]):
        path = ("ingredients", i)
        item = resolve(x, path, registry)
        row = Row(item, x["phase"], "qs" if x.get("qs") else "ingredient", path=path)
        if "share" in x:
            row.percent = faults.run(_share_percent, row, x["share"], registry, batch_mass_g, values_used)
        rows.append(row)
    qs = [r for r in rows if r.role == "qs"]
    if len(qs) > 1:
        faults.add(("ingredients",), "one_qs_vehicle", f"at most one ingredient may be the q.s. vehicle (found {len(qs)})")
    faults.raise_any()
    return rows


def _oil_phase(data: dict, rows: list[Row], registry: Registry, values_used: ValuesUsed):
    oil = [(r, data["ingredients"][r.path[1]]) for r in rows if r.phase == "oil"]
    if not oil:
        raise invalid(("ingredients",), "has_oil_phase", "an emulsion needs at least one oil-phase ingredient")
    qs_oil = next((r for r, _ in oil if r.role == "qs"), None)
    if qs_oil is not None and qs_oil.percent is None:
        raise invalid(qs_oil.path + ("qs",), "qs_oil_needs_total",
                      "an oily q.s. vehicle weighs in the required HLB, so its share must be known first: give the emulsifier "
                      "as total_percent_w_w (or fixed surfactants), not as a minimum estimate")
    counts = [x.get("counts_toward_rhlb", True) for _, x in oil]
    try:
        phase = oil_phase_hlb([r.item for r, _ in oil], [Amount("percent_w_w", r.percent) for r, _ in oil], counts, data["emulsion_type"],
                              registry, values_used, strict=False)
        return phase, sum(r.percent for r, _ in oil)
    except CalculationError as exc:
        # The core names the oil phase's own index; point at the ingredient.
        where = oil[exc.path[1]][0].path if len(exc.path) > 1 else ("ingredients",)
        raise invalid(where, exc.rule, exc.message) from None


def _oily_qs_share(data: dict, rows: list[Row]) -> None:
    """An oily q.s. vehicle (a W/O base made up with its oil) is part of the
    oil phase whose required HLB decides the emulsifier; its share is known
    up front when the emulsifier's total is."""
    qs = next((r for r in rows if r.role == "qs"), None)
    spec = data["emulsifier"]
    if qs is None or qs.phase != "oil":
        return
    if "pair" in spec or "propose" in spec:
        if "total_percent_w_w" not in spec:
            return  # refused in _oil_phase, with the reason
        total = spec["total_percent_w_w"]
    else:
        total = sum(f["percent_w_w"] for f in spec.get("fixed", []))
    qs.percent = qs_percent([r.percent for r in rows] + [total], rows.index(qs), qs.path)


# A formula stated in full, with no q.s. vehicle, must add up to 100 % w/w
# within this: shares written to two decimals may leave a hundredth over.
FORMULA_TOTAL_TOLERANCE_PERCENT = 0.01


def _check_adds_up(rows: list[Row]) -> None:
    total = sum(r.percent for r in rows)
    if abs(total - 100.0) > FORMULA_TOTAL_TOLERANCE_PERCENT:
        raise invalid(("ingredients",), "formula_adds_up",
                      f"with no q.s. vehicle the shares, emulsifier included, must add up to 100 % w/w; they add up to {total:.6g} %: "
                      "mark the vehicle q.s., or correct the shares")


def residue_row(rows: list[Row]) -> int:
    """The row that takes the rounding residue: the q.s. vehicle, or, in a
    formula stated in full, its largest share."""
    qs_i = next((i for i, r in enumerate(rows) if r.role == "qs"), None)
    return qs_i if qs_i is not None else max(range(len(rows)), key=lambda i: rows[i].percent)


def compute(data: dict, registry: Registry, strict: bool) -> Computed:
    values_used = ValuesUsed()
    warnings: list[dict] = []
    b_kind, b_value = to_canonical(data["batch"]["value"], data["batch"]["unit"])
    batch_mass = b_value if b_kind == "mass" else None
    rows = _formula_rows(data, registry, batch_mass, values_used)
    _oily_qs_share(data, rows)
    rhlb, _ = _oil_phase(data, rows, registry, values_used)
    new_rows, info = emulsifier_rows(Formula(data, rows, registry, strict, values_used, warnings), rhlb)
    all_rows = list(rows)
    # Emulsifier rows go after the oil phase they serve: before the first
    # non-oil row, or at the end.
    insert_at = max((i + 1 for i, r in enumerate(all_rows) if r.phase == "oil"), default=len(all_rows))
    all_rows[insert_at:insert_at] = new_rows
    qs_i = next((i for i, r in enumerate(all_rows) if r.role == "qs"), None)
    if qs_i is not None:
        all_rows[qs_i].percent = qs_percent([r.percent for r in all_rows], qs_i, all_rows[qs_i].path)
    else:
        _check_adds_up(all_rows)
    batch_volume = None
    if batch_mass is None:
        batch_volume = b_value
        densities = [row_density(r, registry, values_used) for r in all_rows]
        faults = Faults()
        for r, d in zip(all_rows, densities):
            if d is None:
                faults.add(r.path, "density_needed_for_volume",
                           f"a batch given as a volume needs every component's density; none is known for {r.item.label}: "
                           "give it with 'density', or give the batch as a mass")
        faults.raise_any()
        batch_mass = mixture_mass_for_volume(b_value, [r.percent / 100.0 for r in all_rows], densities, ("ingredients",))
    enforce_strict(values_used, strict)
    return Computed(all_rows, batch_mass, batch_volume, rhlb, info, values_used, warnings)


def _display(value: float, token: str) -> dict:
    return {"value": float(f"{from_canonical(value, token):.6g}"), "unit": token}


def _global_checks(data, c: Computed, registry: Registry) -> list[dict]:
    out = []
    etype = data["emulsion_type"]
    reached = c.emulsifier["_mean"]
    finding = core_findings.usual_range_finding(reached, etype, hlb_ranges(registry))
    low, high = hlb_ranges(registry)[core_findings.RANGE_FOR_EMULSION_TYPE[etype]]
    out.append({"code": "hlb_suits_emulsion_type", "ok": finding is None, "message": finding.message if finding else f"blend HLB {reached:.1f} lies in the range usual for {etype} emulsifiers, {low:g} to {high:g}",
                "subject": "emulsifier"})
    # Against the required HLB as printed, which is what the pair was solved for.
    required = hlb_display(c.rhlb.required_hlb.figure)
    diff = reached - required
    out.append({"code": "blend_matches_required_hlb", "ok": abs(diff) <= HLB_MATCH_TOLERANCE, "message": f"blend HLB {reached:.1f} against the oil phase's required HLB {required:.1f} (difference {diff:+.1f})",
                "subject": "emulsifier"})
    emulsifiers = [r for r in c.rows if r.role == "emulsifier"]
    classes = [r.item.ionic_class for r in emulsifiers] + [r.item.ionic_class for r in c.rows if r.role != "emulsifier" and r.item.ionic_class in ("anionic", "cationic")]
    ionic = core_findings.ionic_findings(classes)
    incompatible = [f for f in ionic if f.code == "ionic_incompatibility"]
    out.append({"code": "ionic_compatibility", "ok": not incompatible, "message": incompatible[0].message if incompatible else "no anionic and cationic ingredients are combined",
                "subject": None})
    levels = registry.emulsifier_levels
    for r in emulsifiers:
        level = levels.for_ingredient(r.item.ingredient_id) if levels and r.item.ingredient_id else None
        if level is None:
            continue
        lo, hi = level.alone if len(emulsifiers) == 1 else level.with_partner
        ok = lo <= r.percent <= hi
        out.append({"code": "emulsifier_level", "ok": ok, "message": f"{r.item.ingredient_id} at {r.percent:.2f} % w/w; usual for {level.family} {'alone' if len(emulsifiers) == 1 else 'with a partner'}: {lo:g} to {hi:g} % "
                               f"({levels.source_id}, {'recalled from memory, ' if levels.recalled_from_memory else ''}{levels.status})",
                    "subject": r.item.ingredient_id})
    return out


def _dispersed_fraction(data: dict, c: Computed, registry: Registry, strict: bool) -> tuple[float, str]:
    """The dispersed phase's volume fraction where every density is known
    (and, in strict mode, verified), else its mass fraction (said so in the
    basis). Densities used are recorded in values_used."""
    dispersed = DISPERSED[data["emulsion_type"]]
    inside = [r.phase == dispersed for r in c.rows]
    mass_fraction = sum(r.percent for r, d in zip(c.rows, inside) if d) / 100.0
    if any(found_density(r, registry) is None for r in c.rows):
        return mass_fraction, "by mass: not every density is known"
    densities = [row_density(r, registry, c.values_used, strict) for r in c.rows]
    if any(d is None for d in densities):
        return mass_fraction, "by mass: not every density is verified (strict mode)"
    volumes = [r.percent / d for r, d in zip(c.rows, densities)]
    return sum(v for v, d in zip(volumes, inside) if d) / sum(volumes), "by volume, volumes assumed additive"


def _row_out(row: Row, b, measure: dict, checks, volume, mass_unit: str, volume_unit: str) -> dict:
    return {
        "ingredient": row.item.ingredient_id, "name": row.item.name, "phase": row.phase, "role": row.role,
        "physical_state": row.item.physical_state, "percent_w_w": b.percent_w_w, "mass_g_unrounded": b.mass_g_unrounded,
        "mass_g": b.mass_g, "rounding_error_percent": b.rounding_error_percent,
        "mass": _display(b.mass_g, mass_unit), "volume_ml": volume,
        "volume": _display(volume, volume_unit) if volume is not None else None,
        "measure": measure, "checks": [{"code": k.code, "ok": k.ok, "message": k.message} for k in checks],
    }


@dataclass
class Sheet:
    """A worksheet's parts before the envelope: its result, the values used
    and the warnings, and the method that produced it."""

    result: dict
    values_used: ValuesUsed
    warnings: list
    method: methods.Method


def worksheet(data: dict, registry: Registry, strict: bool = False, rescaled_from: dict | None = None) -> dict:
    sheet = worksheet_parts(data, registry, strict, rescaled_from)
    return envelope(sheet.result, {"request": data}, sheet.method, sheet.values_used, sheet.warnings, registry,
                    strict=strict, extra_cautions=methods.WORKSHEET_CAUTIONS)


def worksheet_parts(data: dict, registry: Registry, strict: bool = False, rescaled_from: dict | None = None) -> Sheet:
    """The worksheet, for the answer and for the calls built on it (the
    amounts taken); every ingredient id is checked first."""
    check_references(data, registry)
    c = compute(data, registry, strict)
    balance, graduates, defaults = equipment_from(data.get("equipment", {}))
    units = data.get("output_units", {})
    mass_unit, volume_unit = units.get("mass", "g"), units.get("volume", "mL")
    qs_i = residue_row(c.rows)
    batch_rows = rows_for_batch([r.percent for r in c.rows], c.batch_mass_g, qs_i, balance.readability_g)
    out_rows = []
    for row, b in zip(c.rows, batch_rows):
        liquid = row.item.physical_state in ("liquid", None)
        density = row_density(row, registry, c.values_used, strict) if liquid else None
        measure, checks, volume = measure_row(row, b, density, balance, graduates)
        out_rows.append(_row_out(row, b, measure, checks, volume, mass_unit, volume_unit))
    total_mass = sum(b.mass_g for b in batch_rows)
    checks = _global_checks(data, c, registry)
    checks.append({"code": "totals_add_up", "ok": abs(total_mass - c.batch_mass_g) < 1e-6, "message": f"the masses add up to {total_mass:.6g} g for a batch of {c.batch_mass_g:.6g} g",
                   "subject": None})
    capacity = capacity_check(c.batch_mass_g, balance.capacity_g)
    checks.append({"code": "batch_within_balance_capacity", "ok": capacity.ok, "message": f"the whole batch, made up to weight: {capacity.message}",
                   "subject": None})
    fraction, basis = _dispersed_fraction(data, c, registry, strict)
    phase = core_findings.phase_volume_findings(fraction, basis)
    packing = next((f for f in phase if f.code == "dispersed_phase_above_packing_limit"), None)
    checks.append({"code": "dispersed_phase_volume", "ok": packing is None, "message": packing.message if packing else f"the dispersed phase is {fraction * 100:.1f} % of the emulsion ({basis}), "
                   f"below the {core_findings.MAX_PACKING_FRACTION * 100:.1f} % uniform spheres can fill",
                   "subject": "dispersed_phase"})
    warnings = c.warnings + finding_warnings(core_findings.ionic_findings([r.item.ionic_class for r in c.rows if r.role == "emulsifier"]))
    warnings += finding_warnings(f for f in phase if f is not packing)
    warnings += apparent_hlb_warning(r.item.label for r in c.rows if r.item.hlb_is_apparent)
    warnings += [{"code": f"check_{k['code']}", "subject": k["subject"], "message": k["message"]} for k in checks if not k["ok"]]
    for row in out_rows:
        for k in row["checks"]:
            if not k["ok"]:
                warnings.append({"code": f"check_{k['code']}", "subject": row["ingredient"] or row["name"], "message": k["message"]})
    if c.rows[qs_i].role != "qs":
        residue_g = batch_rows[qs_i].mass_g - batch_rows[qs_i].mass_g_unrounded
        warnings.append({"code": "rounding_residue_to_largest_share", "subject": c.rows[qs_i].item.ingredient_id or c.rows[qs_i].item.label,
                         "message": f"no q.s. vehicle: the rounding residue of the other rows, {residue_g:+.6g} g, is taken up by "
                                    f"{c.rows[qs_i].item.label}, the largest share, so that the masses add up to the batch"})
    processing, heating_warnings = worksheet_heating({"rows": out_rows}, registry, c.values_used, strict)
    warnings += heating_warnings
    failed = sum(not k["ok"] for k in checks) + sum(not k["ok"] for row in out_rows for k in row["checks"])
    emulsifier = {k: v for k, v in c.emulsifier.items() if not k.startswith("_")}
    result = {
        "emulsion_type": data["emulsion_type"], "batch_mass_g": c.batch_mass_g, "batch_volume_ml": c.batch_volume_ml,
        "checks_failed": failed,
        "oil_phase": {"required_hlb": hlb_display(c.rhlb.required_hlb.figure),
                      "required_hlb_unrounded": unrounded(c.rhlb.required_hlb.figure),
                      "range": {"low": hlb_display(c.rhlb.required_hlb.low), "high": hlb_display(c.rhlb.required_hlb.high)},
                      "range_with_doubtful": hlb_span_display(c.rhlb.range_with_doubtful),
                      "percent_w_w": sum(r.percent for r in c.rows if r.phase == "oil")},
        "dispersed_phase": {"fraction": fraction, "basis": basis},
        "emulsifier": emulsifier, "rows": out_rows,
        "processing_temperature_c": processing["temperature_c"], "processing_temperature": processing,
        "totals": {"percent_w_w": total_mass / c.batch_mass_g * 100.0, "mass_g": total_mass, "batch_mass_g": c.batch_mass_g},
        "equipment": equipment_out(balance, graduates, defaults),
        "checks": checks, "rescaled_from": rescaled_from,
    }
    method = methods.WORKSHEET_WITH_ESTIMATE if c.emulsifier["minimum_estimate_g_per_100g"] is not None else methods.WORKSHEET
    return Sheet(result, c.values_used, warnings, method)


def rescale(data: dict, registry: Registry, strict: bool = False) -> dict:
    """The worksheet for another batch size: every share is carried over as
    the % w/w it had in the original batch."""
    check_references(data, registry)
    original = data["worksheet"]
    c = compute(original, registry, strict)
    formula_rows = [r for r in c.rows if r.role != "emulsifier"]
    scaled = copy.deepcopy(original)
    for ingredient, row in zip(scaled["ingredients"], formula_rows):
        if "share" in ingredient:
            ingredient["share"] = {"value": row.percent, "unit": "% w/w"}
    scaled["batch"] = dict(data["batch"])
    return worksheet(scaled, registry, strict, rescaled_from=dict(original["batch"]))


def nested_worksheet_parts(data: dict, registry: Registry, strict: bool = False) -> Sheet:
    """The worksheet of a request's `worksheet` member (amounts taken, a
    compounding record), its refusals pointed at their place in that
    request: under /worksheet."""
    try:
        return worksheet_parts(data, registry, strict)
    except CalculationError as exc:
        raise CalculationError(("worksheet",) + exc.path, exc.rule, exc.message, **exc.extra) from None
    except FaultList as exc:
        faults = [{**f, "pointer": f["pointer"].replace("#/", "#/worksheet/", 1)} for f in exc.faults]
        raise type(exc)(faults, exc.detail.replace("#/", "#/worksheet/")) from None
