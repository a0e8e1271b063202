"""The data steward's command line: check, lock, list, show, report and diff
a registry tree. Every command reads the shipped registry unless --root names
another tree (a working copy); --overlay adds a site overlay.

Exit status: 0 when all is well; 1 when a check fails (the review rule
included), an id is unknown, lock finds the review rule broken (and writes
nothing), or a diff finds a record deleted rather than retired or a reviewed
value changed without a renewed review; 2 for usage errors."""
from __future__ import annotations

import argparse
import json
import os
import sys
from collections import Counter
from dataclasses import fields
from pathlib import Path
from typing import Sequence

from registry import review
from registry.coverage import hlb_coverage
from registry.diff import diff_lines
from registry.display import functions_lines, value_lines
from registry.errors import RegistryError
from registry.loader import DEFAULT_ROOT, check_tree, load_registry
from registry.model import PROPERTIES, FunctionsRecord, Registry, ValueRecord

HLB_PROPERTIES = ("hlb", "required_hlb_ow", "required_hlb_wo")


def _out(text: str = "") -> None:
    sys.stdout.write(text + "\n")


def _err(text: str) -> None:
    sys.stderr.write(text + "\n")


def _faults(errors: list[RegistryError]) -> None:
    for exc in errors:
        _err(f"error: {exc.file}: {exc.field}: {exc.message}")


def _load(args) -> Registry | None:
    try:
        return load_registry(args.root, args.overlay)
    except RegistryError as exc:
        _faults([exc])
        return None


def _fmt(record: ValueRecord | None) -> str:
    if record is None:
        return "-"
    text = f"{record.low:g}-{record.high:g}" if record.is_range else f"{record.figure:g}"
    return text + ("*" if record.local else "")


def cmd_check(args) -> int:
    registry, errors = check_tree(args.root, args.overlay)
    if registry is not None:
        broken, stale = review.compare(registry, args.root)
        errors = broken + stale
    _faults(errors)
    if errors:
        _err(f"{len(errors)} error(s); the registry was not accepted")
        return 1
    n_values = sum(len(records) for ing in registry.ingredients.values() for records in ing.values.values())
    _out(f"ok: release {registry.release}, {len(registry.ingredients)} ingredients, {n_values} values, "
         f"{len(registry.sources)} sources, {len(registry.davies_groups)} Davies groups; version {registry.version}")
    return 0


def cmd_lock(args) -> int:
    registry = _load(args)
    if registry is None:
        return 1
    # Regenerating must not launder a figure changed under an old review.
    broken, _ = review.compare(registry, args.root)
    _faults(broken)
    if broken:
        _err(f"{len(broken)} value(s) break the review rule; {review.LOCK_NAME} was not written")
        return 1
    changed, n = review.write_lock(registry, args.root)
    _out(f"{'wrote' if changed else 'unchanged'}: {Path(args.root) / review.LOCK_NAME}, {n} reviewed values")
    return 0


def cmd_list(args) -> int:
    registry = _load(args)
    if registry is None:
        return 1
    _out(f"{'id':<40} {'HLB':>7} {'RHLB O/W':>9} {'RHLB W/O':>9} {'g/mL':>8}  roles")
    for ing in registry.ingredients.values():
        if args.role and args.role not in ing.roles:
            continue
        if ing.retired and not args.all:
            continue
        cells = [_fmt(ing.preferred(p)) for p in ("hlb", "required_hlb_ow", "required_hlb_wo")]
        density = ing.preferred("density")
        flag = " (retired)" if ing.retired else ""
        _out(f"{ing.id:<40} {cells[0]:>7} {cells[1]:>9} {cells[2]:>9} {(f'{density.figure:.4f}' if density else '-'):>8}  {','.join(ing.roles)}{flag}")
    _out("(* a value from the site overlay)")
    return 0


