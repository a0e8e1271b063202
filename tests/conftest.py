"""Shared fixtures: one app and one registry for the whole run (both are
read-only once built)."""
from __future__ import annotations

import pytest

from registry import load_registry
from service.http.app import create_app


@pytest.fixture(scope="session")
def app():
    return create_app()


@pytest.fixture()
def client(app):
    return app.test_client()


@pytest.fixture(scope="session")
def registry():
    return load_registry()
