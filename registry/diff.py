"""What changed between two registry trees, value by value: for the
steward's `diff` and for a reviewer reading a data change."""
from __future__ import annotations

from registry import review
from dataclasses import fields

from registry.model import PROPERTIES, FunctionsRecord, Registry, ValueRecord


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
    for sid in sorted(set(old.sources) - set(new.sources)):
        deletions.append(f"- source {sid} deleted (sources are only ever added)")
    for sid in sorted(set(new.sources) - set(old.sources)):
        changes.append(f"+ source {sid}")
    if old.release == new.release and old.digest != new.digest:
        changes.append(f"! the content changed but the release is still {new.release}: bump it in registry.toml")
    return changes, deletions, reviews
