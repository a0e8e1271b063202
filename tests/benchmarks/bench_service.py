"""The service's benchmark, run by hand (not collected by pytest: its name
does not start with test_). Every part prints as it goes:

  throughput  under the project's gunicorn configuration (service/gunicorn_conf.py,
              loopback, a free port in 18100-18999), requests per second of every
              calculation in the spec's examples, each beside the reference endpoint
              (EMULSION_BENCHMARK: the same app, a pre-encoded body of the same size)
              measured in turns with it (5 a measurement, on the same kept-alive
              connections), in three interleaved rounds; one table, the ratio
              being the median of the rounds' ratios
  cost        the CPU time a worker spends on one request of each calculation and on
              its reference, one worker and one kept-alive connection, requests sent
              one after the other: unlike requests per second, CPU time does not
              depend on how the connections spread or on what else the machine runs;
              the difference is the service's own cost of the calculation
  startup     exec of gunicorn to the first answered /healthz, with the shipped
              registry and with one of 1000 surfactants (tests/benchmarks/big_registry.py)
  memory      each worker's memory after warm-up and, with --long N, after N more
              requests (worker recycling off, so that the same workers are measured):
              resident (RSS, pages shared with the master counted in full), unique
              (USS, its private pages only) and proportional (PSS, shared pages split
              between the processes that share them), from /proc/PID/smaps_rollup;
              --leave-out solveBlend keeps an operation out of it
  pairs       candidate pairs in-process at the shipped registry and at 1000 surfactants
  inprocess   start-up costs and one request to each calculation through Flask's test
              client, and what a refusal of a 64 KiB body costs

    .venv/bin/python -m tests.benchmarks.bench_service                 # all parts
    .venv/bin/python -m tests.benchmarks.bench_service --quick         # short rounds
    .venv/bin/python -m tests.benchmarks.bench_service --only throughput,pairs --long 100000

Timings are noisy on a shared machine: compare figures from one run."""
from __future__ import annotations

import argparse
import json
import multiprocessing
import os
import platform
import signal
import socket
import statistics
import subprocess
import sys
import tempfile
import time
from dataclasses import dataclass
from pathlib import Path

REPO = Path(__file__).resolve().parents[2]
PARTS = ("throughput", "cost", "startup", "memory", "pairs", "inprocess")
REFERENCE_PATH = "/_benchmark/reference/{size}"
PORTS = range(18100, 19000)


@dataclass(frozen=True)
class Case:
    """One request the benchmark sends: a label, the path, the body, the media asked for."""

    label: str
    path: str
    body: bytes
    accept: str = "application/json"
    # Calculations in one request: a batch call's items, else 1.
    items: int = 1


def cases(match: str = "") -> list[Case]:
    """Every POST operation of the spec that has an example, with its first
    example; the worksheet, amounts taken and compounding record also as
    Markdown. An operation the app does not have is not in its spec, so the
    list follows the app as it changes (a batch call included)."""
    from service.http.spec import build_spec
    from service.http.spec_examples import EXAMPLES

    found = []
    spec = build_spec()
    for path, item in spec["paths"].items():
        operation = item.get("post")
        if operation is None or not EXAMPLES.get(operation["operationId"]):
            continue
        op_id = operation["operationId"]
        name, example = next(iter(EXAMPLES[op_id].items()))
        body = json.dumps(example["value"]).encode()
        # A batch call (if the app has one) is counted in items too: the
        # length of the first list in its body.
        lists = [v for v in example["value"].values() if isinstance(v, list)] if "batch" in op_id.lower() else []
        found.append(Case(f"{op_id} ({name})", path, body, items=len(lists[0]) if lists else 1))
        offered = operation["responses"].get("200", {}).get("content", {})
        if "text/markdown" in offered and op_id in ("createWorksheet", "checkAmountsTaken", "createCompoundingRecord"):
            found.append(Case(f"{op_id} ({name}, Markdown)", path, body, "text/markdown"))
        if lists and all(isinstance(item, dict) and set(item) >= {"operation", "body"} for item in lists[0]) and "blendHlb" in EXAMPLES:
            # The goal's measure: a full batch of blend HLBs against single ones.
            most = _max_items(spec, operation)
            one_blend = {"operation": "blendHlb", "body": next(iter(EXAMPLES["blendHlb"].values()))["value"]}
            found.append(Case(f"{op_id} ({most} blendHlb items)", path, json.dumps({"items": [one_blend] * most}).encode(), items=most))
    return [case for case in found if match.lower() in case.label.lower()]


