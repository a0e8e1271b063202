"""Settings from the environment, with defaults. Tests pass a mapping to
create_app instead."""
from __future__ import annotations

import os
from dataclasses import dataclass

from registry import DEFAULT_ROOT

# Largest request body accepted: a formula of many ingredients fits in a few KB.
DEFAULT_MAX_BODY_BYTES = 64 * 1024


TRUE = {"1", "true", "yes", "on"}
FALSE = {"", "0", "false", "no", "off"}


def _flag(env, name: str) -> bool:
    value = env.get(name, "").strip().lower()
    if value in TRUE:
        return True
    if value in FALSE:
        return False
    raise ValueError(f"{name}={value!r}: expected one of {sorted(TRUE | FALSE - {''})}")


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
    def from_env(cls, env: dict | None = None) -> "Settings":
        env = os.environ if env is None else env
        return cls(
            registry_root=env.get("EMULSION_REGISTRY_ROOT", str(DEFAULT_ROOT)),
            site_overlay=env.get("EMULSION_SITE_OVERLAY") or None,
            strict=_flag(env, "EMULSION_STRICT"),
            max_body_bytes=int(env.get("EMULSION_MAX_BODY_BYTES", DEFAULT_MAX_BODY_BYTES)),
        )
