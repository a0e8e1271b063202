"""Headers on every kind of answer: nosniff, no referrer, a content security
policy, and a Cache-Control suited to the answer (OWASP REST Security Cheat
Sheet, "Security headers"; RFC 9111 for Cache-Control and section 3.5 for
answers to requests with Authorization)."""
from __future__ import annotations

import pytest

from service.http.app import create_app

TOKEN = "t0k3n-for-tests-only-4f9a1c2e7b"
BLEND = {"components": [{"ingredient": "polysorbate-80", "amount": {"value": 7, "unit": "g"}},
                        {"ingredient": "sorbitan-monooleate", "amount": {"value": 3, "unit": "g"}}]}

# (method, path, body, status, Cache-Control) for each kind of answer.
KINDS = [
    ("POST", "/v1/blends/hlb", BLEND, 200, "no-store"),  # a calculation
    ("POST", "/v1/worksheets/rescale", {}, 422, "no-store"),  # a refusal
    ("POST", "/v1/blends/hlb", b"{", 400, "no-store"),  # a malformed body
    ("GET", "/v1/ingredients/no-such-ingredient", None, 404, "no-store"),  # a problem on a registry path
    ("GET", "/no/such/path", None, 404, "no-store"),
    ("DELETE", "/v1/sources", None, 405, "no-store"),
    ("GET", "/healthz", None, 200, "no-store"),  # a probe says how the service is now
    ("GET", "/openapi.json", None, 200, "public, max-age=300"),
    ("GET", "/docs", None, 200, "public, max-age=300"),
    ("GET", "/v1/sources", None, 200, "public, max-age=300"),  # registry reads
    ("GET", "/v1/ingredients?q=sorbitan", None, 200, "public, max-age=300"),
    ("GET", "/v1/ingredients/polysorbate-80", None, 200, "public, max-age=300"),
    ("GET", "/v1/davies-groups", None, 200, "public, max-age=300"),
    ("HEAD", "/v1/sources", None, 200, "public, max-age=300"),
]


def send(client, method, path, body, headers=None):
    if isinstance(body, bytes):
        return client.open(path, method=method, data=body, content_type="application/json", headers=headers)
    return client.open(path, method=method, json=body, headers=headers)


@pytest.fixture(scope="module")
def plain(app):
    return app.test_client()


@pytest.mark.parametrize("method, path, body, status, cache", KINDS)
def test_every_kind_of_answer_has_its_headers(plain, method, path, body, status, cache):
    response = send(plain, method, path, body)
    assert response.status_code == status
    assert response.headers["X-Content-Type-Options"] == "nosniff"
    assert response.headers["Referrer-Policy"] == "no-referrer"
    assert "frame-ancestors 'none'" in response.headers["Content-Security-Policy"]
    assert response.headers["Cache-Control"] == cache


def test_only_the_docs_page_may_use_its_inline_style(plain):
    assert "style-src 'unsafe-inline'" in plain.get("/docs").headers["Content-Security-Policy"]
    assert plain.get("/openapi.json").headers["Content-Security-Policy"] == "default-src 'none'; frame-ancestors 'none'"


def test_a_worksheet_as_text_is_not_stored(plain):
    from service.http.spec_examples import EXAMPLES

    body = next(iter(EXAMPLES["createWorksheet"].values()))["value"]
    response = plain.post("/v1/worksheets", json=body, headers={"Accept": "text/markdown"})
    assert response.status_code == 200 and response.mimetype == "text/markdown"
    assert response.headers["Cache-Control"] == "no-store" and response.headers["X-Content-Type-Options"] == "nosniff"


def test_registry_reads_are_private_when_tokens_are_required():
    # A shared cache may not hand an answer given for a token to a caller with none.
    client = create_app({"api_tokens": (TOKEN,)}).test_client()
    response = client.get("/v1/sources", headers={"Authorization": f"Bearer {TOKEN}"})
    assert response.status_code == 200 and response.headers["Cache-Control"] == "private, max-age=300"
    refused = client.get("/v1/sources")
    assert refused.status_code == 401 and refused.headers["Cache-Control"] == "no-store"
    assert refused.headers["X-Content-Type-Options"] == "nosniff"
    assert client.get("/openapi.json").headers["Cache-Control"] == "public, max-age=300"
