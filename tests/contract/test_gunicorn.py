"""The service as it is run: gunicorn with the project's config file, real
HTTP on loopback."""
from __future__ import annotations

import http.client
import json
import os
import socket
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[2]


def free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


@pytest.fixture(scope="module")
def server():
    port = free_port()
    env = {**os.environ, "EMULSION_BIND": f"127.0.0.1:{port}", "EMULSION_WORKERS": "1"}
    # The server's log goes to a file, not a pipe: a pipe nobody reads fills
    # up under many requests and blocks the server.
    log = tempfile.TemporaryFile()
    proc = subprocess.Popen([sys.executable, "-m", "gunicorn", "-c", "service/gunicorn_conf.py", "service.wsgi:app"],
                            cwd=ROOT, env=env, stdout=log, stderr=subprocess.STDOUT)
    deadline = time.monotonic() + 30
    while time.monotonic() < deadline:
        try:
            with socket.create_connection(("127.0.0.1", port), timeout=0.5):
                break
        except OSError:
            if proc.poll() is not None:
                # Close the log before failing, or its ResourceWarning fails an unrelated later test.
                with log:
                    log.seek(0)
                    output = log.read().decode(errors="replace")
                pytest.fail(f"gunicorn exited with status {proc.returncode}: {output}")
            time.sleep(0.1)
    else:
        proc.kill()
        proc.wait(timeout=30)
        log.close()
        pytest.fail("gunicorn did not start")
    yield port
    proc.terminate()
    proc.wait(timeout=30)
    log.close()


def request(port, method, path, body=None, headers=None, chunked=False):
    conn = http.client.HTTPConnection("127.0.0.1", port, timeout=10)
    data = json.dumps(body).encode() if isinstance(body, dict) else body
    if chunked:
        data = iter([data])
    conn.request(method, path, body=data, headers={"Content-Type": "application/json", **(headers or {})}, encode_chunked=chunked)
    resp = conn.getresponse()
    out = resp.status, dict(resp.getheaders()), resp.read()
    conn.close()
    return out


def test_health_over_http(server):
    status, headers, body = request(server, "GET", "/healthz")
    assert status == 200 and json.loads(body)["status"] == "ok"
    assert headers["Registry-Version"] == json.loads(body)["registry"]["version"]


def test_calculation_over_http(server):
    body = {"components": [{"ingredient": "polysorbate-80", "amount": {"value": 9, "unit": "g"}},
                           {"ingredient": "sorbitan-monooleate", "amount": {"value": 1, "unit": "g"}}]}
    status, _, out = request(server, "POST", "/v1/blends/hlb", body)
    assert status == 200 and json.loads(out)["result"]["hlb"] == 13.9  # PMC4137601 Table 2: 13.93


def test_bad_input_over_http(server):
    status, headers, out = request(server, "POST", "/v1/blends/hlb", b'{"components": [{"amount": {"value": NaN}}]}')
    assert status == 422 and headers["Content-Type"] == "application/problem+json"
    # A chunked body has no declared length, so a truncation could pass unseen: refused.
    status, headers, _ = request(server, "POST", "/v1/blends/hlb", b'{"a": 1}', headers={"Transfer-Encoding": "chunked"}, chunked=True)
    assert status == 411 and headers["Content-Type"] == "application/problem+json"


def test_gunicorn_refuses_to_start_on_a_broken_registry(tmp_path):
    import shutil

    from registry import DEFAULT_ROOT

    root = tmp_path / "data"
    shutil.copytree(DEFAULT_ROOT, root)
    for name, old, new in [("olive-oil", 'source = "martin"', 'source = "nowhere"'), ("castor-oil", 'id = "castor-oil"', 'id = "castor"')]:
        path = root / "ingredients" / f"{name}.toml"
        text = path.read_text()
        assert old in text
        path.write_text(text.replace(old, new, 1))
    env = {**os.environ, "EMULSION_BIND": f"127.0.0.1:{free_port()}", "EMULSION_WORKERS": "1", "EMULSION_REGISTRY_ROOT": str(root)}
    done = subprocess.run([sys.executable, "-m", "gunicorn", "-c", "service/gunicorn_conf.py", "service.wsgi:app"],
                          cwd=ROOT, env=env, capture_output=True, text=True, timeout=60)
    output = done.stdout + done.stderr
    assert done.returncode != 0
    # One short message, every fault on a line of its own, no traceback.
    assert "Traceback" not in output
    assert "emulsion-service: cannot start: the registry was not accepted: 2 fault(s)" in output
    assert "  data/ingredients/olive-oil.toml: values/required_hlb_ow/0/source: unknown source 'nowhere'" in output
    assert "  data/ingredients/castor-oil.toml: id: id 'castor' differs from the file name 'castor-oil'" in output


def test_schemathesis_over_http_with_every_check_and_phase(server):
    # The schemathesis CLI against the running server: every check, the
    # examples, coverage and fuzzing phases, this API's hooks and own check
    # (tests/contract/schemathesis_hooks.py). `pytest -m slow` does more.
    env = {**os.environ, "SCHEMATHESIS_HOOKS": "tests.contract.schemathesis_hooks", "PYTHONPATH": str(ROOT)}
    run = subprocess.run([sys.executable, "-m", "schemathesis.cli", "--config-file", "tests/contract/schemathesis.toml", "run",
                          f"http://127.0.0.1:{server}/openapi.json", "--checks", "all", "--phases", "examples,coverage,fuzzing",
                          "--max-examples", "10", "--no-color"], cwd=ROOT, env=env, capture_output=True, text=True, timeout=600)
    summary = run.stdout[-3000:]
    assert run.returncode == 0, summary
    assert "passed" in summary and "failure" not in summary.lower().split("summary")[-1], summary
