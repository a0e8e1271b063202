"""Tokens and CORS under gunicorn as it is run, over real HTTP on loopback:
the token file and variable are read, a call without the token is refused, and no token
reaches gunicorn's access or error log, even at debug level (common
practice, no source: OWASP Logging Cheat Sheet, "Data to exclude")."""
from __future__ import annotations

import json
import os
import socket
import subprocess
import sys
import tempfile
import time

import pytest

from tests.contract.test_gunicorn import ROOT, free_port, request

TOKEN = "gunicorn-test-token-6c1e0a9f3d"
ENV_TOKEN = "gunicorn-env-token-93be1d04c7"
WRONG = "wrong-test-token-2b8d4f7a1e93"
ORIGIN = "https://pharmacy.example"
BLEND = {"components": [{"ingredient": "polysorbate-80", "amount": {"value": 9, "unit": "g"}},
                        {"ingredient": "sorbitan-monooleate", "amount": {"value": 1, "unit": "g"}}]}


@pytest.fixture(scope="module")
def locked_server(tmp_path_factory):
    tokens = tmp_path_factory.mktemp("secrets") / "tokens"
    tokens.write_text(f"# test token\n{TOKEN}\n", encoding="utf-8")
    port = free_port()
    env = {**os.environ, "EMULSION_BIND": f"127.0.0.1:{port}", "EMULSION_WORKERS": "1", "EMULSION_LOG_LEVEL": "debug",
           "EMULSION_API_TOKENS_FILE": str(tokens), "EMULSION_CORS_ORIGINS": ORIGIN}
    env["EMULSION_API_TOKENS"] = ENV_TOKEN
    log = tempfile.TemporaryFile()
    proc = subprocess.Popen([sys.executable, "-m", "gunicorn", "-c", "service/gunicorn_conf.py", "service.wsgi:app"],
                            cwd=ROOT, env=env, stdout=log, stderr=subprocess.STDOUT)
    try:
        deadline = time.monotonic() + 30
        while True:
            try:
                with socket.create_connection(("127.0.0.1", port), timeout=0.5):
                    break
            except OSError:
                if proc.poll() is not None or time.monotonic() > deadline:
                    log.seek(0)
                    pytest.fail(f"gunicorn did not start: {log.read().decode(errors='replace')}")
                time.sleep(0.1)
        yield port, log
    finally:
        proc.terminate()
        proc.wait(timeout=30)
        log.close()


def test_tokens_from_a_file_over_http_and_never_in_the_log(locked_server):
    port, log = locked_server
    status, headers, _ = request(port, "POST", "/v1/blends/hlb", BLEND)
    assert status == 401 and headers["WWW-Authenticate"] == 'Bearer realm="emulsion"'
    status, headers, _ = request(port, "POST", "/v1/blends/hlb", BLEND, headers={"Authorization": f"Bearer {WRONG}"})
    assert status == 401 and 'error="invalid_token"' in headers["WWW-Authenticate"]
    status, headers, body = request(port, "POST", "/v1/blends/hlb", BLEND, headers={"Authorization": f"Bearer {TOKEN}", "Origin": ORIGIN})
    assert status == 200 and json.loads(body)["result"]["hlb"] > 0
    assert headers["Access-Control-Allow-Origin"] == ORIGIN and headers["Cache-Control"] == "no-store"
    status, _, _ = request(port, "GET", "/v1/sources", headers={"Authorization": f"Bearer {ENV_TOKEN}"})
    assert status == 200
    status, _, _ = request(port, "GET", "/healthz")
    assert status == 200
    status, headers, _ = request(port, "OPTIONS", "/v1/sources", headers={"Origin": ORIGIN, "Access-Control-Request-Method": "GET"})
    assert status == 204 and headers["Access-Control-Allow-Origin"] == ORIGIN
    # The access log line of each request is written when it ends; give the worker a moment.
    time.sleep(0.5)
    log.seek(0)
    text = log.read().decode(errors="replace")
    assert "POST /v1/blends/hlb" in text
    assert TOKEN not in text and ENV_TOKEN not in text and WRONG not in text
