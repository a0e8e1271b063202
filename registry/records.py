"""From one data file (already checked against its schema) to frozen records,
checking what a schema cannot: sources resolve, ranges run low to high, one
value is preferred and it is not doubtful, units are of the right dimension.

Each check records its fault in the file's Faults and goes on, so that one
run names every fault of a file; a builder returns None when it found any.
`sources` is None when sources.toml itself could not be read: references
are then left unchecked rather than each reported as unknown."""
from __future__ import annotations

import errno
import os
import stat
import tomllib
from dataclasses import replace
from pathlib import Path

from registry.errors import RegistryError
from registry.model import (
    PROPERTIES,
    PLAUSIBLE_DENSITY_G_PER_ML,
    WATER_DENSITY_25C_G_PER_ML,
    BudCategory,
    BudRule,
    BudTable,
    DaviesGroup,
    DispersibilityBand,
    EmulsifierLevel,
    EmulsifierLevelTable,
    FunctionsRecord,
    HlbRange,
    HlbRangeTable,
    Ingredient,
    ProcessingRecord,
    Provenance,
    Source,
    ValueRecord,
    WaterDispersibilityTable,
    frozen_mapping,
)
from registry.units import density_factor_to_g_per_ml
from registry.validation import schema_faults, validator


class Faults:
    """The faults found in one file, in the order found."""

    def __init__(self, file: str):
        self.file = file
        self.errors: list[RegistryError] = []

    def add(self, field: str, message: str) -> None:
        self.errors.append(RegistryError(self.file, field, message))

    def __len__(self) -> int:
        return len(self.errors)


def rel(path: Path, root: Path) -> str:
    """A file as faults name it: relative to the tree's parent (data/...)."""
    try:
        return str(path.relative_to(root.parent))
    except ValueError:
        return str(path)


def os_reason(exc: OSError) -> str:
    """What an operating-system error says of a path, for a steward to act on."""
    if exc.errno == errno.ELOOP:
        return "is a loop of symbolic links"
    if exc.errno == errno.ENOENT:
        return "is missing (or is a symbolic link to nothing)"
    if exc.errno in (errno.EACCES, errno.EPERM):
        return "cannot be read: permission denied"
    if exc.errno == errno.ENOTDIR:
        return "is under something that is not a folder"
    return f"cannot be read: {exc.strerror or exc}"


def file_kind(mode: int) -> str:
    for test, kind in ((stat.S_ISREG, "a regular file"), (stat.S_ISDIR, "a folder"), (stat.S_ISFIFO, "a named pipe (FIFO)"), (stat.S_ISSOCK, "a socket"),
                       (stat.S_ISCHR, "a character device"), (stat.S_ISBLK, "a block device")):
        if test(mode):
            return kind
    return "a special file"


def folder_fault(path: Path, name: str, what: str) -> RegistryError | None:
    """Why `path` cannot be walked as a folder (None when it can), with
    `what` it is, e.g. "the site overlay"."""
    try:
        mode = os.stat(path).st_mode  # follows links: a loop is ELOOP here
        if not stat.S_ISDIR(mode):
            return RegistryError(name, "(folder)", f"{what} is {file_kind(mode)}, not a folder")
        os.scandir(path).close()  # readable and searchable (permissions, or a mount gone)
    except OSError as exc:
        return RegistryError(name, "(folder)", f"{what} {os_reason(exc)}")
    return None


def toml_files(folder: Path, root: Path) -> list[Path]:
    """The *.toml entries of a folder, in name order. Unlike Path.glob, an
    unreadable folder raises (a RegistryError naming it) instead of looking empty."""
    try:
        with os.scandir(folder) as entries:
            names = sorted(entry.name for entry in entries if entry.name.endswith(".toml"))
    except OSError as exc:
        raise RegistryError(rel(folder, root), "(folder)", f"the folder {os_reason(exc)}") from exc
    return [folder / name for name in names]


