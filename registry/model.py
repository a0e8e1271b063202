"""Frozen records of the registry. Numbers are in canonical units: HLB and
required HLB are dimensionless, densities are g/mL, molar masses g/mol."""
from __future__ import annotations

from dataclasses import dataclass, field
from types import MappingProxyType
from typing import Mapping

# Water at 25 degC (IAPWS-95), used to turn a specific gravity 25/25 into a
# density. The same figure stands in purified-water.toml with its source.
WATER_DENSITY_25C_G_PER_ML = 0.9970476
# Physically plausible densities of pharmaceutical ingredients, g/mL: a
# figure outside is a slip of unit, in a data file or in a request.
PLAUSIBLE_DENSITY_G_PER_ML = (0.05, 25.0)

PROPERTIES = ("hlb", "required_hlb_ow", "required_hlb_wo", "density", "molar_mass")
UNITS = {"density": "g/mL", "molar_mass": "g/mol"}
STATUSES = ("unverified", "checked_against_source", "measured")
KINDS = ("primary_literature", "handbook", "textbook", "pharmacopeia", "standard", "calculated", "in_house_measurement")
# What an ingredient does in a formula; the schema's $defs/function holds the
# same list (a test keeps them equal), registry/FIELDS.md says what each means.
FUNCTIONS = ("emulsifier", "co_emulsifier", "solubilizer", "wetting_agent", "opacifier", "thickener", "stiffening_agent",
             "emollient", "oil_vehicle", "humectant", "solvent", "aqueous_vehicle", "suspending_agent", "stabilizer",
             "lubricant", "antifoaming_agent")


@dataclass(frozen=True)
class Source:
    id: str
    citation: str
    kind: str
    year: int | None = None
    note: str | None = None
    local: bool = False


@dataclass(frozen=True)
class ValueRecord:
    """One published, calculated or measured value of one property, with its
    provenance.

    `low` and `high` are equal for a single figure; for a range they are its
    ends and `figure` is the midpoint. Densities are in g/mL whatever basis
    and unit they were recorded in; `recorded` keeps them as written."""

    property: str
    low: float
    high: float
    source_id: str
    kind: str
    status: str
    locator: str | None = None
    method: str | None = None
    conditions: str | None = None
    reviewed_by: str | None = None
    reviewed_on: str | None = None
    recalled_from_memory: bool = False
    preferred: bool = False
    preferred_reason: str | None = None
    midpoint_of_range: bool = False
    note: str | None = None
    basis: str | None = None
    unit: str | None = None
    temperature_c: float | None = None
    retired: bool = False
    retired_on: str | None = None
    retired_reason: str | None = None
    local: bool = False
    recorded: Mapping[str, float] = field(default_factory=dict)
    # Kept, but not to be trusted: never preferred, and left out of
    # Ingredient.span_without_doubtful.
    doubtful: bool = False
    doubtful_reason: str | None = None

    @property
    def figure(self) -> float:
        return (self.low + self.high) / 2.0

    @property
    def is_range(self) -> bool:
        return self.low != self.high

    @property
    def is_verified(self) -> bool:
        return self.status != "unverified"


@dataclass(frozen=True)
class FunctionsRecord:
    """What an ingredient does in a formula (names from FUNCTIONS), with the
    provenance of that statement, checked by the same rules as a value's."""

    functions: tuple[str, ...]
    source_id: str
    status: str
    recalled_from_memory: bool = False
    locator: str | None = None
    note: str | None = None
    reviewed_by: str | None = None
    reviewed_on: str | None = None

    @property
    def is_verified(self) -> bool:
        return self.status != "unverified"


@dataclass(frozen=True)
class Ingredient:
    id: str
    name: str
    roles: tuple[str, ...]
    ionic_class: str
    physical_state: str
    synonyms: tuple[str, ...] = ()
    molecular_formula: str | None = None
    fatty_chain: str | None = None
    viscous: bool = False
    hlb_is_apparent: bool = False
    note: str | None = None
    retired: bool = False
    retired_on: str | None = None
    retired_reason: str | None = None
    local: bool = False
    # Every value, retired ones included: the record is never rewritten away.
    values: Mapping[str, tuple[ValueRecord, ...]] = field(default_factory=dict)
    # What it does in a formula: an opacifier with an HLB is not an emulsifier.
    # Empty (and no record) only for a retired ingredient that never had one.
    functions: tuple[str, ...] = ()
    functions_record: FunctionsRecord | None = None

    def active(self, prop: str) -> tuple[ValueRecord, ...]:
        return tuple(r for r in self.values.get(prop, ()) if not r.retired)

    def preferred(self, prop: str) -> ValueRecord | None:
        """The preferred active value of a property, or None."""
        records = self.active(prop)
        for record in records:
            if record.preferred:
                return record
        return records[0] if records else None

    def comparable(self, prop: str) -> tuple[ValueRecord, ...]:
        """The current values that speak of the same thing as the preferred
        one: for a density, those at the preferred value's temperature (a
        density at 20 degC does not dispute one at 25 degC)."""
        records = self.active(prop)
        preferred = self.preferred(prop)
        if prop == "density" and preferred is not None:
            return tuple(r for r in records if r.temperature_c == preferred.temperature_c)
        return records

    def span(self, prop: str) -> tuple[float, float] | None:
        """The lowest and highest figure the comparable values give, or None."""
        records = self.comparable(prop)
        if not records:
            return None
        return min(r.low for r in records), max(r.high for r in records)

    def span_without_doubtful(self, prop: str) -> tuple[float, float] | None:
        """The span of the comparable values not flagged doubtful, or None
        when there are none: what the sources dispute once a value known to
        be unreliable is set aside."""
        records = [r for r in self.comparable(prop) if not r.doubtful]
        if not records:
            return None
        return min(r.low for r in records), max(r.high for r in records)

    def has_doubtful(self, prop: str) -> bool:
        """Whether any comparable value of the property is flagged doubtful
        (that is, whether span and span_without_doubtful may differ)."""
        return any(r.doubtful for r in self.comparable(prop))

    @property
    def uses_local_values(self) -> bool:
        return self.local or any(r.local for records in self.values.values() for r in records)


