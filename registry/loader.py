"""Read a registry tree (and optionally a site overlay) from disk, validate
every file, and build the frozen Registry.

`load_registry` stops at the first fault, naming the file and the field: the
service never serves a partial registry. `check_tree` goes on past faults and
returns all of them, for the steward's `check` command."""
from __future__ import annotations

import copy
import hashlib
import json
import tomllib
from dataclasses import replace
from functools import lru_cache
from pathlib import Path

from jsonschema import Draft202012Validator
from jsonschema.exceptions import best_match
from referencing import Registry as SchemaRegistry
from referencing import Resource

from registry.errors import RegistryError
from registry.model import (
    PROPERTIES,
    WATER_DENSITY_25C_G_PER_ML,
    DaviesGroup,
    EmulsifierLevel,
    EmulsifierLevelTable,
    FunctionsRecord,
    HlbRange,
    HlbRangeTable,
    Ingredient,
    Registry,
    Source,
    ValueRecord,
    frozen_mapping,
)
from registry.units import density_factor_to_g_per_ml

PACKAGE_DIR = Path(__file__).resolve().parent
DEFAULT_ROOT = PACKAGE_DIR / "data"
SCHEMA_DIR = PACKAGE_DIR / "schema"


@lru_cache(maxsize=None)
def _schema(name: str) -> dict:
    schema = json.loads((SCHEMA_DIR / name).read_text(encoding="utf-8"))
    Draft202012Validator.check_schema(schema)
    return schema


@lru_cache(maxsize=None)
def _validator(name: str, override: bool = False) -> Draft202012Validator:
    schema = _schema(name)
    if override:
        # An overlay file for an ingredient the registry already holds carries
        # only its id, values and notes; the rest stays as shipped.
        schema = copy.deepcopy(schema)
        schema["required"] = ["id", "values"]
    return Draft202012Validator(schema, registry=_schema_registry())


@lru_cache(maxsize=None)
def _schema_registry() -> SchemaRegistry:
    """The schema files by their $id, so that one may refer to another."""
    resources = [(s["$id"], Resource.from_contents(s)) for s in (_schema(p.name) for p in SCHEMA_DIR.glob("*.json"))]
    return SchemaRegistry().with_resources(resources)


def _rel(path: Path, root: Path) -> str:
    try:
        return str(path.relative_to(root.parent))
    except ValueError:
        return str(path)


def _read_toml(path: Path, root: Path) -> dict:
    try:
        return tomllib.loads(path.read_text(encoding="utf-8"))
    except (tomllib.TOMLDecodeError, UnicodeDecodeError) as exc:
        raise RegistryError(_rel(path, root), "(file)", f"not valid TOML: {exc}") from exc


def _check_schema(data: dict, validator: Draft202012Validator, file: str) -> None:
    errors = list(validator.iter_errors(data))
    # A failed allOf also leaves its properties "unevaluated": report the
    # cause, not that echo. best_match descends into oneOf to the specific fault.
    causes = [e for e in errors if e.validator != "unevaluatedProperties"] or errors
    error = best_match(causes)
    if error is None:
        return
    where = "/".join(str(p) for p in error.absolute_path) or "(top level)"
    message = error.message
    if error.validator == "oneOf" and isinstance(error.instance, dict) and "value" in error.instance:
        message = "give either value, or low and high, not both"
    elif error.validator == "oneOf" and isinstance(error.instance, dict):
        message = "a value needs 'value', or 'low' and 'high'"
    elif error.validator == "required" and error.schema_path and "then" in error.schema_path:
        message = f"{message} (needed with the record's kind, status, doubt or retirement)"
    raise RegistryError(file, where, message)


def _known_source(source_id: str, sources: dict, file: str, field: str) -> None:
    if source_id not in sources:
        raise RegistryError(file, field, f"unknown source '{source_id}' (not in sources.toml)")


def _value_record(prop: str, raw: dict, file: str, field: str, local: bool) -> ValueRecord:
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
                raise RegistryError(file, f"{field}/unit", str(exc)) from None
        low, high = low * factor, high * factor
        if not 0.05 <= low <= high <= 25.0:
            raise RegistryError(file, f"{field}/value", f"{low:g} to {high:g} g/mL is not a plausible density: check the unit")
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