def _max_items(spec: dict, operation: dict) -> int:
    """The most items the spec lets a batch hold (100 if it does not say)."""
    try:
        schema = operation["requestBody"]["content"]["application/json"]["schema"]
        if "$ref" in schema:
            schema = spec["components"]["schemas"][schema["$ref"].rpartition("/")[2]]
        return int(schema["properties"]["items"]["maxItems"])
    except (KeyError, TypeError, ValueError):
        return 100


# -- the machine ------------------------------------------------------------

def machine() -> str:
    model = "unknown CPU"
    try:
        for line in Path("/proc/cpuinfo").read_text().splitlines():
            if line.startswith("model name"):
                model = line.split(":", 1)[1].strip()
                break
    except OSError:
        pass
    load = os.getloadavg() if hasattr(os, "getloadavg") else ()
    return (f"{model}, {os.cpu_count()} cores, Python {platform.python_version()} ({platform.system()} {platform.release()})"
            + (f", load average {load[0]:.2f} at start" if load else ""))


# -- a small HTTP/1.1 client on a raw socket, cheap enough not to be the limit

def request_bytes(case: Case, path: str | None = None, port: int = 0) -> bytes:
    head = (f"POST {path or case.path} HTTP/1.1\r\nHost: 127.0.0.1:{port}\r\nContent-Type: application/json\r\n"
            f"Accept: {case.accept}\r\nContent-Length: {len(case.body)}\r\n\r\n")
    return head.encode() + case.body


def read_response(sock: socket.socket, buffer: bytes) -> tuple[int, bytes, bytes]:
    """(status, body, bytes left over) of one response with a Content-Length."""
    while b"\r\n\r\n" not in buffer:
        chunk = sock.recv(65536)
        if not chunk:
            raise ConnectionError("the server closed the connection")
        buffer += chunk
    head, _, rest = buffer.partition(b"\r\n\r\n")
    lines = head.split(b"\r\n")
    status = int(lines[0].split()[1])
    length = next(int(line.split(b":", 1)[1]) for line in lines[1:] if line.lower().startswith(b"content-length:"))
    while len(rest) < length:
        chunk = sock.recv(65536)
        if not chunk:
            raise ConnectionError("the server closed the connection mid-answer")
        rest += chunk
    return status, rest[:length], rest[length:]


def connect(port: int) -> socket.socket:
    sock = socket.create_connection(("127.0.0.1", port))
    sock.setsockopt(socket.IPPROTO_TCP, socket.TCP_NODELAY, 1)
    return sock


def one(port: int, payload: bytes) -> tuple[int, bytes]:
    with connect(port) as sock:
        sock.sendall(payload)
        status, body, _ = read_response(sock, b"")
        return status, body


# A client process's kept-alive connection, kept from one measurement to the
# next of a pair (see throughput).
_KEPT: dict = {}


