"""The amounts actually weighed or measured for a batch, checked against its
worksheet: each row's deviation from its target against the equipment's
acceptable error, the rows not taken, the batch total and its yield, and
whether the record may go to the checking pharmacist. Nothing is stored.

check_amounts_taken works on a worksheet answer's `result` alone (what a
compounding record keeps); amounts_taken is the endpoint's use case, which
recomputes the worksheet from its request and never trusts figures sent back."""
from __future__ import annotations

from registry import Registry
from service.core.deviations import Deviation, deviation, mass_g_from_volume, volume_ml_from_mass, yield_percent
from service.units import to_canonical
from service.usecases import methods
from service.usecases.answers import envelope, tidy
from service.usecases.resolution import Faults, invalid
from service.usecases.worksheet import nested_worksheet_parts

# How the worksheet says a row is measured by volume; every other row is weighed.
BY_VOLUME = ("graduate", "pipette_or_syringe")


def _label(row: dict) -> str:
    return row["ingredient"] or f"inline '{row['name']}'"


def _density_g_per_ml(row: dict) -> float | None:
    """The density the worksheet used for the row (its unrounded mass over
    the volume it gave it), or None where it knew none."""
    volume_ml = row.get("volume_ml")
    return row["mass_g_unrounded"] / volume_ml if volume_ml else None


def _row_named(rows: list[dict], t: dict, path: tuple, seen: dict[int, int]) -> int:
    """The index of the row an amount names: one the worksheet has, not named
    before, with its own ingredient where one is given; else refused."""
    r = t["row"]
    if not 0 <= r < len(rows):
        raise invalid(path + ("row",), "taken_row_exists", f"the worksheet has rows 0 to {len(rows) - 1}; there is no row {r}")
    if r in seen:
        raise invalid(path + ("row",), "taken_row_once", f"row {r} ({_label(rows[r])}) already has an amount, at taken/{seen[r]}: record each row once")
    seen[r] = path[-1]
    if "ingredient" in t and t["ingredient"] != rows[r]["ingredient"]:
        raise invalid(path + ("ingredient",), "taken_ingredient_matches_row",
                      f"row {r} is {_label(rows[r])}, not '{t['ingredient']}': is the list in the worksheet's order?")
    return r


def _in_row_unit(row: dict, given: dict, path: tuple) -> tuple[float, float, float | None]:
    """(the amount in the unit the row is measured in, its mass in g, the
    density it was converted with or None). Refuses a conversion the row's
    density cannot make."""
    kind, value = to_canonical(given["value"], given["unit"])
    by_volume = row["measure"]["how"] in BY_VOLUME
    density = _density_g_per_ml(row)
    if kind == ("volume" if by_volume else "mass"):
        return value, (mass_g_from_volume(value, density) if by_volume else value), None
    if density is None:
        # Only a weighed row can lack a density: the worksheet measures by volume only where it knows one.
        if row["physical_state"] in ("solid", "semisolid"):
            raise invalid(path + ("unit",), "solids_by_weight",
                          f"row {_label(row)} is a {row['physical_state']}: it is weighed, never measured by volume; give the mass taken")
        raise invalid(path, "density_needed_for_volume",
                      f"no density is known for {_label(row)}, so a volume cannot be compared with its mass: give the mass taken")
    if kind == "volume":
        mass_g = mass_g_from_volume(value, density)
        return mass_g, mass_g, density
    return volume_ml_from_mass(value, density), value, density


def _tolerance_check(d: Deviation, unit: str) -> dict:
    if d.within:
        message = (f"{d.taken:.6g} {unit} taken for {d.target_unrounded:.6g} {unit} ({d.percent:+.3f} %), "
                   f"within the allowed {d.allowed_percent:g} %")
    else:
        message = (f"{d.taken:.6g} {unit} taken is {d.percent:+.3f} % off the {d.target_unrounded:.6g} {unit} the worksheet asks for, "
                   f"beyond the allowed {d.allowed_percent:g} %: correct the amount before going on, or have the pharmacist judge the deviation")
    return {"code": "taken_within_tolerance", "ok": d.within, "message": message}