def read_toml(path: Path, root: Path) -> dict:
    file = rel(path, root)
    try:
        # Checked before opening: opening a named pipe for reading waits for
        # a writer, and would hang the start for ever.
        mode = os.stat(path).st_mode
        if not stat.S_ISREG(mode):
            raise RegistryError(file, "(file)", f"is {file_kind(mode)}, not a regular file (it was not opened)")
        text = path.read_text(encoding="utf-8")
    except OSError as exc:
        raise RegistryError(file, "(file)", f"the file {os_reason(exc)}") from exc
    except UnicodeDecodeError as exc:
        raise RegistryError(file, "(file)", f"not valid TOML: {exc}") from exc
    try:
        return tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise RegistryError(file, "(file)", f"not valid TOML: {exc}") from exc


def known_source(source_id: str, sources: dict | None, faults: Faults, field: str) -> None:
    if sources is not None and source_id not in sources:
        faults.add(field, f"unknown source '{source_id}' (not in sources.toml)")


def _value_record(prop: str, raw: dict, faults: Faults, field: str, local: bool) -> ValueRecord | None:
    low = raw.get("low", raw.get("value"))
    high = raw.get("high", raw.get("value"))
    recorded = {k: raw[k] for k in ("value", "low", "high") if k in raw}
    if prop == "density":
        if raw["basis"] == "specific_gravity_25_25":
            factor = WATER_DENSITY_25C_G_PER_ML  # SG 25/25 x water at 25 degC
        else:
            try:
                factor = density_factor_to_g_per_ml(raw["unit"])
            except ValueError as exc:
                faults.add(f"{field}/unit", str(exc))
                return None
        low, high = low * factor, high * factor
        if not PLAUSIBLE_DENSITY_G_PER_ML[0] <= low <= high <= PLAUSIBLE_DENSITY_G_PER_ML[1]:
            faults.add(f"{field}/value", f"{low:g} to {high:g} g/mL is not a plausible density: check the unit")
            return None
    return ValueRecord(
        property=prop, low=float(low), high=float(high), source_id=raw["source"], kind=raw["kind"], status=raw["status"],
        locator=raw.get("locator"), method=raw.get("method"), conditions=raw.get("conditions"),
        reviewed_by=raw.get("reviewed_by"), reviewed_on=raw.get("reviewed_on"),
        recalled_from_memory=raw.get("recalled_from_memory", False), preferred=raw.get("preferred", False),
        preferred_reason=raw.get("preferred_reason"), midpoint_of_range=raw.get("midpoint_of_range", False),
        note=raw.get("note"), basis=raw.get("basis"), unit=raw.get("unit"), temperature_c=raw.get("temperature_c"),
        retired=raw.get("retired", False), retired_on=raw.get("retired_on"), retired_reason=raw.get("retired_reason"),
        local=local, recorded=frozen_mapping(recorded), doubtful=raw.get("doubtful", False),
        doubtful_reason=raw.get("doubtful_reason"),
    )


def value_list(prop: str, raws: list, faults: Faults, sources: dict | None, local: bool, where: str = "values") -> list[ValueRecord] | None:
    """Validate one property's values (beyond the schema) and build them."""
    before = len(faults)
    active = [raw for raw in raws if not raw.get("retired")]
    for i, raw in enumerate(raws):
        field = f"{where}/{prop}/{i}"
        known_source(raw["source"], sources, faults, f"{field}/source")
        if "low" in raw and raw["low"] > raw["high"]:
            faults.add(f"{field}/low", "low is greater than high")
        if raw.get("midpoint_of_range") and "low" not in raw:
            faults.add(f"{field}/midpoint_of_range", "only a range (low, high) has a midpoint")
        if raw.get("retired") and raw.get("preferred"):
            faults.add(f"{field}/preferred", "a retired value cannot be preferred: mark another one")
        if raw.get("preferred") and len(active) > 1 and not raw.get("preferred_reason"):
            faults.add(f"{field}/preferred_reason", "a preferred value among several needs its reason")
        if raw.get("doubtful") and raw.get("preferred"):
            faults.add(f"{field}/preferred", "a doubtful value cannot be preferred: mark another one")
        # A lone current value is preferred without saying so, and would be used.
        if raw.get("doubtful") and not raw.get("retired") and len(active) == 1:
            faults.add(f"{field}/doubtful", "the only current value cannot be doubtful: a calculation would use it "
                       "(add a better-sourced value, or retire this one)")
    n_preferred = sum(1 for raw in active if raw.get("preferred"))
    if len(active) > 1 and n_preferred != 1:
        faults.add(f"{where}/{prop}", f"{len(active)} current values need exactly one marked preferred (found {n_preferred})")
    records = [_value_record(prop, raw, faults, f"{where}/{prop}/{i}", local) for i, raw in enumerate(raws)]
    if len(faults) > before:
        return None
    if len(active) == 1:
        records = [replace(r, preferred=True) if not r.retired else r for r in records]
    return records


