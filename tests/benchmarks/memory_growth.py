"""What a worker's memory grows by, in process, run by hand (not collected by
pytest): every example of the spec (service/http/spec_examples.py), as JSON
and, where offered, as Markdown, sent round after round through Flask's test
client with the JSON logging of service/gunicorn_conf.py writing to
/dev/null. After a warm-up, tracemalloc's snapshots are compared (the top
allocations by traceback that are still held) and its total of Python
allocations set beside the process's resident memory (/proc/self/status):
Python objects that stay level while VmRSS creeps are the allocator's
fragmentation, not a leak.

    .venv/bin/python -m tests.benchmarks.memory_growth [--rounds N] [--with-solver] [--top N]

solveBlend is left out unless --with-solver: its solver loads numpy and scipy
on first use, which would hide everything else in the figures."""
from __future__ import annotations

import argparse
import gc
import json
import logging.config
import os
import time
import tracemalloc
from pathlib import Path


def rss_kb() -> int:
    for line in Path("/proc/self/status").read_text().splitlines():
        if line.startswith("VmRSS:"):
            return int(line.split()[1])
    raise RuntimeError("no VmRSS")


def requests(with_solver: bool) -> list[tuple[str, str, str]]:
    """(path, body, Accept) of every spec example, Markdown too where offered."""
    from service.http.spec import build_spec
    from service.http.spec_examples import EXAMPLES

    out = []
    for path, item in build_spec()["paths"].items():
        operation = item.get("post")
        if operation is None or (operation["operationId"] == "solveBlend" and not with_solver):
            continue
        offered = operation["responses"].get("200", {}).get("content", {})
        for example in EXAMPLES.get(operation["operationId"], {}).values():
            body = json.dumps(example["value"])
            out.append((path, body, "application/json"))
            if "text/markdown" in offered:
                out.append((path, body, "text/markdown"))
    return out


def main(argv: list[str] | None = None) -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--rounds", type=int, default=200, help="rounds of every example after the warm-up")
    parser.add_argument("--with-solver", action="store_true", help="send solveBlend's examples too")
    parser.add_argument("--top", type=int, default=15, help="allocation sites to print")
    args = parser.parse_args(argv)

    from service.http.app import create_app
    from service.http.logs import logconfig

    logging.config.dictConfig(logconfig())
    logging.getLogger().handlers[0].setStream(open(os.devnull, "w"))
    client = create_app().test_client()
    plan = requests(args.with_solver)

    def round_() -> None:
        for path, body, accept in plan:
            answer = client.post(path, data=body, content_type="application/json", headers={"Accept": accept})
            if answer.status_code != 200:
                raise RuntimeError(f"{path} ({accept}) answered {answer.status_code}: {answer.get_data()[:300]!r}")

    for _ in range(5):
        round_()
    gc.collect()
    print(f"{len(plan)} requests a round; after the warm-up VmRSS {rss_kb() / 1024:.1f} MB")
    tracemalloc.start(12)
    gc.collect()
    first = tracemalloc.take_snapshot()
    start, rss_start, traced_start = time.perf_counter(), rss_kb(), tracemalloc.get_traced_memory()[0]
    step = max(1, args.rounds // 5)
    for done in range(1, args.rounds + 1):
        round_()
        if done % step == 0 or done == args.rounds:
            gc.collect()
            print(f"  {done * len(plan):>7} requests: traced {(tracemalloc.get_traced_memory()[0] - traced_start) / 1024:+8.1f} KiB, "
                  f"VmRSS {(rss_kb() - rss_start) / 1024:+6.1f} MB (tracing costs memory of its own)")
    gc.collect()
    last = tracemalloc.take_snapshot()
    print(f"{args.rounds * len(plan)} requests in {time.perf_counter() - start:.0f} s; the allocations still held that grew most:")
    filters = [tracemalloc.Filter(False, tracemalloc.__file__), tracemalloc.Filter(False, "<frozen importlib._bootstrap*>")]
    for stat in last.filter_traces(filters).compare_to(first.filter_traces(filters), "traceback")[:args.top]:
        print(f"\n{stat.size_diff / 1024:+.1f} KiB in {stat.count_diff:+d} blocks")
        for line in stat.traceback.format(limit=6):
            print("   " + line)


if __name__ == "__main__":
    main()
