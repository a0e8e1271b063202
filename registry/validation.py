"""The JSON Schemas one data file must satisfy, and every schema fault of a
file, each named by its field (the first is the one jsonschema judges most
relevant, so that a reader of one fault sees the same as before).

Two validators judge a file. jsonschema_rs (compiled, about a hundred times
faster) says whether it satisfies its schema: nearly every file does, and a
start-up then costs milliseconds, not a second for 1000 ingredients. Only a
file it refuses goes to jsonschema, which names each fault as it always has.
tests/registry/test_validation.py holds both to the same verdict."""
from __future__ import annotations

import copy
import json
from functools import lru_cache
from pathlib import Path

import jsonschema_rs

from registry.errors import RegistryError

SCHEMA_DIR = Path(__file__).resolve().parent / "schema"


@lru_cache(maxsize=None)
def _schema(name: str) -> dict:
    # The schema files themselves are checked against the meta-schema by
    # tests/registry/test_validation.py, not at every start.
    return json.loads((SCHEMA_DIR / name).read_text(encoding="utf-8"))


def _variant(name: str, override: bool) -> dict:
    schema = _schema(name)
    if override:
        # An overlay file for an ingredient the registry already holds carries
        # only its id, values and notes; the rest stays as shipped.
        schema = copy.deepcopy(schema)
        schema["required"] = ["id", "values"]
    return schema


class Checker:
    """One schema's two validators: the fast verdict, and the faults."""

    def __init__(self, name: str, override: bool):
        self.name, self.override = name, override
        self._fast = jsonschema_rs.Draft202012Validator(_variant(name, override), registry=_fast_registry())

    def passes(self, data: dict) -> bool:
        try:
            return self._fast.is_valid(data)
        except (ValueError, TypeError, OverflowError):
            # A value it cannot take in (jsonschema judges it): not a pass.
            return False

    @property
    def detailed(self):
        return _detailed(self.name, self.override)


@lru_cache(maxsize=None)
def validator(name: str, override: bool = False) -> Checker:
    return Checker(name, override)


def _schema_files() -> list[dict]:
    return [_schema(p.name) for p in sorted(SCHEMA_DIR.glob("*.json"))]


@lru_cache(maxsize=None)
def _fast_registry() -> jsonschema_rs.Registry:
    """The schema files by their $id, so that one may refer to another."""
    return jsonschema_rs.Registry([(s["$id"], s) for s in _schema_files()])


@lru_cache(maxsize=None)
def _detailed(name: str, override: bool):
    from jsonschema import Draft202012Validator
    from referencing import Registry as SchemaRegistry
    from referencing import Resource

    registry = SchemaRegistry().with_resources([(s["$id"], Resource.from_contents(s)) for s in _schema_files()])
    return Draft202012Validator(_variant(name, override), registry=registry)


def _fault(error, file: str) -> RegistryError:
    where = "/".join(str(p) for p in error.absolute_path) or "(top level)"
    message = error.message
    if error.validator == "oneOf" and isinstance(error.instance, dict) and "value" in error.instance:
        message = "give either value, or low and high, not both"
    elif error.validator == "oneOf" and isinstance(error.instance, dict):
        message = "a value needs 'value', or 'low' and 'high'"
    elif error.validator == "required" and error.schema_path and "then" in error.schema_path:
        message = f"{message} (needed with the record's kind, status, doubt or retirement)"
    return RegistryError(file, where, message)


def schema_faults(data: dict, checker: Checker, file: str) -> list[tuple[tuple, RegistryError]]:
    """Every field of one file that breaks its schema, as (path in the data,
    error), one per field, the most relevant field first; [] when the file
    satisfies its schema."""
    if checker.passes(data):
        return []
    from jsonschema.exceptions import best_match

    errors = list(checker.detailed.iter_errors(data))
    # A failed allOf also leaves its properties "unevaluated": report the
    # cause, not that echo. best_match descends into oneOf to the specific fault.
    causes = [e for e in errors if e.validator != "unevaluatedProperties"] or errors
    if not causes:
        return []
    by_field: dict[tuple, list] = {}
    for error in causes:
        by_field.setdefault(tuple(best_match([error]).absolute_path), []).append(error)
    first = tuple(best_match(causes).absolute_path)
    # One fault per field (a status both unknown and not 'unverified' is one
    # fault to put right): the one jsonschema judges most relevant. The field
    # best_match picks for the whole file comes first, as a single-fault
    # reader has always seen it.
    paths = sorted(by_field, key=lambda path: path != first)
    return [(path, _fault(best_match(by_field[path]), file)) for path in paths]
