"""Where the time of one request goes, in process, run by hand (not collected
by pytest): cProfile over the Flask test client, with the JSON logging of
service/gunicorn_conf.py writing to /dev/null, split into the parts of an
answer's life; then what one request log line costs beside gunicorn's plain
access line.

    .venv/bin/python -m tests.benchmarks.profile_request [operationId/example[:md] ...]
"""
from __future__ import annotations

import cProfile
import json
import logging.config
import os
import pstats
import sys

from service.http.app import create_app
from service.http.logs import logconfig
from service.http.spec_examples import EXAMPLES
from service.http.spec import build_spec


def _paths() -> dict[str, str]:
    """operationId -> path of every POST operation in the spec."""
    return {item["post"]["operationId"]: path for path, item in build_spec()["paths"].items() if "post" in item}


def _cumulative(stats, suffix: str, name: str) -> float:
    return sum(ct for (f, _l, fn), (_cc, _nc, _tt, ct, _c) in stats.items() if f.endswith(suffix) and fn == name)


DEFAULT = ("createWorksheet/lotion", "blendHlb/by_mass")


def split(op: str, name: str, repeat: int = 300, accept: str = "application/json") -> dict[str, float]:
    """The share of each part in one request's time, printed and returned."""
    logging.config.dictConfig(logconfig())
    logging.getLogger().handlers[0].setStream(open(os.devnull, "w"))
    client = create_app().test_client()
    # Encoded once here, so that the client's own encoding is not counted.
    path, body = _paths()[op], json.dumps(EXAMPLES[op][name]["value"])
    post = lambda: client.post(path, data=body, content_type="application/json", headers={"Accept": accept})  # noqa: E731
    assert post().status_code == 200
    profile = cProfile.Profile()
    profile.enable()
    for _ in range(repeat):
        post()
    profile.disable()
    stats = pstats.Stats(profile).stats
    total = _cumulative(stats, "werkzeug/test.py", "open") or 1.0
    view = max(ct for (f, _l, fn), (*_, ct, _c) in stats.items() if "/blueprints/" in f and fn != "<module>")
    load = _cumulative(stats, "service/http/bodies.py", "load_body")
    answer = _cumulative(stats, "service/http/bodies.py", "answer")
    dump = _cumulative(stats, "marshmallow/schema.py", "dump")
    envelope = _cumulative(stats, "service/usecases/answers.py", "envelope")
    logged = _cumulative(stats, "service/http/requests_seen.py", "_finish")
    parts = {
        "load body (parse + schema load)": load,
        "calculation (use case but envelope)": view - load - answer - envelope,
        "envelope passes (finite check, tidy)": envelope,
        "marshmallow dump": dump,
        "JSON encode + Response": answer - dump,
        "request log line + metrics": logged,
        "Flask, werkzeug, test client": total - view - logged,
    }
    print(f"POST {path} ({name}, {accept}): {total / repeat * 1000:.3f} ms a request under cProfile")
    for label, seconds in parts.items():
        print(f"  {label:40s} {seconds / total:6.1%}")
    return {label: seconds / total for label, seconds in parts.items()}


def log_line_cost(n: int = 20000) -> None:
    """The service's JSON request line against gunicorn's plain access line,
    each formatted and written to /dev/null, in microseconds a line."""
    import datetime
    import time

    from gunicorn.config import Config
    from gunicorn.glogging import Logger

    cfg = Config()
    cfg.set("accesslog", os.devnull)
    plain = Logger(cfg)
    response = type("Resp", (), {"status": "200 OK", "status_code": 200, "sent": 180, "response_length": 180,
                                 "headers": [("Content-Type", "application/json")]})()
    request = type("Req", (), {"headers": [("HOST", "127.0.0.1"), ("CONTENT-TYPE", "application/json")]})()
    environ = {"REQUEST_METHOD": "POST", "RAW_URI": "/v1/blends/hlb", "PATH_INFO": "/v1/blends/hlb", "QUERY_STRING": "",
               "SERVER_PROTOCOL": "HTTP/1.1", "REMOTE_ADDR": "127.0.0.1", "HTTP_USER_AGENT": "bench", "HTTP_REFERER": "-"}
    took = datetime.timedelta(microseconds=1234)
    start = time.perf_counter()
    for _ in range(n):
        plain.access(response, request, environ, took)
    gunicorn_us = (time.perf_counter() - start) / n * 1e6
    logging.config.dictConfig(logconfig())
    logging.getLogger().handlers[0].setStream(open(os.devnull, "w"))
    log = logging.getLogger("service.requests")
    extra = {"request_id": "a" * 32, "method": "POST", "path": "/v1/blends/hlb", "status": 200, "latency_ms": 1.234,
             "registry_version": "0.7.0+sha256.a3df5157318c", "operation_id": "blendHlb"}
    start = time.perf_counter()
    for _ in range(n):
        log.info("%s %s %d", "POST", "/v1/blends/hlb", 200, extra=extra)
    service_us = (time.perf_counter() - start) / n * 1e6
    print(f"a log line: gunicorn's access line {gunicorn_us:.1f} us, the service's JSON request line {service_us:.1f} us")


def main(args: list[str]) -> None:
    # An item may end in ":md" to ask for the Markdown form.
    for item in args or DEFAULT:
        item, _, form = item.partition(":")
        op, name = item.split("/")
        split(op, name, accept="text/markdown" if form == "md" else "application/json")
    log_line_cost()


if __name__ == "__main__":
    main(sys.argv[1:])
