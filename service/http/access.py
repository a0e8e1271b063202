"""Who may call the service: a bearer token on every operation when the
deployment configures tokens (none by default), and the browser origins that
may call it across origins (CORS, none by default)."""
from __future__ import annotations

import hashlib
import hmac
import logging

from flask import Flask, Response, request

from service.http.config import Settings
from service.http.problems import ApiProblem

log = logging.getLogger("service")

# Probes carry no token: an orchestrator's liveness and readiness checks must
# pass whatever the deployment's tokens are.
OPEN_PATHS = frozenset({"/healthz", "/readyz"})
# The contract is public: a client reads it to learn how to authenticate, and
# it holds nothing of a pharmacy's.
DOC_PATHS = frozenset({"/docs", "/openapi.json"})
UNAUTHENTICATED_PATHS = OPEN_PATHS | DOC_PATHS

TYPE_UNAUTHORIZED = "/docs#problem-unauthorized"
# RFC 6750 section 3: the challenge names the scheme and a realm; a token that
# was sent and refused adds error="invalid_token".
CHALLENGE = 'Bearer realm="emulsion"'

# What a browser page may send across origins: the bearer token, a JSON body,
# and a request id to trace it by.
CORS_ALLOW_HEADERS = "Authorization, Content-Type, X-Request-ID"
# What its script may read of an answer besides the safelisted headers.
CORS_EXPOSE_HEADERS = "Registry-Version, X-Request-ID, WWW-Authenticate"
# A browser may reuse a preflight for ten minutes, so a change to the allowed
# origins reaches every page within that time (Chromium caps this at 2 h).
CORS_MAX_AGE_S = 600


def _digest(token: str) -> bytes:
    # Digests of equal length: compare_digest then takes the same time
    # whatever the length of what was sent.
    return hashlib.sha256(token.encode("utf-8", "surrogatepass")).digest()


class BearerTokens:
    """The configured tokens, held as SHA-256 digests."""

    def __init__(self, tokens):
        self._digests = tuple(_digest(t) for t in tokens)

    def __bool__(self) -> bool:
        return bool(self._digests)

    def __len__(self) -> int:
        return len(self._digests)

    def accepts(self, presented: str) -> bool:
        """True when `presented` is one of the tokens. Every token is compared,
        in constant time and with no early exit, so that the time taken says
        neither which token nor how much of one matched."""
        candidate = _digest(presented)
        matched = False
        for digest in self._digests:
            matched |= hmac.compare_digest(candidate, digest)
        return matched


def presented_token(authorization: str | None) -> str | None:
    """The token of an `Authorization: Bearer <token>` header, or None. The
    scheme is case-insensitive (RFC 9110 section 11.1)."""
    scheme, _, token = (authorization or "").strip().partition(" ")
    if scheme.lower() != "bearer" or not token.strip():
        return None
    return token.strip()


def _refuse(detail: str, challenge: str) -> ApiProblem:
    return ApiProblem(401, "Unauthorized", detail, type_=TYPE_UNAUTHORIZED, headers={"WWW-Authenticate": challenge})


def install(app: Flask, settings: Settings) -> None:
    """The token check and CORS on `app`, as the settings ask."""
    tokens = BearerTokens(settings.api_tokens)
    origins = frozenset(settings.cors_origins)

    @app.before_request
    def _preflight_then_token():
        if request.method == "OPTIONS":
            # A preflight never carries the token (the Fetch standard leaves
            # credentials out of it), so it is answered before the check.
            if origins and request.headers.get("Origin") in origins and "Access-Control-Request-Method" in request.headers \
                    and request.url_rule is not None:
                response = Response(status=204)
                response.headers["Access-Control-Allow-Methods"] = ", ".join(sorted(request.url_rule.methods - {"OPTIONS"}))
                response.headers["Access-Control-Allow-Headers"] = CORS_ALLOW_HEADERS
                response.headers["Access-Control-Max-Age"] = str(CORS_MAX_AGE_S)
                return response
            return None
        if not tokens or request.path in UNAUTHENTICATED_PATHS:
            return None
        # Nothing here logs or echoes the token, accepted or not.
        token = presented_token(request.headers.get("Authorization"))
        if token is None:
            raise _refuse("this service requires a bearer token: send the header Authorization: Bearer <token>", CHALLENGE)
        if not tokens.accepts(token):
            raise _refuse("the bearer token sent is not one this service accepts", CHALLENGE + ', error="invalid_token"')
        return None

    @app.after_request
    def _cors(response: Response) -> Response:
        if origins:
            # The answer differs by Origin, so a cache must key on it, for
            # allowed and refused origins alike.
            response.vary.add("Origin")
            origin = request.headers.get("Origin")
            if origin in origins:
                response.headers["Access-Control-Allow-Origin"] = origin
                response.headers["Access-Control-Expose-Headers"] = CORS_EXPOSE_HEADERS
        return response

    if tokens:
        log.info("access: a bearer token is required on every path but %s (%d token(s) configured)",
                 ", ".join(sorted(UNAUTHENTICATED_PATHS)), len(tokens))
    else:
        log.info("access: no bearer token required (EMULSION_API_TOKENS_FILE and EMULSION_API_TOKENS unset)")
    if origins:
        log.info("access: CORS allowed for %s", ", ".join(sorted(origins)))
