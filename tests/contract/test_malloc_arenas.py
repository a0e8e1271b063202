"""The gunicorn master caps glibc's malloc arenas (service/malloc_arenas.py);
what it saves is measured by tests/benchmarks/bench_service.py, not here."""
import platform
from pathlib import Path

import pytest

from service.malloc_arenas import cap_malloc_arenas


@pytest.mark.skipif(platform.libc_ver()[0] != "glibc", reason="the cap is glibc's")
def test_the_cap_is_set_on_glibc():
    assert cap_malloc_arenas(environ={}) is True


def test_the_environment_wins():
    # glibc has read MALLOC_ARENA_MAX itself at start: it is left alone.
    assert cap_malloc_arenas(environ={"MALLOC_ARENA_MAX": "4"}) is False


def test_the_configuration_sets_it_before_the_app_is_loaded():
    conf = (Path(__file__).parents[2] / "service" / "gunicorn_conf.py").read_text()
    assert conf.index("cap_malloc_arenas()") < conf.index("from service.http.config import")
