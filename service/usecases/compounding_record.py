"""The compounding record of an emulsion end to end: the worksheet, the
components with their lots and expiry dates, the beyond-use date, the
procedure, the label and the quality checks, and the required elements of
USP <795>'s records with what is still to fill. Computed where it can be;
left as fields to fill where only a person can fill them. No Flask here."""
from __future__ import annotations

from registry import Registry
from service.core.errors import UnverifiedValuesRefused
from service.core.procedure import heating, procedure
from service.usecases import methods, worksheet as worksheet_case
from service.usecases.amounts_taken import check_amounts_taken, taken_warnings
from service.usecases.answers import envelope, finding_warnings, tidy
from service.usecases.beyond_use import beyond_use_block, component_expiry, parse_day
from service.units import to_canonical
from service.usecases.heating import HEATING_CODES, cloud_point_warnings, hlb_by_row, processing_block, processing_row
from service.usecases.provenance import ValuesUsed, source_block
from service.usecases.record_parts import label, quality_checks, required_elements
from service.usecases.resolution import Faults, enforce_strict, invalid

ORAL_FORMS = ("emulsion",)


def _row_label(row: dict) -> str:
    return row["ingredient"] or row["name"]


def _match_components(data: dict, rows: list[dict], faults: Faults) -> dict[int, tuple[int, dict]]:
    """Each component entry matched to its worksheet row, by registry id or by
    an inline ingredient's name: {row index: (entry index, entry)}."""
    by_id = {r["ingredient"]: i for i, r in enumerate(rows) if r["ingredient"]}
    by_name = {r["name"].casefold(): i for i, r in enumerate(rows) if not r["ingredient"]}
    matched: dict[int, tuple[int, dict]] = {}
    labels = ", ".join(_row_label(r) for r in rows)
    for j, c in enumerate(data.get("components", [])):
        key = "ingredient" if "ingredient" in c else "name"
        i = by_id.get(c["ingredient"]) if key == "ingredient" else by_name.get(c["name"].casefold())
        if i is None:
            faults.add(("components", j, key), "component_in_worksheet",
                       f"'{c[key]}' is not a component of the worksheet; its components are: {labels}")
        elif i in matched:
            faults.add(("components", j, key), "one_entry_per_component",
                       f"'{c[key]}' is already given at components/{matched[i][0]}")
        else:
            matched[i] = (j, c)
    return matched


def _component_out(i: int, row: dict, entry: dict) -> dict:
    return {
        "row": i, "ingredient": row["ingredient"], "name": row["name"], "phase": row["phase"], "role": row["role"],
        "percent_w_w": row["percent_w_w"], "mass_g": row["mass_g"], "mass": row["mass"], "volume": row["volume"],
        "how": row["measure"]["how"], "supplier": entry.get("supplier"), "lot": entry.get("lot"), "expiry": entry.get("expiry"),
        "expiry_read_as": None, "active": bool(entry.get("active")), "preservative": bool(entry.get("preservative")),
    }


def _quantity_text(result: dict) -> str:
    if result["batch_volume_ml"] is not None:
        return f"{result['batch_volume_ml']:.6g} mL ({result['batch_mass_g']:.6g} g)"
    return f"{result['batch_mass_g']:.6g} g"


def _check_form(prep: dict) -> None:
    if prep["route"] == "oral" and prep["dosage_form"] not in ORAL_FORMS:
        raise invalid(("preparation", "dosage_form"), "dosage_form_suits_route",
                      f"a {prep['dosage_form']} is not an oral dosage form: give dosage_form 'emulsion' for an oral emulsion")


