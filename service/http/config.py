"""Settings from the environment, with defaults. Tests pass a mapping to
create_app instead.

A setting that cannot work raises SettingError, whose text is the one line
the start-up prints (service/startup.py): the variable, what it was given
and what it expects, so that a service is never half-started on it."""
from __future__ import annotations

import ipaddress
import os
import re
from dataclasses import dataclass, field
from pathlib import Path
from typing import Mapping

from registry import DEFAULT_ROOT

# Largest request body accepted: a formula of many ingredients fits in a few KB.
DEFAULT_MAX_BODY_BYTES = 64 * 1024
DEFAULT_BIND = "127.0.0.1:8000"
DEFAULT_WORKERS = 2
# gunicorn's own names; it would take any other silently as "info".
LOG_LEVELS = ("debug", "info", "warning", "error", "critical")

TRUE = {"1", "true", "yes", "on"}
FALSE = {"", "0", "false", "no", "off"}

# ASCII digits only: int() would also take "+5", "1_000" and other scripts' digits.
_WHOLE = re.compile(r"[0-9]+")
# One DNS label, as RFC 1123 allows it (letters, digits, inner hyphens).
_LABEL = re.compile(r"(?!-)[A-Za-z0-9-]{1,63}(?<!-)")


class SettingError(ValueError):
    """A setting that cannot work; str() names the variable and what it expects."""


def _flag(env: Mapping, name: str) -> bool:
    value = env.get(name, "").strip().lower()
    if value in TRUE:
        return True
    if value in FALSE:
        return False
    raise SettingError(f"{name}={env.get(name)!r}: expected one of {', '.join(sorted(TRUE | FALSE - {''}))}")


def whole_number(env: Mapping, name: str, default: int, minimum: int = 1) -> int:
    """A count from the environment: a whole number of at least `minimum`."""
    raw = env.get(name)
    if raw is None:
        return default
    value = raw.strip()
    if not _WHOLE.fullmatch(value) or int(value) < minimum:
        raise SettingError(f"{name}={raw!r}: expected a whole number of at least {minimum}")
    return int(value)


def _host(host: str) -> bool:
    if host.startswith("[") and host.endswith("]"):
        try:
            return isinstance(ipaddress.ip_address(host[1:-1]), ipaddress.IPv6Address)
        except ValueError:
            return False
    try:
        ipaddress.IPv4Address(host)
        return True
    except ValueError:
        pass
    # A name, not an address: "999.1.1.1" must not pass as one.
    labels = host.split(".")
    return len(host) <= 253 and not labels[-1].isdigit() and all(_LABEL.fullmatch(label) for label in labels)


def bind_address(env: Mapping) -> str:
    """EMULSION_BIND as gunicorn takes it: HOST:PORT (an IPv4 address, a
    [bracketed] IPv6 address or a host name; port 1-65535) or unix:PATH."""
    raw = env.get("EMULSION_BIND")
    if raw is None:
        return DEFAULT_BIND
    value = raw.strip()
    if value.startswith("unix:") and len(value) > len("unix:"):
        return value
    host, sep, port = value.rpartition(":")
    if not sep or not _host(host) or not _WHOLE.fullmatch(port) or not 1 <= int(port) <= 65535:
        raise SettingError(f"EMULSION_BIND={raw!r}: expected HOST:PORT (an IPv4 address, a [bracketed] IPv6 address "
                           "or a host name, and a port from 1 to 65535) or unix:PATH")
    return value


def port_of(bind: str) -> int | None:
    """The TCP port a checked bind address listens on (None for a unix socket)."""
    return None if bind.startswith("unix:") else int(bind.rpartition(":")[2])


def log_level(env: Mapping) -> str:
    raw = env.get("EMULSION_LOG_LEVEL")
    if raw is None:
        return "info"
    value = raw.strip().lower()
    if value not in LOG_LEVELS:
        raise SettingError(f"EMULSION_LOG_LEVEL={raw!r}: expected one of {', '.join(LOG_LEVELS)}")
    return value


@dataclass(frozen=True)
class ServerSettings:
    """gunicorn's settings that come from the environment."""

    bind: str = DEFAULT_BIND
    workers: int = DEFAULT_WORKERS
    log_level: str = "info"

    @classmethod
    def from_env(cls, env: Mapping | None = None) -> "ServerSettings":
        env = os.environ if env is None else env
        return cls(bind=bind_address(env), workers=whole_number(env, "EMULSION_WORKERS", DEFAULT_WORKERS),
                   log_level=log_level(env))


# RFC 6750's b64token: what a client can send after "Bearer " unquoted.
_B64TOKEN = re.compile(r"[A-Za-z0-9\-._~+/]+=*")
# A token shorter than this could be guessed; 32 random hex digits is the
# suggested form (README, "Access control").
MIN_TOKEN_CHARS = 16
# An exact origin as a browser sends it: scheme, host, optional port; no
# path. Browsers send it in lower case, and it is compared exactly.
_ORIGIN = re.compile(r"https?://[a-z0-9.-]+(:[0-9]{1,5})?")


