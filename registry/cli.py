"""The data steward's command line: check, lock, list, show, report and diff
a registry tree. Every command reads the shipped registry unless --root names
another tree (a working copy: the registry folder, or its data folder);
--overlay adds a site overlay. --json prints list, show, check and report as
JSON; --version prints the package's version and the shipped registry's.

Exit status: 0 when all is well; 1 when a check fails (the review rule
included), an id is unknown, a tree does not load for list, show or report,
lock finds the review rule broken (and writes nothing), or a diff finds a
record deleted rather than retired or a reviewed value changed without a
renewed review; 2 for usage errors, a --root that is not a registry tree, and
a diff whose trees cannot both be loaded (there is then nothing to compare)."""
from __future__ import annotations

import argparse
import importlib.metadata
import json
import os
import sys
from dataclasses import asdict
from pathlib import Path
from typing import Sequence

from registry import review
from registry.diff import diff_lines
from registry.display import (bud_data, bud_lines, dispersibility_data, dispersibility_lines, functions_lines, ingredient_data,
                              processing_lines, summary_data, value_lines)
from registry.errors import RegistryError, RegistryFaults
from registry.loader import DEFAULT_ROOT, check_tree, load_registry
from registry.lookup import closest, either
from registry.model import PROPERTIES, OverlayCollision, ValueRecord
from registry.report import report_data

PACKAGE = "emulsion-formulation-service"


def _out(text: str = "") -> None:
    sys.stdout.write(text + "\n")


def _err(text: str) -> None:
    sys.stderr.write(text + "\n")


def _json(data) -> None:
    _out(json.dumps(data, indent=2, ensure_ascii=False))


def _each(errors: Sequence[RegistryError]) -> list[RegistryError]:
    return [e for exc in errors for e in (exc.errors if isinstance(exc, RegistryFaults) else [exc])]


def _faults(errors: Sequence[RegistryError]) -> None:
    for exc in _each(errors):
        _err(f"error: {exc.file}: {exc.field}: {exc.message}")


def _collisions(collisions: Sequence[OverlayCollision]) -> None:
    for c in collisions:
        _err(f"warning: {c.site_file}: {c.field}: {c.message}")


def _load(args):
    try:
        registry = load_registry(args.root, args.overlay)
    except RegistryError as exc:
        _faults([exc])
        return None
    if not getattr(args, "json", False):
        _collisions(registry.collisions)
    return registry


def _fmt(record: ValueRecord | None) -> str:
    if record is None:
        return "-"
    text = f"{record.low:g}-{record.high:g}" if record.is_range else f"{record.figure:g}"
    return text + ("*" if record.local else "")


def _fault_data(exc: RegistryError) -> dict:
    return {"file": exc.file, "field": exc.field, "message": exc.message}


def _collision_data(c: OverlayCollision) -> dict:
    return asdict(c) | {"message": c.message}


def cmd_check(args) -> int:
    checked = check_tree(args.root, args.overlay)
    registry, errors = checked.registry, checked.errors
    if registry is not None:
        broken, stale = review.compare(registry, args.root)
        errors = broken + stale
    counts = None
    if registry is not None and not errors:
        counts = {"ingredients": len(registry.ingredients),
                  "values": sum(len(records) for ing in registry.ingredients.values() for records in ing.values.values()),
                  "sources": len(registry.sources), "davies_groups": len(registry.davies_groups)}
    if args.json:
        _json({"accepted": not errors, "release": registry.release if counts else None, "version": registry.version if counts else None,
               "counts": counts, "errors": [_fault_data(e) for e in errors], "collisions": [_collision_data(c) for c in checked.collisions]})
        return 1 if errors else 0
    _faults(errors)
    _collisions(checked.collisions)
    if errors:
        _err(f"{len(errors)} error(s); the registry was not accepted")
        return 1
    _out(f"ok: release {registry.release}, {counts['ingredients']} ingredients, {counts['values']} values, "
         f"{counts['sources']} sources, {counts['davies_groups']} Davies groups; version {registry.version}")
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
    chosen = [ing for ing in registry.ingredients.values()
              if (not args.role or args.role in ing.roles) and (args.all or not ing.retired)]
    if args.json:
        _json({"version": registry.version, "ingredients": [summary_data(ing) for ing in chosen]})
        return 0
    _out(f"{'id':<40} {'HLB':>7} {'RHLB O/W':>9} {'RHLB W/O':>9} {'g/mL':>8}  roles")
    for ing in chosen:
        cells = [_fmt(ing.preferred(p)) for p in ("hlb", "required_hlb_ow", "required_hlb_wo")]
        density = ing.preferred("density")
        flag = " (retired)" if ing.retired else ""
        _out(f"{ing.id:<40} {cells[0]:>7} {cells[1]:>9} {cells[2]:>9} {(f'{density.figure:.4f}' if density else '-'):>8}  {','.join(ing.roles)}{flag}")
    _out("(* a value from the site overlay)")
    return 0


