"""Shared fixtures: one app and one registry for the whole run (both are
read-only once built)."""
from __future__ import annotations

import pytest
from hypothesis import settings

from registry import load_registry
from service.http.app import create_app

# Property tests draw the same examples on every run by default, so that a
# run on a fresh machine is repeatable and a red CI run can be reproduced;
# `pytest --hypothesis-profile=explore` draws fresh ones (run it after
# changing a solver; a failure it finds becomes an @example).
settings.register_profile("repeatable", derandomize=True)
settings.register_profile("explore", derandomize=False)
settings.load_profile("repeatable")


@pytest.fixture(scope="session")
def app():
    return create_app()


@pytest.fixture()
def client(app):
    return app.test_client()


@pytest.fixture(scope="session")
def registry():
    return load_registry()