def _client(args) -> float:
    """A client process's part of one measurement: requests per second
    answered 200 from `start_at` until the last one begun before `stop_at`
    ends, on one kept-alive connection (or a fresh one each time).
    With `keep`, the connection of this process's previous measurement is
    used again."""
    port, payload, start_at, stop_at, fresh, keep = args
    sock, buffer = _KEPT.pop("sock", (None, b""))
    if sock is not None and not keep:
        sock.close()
        sock, buffer = None, b""
    if sock is None and not fresh:
        # Opened before the start, as a kept one was: a connection's cost is
        # not part of a kept-alive measurement.
        sock, buffer = connect(port), b""
    while time.time() < start_at:
        time.sleep(0.0005)
    done = 0
    while time.time() < stop_at:
        try:
            if sock is None:
                sock, buffer = connect(port), b""
            sock.sendall(payload)
            status, _, buffer = read_response(sock, buffer)
        except OSError:
            # gunicorn closes a kept-alive connection when a worker reaches
            # its max_requests and is replaced; the next request opens another.
            sock = None
            continue
        if status != 200:
            raise RuntimeError(f"answered {status}")
        done += 1
        if fresh:
            sock.close()
            sock = None
    finished = time.time()
    if sock is not None:
        _KEPT["sock"] = (sock, buffer)
    # The last request may end after stop_at: the rate is over the time the
    # requests took, not the time asked for (a 100-item batch takes tens of
    # milliseconds, a fair part of a short turn).
    return done / max(finished - start_at, 1e-9)


def throughput(pool, port: int, payload: bytes, clients: int, seconds: float, fresh: bool, keep: bool = False) -> float:
    """Requests per second. gthread workers take connections as they come, so
    4 kept-alive connections may land 2 and 2 on the two workers or all 4 on
    one, which halves the rate: `keep` measures on the connections of the
    measurement before (each of the `clients` processes runs one part of
    each), so that an operation and its reference meet the same spread."""
    start_at = time.time() + 0.02
    return sum(pool.map(_client, [(port, payload, start_at, start_at + seconds, fresh, keep)] * clients, chunksize=1))


def paired_throughput(pool, port: int, payload: bytes, reference: bytes, clients: int, seconds: float, fresh: bool,
                      slices: int) -> tuple[float, float]:
    """An operation's and its reference's requests per second, each over
    `seconds`, measured in `slices` alternating turns on the same kept-alive
    connections: the machine's speed drifts (a shared 2-core machine ran
    the same reference at 1300 and 3200 requests/s within one run), and a
    drift slower than a turn then falls on both alike."""
    turn = seconds / slices
    ours, theirs = [], []
    for i in range(slices):
        ours.append(throughput(pool, port, payload, clients, turn, fresh, keep=i > 0))
        theirs.append(throughput(pool, port, reference, clients, turn, fresh, keep=True))
    return statistics.fmean(ours), statistics.fmean(theirs)


# -- the server -------------------------------------------------------------

def free_port() -> int:
    for port in PORTS:
        with socket.socket() as probe:
            try:
                probe.bind(("127.0.0.1", port))
            except OSError:
                continue
            return port
    raise RuntimeError("no free port in 18100-18999")


def healthz_answered(port: int) -> bool:
    try:
        with socket.create_connection(("127.0.0.1", port), timeout=1) as sock:
            sock.sendall(b"GET /healthz HTTP/1.1\r\nHost: 127.0.0.1\r\n\r\n")
            return read_response(sock, b"")[0] == 200
    except OSError:
        return False


