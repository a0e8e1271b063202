"""The benchmark's reference endpoint, registered only with EMULSION_BENCHMARK
on (off by default) and never in the OpenAPI document.

It is the floor set by HTTP and Flask: the same app, server and hooks (request
id, log line, metrics, headers) as a calculation, reading the request body as
a real endpoint does but not parsing it, and answering a body encoded once of
the size asked for. tests/benchmarks/bench_service.py compares each
calculation's throughput with it at the same answer size."""
from __future__ import annotations

from flask import Blueprint, Response, request

bp = Blueprint("benchmark", __name__)

# Outside /v1 and the spec's paths, so that no client takes it for the API.
PATH = "/_benchmark/reference/<int:size>"
# Bodies of a few sizes are asked for in a run; each is built once. Capped so
# that the endpoint cannot be made to hold much memory.
MAX_SIZE_BYTES = 4 * 1024 * 1024
_PREFIX, _SUFFIX = b'{"reference": "', b'"}\n'
_BODIES: dict[int, bytes] = {}


def reference_body(size: int) -> bytes:
    """A JSON object of exactly `size` bytes (at least the empty one's)."""
    body = _BODIES.get(size)
    if body is None:
        padding = max(0, size - len(_PREFIX) - len(_SUFFIX))
        body = _BODIES[size] = _PREFIX + b"x" * padding + _SUFFIX
    return body


@bp.post(PATH)
def reference(size: int):
    # Read as load_body reads a calculation's body, so that the cost of
    # receiving it is counted on both sides of the ratio.
    request.get_data(cache=False)
    return Response(reference_body(min(size, MAX_SIZE_BYTES)), mimetype="application/json")
