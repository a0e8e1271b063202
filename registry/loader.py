"""Read a registry tree from disk, validate every file, and build the frozen
Registry. Any fault stops the load with the file and the field named: the
service never serves a partial registry."""
from __future__ import annotations

import hashlib
import json
import tomllib
from dataclasses import replace
from functools import lru_cache
from pathlib import Path

from jsonschema import Draft202012Validator
from jsonschema.exceptions import best_match

from registry.errors import RegistryError
from registry.model import (
    PROPERTIES,
    WATER_DENSITY_25C_G_PER_ML,
    HlbRange,
    HlbRangeTable,
    Ingredient,
    Registry,
    Source,
    ValueRecord,
    frozen_mapping,
)

PACKAGE_DIR = Path(__file__).resolve().parent
DEFAULT_ROOT = PACKAGE_DIR / "data"
SCHEMA_DIR = PACKAGE_DIR / "schema"


@lru_cache(maxsize=None)
def _validator(name: str) -> Draft202012Validator:
    schema = json.loads((SCHEMA_DIR / name).read_text(encoding="utf-8"))
    Draft202012Validator.check_schema(schema)
    return Draft202012Validator(schema)


def _read_toml(path: Path, root: Path) -> dict:
    try:
        return tomllib.loads(path.read_text(encoding="utf-8"))
    except (tomllib.TOMLDecodeError, UnicodeDecodeError) as exc:
        raise RegistryError(_rel(path, root), "(file)", f"not valid TOML: {exc}") from exc


def _rel(path: Path, root: Path) -> str:
    try:
        return str(path.relative_to(root.parent))
    except ValueError:
        return str(path)


def _check_schema(data: dict, schema_name: str, path: Path, root: Path) -> None:
    errors = list(_validator(schema_name).iter_errors(data))
    # A failed allOf also leaves its properties "unevaluated": report the
    # cause, not that echo. best_match descends into oneOf to the specific fault.
    causes = [e for e in errors if e.validator != "unevaluatedProperties"] or errors
    error = best_match(causes)
    if error is not None:
        where = "/".join(str(p) for p in error.absolute_path) or "(top level)"
        message = error.message
        if error.validator == "oneOf" and "value" in error.instance and ("low" in error.instance or "high" in error.instance):
            message = "give either value, or low and high, not both"
        elif error.validator in ("oneOf", "required") and isinstance(error.instance, dict):
            message = f"{message} (a value needs 'value', or 'low' and 'high', with 'source' and 'status')"
        raise RegistryError(_rel(path, root), where, message)


def _value_record(prop: str, raw: dict) -> ValueRecord:
    low = raw.get("low", raw.get("value"))
    high = raw.get("high", raw.get("value"))
    recorded = {k: raw[k] for k in ("value", "low", "high") if k in raw}
    if prop == "density" and raw["basis"] == "specific_gravity_25_25":
        # Specific gravity 25/25 times the density of water at 25 degC.
        low, high = low * WATER_DENSITY_25C_G_PER_ML, high * WATER_DENSITY_25C_G_PER_ML
    return ValueRecord(
        property=prop,
        low=float(low),
        high=float(high),
        source_id=raw["source"],
        status=raw["status"],
        locator=raw.get("locator"),
        recalled_from_memory=raw.get("recalled_from_memory", False),
        preferred=raw.get("preferred", False),
        preferred_reason=raw.get("preferred_reason"),
        midpoint_of_range=raw.get("midpoint_of_range", False),
        note=raw.get("note"),
        basis=raw.get("basis"),
        temperature_c=raw.get("temperature_c"),
        recorded=frozen_mapping(recorded),
    )


