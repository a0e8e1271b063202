"""The answer check of tests/api/conftest.py refuses what the spec does not
publish (guards it against passing vacuously)."""
from __future__ import annotations

from tests.api.conftest import AnswerCheckingClient, answer_validator


def test_the_client_checks_answers(client):
    assert isinstance(client, AnswerCheckingClient)


def test_every_json_operation_has_a_validator():
    for method, path in [("POST", "/v1/blends/hlb"), ("POST", "/v1/worksheets"), ("GET", "/v1/ingredients/polysorbate-80"),
                         ("GET", "/healthz")]:
        assert answer_validator(method, path) is not None, (method, path)


def test_an_unpublished_member_is_refused(client):
    answer = client.get("/v1/ingredients/polysorbate-80").get_json()
    validator = answer_validator("GET", "/v1/ingredients/polysorbate-80")
    assert validator.is_valid(answer)
    answer["unpublished"] = 1
    assert not validator.is_valid(answer)
    # ...and deep inside too: the ingredient object with a member of its own.
    answer.pop("unpublished")
    answer["ingredient"]["unpublished"] = 1
    assert not validator.is_valid(answer)
