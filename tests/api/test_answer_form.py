"""Answers are sent as the use cases build them: compact JSON by default,
indented on request (`indent`), problems alike; every operation's 200 answer
is checked against its published schema through the answer-checking client
(tests/api/conftest.py), since no dump checks it per request; and the
envelope's one pass tidies floats and refuses non-finite numbers as the
separate passes did. The layouts compared against are those the standard
library's json module writes (Python documentation, json.dumps)."""
from __future__ import annotations

import json
import math

import pytest
from hypothesis import given
from hypothesis import strategies as st

from service.core.errors import CalculationError
from service.http.spec import build_spec
from service.usecases import answers
from service.usecases.methods import BLEND_HLB
from tests.api.conftest import AnswerCheckingClient

BLEND = {"components": [{"ingredient": "sorbitan-monooleate", "amount": {"value": 3.64, "unit": "g"}},
                        {"ingredient": "polysorbate-80", "amount": {"value": 6.36, "unit": "g"}}]}


def _compact(obj) -> str:
    return json.dumps(obj, separators=(",", ":"), ensure_ascii=False) + "\n"


def _requests(spec: dict):
    """(method, path, body) for every operation with a JSON 200 answer, from
    the spec's own request and path examples."""
    for path, operations in spec["paths"].items():
        for method, operation in operations.items():
            if "application/json" not in operation["responses"].get("200", {}).get("content", {}):
                continue
            for p in operation["parameters"]:
                if p["in"] == "path":
                    path = path.replace("{" + p["name"] + "}", p["example"])
            examples = operation.get("requestBody", {}).get("content", {}).get("application/json", {}).get("examples")
            yield operation["operationId"], method.upper(), path, next(iter(examples.values()))["value"] if examples else None


def test_every_operation_answer_is_checked_against_its_schema(client):
    assert isinstance(client, AnswerCheckingClient)
    seen = []
    for op_id, method, path, body in _requests(build_spec()):
        response = client.open(path, method=method, json=body)
        assert response.status_code == 200, (op_id, response.get_data(as_text=True)[:300])
        seen.append(op_id)
    assert len(seen) >= 20


def test_answers_are_compact_by_default(client):
    response = client.post("/v1/blends/hlb", json=BLEND)
    assert response.status_code == 200
    assert response.get_data(as_text=True) == _compact(response.get_json())


@pytest.mark.parametrize("indent", [1, 2, 4, 8])
def test_an_indented_answer_on_request(client, indent):
    compact = client.post("/v1/blends/hlb", json=BLEND).get_json()
    response = client.post(f"/v1/blends/hlb?indent={indent}", json=BLEND)
    assert response.status_code == 200
    assert response.get_json() == compact
    assert response.get_data(as_text=True) == json.dumps(compact, indent=indent, ensure_ascii=False) + "\n"


def test_indent_zero_is_compact_and_a_get_query_ignores_it(client):
    response = client.get("/v1/ingredients?indent=0&role=surfactant")
    assert response.status_code == 200
    assert response.get_data(as_text=True) == _compact(response.get_json())
    assert client.get("/v1/ingredients?indent=2&role=surfactant").get_json() == response.get_json()


def test_problems_are_compact_or_indented_alike(client):
    bad = {"components": []}
    response = client.post("/v1/blends/hlb", json=bad)
    assert response.status_code == 422 and response.mimetype == "application/problem+json"
    assert response.get_data(as_text=True) == _compact(response.get_json())
    indented = client.post("/v1/blends/hlb?indent=2", json=bad)
    assert indented.get_data(as_text=True) == json.dumps(indented.get_json(), indent=2, ensure_ascii=False) + "\n"


@pytest.mark.parametrize("value", ["9", "-1", "x", "2.0", "", "\u0663", "10"])
def test_a_bad_indent_is_refused_naming_it(client, value):
    response = client.get("/healthz", query_string={"indent": value})
    assert response.status_code == 422
    body = response.get_json()
    assert [e["parameter"] for e in body["errors"]] == ["indent"]
    # The refusal itself is compact: the indent asked for was not valid.
    assert response.get_data(as_text=True) == _compact(body)


def test_indent_given_twice_is_refused(client):
    response = client.get("/healthz?indent=1&indent=2")
    assert response.status_code == 422 and response.get_json()["errors"][0]["parameter"] == "indent"


def test_every_operation_declares_indent():
    spec = build_spec()
    for path, operations in spec["paths"].items():
        for method, operation in operations.items():
            names = [p["name"] for p in operation["parameters"] if p["in"] == "query" and "name" in p]
            assert "indent" in names, (method, path)
            assert "422" in operation["responses"], (method, path)


NESTED = {"a": 3.2352941176470584, "b": [11.600000000000001, {"c": 1e-12 / 3, "d": (0.1 + 0.2, 2)}], "e": "x", "f": None, "g": True, "h": 7,
          "whole": [5.0, -0.0, 9999999999.0, 12345678901.0, -12345678901.0, 1e300]}


def test_the_one_pass_tidies_as_tidy_does():
    # tidy_walk is the definition (a node at a time); tidy itself runs the one pass.
    assert answers._final(NESTED) == answers.tidy_walk(NESTED)
    assert json.dumps(answers._final(NESTED)) == json.dumps(answers.tidy_walk(NESTED)) == json.dumps(answers.tidy(NESTED))


