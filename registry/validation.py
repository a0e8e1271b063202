"""The JSON Schemas one data file must satisfy, and every schema fault of a
file, each named by its field (the first is the one jsonschema judges most
relevant, so that a reader of one fault sees the same as before)."""
from __future__ import annotations

import copy
import json
from functools import lru_cache
from pathlib import Path

from jsonschema import Draft202012Validator
from jsonschema.exceptions import ValidationError, best_match
from referencing import Registry as SchemaRegistry
from referencing import Resource

from registry.errors import RegistryError

SCHEMA_DIR = Path(__file__).resolve().parent / "schema"


@lru_cache(maxsize=None)
def _schema(name: str) -> dict:
    schema = json.loads((SCHEMA_DIR / name).read_text(encoding="utf-8"))
    Draft202012Validator.check_schema(schema)
    return schema


@lru_cache(maxsize=None)
def validator(name: str, override: bool = False) -> Draft202012Validator:
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


def _fault(error: ValidationError, file: str) -> RegistryError:
    where = "/".join(str(p) for p in error.absolute_path) or "(top level)"
    message = error.message
    if error.validator == "oneOf" and isinstance(error.instance, dict) and "value" in error.instance:
        message = "give either value, or low and high, not both"
    elif error.validator == "oneOf" and isinstance(error.instance, dict):
        message = "a value needs 'value', or 'low' and 'high'"
    elif error.validator == "required" and error.schema_path and "then" in error.schema_path:
        message = f"{message} (needed with the record's kind, status, doubt or retirement)"
    return RegistryError(file, where, message)


def schema_faults(data: dict, checker: Draft202012Validator, file: str) -> list[tuple[tuple, RegistryError]]:
    """Every field of one file that breaks its schema, as (path in the data,
    error), one per field, the most relevant field first; [] when the file
    satisfies its schema."""
    errors = list(checker.iter_errors(data))
    # A failed allOf also leaves its properties "unevaluated": report the
    # cause, not that echo. best_match descends into oneOf to the specific fault.
    causes = [e for e in errors if e.validator != "unevaluatedProperties"] or errors
    if not causes:
        return []
    by_field: dict[tuple, list[ValidationError]] = {}
    for error in causes:
        by_field.setdefault(tuple(best_match([error]).absolute_path), []).append(error)
    first = tuple(best_match(causes).absolute_path)
    # One fault per field (a status both unknown and not 'unverified' is one
    # fault to put right): the one jsonschema judges most relevant. The field
    # best_match picks for the whole file comes first, as a single-fault
    # reader has always seen it.
    paths = sorted(by_field, key=lambda path: path != first)
    return [(path, _fault(best_match(by_field[path]), file)) for path in paths]
