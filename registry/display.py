"""One record and its provenance as the steward's commands print it: plain
lines for `show`, and plain data for `list --json` and `show --json` (kept
apart so that cli.py stays the commands)."""
from __future__ import annotations

from dataclasses import fields

from registry.lookup import labels
from registry.model import (PROPERTIES, UNITS, BudTable, FunctionsRecord, Ingredient, ProcessingRecord, Provenance, Registry, ValueRecord,
                            WaterDispersibilityTable)


def _detail_lines(items: list[tuple[str, object]]) -> list[str]:
    return [f"    {label}: {value}" for label, value in items if value]


def value_lines(registry: Registry, record: ValueRecord) -> list[str]:
    source = registry.sources[record.source_id]
    unit = f" {UNITS[record.property]}" if record.property in UNITS else ""
    head = f"{record.low:g} to {record.high:g}{unit}" if record.is_range else f"{record.figure:g}{unit}"
    marks = [m for m, on in [("preferred", record.preferred), ("midpoint of range", record.midpoint_of_range),
                             ("recalled from memory", record.recalled_from_memory), ("site overlay", record.local),
                             ("DOUBTFUL", record.doubtful), ("RETIRED", record.retired)] if on]
    lines = [f"  {head}" + (f"  [{', '.join(marks)}]" if marks else "")]
    if record.recorded and record.basis == "specific_gravity_25_25":
        lines.append(f"    recorded as specific gravity 25/25: {dict(record.recorded)}")
    elif record.unit and record.unit != UNITS.get(record.property):
        lines.append(f"    recorded as {dict(record.recorded)} {record.unit}")
    lines.append(f"    source: {source.id}: {source.citation}")
    return lines + _detail_lines([
        ("locator", record.locator), ("kind", record.kind), ("method", record.method), ("status", record.status),
        ("reviewed", " on ".join(filter(None, [record.reviewed_by, record.reviewed_on])) or None),
        ("temperature", f"{record.temperature_c:g} degC" if record.temperature_c is not None else None),
        ("basis", record.basis if record.property in ("melting_range", "area_per_molecule") else None),
        ("conditions", record.conditions), ("why preferred", record.preferred_reason), ("why doubtful", record.doubtful_reason),
        ("note", record.note), ("retired", f"{record.retired_on}: {record.retired_reason}" if record.retired else None)])


def functions_lines(registry: Registry, record: FunctionsRecord | None) -> list[str]:
    """What the ingredient does in a formula, with where that is said."""
    if record is None:
        return ["functions: none recorded"]
    source = registry.sources[record.source_id]
    marks = "  [recalled from memory]" if record.recalled_from_memory else ""
    return ["functions:", f"  {', '.join(record.functions)}{marks}", f"    source: {source.id}: {source.citation}"] + _detail_lines([
        ("locator", record.locator), ("status", record.status),
        ("reviewed", " on ".join(filter(None, [record.reviewed_by, record.reviewed_on])) or None), ("note", record.note)])


def processing_lines(registry: Registry, record: ProcessingRecord | None) -> list[str]:
    """How the ingredient is handled in making the preparation, with where that is said."""
    if record is None:
        return []
    source = registry.sources[record.source_id]
    facts = [f"dissolved or dispersed in the {record.dissolves_in} phase" if record.dissolves_in else None,
             "volatile" if record.volatile else None, "heat-sensitive" if record.heat_sensitive else None]
    marks = "  [recalled from memory]" if record.recalled_from_memory else ""
    return ["processing:", f"  {'; '.join(filter(None, facts))}{marks}", f"    source: {source.id}: {source.citation}"] + _detail_lines([
        ("locator", record.locator), ("status", record.status),
        ("reviewed", " on ".join(filter(None, [record.reviewed_by, record.reviewed_on])) or None), ("note", record.note)])


def _provenance_lines(registry: Registry, origin: Provenance) -> list[str]:
    source = registry.sources[origin.source_id]
    return _detail_lines([("source", f"{source.id}: {source.citation}"), ("locator", origin.locator), ("status", origin.status),
                          ("recalled from memory", "yes" if origin.recalled_from_memory else None),
                          ("reviewed", " on ".join(filter(None, [origin.reviewed_by, origin.reviewed_on])) or None),
                          ("note", origin.note)])


