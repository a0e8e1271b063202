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
PAIR = re.compile(r"```sh\n(curl [^\n]*)\n```\n\n```json\n(.*?)\n```", re.S)


def examples(text: str):
    return [(m.group(1), m.group(2), (m.start(2), m.end(2))) for m in PAIR.finditer(text)]


def parse_curl(command: str):
    curl, _, jq = command.partition(" | jq ")
    args = shlex.split(curl)
    method, data, url = "GET", None, None
    i = 1
    while i < len(args):
        a = args[i]
        if a == "-X":
            method, i = args[i + 1], i + 2
        elif a == "-d":
            data, i = args[i + 1], i + 2
            method = "POST" if method == "GET" else method
        elif a == "-H":
            i += 2
        elif a.startswith("-"):
            i += 1
        else:
            url, i = a, i + 1
    parts = urlsplit(url)
    path = parts.path + (f"?{parts.query}" if parts.query else "")
    return method, path, data, shlex.split(jq)[0] if jq else "."


def _path(value, expr: str):
    for key in filter(None, expr.strip().lstrip(".").split(".")):
        value = value[key]
    return value


def jq_lite(value, program: str):
    """The few jq filters the README uses: `.a.b`, and `.a | map(.b)`."""
    for stage in program.split("|"):
        stage = stage.strip()
        m = re.fullmatch(r"map\((.*)\)", stage)
        value = [_path(v, m.group(1)) for v in value] if m else _path(value, stage)
    return value


def replay(client, command: str):
    method, path, data, jq = parse_curl(command)
    response = client.open(path, method=method, data=data, content_type="application/json" if data else None)
    return jq_lite(json.loads(response.get_data(as_text=True)), jq)


CASES = examples(README.read_text(encoding="utf-8"))


def test_the_readme_has_examples():
    assert len(CASES) >= 10


@pytest.mark.parametrize(("command", "shown"), [(c, s) for c, s, _ in CASES], ids=[parse_curl(c)[1] for c, _, _ in CASES])
def test_readme_example_gives_the_output_shown(client, command, shown):
    assert replay(client, command) == json.loads(shown)


def main() -> int:
    from service import create_app

    client = create_app().test_client()
    text = README.read_text(encoding="utf-8")
    for command, _, (start, end) in reversed(examples(text)):
        text = text[:start] + json.dumps(replay(client, command), indent=2, ensure_ascii=False) + text[end:]
    README.write_text(text, encoding="utf-8")
    return 0


if __name__ == "__main__" and "--write" in sys.argv:
    raise SystemExit(main())
