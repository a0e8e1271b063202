"""Settings from the environment, with defaults. Tests pass a mapping to
create_app instead.

A setting that cannot work raises SettingError, whose text is the one line
the start-up prints (service/startup.py): the variable, what it was given
and what it expects, so that a service is never half-started on it."""
from __future__ import annotations

import ipaddress
import os
import re
from dataclasses import dataclass
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

    @classmethod
    def from_env(cls, env: Mapping | None = None) -> "Settings":
        env = os.environ if env is None else env
        return cls(
            # Empty is unset, as for the overlay: "" would otherwise be the working directory.
            registry_root=env.get("EMULSION_REGISTRY_ROOT") or str(DEFAULT_ROOT),
            site_overlay=env.get("EMULSION_SITE_OVERLAY") or None,
            strict=_flag(env, "EMULSION_STRICT"),
            max_body_bytes=whole_number(env, "EMULSION_MAX_BODY_BYTES", DEFAULT_MAX_BODY_BYTES),
        )
