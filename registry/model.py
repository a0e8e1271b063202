"""Frozen records of the registry. Numbers are in canonical units: HLB and
required HLB are dimensionless, densities are g/mL, molar masses g/mol,
melting ranges degrees Celsius,
acid values mg KOH per g, areas per molecule nm2, critical micelle
concentrations mmol/L, cloud points degrees Celsius; beyond-use dates are
whole days."""
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

PROPERTIES = ("hlb", "required_hlb_ow", "required_hlb_wo", "density", "molar_mass", "melting_range",
              "acid_value", "area_per_molecule", "cmc", "cloud_point")
UNITS = {"density": "g/mL", "molar_mass": "g/mol", "melting_range": "degC",
         "acid_value": "mg KOH/g", "area_per_molecule": "nm2", "cmc": "mmol/L", "cloud_point": "degC"}
# What a melting-range figure is (its `basis`): the pharmacopoeias state
# waxes, fats and surfactants by one of these, each measured its own way.
MELTING_BASES = ("melting_range", "congealing_range", "drop_point")
# The interface an area per molecule was measured at (its `basis`): a
# surfactant packs differently against air than against oil, so the two are
# different values.
AREA_BASES = ("oil_water", "air_water")
# Where a component is dissolved or dispersed before the phases are combined.
PHASES = ("oil", "water")
# USP <795> beyond-use-date categories: water content and dosage form.
BUD_WATER = ("aqueous", "nonaqueous")
BUD_FORMS = ("oral_liquid", "other", "solid")
BUD_STORAGE = ("refrigerator", "controlled_room_temperature")
STATUSES = ("unverified", "checked_against_source", "measured")
KINDS = ("primary_literature", "handbook", "textbook", "pharmacopeia", "standard", "calculated", "in_house_measurement")
# What an ingredient does in a formula; the schema's $defs/function holds the
# same list (a test keeps them equal), registry/FIELDS.md says what each means.
FUNCTIONS = ("emulsifier", "co_emulsifier", "solubilizer", "wetting_agent", "opacifier", "thickener", "stiffening_agent",
             "emollient", "oil_vehicle", "humectant", "solvent", "aqueous_vehicle", "suspending_agent", "stabilizer",
             "lubricant", "antifoaming_agent",
             "alkalizing_agent")


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
class Provenance:
    """Where one statement comes from (a record's [functions] or [processing],
    a row of a shared table), checked by the same rules as a value's."""

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


@dataclass(frozen=True, kw_only=True)
class FunctionsRecord(Provenance):
    """What an ingredient does in a formula (names from FUNCTIONS), with the
    provenance of that statement."""

    functions: tuple[str, ...]


@dataclass(frozen=True, kw_only=True)
class ProcessingRecord(Provenance):
    """How an ingredient is handled when the preparation is made: the phase it
    is dissolved or dispersed in before emulsifying (None when not recorded),
    whether it is volatile (added after heating, to the cooled preparation)
    and whether heat harms it; with the provenance of that statement."""

    dissolves_in: str | None = None  # "oil" | "water"
    volatile: bool = False
    heat_sensitive: bool = False


def _span(records) -> tuple[float, float] | None:
    if not records:
        return None
    return min(r.low for r in records), max(r.high for r in records)


@dataclass(frozen=True)
class _PropertyLookup:
    """What Ingredient's lookups answer for one property, worked out once
    from its value records (see Ingredient for what each means)."""

    active: tuple[ValueRecord, ...]
    preferred: ValueRecord | None
    comparable: tuple[ValueRecord, ...]
    span: tuple[float, float] | None
    span_without_doubtful: tuple[float, float] | None
    has_doubtful: bool

    @classmethod
    def of(cls, prop: str, records) -> "_PropertyLookup":
        active = tuple(r for r in records if not r.retired)
        preferred = next((r for r in active if r.preferred), active[0] if active else None)
        comparable = active
        if prop == "density" and preferred is not None:
            comparable = tuple(r for r in active if r.temperature_c == preferred.temperature_c)
        return cls(active, preferred, comparable, _span(comparable), _span([r for r in comparable if not r.doubtful]),
                   any(r.doubtful for r in comparable))


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
    # How it is handled in making the preparation; None when not recorded.
    processing: ProcessingRecord | None = None

    def __post_init__(self):
        # Lookups by property, each worked out on first use and kept: the
        # record is frozen, so they never change, and a calculation asks
        # them several times per value it uses. Not a field, so equality,
        # hashing and repr see only the record.
        object.__setattr__(self, "_lookups", {})

    def _lookup(self, prop: str) -> "_PropertyLookup":
        found = self._lookups.get(prop)
        if found is None:
            found = self._lookups[prop] = _PropertyLookup.of(prop, self.values.get(prop, ()))
        return found

    def active(self, prop: str) -> tuple[ValueRecord, ...]:
        return self._lookup(prop).active

    def preferred(self, prop: str) -> ValueRecord | None:
        """The preferred active value of a property, or None."""
        return self._lookup(prop).preferred

    def comparable(self, prop: str) -> tuple[ValueRecord, ...]:
        """The current values that speak of the same thing as the preferred
        one: for a density, those at the preferred value's temperature (a
        density at 20 degC does not dispute one at 25 degC)."""
        return self._lookup(prop).comparable

    def span(self, prop: str) -> tuple[float, float] | None:
        """The lowest and highest figure the comparable values give, or None."""
        return self._lookup(prop).span

    def span_without_doubtful(self, prop: str) -> tuple[float, float] | None:
        """The span of the comparable values not flagged doubtful, or None
        when there are none: what the sources dispute once a value known to
        be unreliable is set aside."""
        return self._lookup(prop).span_without_doubtful

    def has_doubtful(self, prop: str) -> bool:
        """Whether any comparable value of the property is flagged doubtful
        (that is, whether span and span_without_doubtful may differ)."""
        return self._lookup(prop).has_doubtful

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
class DispersibilityBand:
    """One of Griffin's bands of HLB by how a surfactant behaves in water.
    `high` is None for the open top band; `dissolves_in` is the phase such a
    surfactant is put in before emulsifying (the rule is in the data file)."""

    low: float
    high: float | None
    description: str
    dissolves_in: str


