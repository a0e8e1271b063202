"""What happened, for the pharmacy's records: a JSON log line per request,
the request id in every line, header and problem, readiness, and the
Prometheus metrics of one process. Common practice, no source (the
X-Request-ID convention; Prometheus' text exposition format)."""
from __future__ import annotations

import io
import json
import logging
import re

import pytest
from prometheus_client.parser import text_string_to_metric_families

from service.http.logs import RequestContextFilter, json_formatter, logconfig

BLEND = {"components": [{"ingredient": "polysorbate-80", "amount": {"value": 9, "unit": "g"}},
                        {"ingredient": "sorbitan-monooleate", "amount": {"value": 1, "unit": "g"}}]}
GENERATED = re.compile(r"[0-9a-f]{32}")


@pytest.fixture()
def log_lines():
    """The JSON lines the service logs during the test, through the formatter
    and filter gunicorn's configuration uses; a callable that parses them."""
    stream = io.StringIO()
    handler = logging.StreamHandler(stream)
    handler.setFormatter(json_formatter())
    handler.addFilter(RequestContextFilter())
    logger = logging.getLogger("service")
    old_level = logger.level
    logger.addHandler(handler)
    logger.setLevel(logging.INFO)
    try:
        yield lambda: [json.loads(line) for line in stream.getvalue().splitlines()]
    finally:
        logger.removeHandler(handler)
        logger.setLevel(old_level)


def request_lines(lines):
    return [line for line in lines if line["logger"] == "service.requests"]


def test_each_request_is_one_json_line_with_its_fields(client, app, log_lines):
    response = client.post("/v1/blends/hlb", json=BLEND, headers={"X-Request-ID": "order-2291.line-3"})
    assert response.status_code == 200
    (line,) = request_lines(log_lines())
    assert line["request_id"] == "order-2291.line-3" == response.headers["X-Request-ID"]
    assert (line["method"], line["path"], line["status"], line["operation_id"]) == ("POST", "/v1/blends/hlb", 200, "blendHlb")
    assert line["registry_version"] == app.extensions["registry"].version == response.headers["Registry-Version"]
    assert isinstance(line["latency_ms"], float) and line["latency_ms"] >= 0
    assert line["level"] == "INFO" and re.fullmatch(r"\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d\.\d+\+00:00", line["time"])
    assert isinstance(line["pid"], int)


def test_a_route_outside_the_spec_has_no_operation_id(client, log_lines):
    client.get("/no-such-path")
    (line,) = request_lines(log_lines())
    assert (line["status"], line["operation_id"]) == (404, None)


def test_neither_the_body_nor_the_authorization_header_is_logged(client, log_lines):
    body = {"components": [{"ingredient": "body-marker-7f3e", "amount": {"value": 1, "unit": "g"}}]}
    client.post("/v1/blends/hlb?q=query-marker-51", json=body, headers={"Authorization": "Bearer token-marker-9c2a"})
    text = json.dumps(log_lines())
    assert "body-marker-7f3e" not in text and "token-marker-9c2a" not in text and "query-marker-51" not in text
    assert "Authorization" not in text


@pytest.mark.parametrize("sent", ["a", "order-2291.line-3", "A_b.c-9", "x" * 128])
def test_a_plain_request_id_is_kept(client, sent):
    response = client.get("/healthz", headers={"X-Request-ID": sent})
    assert response.headers["X-Request-ID"] == sent


@pytest.mark.parametrize("sent", ["", "x" * 129, "has space", "semi;colon", "<script>", "é-accent", "a/b"])
def test_any_other_request_id_is_replaced_never_echoed(client, log_lines, sent):
    response = client.get("/healthz", headers={"X-Request-ID": sent})
    kept = response.headers["X-Request-ID"]
    assert GENERATED.fullmatch(kept) and kept != sent
    lines = log_lines()
    assert request_lines(lines)[0]["request_id"] == kept
    if sent:
        assert sent not in json.dumps(lines, ensure_ascii=False)


def test_a_request_id_is_generated_when_none_is_sent(client):
    first, second = (client.get("/healthz").headers["X-Request-ID"] for _ in range(2))
    assert GENERATED.fullmatch(first) and GENERATED.fullmatch(second) and first != second


@pytest.mark.parametrize(("method", "path", "body", "status"), [
    ("POST", "/v1/blends/hlb", {"components": 5}, 422),
    ("POST", "/v1/blends/hlb", b"{NaN", 400),
    ("GET", "/v1/ingredients/no-such-thing", None, 404),
    ("DELETE", "/healthz", None, 405),
])
def test_every_problem_carries_the_request_id(client, method, path, body, status):
    kwargs = {"json": body} if isinstance(body, dict) else {"data": body, "content_type": "application/json"} if body else {}
    for sent in ("case-17", None):
        response = client.open(path, method=method, headers={"X-Request-ID": sent} if sent else {}, **kwargs)
        assert response.status_code == status and response.mimetype == "application/problem+json"
        assert response.get_json()["request_id"] == response.headers["X-Request-ID"] == (sent or response.headers["X-Request-ID"])


def test_an_unhandled_error_logs_its_error_id_with_the_request_id(app, client, log_lines, monkeypatch):
    def broken():
        raise RuntimeError("a fault of the service's own")

    monkeypatch.setitem(app.view_functions, "meta.healthz", broken)
    response = client.get("/healthz", headers={"X-Request-ID": "fault-1"})
    body = response.get_json()
    assert response.status_code == 500 and body["request_id"] == "fault-1"
    lines = log_lines()
    (error,) = [line for line in lines if line.get("error_id")]
    assert error["error_id"] == body["error_id"] and error["request_id"] == "fault-1" and error["level"] == "ERROR"
    assert "RuntimeError" in error["exc_info"]
    assert request_lines(lines)[0]["status"] == 500


def test_readyz_names_the_registry_served(client, app):
    response = client.get("/readyz")
    assert response.status_code == 200
    body = response.get_json()
    assert body["status"] == "ready"
    assert body["registry"]["version"] == app.extensions["registry"].version == response.headers["Registry-Version"]


def _samples(client) -> dict:
    response = client.get("/metrics")
    assert response.status_code == 200 and response.mimetype == "text/plain"
    return {(s.name, tuple(sorted(s.labels.items()))): s.value
            for family in text_string_to_metric_families(response.get_data(as_text=True)) for s in family.samples}


def test_metrics_count_each_request_by_operation_and_status(client, app):
    key = ("emulsion_http_requests_total", (("operation", "readyz"), ("status", "200")))
    latency = ("emulsion_http_request_duration_seconds_count", (("operation", "readyz"), ("status", "200")))
    before = _samples(client)
    client.get("/readyz")
    client.get("/readyz")
    after = _samples(client)
    assert after[key] - before.get(key, 0) == 2
    assert after[latency] - before.get(latency, 0) == 2
    assert after[("emulsion_registry_info", (("version", app.extensions["registry"].version),))] == 1
    unmatched = ("emulsion_http_requests_total", (("operation", "unmatched"), ("status", "404")))
    client.get("/made-up-path-1")
    # A made-up path is counted as unmatched, never under its own name.
    assert _samples(client)[unmatched] - after.get(unmatched, 0) == 1


def test_the_gunicorn_log_configuration_sends_gunicorn_lines_through_the_json_handler():
    config = logconfig("warning")
    assert config["loggers"]["gunicorn.error"] == {"level": "WARNING", "handlers": ["stdout"], "propagate": False}
    assert config["handlers"]["stdout"]["filters"] == ["request"] and config["handlers"]["stdout"]["stream"] == "ext://sys.stdout"
