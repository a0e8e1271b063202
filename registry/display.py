"""Plain-text lines for one record and its provenance, as the steward's
`show` command prints them (kept apart so that cli.py stays the commands)."""
from __future__ import annotations

from registry.model import UNITS, FunctionsRecord, Registry, ValueRecord


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
