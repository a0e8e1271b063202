"""Where the time of one request goes, in process, run by hand (not collected
by pytest): cProfile over the Flask test client, with the JSON logging of
service/gunicorn_conf.py writing to /dev/null, split into the parts of an
answer's life.

    .venv/bin/python -m tests.benchmarks.profile_request [operationId/example ...]
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
from tests.benchmarks.bench_service import PATHS

def _cumulative(stats, suffix: str, name: str) -> float:
    return sum(ct for (f, _l, fn), (_cc, _nc, _tt, ct, _c) in stats.items() if f.endswith(suffix) and fn == name)


DEFAULT = ("createWorksheet/lotion", "blendHlb/by_mass")


def split(op: str, name: str, repeat: int = 300) -> dict[str, float]:
    """The share of each part in one request's time, printed and returned."""
    logging.config.dictConfig(logconfig())
    logging.getLogger().handlers[0].setStream(open(os.devnull, "w"))
    client = create_app().test_client()
    # Encoded once here, so that the client's own encoding is not counted.
    path, body = PATHS[op], json.dumps(EXAMPLES[op][name]["value"])
    post = lambda: client.post(path, data=body, content_type="application/json")  # noqa: E731
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
    print(f"POST {path} ({name}): {total / repeat * 1000:.3f} ms a request under cProfile")
    for label, seconds in parts.items():
        print(f"  {label:40s} {seconds / total:6.1%}")
    return {label: seconds / total for label, seconds in parts.items()}


def main(args: list[str]) -> None:
    for item in args or DEFAULT:
        op, name = item.split("/")
        split(op, name)


if __name__ == "__main__":
    main(sys.argv[1:])
