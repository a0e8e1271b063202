"""The two validators of registry/validation.py: the compiled one passes
only what jsonschema passes.

jsonschema_rs gives the verdict at start-up; jsonschema, the reference
implementation of JSON Schema for Python (PyPI), names the faults of a file
it refused, and has the last word (it passes a NaN where a bound is set,
which jsonschema_rs refuses: such a file goes to jsonschema and is judged as
before). A file the compiled one passed while jsonschema refuses it would be
served unchecked: no shipped file, and no file made from one by a single
change to one of its fields, may be one."""
import datetime
import json
import tomllib

import pytest
from jsonschema import Draft202012Validator

from registry.loader import DEFAULT_ROOT
from registry.validation import SCHEMA_DIR, validator
from tests.json_tree import DROP, changed, get, paths

TABLES = {"registry.toml": "release.schema.json", "sources.toml": "sources.schema.json",
          "davies_groups.toml": "davies.schema.json", "beyond_use_dates.toml": "beyond_use_dates.schema.json"}
INGREDIENT_FILES = sorted((DEFAULT_ROOT / "ingredients").glob("*.toml"))


def _files():
    for file, schema in TABLES.items():
        yield DEFAULT_ROOT / file, schema
    for path in INGREDIENT_FILES:
        yield path, "ingredient.schema.json"


# A wrong type of each kind, TOML's own date and time, and out-of-range numbers.
REPLACEMENTS = [DROP, "", "text", -1, 0, 1e9, float("nan"), True, [], {}, datetime.date(2020, 1, 2),
                datetime.datetime(2020, 1, 2, 3, 4), 2**70]


def _same_verdict(data, schema, override=False):
    """False when the compiled validator passes what jsonschema refuses."""
    checker = validator(schema, override=override)
    return not checker.passes(data) or checker.detailed.is_valid(data)


@pytest.mark.parametrize("schema", sorted(p.name for p in SCHEMA_DIR.glob("*.json")))
def test_schema_files_meet_the_meta_schema(schema):
    # Checked here rather than at every start.
    Draft202012Validator.check_schema(json.loads((SCHEMA_DIR / schema).read_text(encoding="utf-8")))


@pytest.mark.parametrize(("path", "schema"), list(_files()), ids=lambda x: getattr(x, "name", x))
def test_shipped_files_pass_both(path, schema):
    data = tomllib.loads(path.read_text(encoding="utf-8"))
    checker = validator(schema)
    assert checker.passes(data) and checker.detailed.is_valid(data)


# A few ingredient files with many kinds of value, and every table file.
SAMPLE = [(p, s) for p, s in _files() if s != "ingredient.schema.json"] + [
    (p, "ingredient.schema.json") for p in sorted(INGREDIENT_FILES, key=lambda p: -p.stat().st_size)[:6]]


@pytest.mark.parametrize(("path", "schema"), SAMPLE, ids=lambda x: getattr(x, "name", x))
def test_one_change_anywhere_is_never_passed_unchecked(path, schema):
    data = tomllib.loads(path.read_text(encoding="utf-8"))
    differ = []
    for where in paths(data):
        if not where:
            continue
        for value in REPLACEMENTS:
            variant = changed(data, where, value)
            if not _same_verdict(variant, schema):
                differ.append((where, value))
        if isinstance(get(data, where), dict) and not _same_verdict(changed(data, where + ("unknown_field",), 1), schema):
            differ.append((where, "unknown_field"))
    assert not differ


def test_overlay_variant_is_never_passed_unchecked():
    # A site file adding values to a shipped record carries only id and values.
    data = tomllib.loads(INGREDIENT_FILES[0].read_text(encoding="utf-8"))
    partial = {"id": data["id"], "values": data["values"]}
    assert validator("ingredient.schema.json", override=True).passes(partial)
    assert not validator("ingredient.schema.json").passes(partial)
    for key in ("id", "values"):
        assert _same_verdict({k: v for k, v in partial.items() if k != key}, "ingredient.schema.json", override=True)