def _weighable_check(mass_g: float, balance: dict) -> dict:
    mwq = balance["minimum_weighable_quantity_g"]
    if mass_g >= mwq:
        return {"code": "taken_at_least_minimum_weighable", "ok": True,
                "message": f"{mass_g:.6g} g is at or above the balance's minimum weighable quantity, {mwq:g} g"}
    return {"code": "taken_at_least_minimum_weighable", "ok": False,
            "message": f"{mass_g:.6g} g is below the balance's minimum weighable quantity of {mwq:g} g: a single weighing that small is not "
                       f"accurate to {balance['acceptable_error_percent']:g} %; record the aliquot weighings the worksheet works out, or use a finer balance"}


def _row_out(r: int, row: dict, given: dict, path: tuple, balance: dict) -> dict:
    by_volume = row["measure"]["how"] in BY_VOLUME
    unit = "mL" if by_volume else "g"
    target = row["volume_ml"] if by_volume else row["mass_g_unrounded"]
    displayed = row["measure"]["volume_ml_rounded"] if by_volume else row["mass_g"]
    taken, mass_g, density = _in_row_unit(row, given, path)
    allowed = balance["acceptable_error_percent"]
    d = deviation(target, taken, allowed, path)
    checks = [_tolerance_check(d, unit)]
    if to_canonical(given["value"], given["unit"])[0] == "mass":
        # Weighed on the balance, whatever the worksheet planned: its minimum weighable quantity applies.
        checks.append(_weighable_check(mass_g, balance))
    return {"row": r, "ingredient": row["ingredient"], "name": row["name"], "role": row["role"], "how": row["measure"]["how"],
            "unit": unit, "target_unrounded": target, "target_displayed": displayed, "taken": taken,
            "taken_as_given": {"value": given["value"], "unit": given["unit"]}, "taken_mass_g": mass_g,
            "converted_with_density_g_per_ml": density, "deviation": d.deviation, "deviation_percent": d.percent,
            "allowed_percent": allowed, "checks": checks}


def _final_weight(batch_g: float, final_g: float | None, tolerance_percent: float | None, balance: dict, taken_g: float) -> tuple[dict, list[dict]]:
    tolerance = balance["acceptable_error_percent"] if tolerance_percent is None else tolerance_percent
    totals = {"batch_mass_g": batch_g, "taken_mass_g": taken_g, "final_weight_g": final_g, "yield_percent": None,
              "final_weight_deviation_g": None, "final_weight_deviation_percent": None, "tolerance_percent": tolerance,
              "tolerance_from": "the request" if tolerance_percent is not None else "the balance's acceptable error (the default)"}
    if final_g is None:
        return totals, []
    d = deviation(batch_g, final_g, tolerance, ("final_weight",))
    totals.update(yield_percent=yield_percent(final_g, batch_g, ("final_weight",)), final_weight_deviation_g=d.deviation,
                  final_weight_deviation_percent=d.percent)
    message = (f"the finished preparation weighs {final_g:.6g} g for a batch of {batch_g:.6g} g: yield {totals['yield_percent']:.2f} %, "
               f"{d.percent:+.3f} % {'within' if d.within else 'beyond'} the tolerance of {tolerance:g} %")
    if not d.within:
        message += ": find where the difference went (losses on heating, a row missed or doubled) before the batch goes on"
    return totals, [{"code": "final_weight_within_tolerance", "ok": d.within, "message": message, "subject": None}]


