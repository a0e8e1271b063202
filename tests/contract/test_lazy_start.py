"""What a start does not load: the libraries only some answers need are
imported where they are used, pint only for a unit text the registry's table
does not hold, and the OpenAPI document is built on its first request. Each
check runs in a fresh interpreter, whose sys.modules shows what was loaded.
Common practice, no source (a process loads only what serves its requests)."""
from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

from service.http.requests_seen import operation_ids
from service.http.spec import OPERATIONS, build_spec

ROOT = Path(__file__).resolve().parents[2]
# scipy: never in the service (the tests' reference for the blend
# programs); matplotlib: the series' SVG; fpdf and pypdf: PDFs; numpy: only
# matplotlib's; pint: unit texts outside the table;
# jsonschema: the faults of a file the compiled validator refused; apispec:
# the OpenAPI document.
NOT_AT_START = ["scipy", "numpy", "matplotlib", "fpdf", "pypdf", "pint", "jsonschema", "apispec"]


def _loaded_after(code: str) -> dict:
    script = code + "\nimport json, sys\nprint(json.dumps({m: m in sys.modules for m in %r}))" % NOT_AT_START
    out = subprocess.run([sys.executable, "-c", script], cwd=ROOT, capture_output=True, text=True, check=True,
                         env={"PATH": "/usr/bin:/bin", "PYTHONPATH": str(ROOT)})
    return json.loads(out.stdout.strip().splitlines()[-1])


def test_building_the_app_and_answering_the_common_calls_loads_none_of_them():
    # The spec's own examples of the calls that need none of them.
    loaded = _loaded_after(
        "from service.http.app import create_app\n"
        "from service.http.spec import OPERATIONS\n"
        "from service.http.spec_examples import EXAMPLES\n"
        "client = create_app({'testing': True}).test_client()\n"
        "assert client.get('/healthz').status_code == 200\n"
        "paths = {op_id: path for path, method, op_id, *_ in OPERATIONS}\n"
        "for op_id in ('blendHlb', 'oilPhaseRequiredHlb', 'createWorksheet', 'candidatePairs'):\n"
        "    for example in EXAMPLES[op_id].values():\n"
        "        assert client.post(paths[op_id], json=example['value']).status_code == 200, op_id\n"
        "assert client.post('/v1/blends/hlb', json={'components': []}).status_code == 422")
    assert [m for m, yes in loaded.items() if yes] == []


def test_solving_a_blend_loads_neither_numpy_nor_scipy():
    # The blend programs are plain Python (service/core/blend_programs.py).
    loaded = _loaded_after(
        "from service.http.app import create_app\n"
        "from service.http.spec_examples import EXAMPLES\n"
        "client = create_app({'testing': True}).test_client()\n"
        "for example in EXAMPLES['solveBlend'].values():\n"
        "    assert client.post('/v1/blends/solve', json=example['value']).status_code == 200\n")
    assert not loaded["numpy"] and not loaded["scipy"]


def test_the_check_is_able_to_see_a_library_loaded():
    # The same check, after a request for the document: apispec is loaded.
    loaded = _loaded_after("from service.http.app import create_app\n"
                           "client = create_app({'testing': True}).test_client()\n"
                           "assert client.get('/openapi.json').status_code == 200")
    assert loaded["apispec"]


def test_the_document_served_is_the_built_one():
    from service.http.app import create_app

    client = create_app({"testing": True}).test_client()
    assert client.get("/openapi.json").get_json() == json.loads(json.dumps(build_spec()))
    assert client.get("/docs").status_code == 200


def test_operation_ids_of_the_request_log_are_the_spec_s():
    spec = build_spec()
    from_spec = {(path.replace("{", "<").replace("}", ">"), method.upper()): operation["operationId"]
                 for path, item in spec["paths"].items() for method, operation in item.items()}
    assert operation_ids(OPERATIONS) == from_spec
