"""gunicorn's signals, on a real server with the project's config: SIGTERM
drains the requests a worker has accepted, and USR2 then TERM to the old
master rolls out a new registry release without a refused request
(gunicorn's documentation, "Signal Handling": "Upgrading to a new binary
on the fly")."""
from __future__ import annotations

import http.client
import json
import os
import shutil
import signal
import socket
import subprocess
import sys
import tempfile
import threading
import time
from pathlib import Path

from registry import DEFAULT_ROOT
from service.http.spec_examples import EXAMPLES
from tests.contract.test_gunicorn import free_port

ROOT = Path(__file__).resolve().parents[2]
BLEND_BODY = json.dumps(EXAMPLES["blendHlb"]["by_mass"]["value"]).encode()


# gunicorn's own script, as the README and the Dockerfile run it: USR2
# re-executes the master's command line, and `python -m gunicorn` comes back
# as `python .../gunicorn/__main__.py`, whose folder (holding gunicorn's
# `http` package) then shadows the standard library's `http`.
GUNICORN = Path(sys.executable).with_name("gunicorn")


def start(port, log, *args, env=None):
    # The log goes to a file, not a pipe (see the server fixture in test_gunicorn.py).
    env = {**os.environ, "EMULSION_BIND": f"127.0.0.1:{port}", "EMULSION_WORKERS": "1", **(env or {})}
    proc = subprocess.Popen([str(GUNICORN), "-c", "service/gunicorn_conf.py", *args, "service.wsgi:app"],
                            cwd=ROOT, env=env, stdout=log, stderr=subprocess.STDOUT)
    deadline = time.monotonic() + 30
    while time.monotonic() < deadline:
        try:
            health(port)
            return proc
        except OSError:
            assert proc.poll() is None, f"gunicorn exited with status {proc.returncode}: {read_log(log)}"
            time.sleep(0.1)
    proc.kill()
    proc.wait(timeout=30)
    raise AssertionError(f"gunicorn did not start: {read_log(log)}")


def read_log(log) -> str:
    log.seek(0)
    return log.read().decode(errors="replace")


def health(port) -> str:
    conn = http.client.HTTPConnection("127.0.0.1", port, timeout=10)
    try:
        conn.request("GET", "/healthz")
        response = conn.getresponse()
        assert response.status == 200
        return json.loads(response.read())["registry"]["version"]
    finally:
        conn.close()


def read_response(sock: socket.socket) -> tuple[int, dict]:
    """An HTTP/1.1 answer read to the end of its declared length."""
    response = http.client.HTTPResponse(sock)
    response.begin()
    return response.status, json.loads(response.read())


def test_sigterm_answers_every_accepted_request():
    # Five requests that have sent their headers and half their body when the
    # master gets SIGTERM; with two threads, three of them wait in the
    # worker's queue. Each must get its whole answer, none a reset.
    port = free_port()
    with tempfile.TemporaryFile() as log:
        proc = start(port, log, "--threads", "2")
        socks = []
        try:
            head = (f"POST /v1/blends/hlb HTTP/1.1\r\nHost: localhost\r\nContent-Type: application/json\r\n"
                    f"Content-Length: {len(BLEND_BODY)}\r\n\r\n").encode()
            half = len(BLEND_BODY) // 2
            for _ in range(5):
                sock = socket.create_connection(("127.0.0.1", port), timeout=20)
                sock.sendall(head + BLEND_BODY[:half])
                socks.append(sock)
            time.sleep(1)  # accepted by the worker by now
            proc.send_signal(signal.SIGTERM)
            time.sleep(0.5)
            assert proc.poll() is None  # still draining
            for sock in socks:
                sock.sendall(BLEND_BODY[half:])
            answers = [read_response(sock) for sock in socks]
            assert [status for status, _ in answers] == [200] * 5
            assert all(body["result"]["hlb"] == answers[0][1]["result"]["hlb"] for _, body in answers)
            assert proc.wait(timeout=30) == 0
        finally:
            for sock in socks:
                sock.close()
            if proc.poll() is None:
                proc.kill()
                proc.wait(timeout=30)


def pid_in(path: Path, deadline_s: float = 30) -> int:
    deadline = time.monotonic() + deadline_s
    while time.monotonic() < deadline:
        try:
            return int(path.read_text().strip())
        except (OSError, ValueError):
            time.sleep(0.1)
    raise AssertionError(f"no pid in {path}")