def _value_list(prop: str, raws: list, file: str, sources: dict, local: bool, where: str = "values") -> list[ValueRecord]:
    """Validate one property's values (beyond the schema) and build them."""
    active = [raw for raw in raws if not raw.get("retired")]
    for i, raw in enumerate(raws):
        field = f"{where}/{prop}/{i}"
        _known_source(raw["source"], sources, file, f"{field}/source")
        if "low" in raw and raw["low"] > raw["high"]:
            raise RegistryError(file, f"{field}/low", "low is greater than high")
        if raw.get("midpoint_of_range") and "low" not in raw:
            raise RegistryError(file, f"{field}/midpoint_of_range", "only a range (low, high) has a midpoint")
        if raw.get("retired") and raw.get("preferred"):
            raise RegistryError(file, f"{field}/preferred", "a retired value cannot be preferred: mark another one")
        if raw.get("preferred") and len(active) > 1 and not raw.get("preferred_reason"):
            raise RegistryError(file, f"{field}/preferred_reason", "a preferred value among several needs its reason")
        if raw.get("doubtful") and raw.get("preferred"):
            raise RegistryError(file, f"{field}/preferred", "a doubtful value cannot be preferred: mark another one")
        # A lone current value is preferred without saying so, and would be used.
        if raw.get("doubtful") and not raw.get("retired") and len(active) == 1:
            raise RegistryError(file, f"{field}/doubtful", "the only current value cannot be doubtful: a calculation would use it "
                                "(add a better-sourced value, or retire this one)")
    n_preferred = sum(1 for raw in active if raw.get("preferred"))
    if len(active) > 1 and n_preferred != 1:
        raise RegistryError(file, f"{where}/{prop}", f"{len(active)} current values need exactly one marked preferred (found {n_preferred})")
    records = [_value_record(prop, raw, file, f"{where}/{prop}/{i}", local) for i, raw in enumerate(raws)]
    if len(active) == 1:
        records = [replace(r, preferred=True) if not r.retired else r for r in records]
    return records


def _functions(data: dict, file: str, sources: dict) -> FunctionsRecord | None:
    """The [functions] table; the schema has checked its names and its
    provenance fields, as it does a value's."""
    raw = data.get("functions")
    if raw is None:
        if data.get("retired"):
            return None
        # Without it the service could not tell an emulsifier from an opacifier.
        raise RegistryError(file, "functions", "a current ingredient needs [functions]: what it does in a formula, with its source")
    _known_source(raw["source"], sources, file, "functions/source")
    return FunctionsRecord(
        functions=tuple(raw["list"]), source_id=raw["source"], status=raw["status"],
        recalled_from_memory=raw.get("recalled_from_memory", False), locator=raw.get("locator"), note=raw.get("note"),
        reviewed_by=raw.get("reviewed_by"), reviewed_on=raw.get("reviewed_on"),
    )


def _ingredient(data: dict, file: str, sources: dict, local: bool) -> Ingredient:
    functions = _functions(data, file, sources)
    values = {}
    for prop in PROPERTIES:
        if data["values"].get(prop):
            values[prop] = tuple(_value_list(prop, data["values"][prop], file, sources, local))
    return Ingredient(
        id=data["id"], name=data["name"], roles=tuple(data["roles"]), ionic_class=data["ionic_class"],
        physical_state=data["physical_state"], synonyms=tuple(data.get("synonyms", ())),
        molecular_formula=data.get("molecular_formula"), fatty_chain=data.get("fatty_chain"),
        viscous=data.get("viscous", False), hlb_is_apparent=data.get("hlb_is_apparent", False),
        note=data.get("note"), retired=data.get("retired", False), retired_on=data.get("retired_on"),
        retired_reason=data.get("retired_reason"), local=local, values=frozen_mapping(values),
        functions=functions.functions if functions else (), functions_record=functions,
    )