def functions_record(data: dict, faults: Faults, sources: dict | None) -> FunctionsRecord | None:
    """The [functions] table; the schema has checked its names and its
    provenance fields, as it does a value's."""
    raw = data.get("functions")
    if raw is None:
        if not data.get("retired"):
            # Without it the service could not tell an emulsifier from an opacifier.
            faults.add("functions", "a current ingredient needs [functions]: what it does in a formula, with its source")
        return None
    known_source(raw["source"], sources, faults, "functions/source")
    return FunctionsRecord(
        functions=tuple(raw["list"]), source_id=raw["source"], status=raw["status"],
        recalled_from_memory=raw.get("recalled_from_memory", False), locator=raw.get("locator"), note=raw.get("note"),
        reviewed_by=raw.get("reviewed_by"), reviewed_on=raw.get("reviewed_on"),
    )


def provenance(raw: dict, faults: Faults, sources: dict | None, field: str) -> Provenance:
    """The provenance fields of a statement (the schema's attribution), its source checked."""
    known_source(raw["source"], sources, faults, f"{field}/source" if field else "source")
    return Provenance(source_id=raw["source"], status=raw["status"], recalled_from_memory=raw.get("recalled_from_memory", False),
                      locator=raw.get("locator"), note=raw.get("note"), reviewed_by=raw.get("reviewed_by"),
                      reviewed_on=raw.get("reviewed_on"))


def processing_record(data: dict, faults: Faults, sources: dict | None) -> ProcessingRecord | None:
    """The optional [processing] table; the schema has checked its fields."""
    raw = data.get("processing")
    if raw is None:
        return None
    known_source(raw["source"], sources, faults, "processing/source")
    return ProcessingRecord(
        source_id=raw["source"], status=raw["status"], dissolves_in=raw.get("dissolves_in"), volatile=raw.get("volatile", False),
        heat_sensitive=raw.get("heat_sensitive", False), recalled_from_memory=raw.get("recalled_from_memory", False),
        locator=raw.get("locator"), note=raw.get("note"), reviewed_by=raw.get("reviewed_by"), reviewed_on=raw.get("reviewed_on"),
    )


def under(paths: set[tuple], prefix: tuple) -> bool:
    return any(p[:len(prefix)] == prefix for p in paths)


def ingredient(data: dict, faults: Faults, sources: dict | None, local: bool, bad: set[tuple] = frozenset()) -> Ingredient | None:
    """The ingredient record. `bad` holds the data paths the schema faulted:
    the checks of those parts are skipped (their fault is already named),
    the others still run."""
    before = len(faults)
    functions = None if under(bad, ("functions",)) else functions_record(data, faults, sources)
    processing = None if under(bad, ("processing",)) else processing_record(data, faults, sources)
    values = {}
    raw_values = data.get("values") if isinstance(data.get("values"), dict) else {}
    for prop in PROPERTIES:
        raws = raw_values.get(prop)
        if raws and isinstance(raws, list) and not under(bad, ("values", prop)):
            built = value_list(prop, raws, faults, sources, local)
            if built is not None:
                values[prop] = tuple(built)
    if bad or len(faults) > before:
        return None
    return Ingredient(
        id=data["id"], name=data["name"], roles=tuple(data["roles"]), ionic_class=data["ionic_class"],
        physical_state=data["physical_state"], synonyms=tuple(data.get("synonyms", ())),
        molecular_formula=data.get("molecular_formula"), fatty_chain=data.get("fatty_chain"),
        viscous=data.get("viscous", False), hlb_is_apparent=data.get("hlb_is_apparent", False),
        note=data.get("note"), retired=data.get("retired", False), retired_on=data.get("retired_on"),
        retired_reason=data.get("retired_reason"), local=local, values=frozen_mapping(values),
        functions=functions.functions if functions else (), functions_record=functions, processing=processing,
    )