def _ingredient(data: dict, file: str, sources: dict) -> Ingredient:
    values: dict[str, tuple[ValueRecord, ...]] = {}
    for prop in PROPERTIES:
        raws = data["values"].get(prop, [])
        for i, raw in enumerate(raws):
            field = f"values/{prop}/{i}"
            if raw["source"] not in sources:
                raise RegistryError(file, f"{field}/source", f"unknown source '{raw['source']}' (not in sources.toml)")
            if "low" in raw and raw["low"] > raw["high"]:
                raise RegistryError(file, f"{field}/low", "low is greater than high")
            if raw.get("preferred") and not raw.get("preferred_reason") and len(raws) > 1:
                raise RegistryError(file, f"{field}/preferred_reason", "a preferred value among several needs its reason")
            if raw.get("midpoint_of_range") and "low" not in raw:
                raise RegistryError(file, f"{field}/midpoint_of_range", "only a range (low, high) has a midpoint")
        n_preferred = sum(1 for raw in raws if raw.get("preferred"))
        if len(raws) > 1 and n_preferred != 1:
            raise RegistryError(file, f"values/{prop}", f"{len(raws)} values need exactly one marked preferred (found {n_preferred})")
        if raws:
            records = [_value_record(prop, raw) for raw in raws]
            if len(records) == 1 and not records[0].preferred:
                records[0] = _as_preferred(records[0])
            values[prop] = tuple(records)
    return Ingredient(
        id=data["id"],
        name=data["name"],
        roles=tuple(data["roles"]),
        ionic_class=data["ionic_class"],
        physical_state=data["physical_state"],
        synonyms=tuple(data.get("synonyms", ())),
        hlb_is_apparent=data.get("hlb_is_apparent", False),
        note=data.get("note"),
        values=frozen_mapping(values),
    )


def _as_preferred(record: ValueRecord) -> ValueRecord:
    return replace(record, preferred=True)


def _hlb_ranges(data: dict, file: str, sources: dict) -> HlbRangeTable:
    table = data["hlb_ranges"]
    if table["source"] not in sources:
        raise RegistryError(file, "hlb_ranges/source", f"unknown source '{table['source']}' (not in sources.toml)")
    ranges = {}
    for name, r in table["ranges"].items():
        if r["low"] > r["high"]:
            raise RegistryError(file, f"hlb_ranges/ranges/{name}/low", "low is greater than high")
        ranges[name] = HlbRange(name, float(r["low"]), float(r["high"]))
    return HlbRangeTable(
        ranges=frozen_mapping(ranges),
        source_id=table["source"],
        status=table["status"],
        recalled_from_memory=table.get("recalled_from_memory", False),
        locator=table.get("locator"),
        note=table.get("note"),
    )


def load_registry(root: Path | str = DEFAULT_ROOT) -> Registry:
    """Load and validate the registry tree at `root` (a folder holding
    registry.toml, sources.toml and ingredients/). Raises RegistryError."""
    root = Path(root)
    digest = hashlib.sha256()
    release_path = root / "registry.toml"
    sources_path = root / "sources.toml"
    for required in (release_path, sources_path, root / "ingredients"):
        if not required.exists():
            raise RegistryError(_rel(required, root), "(file)", "missing from the registry tree")

    release_data = _read_toml(release_path, root)
    _check_schema(release_data, "release.schema.json", release_path, root)
    sources_data = _read_toml(sources_path, root)
    _check_schema(sources_data, "sources.schema.json", sources_path, root)
    sources = {
        sid: Source(sid, s["citation"], s["kind"], s.get("year"), s.get("note"))
        for sid, s in sources_data["sources"].items()
    }
    hlb_ranges = _hlb_ranges(release_data, _rel(release_path, root), sources)

    ingredients: dict[str, Ingredient] = {}
    names: dict[str, str] = {}
    for path in sorted((root / "ingredients").glob("*.toml")):
        file = _rel(path, root)
        data = _read_toml(path, root)
        _check_schema(data, "ingredient.schema.json", path, root)
        if data["id"] != path.stem:
            raise RegistryError(file, "id", f"id '{data['id']}' differs from the file name '{path.stem}'")
        for label in [data["name"], *data.get("synonyms", ())]:
            key = label.casefold()
            if key in names and names[key] != data["id"]:
                raise RegistryError(file, "synonyms", f"'{label}' already names ingredient '{names[key]}'")
            names[key] = data["id"]
        ingredients[data["id"]] = _ingredient(data, file, sources)

    if not ingredients:
        raise RegistryError(_rel(root / "ingredients", root), "(folder)", "holds no ingredient files")
    for path in [release_path, sources_path, *sorted((root / "ingredients").glob("*.toml"))]:
        digest.update(path.relative_to(root).as_posix().encode() + b"\0" + path.read_bytes() + b"\0")
    return Registry(
        release=release_data["release"],
        digest=digest.hexdigest(),
        ingredients=frozen_mapping(ingredients),
        sources=frozen_mapping(sources),
        hlb_ranges=hlb_ranges,
    )
