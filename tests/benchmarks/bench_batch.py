"""The batch call against single requests, in process, run by hand (not
collected by pytest): items per second of a 100-item blend-HLB batch and of
the same 100 blends sent one request each through the test client, in
interleaved rounds so that both meet the same load of the machine.

    .venv/bin/python -m tests.benchmarks.bench_batch
    .venv/bin/python -m tests.benchmarks.bench_batch --port 18437   # a running server on 127.0.0.1, one client

The goal (issue 15): the batch at least 4x the items per second of single
requests, under gunicorn."""
from __future__ import annotations

import argparse
import http.client
import json
import statistics
import time
from types import SimpleNamespace

from service.http.app import create_app
from service.http.schemas.batch_bodies import MAX_ITEMS
from service.http.spec_examples import EXAMPLES

ROUNDS = 7


def items_per_s(post, raw: str, path: str, requests: int, items: int) -> float:
    start = time.perf_counter()
    for _ in range(requests):
        response = post(path, data=raw, content_type="application/json")
        assert response.status_code == 200, response.status_code
    return requests * items / (time.perf_counter() - start)


def http_post(port: int):
    """A test-client-like post over HTTP: one connection per request, as a
    sync worker serves them."""
    def post(path: str, data: str, content_type: str):
        connection = http.client.HTTPConnection("127.0.0.1", port)
        connection.request("POST", path, data.encode(), {"Content-Type": content_type})
        response = connection.getresponse()
        response.read()
        connection.close()
        return SimpleNamespace(status_code=response.status)
    return post


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    parser.add_argument("--port", type=int, help="measure a server running on 127.0.0.1 at this port, not in process")
    args = parser.parse_args()
    client = SimpleNamespace(post=http_post(args.port)) if args.port else create_app({"testing": True}).test_client()
    where = f"over HTTP on port {args.port}" if args.port else "in process"
    one = json.dumps(EXAMPLES["blendHlb"]["by_mass"]["value"])
    batch = json.dumps({"items": [{"operation": "blendHlb", "body": json.loads(one)}] * MAX_ITEMS})
    for _ in range(3):
        items_per_s(client.post, one, "/v1/blends/hlb", 1, 1)
        items_per_s(client.post, batch, "/v1/batch", 1, MAX_ITEMS)
    single, batched = [], []
    for _ in range(ROUNDS):
        single.append(items_per_s(client.post, one, "/v1/blends/hlb", MAX_ITEMS, 1))
        batched.append(items_per_s(client.post, batch, "/v1/batch", 3, MAX_ITEMS))
    ratios = [b / s for s, b in zip(single, batched)]
    print(f"blend HLB, {where}: single requests {statistics.median(single):.0f} items/s; "
          f"{MAX_ITEMS}-item batches {statistics.median(batched):.0f} items/s; "
          f"ratio {statistics.median(ratios):.2f} (rounds {min(ratios):.2f} to {max(ratios):.2f})")


if __name__ == "__main__":
    main()