def cmd_show(args) -> int:
    registry = _load(args)
    if registry is None:
        return 1
    ing = registry.get(args.id)
    if ing is None:
        _err(f"error: no ingredient '{args.id}' in {args.root}")
        return 1
    _out(f"{ing.id}: {ing.name}" + ("  (RETIRED " + f"{ing.retired_on}: {ing.retired_reason})" if ing.retired else ""))
    _out(f"  roles: {', '.join(ing.roles)}; ionic class: {ing.ionic_class}; state: {ing.physical_state}")
    if ing.synonyms:
        _out(f"  synonyms: {', '.join(ing.synonyms)}")
    if ing.molecular_formula:
        _out(f"  formula: {ing.molecular_formula}")
    if ing.note:
        _out(f"  note: {ing.note}")
    for line in functions_lines(registry, ing.functions_record):
        _out(line)
    for prop in PROPERTIES:
        records = ing.values.get(prop, ())
        if records:
            _out(f"{prop}:")
            for record in records:
                for line in value_lines(registry, record):
                    _out(line)
    return 0


def report_data(registry: Registry, hlb_threshold: float, density_threshold: float) -> dict:
    records = [r for ing in registry.ingredients.values() for prop in ing.values for r in ing.active(prop)]
    records += [r for g in registry.davies_groups.values() for r in g.values if not r.retired]
    current = [ing for ing in registry.ingredients.values() if not ing.retired]
    disagreements = []
    for ing in current:
        for prop in ing.values:
            # Densities at other temperatures differ by nature, not by dispute.
            active = ing.comparable(prop)
            if len(active) < 2:
                continue
            low, high = ing.span(prop)
            limit = density_threshold if prop == "density" else hlb_threshold
            if high - low > limit:
                disagreements.append({"ingredient": ing.id, "property": prop, "low": low, "high": high,
                                      "sources": sorted({r.source_id for r in active}),
                                      "without_doubtful": ing.span_without_doubtful(prop) if ing.has_doubtful(prop) else None})
    return {
        "release": registry.release, "version": registry.version,
        "values": len(records),
        "by_status": dict(sorted(Counter(r.status for r in records).items())),
        "by_kind": dict(sorted(Counter(r.kind for r in records).items())),
        "recalled_from_memory": sum(r.recalled_from_memory for r in records),
        "lacking_density": sorted(i.id for i in current if not i.active("density")),
        "oil_phase_lacking_required_hlb_ow": sorted(i.id for i in current if "oil_phase" in i.roles and not i.active("required_hlb_ow")),
        "oil_phase_lacking_required_hlb_wo": sorted(i.id for i in current if "oil_phase" in i.roles and not i.active("required_hlb_wo")),
        "surfactants_lacking_hlb": sorted(i.id for i in current if "surfactant" in i.roles and not i.active("hlb")),
        "current_ingredients": len(current),
        "functions_unverified": sorted(i.id for i in current if i.functions_record and not i.functions_record.is_verified),
        "doubtful_values": [{"ingredient": ing.id, "property": prop, "source": r.source_id, "reason": r.doubtful_reason}
                            for ing in current for prop in ing.values for r in ing.active(prop) if r.doubtful],
        "disagreements": disagreements,
        "hlb_coverage": hlb_coverage(registry).as_dict(),
        "thresholds": {"hlb": hlb_threshold, "density_g_per_ml": density_threshold},
    }