@dataclass(frozen=True)
class WaterDispersibilityTable:
    """Griffin's bands, lowest first, with the table's provenance."""

    bands: tuple[DispersibilityBand, ...]
    source_id: str
    status: str
    recalled_from_memory: bool
    locator: str | None = None
    note: str | None = None
    reviewed_by: str | None = None
    reviewed_on: str | None = None

    @property
    def provenance(self) -> Provenance:
        return Provenance(self.source_id, self.status, self.recalled_from_memory, self.locator, self.note,
                          self.reviewed_by, self.reviewed_on)

    def band_for(self, hlb: float) -> DispersibilityBand:
        """The band an HLB falls in. The published bands overlap at their
        ends (1-4 and 3-6): a figure in two is given the higher band, the one
        whose low end it has reached. A figure below the lowest band is in it
        (nothing disperses less than "no dispersibility"); the top band is open."""
        if hlb < 0:
            raise ValueError(f"an HLB is not negative (got {hlb:g})")
        chosen = self.bands[0]
        for band in self.bands:
            if hlb >= band.low:
                chosen = band
        return chosen


class WithProvenance:
    """The provenance fields of a record that holds its Provenance, read
    through: `record.source_id` as for a value."""

    provenance: Provenance

    @property
    def source_id(self) -> str:
        return self.provenance.source_id

    @property
    def status(self) -> str:
        return self.provenance.status

    @property
    def locator(self) -> str | None:
        return self.provenance.locator

    @property
    def recalled_from_memory(self) -> bool:
        return self.provenance.recalled_from_memory

    @property
    def note(self) -> str | None:
        return self.provenance.note


@dataclass(frozen=True)
class BudCategory(WithProvenance):
    """One default beyond-use-date category of USP <795> for a nonsterile
    preparation. `preserved` and `form` are None where the category does not
    depend on them."""

    id: str
    description: str
    water: str  # "aqueous" (water activity at or above the threshold) | "nonaqueous"
    days: int
    storage: tuple[str, ...]
    provenance: Provenance
    preserved: bool | None = None
    form: str | None = None  # "oral_liquid" | "other" | "solid"


@dataclass(frozen=True)
class BudRule:
    """A rule that holds for every category (a limit, where and when to count
    from), stated in words, with a figure where it has one."""

    id: str
    text: str
    provenance: Provenance
    value: float | None = None


@dataclass(frozen=True)
class BudTable(WithProvenance):
    """The default beyond-use dates of USP <795>: the categories, the rules
    over them (`rules` by id: aw_threshold, component_expiry, count_from),
    and the provenance of the table as a whole."""

    categories: tuple[BudCategory, ...]
    rules: Mapping[str, BudRule]
    provenance: Provenance

    @property
    def aw_threshold(self) -> float:
        """Water activity at and above which a preparation is aqueous."""
        return float(self.rules["aw_threshold"].value)

    def water_class(self, water_activity: float) -> str:
        return "aqueous" if water_activity >= self.aw_threshold else "nonaqueous"

    def category(self, water: str, preserved: bool | None = None, form: str | None = None) -> BudCategory | None:
        """The one category for a preparation, or None when none fits or the
        facts given do not decide between several (say whether an aqueous
        preparation is preserved; give a nonaqueous one's form). A category
        naming no `preserved` or `form` fits any; one whose form is "other"
        fits every form no category of the same water class names."""
        same = [c for c in self.categories if c.water == water]
        named = {c.form for c in same if c.form not in (None, "other")}
        fits = [c for c in same
                if (c.preserved is None or c.preserved == preserved)
                and (c.form is None or c.form == form or (c.form == "other" and form is not None and form not in named))]
        return fits[0] if len(fits) == 1 else None


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
    water_dispersibility: WaterDispersibilityTable | None = None
    beyond_use_dates: BudTable | None = None

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