def alive(pid: int) -> bool:
    """Running, not gone nor a zombie (it is not our child, so we cannot reap it)."""
    try:
        return Path(f"/proc/{pid}/stat").read_text().rsplit(")", 1)[1].split()[0] != "Z"
    except OSError:
        return False


def test_usr2_then_term_rolls_out_a_new_registry_release_without_a_refused_request(tmp_path):
    # The README's procedure ("Deployment under load"): a new registry in
    # place, USR2 starts a second master that loads it, TERM stops the old
    # one after its workers have drained. A client asking all along is never
    # refused, and sees the old version, then both, then only the new one.
    root = tmp_path / "data"
    shutil.copytree(DEFAULT_ROOT, root)
    pidfile = tmp_path / "gunicorn.pid"
    port = free_port()
    seen: list[str] = []
    failures: list[str] = []
    stop = threading.Event()

    def ask_all_along():
        while not stop.is_set():
            try:
                seen.append(health(port))
            except (OSError, AssertionError) as exc:
                failures.append(repr(exc))
            time.sleep(0.02)

    with tempfile.TemporaryFile() as log:
        proc = start(port, log, "--pid", str(pidfile), env={"EMULSION_REGISTRY_ROOT": str(root)})
        new_master = None
        asker = threading.Thread(target=ask_all_along)
        try:
            old_version = health(port)
            manifest = root / "registry.toml"
            text = manifest.read_text()
            assert 'release = "0.' in text
            manifest.write_text(text.replace('release = "0.', 'release = "9.', 1))
            asker.start()
            proc.send_signal(signal.SIGUSR2)
            # The new master writes <pidfile>.2 until the old one is gone.
            new_master = pid_in(Path(f"{pidfile}.2"))
            assert new_master != proc.pid
            deadline = time.monotonic() + 30
            while not any(v.startswith("9.") for v in seen[-20:]) and time.monotonic() < deadline:
                time.sleep(0.1)
            proc.send_signal(signal.SIGTERM)
            assert proc.wait(timeout=30) == 0
            time.sleep(1.5)  # the new master notices it was promoted within a second
            count = len(seen)
            time.sleep(0.5)
            stop.set()
            asker.join(timeout=30)
            assert failures == [], read_log(log)
            assert seen[0] == old_version and not old_version.startswith("9.")
            assert seen[count:] and all(v.startswith("9.") for v in seen[count:]), seen[count:]
            assert pid_in(pidfile) == new_master  # promoted: it took over the pidfile
        finally:
            stop.set()
            if asker.is_alive():
                asker.join(timeout=30)
            if proc.poll() is None:
                proc.kill()
                proc.wait(timeout=30)
            if new_master is not None and alive(new_master):
                # Our own second master, by its pid; not our child, so polled.
                os.kill(new_master, signal.SIGTERM)
                deadline = time.monotonic() + 30
                while alive(new_master) and time.monotonic() < deadline:
                    time.sleep(0.1)


def test_usr2_with_a_refused_registry_leaves_the_old_master_serving(tmp_path):
    # The new master loads the registry before it starts any worker: a tree it
    # refuses stops the new master, and the old one goes on with its release.
    root = tmp_path / "data"
    shutil.copytree(DEFAULT_ROOT, root)
    pidfile = tmp_path / "gunicorn.pid"
    port = free_port()
    with tempfile.TemporaryFile() as log:
        proc = start(port, log, "--pid", str(pidfile), env={"EMULSION_REGISTRY_ROOT": str(root)})
        try:
            old_version = health(port)
            path = root / "ingredients" / "olive-oil.toml"
            text = path.read_text()
            assert 'source = "martin"' in text
            path.write_text(text.replace('source = "martin"', 'source = "nowhere"', 1))
            proc.send_signal(signal.SIGUSR2)
            deadline = time.monotonic() + 30
            while "emulsion-service: cannot start" not in read_log(log) and time.monotonic() < deadline:
                time.sleep(0.1)
            assert "emulsion-service: cannot start: the registry was not accepted" in read_log(log)
            time.sleep(1)
            assert not Path(f"{pidfile}.2").exists()
            assert [health(port) for _ in range(5)] == [old_version] * 5
            assert pid_in(pidfile) == proc.pid
            proc.send_signal(signal.SIGTERM)
            assert proc.wait(timeout=30) == 0
        finally:
            if proc.poll() is None:
                proc.kill()
                proc.wait(timeout=30)