def _check_token(token: str, where: str) -> str:
    # The message names where the token is, never the token: a start-up
    # error is logged, and the token must not be.
    if not _B64TOKEN.fullmatch(token):
        raise SettingError(f"{where}: a token may hold only letters, digits and -._~+/ (then = signs), no spaces")
    if len(token) < MIN_TOKEN_CHARS:
        raise SettingError(f"{where}: a token of {len(token)} characters is too short to be secret; use at least {MIN_TOKEN_CHARS}")
    return token


def _tokens(env) -> tuple[str, ...]:
    """The bearer tokens of EMULSION_API_TOKENS (comma-separated) and of the
    file EMULSION_API_TOKENS_FILE (one a line; blank lines and # comments
    skipped), both together. A variable set but holding no token is an
    error: whoever set it meant to require tokens, and the service must not
    start open instead."""
    found: list[str] = []
    listed = env.get("EMULSION_API_TOKENS", "")
    if listed.strip():
        items = [t.strip() for t in listed.split(",")]
        found += [_check_token(t, f"EMULSION_API_TOKENS item {i}") for i, t in enumerate(items, 1) if t]
        if not found:
            raise SettingError("EMULSION_API_TOKENS is set but holds no token")
    path = env.get("EMULSION_API_TOKENS_FILE", "")
    if path:
        try:
            lines = Path(path).read_text(encoding="utf-8").splitlines()
        except OSError as exc:
            raise SettingError(f"EMULSION_API_TOKENS_FILE={path!r}: cannot be read ({exc.strerror or exc})") from None
        except UnicodeDecodeError:
            raise SettingError(f"EMULSION_API_TOKENS_FILE={path!r}: not UTF-8 text") from None
        from_file = [_check_token(line.strip(), f"EMULSION_API_TOKENS_FILE={path!r} line {n}")
                     for n, line in enumerate(lines, 1) if line.strip() and not line.strip().startswith("#")]
        if not from_file:
            raise SettingError(f"EMULSION_API_TOKENS_FILE={path!r} holds no token (only blank lines or # comments)")
        found += from_file
    return tuple(dict.fromkeys(found))


def _origins(env) -> tuple[str, ...]:
    """EMULSION_CORS_ORIGINS: comma-separated exact origins, or none."""
    origins = tuple(o.strip() for o in env.get("EMULSION_CORS_ORIGINS", "").split(",") if o.strip())
    for origin in origins:
        _check_origin(origin)
    return origins


def _check_origin(origin: str) -> None:
    if not _ORIGIN.fullmatch(origin):
        raise SettingError(f"EMULSION_CORS_ORIGINS: {origin!r} is not an exact origin such as https://pharmacy.example or "
                         "http://127.0.0.1:8080 (lower case; scheme and host, optional port, no path, no trailing slash; * is not accepted)")


@dataclass(frozen=True)
class Settings:
    registry_root: str = str(DEFAULT_ROOT)
    # A folder with the pharmacy's own records or overrides, or None.
    site_overlay: str | None = None
    # Refuse unverified registry values in every calculation.
    strict: bool = False
    max_body_bytes: int = DEFAULT_MAX_BODY_BYTES
    # Flask's testing mode (exceptions propagate to the test client); tests only.
    testing: bool = False
    # Bearer tokens a caller must present; none means every caller is served
    # (the default, for one machine). Kept out of repr, so that printing or
    # logging the settings never shows a token.
    api_tokens: tuple[str, ...] = field(default=(), repr=False)
    # Origins whose browser pages may call the service (CORS); none by default.
    cors_origins: tuple[str, ...] = ()
    # The benchmark's reference endpoint (service/http/blueprints/benchmark_views.py),
    # for tests/benchmarks/bench_service.py only; off by default, never in the spec.
    benchmark: bool = False

    def __post_init__(self):
        # Settings given to create_app directly are held to the same rules.
        for i, token in enumerate(self.api_tokens, 1):
            _check_token(token, f"api_tokens item {i}")
        for origin in self.cors_origins:
            _check_origin(origin)

    @classmethod
    def from_env(cls, env: Mapping | None = None) -> "Settings":
        env = os.environ if env is None else env
        return cls(
            # Empty is unset, as for the overlay: "" would otherwise be the working directory.
            registry_root=env.get("EMULSION_REGISTRY_ROOT") or str(DEFAULT_ROOT),
            site_overlay=env.get("EMULSION_SITE_OVERLAY") or None,
            strict=_flag(env, "EMULSION_STRICT"),
            max_body_bytes=whole_number(env, "EMULSION_MAX_BODY_BYTES", DEFAULT_MAX_BODY_BYTES),
            api_tokens=_tokens(env),
            cors_origins=_origins(env),
            benchmark=_flag(env, "EMULSION_BENCHMARK"),
        )
