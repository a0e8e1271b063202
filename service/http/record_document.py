"""The compounding record as a document: a list of blocks (headings,
paragraphs, lists, tables, fields to fill) built once from the answer and
rendered as Markdown, plain text (record_text.py) or PDF (record_pdf.py),
so the three forms carry the same content. Text here is the answer's, not
yet escaped: each renderer escapes it for its form."""
from __future__ import annotations

from dataclasses import dataclass

from service.http.worksheet_text import _mass

BLANK = "________"


@dataclass(frozen=True)
class Block:
    kind: str          # h1 | h2 | p | banner | list | numbered | table | fields
    text: str = ""
    items: tuple = ()  # list items; table rows (tuples of cells); fields (label, value or None)
    header: tuple = ()


def _or_blank(value) -> str | None:
    return None if value in (None, "") else str(value)


def _taken(x: dict | None) -> str:
    """The Taken cell: the amount recorded with its verdict, or a blank."""
    if x is None:
        return BLANK
    ok = all(k["ok"] for k in x["checks"])
    return f"{x['taken_as_given']['value']:g} {x['taken_as_given']['unit']} ({x['deviation_percent']:+.2f} %{'' if ok else ', CHECK'})"


def record_blocks(answer: dict) -> list[Block]:
    r = answer["result"]
    prep, bud, sheet = r["preparation"], r["beyond_use_date"], r["worksheet"]
    readability = sheet["equipment"]["balance"]["readability_g"]
    blocks = [Block("h1", f"Compounding record: {prep['name']}")]
    if not r["complete"]:
        n = len(r["required_elements"]["to_fill_before_compounding"]) + sum(not k["ok"] for k in r["checks"])
        blocks.append(Block("banner", f"INCOMPLETE: {n} item(s) to give or resolve before compounding (listed under 'To fill' and "
                                      "'Checks'). A decision aid for a qualified pharmacist: check every figure before use."))
    if sheet["checks_failed"]:
        blocks.append(Block("banner", f"CHECK BEFORE WEIGHING: {sheet['checks_failed']} worksheet check(s) failed; see 'Checks'."))
    blocks.append(Block("p", f"Registry {answer['registry']['version']}" + ("; strict mode" if answer["strict"] else "")))
    blocks += [Block("h2", "Preparation"), Block("fields", items=(
        ("Name", prep["name"]), ("Strength", "; ".join(prep["strength"]) or "no active ingredient"),
        ("Dosage form and route", f"{prep['dosage_form']}, {prep['route']}"),
        ("Quantity", next(line["text"] for line in r["label"]["lines"] if line["element"] == "quantity")),
        ("Container", _or_blank(prep["container"])), ("Internal id (Rx, order or lot)", _or_blank(prep["internal_id"])),
        ("Formula reference", _or_blank(prep["formula_reference"])), ("Description", _or_blank(prep["description"])),
    ))]
    c = r["compounding"]
    blocks += [Block("h2", "Compounding"), Block("fields", items=(
        ("Date compounded", c["date"]), ("Prepared by", _or_blank(c["prepared_by"])), ("Checked by", _or_blank(c["checked_by"])),
    ))]
    cat = bud["category"]
    blocks += [Block("h2", "Beyond-use date"),
               Block("fields", items=(("Beyond-use date", bud["date"] + (" (provisional)" if bud["provisional"] else "")),
                                      ("Storage", bud["storage_text"]))),
               Block("list", items=(
                   f"Decided by {bud['rule']}.",
                   f"Category: {cat['description']}, {cat['days']} days ({cat['source']['id']}"
                   + (f", {cat['locator']}" if cat["locator"] else "") + f", {cat['status']}"
                   + (", recalled from memory" if cat["recalled_from_memory"] else "") + ").",
                   *(f"Rule: {rule['text']} ({rule['source']['id']}, {rule['status']}"
                     + (", recalled from memory" if rule["recalled_from_memory"] else "") + ")" for rule in bud["table_rules"]["rules"]),
                   f"Water: {bud['decisions']['water']} ({bud['decisions']['water_basis']}).",
                   f"Preserved: {bud['decisions']['preserved_basis']}.",
                   f"Storage: {bud['storage_basis']}.",
                   *([bud["aqueous_implication"]] if bud["aqueous_implication"] else []),
                   *([f"No expiry date given for: {', '.join(bud['components_without_expiry'])}."] if bud["components_without_expiry"] else []),
                   bud["caution"],
               ))]
    rows = []
    taken = {x["row"]: x for x in r["amounts_taken"]["rows"]} if r["amounts_taken"] else {}
    for i, (comp, row) in enumerate(zip(r["components"], sheet["rows"])):
        how = row["measure"]["how"]
        if how == "graduate":
            how += f" {row['measure']['graduate_ml']:g} mL: {row['measure']['volume_ml_rounded']:g} mL"
        rows.append((row["name"] + (" (q.s.)" if row["role"] == "qs" else ""), row["phase"], f"{row['percent_w_w']:.3f}",
                     _mass(row["mass"]["value"], row["mass"]["unit"], readability) + f" {row['mass']['unit']}",
                     f"{row['mass_g_unrounded']:.6g}", how, comp["supplier"] or BLANK, comp["lot"] or BLANK,
                     comp["expiry"] or BLANK, _taken(taken.get(i))))
    total = sum(row["mass"]["value"] for row in sheet["rows"])
    unit = sheet["rows"][0]["mass"]["unit"]
    rows.append(("Total", "", f"{sheet['totals']['percent_w_w']:.3f}", _mass(total, unit, readability) + f" {unit}", "", "", "", "", "", ""))
    blocks += [Block("h2", "Components and quantities"),
               Block("table", header=("Component", "Phase", "% w/w", "Mass", "Unrounded (g)", "How", "Supplier", "Lot", "Expiry", "Taken"),
                     items=tuple(rows))]
    aliquots = [row for row in sheet["rows"] if row["measure"]["aliquot"]]
    for row in aliquots:
        blocks += [Block("p", f"Aliquot for {row['name']} ({row['mass_g_unrounded']:.6g} g wanted, below the minimum weighable quantity):"),
                   Block("numbered", items=tuple(row["measure"]["aliquot"]["steps"]))]
    p = r["procedure"]
    blocks += [Block("h2", "Procedure"),
               Block("numbered", items=tuple(f"{s['text']} [{s['basis_note']}] Confirmed: {BLANK}" for s in p["steps"]))]
    lab = r["label"]
    blocks += [Block("h2", "Label"),
               Block("list", items=tuple(line["text"] for line in lab["lines"]) + tuple(a["text"] for a in lab["auxiliary"])),
               Block("fields", items=tuple((ph["field"].capitalize(), None) for ph in lab["placeholders"]))]
    blocks += [Block("h2", "Quality checks"),
               Block("table", header=("Check", "Expected", "Result", "Pass / fail"),
                     items=tuple((q["check"], q["expected"], q["result"] or BLANK,
                                  BLANK if q["passed"] is None else ("pass" if q["passed"] else "FAIL")) for q in r["quality_checks"]))]
    taken_checks = r["amounts_taken"]["checks"] if r["amounts_taken"] else []
    checks = [f"[{'ok' if k['ok'] else 'CHECK'}] {k['message']}" for k in sheet["checks"] + r["checks"] + taken_checks]
    if r["amounts_taken"]:
        checks.append("[ok] the amounts taken may pass to the checking pharmacist" if r["amounts_taken"]["may_pass_to_checker"]
                      else "[CHECK] the amounts taken may not pass to the checking pharmacist yet: " + "; ".join(r["amounts_taken"]["reasons"]))
    checks += [f"[CHECK] {row['name']}: {k['message']}" for row in sheet["rows"] for k in row["checks"] if not k["ok"]]
    checks += [f"[CHECK] {x['name']} taken: {k['message']}" for x in taken.values() for k in x["checks"] if not k["ok"]]
    blocks += [Block("h2", "Checks"), Block("list", items=tuple(checks))]
    if r["required_elements"]["to_fill"]:
        blocks += [Block("h2", "To fill"), Block("list", items=tuple(r["required_elements"]["to_fill"]))]
    blocks += [Block("h2", "Warnings"), Block("list", items=tuple(w["message"] for w in answer["warnings"]) or ("none",))]
    values = []
    for v in answer["values_used"]:
        src = v["source"]["id"] if v["source"] else "caller"
        figure = f"{v['low']:g} to {v['high']:g}" if v["property"] == "melting_range" and v["low"] != v["high"] else f"{v['figure']:g}"
        values.append(f"{v['ingredient'] or v['name']} {v['property']} {figure}{' ' + v['unit'] if v['unit'] else ''}: {src}, {v['status']}"
                      + (", recalled from memory" if v["recalled_from_memory"] else "") + (", site overlay" if v["local"] else ""))
    blocks += [Block("h2", "Values used"), Block("list", items=tuple(values))]
    m = answer["method"]
    blocks += [Block("h2", "Method"), Block("p", f"{m['name']}: {m['formula']}"),
               Block("list", items=tuple(s["citation"] for s in m["sources"]))]
    blocks += [Block("h2", "Cautions"), Block("list", items=tuple(answer["cautions"]))]
    blocks += [Block("fields", items=(("Prepared by", None), ("Checked by", None), ("Date", None)))]
    return blocks
