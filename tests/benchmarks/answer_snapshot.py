"""Every spec example's answer, JSON and Markdown where offered, written to a
folder through Flask's test client, run by hand (not collected by pytest):
the answers are deterministic, so a change meant only to make the service
faster must leave two snapshots byte for byte the same.

    .venv/bin/python -m tests.benchmarks.answer_snapshot /tmp/before
    ... change ...
    .venv/bin/python -m tests.benchmarks.answer_snapshot /tmp/after && diff -r /tmp/before /tmp/after
"""
from __future__ import annotations

import json
import sys
from pathlib import Path

from service.http.app import create_app
from service.http.spec import build_spec
from service.http.spec_examples import EXAMPLES

FORMS = ("application/json", "text/markdown")


def snapshot(folder: Path) -> int:
    """The number of answers written, one file each, named by operation, example, form and status."""
    folder.mkdir(parents=True, exist_ok=True)
    paths = {item["post"]["operationId"]: path for path, item in build_spec()["paths"].items() if "post" in item}
    client = create_app().test_client()
    written = 0
    for operation, examples in EXAMPLES.items():
        if operation not in paths:
            continue
        for name, example in examples.items():
            body = json.dumps(example["value"])
            for accept in FORMS:
                answer = client.post(paths[operation], data=body, content_type="application/json", headers={"Accept": accept})
                if accept != FORMS[0] and answer.status_code == 406:
                    continue  # no Markdown form for this operation
                (folder / f"{operation}-{name}-{accept.split('/')[1]}-{answer.status_code}").write_bytes(answer.data)
                written += 1
    return written


if __name__ == "__main__":
    if len(sys.argv) != 2:
        sys.exit(__doc__)
    print(f"{snapshot(Path(sys.argv[1]))} answers written to {sys.argv[1]}")
