"""The application factory: create_app(config=None) and nothing else of weight."""
from __future__ import annotations

import logging
from typing import Mapping

from flask import Flask

from registry import load_registry
from service.http.config import Settings


def create_app(config: Mapping | None = None) -> Flask:
    """Build the app. `config` overrides settings (keys of Settings, e.g.
    registry_root, site_overlay, strict); without it they come from the
    environment. A bad registry or overlay raises RegistryFaults (a
    RegistryError listing every fault) here, so the service never starts on
    partial data. Where the overlay meets shipped records, each collision is
    logged as a warning, naming both records and how to resolve it."""
    from service.http import access, headers
    from service.http.blueprints import calculation_views, estimate_views, ingredient_views, meta_views, record_views, worksheet_views
    from service.http.bodies import install_indent
    from service.http.problems import register_error_handlers
    from service.http import requests_seen
    from service.http.jsonio import StrictJSONProvider
    from service.http.spec import OPERATIONS
    from service.http.blueprints import soap_views
    from service.http.blueprints import batch_views

    settings = Settings.from_env()
    if config:
        settings = Settings(**{**settings.__dict__, **dict(config)})
    registry = load_registry(settings.registry_root, settings.site_overlay)

    app = Flask(__name__)
    app.json = StrictJSONProvider(app)
    app.testing = settings.testing
    app.config["MAX_BODY_BYTES"] = settings.max_body_bytes
    app.config["STRICT"] = settings.strict
    # werkzeug's own limit backs ours up for bodies read elsewhere.
    app.config["MAX_CONTENT_LENGTH"] = settings.max_body_bytes
    app.extensions["registry"] = registry
    # The OpenAPI document is built on its first request (service.http.spec.document):
    # at start it would cost a tenth of a second and apispec's import.

    # First, so that every later hook and handler sees the request id.
    requests_seen.install(app, registry.version, OPERATIONS)
    register_error_handlers(app)
    access.install(app, settings)
    # After the token check: a caller without a token learns nothing else.
    install_indent(app)
    headers.install(app, tokens_required=bool(settings.api_tokens))
    for module in (calculation_views, worksheet_views, record_views, estimate_views, ingredient_views, meta_views):
        app.register_blueprint(module.bp)
    app.register_blueprint(soap_views.bp)
    app.register_blueprint(batch_views.bp)
    if settings.benchmark:
        from service.http.blueprints import benchmark_views

        app.register_blueprint(benchmark_views.bp)

    @app.after_request
    def _registry_header(response):
        response.headers["Registry-Version"] = registry.version
        return response

    log = logging.getLogger("service")
    for c in registry.collisions:
        log.warning("site overlay: %s: %s: %s", c.site_file, c.field, c.message)
    log.info("registry %s loaded: %d ingredients", registry.version, len(registry.ingredients),
             extra={"registry_version": registry.version, "ingredients": len(registry.ingredients)})
    return app
