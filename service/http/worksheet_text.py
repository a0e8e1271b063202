"""The worksheet as text, for curl users and the batch record: Markdown, or
plain text with the same content.

Every string printed from the answer (ingredient names above all, and the
messages that quote them) passes through the form's escape: in Markdown no
name can add a row, a cell, a heading, a list item, a link or markup; in
either form no name can add a line. Only the template's own text is markup."""
from __future__ import annotations

import functools
import math
import re

from service.core.errors import printable

# Markdown's inline markup (CommonMark and GitHub's): emphasis, code, links,
# entities, strikethrough, math, table cells, and # in case a renderer reads a
# heading mid-line; each is escaped with a backslash, which CommonMark allows
# before any ASCII punctuation. Two are escaped only where they could act, to
# keep the batch record legible: `_` between letters or digits never opens or
# closes emphasis (checked_against_source), and `<` opens raw HTML or an
# autolink only before a letter, `/`, `!` or `?` (USP <1176> stays as it is).
# `>` is left: it marks a block only at a line's start, where no printed value
# ever stands, and ends a tag only after a `<`.
_MD_SPECIAL = re.compile(r"[\\`*\[\]#|~&$]|(?<![A-Za-z0-9])_|_(?![A-Za-z0-9])|<(?=[A-Za-z/!?])")


# Strings up to this long are escaped once a worker and kept: most of what a
# sheet prints recurs from request to request (cautions, the method's text,
# the checks' words, ingredient names). Longer ones are escaped each time,
# so that the cache stays small (at most 2048 entries of this size).
_MD_CACHED_LENGTH = 400


def _md(text) -> str:
    """Literal text for a Markdown line or cell. printable() first: a line
    break becomes a visible \\u000a, so nothing from the request starts a line."""
    text = str(text)
    return _md_kept(text) if len(text) <= _MD_CACHED_LENGTH else _md_escape(text)


def _md_escape(text: str) -> str:
    return _MD_SPECIAL.sub(lambda m: "\\" + m.group(), printable(text))


_md_kept = functools.lru_cache(maxsize=2048)(_md_escape)


def _plain(text) -> str:
    """Literal text for the plain form: no line breaks or control characters;
    its columns are padded with spaces, with no separator a name could fake."""
    return printable(str(text))


def _num(value: float | None, digits: int = 4) -> str:
    return "-" if value is None else f"{value:.{digits}g}"


def _mass(value: float, unit: str, readability_g: float) -> str:
    """A mass to the balance's readability when in grams."""
    if unit != "g":
        return _num(value, 6)
    decimals = max(0, round(-math.log10(readability_g)))
    return f"{value:.{decimals}f}"


def table_lines(header: list[str], table: list[list[str]], markdown: bool) -> list[str]:
    """A table of cells already escaped: Markdown's, or columns padded with
    spaces (no separator a name could fake)."""
    if markdown:
        return (["| " + " | ".join(header) + " |", "|" + "|".join("---" for _ in header) + "|"]
                + ["| " + " | ".join(cells) + " |" for cells in table])
    widths = [max(len(str(x)) for x in col) for col in zip(header, *table)]
    return (["  ".join(h.ljust(w) for h, w in zip(header, widths)), "  ".join("-" * w for w in widths)]
            + ["  ".join(str(c).ljust(w) for c, w in zip(cells, widths)) for cells in table])


def _mark(ok: bool) -> str:
    return "ok" if ok else "CHECK"


