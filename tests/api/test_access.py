"""Who may call the service: bearer tokens when configured (from a file or the
environment), the open paths, the token kept out of every log, and CORS for
the allowed origins only. RFC 6750 (bearer tokens, the WWW-Authenticate
challenge) and the Fetch standard (CORS, preflight) are the sources; the
rest is common practice, no source."""
from __future__ import annotations

import logging

import pytest

from service.http.access import OPEN_PATHS, BearerTokens, presented_token
from service.http.app import create_app
from service.http.config import Settings
from service.http.spec import build_spec

TOKEN = "t0k3n-for-tests-only-4f9a1c2e7b"
OTHER = "another-token-for-tests-0d2b7e"
BLEND = {"components": [{"ingredient": "polysorbate-80", "amount": {"value": 7, "unit": "g"}},
                        {"ingredient": "sorbitan-monooleate", "amount": {"value": 3, "unit": "g"}}]}
ORIGIN = "https://pharmacy.example"


@pytest.fixture(scope="module")
def locked():
    return create_app({"api_tokens": (TOKEN, OTHER)}).test_client()


def bearer(token):
    return {"Authorization": f"Bearer {token}"}


# --- off by default -------------------------------------------------------

def test_no_token_is_asked_for_by_default(client):
    assert client.post("/v1/blends/hlb", json=BLEND).status_code == 200
    # A token sent to a service that asks for none is ignored.
    assert client.post("/v1/blends/hlb", json=BLEND, headers=bearer("anything-at-all-0123456789")).status_code == 200


# --- on -------------------------------------------------------------------

@pytest.mark.parametrize("headers", [{}, {"Authorization": "Basic dXNlcjpwYXNz"}, {"Authorization": "Bearer"}, {"Authorization": "Bearer   "}])
def test_missing_token_is_401_with_a_challenge(locked, headers):
    response = locked.post("/v1/blends/hlb", json=BLEND, headers=headers)
    assert response.status_code == 401
    assert response.mimetype == "application/problem+json"
    assert response.headers["WWW-Authenticate"] == 'Bearer realm="emulsion"'
    body = response.get_json()
    assert body["status"] == 401 and body["type"] == "/docs#problem-unauthorized"


@pytest.mark.parametrize("token", [TOKEN[:-1], TOKEN + "x", TOKEN.upper(), "z" * len(TOKEN)])
def test_wrong_token_is_401_invalid_token_and_never_echoed(locked, token):
    response = locked.get("/v1/sources", headers=bearer(token))
    assert response.status_code == 401
    assert response.headers["WWW-Authenticate"] == 'Bearer realm="emulsion", error="invalid_token"'
    assert token not in response.get_data(as_text=True) and token not in str(response.headers)


@pytest.mark.parametrize("token", [TOKEN, OTHER])
@pytest.mark.parametrize("scheme", ["Bearer", "bearer", "BEARER"])
def test_each_configured_token_is_accepted(locked, token, scheme):
    # RFC 9110 section 11.1: the auth scheme is case-insensitive.
    response = locked.post("/v1/blends/hlb", json=BLEND, headers={"Authorization": f"{scheme} {token}"})
    assert response.status_code == 200


@pytest.mark.parametrize("path", sorted(OPEN_PATHS | {"/docs", "/openapi.json"}))
def test_probes_and_the_contract_stay_open(locked, path):
    response = locked.get(path)
    assert response.status_code != 401 and "WWW-Authenticate" not in response.headers
    # /readyz is open whether or not this build has it (404 then).
    assert response.status_code == 200 or path == "/readyz"


def test_every_operation_the_spec_secures_refuses_without_a_token_and_no_other(locked):
    """The spec and the check agree: an operation declaring the bearer scheme
    answers 401 without a token, one declaring none answers without it."""
    for path, item in build_spec()["paths"].items():
        for method, op in item.items():
            url = path.replace("{ingredient_id}", "polysorbate-80")
            response = locked.open(url, method=method.upper(), json=BLEND if method == "post" else None)
            if op["security"]:
                assert {"bearerAuth": []} in op["security"] and "401" in op["responses"], (method, path)
                assert response.status_code == 401, (method, path)
            else:
                assert response.status_code != 401, (method, path)


def test_a_refusal_is_checked_before_the_body_is_read(locked):
    # No token: 401, not the 400 or 415 the body would earn.
    response = locked.post("/v1/blends/hlb", data="{not json", content_type="text/plain")
    assert response.status_code == 401


