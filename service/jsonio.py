"""Strict JSON at the boundary.

Stock Flask lets through NaN and Infinity, turns 1e400 into inf, lets a
duplicate key silently win, and writes NaN back out. Here each of these is
refused on input, and output refuses non-finite numbers."""
from __future__ import annotations

import json
import math

from flask.json.provider import DefaultJSONProvider


class StrictJSONError(ValueError):
    """The body is not JSON this service accepts; the message says why."""


def _refuse_constant(name: str):
    raise StrictJSONError(f"{name} is not a JSON number")


def _finite_float(text: str) -> float:
    value = float(text)
    if not math.isfinite(value):
        raise StrictJSONError(f"number {text[:40]} is out of range for a double")
    return value


def _no_duplicates(pairs: list) -> dict:
    out = {}
    for key, value in pairs:
        if key in out:
            raise StrictJSONError(f"duplicate key '{key[:60]}'")
        out[key] = value
    return out


def strict_loads(text: str | bytes):
    """Parse JSON strictly. Raises StrictJSONError with a reason."""
    try:
        return json.loads(text, parse_constant=_refuse_constant, parse_float=_finite_float, object_pairs_hook=_no_duplicates)
    except StrictJSONError:
        raise
    except RecursionError:
        raise StrictJSONError("nesting is too deep") from None
    except (ValueError, UnicodeDecodeError) as exc:
        raise StrictJSONError(f"not valid JSON: {exc}") from None


class StrictJSONProvider(DefaultJSONProvider):
    sort_keys = False
    ensure_ascii = False

    def loads(self, s, **kwargs):
        return strict_loads(s)

    def dumps(self, obj, **kwargs):
        kwargs.setdefault("allow_nan", False)
        return super().dumps(obj, **kwargs)
