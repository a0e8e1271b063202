"""POST /v1/batch: many calculations in one request, answered item by item.

The expected answers are the single calls' own (each item must be answered
as its own request is); the calculations themselves are checked against
their sources in tests/core and tests/api."""
from __future__ import annotations

import dataclasses
import json
import logging

import pytest

from service.http.operations import CALCULATIONS
from service.http.schemas.batch_bodies import MAX_ITEMS
from service.http.schemas.enums import BATCH_OPERATIONS
from service.http.spec import OPERATIONS
from service.http.spec_examples import EXAMPLES
from service.http.answer_examples import POST_PATHS
from service.usecases.shared_provenance import restored
from tests.api.helpers import comp, problem_pointers, unverified_surfactants

BLEND = EXAMPLES["blendHlb"]["by_mass"]["value"]
# Every request example of every batchable operation, as (operation, body).
EXAMPLE_ITEMS = [(op_id, ex["value"]) for op_id in BATCH_OPERATIONS for ex in EXAMPLES.get(op_id, {}).values()]


def _batch(client, items, **extra):
    response = client.post("/v1/batch", json={"items": [{"operation": op, "body": body} for op, body in items], **extra})
    assert response.status_code == 200, response.get_data(as_text=True)[:500]
    return response.get_json()


def test_the_batchable_operations_are_the_table_of_calculations_and_in_the_spec():
    assert BATCH_OPERATIONS == tuple(CALCULATIONS)
    spec_ids = {op[2] for op in OPERATIONS}
    assert set(BATCH_OPERATIONS) <= spec_ids
    # Every batchable operation has a request example, so the test below covers each.
    assert {op for op, _ in EXAMPLE_ITEMS} == set(BATCH_OPERATIONS)


def test_the_answers_are_built_in_their_final_form(app):
    # The batch answers with the use case's payload as it stands; the single
    # call dumps it through its answer schema. The two must be the same.
    registry = app.extensions["registry"]
    for op_id, body in EXAMPLE_ITEMS:
        op = CALCULATIONS[op_id]
        payload = op.run(op.request.load(body), registry, False)
        assert op.answer.dump(payload) == payload, op_id


def test_each_item_is_answered_as_its_own_request_apart_from_what_is_shared(client):
    batch = _batch(client, EXAMPLE_ITEMS)
    assert [item["index"] for item in batch["items"]] == list(range(len(EXAMPLE_ITEMS)))
    assert batch["answered"] == len(EXAMPLE_ITEMS) and batch["refused"] == 0
    for (op_id, body), item in zip(EXAMPLE_ITEMS, batch["items"]):
        single = client.post(POST_PATHS[op_id], json=body)
        assert single.status_code == 200
        assert item["operation"] == op_id and item["status"] == 200 and "problem" not in item
        assert "registry" not in item["answer"]
        assert all(isinstance(s, str) for s in item["answer"]["method"]["sources"])
        assert restored(item["answer"], batch) == single.get_json(), op_id
    assert batch["registry"] == single.get_json()["registry"]


def test_sources_and_values_used_are_listed_once_and_referred_to(client):
    batch = _batch(client, [("blendHlb", BLEND)] * 3)
    source_ids = [s["id"] for s in batch["sources"]]
    assert len(source_ids) == len(set(source_ids))
    # The same two surfactants' HLBs, three times: two values in all.
    assert len(batch["values_used"]) == 2 and len({v["id"] for v in batch["values_used"]}) == 2
    refs = [item["answer"]["values_used"] for item in batch["items"]]
    assert refs[0] == refs[1] == refs[2]
    assert [r["pointer"] for r in refs[0]] == ["#/components/0", "#/components/1"]
    assert {v["source"] for v in batch["values_used"]} <= set(source_ids)
    assert all(item["answer"]["cautions"] == [] for item in batch["items"]) and batch["cautions"]


def test_a_mixed_batch_is_answered_in_order_none_failing_the_others(client):
    invalid = {"components": [comp("polysorbate-80", -1, "g"), comp("sorbitan-monooleate", 1, "grams")]}
    refused = {"target_hlb": 17.5, "pair": [{"ingredient": "sorbitan-monostearate"}, {"ingredient": "polysorbate-60"}]}
    batch = _batch(client, [("blendHlb", BLEND), ("blendHlb", invalid), ("blendProportions", refused), ("blendHlb", BLEND)])
    statuses = [item["status"] for item in batch["items"]]
    assert statuses == [200, 422, 422, 200] and batch["answered"] == 2 and batch["refused"] == 2
    for (item, body, path) in ((batch["items"][1], invalid, "/v1/blends/hlb"), (batch["items"][2], refused, "/v1/blends/proportions")):
        single = client.post(path, json=body)
        expected = single.get_json()
        expected.pop("request_id")
        assert "answer" not in item and item["problem"] == expected
    # Pointers are the item's body's, as in its own request.
    assert {e["pointer"] for e in batch["items"][1]["problem"]["errors"]} == {"#/components/0/amount/value", "#/components/1/amount/unit"}
    assert batch["items"][2]["problem"]["errors"][0]["rule"] == "target_outside_reachable_range"
    assert batch["items"][0]["answer"] == batch["items"][3]["answer"]


