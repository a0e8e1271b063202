"""Headers on every answer: no content sniffing, no referrer, a content
security policy, and a Cache-Control suited to what the answer is."""
from __future__ import annotations

from flask import Flask, Response, request

from service.http.access import DOC_PATHS
from service.http.problems import PROBLEM_TYPE

# The contract and the registry change only when the service restarts on a
# new release, and every answer names its Registry-Version; five minutes of
# reuse spares clients refetching them and bounds how long an old copy lives.
REFERENCE_MAX_AGE_S = 300
# A JSON answer loads nothing and may not be framed; the docs page needs its
# own inline style and nothing else.
CSP_ANSWER = "default-src 'none'; frame-ancestors 'none'"
CSP_DOCS = "default-src 'none'; style-src 'unsafe-inline'; frame-ancestors 'none'"


def cache_control(response: Response, *, tokens_required: bool) -> str:
    """The Cache-Control of an answer to the current request."""
    if response.mimetype == PROBLEM_TYPE or response.status_code >= 400:
        # A refusal holds the request's own faults (or says a token is
        # missing): it must never be served again from a cache.
        return "no-store"
    if request.method in ("GET", "HEAD"):
        if request.path in DOC_PATHS:
            return f"public, max-age={REFERENCE_MAX_AGE_S}"
        if request.path.startswith("/v1/"):
            # The registry's reads. When tokens are required, "public" would
            # let a shared cache answer callers who sent no token (RFC 9111
            # section 3.5); "private" keeps reuse to the caller's own cache.
            scope = "private" if tokens_required else "public"
            return f"{scope}, max-age={REFERENCE_MAX_AGE_S}"
    # Calculations and worksheets hold a pharmacy's formula and are answered
    # fresh each time; probes must report the service as it is now.
    return "no-store"


def install(app: Flask, *, tokens_required: bool) -> None:
    @app.after_request
    def _security_headers(response: Response) -> Response:
        response.headers["X-Content-Type-Options"] = "nosniff"
        response.headers["Referrer-Policy"] = "no-referrer"
        response.headers["Content-Security-Policy"] = CSP_DOCS if request.path == "/docs" else CSP_ANSWER
        response.headers.setdefault("Cache-Control", cache_control(response, tokens_required=tokens_required))
        return response