@dataclass(frozen=True)
class HlbRange:
    name: str
    low: float
    high: float


@dataclass(frozen=True)
class HlbRangeTable:
    ranges: Mapping[str, HlbRange]
    source_id: str
    status: str
    recalled_from_memory: bool
    locator: str | None = None
    note: str | None = None


@dataclass(frozen=True)
class EmulsifierLevel:
    """Usual level of a surfactant family, % w/w of the formula."""

    family: str
    id_prefix: str
    alone: tuple[float, float]
    with_partner: tuple[float, float]


@dataclass(frozen=True)
class EmulsifierLevelTable:
    families: tuple[EmulsifierLevel, ...]
    source_id: str
    status: str
    recalled_from_memory: bool

    def for_ingredient(self, ingredient_id: str) -> EmulsifierLevel | None:
        for level in self.families:
            if ingredient_id.startswith(level.id_prefix):
                return level
        return None


@dataclass(frozen=True)
class DaviesGroup:
    """A Davies group number: its preferred value and any others recorded."""

    id: str
    formula: str
    kind: str  # hydrophilic | lipophilic
    values: tuple[ValueRecord, ...]

    @property
    def number(self) -> float:
        for record in self.values:
            if record.preferred and not record.retired:
                return record.figure
        return self.values[0].figure


@dataclass(frozen=True)
class OverlayCollision:
    """A site overlay record that meets a shipped one, by id or by a name or
    synonym (registry/FIELDS.md, "The site overlay"): the site record is
    used, and `message` says what became of the shipped one and how to
    resolve it. Files are named as faults are (relative to each tree's parent)."""

    kind: str  # "id" | "label"
    label: str  # the id, or the name or synonym both records claim
    field: str  # where in the site file: id, name or synonyms
    site_id: str
    site_file: str
    shipped_id: str
    shipped_file: str

    @property
    def message(self) -> str:
        if self.kind == "id":
            return (f"site record '{self.site_id}' has the id of shipped record '{self.shipped_id}' ({self.shipped_file}): "
                    "this site uses its own record and sets the shipped one aside. To resolve: to use the shipped record "
                    "with the site's values added, keep only id, values and note in the site file; to keep both, give the "
                    "site record a new id (and file name) and change the requests that name it")
        return (f"'{self.label}' names site record '{self.site_id}' and shipped record '{self.shipped_id}' ({self.shipped_file}): "
                f"lookups by it find the site record only. To resolve: rename or remove '{self.label}' in the site record, "
                f"or retire the site record in favour of '{self.shipped_id}'")


@dataclass(frozen=True)
class Registry:
    release: str
    digest: str
    ingredients: Mapping[str, Ingredient]
    sources: Mapping[str, Source]
    hlb_ranges: HlbRangeTable
    davies_groups: Mapping[str, DaviesGroup] = field(default_factory=dict)
    emulsifier_levels: EmulsifierLevelTable | None = None
    overlay_digest: str | None = None
    overlay_root: str | None = None
    # Lookup index: every name and synonym, casefolded, to the one id it finds
    # (a shipped label a site record also claims finds the site record).
    names: Mapping[str, str] = field(default_factory=dict)
    # Shipped records a site record of the same id set aside, kept so that
    # the review lock still sees every shipped value.
    shadowed: Mapping[str, Ingredient] = field(default_factory=dict)
    collisions: tuple[OverlayCollision, ...] = ()

    @property
    def version(self) -> str:
        """Release and content digest in one token, e.g.
        '0.2.0+sha256.1a2b3c4d5e6f', with '.site.<digest>' when a site
        overlay is in use."""
        base = f"{self.release}+sha256.{self.digest[:12]}"
        return base + (f".site.{self.overlay_digest[:12]}" if self.overlay_digest else "")

    def get(self, ingredient_id: str) -> Ingredient | None:
        return self.ingredients.get(ingredient_id)


def frozen_mapping(items: dict) -> Mapping:
    return MappingProxyType(dict(items))
