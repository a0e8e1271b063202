"""The service's Schema (service/http/schemas/base_schema.py) loads as
marshmallow's own Schema does: for every calculation's request schema, on
the spec's examples and on bodies broken at any point (a member removed,
replaced by a value of any JSON type, or an unknown member added), both give
the same loaded data, or the same errors with the same partly loaded data.
The reference is marshmallow 4.4.0's Schema._deserialize itself (PyPI), run
on the same schema instances."""
from __future__ import annotations

import copy

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from marshmallow import Schema as MarshmallowSchema, ValidationError

from service.http.operations import CALCULATIONS
from service.http.schemas import base_schema
from service.http.schemas.batch_bodies import BatchRequestSchema
from service.http.spec_examples import EXAMPLES
from tests.json_tree import DROP, changed, get, paths

_CASES = [(op_id, name, example["value"]) for op_id, op in CALCULATIONS.items() for name, example in EXAMPLES.get(op_id, {}).items()]
_SCHEMAS = {op_id: op.request for op_id, op in CALCULATIONS.items()}
_SCHEMAS["batch"] = BatchRequestSchema()
_CASES += [("batch", name, example["value"]) for name, example in EXAMPLES.get("batch", {}).items()]

_JSON = st.recursive(st.none() | st.booleans() | st.integers(-10**6, 10**6) | st.floats(allow_nan=False, allow_infinity=False) | st.text(max_size=12),
                     lambda inner: st.lists(inner, max_size=3) | st.dictionaries(st.text(max_size=6), inner, max_size=3), max_leaves=6)


def _outcome(schema, data):
    try:
        return ("loaded", schema.load(data))
    except ValidationError as error:
        return ("refused", error.messages, error.valid_data)


def _both(schema, data, monkeypatch):
    ours = _outcome(schema, copy.deepcopy(data))
    with monkeypatch.context() as m:
        m.setattr(base_schema.Schema, "_deserialize", MarshmallowSchema._deserialize)
        theirs = _outcome(schema, copy.deepcopy(data))
    return ours, theirs


def test_every_schema_of_a_request_is_the_services():
    def walk(schema, seen):
        if id(schema) in seen:
            return
        seen.add(id(schema))
        assert isinstance(schema, base_schema.Schema), type(schema).__name__
        for field in schema.fields.values():
            for inner in (field, getattr(field, "inner", None)):
                if inner is not None and hasattr(inner, "schema") and hasattr(inner, "nested"):
                    walk(inner.schema, seen)

    seen: set = set()
    for schema in _SCHEMAS.values():
        walk(schema, seen)
    assert len(seen) > 40


@pytest.mark.parametrize("op_id,name,body", _CASES, ids=[f"{c[0]}/{c[1]}" for c in _CASES])
def test_the_spec_examples_load_alike(op_id, name, body, monkeypatch):
    ours, theirs = _both(_SCHEMAS[op_id], body, monkeypatch)
    assert ours == theirs
    assert ours[0] == "loaded"


@settings(max_examples=400, suppress_health_check=[HealthCheck.function_scoped_fixture, HealthCheck.too_slow])
@given(st.data())
def test_broken_bodies_are_refused_alike(monkeypatch, data):
    op_id, _name, body = data.draw(st.sampled_from(_CASES))
    path = data.draw(st.sampled_from(list(paths(body))))
    kind = data.draw(st.sampled_from(["remove", "replace", "add"]))
    if kind == "add" and isinstance(get(body, path), dict):
        body = changed(body, path + (data.draw(st.text(min_size=1, max_size=8)),), data.draw(_JSON))
    elif path == ():
        body = data.draw(_JSON) if kind == "replace" else body
    elif kind == "replace":
        body = changed(body, path, data.draw(_JSON))
    elif kind == "remove" and isinstance(get(body, path[:-1]), dict):
        body = changed(body, path, DROP)
    ours, theirs = _both(_SCHEMAS[op_id], body, monkeypatch)
    assert ours == theirs


def test_an_unknown_member_and_a_wrong_type_are_refused_alike(monkeypatch):
    # Two fixed cases, for a reader: what the comparison compares.
    body = copy.deepcopy(EXAMPLES["blendHlb"]["by_mass"]["value"])
    body["colour"] = "white"
    body["components"][0]["amount"]["value"] = "3.64"
    ours, theirs = _both(_SCHEMAS["blendHlb"], body, monkeypatch)
    assert ours == theirs
    assert ours[0] == "refused" and "colour" in ours[1] and "components" in ours[1]
