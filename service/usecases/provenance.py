"""A value a calculation used, with its provenance: one frozen record built
here and only here (from a registry value record, from the caller's request,
or from a Davies group number), and the collector of an answer's values,
which drops repeats by key. Answers show each as `as_dict()`, the
`values_used` item the spec publishes (ValueUsedSchema)."""
from __future__ import annotations

from dataclasses import dataclass
from typing import Iterable, Iterator

from registry import Ingredient, Registry, ValueRecord
from service.core.errors import pointer

ORIGINS = ("registry", "caller")
CALLER_NOTE = "Supplied in the request; its provenance is the caller's."


def figures_differ(records) -> bool:
    """Whether the values give different figures (or ranges): several sources
    printing one figure corroborate it, and saying they disagree would send a
    pharmacist looking for a conflict that is not there."""
    return len({(r.low, r.high) for r in records}) > 1


def source_block(source) -> dict:
    """A source as every answer cites it: id, citation, kind (from a registry
    Source or a Citation)."""
    return {"id": source.id, "citation": source.citation, "kind": source.kind}


@dataclass(frozen=True)
class Citation:
    id: str
    citation: str
    kind: str


@dataclass(frozen=True)
class ValueUsed:
    ingredient: str | None
    name: str
    property: str
    pointer: str
    figure: float
    low: float
    high: float
    unit: str | None
    origin: str
    source: Citation | None
    locator: str | None
    kind: str | None
    status: str
    local: bool
    recalled_from_memory: bool
    sources_disagree: bool
    note: str | None
    # (low, high) with the values flagged doubtful, where any are.
    range_with_doubtful: tuple[float, float] | None = None

    def __post_init__(self):
        if self.origin not in ORIGINS:
            raise ValueError(f"origin {self.origin!r}: expected one of {ORIGINS}")
        if (self.origin == "registry") != (self.source is not None):
            raise ValueError(f"{self.pointer} {self.property}: a registry value has a source, a caller's has none")

    @property
    def label(self) -> str:
        """How warnings name it: the ingredient id, or the inline name."""
        who = self.ingredient or f"inline '{self.name}'"
        return f"{who} {self.property}"

    @property
    def unverified_registry_value(self) -> bool:
        return self.origin == "registry" and self.status == "unverified"

    def as_dict(self) -> dict:
        """The `values_used` item of an answer, member for member."""
        return {
            "ingredient": self.ingredient, "name": self.name, "property": self.property, "pointer": self.pointer,
            "figure": self.figure, "low": self.low, "high": self.high, "unit": self.unit, "origin": self.origin,
            "source": source_block(self.source) if self.source else None,
            "locator": self.locator, "kind": self.kind, "status": self.status, "local": self.local,
            "recalled_from_memory": self.recalled_from_memory, "sources_disagree": self.sources_disagree, "note": self.note,
            "range_with_doubtful": {"low": self.range_with_doubtful[0], "high": self.range_with_doubtful[1]} if self.range_with_doubtful else None,
        }

    @classmethod
    def from_dict(cls, d: dict) -> "ValueUsed":
        """Back from `as_dict()` (an answer reused inside another)."""
        source = Citation(**d["source"]) if d["source"] else None
        wide = (d["range_with_doubtful"]["low"], d["range_with_doubtful"]["high"]) if d["range_with_doubtful"] else None
        return cls(**{**d, "source": source, "range_with_doubtful": wide})

    @classmethod
    def from_registry(cls, *, ingredient: str | None, name: str, path: tuple, record: ValueRecord, registry: Registry,
                      low: float, high: float, unit: str | None, sources_disagree: bool, local: bool,
                      range_with_doubtful: tuple[float, float] | None = None, property: str | None = None) -> "ValueUsed":
        """A registry value record as used; `low`/`high` the span of its property's current values."""
        source = registry.sources[record.source_id]
        return cls(ingredient, name, property or record.property, pointer(path), record.figure, low, high, unit, "registry",
                   Citation(source.id, source.citation, source.kind), record.locator, record.kind, record.status, local,
                   record.recalled_from_memory, sources_disagree, record.note, range_with_doubtful)

    @classmethod
    def from_caller(cls, *, ingredient: str | None, name: str, path: tuple, property: str, figure: float,
                    unit: str | None) -> "ValueUsed":
        """A figure the request supplied: its provenance is the caller's."""
        return cls(ingredient, name, property, pointer(path), figure, figure, figure, unit, "caller", None, None, None,
                   "caller_supplied", False, False, False, CALLER_NOTE, None)


class ValuesUsed:
    """An answer's values used, in the order first used. `add` with a key
    drops a value whose key an earlier one shares (a density looked up once
    per row, an HLB once per surfactant)."""

    def __init__(self, values: Iterable[ValueUsed] = ()):
        self._values: list[ValueUsed] = []
        for v in values:
            self.add(v)

    def add(self, value: ValueUsed, key=None) -> None:
        if key is not None:
            seen = key(value)
            if any(key(v) == seen for v in self._values):
                return
        self._values.append(value)

    def extend(self, values: Iterable[ValueUsed]) -> None:
        for v in values:
            self.add(v)

    def __iter__(self) -> Iterator[ValueUsed]:
        return iter(self._values)

    def __len__(self) -> int:
        return len(self._values)

    def as_dicts(self) -> list[dict]:
        return [v.as_dict() for v in self._values]
