"""Every 200 JSON answer the API tests receive through the `client` fixture
is checked against its operation's response schema in the committed spec,
with unknown keys refused: an answer that grows a member the spec does not
publish fails the test that received it."""
from __future__ import annotations

import copy
import json
import re

import jsonschema
import pytest
from flask.testing import FlaskClient

from service.http.spec import SPEC_PATH


def _closed(node):
    """The schema with every object that lists its properties closed to
    others (unless it says what others may be), in place."""
    if isinstance(node, dict):
        if "properties" in node and "additionalProperties" not in node:
            node["additionalProperties"] = False
        for value in node.values():
            _closed(value)
    elif isinstance(node, list):
        for value in node:
            _closed(value)
    return node


def _answer_validators() -> list[tuple[re.Pattern, str, jsonschema.protocols.Validator]]:
    spec = json.loads(SPEC_PATH.read_text(encoding="utf-8"))
    components = _closed(copy.deepcopy(spec["components"]))
    out = []
    for path, operations in spec["paths"].items():
        pattern = re.compile("^" + re.sub(r"\\\{[^}]+\\\}", "[^/]+", re.escape(path)) + "$")
        for method, operation in operations.items():
            content = operation.get("responses", {}).get("200", {}).get("content", {})
            if "application/json" not in content:
                continue
            schema = {**_closed(copy.deepcopy(content["application/json"]["schema"])), "components": components}
            out.append((pattern, method.upper(), jsonschema.Draft202012Validator(schema)))
    return out


VALIDATORS = _answer_validators()


def answer_validator(method: str, path: str):
    """The validator of a 200 answer to `method path`, or None."""
    found = [v for pattern, m, v in VALIDATORS if m == method and pattern.match(path)]
    return found[0] if found else None


class AnswerCheckingClient(FlaskClient):
    def open(self, *args, **kwargs):
        response = super().open(*args, **kwargs)
        if response.status_code == 200 and response.mimetype == "application/json":
            request = response.request
            validator = answer_validator(request.method, request.path)
            assert validator, f"no 200 answer schema in the spec for {request.method} {request.path}"
            errors = sorted(validator.iter_errors(response.get_json()), key=lambda e: list(e.absolute_path))
            assert not errors, f"{request.method} {request.path}: answer breaks its schema: " + "; ".join(
                f"at /{'/'.join(map(str, e.absolute_path))}: {e.message}" for e in errors[:5])
        return response


@pytest.fixture()
def client(app):
    return AnswerCheckingClient(app, app.response_class, use_cookies=True)

