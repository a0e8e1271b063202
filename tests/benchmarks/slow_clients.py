"""Slow clients against the service as it is deployed, run by hand (not
collected by pytest): gunicorn with the project's config on a free port, 200
connections that send their request headers a byte a second, and meanwhile
one client that asks GET /healthz and POST /v1/blends/hlb (the spec's first
example) in turn, a fresh connection each time. It prints the latency of
those requests (p50, p99, max) and every failure. The goal: p99 within 1 s.

    .venv/bin/python -m tests.benchmarks.slow_clients                       # the project's config
    .venv/bin/python -m tests.benchmarks.slow_clients -- -k sync --threads 1   # the old sync workers

Arguments after `--` are passed to gunicorn after `-c service/gunicorn_conf.py`,
so they override it. The attack is "slowloris", common practice, no source."""
from __future__ import annotations

import argparse
import http.client
import json
import os
import socket
import statistics
import subprocess
import sys
import tempfile
import threading
import time
from pathlib import Path

from service.http.spec_examples import EXAMPLES

ROOT = Path(__file__).resolve().parents[2]
BLEND_BODY = json.dumps(EXAMPLES["blendHlb"]["by_mass"]["value"]).encode()
PROBE_TIMEOUT_S = 10.0


def free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


def start_gunicorn(port: int, extra_args: list[str], log) -> subprocess.Popen:
    env = {**os.environ, "EMULSION_BIND": f"127.0.0.1:{port}", "EMULSION_LOG_LEVEL": "warning"}
    proc = subprocess.Popen([sys.executable, "-m", "gunicorn", "-c", "service/gunicorn_conf.py", *extra_args, "service.wsgi:app"],
                            cwd=ROOT, env=env, stdout=log, stderr=subprocess.STDOUT)
    deadline = time.monotonic() + 30
    while time.monotonic() < deadline:
        try:
            if probe(port, "GET", "/healthz", None)[0] == 200:
                return proc
        except OSError:
            if proc.poll() is not None:
                raise SystemExit(f"gunicorn exited with status {proc.returncode}")
            time.sleep(0.2)
    proc.kill()
    raise SystemExit("gunicorn did not start")


def probe(port: int, method: str, path: str, body: bytes | None) -> tuple[int, float]:
    """One request on a new connection: its status and its latency in seconds."""
    start = time.perf_counter()
    conn = http.client.HTTPConnection("127.0.0.1", port, timeout=PROBE_TIMEOUT_S)
    try:
        conn.request(method, path, body=body, headers={"Content-Type": "application/json"} if body else {})
        response = conn.getresponse()
        response.read()
        return response.status, time.perf_counter() - start
    finally:
        conn.close()


class SlowClients:
    """`count` connections, each sending an endless header a byte a second;
    a connection the server closes is opened again (and counted)."""

    def __init__(self, port: int, count: int, interval_s: float):
        self.port, self.count, self.interval_s = port, count, interval_s
        self.stop = threading.Event()
        self.reconnects = 0
        self.socks: list[socket.socket | None] = [None] * count
        self.thread = threading.Thread(target=self.run, daemon=True)

    def open(self) -> socket.socket:
        sock = socket.create_connection(("127.0.0.1", self.port), timeout=5)
        sock.sendall(b"GET /healthz HTTP/1.1\r\nHost: localhost\r\nX-Slow: ")
        return sock

    def run(self) -> None:
        while not self.stop.is_set():
            tick = time.monotonic()
            for i in range(self.count):
                try:
                    if self.socks[i] is None:
                        self.socks[i] = self.open()
                    else:
                        self.socks[i].send(b"a")
                except OSError:
                    if self.socks[i] is not None:
                        self.socks[i].close()
                        self.reconnects += 1
                    self.socks[i] = None
            self.stop.wait(max(0.0, self.interval_s - (time.monotonic() - tick)))
        for sock in self.socks:
            if sock is not None:
                sock.close()


def percentile(values: list[float], share: float) -> float:
    ordered = sorted(values)
    return ordered[min(len(ordered) - 1, int(share * len(ordered)))]


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--clients", type=int, default=200)
    parser.add_argument("--seconds", type=float, default=60.0)
    parser.add_argument("--byte-interval-s", type=float, default=1.0)
    parser.add_argument("gunicorn_args", nargs="*")
    args = parser.parse_args()
    port = free_port()
    with tempfile.TemporaryFile() as log:
        proc = start_gunicorn(port, args.gunicorn_args, log)
        try:
            slow = SlowClients(port, args.clients, args.byte_interval_s)
            slow.thread.start()
            time.sleep(3)  # every slow connection opened and sending before the probes begin
            latencies: dict[str, list[float]] = {"GET /healthz": [], "POST /v1/blends/hlb": []}
            failures: list[str] = []
            deadline = time.monotonic() + args.seconds
            while time.monotonic() < deadline:
                for label, method, path, body in (("GET /healthz", "GET", "/healthz", None),
                                                  ("POST /v1/blends/hlb", "POST", "/v1/blends/hlb", BLEND_BODY)):
                    start = time.perf_counter()
                    try:
                        status, seconds = probe(port, method, path, body)
                    except OSError as exc:
                        failures.append(f"{label}: {type(exc).__name__} after {time.perf_counter() - start:.1f} s")
                        continue
                    if status != 200:
                        failures.append(f"{label}: status {status}")
                    latencies[label].append(seconds)
                time.sleep(0.1)
            slow.stop.set()
            slow.thread.join()
        finally:
            proc.terminate()
            proc.wait(timeout=60)
    print(f"gunicorn -c service/gunicorn_conf.py {' '.join(args.gunicorn_args)}: {args.clients} slow clients "
          f"(a byte every {args.byte_interval_s:g} s) for {args.seconds:g} s; slow connections reopened after a close: {slow.reconnects}")
    for label, values in latencies.items():
        if values:
            print(f"  {label}: {len(values)} answered, p50 {statistics.median(values) * 1000:.1f} ms, "
                  f"p99 {percentile(values, 0.99) * 1000:.1f} ms, max {max(values) * 1000:.1f} ms")
        else:
            print(f"  {label}: none answered")
    print(f"  failures: {len(failures)}" + "".join(f"\n    {f}" for f in failures[:10]) + (" ..." if len(failures) > 10 else ""))


if __name__ == "__main__":
    main()
