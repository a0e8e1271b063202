"""The parts of a compounding record that follow from the worksheet and the
beyond-use date: the label text, the quality checks to record, and the
required elements of the master formulation record and the compounding
record, each pointing at where the record holds it (or saying it is still
to fill). The lists of required elements are USP <795>'s, written from
memory of the chapter (source usp-795-2023, unverified): the registry's
steward checks them against the text."""
from __future__ import annotations

from service.usecases.beyond_use import LIQUID_FORMS

PLACEHOLDER = "________"

ROUTE_STATEMENTS = {
    "topical": "For external use only.",
    "rectal": "For rectal use only.",
    "vaginal": "For vaginal use only.",
    "mucosal": "For use on the mucosa as directed; do not swallow.",
    "oral": None,
}
# Emulsions separate on freezing (common practice, no source).
DO_NOT_FREEZE = "Do not freeze."
SHAKE_WELL = "Shake well before use."

# (element, where in the record's result it is held): the master formulation
# record and the compounding record of USP <795> (from memory, not read).
MASTER_FORMULATION_ELEMENTS = (
    ("Name, strength or activity, and dosage form of the preparation", "preparation"),
    ("Identities and amounts of all components", "worksheet/rows"),
    ("Container closure system", "preparation/container"),
    ("Complete instructions for preparing it: equipment, supplies and the compounding steps", "procedure"),
    ("Physical description of the final preparation", "preparation/description"),
    ("Beyond-use date and storage requirements", "beyond_use_date"),
    ("Reference source supporting the formula and its beyond-use date", "preparation/formula_reference"),
    ("Quality control procedures and the results expected", "quality_checks/expected"),
    ("Calculations needed to determine and verify quantities", "worksheet"),
)
COMPOUNDING_RECORD_ELEMENTS = (
    ("Name, strength or activity, and dosage form of the preparation", "preparation"),
    ("Date (and time) of preparation", "compounding/date"),
    ("Internal identification number (prescription, order or lot number)", "preparation/internal_id"),
    ("The person who compounded it and the person who verified it", "compounding"),
    ("Name, supplier or manufacturer, lot number and expiry date of each component", "components"),
    ("Weight or measure of each component", "worksheet/rows"),
    ("Total quantity compounded", "worksheet/batch_mass_g"),
    ("Assigned beyond-use date and storage requirements", "beyond_use_date"),
    ("Calculations made to determine and verify quantities", "worksheet"),
    ("Physical description of the final preparation", "preparation/description"),
    ("Results of the quality control procedures", "quality_checks/results"),
    ("Reference to the master formulation record", "preparation/formula_reference"),
)


def _filled(result: dict, where: str) -> bool:
    if where.startswith("quality_checks/"):
        checks = result["quality_checks"]
        return bool(checks) and (where.endswith("expected") or all(q["passed"] is not None for q in checks))
    node = result
    for key in where.split("/"):
        if not isinstance(node, dict) or node.get(key) in (None, "", []):
            return False
        node = node[key]
    if where == "components":
        return all(c["supplier"] and c["lot"] and c["expiry"] for c in node)
    if where == "compounding":
        return bool(node.get("prepared_by") and node.get("checked_by"))
    return True


# Filled in at the bench, after compounding: never by the request.
AT_THE_BENCH = ("quality_checks/results",)


def required_elements(result: dict, source: dict) -> dict:
    """Each required element with where the record holds it and whether it
    is filled in; `to_fill` lists what a person must still complete, and
    `to_fill_before_compounding` what the request could have given."""
    def listed(elements):
        return [{"element": e, "where": f"#/result/{w.split('/expected')[0].split('/results')[0]}", "filled": _filled(result, w),
                 "at_the_bench": w in AT_THE_BENCH} for e, w in elements]
    mfr, cr = listed(MASTER_FORMULATION_ELEMENTS), listed(COMPOUNDING_RECORD_ELEMENTS)
    to_fill = list(dict.fromkeys(x["element"] for x in mfr + cr if not x["filled"]))
    before = list(dict.fromkeys(x["element"] for x in mfr + cr if not x["filled"] and not x["at_the_bench"]))
    return {**source, "master_formulation_record": mfr, "compounding_record": cr, "to_fill": to_fill, "to_fill_before_compounding": before,
            "note": "The required elements as the chapter lists them, written from memory of it: confirm against the chapter in force."}


