"""The benchmark's reference endpoint (EMULSION_BENCHMARK) and the benchmark
script's own pieces, so that tests/benchmarks/bench_service.py, run by hand,
cannot rot unseen. Behaviour only: no timing is checked here."""
from __future__ import annotations

import json

from service.http.app import create_app
from service.http.config import Settings
from tests.benchmarks import bench_service


def test_off_by_default_and_never_in_the_spec(client):
    assert Settings.from_env({}).benchmark is False
    assert client.post("/_benchmark/reference/100", data=b"{}", content_type="application/json").status_code == 404
    on = create_app({"benchmark": True}).test_client()
    assert not any("_benchmark" in path for path in on.get("/openapi.json").get_json()["paths"])


def test_answers_a_json_body_of_the_size_asked_and_reads_the_body_unparsed():
    client = create_app({"benchmark": True}).test_client()
    for size in (4729, 52166):
        # Not JSON at all: the endpoint reads the body but does not parse it.
        response = client.post(f"/_benchmark/reference/{size}", data=b"x" * 100, content_type="application/json")
        assert response.status_code == 200
        assert response.mimetype == "application/json"
        assert len(response.get_data()) == size
        assert set(json.loads(response.get_data())) == {"reference"}


def test_the_setting_is_read_from_the_environment():
    assert Settings.from_env({"EMULSION_BENCHMARK": "1"}).benchmark is True


def test_the_benchmark_covers_every_example_and_its_table_lines_up():
    client = create_app({"benchmark": True}).test_client()
    labels = []
    for case in bench_service.cases():
        response = client.post(case.path, data=case.body, content_type="application/json", headers={"Accept": case.accept})
        assert response.status_code == 200, case.label
        size = len(response.get_data())
        reference = client.post(bench_service.REFERENCE_PATH.format(size=size), data=case.body, content_type="application/json")
        assert len(reference.get_data()) == size, case.label
        labels.append(case.label)
    assert any(label.startswith("candidatePairs") for label in labels)
    assert any("Markdown" in label for label in labels)
    table = bench_service.format_table([{"label": "blendHlb (by_mass)", "size": 4729, "rps": 1283.4, "reference_rps": 3783.0, "ratio": 0.339}])
    header, rule, row = table.splitlines()
    assert header.count("|") == rule.count("|") == row.count("|") == 6
    assert row == "| blendHlb (by_mass) | 4729 | 1283 | 3783 | 0.34 |"


def test_the_answer_snapshot_writes_every_example_answered(tmp_path):
    from tests.benchmarks.answer_snapshot import snapshot

    written = snapshot(tmp_path)
    names = sorted(p.name for p in tmp_path.iterdir())
    assert written == len(names) > len(bench_service.cases())
    assert all(name.endswith("-200") for name in names), [n for n in names if not n.endswith("-200")]


def test_the_cost_parts_clock_reads_a_process_cpu_time():
    # The cost part's clock (proc(5): utime and stime in clock ticks), read
    # on this process against the standard library's own count of it.
    import os
    import time

    before, theirs = bench_service.worker_cpu_s(os.getpid()), time.process_time()
    while time.process_time() - theirs < 0.2:
        pass
    spent = bench_service.worker_cpu_s(os.getpid()) - before
    assert 0.15 <= spent <= 0.5