def _override(base: Ingredient, data: dict, file: str, sources: dict) -> Ingredient:
    """Apply a site overlay file to a shipped ingredient: its values are added
    as local values, and for each property it gives, its preferred value
    becomes the preferred one."""
    if "functions" in data:
        # The overlay adds local values; what a shipped ingredient does is the
        # registry's statement, and a local one could not be told apart.
        raise RegistryError(file, "functions", "a site overlay cannot change a shipped ingredient's functions")
    values = dict(base.values)
    for prop in PROPERTIES:
        raws = data["values"].get(prop)
        if not raws:
            continue
        local = _value_list(prop, raws, file, sources, local=True)
        shipped = [replace(r, preferred=False) for r in base.values.get(prop, ())]
        values[prop] = tuple(local + shipped)
    note = " ".join(filter(None, [base.note, data.get("note")])) or None
    return replace(base, values=frozen_mapping(values), note=note)


def _hlb_ranges(data: dict, file: str, sources: dict) -> HlbRangeTable:
    table = data["hlb_ranges"]
    _known_source(table["source"], sources, file, "hlb_ranges/source")
    ranges = {}
    for name, r in table["ranges"].items():
        if r["low"] > r["high"]:
            raise RegistryError(file, f"hlb_ranges/ranges/{name}/low", "low is greater than high")
        ranges[name] = HlbRange(name, float(r["low"]), float(r["high"]))
    return HlbRangeTable(ranges=frozen_mapping(ranges), source_id=table["source"], status=table["status"],
                         recalled_from_memory=table.get("recalled_from_memory", False),
                         locator=table.get("locator"), note=table.get("note"))


def _emulsifier_levels(data: dict, file: str, sources: dict) -> EmulsifierLevelTable:
    table = data["emulsifier_levels"]
    _known_source(table["source"], sources, file, "emulsifier_levels/source")
    families = []
    for name, f in table["families"].items():
        for key in ("alone", "with_partner"):
            if f[key]["low"] > f[key]["high"]:
                raise RegistryError(file, f"emulsifier_levels/families/{name}/{key}/low", "low is greater than high")
        families.append(EmulsifierLevel(name, f["id_prefix"], (f["alone"]["low"], f["alone"]["high"]),
                                        (f["with_partner"]["low"], f["with_partner"]["high"])))
    return EmulsifierLevelTable(tuple(families), table["source"], table["status"], table.get("recalled_from_memory", False))


def _davies(data: dict, file: str, sources: dict) -> dict[str, DaviesGroup]:
    groups = {}
    for gid, group in data["groups"].items():
        records = _value_list("davies_group_number", group["values"], file, sources, local=False, where=f"groups/{gid}")
        groups[gid] = DaviesGroup(gid, group["formula"], group["kind"], tuple(records))
    return groups


class _Collector:
    """Runs each file's checks, stopping at the first fault or gathering all."""

    def __init__(self, collect: bool):
        self.collect = collect
        self.errors: list[RegistryError] = []

    def run(self, fn, *args):
        try:
            return fn(*args)
        except RegistryError as exc:
            if not self.collect:
                raise
            self.errors.append(exc)
            return None


def _digest(root: Path, paths: list[Path]) -> str:
    digest = hashlib.sha256()
    for path in paths:
        digest.update(path.relative_to(root).as_posix().encode() + b"\0" + path.read_bytes() + b"\0")
    return digest.hexdigest()


def _load_sources(path: Path, root: Path, local: bool) -> dict[str, Source]:
    data = _read_toml(path, root)
    _check_schema(data, _validator("sources.schema.json"), _rel(path, root))
    return {sid: Source(sid, s["citation"], s["kind"], s.get("year"), s.get("note"), local) for sid, s in data["sources"].items()}