def worksheet_text(answer: dict, markdown: bool) -> str:
    r = answer["result"]
    e = _md if markdown else _plain
    h1, h2 = ("# ", "## ") if markdown else ("", "")
    lines = [f"{h1}Batch worksheet: {e(r['emulsion_type'])} emulsion, {_num(r['batch_mass_g'], 6)} g"]
    lines += [""] if markdown else ["=" * 72, ""]
    if r["checks_failed"]:
        banner = (f"CHECK BEFORE WEIGHING: {r['checks_failed']} check(s) failed. Do not weigh from this worksheet until a pharmacist "
                  "has resolved every item marked CHECK below.")
        lines += [f"> **{banner}**" if markdown else f"!!! {banner}", ""]
    lines += [f"Registry {e(answer['registry']['version'])}" + ("; strict mode" if answer["strict"] else ""), ""]
    oil, em = r["oil_phase"], r["emulsifier"]
    lines += [f"{h2}Emulsifier system", "",
              f"- Oil phase {oil['percent_w_w']:.2f} % w/w; required HLB {oil['required_hlb']:.1f} (sources range {oil['range']['low']:.1f} to {oil['range']['high']:.1f}"
              + (f"; {oil['range_with_doubtful']['low']:.1f} to {oil['range_with_doubtful']['high']:.1f} with values flagged doubtful"
                 if oil["range_with_doubtful"] else "") + ")",
              f"- Dispersed phase {r['dispersed_phase']['fraction'] * 100:.1f} % of the emulsion ({e(r['dispersed_phase']['basis'])})",
              f"- Surfactants: {', '.join(map(e, em['surfactants']))}" + (" (proposed by the service)" if em["proposed"] else ""),
              f"- Blend HLB reached {em['hlb_reached']:.1f}" + (f" for a target of {em['target_hlb']:.1f}" if em["target_hlb"] is not None else ""),
              f"- Emulsifier total {em['total_percent_w_w']:.2f} % w/w ({e(em['basis'])})", ""]
    heat = r["processing_temperature"]
    lines += [f"{h2}Processing temperature", "",
              (f"- Heat both phases to about {heat['temperature_c']:g} °C" if heat["heated"] else "- Cold process")
              + f": {e(heat['note'])}", ""]
    mass_unit = r["rows"][0]["mass"]["unit"]
    readability = r["equipment"]["balance"]["readability_g"]
    lines += [f"{h2}Quantities", ""]
    header = ["Ingredient", "Phase", "% w/w", f"Mass ({e(mass_unit)})", "Unrounded (g)", "Rounding", "Volume", "How", "Checks"]
    table = []
    for row in r["rows"]:
        m = row["measure"]
        how = e(m["how"]) + (f" ({_num(m['graduate_ml'])} mL graduate, {_num(m['volume_ml_rounded'])} mL)" if m["how"] == "graduate" else "")
        volume = f"{_num(row['volume']['value'])} {e(row['volume']['unit'])}" if row["volume"] else "-"
        failed = [e(k["code"]) for k in row["checks"] if not k["ok"]]
        flags = f"CHECK: {', '.join(failed)}" if failed else ("ok" if row["checks"] else "-")
        name = e(row["name"]) + (" (q.s.)" if row["role"] == "qs" else "")
        table.append([name, e(row["phase"]), f"{row['percent_w_w']:.3f}", _mass(row["mass"]["value"], mass_unit, readability),
                      f"{row['mass_g_unrounded']:.6g}", f"{row['rounding_error_percent']:+.2f} %", volume, how, flags])
    total = sum(row["mass"]["value"] for row in r["rows"])
    table.append(["Total", "", f"{r['totals']['percent_w_w']:.3f}", _mass(total, mass_unit, readability), "", "", "", "", ""])
    lines += table_lines(header, table, markdown)
    lines += ["", f"{h2}Checks", ""]
    lines += [f"- [{_mark(k['ok'])}] {e(k['message'])}" for k in r["checks"]]
    for row in r["rows"]:
        lines += [f"- [{_mark(k['ok'])}] {e(row['name'])}: {e(k['message'])}" for k in row["checks"] if not k["ok"]]
    aliquots = [row for row in r["rows"] if row["measure"]["aliquot"]]
    if aliquots:
        lines += ["", f"{h2}Aliquots", ""]
        for row in aliquots:
            a = row["measure"]["aliquot"]
            lines += [f"- {e(row['name'])}, {row['mass_g_unrounded']:.6g} g wanted, below the minimum weighable quantity:"]
            lines += [f"  {n}. {e(step)}" for n, step in enumerate(a["steps"], 1)]
    b = r["equipment"]["balance"]
    lines += ["", f"{h2}Equipment", "",
              f"- Balance: sensitivity {b['sensitivity_g'] * 1000:g} mg, acceptable error {b['acceptable_error_percent']:g} %, "
              f"readability {b['readability_g'] * 1000:g} mg, capacity {b['capacity_g']:g} g; minimum weighable quantity {b['minimum_weighable_quantity_g'] * 1000:g} mg",
              "- Graduates: " + ", ".join(f"{g['capacity_ml']:g} mL" for g in r["equipment"]["graduates"])]
    lines += [f"- Assumed: {e(d)}" for d in r["equipment"]["defaults_assumed"]]
    lines += ["", f"{h2}Warnings", ""] + [f"- {e(w['message'])}" for w in answer["warnings"]]
    lines += ["", f"{h2}Values used", ""]
    for v in answer["values_used"]:
        src = e(v["source"]["id"]) if v["source"] else "caller"
        lines.append(f"- {e(v['ingredient'] or v['name'])} {e(v['property'])} {v['figure']:g}{' ' + e(v['unit']) if v['unit'] else ''}: {src}, {e(v['status'])}"
                     + (", recalled from memory" if v["recalled_from_memory"] else "") + (", site overlay" if v["local"] else ""))
    lines += ["", f"{h2}Method", "", f"{e(answer['method']['name'])}: {e(answer['method']['formula'])}", ""]
    lines += [f"- {e(s['citation'])}" for s in answer["method"]["sources"]]
    lines += ["", f"{h2}Cautions", ""] + [f"- {e(c)}" for c in answer["cautions"]]
    lines += ["", "Prepared by: ____________  Checked by: ____________  Date: ____________", ""]
    return "\n".join(lines)
