"""Text that cannot hurt the service: control characters and lone surrogates
in a name are refused with 422 naming the field and the rule; in a key, a
query string or a path they can never turn a 4xx into a 500."""
import json

import pytest

from tests.api.helpers import problem_pointers

BLEND = "/v1/blends/hlb"
PAIR = {"ingredient": "polysorbate-80", "amount": {"value": 1, "unit": "g"}}


def post_text(client, path, text):
    # Sent as written: "\ud800" stays a JSON escape the server has to parse,
    # as a client could send it (the test client could not encode it raw).
    return client.post(path, data=text.encode("ascii"), content_type="application/json")


def inline_blend(name_json: str) -> str:
    return ('{"components": [{"inline": {"name": "%s", "hlb": 5}, "amount": {"value": 1, "unit": "g"}}, %s]}'
            % (name_json, json.dumps(PAIR)))


def test_lone_surrogate_in_a_name_was_a_500_and_is_a_422_naming_the_rule(client):
    # Rule no_lone_surrogates: before it, every endpoint echoing names answered 500
    # (the answer could not be encoded as UTF-8).
    r = post_text(client, BLEND, inline_blend("\\ud800"))
    assert r.status_code == 422
    assert problem_pointers(r) == ["#/components/0/inline/name"]
    assert r.get_json()["errors"][0]["rule"] == "no_lone_surrogates"


@pytest.mark.parametrize("name_json", ["a\\u0000b", "tab\\there", "two\\nlines", "cr\\r", "del\\u007f", "c1\\u0085", "c1\\u009f"])
def test_control_characters_in_a_name_are_refused(client, name_json):
    # Rule no_control_characters: C0 (tab, newline and CR included), DEL and C1.
    r = post_text(client, BLEND, inline_blend(name_json))
    assert r.status_code == 422
    assert problem_pointers(r) == ["#/components/0/inline/name"]
    error = r.get_json()["errors"][0]
    assert error["rule"] == "no_control_characters" and "U+" in error["detail"]


def test_printable_names_still_pass(client):
    # A paired surrogate (an astral character) and non-ASCII letters are text.
    r = post_text(client, BLEND, inline_blend("\\u00e9mulsifiant \\ud83e\\uddea \\u00b5"))
    assert r.status_code == 200, r.get_data(as_text=True)


def test_the_estimate_name_is_checked_too(client):
    r = client.post("/v1/hlb-estimates", json={"method": "griffin_oxyethylene", "name": "x\ty", "oxyethylene_percent": 50})
    assert r.status_code == 422 and problem_pointers(r) == ["#/name"]
    assert r.get_json()["errors"][0]["rule"] == "no_control_characters"


@pytest.mark.parametrize("key", ["\\ud800", "\\udfff\\u0001", "a/\\u0085~"])
def test_a_hostile_unknown_key_is_a_422_that_can_be_encoded(client, key):
    # An unknown key is echoed in the pointer: written as \uXXXX, never raw.
    text = '{"components": [%s, %s], "%s": 1}' % (json.dumps(PAIR), json.dumps(PAIR), key)
    r = post_text(client, BLEND, text)
    assert r.status_code == 422
    [where] = problem_pointers(r)
    assert where.startswith("#/") and all(ord(c) >= 0x20 and not 0x7F <= ord(c) <= 0x9F and not 0xD800 <= ord(c) <= 0xDFFF for c in where)
    assert "\\u" in where


def test_control_characters_in_a_query_value_are_refused(client):
    r = client.get("/v1/ingredients?q=oil%01")
    assert r.status_code == 422
    assert problem_pointers(r) == ["q"] and r.get_json()["errors"][0]["rule"] == "no_control_characters"


def test_hostile_query_keys_and_utf8_surrogate_bytes_never_give_a_500(client):
    # Encoded surrogate bytes arrive as U+FFFD (werkzeug decodes with replacement): a search with no match.
    assert client.get("/v1/ingredients?q=a%ED%A0%80").status_code == 200
    r = client.get("/v1/ingredients?a%01%2Fb=1")
    assert r.status_code == 422 and problem_pointers(r) == ["a\\u0001/b"]


@pytest.mark.parametrize("path_id", ["%ED%A0%80", "a%01b", "%C2%85", "%7F"])
def test_a_hostile_path_id_is_a_404_whose_detail_is_printable(client, path_id):
    r = client.get(f"/v1/ingredients/{path_id}")
    assert r.status_code == 404
    problem_pointers(r)
    detail = r.get_json()["detail"]
    assert not any(ord(c) < 0x20 or 0x7F <= ord(c) <= 0x9F for c in detail)


def test_a_duplicate_hostile_key_is_a_400_that_can_be_encoded(client):
    # The strict parser names the duplicate key; the problem writes its surrogate as \ud800.
    r = post_text(client, BLEND, '{"\\ud800\\u0001": 1, "\\ud800\\u0001": 2}')
    assert r.status_code == 400
    problem_pointers(r)
    assert "\\ud800\\u0001" in r.get_json()["detail"]