def _build(root: Path, overlay: Path | None, collect: bool) -> tuple[Registry | None, list[RegistryError]]:
    c = _Collector(collect)
    release_path, sources_path, davies_path = root / "registry.toml", root / "sources.toml", root / "davies_groups.toml"
    for required in (release_path, sources_path, davies_path, root / "ingredients"):
        if not required.exists():
            error = RegistryError(_rel(required, root), "(file)", "missing from the registry tree")
            if not collect:
                raise error
            return None, [error]

    sources = c.run(_load_sources, sources_path, root, False) or {}
    release_data = c.run(_read_toml, release_path, root)
    hlb_ranges = levels = None
    if release_data is not None:
        n_before = len(c.errors)
        c.run(_check_schema, release_data, _validator("release.schema.json"), _rel(release_path, root))
        if len(c.errors) == n_before:
            hlb_ranges = c.run(_hlb_ranges, release_data, _rel(release_path, root), sources)
            levels = c.run(_emulsifier_levels, release_data, _rel(release_path, root), sources)
    davies_data = c.run(_read_toml, davies_path, root)
    davies = {}
    if davies_data is not None:
        file = _rel(davies_path, root)
        n_before = len(c.errors)
        c.run(_check_schema, davies_data, _validator("davies.schema.json"), file)
        if len(c.errors) == n_before:
            davies = c.run(_davies, davies_data, file, sources) or {}

    ingredients: dict[str, Ingredient] = {}
    names: dict[str, str] = {}
    ingredient_paths = sorted((root / "ingredients").glob("*.toml"))

    def one(path: Path, tree_root: Path, local: bool):
        file = _rel(path, tree_root)
        data = _read_toml(path, tree_root)
        is_override = local and isinstance(data.get("id"), str) and data["id"] in ingredients and not ingredients[data["id"]].local
        _check_schema(data, _validator("ingredient.schema.json", override=is_override), file)
        if data["id"] != path.stem:
            raise RegistryError(file, "id", f"id '{data['id']}' differs from the file name '{path.stem}'")
        if is_override:
            ingredients[data["id"]] = _override(ingredients[data["id"]], data, file, sources)
            return
        for label in [data["name"], *data.get("synonyms", ())]:
            key = label.casefold()
            if key in names and names[key] != data["id"]:
                raise RegistryError(file, "synonyms", f"'{label}' already names ingredient '{names[key]}'")
        ingredient = _ingredient(data, file, sources, local)
        for label in [data["name"], *data.get("synonyms", ())]:
            names[label.casefold()] = data["id"]
        ingredients[data["id"]] = ingredient

    for path in ingredient_paths:
        c.run(one, path, root, False)
    if not ingredient_paths:
        c.run(_raise, RegistryError(_rel(root / "ingredients", root), "(folder)", "holds no ingredient files"))

    overlay_digest = None
    if overlay is not None:
        overlay = Path(overlay)
        if not (overlay / "ingredients").is_dir():
            c.run(_raise, RegistryError(str(overlay), "(folder)", "a site overlay needs an ingredients/ folder"))
        else:
            overlay_sources = overlay / "sources.toml"
            if overlay_sources.exists():
                local_sources = c.run(_load_sources, overlay_sources, overlay, True) or {}
                for sid in local_sources:
                    if sid in sources:
                        c.run(_raise, RegistryError(_rel(overlay_sources, overlay), f"sources/{sid}", "a site source cannot reuse a shipped source's id"))
                sources.update(local_sources)
            overlay_paths = sorted((overlay / "ingredients").glob("*.toml"))
            for path in overlay_paths:
                c.run(one, path, overlay, True)
            overlay_digest = _digest(overlay, [p for p in [overlay_sources] if p.exists()] + overlay_paths)

    if c.errors or hlb_ranges is None:
        return None, c.errors
    registry = Registry(
        release=release_data["release"],
        # The data files only: reviewed.lock.toml is derived from them (see
        # registry/review.py), and the service never reads it.
        digest=_digest(root, [release_path, sources_path, davies_path, *ingredient_paths]),
        ingredients=frozen_mapping(ingredients),
        sources=frozen_mapping(sources),
        hlb_ranges=hlb_ranges,
        davies_groups=frozen_mapping(davies),
        emulsifier_levels=levels,
        overlay_digest=overlay_digest,
        overlay_root=str(overlay) if overlay is not None else None,
    )
    return registry, []


def _raise(error: RegistryError):
    raise error


def load_registry(root: Path | str = DEFAULT_ROOT, overlay: Path | str | None = None) -> Registry:
    """Load and validate the registry tree at `root` (registry.toml,
    sources.toml, davies_groups.toml, ingredients/), with an optional site
    overlay folder (ingredients/, optional sources.toml). Raises
    RegistryError at the first fault."""
    registry, _ = _build(Path(root), Path(overlay) if overlay else None, collect=False)
    return registry


def check_tree(root: Path | str = DEFAULT_ROOT, overlay: Path | str | None = None) -> tuple[Registry | None, list[RegistryError]]:
    """Validate a tree and report every fault found (not only the first)."""
    return _build(Path(root), Path(overlay) if overlay else None, collect=True)
