"""Prometheus metrics: requests and their latency by operation and status,
and the registry version served, in the text exposition format at /metrics.

Under gunicorn each worker is a process of its own, so the counts live in
prometheus_client's multiprocess mode: service/gunicorn_conf.py sets
PROMETHEUS_MULTIPROC_DIR before this module is imported, every process
writes its values to files there, and /metrics adds up every process's.
Without the variable (tests, one process) the values are this process's."""
from __future__ import annotations

import os

from prometheus_client import CONTENT_TYPE_LATEST, CollectorRegistry, Counter, Gauge, Histogram, generate_latest, multiprocess

# The metrics' own registry, not prometheus_client's default one: that one
# also holds process collectors which multiprocess mode cannot add up.
REGISTRY = CollectorRegistry(auto_describe=True)

# operation is the operationId, or the route for a path outside the spec
# (/docs, /metrics), or UNMATCHED: never the raw path, so that a scan of
# made-up paths cannot grow the series without bound.
UNMATCHED = "unmatched"
REQUESTS = Counter("emulsion_http_requests", "Requests answered, by operation and status.", ["operation", "status"], registry=REGISTRY)
# Buckets in seconds, from well under a small calculation (about 1 ms in
# process) to past a large worksheet.
LATENCY_SECONDS = Histogram("emulsion_http_request_duration_seconds", "Time to answer a request, by operation and status.",
                            ["operation", "status"], buckets=(0.001, 0.0025, 0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 0.5, 1.0, 2.5),
                            registry=REGISTRY)
# An info metric as a gauge: prometheus_client's Info cannot be added up
# across processes. The master loads the registry (preload_app), so "max"
# keeps its value after workers come and go.
REGISTRY_INFO = Gauge("emulsion_registry_info", "The ingredient registry served: 1, with its version as a label.", ["version"],
                      registry=REGISTRY, multiprocess_mode="max")


def set_registry_version(version: str) -> None:
    # One process builds apps on several registries only in tests; under
    # gunicorn there is one, and prometheus_client cannot clear there.
    if not os.environ.get("PROMETHEUS_MULTIPROC_DIR"):
        REGISTRY_INFO.clear()
    REGISTRY_INFO.labels(version=version).set(1)


def observe(operation: str, status: int, latency_s: float) -> None:
    REQUESTS.labels(operation=operation, status=str(status)).inc()
    LATENCY_SECONDS.labels(operation=operation, status=str(status)).observe(latency_s)


def exposition() -> tuple[bytes, str]:
    """(body, content type) of /metrics: every process's values under
    gunicorn, this process's otherwise."""
    if os.environ.get("PROMETHEUS_MULTIPROC_DIR"):
        registry = CollectorRegistry()
        multiprocess.MultiProcessCollector(registry)
        return generate_latest(registry), CONTENT_TYPE_LATEST
    return generate_latest(REGISTRY), CONTENT_TYPE_LATEST