def test_the_maximum_number_of_items_is_enforced(client):
    items = [{"operation": "blendHlb", "body": BLEND}]
    assert client.post("/v1/batch", json={"items": items * MAX_ITEMS}).status_code == 200
    response = client.post("/v1/batch", json={"items": items * (MAX_ITEMS + 1)})
    assert problem_pointers(response) == ["#/items"]
    assert response.get_json()["errors"][0]["rule"] == "list_length"
    assert problem_pointers(client.post("/v1/batch", json={"items": []})) == ["#/items"]


@pytest.mark.parametrize("operation", ["listIngredients", "healthz", "noSuchOperation"])
def test_an_operation_that_is_not_batchable_is_refused_at_its_pointer(client, operation):
    response = client.post("/v1/batch", json={"items": [{"operation": "blendHlb", "body": BLEND}, {"operation": operation, "body": {}}]})
    assert problem_pointers(response) == ["#/items/1/operation"]
    error = response.get_json()["errors"][0]
    assert error["rule"] == "enum" and repr(operation) in error["detail"] and "blendHlb" in error["detail"]


def test_an_item_without_its_body_or_with_a_stray_member_is_refused(client):
    response = client.post("/v1/batch", json={"items": [{"operation": "blendHlb"}, {"operation": "blendHlb", "body": BLEND, "strict": True}]})
    assert sorted(problem_pointers(response)) == ["#/items/0/body", "#/items/1/strict"]


def test_strict_mode_per_item_and_for_the_whole_batch(client, registry):
    first, second = unverified_surfactants(registry)
    body = {"components": [comp(first, 5, "g"), comp(second, 5, "g")]}
    batch = _batch(client, [("blendHlb", body), ("blendHlb", {**body, "strict": True})])
    assert [item["status"] for item in batch["items"]] == [200, 422]
    assert batch["items"][0]["answer"]["strict"] is False
    assert batch["items"][1]["problem"]["title"] == "Unverified values refused"
    assert batch["items"][1]["problem"] == {k: v for k, v in client.post("/v1/blends/hlb", json={**body, "strict": True}).get_json().items()
                                            if k != "request_id"}
    whole = _batch(client, [("blendHlb", body), ("blendHlb", BLEND)], strict=True)
    assert whole["items"][0]["status"] == 422
    # A blend of checked values passes strict mode; sorbitan monostearate's is, polysorbate 60's is not (registry status).
    strict_blend = whole["items"][1]
    single = client.post("/v1/blends/hlb", json={**BLEND, "strict": True})
    assert strict_blend["status"] == single.status_code


def test_a_fault_of_the_service_in_one_item_fails_that_item_alone(client, monkeypatch, caplog):
    def broken(data, registry, strict=False):
        raise RuntimeError("a fault of the service's own")

    monkeypatch.setitem(CALCULATIONS, "oilPhaseRequiredHlb", dataclasses.replace(CALCULATIONS["oilPhaseRequiredHlb"], use_case=broken))
    oil = EXAMPLES["oilPhaseRequiredHlb"]["lotion"]["value"]
    with caplog.at_level(logging.ERROR, logger="service"):
        batch = _batch(client, [("blendHlb", BLEND), ("oilPhaseRequiredHlb", oil), ("blendHlb", BLEND)])
    assert [item["status"] for item in batch["items"]] == [200, 500, 200]
    problem = batch["items"][1]["problem"]
    assert problem["title"] == "Internal Server Error" and "RuntimeError" not in problem["detail"]
    (logged,) = [r for r in caplog.records if getattr(r, "error_id", None)]
    assert logged.error_id == problem["error_id"] and logged.exc_info[0] is RuntimeError


def test_the_body_size_limit_still_applies(client, app):
    limit = app.config["MAX_BODY_BYTES"]
    raw = json.dumps({"items": [{"operation": "blendHlb", "body": BLEND}]}).encode()
    # Well-formed JSON, one byte over the limit by its whitespace.
    raw = raw[:-1] + b" " * (limit + 1 - len(raw)) + b"}"
    response = client.post("/v1/batch", data=raw, content_type="application/json")
    assert response.status_code == 413
