"""The application factory itself: settings from a test config, and one route
answering (after the pattern of Flask's tutorial test_factory)."""
from __future__ import annotations

from service.http.app import create_app


def test_config():
    assert not create_app().testing
    assert create_app({"testing": True}).testing


def test_test_config_overrides_settings():
    app = create_app({"testing": True, "strict": True, "max_body_bytes": 1024})
    assert app.config["STRICT"] is True
    assert app.config["MAX_BODY_BYTES"] == 1024


def test_healthz_answers():
    client = create_app({"testing": True}).test_client()
    response = client.get("/healthz")
    assert response.status_code == 200
    assert response.get_json()["status"] == "ok"
    assert response.headers["Registry-Version"]