def record(data: dict, registry: Registry, strict: bool = False) -> dict:
    prep = data["preparation"]
    _check_form(prep)
    compounding = data["compounding"]
    compounded_on = parse_day(compounding["date"], ("compounding", "date"))
    sheet = worksheet_case.nested_worksheet_parts(data["worksheet"], registry, strict)
    result = tidy(sheet.result)
    rows = result["rows"]
    faults = Faults()
    matched = _match_components(data, rows, faults)
    faults.raise_any()
    final = data.get("final_weight")
    final_g = to_canonical(final["value"], final["unit"])[1] if final else None
    tolerance = data.get("final_weight_tolerance_percent")
    taken = check_amounts_taken(result, data["taken"], final_g, tolerance) if data.get("taken") else None

    # The record's procedure sets its own temperature (its components may go
    # in late): the worksheet's heating values and warnings give way to its.
    values_used = ValuesUsed()
    values_used.extend(v for v in sheet.values_used if v.property not in ("melting_range", "cloud_point"))
    hlbs = hlb_by_row(values_used)
    components, proc_rows = [], []
    for i, row in enumerate(rows):
        j, entry = matched.get(i, (None, {}))
        out = _component_out(i, row, entry)
        path = ("components", j) if j is not None else ("worksheet", "ingredients")
        out["label"] = row["name"]
        out["expiry_parsed"] = component_expiry(entry, row["name"], path) if j is not None else None
        components.append(out)
        proc_rows.append(processing_row(row, entry, registry, hlbs, values_used, ("worksheet", "result", "rows", i), strict))

    for_bud = [{"label": c["label"], "preservative": c["preservative"], "expiry": c["expiry_parsed"]} for c in components]
    bud = beyond_use_block(prep, compounded_on, for_bud, rows, registry)
    for c in components:
        parsed = c.pop("expiry_parsed")
        c.pop("label")
        c["expiry_read_as"] = parsed.date.isoformat() if parsed else None
    proc = procedure(result["emulsion_type"], proc_rows, result["batch_mass_g"])
    # The worksheet inside the record shows the record's temperature: a
    # component the record adds on cooling no longer sets it there either,
    # so that the two never disagree on the page.
    result["processing_temperature"] = processing_block(heating(proc_rows))
    result["processing_temperature_c"] = result["processing_temperature"]["temperature_c"]

    checks_to_record = quality_checks(prep, any(r["phase"] == "aqueous" for r in rows), result["batch_mass_g"],
                                      result["equipment"]["balance"]["acceptable_error_percent"] if tolerance is None else tolerance, final_g)
    table = registry.beyond_use_dates
    record_checks = [
        {"code": "component_expiries_given", "ok": not bud["components_without_expiry"],
         "message": ("every component's expiry date is given" if not bud["components_without_expiry"] else
                     f"no expiry date for {', '.join(bud['components_without_expiry'])}: the beyond-use date is provisional until they are given")},
        {"code": "component_lots_given", "ok": all(c["lot"] and c["supplier"] for c in components),
         "message": ("every component's supplier and lot are given" if all(c["lot"] and c["supplier"] for c in components) else
                     f"supplier or lot missing for {', '.join(c['name'] for c in components if not (c['lot'] and c['supplier']))}")},
    ]
    out = {
        "preparation": {
            "name": prep["name"], "dosage_form": prep["dosage_form"], "route": prep["route"],
            "container": prep.get("container"), "storage": bud["storage"], "formula_reference": prep.get("formula_reference"),
            "internal_id": prep.get("internal_id"), "description": prep.get("description"),
            "strength": [c["name"] + f" {c['percent_w_w']:.4g} % w/w" for c in components if c["active"]],
        },
        "compounding": {"date": compounded_on.isoformat(), "prepared_by": compounding.get("prepared_by"),
                        "checked_by": compounding.get("checked_by")},
        "components": components,
        "beyond_use_date": bud,
        "procedure": {"steps": [{"number": s.number, "stage": s.phase, "text": s.text, "basis": s.basis, "basis_note": s.basis_note,
                                 "confirmed_by": None} for s in proc.steps],
                      "oil_phase_c": proc.oil_phase_c, "aqueous_phase_c": proc.aqueous_phase_c, "heated": proc.heated,
                      "highest_melting": proc.highest_melting.label if proc.highest_melting else None},
        "label": label(prep, components, bud, _quantity_text(result)),
        "quality_checks": checks_to_record,
        "checks": record_checks,
        "worksheet": result,
        "amounts_taken": taken,
        "paper": data.get("paper", "A4"),
    }
    out["required_elements"] = required_elements(out, {"source": source_block(registry.sources[table.source_id]),
                                                       "status": table.status, "recalled_from_memory": True})
    # Complete for compounding: all the request can give is given; the quality
    # results are written at the bench.
    out["complete"] = not out["required_elements"]["to_fill_before_compounding"] and all(k["ok"] for k in record_checks)
    warnings = [w for w in sheet.warnings if w["code"] not in HEATING_CODES] + finding_warnings(proc.findings)
    warnings += cloud_point_warnings(rows, proc.oil_phase_c, registry, values_used, strict, ("worksheet", "result", "rows")) + (taken_warnings(taken) if taken else [])
    warnings += [{"code": f"check_{k['code']}", "subject": None, "message": k["message"]} for k in record_checks if not k["ok"]]
    category = bud["category"]
    if prep.get("water_activity") == table.aw_threshold:
        warnings.append({"code": "water_activity_at_threshold", "subject": "preparation",
                         "message": f"the measured water activity is exactly the threshold, {table.aw_threshold:g}: taken as aqueous (the "
                                    "shorter date), as the current chapter is read; an earlier reading counted only above it as aqueous. "
                                    "Measure again, or keep the aqueous category"})
    if category["status"] == "unverified":
        warnings.append({"code": "unverified_bud_category", "subject": category["id"],
                         "message": f"the beyond-use category '{category['description']}' ({category['days']} days) is not yet checked "
                                    f"against {category['source']['id']}{' (recalled from memory)' if category['recalled_from_memory'] else ''}: "
                                    "confirm it in the chapter in force"})
    if strict and category["status"] == "unverified":
        raise UnverifiedValuesRefused([{"pointer": "#/preparation", "rule": "verified_values_only",
                                        "detail": f"beyond-use category {category['id']} (source {category['source']['id']}) is unverified"}],
                                      "strict mode: the beyond-use category used is not yet checked against its source")
    enforce_strict(values_used, strict)
    return envelope(out, {"request": data}, methods.COMPOUNDING_RECORD, values_used, warnings, registry, strict=strict,
                    extra_cautions=methods.RECORD_CAUTIONS)

