"""How far the registry's HLB and required-HLB figures have been checked.

Counted per ingredient and property, on the preferred current value (the one
calculations use): read in its cited source with a locator, checked by
computation (a calculated value recomputed by a reference-library test), or
neither."""
from __future__ import annotations

from dataclasses import dataclass

from registry.model import Registry, ValueRecord

HLB_PROPERTIES = ("hlb", "required_hlb_ow", "required_hlb_wo")


def read_in_source(record: ValueRecord) -> bool:
    return record.status == "checked_against_source" and record.kind != "calculated" and bool(record.locator)


def by_computation(record: ValueRecord) -> bool:
    return record.status == "checked_against_source" and record.kind == "calculated"


@dataclass(frozen=True)
class Coverage:
    properties: int
    read_in_source: tuple[str, ...]
    by_computation: tuple[str, ...]
    unchecked: tuple[str, ...]

    def share(self, which: tuple[str, ...]) -> float:
        return len(which) / self.properties if self.properties else 0.0

    def as_dict(self) -> dict:
        return {"properties": self.properties,
                "read_in_source": len(self.read_in_source), "read_in_source_share": round(self.share(self.read_in_source), 4),
                "by_computation": len(self.by_computation), "by_computation_share": round(self.share(self.by_computation), 4),
                "unchecked": list(self.unchecked)}


def hlb_coverage(registry: Registry) -> Coverage:
    """Coverage of the current ingredients' HLB and required-HLB properties."""
    read, computed, unchecked = [], [], []
    for ing in sorted(registry.ingredients.values(), key=lambda i: i.id):
        if ing.retired:
            continue
        for prop in HLB_PROPERTIES:
            record = ing.preferred(prop)
            if record is None:
                continue
            label = f"{ing.id} {prop}"
            (read if read_in_source(record) else computed if by_computation(record) else unchecked).append(label)
    return Coverage(len(read) + len(computed) + len(unchecked), tuple(read), tuple(computed), tuple(unchecked))