def check_amounts_taken(worksheet_result: dict, taken: list[dict], final_weight_g: float | None, tolerance_percent: float | None) -> dict:
    """The amounts taken against `worksheet_result` (a worksheet answer's
    `result`). `taken`: items {row, ingredient?, amount: {value, unit}} as
    the request gives them, pointed at as taken/i; `final_weight_g` the
    finished preparation in g or None; `tolerance_percent` for the final
    weight, None for the balance's acceptable error. Raises InvalidInput with
    every fault of the amounts at once."""
    rows, balance = worksheet_result["rows"], worksheet_result["equipment"]["balance"]
    faults, seen, out = Faults(), {}, []
    # Every fault of every amount is refused together, in the order of the list.
    for i, t in enumerate(taken):
        r = faults.run(_row_named, rows, t, ("taken", i), seen)
        if r is not None:
            out.append(faults.run(_row_out, r, rows[r], t["amount"], ("taken", i, "amount"), balance))
    faults.raise_any()
    out.sort(key=lambda x: x["row"])
    done = {x["row"] for x in out}
    not_taken = [{"row": r, "ingredient": row["ingredient"], "name": row["name"]} for r, row in enumerate(rows) if r not in done]
    checks = [{"code": "every_row_taken", "ok": not not_taken, "message": "every row of the worksheet has an amount taken" if not not_taken else
               f"{len(not_taken)} row(s) have no amount taken: " + ", ".join(f"row {x['row']} ({_label(rows[x['row']])})" for x in not_taken),
               "subject": None}]
    totals, final_checks = _final_weight(worksheet_result["batch_mass_g"], final_weight_g, tolerance_percent, balance,
                                         sum(x["taken_mass_g"] for x in out))
    checks += final_checks
    reasons = [f"row {x['row']} ({_label(rows[x['row']])}): {k['message']}" for x in out for k in x["checks"] if not k["ok"]]
    reasons += [k["message"] for k in checks if not k["ok"]]
    return {"rows": out, "not_taken": not_taken, "totals": totals, "checks": checks,
            "worksheet_checks_failed": worksheet_result["checks_failed"], "may_pass_to_checker": not reasons, "reasons": reasons}


def taken_warnings(result: dict) -> list[dict]:
    """What a pharmacist must read in an amounts-taken result: each failed
    check, the conversions made with a density, and the worksheet's own failures."""
    out = [{"code": f"check_{k['code']}", "subject": x["ingredient"] or x["name"], "message": k["message"]}
           for x in result["rows"] for k in x["checks"] if not k["ok"]]
    out += [{"code": f"check_{k['code']}", "subject": k["subject"], "message": k["message"]} for k in result["checks"] if not k["ok"]]
    converted = [x for x in result["rows"] if x["converted_with_density_g_per_ml"] is not None]
    if converted:
        out.append({"code": "taken_converted_with_density", "subject": ", ".join(x["ingredient"] or x["name"] for x in converted),
                    "message": "amount(s) given in another measure than the row's were converted with the density the worksheet used: "
                               + "; ".join(f"row {x['row']} ({x['name']}) {x['taken_as_given']['value']:g} {x['taken_as_given']['unit']} at "
                                           f"{x['converted_with_density_g_per_ml']:.6g} g/mL is {x['taken']:.6g} {x['unit']}" for x in converted)})
    if result["worksheet_checks_failed"]:
        out.append({"code": "worksheet_checks_failed", "subject": None,
                    "message": f"the worksheet itself has {result['worksheet_checks_failed']} failed check(s) (POST /v1/worksheets shows them): "
                               "they concern the plan, and the pharmacist must have resolved them; they are not repeated here"})
    return out


def amounts_taken(data: dict, registry: Registry, strict: bool = False) -> dict:
    """The answer to POST /v1/worksheets/amounts-taken: the worksheet is
    recomputed from its request, then the amounts are checked against it."""
    sheet = nested_worksheet_parts(data["worksheet"], registry, strict)
    final = data.get("final_weight")
    final_g = to_canonical(final["value"], final["unit"])[1] if final else None
    result = check_amounts_taken(tidy(sheet.result), data["taken"], final_g, data.get("final_weight_tolerance_percent"))
    return envelope(result, {"request": data}, methods.AMOUNTS_TAKEN, sheet.values_used, taken_warnings(result), registry,
                    strict=strict, extra_cautions=methods.AMOUNTS_TAKEN_CAUTIONS)


__all__ = ["amounts_taken", "check_amounts_taken", "taken_warnings"]
