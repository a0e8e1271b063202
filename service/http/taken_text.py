"""The amounts taken for a batch as text, for the batch record: Markdown, or
plain text with the same content. Every string from the answer passes
through the form's escape, as in the worksheet's text (worksheet_text.py)."""
from __future__ import annotations

from service.http.worksheet_text import _mark, _md, _num, _plain, table_lines


def taken_text(answer: dict, markdown: bool) -> str:
    r = answer["result"]
    e = _md if markdown else _plain
    h1, h2 = ("# ", "## ") if markdown else ("", "")
    t = r["totals"]
    lines = [f"{h1}Amounts taken: batch of {_num(t['batch_mass_g'], 6)} g"]
    lines += [""] if markdown else ["=" * 72, ""]
    verdict = ("May pass to the checking pharmacist: every check passed." if r["may_pass_to_checker"] else
               f"DO NOT PASS TO THE CHECKER: {len(r['reasons'])} check(s) failed; resolve every item marked CHECK below.")
    lines += [f"> **{verdict}**" if markdown else f"!!! {verdict}", "",
              f"Registry {e(answer['registry']['version'])}" + ("; strict mode" if answer["strict"] else ""), "", f"{h2}Rows", ""]
    header = ["Row", "Ingredient", "How", "Target", "Unrounded", "Taken", "Deviation", "Allowed", "Checks"]
    table = []
    for x in r["rows"]:
        failed = [e(k["code"]) for k in x["checks"] if not k["ok"]]
        unit = e(x["unit"])
        table.append([str(x["row"]), e(x["name"]), e(x["how"]), f"{_num(x['target_displayed'], 6)} {unit}", f"{x['target_unrounded']:.6g}",
                      f"{_num(x['taken'], 6)} {unit}", f"{x['deviation_percent']:+.2f} %", f"{x['allowed_percent']:g} %",
                      f"CHECK: {', '.join(failed)}" if failed else "ok"])
    lines += table_lines(header, table, markdown)
    if r["not_taken"]:
        lines += ["", f"{h2}Not taken", ""] + [f"- row {x['row']}: {e(x['name'])}" for x in r["not_taken"]]
    lines += ["", f"{h2}Totals", "", f"- Batch {_num(t['batch_mass_g'], 6)} g; taken {_num(t['taken_mass_g'], 6)} g (volumes converted)"]
    if t["final_weight_g"] is not None:
        lines.append(f"- Final weight {_num(t['final_weight_g'], 6)} g: yield {t['yield_percent']:.2f} % "
                     f"(tolerance {t['tolerance_percent']:g} %, from {e(t['tolerance_from'])})")
    lines += ["", f"{h2}Checks", ""] + [f"- [{_mark(k['ok'])}] {e(k['message'])}" for k in r["checks"]]
    lines += [f"- [CHECK] {e(reason)}" for reason in r["reasons"] if not any(reason == k["message"] for k in r["checks"])]
    lines += ["", f"{h2}Warnings", ""] + [f"- {e(w['message'])}" for w in answer["warnings"]]
    lines += ["", f"{h2}Method", "", f"{e(answer['method']['name'])}: {e(answer['method']['formula'])}", ""]
    lines += [f"- {e(a)}" for a in answer["method"]["assumptions"]]
    lines += ["", f"{h2}Cautions", ""] + [f"- {e(c)}" for c in answer["cautions"]]
    lines += ["", "Weighed by: ____________  Checked by: ____________  Date: ____________", ""]
    return "\n".join(lines)