def override(base: Ingredient, data: dict, faults: Faults, sources: dict | None, bad: set[tuple] = frozenset()) -> Ingredient | None:
    """Apply a site overlay file to a shipped ingredient: its values are added
    as local values, and for each property it gives, its preferred value
    becomes the preferred one."""
    before = len(faults)
    values = dict(base.values)
    raw_values = data.get("values") if isinstance(data.get("values"), dict) else {}
    for prop in PROPERTIES:
        raws = raw_values.get(prop)
        if not raws or not isinstance(raws, list) or under(bad, ("values", prop)):
            continue
        local = value_list(prop, raws, faults, sources, local=True)
        if local is not None:
            shipped = [replace(r, preferred=False) for r in base.values.get(prop, ())]
            values[prop] = tuple(local + shipped)
    if bad or len(faults) > before:
        return None
    note = " ".join(filter(None, [base.note, data.get("note")])) or None
    return replace(base, values=frozen_mapping(values), note=note)


def _hlb_ranges(data: dict, faults: Faults, sources: dict | None) -> HlbRangeTable:
    table = data["hlb_ranges"]
    known_source(table["source"], sources, faults, "hlb_ranges/source")
    ranges = {}
    for name, r in table["ranges"].items():
        if r["low"] > r["high"]:
            faults.add(f"hlb_ranges/ranges/{name}/low", "low is greater than high")
        ranges[name] = HlbRange(name, float(r["low"]), float(r["high"]))
    return HlbRangeTable(ranges=frozen_mapping(ranges), source_id=table["source"], status=table["status"],
                         recalled_from_memory=table.get("recalled_from_memory", False),
                         locator=table.get("locator"), note=table.get("note"))


def _emulsifier_levels(data: dict, faults: Faults, sources: dict | None) -> EmulsifierLevelTable:
    table = data["emulsifier_levels"]
    known_source(table["source"], sources, faults, "emulsifier_levels/source")
    families = []
    for name, f in table["families"].items():
        for key in ("alone", "with_partner"):
            if f[key]["low"] > f[key]["high"]:
                faults.add(f"emulsifier_levels/families/{name}/{key}/low", "low is greater than high")
        families.append(EmulsifierLevel(name, f["id_prefix"], (f["alone"]["low"], f["alone"]["high"]),
                                        (f["with_partner"]["low"], f["with_partner"]["high"])))
    return EmulsifierLevelTable(tuple(families), table["source"], table["status"], table.get("recalled_from_memory", False))


def _water_dispersibility(data: dict, faults: Faults, sources: dict | None) -> WaterDispersibilityTable:
    """Griffin's bands, lowest first: each band's low end above the last's,
    none open but the top one, and no gap between one band and the next."""
    table = data["water_dispersibility"]
    where = "water_dispersibility"
    origin = provenance(table, faults, sources, where)
    bands = []
    for i, b in enumerate(table["bands"]):
        field = f"{where}/bands/{i}"
        high = b.get("high")
        if high is not None and b["low"] > high:
            faults.add(f"{field}/low", "low is greater than high")
        if high is None and i != len(table["bands"]) - 1:
            faults.add(f"{field}/high", "only the top band may be open (without high)")
        if bands and b["low"] <= bands[-1].low:
            faults.add(f"{field}/low", "bands run from the lowest HLB up: this one starts no higher than the one before")
        elif bands and bands[-1].high is not None and b["low"] > bands[-1].high:
            faults.add(f"{field}/low", f"leaves a gap after the band before, which ends at {bands[-1].high:g}")
        bands.append(DispersibilityBand(float(b["low"]), None if high is None else float(high), b["description"], b["dissolves_in"]))
    return WaterDispersibilityTable(tuple(bands), origin.source_id, origin.status, origin.recalled_from_memory, origin.locator,
                                    origin.note, origin.reviewed_by, origin.reviewed_on)