@given(st.floats(allow_nan=False, allow_infinity=False))
def test_the_one_pass_agrees_with_tidy_on_every_float(x):
    # _final skips formatting whole numbers below 1e10; tidy formats all.
    assert json.dumps(answers._final({"x": x, "y": [x]})) == json.dumps(answers.tidy_walk({"x": x, "y": [x]}))


@pytest.mark.parametrize("bad", [math.inf, -math.inf, math.nan])
def test_tidy_leaves_a_non_finite_number_for_the_envelope_to_refuse(bad):
    # A worksheet tidied inside a record or an amounts-taken check must not
    # fail there on an overflow: the envelope refuses it, naming where.
    tidied = answers.tidy({"rows": [{"mass_g": 3.2352941176470584}, {"mass_g": bad}]})
    assert tidied["rows"][0]["mass_g"] == 3.235294118
    assert math.isnan(tidied["rows"][1]["mass_g"]) if math.isnan(bad) else tidied["rows"][1]["mass_g"] == bad


@pytest.mark.parametrize("bad", [math.inf, -math.inf, math.nan])
def test_the_one_pass_refuses_a_non_finite_result_naming_where(registry, bad):
    result = {"rows": [{"mass_g": 1.0}, {"mass_g": bad}]}
    with pytest.raises(CalculationError) as caught:
        answers.envelope(result, {}, BLEND_HLB, [], [], registry)
    assert caught.value.rule == "finite_result" and "result/rows/1/mass_g" in caught.value.message


def _containers(value):
    """Every dict and list inside `value`, by identity."""
    if isinstance(value, dict):
        yield value
        for v in value.values():
            yield from _containers(v)
    elif isinstance(value, (list, tuple)):
        if isinstance(value, list):
            yield value
        for v in value:
            yield from _containers(v)


def test_the_answer_shares_no_dict_or_list_with_the_request(registry):
    # The use cases hand the loaded request to the envelope uncopied: the
    # one pass builds new dicts and lists, so a later change to the answer
    # (the batch's shared sources, a caller's test) cannot reach the request.
    request = {"components": [{"amount": {"value": 1.5, "unit": "g"}}], "pair": ({"ingredient": "x"},)}
    answer = answers.envelope({"rows": [request["components"][0]]}, {"request": request}, BLEND_HLB, [], [], registry)
    seen = {id(c) for c in _containers(request)} - {id(request["pair"][0])}  # a tuple is kept as it is, members and all
    assert not seen & {id(c) for c in _containers(answer)}
    assert answer["inputs"]["request"] == request


def test_a_cycle_still_fails_to_encode():
    # The compact encoder skips the circular-reference check (service/http/jsonio.py):
    # a cycle, which no answer can hold, must still raise rather than pass.
    from service.http import jsonio

    looped: dict = {}
    looped["self"] = looped
    with pytest.raises(RecursionError):
        jsonio.encode(looped)


# The compact form of a calculation's answer is written by orjson
# (service/http/jsonio.py), everything else by json; the reference for both
# is json.dumps (Python documentation). orjson's own guarantee is RFC 8259
# output; what is checked here is that it writes the same values.
_JSON_VALUES = st.recursive(
    st.none() | st.booleans() | st.integers(-2**63, 2**63 - 1) | st.floats(allow_nan=False, allow_infinity=False) | st.text(),
    lambda inner: st.lists(inner, max_size=4) | st.dictionaries(st.text(max_size=8), inner, max_size=4), max_leaves=30)


@given(_JSON_VALUES)
def test_a_checked_answer_is_written_with_the_same_values_json_writes(value):
    from service.http import jsonio

    body = jsonio.encode(answers.CheckedAnswer({"result": value}))
    assert json.loads(body) == json.loads(_compact({"result": value}))
    assert body.endswith(b"\n") and b"\n" not in body[:-1]


def test_a_checked_answer_orjson_refuses_falls_back_to_json():
    # orjson refuses integers beyond 64 bits and lone surrogates; json writes
    # both, and the answer must not turn into a 500 for an echoed request.
    from service.http import jsonio

    for value in (2**70, -2**64, "\ud800"):
        assert jsonio.encode(answers.CheckedAnswer({"echo": value})) == _compact({"echo": value})


@pytest.mark.parametrize("bad", [math.inf, math.nan])
def test_a_plain_dict_with_a_non_finite_number_is_still_refused(bad):
    # orjson would write null: only an answer the envelope checked reaches it.
    from service.http import jsonio

    with pytest.raises(ValueError):
        jsonio.encode({"x": bad})


def test_the_envelope_returns_a_checked_answer(registry):
    answer = answers.envelope({"x": 1.5}, {}, BLEND_HLB, [], [], registry)
    assert type(answer) is answers.CheckedAnswer


def test_every_calculation_answer_goes_the_checked_road(client, monkeypatch):
    # A use case's answer must reach encode as the envelope built it, not
    # rebuilt into a plain dict on the way (which would silently lose the
    # faster encoder, and for a dict carrying a NaN, the refusal).
    from service.http import jsonio

    kinds, seen = [], 0
    real = jsonio.encode
    monkeypatch.setattr("service.http.bodies.encode", lambda obj, indent=0: kinds.append(type(obj)) or real(obj, indent))
    for op_id, method, path, body in _requests(build_spec()):
        if method == "POST" and path.startswith("/v1/") and path != "/v1/batch":
            kinds.clear()
            assert client.open(path, method=method, json=body).status_code == 200, op_id
            assert kinds == [answers.CheckedAnswer], op_id
            seen += 1
    assert seen >= 15
