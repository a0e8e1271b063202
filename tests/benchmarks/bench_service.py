"""Benchmarks, run by hand (not collected by pytest): start-up costs and the
in-process cost of one request to each calculation, as medians.

    .venv/bin/python -m tests.benchmarks.bench_service

Targets (from the stack notes, on 2 cores): building the app well under a
second; a calculation request within a few times a no-op Flask request
(about 0.13 ms), so that gunicorn's throughput is set by HTTP, not by us."""
from __future__ import annotations

import statistics
import time

from registry import load_registry
from service.http.app import create_app
from service.http.spec_examples import EXAMPLES
from tests.api.helpers import invalid_list_body

PATHS = {"blendHlb": "/v1/blends/hlb", "blendProportions": "/v1/blends/proportions", "oilPhaseRequiredHlb": "/v1/oil-phases/required-hlb",
         "emulsifierMinimum": "/v1/emulsifier/minimum", "createWorksheet": "/v1/worksheets", "candidatePairs": "/v1/candidate-pairs",
         "hlbEstimate": "/v1/hlb-estimates", "requiredHlbSeriesPlan": "/v1/required-hlb-series/plan",
         "requiredHlbSeriesEvaluate": "/v1/required-hlb-series/evaluate"}


def median_ms(fn, repeat: int, clock=time.perf_counter) -> float:
    times = []
    for _ in range(repeat):
        start = clock()
        fn()
        times.append((clock() - start) * 1000)
    return statistics.median(times)


def bench_invalid_body(client) -> None:
    """64 KiB bodies that are all faults: what one refusal costs, in CPU time
    and in the size of the answer. Many invalid list items (refused by the
    list's length), and many unknown keys within bounds (the error cap)."""
    keys = ('{"components": [{"ingredient": "polysorbate-80", "amount": {"value": 1, "unit": "g"}}, '
            '{"ingredient": "sorbitan-monooleate", "amount": {"value": 1, "unit": "g"}}, ')
    keys = (keys + ", ".join(f'"k{i:05d}": 0' for i in range((64 * 1024 - len(keys)) // 13)) + "}").replace("}}, \"k", "}}], \"k", 1)
    for label, body in (("invalid items", invalid_list_body()), ("unknown keys", keys.encode())):
        response = client.post("/v1/blends/hlb", data=body, content_type="application/json")
        assert response.status_code == 422, response.status_code
        # CPU time, not wall time: a refusal's cost is what it takes from the worker.
        cost = median_ms(lambda: client.post("/v1/blends/hlb", data=body, content_type="application/json"), 20, clock=time.process_time)
        print(f"POST /v1/blends/hlb (64 KiB of {label}, {len(body)} bytes): {cost:.1f} ms CPU, "
              f"answer {len(response.get_data())} bytes, {len(response.get_json()['errors'])} error items")


def main() -> None:
    print(f"load_registry: {median_ms(load_registry, 5):.1f} ms")
    print(f"create_app: {median_ms(create_app, 3):.1f} ms")
    client = create_app().test_client()
    print(f"GET /healthz: {median_ms(lambda: client.get('/healthz'), 300):.3f} ms")
    bench_invalid_body(client)
    for op, examples in EXAMPLES.items():
        for name, example in examples.items():
            body = example["value"]
            response = client.post(PATHS[op], json=body)
            assert response.status_code == 200, (op, name, response.get_data(as_text=True))
            print(f"POST {PATHS[op]} ({name}): {median_ms(lambda: client.post(PATHS[op], json=body), 200):.3f} ms")


if __name__ == "__main__":
    main()
