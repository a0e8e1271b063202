"""gunicorn's access line costs nothing (service/gunicorn_logger.py). That the
service's own line is still written and gunicorn's is not, over real HTTP, is
tests/contract/test_gunicorn_observability.py's; the time saved is measured
by tests/benchmarks/bench_service.py, not here."""
from __future__ import annotations

from gunicorn import glogging
from gunicorn.config import Config

from service.gunicorn_logger import QuietAccessLogger
from service.http.logs import logconfig


def _cfg() -> Config:
    cfg = Config()
    cfg.set("logconfig_dict", logconfig("info"))
    return cfg


def test_with_the_services_log_configuration_gunicorn_would_build_every_access_line():
    # Why the class exists: the stock logger counts the access log as on.
    assert glogging.Logger(_cfg()).access_log_enabled is True


def test_the_quiet_logger_builds_no_access_line(monkeypatch):
    logger = QuietAccessLogger(_cfg())
    assert logger.access_log_enabled is False

    def atoms(*args, **kwargs):
        raise AssertionError("an access line was built")

    monkeypatch.setattr(logger, "atoms", atoms)
    assert logger.access(None, None, {}, None) is None


def test_the_configuration_uses_it():
    # Read as text: the settings file has side effects at import (the metrics folder).
    from pathlib import Path

    text = (Path(__file__).parents[2] / "service" / "gunicorn_conf.py").read_text()
    assert "\nlogger_class = QuietAccessLogger\n" in text