def release(data: dict, faults: Faults, sources: dict | None) -> tuple[str, HlbRangeTable, EmulsifierLevelTable, WaterDispersibilityTable] | None:
    """registry.toml's release number and tables, or None (its faults recorded)."""
    for _, error in schema_faults(data, validator("release.schema.json"), faults.file):
        faults.errors.append(error)
    if faults.errors:
        return None
    tables = (data["release"], _hlb_ranges(data, faults, sources), _emulsifier_levels(data, faults, sources),
              _water_dispersibility(data, faults, sources))
    return None if faults.errors else tables


def _overlapping(a: BudCategory, b: BudCategory) -> bool:
    """Whether one preparation could fit both categories (same water class)."""
    preserved = a.preserved is None or b.preserved is None or a.preserved == b.preserved
    form = a.form is None or b.form is None or a.form == b.form
    return a.water == b.water and preserved and form


def beyond_use_dates(data: dict, faults: Faults, sources: dict | None) -> BudTable | None:
    """beyond_use_dates.toml's categories and rules, or None (its faults
    recorded). Categories have unique ids, and no preparation fits two."""
    for _, error in schema_faults(data, validator("beyond_use_dates.schema.json"), faults.file):
        faults.errors.append(error)
    if faults.errors:
        return None
    table = provenance(data["table"], faults, sources, "table")
    rules = {rid: BudRule(rid, raw["text"], provenance(raw, faults, sources, f"rules/{rid}"), raw.get("value"))
             for rid, raw in data["rules"].items()}
    categories: list[BudCategory] = []
    for i, raw in enumerate(data["categories"]):
        field = f"categories/{i}"
        category = BudCategory(raw["id"], raw["description"], raw["water"], raw["days"], tuple(raw["storage"]),
                               provenance(raw, faults, sources, field), raw.get("preserved"), raw.get("form"))
        for other in categories:
            if other.id == category.id:
                faults.add(f"{field}/id", f"id '{category.id}' is used by another category")
            elif _overlapping(other, category):
                faults.add(field, f"a preparation could fit both this category and '{other.id}': "
                           "give each a preserved or form that tells them apart")
        categories.append(category)
    if faults.errors:
        return None
    return BudTable(tuple(categories), frozen_mapping(rules), table)


def davies(data: dict, faults: Faults, sources: dict | None) -> dict[str, DaviesGroup] | None:
    """davies_groups.toml's groups, or None (its faults recorded)."""
    for _, error in schema_faults(data, validator("davies.schema.json"), faults.file):
        faults.errors.append(error)
    if faults.errors:
        return None
    groups = {}
    for gid, group in data["groups"].items():
        records = value_list("davies_group_number", group["values"], faults, sources, local=False, where=f"groups/{gid}")
        if records is not None:
            groups[gid] = DaviesGroup(gid, group["formula"], group["kind"], tuple(records))
    return None if faults.errors else groups


def sources_table(data: dict, faults: Faults, local: bool) -> dict[str, Source] | None:
    """sources.toml's bibliography, or None (its faults recorded)."""
    for _, error in schema_faults(data, validator("sources.schema.json"), faults.file):
        faults.errors.append(error)
    if faults.errors:
        return None
    return {sid: Source(sid, s["citation"], s["kind"], s.get("year"), s.get("note"), local) for sid, s in data["sources"].items()}
