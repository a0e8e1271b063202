"""Each curl example in the README gives the output shown there.

The README pairs a ```sh block holding one curl command (optionally piped to
a simple jq path or `map(.path)`) with the ```json block after it. The test
replays the request on the app and compares the JSON, so an example cannot go
stale unseen. `python -m tests.contract.test_readme --write` refreshes the
outputs after a deliberate change."""
from __future__ import annotations

import json
import re
import shlex
import sys
from pathlib import Path
from urllib.parse import urlsplit

import pytest

README = Path(__file__).resolve().parents[2] / "README.md"
PAIR = re.compile(r"```sh\n(curl [^\n]*)\n```\n\n```(json|markdown)\n(.*?)\n```", re.S)


def examples(text: str):
    """(command, kind, shown, where) for each example."""
    return [(m.group(1), m.group(2), m.group(3), (m.start(3), m.end(3))) for m in PAIR.finditer(text)]


def parse_curl(command: str):
    curl, _, jq = command.partition(" | jq ")
    args = shlex.split(curl)
    method, data, url, headers = "GET", None, None, {}
    i = 1
    while i < len(args):
        a = args[i]
        if a == "-X":
            method, i = args[i + 1], i + 2
        elif a == "-d":
            data, i = args[i + 1], i + 2
            method = "POST" if method == "GET" else method
        elif a == "-H":
            name, _, value = args[i + 1].partition(":")
            headers[name.strip()] = value.strip()
            i += 2
        elif a.startswith("-"):
            i += 1
        else:
            url, i = a, i + 1
    parts = urlsplit(url)
    path = parts.path + (f"?{parts.query}" if parts.query else "")
    return method, path, data, headers, shlex.split(jq)[0] if jq else "."


def _path(value, expr: str):
    for key in filter(None, expr.strip().lstrip(".").split(".")):
        value = value[key]
    return value


def _item(value, expr: str):
    expr = expr.strip()
    if expr.startswith("[") and expr.endswith("]"):
        return [_path(value, part) for part in expr[1:-1].split(",")]
    return _path(value, expr)


def jq_lite(value, program: str):
    """The few jq filters the README uses: `.a.b`, `.a | map(.b)`,
    `map([.b, .c])` and `.a | [.b, .c]`."""
    for stage in program.split("|"):
        stage = stage.strip()
        m = re.fullmatch(r"map\((.*)\)", stage)
        value = [_item(v, m.group(1)) for v in value] if m else _item(value, stage)
    return value


def replay(client, command: str):
    """The answer to the example's request: JSON through the jq filter, or text."""
    method, path, data, headers, jq = parse_curl(command)
    headers.pop("Content-Type", None)
    response = client.open(path, method=method, data=data, headers=headers, content_type="application/json" if data else None)
    if not response.mimetype.endswith("json"):
        return response.get_data(as_text=True).rstrip("\n")
    value = json.loads(response.get_data(as_text=True))
    if response.mimetype == "application/problem+json" and "X-Request-ID" not in headers:
        # A generated request id differs on every request, so the examples
        # leave it out; the README's "Logs and metrics" shows one.
        value.pop("request_id", None)
    return jq_lite(value, jq)


CASES = examples(README.read_text(encoding="utf-8"))


def test_the_readme_has_examples():
    assert len(CASES) >= 10


@pytest.mark.parametrize(("command", "kind", "shown"), [(c, k, s) for c, k, s, _ in CASES], ids=[parse_curl(c)[1] for c, *_ in CASES])
def test_readme_example_gives_the_output_shown(client, command, kind, shown):
    got = replay(client, command)
    assert got == (json.loads(shown) if kind == "json" else shown)


def main() -> int:
    from service.http.app import create_app

    client = create_app().test_client()
    text = README.read_text(encoding="utf-8")
    for command, kind, _, (start, end) in reversed(examples(text)):
        got = replay(client, command)
        text = text[:start] + (json.dumps(got, indent=2, ensure_ascii=False) if kind == "json" else got) + text[end:]
    README.write_text(text, encoding="utf-8")
    return 0


if __name__ == "__main__" and "--write" in sys.argv:
    raise SystemExit(main())
