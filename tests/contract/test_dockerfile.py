"""The container's rules, held without a Docker engine (none runs where the
suite does): the Dockerfile is parsed and its instructions checked. Common
practice, no source: Docker's "Best practices for writing Dockerfiles"
(dependencies before code for the layer cache, pinned base images,
.dockerignore), and gunicorn's graceful stop within the stop timeout."""
from __future__ import annotations

import os
import re
import subprocess
import sys
from pathlib import Path

import pytest

from service.healthcheck import connection, healthy
from tests.contract.test_gunicorn import free_port, server  # noqa: F401  (a fixture)

ROOT = Path(__file__).resolve().parents[2]


def instructions() -> list[tuple[str, str]]:
    """(INSTRUCTION, arguments) in order, continuations joined, comments dropped."""
    out, pending = [], ""
    for line in (ROOT / "Dockerfile").read_text().splitlines():
        if not pending and (not line.strip() or line.lstrip().startswith("#")):
            continue
        pending += line.rstrip()
        if pending.endswith("\\"):
            pending = pending[:-1] + " "
            continue
        word, _, args = pending.strip().partition(" ")
        out.append((word.upper(), " ".join(args.split())))
        pending = ""
    assert not pending, "the Dockerfile ends inside a continued line"
    return out


def of(kind: str) -> list[str]:
    return [args for word, args in instructions() if word == kind]


def test_the_base_image_is_an_exact_release():
    (base,) = of("FROM")
    # A floating tag (3.11-slim) changes under the same name; an exact one,
    # or a digest, rebuilds the image tested.
    assert re.fullmatch(r"python:3\.11\.\d+-slim-bookworm(@sha256:[0-9a-f]{64})?", base), base


def test_dependencies_are_installed_before_the_code_is_copied():
    steps = [(word, args) for word, args in instructions() if word in ("COPY", "RUN")]
    copies = [i for i, (word, _) in enumerate(steps) if word == "COPY"]
    first_copy = steps[copies[0]][1]
    assert first_copy.split() == ["pyproject.toml", "./"], "the first COPY must bring only the pinned dependency list"
    installs = [i for i, (word, args) in enumerate(steps) if word == "RUN" and "pip install" in args]
    dependency_install, code_install = installs[0], installs[-1]
    assert copies[0] < dependency_install < copies[1], "the dependencies install between pyproject.toml and the code"
    assert "-r " in steps[dependency_install][1] and "'dependencies'" in steps[dependency_install][1]
    code_copies = [i for i in copies if any(part in steps[i][1] for part in ("service", "registry"))]
    assert code_copies and min(code_copies) > dependency_install
    assert max(code_copies) < code_install and "--no-deps" in steps[code_install][1].split()


def test_the_dependency_layer_installs_exactly_the_pinned_list():
    # The Dockerfile's own one-liner, run here: it must print every pinned
    # dependency, one a line, as pip -r reads them.
    (command,) = [args for word, args in instructions() if word == "RUN" and "tomllib" in args]
    code = re.search(r'python -c "(.*?)"', command).group(1)
    printed = subprocess.run([sys.executable, "-c", code], cwd=ROOT, capture_output=True, text=True, check=True).stdout.split()
    assert printed and all(re.fullmatch(r"[A-Za-z0-9_.\-]+==[0-9][0-9A-Za-z.]*", line) for line in printed), printed
    assert "gunicorn==" in " ".join(printed) and "flask==" in " ".join(printed)


def test_the_health_check_has_a_start_period_and_follows_the_configured_port():
    (check,) = of("HEALTHCHECK")
    start_period = re.search(r"--start-period=(\d+)s", check)
    assert start_period and int(start_period.group(1)) >= 10, check
    assert re.search(r'CMD \["python", "-m", "service\.healthcheck"\]', check), check
    (env,) = of("ENV")
    port = re.search(r"EMULSION_BIND=[^\s:]+:(\d+)", env).group(1)
    assert of("EXPOSE") == [port]


@pytest.mark.parametrize("bind, host, port", [("0.0.0.0:8000", "127.0.0.1", 8000), ("[::]:9000", "127.0.0.1", 9000),
                                              ("[::1]:8080", "::1", 8080), ("10.0.0.5:18080", "10.0.0.5", 18080)])
def test_the_health_check_asks_the_configured_address(bind, host, port):
    conn = connection(bind, 1)
    assert (conn.host, conn.port) == (host, port)


def test_the_health_check_against_a_real_server(server):  # noqa: F811
    env = {**os.environ, "EMULSION_BIND": f"0.0.0.0:{server}", "PYTHONPATH": str(ROOT)}
    done = subprocess.run([sys.executable, "-m", "service.healthcheck"], cwd=ROOT, env=env, timeout=30)
    assert done.returncode == 0
    assert not healthy(f"127.0.0.1:{free_port()}", timeout_s=1)


def test_the_graceful_stop_ends_within_the_stop_timeout():
    conf = (ROOT / "service" / "gunicorn_conf.py").read_text()
    graceful_s = int(re.search(r"^graceful_timeout = (\d+)$", conf, re.M).group(1))
    assert of("STOPSIGNAL") == ["SIGTERM"]
    assert of("CMD") and "exec gunicorn -c service/gunicorn_conf.py" in of("CMD")[-1]
    # Every stop timeout the Dockerfile and the README tell the operator to use
    # leaves the graceful stop time to finish.
    texts = (ROOT / "Dockerfile").read_text() + (ROOT / "README.md").read_text()
    advised = [int(n) for n in re.findall(r"(?:--stop-timeout|docker stop -t) (\d+)", texts)]
    assert advised and all(n > graceful_s for n in advised), advised


@pytest.mark.parametrize("entry", [".git", ".venv", "**/__pycache__", ".pytest_cache", ".hypothesis", ".schemathesis",
                                   "*.egg-info", "tests"])
def test_dockerignore_keeps_local_state_out_of_the_image(entry):
    lines = [line.strip() for line in (ROOT / ".dockerignore").read_text().splitlines()]
    assert entry in lines


def test_what_the_image_needs_is_not_ignored():
    ignored = {line.strip() for line in (ROOT / ".dockerignore").read_text().splitlines() if line.strip() and not line.startswith("#")}
    copied = {part.rstrip("/") for args in of("COPY") for part in args.split()[:-1]}
    assert copied and not copied & ignored, copied & ignored
