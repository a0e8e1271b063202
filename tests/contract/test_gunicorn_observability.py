"""Logs and metrics as gunicorn runs the service with two workers: every
line on stdout is JSON, and /metrics adds up the counts of both workers
(prometheus_client's multiprocess mode). Common practice, no source."""
from __future__ import annotations

import json
import os
import subprocess
import sys
import tempfile
import time
from concurrent.futures import ThreadPoolExecutor

import pytest
from prometheus_client.parser import text_string_to_metric_families

from tests.contract.test_gunicorn import ROOT, free_port, request

COUNTED = ("emulsion_http_requests_total", (("operation", "readyz"), ("status", "200")))


@pytest.fixture(scope="module")
def two_workers():
    port = free_port()
    metrics_dir = tempfile.TemporaryDirectory(prefix="emulsion-metrics-test-")
    env = {**os.environ, "EMULSION_BIND": f"127.0.0.1:{port}", "EMULSION_WORKERS": "2", "PROMETHEUS_MULTIPROC_DIR": metrics_dir.name}
    # To a file, not a pipe (see test_gunicorn.py); read back by the tests.
    log = tempfile.NamedTemporaryFile(prefix="emulsion-gunicorn-", suffix=".log")
    proc = subprocess.Popen([sys.executable, "-m", "gunicorn", "-c", "service/gunicorn_conf.py", "service.wsgi:app"],
                            cwd=ROOT, env=env, stdout=log, stderr=subprocess.STDOUT)

    def lines():
        with open(log.name, encoding="utf-8") as f:
            return f.read().splitlines()

    deadline = time.monotonic() + 30
    # Ready when both workers have booted, so that both can take requests.
    while sum("Booting worker" in line for line in lines()) < 2:
        if proc.poll() is not None or time.monotonic() > deadline:
            proc.kill()
            proc.wait(timeout=30)
            output = "\n".join(lines())
            log.close()
            metrics_dir.cleanup()
            pytest.fail(f"gunicorn did not start: {output}")
        time.sleep(0.1)
    yield port, lines
    proc.terminate()
    proc.wait(timeout=30)
    log.close()
    metrics_dir.cleanup()


def _counted(port) -> float:
    status, headers, body = request(port, "GET", "/metrics")
    assert status == 200 and headers["Content-Type"].startswith("text/plain")
    samples = {(s.name, tuple(sorted(s.labels.items()))): s.value
               for family in text_string_to_metric_families(body.decode()) for s in family.samples}
    return samples.get(COUNTED, 0.0)


def test_counts_from_both_workers_add_up(two_workers):
    port, lines = two_workers
    before = _counted(port)
    sent, pids = 0, set()
    # Concurrent requests, a batch at a time, until both workers have
    # answered some (the kernel decides which worker accepts a connection).
    with ThreadPoolExecutor(max_workers=8) as pool:
        while len(pids) < 2 and sent < 800:
            ids = [f"sum-{sent + i}" for i in range(40)]
            statuses = list(pool.map(lambda rid: request(port, "GET", "/readyz", headers={"X-Request-ID": rid})[0], ids))
            assert statuses == [200] * len(ids)
            sent += len(ids)
            records = [json.loads(line) for line in lines()]
            pids = {r["pid"] for r in records if r.get("request_id", "").startswith("sum-")}
    assert len(pids) == 2, "one worker answered every request"
    assert _counted(port) - before == sent


def test_every_line_is_json_with_one_line_per_request(two_workers):
    port, lines = two_workers
    request(port, "GET", "/healthz", headers={"X-Request-ID": "json-line-check", "Authorization": "Bearer token-marker-4d1"})
    time.sleep(0.2)
    records = [json.loads(line) for line in lines()]  # fails on any line that is not JSON
    assert any(r["logger"] == "gunicorn.error" and r["message"].startswith("Starting gunicorn") for r in records)
    assert any(r["logger"] == "service" and "registry_version" in r and "ingredients" in r for r in records)
    (mine,) = [r for r in records if r.get("request_id") == "json-line-check"]
    assert (mine["logger"], mine["operation_id"], mine["status"]) == ("service.requests", "healthz", 200)
    assert "token-marker-4d1" not in "\n".join(lines())
    # gunicorn's access log is off in favour of the service's line.
    assert not any(r["logger"] == "gunicorn.access" for r in records)