def bud_lines(registry: Registry, table: BudTable) -> list[str]:
    """The beyond-use-date table: its categories, its rules, each with its provenance."""
    lines = ["beyond-use dates (nonsterile preparations):"] + _provenance_lines(registry, table.provenance)
    for c in table.categories:
        facts = [c.water] + ([("preserved" if c.preserved else "not preserved")] if c.preserved is not None else []) + (
            [f"form {c.form}"] if c.form else [])
        lines.append(f"  {c.id}: {c.days} days, {' or '.join(s.replace('_', ' ') for s in c.storage)}  ({', '.join(facts)})")
        lines += ["  " + line for line in _provenance_lines(registry, c.provenance)]
    lines.append("rules:")
    for rule in table.rules.values():
        lines.append(f"  {rule.id}: {rule.text}" + (f"  [{rule.value:g}]" if rule.value is not None else ""))
        lines += ["  " + line for line in _provenance_lines(registry, rule.provenance)]
    return lines


def dispersibility_lines(registry: Registry, table: WaterDispersibilityTable) -> list[str]:
    """Griffin's bands of HLB by behaviour in water, and where each is put."""
    lines = ["water dispersibility by HLB:"] + _provenance_lines(registry, table.provenance)
    for b in table.bands:
        span = f"{b.low:g}-{b.high:g}" if b.high is not None else f"{b.low:g} and over"
        lines.append(f"  {span}: {b.description}; dissolved in the {b.dissolves_in} phase")
    return lines


def _source(registry: Registry, source_id: str) -> dict:
    source = registry.sources[source_id]
    return {"id": source.id, "citation": source.citation, "kind": source.kind, "local": source.local}


def value_data(registry: Registry, record: ValueRecord) -> dict:
    """Every field of a value; `low`, `high` and `figure` in `canonical_unit`
    (g/mL for densities), `recorded` and `unit` as the file has them."""
    data = {f.name: getattr(record, f.name) for f in fields(ValueRecord) if f.name != "source_id"}
    data["recorded"] = dict(record.recorded)
    return data | {"figure": record.figure, "canonical_unit": UNITS.get(record.property), "source": _source(registry, record.source_id)}


def functions_data(registry: Registry, record: FunctionsRecord | None) -> dict | None:
    if record is None:
        return None
    data = {f.name: getattr(record, f.name) for f in fields(FunctionsRecord) if f.name != "source_id"}
    return data | {"functions": list(record.functions), "source": _source(registry, record.source_id)}


def processing_data(registry: Registry, record: ProcessingRecord | None) -> dict | None:
    if record is None:
        return None
    data = {f.name: getattr(record, f.name) for f in fields(ProcessingRecord) if f.name != "source_id"}
    return data | {"source": _source(registry, record.source_id)}


def _provenance_data(registry: Registry, origin: Provenance) -> dict:
    data = {f.name: getattr(origin, f.name) for f in fields(Provenance) if f.name != "source_id"}
    return data | {"source": _source(registry, origin.source_id)}


def bud_data(registry: Registry, table: BudTable) -> dict:
    return {"provenance": _provenance_data(registry, table.provenance), "aw_threshold": table.aw_threshold,
            "categories": [{"id": c.id, "description": c.description, "water": c.water, "preserved": c.preserved, "form": c.form,
                            "days": c.days, "storage": list(c.storage), "provenance": _provenance_data(registry, c.provenance)}
                           for c in table.categories],
            "rules": {rid: {"text": r.text, "value": r.value, "provenance": _provenance_data(registry, r.provenance)}
                      for rid, r in table.rules.items()}}


def dispersibility_data(registry: Registry, table: WaterDispersibilityTable) -> dict:
    return {"provenance": _provenance_data(registry, table.provenance),
            "bands": [{"low": b.low, "high": b.high, "description": b.description, "dissolves_in": b.dissolves_in} for b in table.bands]}


def _preferred(ing: Ingredient, prop: str) -> dict | None:
    record = ing.preferred(prop)
    if record is None:
        return None
    return {"figure": record.figure, "low": record.low, "high": record.high, "status": record.status, "local": record.local}


def summary_data(ing: Ingredient) -> dict:
    """One line of `list`: the record and its preferred figures."""
    return {"id": ing.id, "name": ing.name, "roles": list(ing.roles), "functions": list(ing.functions),
            "retired": ing.retired, "local": ing.uses_local_values,
            "preferred": {prop: _preferred(ing, prop) for prop in PROPERTIES}}


def ingredient_data(registry: Registry, ing: Ingredient) -> dict:
    """Everything `show` prints, as data: the record, what it does, every value."""
    data = {f.name: getattr(ing, f.name) for f in fields(Ingredient)
            if f.name not in ("values", "functions", "functions_record", "processing")}
    data.update(roles=list(ing.roles), synonyms=list(ing.synonyms), lookup_names=labels(registry, ing),
                functions=functions_data(registry, ing.functions_record), processing=processing_data(registry, ing.processing),
                values={prop: [value_data(registry, r) for r in ing.values.get(prop, ())] for prop in PROPERTIES})
    return data
