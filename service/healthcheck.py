"""The container's health check: GET /healthz on the port EMULSION_BIND
configures; exit 0 when it answers 200, 1 otherwise.

    python -m service.healthcheck

Standard library only, and nothing of the project: Docker runs it every
interval, and importing the registry and the app each time would cost more
than the check. The bind address was checked at start
(service/http/config.py), so it is only taken apart here."""
from __future__ import annotations

import http.client
import os
import socket
import sys

DEFAULT_BIND = "127.0.0.1:8000"
# A server bound to every address is asked on loopback.
WILDCARDS = {"", "0.0.0.0", "[::]", "*"}


class _UnixConnection(http.client.HTTPConnection):
    def __init__(self, path: str, timeout: float):
        super().__init__("localhost", timeout=timeout)
        self.path = path

    def connect(self):
        self.sock = socket.socket(socket.AF_UNIX, socket.SOCK_STREAM)
        self.sock.settimeout(self.timeout)
        self.sock.connect(self.path)


def connection(bind: str, timeout_s: float) -> http.client.HTTPConnection:
    """A connection to the server that `bind` (gunicorn's form) describes."""
    if bind.startswith("unix:"):
        return _UnixConnection(bind[len("unix:"):], timeout_s)
    host, _, port = bind.rpartition(":")
    host = "127.0.0.1" if host in WILDCARDS else host.strip("[]")
    return http.client.HTTPConnection(host, int(port), timeout=timeout_s)


def healthy(bind: str, timeout_s: float = 2.5) -> bool:
    try:
        conn = connection(bind, timeout_s)
        try:
            conn.request("GET", "/healthz")
            return conn.getresponse().status == 200
        finally:
            conn.close()
    except (OSError, http.client.HTTPException, ValueError):
        return False


def main() -> int:
    return 0 if healthy(os.environ.get("EMULSION_BIND", DEFAULT_BIND).strip()) else 1


if __name__ == "__main__":
    sys.exit(main())