def test_the_token_is_never_logged(caplog):
    caplog.set_level(logging.DEBUG)
    app = create_app({"api_tokens": (TOKEN,)})
    client = app.test_client()
    for headers in (bearer(TOKEN), bearer(TOKEN + "x"), {"Authorization": TOKEN}):
        client.post("/v1/blends/hlb", json=BLEND, headers=headers)
        client.get("/v1/ingredients/no-such-thing", headers=headers)
    logged = "\n".join(r.getMessage() + " " + str(r.args) for r in caplog.records)
    assert "token" in logged  # the start-up line says tokens are required...
    assert TOKEN not in logged  # ...and never what they are


def test_settings_never_show_a_token():
    assert TOKEN not in repr(Settings(api_tokens=(TOKEN,)))


# --- tokens from the environment and from a file -------------------------

def test_tokens_from_the_environment():
    settings = Settings.from_env({"EMULSION_API_TOKENS": f" {TOKEN} ,{OTHER},, "})
    assert settings.api_tokens == (TOKEN, OTHER)


def test_tokens_from_a_file_with_comments_and_blank_lines(tmp_path):
    path = tmp_path / "tokens"
    path.write_text(f"# the ward's terminal\n{TOKEN}\n\n   \n  # retired on rotation\n{OTHER}  \n", encoding="utf-8")
    settings = Settings.from_env({"EMULSION_API_TOKENS_FILE": str(path)})
    assert settings.api_tokens == (TOKEN, OTHER)
    client = create_app({"api_tokens": settings.api_tokens}).test_client()
    assert client.get("/v1/sources", headers=bearer(OTHER)).status_code == 200


def test_tokens_from_both_are_all_accepted(tmp_path):
    path = tmp_path / "tokens"
    path.write_text(TOKEN + "\n", encoding="utf-8")
    settings = Settings.from_env({"EMULSION_API_TOKENS_FILE": str(path), "EMULSION_API_TOKENS": OTHER})
    assert set(settings.api_tokens) == {TOKEN, OTHER}


def test_no_tokens_set_means_none_required():
    assert Settings.from_env({}).api_tokens == ()
    assert Settings.from_env({"EMULSION_API_TOKENS": ""}).api_tokens == ()


@pytest.mark.parametrize("env, message", [
    ({"EMULSION_API_TOKENS": " , ,"}, "holds no token"),
    ({"EMULSION_API_TOKENS": "short-0123"}, "too short"),
    ({"EMULSION_API_TOKENS": "has a space in it 0123456789"}, "no spaces"),
    ({"EMULSION_API_TOKENS_FILE": "/nonexistent/emulsion-tokens"}, "cannot be read"),
])
def test_bad_token_settings_are_refused_without_showing_the_token(env, message):
    with pytest.raises(ValueError, match=message) as raised:
        Settings.from_env(env)
    value = env.get("EMULSION_API_TOKENS", "").strip(" ,")
    assert not value or value not in str(raised.value)


def test_a_token_file_with_no_token_is_refused(tmp_path):
    # Whoever set the variable meant to require tokens: starting open instead would fail open.
    path = tmp_path / "tokens"
    path.write_text("# nothing yet\n\n", encoding="utf-8")
    with pytest.raises(ValueError, match="holds no token"):
        Settings.from_env({"EMULSION_API_TOKENS_FILE": str(path)})


def test_a_bad_line_is_named_by_its_number_not_its_text(tmp_path):
    path = tmp_path / "tokens"
    path.write_text(f"{TOKEN}\nsecret!\n", encoding="utf-8")
    with pytest.raises(ValueError, match="line 2") as raised:
        Settings.from_env({"EMULSION_API_TOKENS_FILE": str(path)})
    assert "secret" not in str(raised.value)


def test_the_comparison_looks_at_every_token():
    tokens = BearerTokens([OTHER, TOKEN])
    assert tokens.accepts(TOKEN) and tokens.accepts(OTHER)
    assert not tokens.accepts("") and not tokens.accepts(TOKEN[:-1])
    assert not BearerTokens([]).accepts(TOKEN)


@pytest.mark.parametrize("header, token", [
    ("Bearer abc", "abc"), ("bearer  abc ", "abc"), ("Basic abc", None), ("", None), (None, None), ("Bearer", None), ("abc", None),
])
def test_presented_token(header, token):
    assert presented_token(header) == token


# --- CORS -----------------------------------------------------------------

@pytest.fixture(scope="module")
def cross():
    return create_app({"cors_origins": (ORIGIN, "http://127.0.0.1:8080"), "api_tokens": (TOKEN,)}).test_client()


def test_no_cors_headers_by_default(client):
    response = client.get("/v1/sources", headers={"Origin": ORIGIN})
    assert not [h for h in response.headers.keys() if h.lower().startswith("access-control-")]
    assert "Origin" not in response.headers.get("Vary", "")