class Server:
    """gunicorn with the project's configuration, on a free loopback port."""

    def __init__(self, registry_root: str | None = None, extra_args: tuple[str, ...] = (), timeout_s: float = 60,
                 environ: dict[str, str] | None = None):
        self.port = free_port()
        env = {**os.environ, **(environ or {}), "EMULSION_BIND": f"127.0.0.1:{self.port}", "EMULSION_BENCHMARK": "1",
               "PYTHONPATH": str(REPO)}
        env.pop("PROMETHEUS_MULTIPROC_DIR", None)
        if registry_root:
            env["EMULSION_REGISTRY_ROOT"] = registry_root
        started = time.perf_counter()
        self.proc = subprocess.Popen([sys.executable, "-m", "gunicorn", "-c", "service/gunicorn_conf.py", *extra_args,
                                      "service.wsgi:app"], cwd=REPO, env=env,
                                     stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
        while not healthz_answered(self.port):
            if self.proc.poll() is not None:
                raise RuntimeError(f"gunicorn exited with {self.proc.returncode} before answering /healthz")
            if time.perf_counter() - started > timeout_s:
                self.stop()
                raise RuntimeError("gunicorn did not answer /healthz in time")
            time.sleep(0.005)
        self.startup_s = time.perf_counter() - started
        # /healthz is answered by the first worker up; the others follow.
        expected = int(env.get("EMULSION_WORKERS", "2"))
        while len(self.workers()) < expected and time.perf_counter() - started < timeout_s:
            time.sleep(0.01)

    def workers(self) -> list[int]:
        pids = []
        for entry in Path("/proc").iterdir():
            if entry.name.isdigit():
                try:
                    stat = (entry / "stat").read_text()
                except OSError:
                    continue
                if int(stat.rpartition(")")[2].split()[1]) == self.proc.pid:
                    pids.append(int(entry.name))
        return sorted(pids)

    def stop(self) -> None:
        # Only the master this object started; it stops its own workers.
        if self.proc.poll() is None:
            self.proc.send_signal(signal.SIGTERM)
            try:
                self.proc.wait(30)
            except subprocess.TimeoutExpired:
                self.proc.kill()
                self.proc.wait()

    def __enter__(self):
        return self

    def __exit__(self, *exc):
        self.stop()


def rss_mb(pid: int) -> float:
    for line in Path(f"/proc/{pid}/status").read_text().splitlines():
        if line.startswith("VmRSS:"):
            return int(line.split()[1]) / 1024
    raise RuntimeError(f"no VmRSS for {pid}")


def memory_mb(pid: int) -> dict[str, float]:
    """{"rss", "uss", "pss"} of a process in MB. A gunicorn worker forked from
    a master that loaded the app (preload_app) shares the master's pages until
    it writes to them: RSS counts them in each worker, USS in none, PSS in
    shares. Only RSS where smaps_rollup cannot be read."""
    try:
        fields = {}
        for line in Path(f"/proc/{pid}/smaps_rollup").read_text().splitlines()[1:]:
            name, _, rest = line.partition(":")
            fields[name] = int(rest.split()[0]) / 1024
        return {"rss": fields["Rss"], "uss": fields["Private_Clean"] + fields["Private_Dirty"], "pss": fields["Pss"]}
    except (OSError, KeyError, ValueError, IndexError):
        return {"rss": rss_mb(pid)}


MEMORY_KINDS = (("rss", "RSS"), ("uss", "USS"), ("pss", "PSS"))


def format_memory(mb: dict[str, float], before: dict[str, float] | None = None) -> str:
    def one(key: str, name: str) -> str:
        return f"{name} {mb[key]:.1f} MB" + (f" ({mb[key] - before[key]:+.1f})" if before and key in before else "")
    return ", ".join(one(key, name) for key, name in MEMORY_KINDS if key in mb)


def format_change(mb: dict[str, float], before: dict[str, float] | None) -> str:
    if not before:
        return "new worker"
    return ", ".join(f"{name} {mb[key] - before[key]:+.1f}" for key, name in MEMORY_KINDS if key in mb and key in before) + " MB"


# -- the table --------------------------------------------------------------

def format_table(rows: list[dict]) -> str:
    """rows: label, size (answer bytes), rps and reference_rps (medians), ratio.
    A Markdown table, so that it can be pasted into the README as it stands."""
    lines = ["| Operation | Answer bytes | Requests/s | Reference requests/s | Ratio |", "|---|---:|---:|---:|---:|"]
    for row in rows:
        lines.append(f"| {row['label']} | {row['size']} | {row['rps']:.0f} | {row['reference_rps']:.0f} | {row['ratio']:.2f} |")
    return "\n".join(lines)


def measure_rows(port: int, clients: int, seconds: float, rounds: int, fresh: bool, match: str = "", slices: int = 5) -> list[dict]:
    """Each case and its reference, in alternating turns (paired_throughput)
    in each round; the rounds interleaved, so that a slow spell of the
    machine falls on both."""
    plans = []
    for case in cases(match):
        status, body = one(port, request_bytes(case, port=port))
        if status != 200:
            print(f"  skipped {case.label}: answered {status}: {body[:200]!r}")
            continue
        reference = request_bytes(case, REFERENCE_PATH.format(size=len(body)), port)
        status, ref_body = one(port, reference)
        if status != 200 or len(ref_body) != len(body):
            raise RuntimeError(f"the reference endpoint answered {status} with {len(ref_body)} bytes, not {len(body)}: "
                               "is EMULSION_BENCHMARK read by this app?")
        plans.append((case, len(body), request_bytes(case, port=port), reference))
    results = {case.label: ([], []) for case, *_ in plans}
    with multiprocessing.get_context("fork").Pool(clients) as pool:
        for r in range(rounds):
            for case, _, payload, reference in plans:
                ours, theirs = results[case.label]
                mine, reference_rps = paired_throughput(pool, port, payload, reference, clients, seconds, fresh, slices)
                ours.append(mine)
                theirs.append(reference_rps)
            print(f"  round {r + 1} of {rounds} done")
    rows = []
    for case, size, *_ in plans:
        ours, theirs = results[case.label]
        rows.append({"label": case.label, "size": size, "items": case.items, "rps": statistics.median(ours), "reference_rps": statistics.median(theirs),
                     "ratio": statistics.median(o / t for o, t in zip(ours, theirs))})
    return rows


def part_throughput(args) -> None:
    print(f"\n## Throughput: {args.clients} client processes, {'a fresh connection per request' if args.fresh else 'kept-alive connections'}, "
          f"{args.rounds} interleaved rounds of {args.seconds} s per measurement, in {args.slices} turns alternating with its reference")
    with Server() as server:
        print(f"gunicorn -c service/gunicorn_conf.py: {len(server.workers())} workers, port {server.port}")
        rows = measure_rows(server.port, args.clients, args.seconds, args.rounds, args.fresh, args.match, args.slices)
        print(format_table(rows))
        single = next((row for row in rows if row["label"].startswith("blendHlb")), None)
        for row in rows:
            if row.get("items", 1) > 1:
                print(f"{row['label']}: {row['items']} items a request, {row['rps'] * row['items']:.0f} items/s"
                      + (f", {row['rps'] * row['items'] / single['rps']:.1f}x the {single['label']} requests/s" if single else ""))


def worker_cpu_s(pid: int) -> float:
    """User and system CPU time of a process so far, from /proc/PID/stat."""
    fields = Path(f"/proc/{pid}/stat").read_text().rpartition(")")[2].split()
    return (int(fields[11]) + int(fields[12])) / os.sysconf("SC_CLK_TCK")


def cpu_per_request_us(sock: socket.socket, pid: int, payload: bytes, n: int) -> float:
    """Worker CPU per request over `n` requests sent one after the other, after a warm-up of n // 5."""
    buffer = b""
    for i in range(n // 5 + n):
        if i == n // 5:
            started = worker_cpu_s(pid)
        sock.sendall(payload)
        status, _, buffer = read_response(sock, buffer)
        if status != 200:
            raise RuntimeError(f"answered {status}")
    return (worker_cpu_s(pid) - started) / n * 1e6


def part_cost(args) -> None:
    n = 300 if args.quick else 1500
    print(f"\n## Cost: worker CPU per request, 1 worker, 1 kept-alive connection, {n} requests one after the other (clock ticks of "
          f"{1e3 / os.sysconf('SC_CLK_TCK'):.0f} ms: {1e7 / os.sysconf('SC_CLK_TCK') / n:.0f} us a request at most)")
    rows = []
    with Server(extra_args=("--max-requests", "0"), environ={"EMULSION_WORKERS": "1"}) as server:
        [pid] = server.workers()
        with connect(server.port) as sock:
            for case in cases(args.match):
                status, body = one(server.port, request_bytes(case, port=server.port))
                if status != 200:
                    raise RuntimeError(f"{case.label} answered {status}")
                reference = request_bytes(case, REFERENCE_PATH.format(size=len(body)), server.port)
                ours = cpu_per_request_us(sock, pid, request_bytes(case, port=server.port), n)
                theirs = cpu_per_request_us(sock, pid, reference, n)
                rows.append((case.label, len(body), ours, theirs))
    print("| Operation | Answer bytes | Worker CPU us/request | Reference us/request | Own cost us |\n|---|---:|---:|---:|---:|")
    for label, size, ours, theirs in rows:
        print(f"| {label} | {size} | {ours:.0f} | {theirs:.0f} | {ours - theirs:.0f} |")


def part_startup(args, big_root: str) -> None:
    print("\n## Start-up: exec of gunicorn to the first answered /healthz (median of 3)")
    for label, root in (("shipped registry", None), ("1000 surfactants", big_root)):
        times = []
        for _ in range(3):
            with Server(root) as server:
                times.append(server.startup_s)
        print(f"{label}: {statistics.median(times):.2f} s (runs: {', '.join(f'{t:.2f}' for t in times)})")


def part_memory(args) -> None:
    left_out = [name.strip() for name in args.leave_out.split(",") if name.strip()]
    print("\n## Memory per worker (RSS, USS, PSS)" + (f", {', '.join(left_out)} left out" if left_out else ""))
    # Recycling off (it is on in the configuration, every ~5000 requests), so
    # that the workers measured after the long run are the ones measured before.
    with Server(extra_args=("--max-requests", "0")) as server:
        plans = [request_bytes(case, port=server.port) for case in cases()
                 if not any(case.label.startswith(name + " ") for name in left_out)]
        for payload in plans * 20:
            one(server.port, payload)
        before = {pid: memory_mb(pid) for pid in server.workers()}
        print(f"master {server.proc.pid}: {format_memory(memory_mb(server.proc.pid))}")
        print("after warm-up:\n" + "\n".join(f"  worker {pid}: {format_memory(mb)}" for pid, mb in before.items()))
        if args.long:
            # Five legs, each measured: growth that levels off (pages made
            # private once, arenas filled once) shows apart from a leak,
            # which keeps growing in every leg.
            start, sent, previous = time.perf_counter(), 0, before
            legs = 5
            per_leg = max(1, args.long // legs // len(plans) // args.clients)
            with multiprocessing.get_context("fork").Pool(args.clients) as pool:
                for leg in range(1, legs + 1):
                    pool.map(_long_client, [(server.port, plans, per_leg)] * args.clients)
                    sent += per_leg * args.clients * len(plans)
                    after = {pid: memory_mb(pid) for pid in server.workers()}
                    same = "same workers" if set(after) == set(before) else "the workers changed"
                    print(f"after {sent} more requests ({time.perf_counter() - start:.0f} s, {same}; change since warm-up, then since the last leg):\n"
                          + "\n".join(f"  worker {pid}: {format_memory(mb, before.get(pid))}; this leg {format_change(mb, previous.get(pid))}"
                                       for pid, mb in after.items()), flush=True)
                    previous = after


def _long_client(args) -> None:
    port, plans, each = args
    sock, buffer = connect(port), b""
    try:
        for _ in range(each):
            for payload in plans:
                sock.sendall(payload)
                status, _, buffer = read_response(sock, buffer)
                if status != 200:
                    raise RuntimeError(f"answered {status}")
    finally:
        sock.close()


def median_ms(fn, repeat: int, clock=time.perf_counter) -> float:
    times = []
    for _ in range(repeat):
        start = clock()
        fn()
        times.append((clock() - start) * 1000)
    return statistics.median(times)


def part_pairs(args, big_root: str) -> None:
    from service.http.app import create_app
    from service.http.spec_examples import EXAMPLES

    print("\n## Candidate pairs in-process (median)")
    body = next(iter(EXAMPLES["candidatePairs"].values()))["value"]
    for label, root in (("shipped registry", None), ("1000 surfactants", big_root)):
        client = create_app({"registry_root": root} if root else None).test_client()
        response = client.post("/v1/candidate-pairs", json=body)
        assert response.status_code == 200, response.get_data(as_text=True)
        print(f"{label}: {median_ms(lambda: client.post('/v1/candidate-pairs', json=body), args.pairs_repeat):.1f} ms")


def bench_invalid_body(client) -> None:
    """64 KiB bodies that are all faults: what one refusal costs, in CPU time
    and in the size of the answer. Many invalid list items (refused by the
    list's length), and many unknown keys within bounds (the error cap)."""
    from tests.api.helpers import invalid_list_body

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


def part_inprocess(args) -> None:
    from registry import load_registry
    from service.http.app import create_app

    print("\n## In-process (Flask's test client, median)")
    print(f"load_registry: {median_ms(load_registry, 5):.1f} ms")
    print(f"create_app: {median_ms(create_app, 3):.1f} ms")
    client = create_app().test_client()
    print(f"GET /healthz: {median_ms(lambda: client.get('/healthz'), 300):.3f} ms")
    bench_invalid_body(client)
    for case in cases():
        headers = {"Accept": case.accept}

        def post():
            return client.post(case.path, data=case.body, content_type="application/json", headers=headers)

        response = post()
        assert response.status_code == 200, (case.label, response.get_data(as_text=True))
        print(f"POST {case.path} {case.label}: {median_ms(post, 200):.3f} ms")


def main(argv: list[str] | None = None) -> None:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--only", default=",".join(PARTS), help=f"comma-separated parts to run (of {', '.join(PARTS)})")
    parser.add_argument("--quick", action="store_true", help="one round of 0.3 s per measurement, no in-process part")
    parser.add_argument("--rounds", type=int, default=3)
    parser.add_argument("--seconds", type=float, default=1.0, help="length of one measurement")
    parser.add_argument("--slices", type=int, default=5, help="throughput: turns a measurement is cut into, alternating with its reference's")
    parser.add_argument("--clients", type=int, default=4, help="client processes, each with one connection")
    parser.add_argument("--fresh", action="store_true", help="a fresh connection per request instead of kept-alive ones")
    parser.add_argument("--long", type=int, default=0, help="memory: send this many more requests and measure again (e.g. 100000)")
    parser.add_argument("--leave-out", default="", help="memory: operationIds kept out of the requests sent (e.g. solveBlend)")
    parser.add_argument("--match", default="", help="throughput: only the operations whose label holds this text")
    parser.add_argument("--pairs-repeat", type=int, default=20)
    args = parser.parse_args(argv)
    parts = [p.strip() for p in args.only.split(",") if p.strip()]
    unknown = set(parts) - set(PARTS)
    if unknown:
        parser.error(f"unknown part(s): {', '.join(sorted(unknown))}")
    if args.quick:
        args.rounds, args.seconds = 1, 0.3
        parts = [p for p in parts if p != "inprocess"] if args.only == ",".join(PARTS) else parts
    print(f"# Benchmark, {time.strftime('%Y-%m-%d %H:%M UTC', time.gmtime())}\nMachine: {machine()}")
    with tempfile.TemporaryDirectory(prefix="emulsion-bench-") as tmp:
        big_root = None
        if {"startup", "pairs"} & set(parts):
            from tests.benchmarks.big_registry import write_big_registry

            big_root = str(write_big_registry(Path(tmp) / "registry", 1000))
        for part in parts:
            if part == "throughput":
                part_throughput(args)
            elif part == "cost":
                part_cost(args)
            elif part == "startup":
                part_startup(args, big_root)
            elif part == "memory":
                part_memory(args)
            elif part == "pairs":
                part_pairs(args, big_root)
            elif part == "inprocess":
                part_inprocess(args)


if __name__ == "__main__":
    main()
