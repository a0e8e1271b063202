"""What changed between two registry trees, value by value: for the
steward's `diff` and for a reviewer reading a data change."""
from __future__ import annotations

from registry import review
from dataclasses import fields

from registry.model import PROPERTIES, FunctionsRecord, ProcessingRecord, Registry, ValueRecord


# The figure as the `list` command prints it; a diff holds no overlay values,
# so it never needs the local mark.
def _figure(record: ValueRecord) -> str:
    return f"{record.low:g}-{record.high:g}" if record.is_range else f"{record.figure:g}"


COMPARED = ("low", "high", "kind", "status", "preferred", "retired", "recalled_from_memory", "method", "note", "reviewed_by", "reviewed_on",
            "unit", "locator", "doubtful", "doubtful_reason")


def diff_lines(old: Registry, new: Registry) -> tuple[list[str], list[str], list[tuple[str, bool]]]:
    """(changes, deletions, reviews): what changed from OLD to NEW, what was
    deleted where it should have been retired, and each status change or
    change to a reviewed value's figure with whether its review was renewed."""
    changes, deletions, reviews = [], [], []
    for iid in sorted(set(old.ingredients) | set(new.ingredients)):
        a, b = old.get(iid), new.get(iid)
        if a is None:
            changes.append(f"+ {iid}: new ingredient ({b.name})")
            continue
        if b is None:
            deletions.append(f"- {iid}: ingredient deleted (records are retired, never deleted)")
            continue
        if not a.retired and b.retired:
            changes.append(f"~ {iid}: retired on {b.retired_on}: {b.retired_reason}")
        for f in fields(FunctionsRecord):
            va, vb = getattr(a.functions_record, f.name, None), getattr(b.functions_record, f.name, None)
            if va != vb:
                changes.append(f"~ {iid} functions: {f.name} {va!r} -> {vb!r}")
        for f in fields(ProcessingRecord):
            va, vb = getattr(a.processing, f.name, None), getattr(b.processing, f.name, None)
            if va != vb:
                changes.append(f"~ {iid} processing: {f.name} {va!r} -> {vb!r}")
        for prop in PROPERTIES:
            olds = {key: r for key, (_, r) in review.keyed(a.values.get(prop, ())).items()}
            news = {key: r for key, (_, r) in review.keyed(b.values.get(prop, ())).items()}
            for key in sorted(set(olds) | set(news), key=str):
                ra, rb = olds.get(key), news.get(key)
                label = f"{iid} {prop} {review.label(key, rb or ra)}"
                if ra is None:
                    changes.append(f"+ {label}: {_figure(rb)} ({rb.status})")
                elif rb is None:
                    deletions.append(f"- {label}: {_figure(ra)} deleted (values are retired, never deleted)")
                else:
                    for attr in COMPARED:
                        va, vb = getattr(ra, attr), getattr(rb, attr)
                        if va != vb:
                            changes.append(f"~ {label}: {attr} {va!r} -> {vb!r}")
                    judged = review.review_change(ra, rb)
                    if judged is not None:
                        reviews.append((f"{'~' if judged.renewed else '!'} {label}: {judged.text}", judged.renewed))
    changes += _table_lines(old, new)
    for sid in sorted(set(old.sources) - set(new.sources)):
        deletions.append(f"- source {sid} deleted (sources are only ever added)")
    for sid in sorted(set(new.sources) - set(old.sources)):
        changes.append(f"+ source {sid}")
    if old.release == new.release and old.digest != new.digest:
        changes.append(f"! the content changed but the release is still {new.release}: bump it in registry.toml")
    return changes, deletions, reviews


def _table_lines(old: Registry, new: Registry) -> list[str]:
    """What changed in the shared tables: beyond-use-date categories and
    rules by id, and Griffin's bands as a whole."""
    lines = []
    a = {c.id: c for c in old.beyond_use_dates.categories} if old.beyond_use_dates else {}
    b = {c.id: c for c in new.beyond_use_dates.categories} if new.beyond_use_dates else {}
    for cid in sorted(set(a) | set(b)):
        if a.get(cid) != b.get(cid):
            what = "new" if cid not in a else "removed" if cid not in b else "changed"
            lines.append(f"~ beyond-use-date category {cid}: {what}")
    ra = dict(old.beyond_use_dates.rules) if old.beyond_use_dates else {}
    rb = dict(new.beyond_use_dates.rules) if new.beyond_use_dates else {}
    lines += [f"~ beyond-use-date rule {rid}: changed" for rid in sorted(set(ra) | set(rb)) if ra.get(rid) != rb.get(rid)]
    if old.water_dispersibility != new.water_dispersibility:
        lines.append("~ water dispersibility table: changed")
    return lines
