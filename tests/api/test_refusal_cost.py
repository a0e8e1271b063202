"""The cost of a refusal is bounded: a list is refused by its length before
its items are read, and a problem lists at most MAX_ERRORS faults, counting
the rest. Sizes are checked, never times (tests/benchmarks measures those)."""
import json

from service.http.problems import MAX_ERRORS
from tests.api.helpers import comp, invalid_list_body, problem_pointers

BLEND = "/v1/blends/hlb"


def test_a_64_kib_body_of_invalid_items_gets_a_small_answer(client):
    # Rule list_length, checked first: before it the answer was about 486 KB (3116 error items).
    body = invalid_list_body(64 * 1024)
    assert len(body) > 60 * 1024
    r = client.post(BLEND, data=body, content_type="application/json")
    assert r.status_code == 422
    assert len(r.get_data()) < 20_000
    assert problem_pointers(r) == ["#/components"]
    error = r.get_json()["errors"][0]
    assert error["rule"] == "list_length" and "at most 30" in error["detail"]


def test_an_overlong_list_is_refused_without_reading_its_items(client):
    # Items that are not even objects: the length alone refuses the list.
    r = client.post("/v1/worksheets", json={"emulsion_type": "O/W", "batch": {"value": 1, "unit": "g"}, "ingredients": [None] * 41,
                                             "emulsifier": {"pair": [1, 2, 3]}})
    assert r.status_code == 422
    errors = {e["pointer"]: e for e in r.get_json()["errors"]}
    assert errors["#/ingredients"]["rule"] == "list_length" and "#/ingredients/0" not in errors
    assert errors["#/emulsifier/pair"]["rule"] == "list_length" and "exactly 2" in errors["#/emulsifier/pair"]["detail"]


def test_lists_within_bounds_still_name_each_bad_item(client):
    r = client.post(BLEND, json={"components": [comp("polysorbate-80", "1", "g"), comp("sorbitan-monooleate", 1, "grams")]})
    assert problem_pointers(r) == ["#/components/0/amount/value", "#/components/1/amount/unit"]


def test_the_error_list_is_capped_and_the_rest_counted(client):
    # Rule: at most MAX_ERRORS items; errors_total and errors_omitted say how many more there were.
    keys = {f"unknown_{i}": i for i in range(MAX_ERRORS + 25)}
    body = {"components": [comp("polysorbate-80", 1, "g"), comp("sorbitan-monooleate", 1, "g")], **keys}
    r = client.post(BLEND, data=json.dumps(body), content_type="application/json")
    problem = r.get_json()
    assert r.status_code == 422 and len(problem["errors"]) == MAX_ERRORS
    assert problem["errors_total"] == MAX_ERRORS + 25 and problem["errors_omitted"] == 25
    assert problem["detail"].startswith(f"{MAX_ERRORS + 25} input error(s)")


def test_a_short_error_list_carries_no_counts(client):
    r = client.post(BLEND, json={"components": [comp("polysorbate-80", 1, "g")]})
    assert r.status_code == 422 and "errors_total" not in r.get_json() and "errors_omitted" not in r.get_json()
