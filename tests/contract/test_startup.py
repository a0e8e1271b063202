"""Start-up refuses what cannot work: each setting that cannot work, and a
registry root or overlay that cannot be read, stops gunicorn with one line
on stderr and a non-zero exit, no traceback. Common practice, no source
(the twelve-factor "fail fast on bad config")."""
from __future__ import annotations

import os
import subprocess
import sys
import tempfile
from pathlib import Path

import pytest

from service.http.config import ServerSettings, SettingError, Settings, bind_address, port_of, whole_number
from tests.contract.test_gunicorn import free_port

ROOT = Path(__file__).resolve().parents[2]
PREFIX = "emulsion-service: cannot start: "


@pytest.mark.parametrize("value", ["0", "-1", "1.5", "two", "", " ", "+2", "1_0", "٣", "1e3"])
@pytest.mark.parametrize("name", ["EMULSION_WORKERS", "EMULSION_MAX_BODY_BYTES"])
def test_a_count_must_be_a_whole_number_of_at_least_one(name, value):
    with pytest.raises(SettingError) as err:
        whole_number({name: value}, name, 2)
    assert str(err.value) == f"{name}={value!r}: expected a whole number of at least 1"


def test_counts_that_work():
    assert whole_number({}, "EMULSION_WORKERS", 2) == 2
    assert whole_number({"EMULSION_WORKERS": " 4 "}, "EMULSION_WORKERS", 2) == 4
    assert Settings.from_env({"EMULSION_MAX_BODY_BYTES": "1024"}).max_body_bytes == 1024
    assert ServerSettings.from_env({"EMULSION_WORKERS": "3"}).workers == 3


@pytest.mark.parametrize("value", ["maybe", "2", "enabled", "tru"])
def test_a_bad_strict_flag(value):
    with pytest.raises(SettingError, match=r"^EMULSION_STRICT=.*: expected one of 0, 1, false, no, off, on, true, yes$"):
        Settings.from_env({"EMULSION_STRICT": value})


@pytest.mark.parametrize("value", ["8000", "localhost", ":8000", "127.0.0.1:", "127.0.0.1:0", "127.0.0.1:65536",
                                   "127.0.0.1:80a", "999.1.1.1:8000", "::1:8000", "[::1", "[127.0.0.1]:8000",
                                   "-bad-.example:8000", "a b:8000", "unix:", "http://127.0.0.1:8000"])
def test_a_malformed_bind_address(value):
    with pytest.raises(SettingError, match=r"^EMULSION_BIND=.*: expected HOST:PORT"):
        bind_address({"EMULSION_BIND": value})


@pytest.mark.parametrize("value, port", [("127.0.0.1:8000", 8000), ("0.0.0.0:1", 1), ("[::]:8080", 8080),
                                         ("[::1]:65535", 65535), ("emulsion.internal:9000", 9000),
                                         ("localhost:8000", 8000), ("unix:/run/emulsion.sock", None)])
def test_bind_addresses_that_work(value, port):
    assert port_of(bind_address({"EMULSION_BIND": value})) == port


def test_a_bad_log_level():
    with pytest.raises(SettingError, match=r"^EMULSION_LOG_LEVEL='loud': expected one of debug, info, warning, error, critical$"):
        ServerSettings.from_env({"EMULSION_LOG_LEVEL": "loud"})


def start(env: dict, timeout: float = 60) -> tuple[int, str]:
    """Start gunicorn as the README does; its exit status and everything it printed.
    The log goes to a file, not a pipe (a pipe nobody reads can block the server).
    A server that did start is stopped by its PID, and reported as a start."""
    env = {**os.environ, "EMULSION_BIND": f"127.0.0.1:{free_port()}", "EMULSION_WORKERS": "1", **env}
    with tempfile.TemporaryFile() as log:
        proc = subprocess.Popen([sys.executable, "-m", "gunicorn", "-c", "service/gunicorn_conf.py", "service.wsgi:app"],
                                cwd=ROOT, env=env, stdout=log, stderr=subprocess.STDOUT)
        try:
            code = proc.wait(timeout=timeout)
        except subprocess.TimeoutExpired:
            proc.kill()
            proc.wait(timeout=30)
            code = None
        log.seek(0)
        output = log.read().decode(errors="replace")
    assert code is not None, f"gunicorn started (or hung) instead of refusing: {output}"
    return code, output


def assert_one_line(code: int, output: str, expected: str) -> None:
    assert code != 0
    assert "Traceback" not in output
    assert output.strip().splitlines() == [PREFIX + expected], output


@pytest.mark.parametrize("name, value, expects", [
    ("EMULSION_WORKERS", "0", "expected a whole number of at least 1"),
    ("EMULSION_WORKERS", "-2", "expected a whole number of at least 1"),
    ("EMULSION_WORKERS", "two", "expected a whole number of at least 1"),
    ("EMULSION_MAX_BODY_BYTES", "0", "expected a whole number of at least 1"),
    ("EMULSION_MAX_BODY_BYTES", "-5", "expected a whole number of at least 1"),
    ("EMULSION_MAX_BODY_BYTES", "64k", "expected a whole number of at least 1"),
    ("EMULSION_STRICT", "maybe", "expected one of 0, 1, false, no, off, on, true, yes"),
    ("EMULSION_BIND", "127.0.0.1", "expected HOST:PORT (an IPv4 address, a [bracketed] IPv6 address or a host name, "
                                   "and a port from 1 to 65535) or unix:PATH"),
    ("EMULSION_LOG_LEVEL", "loud", "expected one of debug, info, warning, error, critical"),
])
def test_gunicorn_refuses_a_setting_that_cannot_work(name, value, expects):
    assert_one_line(*start({name: value}), f"{name}={value!r}: {expects}")


def test_gunicorn_refuses_a_missing_site_overlay(tmp_path):
    site = tmp_path / "nowhere"
    assert_one_line(*start({"EMULSION_SITE_OVERLAY": str(site)}),
                    f"the registry was not accepted: {site}: (folder): the site overlay is missing (or is a symbolic link to nothing)")


def test_gunicorn_refuses_a_registry_root_that_is_a_file(tmp_path):
    root = tmp_path / "data"
    root.write_text("")
    assert_one_line(*start({"EMULSION_REGISTRY_ROOT": str(root)}),
                    f"the registry was not accepted: {root}: (folder): the registry root is a regular file, not a folder")


def test_gunicorn_refuses_a_named_pipe_in_the_overlay_without_hanging(tmp_path):
    # Before the loader checked the kind of file, this start waited for ever
    # on the pipe: the timeout makes a regression fail, not hang the suite.
    (tmp_path / "site" / "ingredients").mkdir(parents=True)
    os.mkfifo(tmp_path / "site" / "ingredients" / "x.toml")
    assert_one_line(*start({"EMULSION_SITE_OVERLAY": str(tmp_path / "site")}, timeout=60),
                    "the registry was not accepted: site/ingredients/x.toml: (file): is a named pipe (FIFO), "
                    "not a regular file (it was not opened)")
