"""What changed between two registry trees, value by value: for the
steward's `diff` and for a reviewer reading a data change."""
from __future__ import annotations

from registry.model import PROPERTIES, Registry, ValueRecord


# The figure as the `list` command prints it; a diff holds no overlay values,
# so it never needs the local mark.
def _figure(record: ValueRecord) -> str:
    return f"{record.low:g}-{record.high:g}" if record.is_range else f"{record.figure:g}"


def _key(record: ValueRecord) -> tuple:
    # A value's identity across two trees: what it is of, and where it is from.
    return (record.source_id, record.locator, record.basis, record.temperature_c)


COMPARED = ("low", "high", "kind", "status", "preferred", "retired", "recalled_from_memory", "method", "note", "reviewed_by", "reviewed_on", "unit")


def diff_lines(old: Registry, new: Registry) -> tuple[list[str], list[str]]:
    """(changes, deletions): what changed from OLD to NEW, and what was
    deleted where it should have been retired."""
    changes, deletions = [], []
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
        for prop in PROPERTIES:
            olds = {_key(r): r for r in a.values.get(prop, ())}
            news = {_key(r): r for r in b.values.get(prop, ())}
            for key in sorted(set(olds) | set(news), key=str):
                ra, rb = olds.get(key), news.get(key)
                label = f"{iid} {prop} [{key[0]}{', ' + key[1] if key[1] else ''}]"
                if ra is None:
                    changes.append(f"+ {label}: {_figure(rb)} ({rb.status})")
                elif rb is None:
                    deletions.append(f"- {label}: {_figure(ra)} deleted (values are retired, never deleted)")
                else:
                    for attr in COMPARED:
                        va, vb = getattr(ra, attr), getattr(rb, attr)
                        if va != vb:
                            changes.append(f"~ {label}: {attr} {va!r} -> {vb!r}")
    for sid in sorted(set(old.sources) - set(new.sources)):
        deletions.append(f"- source {sid} deleted (sources are only ever added)")
    for sid in sorted(set(new.sources) - set(old.sources)):
        changes.append(f"+ source {sid}")
    if old.release == new.release and old.digest != new.digest:
        changes.append(f"! the content changed but the release is still {new.release}: bump it in registry.toml")
    return changes, deletions