# The shared tables `show --table` prints, each by its printed lines and its JSON.
TABLES = {"beyond-use-dates": ("beyond_use_dates", bud_lines, bud_data),
          "water-dispersibility": ("water_dispersibility", dispersibility_lines, dispersibility_data)}


def _show_table(args, registry) -> int:
    attribute, lines, data = TABLES[args.table]
    table = getattr(registry, attribute)
    if args.json:
        _json({"version": registry.version, attribute: data(registry, table)})
        return 0
    for line in lines(registry, table):
        _out(line)
    return 0


def cmd_show(args) -> int:
    if (args.id is None) == (args.table is None):
        _err("error: show needs an ingredient id or --table, not both")
        return 2
    registry = _load(args)
    if registry is None:
        return 1
    if args.table:
        return _show_table(args, registry)
    ing = registry.get(args.id)
    if ing is None:
        near = closest(registry, args.id)
        hint = f"; did you mean {either(near)}?" if near else ""
        _err(f"error: no ingredient '{args.id}' in {args.root}{hint}")
        return 1
    if args.json:
        _json({"version": registry.version, "ingredient": ingredient_data(registry, ing)})
        return 0
    _out(f"{ing.id}: {ing.name}" + ("  (RETIRED " + f"{ing.retired_on}: {ing.retired_reason})" if ing.retired else ""))
    _out(f"  roles: {', '.join(ing.roles)}; ionic class: {ing.ionic_class}; state: {ing.physical_state}")
    if ing.synonyms:
        _out(f"  synonyms: {', '.join(ing.synonyms)}")
    if ing.molecular_formula:
        _out(f"  formula: {ing.molecular_formula}")
    if ing.note:
        _out(f"  note: {ing.note}")
    for line in functions_lines(registry, ing.functions_record) + processing_lines(registry, ing.processing):
        _out(line)
    for prop in PROPERTIES:
        records = ing.values.get(prop, ())
        if records:
            _out(f"{prop}:")
            for record in records:
                for line in value_lines(registry, record):
                    _out(line)
    return 0


def cmd_report(args) -> int:
    registry = _load(args)
    if registry is None:
        return 1
    data = report_data(registry, args.threshold, args.density_threshold)
    if args.json:
        _json(data)
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
    _out(f"solid or semisolid lacking a melting range ({len(data['solid_lacking_melting_range'])}): "
         f"{', '.join(data['solid_lacking_melting_range']) or 'none'}")
    proc = data["processing"]
    _out(f"processing records: {proc['records']} ({proc['unverified']} unverified); volatile: {', '.join(proc['volatile']) or 'none'}; "
         f"surfactants without dissolves_in ({len(proc['surfactants_lacking_dissolves_in'])}): "
         f"{', '.join(proc['surfactants_lacking_dissolves_in']) or 'none'}")
    for name, table in data["tables"].items():
        _out(f"table {name}: {table['entries']} entries, by status: " + ", ".join(f"{k} {v}" for k, v in table["by_status"].items())
             + f"; recalled from memory {table['recalled_from_memory']}")
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
        _err("a tree could not be loaded, so nothing was compared")
        return 2
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


