"""The committed OpenAPI document and the running app cannot drift apart."""
import json

from service.http.spec import SPEC_PATH, build_spec, spec_json


def test_committed_spec_is_what_the_code_builds():
    committed = SPEC_PATH.read_text(encoding="utf-8")
    assert committed == spec_json(build_spec()), "openapi/openapi.json is stale: run `python -m service.http.spec --write`"


def test_served_spec_is_the_committed_one(client):
    served = client.get("/openapi.json")
    assert served.status_code == 200 and served.mimetype == "application/json"
    assert served.get_json() == json.loads(SPEC_PATH.read_text(encoding="utf-8"))


def test_routes_and_spec_paths_agree(app):
    spec = build_spec()
    documented = {(path, method.upper()) for path, item in spec["paths"].items() for method in item}
    served = set()
    for rule in app.url_map.iter_rules():
        # /metrics is Prometheus' text format for a scraper, not part of this API's contract.
        if rule.endpoint in ("static", "meta.openapi_json", "meta.docs", "meta.metrics"):
            continue
        path = rule.rule.replace("<ingredient_id>", "{ingredient_id}")
        served |= {(path, m) for m in rule.methods - {"HEAD", "OPTIONS"}}
    assert served == documented


def test_every_operation_documents_its_errors():
    spec = build_spec()
    for path, item in spec["paths"].items():
        for method, op in item.items():
            codes = set(op["responses"])
            assert "405" in codes and "headers" in op["responses"]["405"], (path, method)
            if method == "post":
                assert {"400", "411", "413", "415", "422"} <= codes, (path, method)
            for code, response in op["responses"].items():
                media = "application/json" if code == "200" else "application/problem+json"
                assert media in response["content"], (path, method, code)


def test_spec_is_openapi_3_1():
    spec = build_spec()
    assert spec["openapi"] == "3.1.0"
    assert "pharmacist" in spec["info"]["description"]


def test_spec_validates_against_the_openapi_3_1_schema():
    # The OpenAPI Initiative's 3.1 JSON Schema, as bundled with schemathesis.
    from jsonschema import Draft202012Validator
    from schemathesis.specs.openapi.definitions import OPENAPI_31

    errors = [e.message for e in Draft202012Validator(OPENAPI_31).iter_errors(build_spec())]
    assert errors == []


def test_recorded_answer_examples_are_what_the_service_answers(app):
    from service.http.answer_examples import RESPONSE_EXAMPLES_PATH, examples_json, record

    assert RESPONSE_EXAMPLES_PATH.read_text(encoding="utf-8") == examples_json(record(app)), \
        "openapi/response_examples.json is stale: run `python -m service.http.spec --write`"


def test_every_operation_has_a_request_and_a_response_example():
    spec = build_spec()
    for path, item in spec["paths"].items():
        for method, op in item.items():
            ok = op["responses"]["200"]["content"]
            assert ok["application/json"].get("examples"), (path, method, "response example")
            if "text/markdown" in ok and op["operationId"] == "createWorksheet":
                assert ok["text/markdown"].get("examples"), (path, "markdown example")
            if method == "post":
                assert op["requestBody"]["content"]["application/json"].get("examples"), (path, "request example")
            elif op.get("parameters"):
                assert any("example" in p for p in op["parameters"]), (path, "parameter example")