def test_an_allowed_origin_is_named_on_the_answer(cross):
    response = cross.post("/v1/blends/hlb", json=BLEND, headers={"Origin": ORIGIN, **bearer(TOKEN)})
    assert response.status_code == 200
    assert response.headers["Access-Control-Allow-Origin"] == ORIGIN
    assert "Registry-Version" in response.headers["Access-Control-Expose-Headers"]
    assert "Origin" in response.headers["Vary"]
    # Tokens travel in a header, not in cookies: credentials mode is never allowed.
    assert "Access-Control-Allow-Credentials" not in response.headers


def test_a_401_to_an_allowed_origin_is_readable_by_its_page(cross):
    response = cross.post("/v1/blends/hlb", json=BLEND, headers={"Origin": ORIGIN})
    assert response.status_code == 401 and response.headers["Access-Control-Allow-Origin"] == ORIGIN


@pytest.mark.parametrize("origin", ["https://elsewhere.example", "https://pharmacy.example.evil.example", "http://pharmacy.example",
                                    "https://pharmacy.example:8443", "null"])
def test_a_disallowed_origin_gets_no_cors_headers(cross, origin):
    response = cross.get("/v1/sources", headers={"Origin": origin, **bearer(TOKEN)})
    assert not [h for h in response.headers.keys() if h.lower().startswith("access-control-")]
    # The answer still varies by Origin, for caches.
    assert "Origin" in response.headers["Vary"]


def test_preflight_for_an_allowed_origin(cross):
    response = cross.options("/v1/blends/hlb", headers={"Origin": ORIGIN, "Access-Control-Request-Method": "POST",
                                                        "Access-Control-Request-Headers": "authorization, content-type, x-request-id"})
    # No token on a preflight (the Fetch standard sends none), and none asked for.
    assert response.status_code == 204
    assert response.headers["Access-Control-Allow-Origin"] == ORIGIN
    assert response.headers["Access-Control-Allow-Methods"] == "POST"
    allowed = {h.strip().lower() for h in response.headers["Access-Control-Allow-Headers"].split(",")}
    assert {"authorization", "content-type", "x-request-id"} <= allowed
    assert int(response.headers["Access-Control-Max-Age"]) > 0
    assert "Origin" in response.headers["Vary"]


def test_preflight_for_a_registry_read_lists_its_methods(cross):
    response = cross.options("/v1/ingredients", headers={"Origin": "http://127.0.0.1:8080", "Access-Control-Request-Method": "GET"})
    assert response.status_code == 204 and response.headers["Access-Control-Allow-Methods"] == "GET, HEAD"


def test_preflight_for_a_disallowed_origin_gets_no_cors_headers(cross):
    response = cross.options("/v1/blends/hlb", headers={"Origin": "https://elsewhere.example", "Access-Control-Request-Method": "POST"})
    assert response.status_code != 401
    assert not [h for h in response.headers.keys() if h.lower().startswith("access-control-")]


def test_preflight_to_an_unknown_path_is_404(cross):
    response = cross.options("/v1/nothing-here", headers={"Origin": ORIGIN, "Access-Control-Request-Method": "POST"})
    assert response.status_code == 404


@pytest.mark.parametrize("origins", ["*", "https://pharmacy.example/", "pharmacy.example", "https://Pharmacy.example",
                                     "https://pharmacy.example/app", "ftp://pharmacy.example"])
def test_bad_origins_are_refused(origins):
    with pytest.raises(ValueError, match="exact origin"):
        Settings.from_env({"EMULSION_CORS_ORIGINS": origins})


def test_origins_from_the_environment():
    settings = Settings.from_env({"EMULSION_CORS_ORIGINS": f"{ORIGIN}, http://127.0.0.1:8080 ,"})
    assert settings.cors_origins == (ORIGIN, "http://127.0.0.1:8080")
    assert Settings.from_env({}).cors_origins == ()


def test_the_spec_declares_the_bearer_scheme_as_optional():
    spec = build_spec()
    scheme = spec["components"]["securitySchemes"]["bearerAuth"]
    assert (scheme["type"], scheme["scheme"]) == ("http", "bearer")
    assert "may require a bearer token" in spec["info"]["description"]
    healthz = spec["paths"]["/healthz"]["get"]
    assert healthz["security"] == [] and "401" not in healthz["responses"]
    blend = spec["paths"]["/v1/blends/hlb"]["post"]
    assert blend["security"] == [{"bearerAuth": []}, {}]
    assert "WWW-Authenticate" in blend["responses"]["401"]["headers"]
