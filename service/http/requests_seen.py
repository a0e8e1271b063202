"""Each request's id, its log line and its metrics: the hooks create_app
installs before any other, so that every later line of the request, an
error's included, carries the id."""
from __future__ import annotations

import logging
import time

from flask import Flask, g, request

from service.http import metrics
from service.http.logs import REQUEST_ID_HEADER, request_id_from

log = logging.getLogger("service.requests")


def operation_ids(operations) -> dict[tuple[str, str], str]:
    """{(Flask route, method): operationId} for every operation of the spec's
    table (service.http.spec.OPERATIONS: path, method, operationId, ...)."""
    return {(path.replace("{", "<").replace("}", ">"), method.upper()): op_id for path, method, op_id, *_ in operations}


def install(app: Flask, registry_version: str, operations) -> None:
    operations = operation_ids(operations)
    metrics.set_registry_version(registry_version)

    @app.before_request
    def _start():
        g.request_id = request_id_from(request.headers.get(REQUEST_ID_HEADER))
        g.started_s = time.perf_counter()

    @app.after_request
    def _finish(response):
        # A request refused before _start ran (none today) still gets an id.
        request_id = g.get("request_id") or request_id_from(None)
        response.headers[REQUEST_ID_HEADER] = request_id
        latency_s = time.perf_counter() - g.get("started_s", time.perf_counter())
        rule = request.url_rule.rule if request.url_rule is not None else None
        operation_id = operations.get((rule, request.method)) if rule else None
        metrics.observe(operation_id or rule or metrics.UNMATCHED, response.status_code, latency_s)
        # The path only: never the query string, the body or a header.
        log.info("%s %s %d", request.method, request.path, response.status_code, extra={
            "request_id": request_id, "method": request.method, "path": request.path, "status": response.status_code,
            "latency_ms": round(latency_s * 1000, 3), "registry_version": registry_version, "operation_id": operation_id})
        return response
