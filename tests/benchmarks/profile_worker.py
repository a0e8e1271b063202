"""Where a gunicorn worker's time goes, run by hand (not collected by pytest):
one worker under the project's configuration, cProfile around each request
it handles (gunicorn's parsing and sending included, which Flask's test client
in profile_request.py leaves out), for one benchmark case or its reference.

    .venv/bin/python -m tests.benchmarks.profile_worker "createWorksheet (lotion)" [ours|reference] [requests]
"""
from __future__ import annotations

import os
import pstats
import signal
import subprocess
import sys
import tempfile
import time
from pathlib import Path

from tests.benchmarks import bench_service as bench

# Runs the project's settings, then wraps the worker's handler: with one
# client sending one request at a time, one profile holds every request.
_SETTINGS = """
exec(open({conf!r}).read())
import cProfile
_profile = cProfile.Profile()
def post_worker_init(worker):
    handle = worker.handle
    worker.handle = lambda conn: _profile.runcall(handle, conn)
def worker_exit(server, worker):
    _profile.dump_stats({out!r})
"""


def profile(label: str, which: str = "ours", requests: int = 2000) -> pstats.Stats:
    case = {c.label: c for c in bench.cases()}[label]
    with tempfile.TemporaryDirectory(prefix="emulsion-profile-") as tmp:
        out, settings = Path(tmp) / "worker.prof", Path(tmp) / "settings.py"
        settings.write_text(_SETTINGS.format(conf=str(bench.REPO / "service" / "gunicorn_conf.py"), out=str(out)))
        # Not Server(): the settings file is this one, and the worker must exit to write its profile.
        port = bench.free_port()
        env = {"EMULSION_BIND": f"127.0.0.1:{port}", "EMULSION_BENCHMARK": "1", "EMULSION_WORKERS": "1", "PYTHONPATH": str(bench.REPO)}
        proc = subprocess.Popen([sys.executable, "-m", "gunicorn", "-c", str(settings), "--max-requests", "0", "service.wsgi:app"],
                                cwd=bench.REPO, env={**os.environ, **env}, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
        try:
            while not bench.healthz_answered(port):
                if proc.poll() is not None:
                    raise RuntimeError(f"gunicorn exited with {proc.returncode}")
                time.sleep(0.01)
            status, body = bench.one(port, bench.request_bytes(case, port=port))
            if status != 200:
                raise RuntimeError(f"{label} answered {status}")
            path = None if which == "ours" else bench.REFERENCE_PATH.format(size=len(body))
            payload, buffer = bench.request_bytes(case, path, port), b""
            with bench.connect(port) as sock:
                for _ in range(requests):
                    sock.sendall(payload)
                    _, _, buffer = bench.read_response(sock, buffer)
        finally:
            proc.send_signal(signal.SIGTERM)
            proc.wait(timeout=30)
        return pstats.Stats(str(out))


if __name__ == "__main__":
    if not 2 <= len(sys.argv) <= 4 or (len(sys.argv) > 2 and sys.argv[2] not in ("ours", "reference")):
        sys.exit(__doc__)
    stats = profile(sys.argv[1], *(sys.argv[2:3] or ["ours"]), *(int(a) for a in sys.argv[3:4]))
    stats.sort_stats("cumulative").print_stats(40)