def cmd_report(args) -> int:
    registry = _load(args)
    if registry is None:
        return 1
    data = report_data(registry, args.threshold, args.density_threshold)
    if args.json:
        _out(json.dumps(data, indent=2))
        return 0
    _out(f"registry {data['version']}: {data['values']} current values")
    _out("by status: " + ", ".join(f"{k} {v}" for k, v in data["by_status"].items()))
    _out("by kind: " + ", ".join(f"{k} {v}" for k, v in data["by_kind"].items()))
    _out(f"recalled from memory: {data['recalled_from_memory']}")
    cov = data["hlb_coverage"]
    _out(f"HLB and required-HLB figures in use ({cov['properties']}): read in their source with a locator {cov['read_in_source']} "
         f"({cov['read_in_source_share']:.0%}), checked by computation {cov['by_computation']} ({cov['by_computation_share']:.0%}), "
         f"unchecked {len(cov['unchecked'])}")
    for key, label in [("lacking_density", "lacking a density"), ("oil_phase_lacking_required_hlb_ow", "oil phase lacking an O/W required HLB"),
                       ("oil_phase_lacking_required_hlb_wo", "oil phase lacking a W/O required HLB"), ("surfactants_lacking_hlb", "surfactants lacking an HLB")]:
        _out(f"{label} ({len(data[key])}): {', '.join(data[key]) or 'none'}")
    _out(f"functions unverified: {len(data['functions_unverified'])} of {data['current_ingredients']} current ingredients")
    _out(f"doubtful values ({len(data['doubtful_values'])}): "
         + (", ".join(f"{d['ingredient']} {d['property']} ({d['source']})" for d in data["doubtful_values"]) or "none"))
    _out(f"sources disagreeing by more than {args.threshold:g} HLB units or {args.density_threshold:g} g/mL ({len(data['disagreements'])}):")
    for d in data["disagreements"]:
        rest = f"; {d['without_doubtful'][0]:g} to {d['without_doubtful'][1]:g} without doubtful values" if d["without_doubtful"] else ""
        _out(f"  {d['ingredient']} {d['property']}: {d['low']:g} to {d['high']:g} ({', '.join(d['sources'])}){rest}")
    return 0


def cmd_diff(args) -> int:
    try:
        old, new = load_registry(args.old), load_registry(args.new)
    except RegistryError as exc:
        _faults([exc])
        return 1
    changes, deletions, reviews = diff_lines(old, new)
    _out(f"{old.version} -> {new.version}")
    for line in changes + deletions:
        _out(line)
    unreviewed = sum(not ok for _, ok in reviews)
    if reviews:
        _out("review (status changes, and changes to reviewed values; '!' lacks a renewed review):")
        for line, _ in reviews:
            _out(f"  {line}")
    _out(f"{len(changes)} change(s), {len(deletions)} deletion(s), {len(reviews)} review change(s), {unreviewed} without a renewed review")
    return 1 if deletions or unreviewed else 0


def parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(prog="emulsion-registry", description="Check, read and compare the ingredient registry.")
    sub = p.add_subparsers(dest="command", required=True)

    def tree(sp, overlay=True):
        sp.add_argument("--root", type=Path, default=DEFAULT_ROOT, help="registry tree (default: the shipped one)")
        if overlay:
            sp.add_argument("--overlay", type=Path, default=None, help="a site overlay folder to apply")
        return sp

    tree(sub.add_parser("check", help="validate every file, and the review rule against the lock")).set_defaults(fn=cmd_check)
    # The lock records the shipped tree's reviews; a site overlay has none in it.
    tree(sub.add_parser("lock", help=f"regenerate {review.LOCK_NAME}, the record of reviewed values"), overlay=False).set_defaults(fn=cmd_lock, overlay=None)
    sp = tree(sub.add_parser("list", help="ingredients with their preferred values"))
    sp.add_argument("--role", choices=["surfactant", "oil_phase", "aqueous_phase", "hydrocolloid"])
    sp.add_argument("--all", action="store_true", help="include retired records")
    sp.set_defaults(fn=cmd_list)
    sp = tree(sub.add_parser("show", help="one ingredient, every value and its provenance"))
    sp.add_argument("id")
    sp.set_defaults(fn=cmd_show)
    sp = tree(sub.add_parser("report", help="provenance coverage and disagreements"))
    sp.add_argument("--threshold", type=float, default=2.0, help="HLB units of disagreement to report (default 2)")
    sp.add_argument("--density-threshold", type=float, default=0.02, help="g/mL of disagreement to report (default 0.02)")
    sp.add_argument("--json", action="store_true")
    sp.set_defaults(fn=cmd_report)
    sp = sub.add_parser("diff", help="values that changed between two registry trees")
    sp.add_argument("old", type=Path)
    sp.add_argument("new", type=Path)
    sp.set_defaults(fn=cmd_diff)
    return p


def main(argv: Sequence[str] | None = None) -> int:
    args = parser().parse_args(argv)
    try:
        return args.fn(args)
    except BrokenPipeError:
        # The reader (head, less) went away: not an error of the registry.
        sys.stdout = open(os.devnull, "w")
        return 0


if __name__ == "__main__":
    raise SystemExit(main())