def registry_tree(text: str) -> Path:
    """A tree argument: the data folder (registry.toml in it), or the registry
    folder that holds it as data/ (registry/ or registry/data alike)."""
    path = Path(text)
    if (path / "registry.toml").is_file():
        return path
    if (path / "data" / "registry.toml").is_file():
        return path / "data"
    what = "no such folder" if not path.is_dir() else "not a registry tree"
    raise argparse.ArgumentTypeError(
        f"{text}: {what}: give the registry folder (e.g. registry/, which holds data/) or its data folder "
        "(e.g. registry/data, which holds registry.toml, sources.toml, davies_groups.toml and ingredients/)")


def _version_text() -> tuple[int, str]:
    try:
        package = importlib.metadata.version(PACKAGE)
    except importlib.metadata.PackageNotFoundError:
        package = "(not installed)"
    try:
        registry = load_registry()
    except RegistryError as exc:
        return 1, (f"emulsion-registry {package}; registry at {DEFAULT_ROOT}: not accepted ({len(_each([exc]))} fault(s)): "
                   "run `emulsion-registry check`")
    return 0, f"emulsion-registry {package}; registry {registry.version} ({DEFAULT_ROOT})"


class _Version(argparse.Action):
    """--version: the package's version and the shipped registry's (which
    takes loading it, so it is not a static string)."""

    def __init__(self, option_strings, dest, **kwargs):
        super().__init__(option_strings, dest, nargs=0, default=argparse.SUPPRESS,
                         help="print the package version and the shipped registry's version, and exit")

    def __call__(self, parser, namespace, values, option_string=None):
        status, text = _version_text()
        _out(text)
        parser.exit(status)


def parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(prog="emulsion-registry", description="Check, read and compare the ingredient registry.")
    p.add_argument("--version", action=_Version)
    sub = p.add_subparsers(dest="command", required=True)

    def tree(sp, overlay=True, json_out=True):
        sp.add_argument("--root", type=registry_tree, default=DEFAULT_ROOT,
                        help="registry tree: the registry folder or its data folder (default: the shipped one)")
        if overlay:
            sp.add_argument("--overlay", type=Path, default=None, help="a site overlay folder to apply")
        if json_out:
            sp.add_argument("--json", action="store_true", help="print JSON")
        return sp

    tree(sub.add_parser("check", help="validate every file, and the review rule against the lock")).set_defaults(fn=cmd_check)
    # The lock records the shipped tree's reviews; a site overlay has none in it.
    tree(sub.add_parser("lock", help=f"regenerate {review.LOCK_NAME}, the record of reviewed values"), overlay=False,
         json_out=False).set_defaults(fn=cmd_lock, overlay=None)
    sp = tree(sub.add_parser("list", help="ingredients with their preferred values"))
    sp.add_argument("--role", choices=["surfactant", "oil_phase", "aqueous_phase", "hydrocolloid"])
    sp.add_argument("--all", action="store_true", help="include retired records")
    sp.set_defaults(fn=cmd_list)
    sp = tree(sub.add_parser("show", help="one ingredient, every value and its provenance; or a shared table (--table)"))
    sp.add_argument("id", nargs="?", default=None)
    sp.add_argument("--table", choices=sorted(TABLES), help="show a shared table instead of an ingredient")
    sp.set_defaults(fn=cmd_show)
    sp = tree(sub.add_parser("report", help="provenance coverage and disagreements"))
    sp.add_argument("--threshold", type=float, default=2.0, help="HLB units of disagreement to report (default 2)")
    sp.add_argument("--density-threshold", type=float, default=0.02, help="g/mL of disagreement to report (default 0.02)")
    sp.set_defaults(fn=cmd_report)
    sp = sub.add_parser("diff", help="values that changed between two registry trees")
    sp.add_argument("old", type=registry_tree)
    sp.add_argument("new", type=registry_tree)
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