def strength_lines(components: list[dict]) -> list[str]:
    return [f"{c['name']} {c['percent_w_w']:.4g} % w/w" for c in components if c["active"]]


def label(prep: dict, components: list[dict], bud: dict, quantity_text: str) -> dict:
    """The label's statements, in the order printed, and the pharmacy's own
    placeholders. Strength comes from the formula's % w/w of each active."""
    strengths = strength_lines(components)
    form = prep["dosage_form"]
    lines = [
        {"element": "name", "text": prep["name"]},
        *([{"element": "strength", "text": "; ".join(strengths)}] if strengths else []),
        {"element": "dosage_form_and_route", "text": f"{form.capitalize()}, for {prep['route']} use"},
        {"element": "quantity", "text": quantity_text},
        {"element": "beyond_use_date", "text": f"Discard after {bud['date']}" + (" (provisional: component expiry dates missing)" if bud["provisional"] else "")},
        {"element": "storage", "text": bud["storage_text"]},
        {"element": "internal_id", "text": f"No. {prep.get('internal_id') or PLACEHOLDER}"},
        {"element": "compounded", "text": "Compounded preparation."},
    ]
    auxiliary = []
    if form in LIQUID_FORMS:
        article = "an" if form[0] in "aeiou" else "a"
        auxiliary.append({"text": SHAKE_WELL, "why": f"{article} {form} separates on standing (common practice, no source)"})
    route = ROUTE_STATEMENTS.get(prep["route"])
    if route:
        auxiliary.append({"text": route, "why": f"{prep['route']} route (common practice, no source)"})
    auxiliary.append({"text": DO_NOT_FREEZE, "why": "an emulsion breaks on freezing (common practice, no source)"})
    auxiliary.append({"text": "Keep out of the reach of children.", "why": "common practice, no source"})
    placeholders = ["pharmacy name, address and telephone", "patient", "directions for use", "prescriber", "date dispensed", "pharmacist"]
    return {"lines": lines, "auxiliary": auxiliary, "placeholders": [{"field": p, "text": PLACEHOLDER} for p in placeholders]}


def quality_checks(prep: dict, has_aqueous_phase: bool, batch_g: float, tolerance_percent: float, final_weight_g: float | None) -> list[dict]:
    """The checks the compounder records, each with a pass/fail field (null
    until filled); the final weight is judged here when it is given."""
    practice = "common practice, no source"
    checks = [
        {"code": "appearance", "check": "Appearance: colour, texture, uniformity; no lumps, grit or foreign matter",
         "expected": prep.get("description") or "smooth and uniform", "result": None, "passed": None, "basis": practice},
        {"code": "phase_separation", "check": "No separation, creaming or oil droplets on the surface after standing",
         "expected": "none", "result": None, "passed": None, "basis": practice},
    ]
    if has_aqueous_phase:
        ph = prep.get("ph_range")
        checks.append({"code": "ph", "check": "pH of the preparation (it has an aqueous phase)",
                       "expected": f"{ph['low']:g} to {ph['high']:g}" if ph else "record the value; no range given",
                       "result": None, "passed": None, "basis": practice})
    low, high = batch_g * (1 - tolerance_percent / 100.0), batch_g * (1 + tolerance_percent / 100.0)
    weight = {"code": "final_weight", "check": f"Final weight against the batch, {batch_g:.6g} g, within ±{tolerance_percent:g} %",
              "expected": f"{low:.6g} g to {high:.6g} g", "result": None, "passed": None, "basis": practice}
    if final_weight_g is not None:
        weight["result"] = f"{final_weight_g:.6g} g"
        weight["passed"] = low <= final_weight_g <= high
    checks.append(weight)
    return checks
