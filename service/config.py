"""Settings from the environment, with defaults. Tests pass a mapping to
create_app instead."""
from __future__ import annotations

import os
from dataclasses import dataclass, field

from registry import DEFAULT_ROOT

# Largest request body accepted: a formula of many ingredients fits in a few KB.
DEFAULT_MAX_BODY_BYTES = 64 * 1024


@dataclass(frozen=True)
class Settings:
    registry_root: str = str(DEFAULT_ROOT)
    max_body_bytes: int = DEFAULT_MAX_BODY_BYTES
    extra: dict = field(default_factory=dict)

    @classmethod
    def from_env(cls, env: dict | None = None) -> "Settings":
        env = os.environ if env is None else env
        return cls(
            registry_root=env.get("EMULSION_REGISTRY_ROOT", str(DEFAULT_ROOT)),
            max_body_bytes=int(env.get("EMULSION_MAX_BODY_BYTES", DEFAULT_MAX_BODY_BYTES)),
        )
