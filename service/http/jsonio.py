"""Strict JSON at the boundary.

Stock Flask lets through NaN and Infinity, turns 1e400 into inf, lets a
duplicate key silently win, and writes NaN back out. Here a duplicate key or
too deep a nesting refuses the whole body; NaN, Infinity and numbers too large
for a double are parsed into a NonFiniteNumber marker, which no schema field
accepts, so the answer names the field that held it. Output refuses
non-finite numbers."""
from __future__ import annotations

import json
import math

import orjson
from flask.json.provider import DefaultJSONProvider

from service.usecases.answers import CheckedAnswer


class StrictJSONError(ValueError):
    """The body is not JSON this service accepts; the message says why."""


class NonFiniteNumber:
    """Stands where the body held NaN, Infinity or an overflowing number."""

    __slots__ = ("text",)

    def __init__(self, text: str):
        self.text = text[:40]

    def __repr__(self) -> str:
        return f"NonFiniteNumber({self.text!r})"


def _finite_float(text: str):
    value = float(text)
    return value if math.isfinite(value) else NonFiniteNumber(text)


def _no_duplicates(pairs: list) -> dict:
    out = dict(pairs)
    # dict() in C, and the pairs walked only when one key came twice.
    if len(out) != len(pairs):
        seen = set()
        for key, _value in pairs:
            if key in seen:
                raise StrictJSONError(f"duplicate key '{key[:60]}'")
            seen.add(key)
    return out


# Built once: json.loads with hooks builds a new decoder on every call.
_DECODER = json.JSONDecoder(parse_constant=NonFiniteNumber, parse_float=_finite_float, object_pairs_hook=_no_duplicates)


def strict_loads(text: str | bytes):
    """Parse JSON strictly. Raises StrictJSONError with a reason."""
    try:
        # As json.loads reads bytes (UTF-8, -16 or -32, found from the first
        # bytes) and refuses a str that starts with a byte order mark.
        if isinstance(text, (bytes, bytearray)):
            text = text.decode(json.detect_encoding(text), "surrogatepass")
        elif text.startswith("\ufeff"):
            raise json.JSONDecodeError("Unexpected UTF-8 BOM (decode using utf-8-sig)", text, 0)
        return _DECODER.decode(text)
    except StrictJSONError:
        raise
    except RecursionError:
        raise StrictJSONError("nesting is too deep") from None
    except (ValueError, UnicodeDecodeError) as exc:
        raise StrictJSONError(f"not valid JSON: {exc}") from None


# Compact by default: a calculation's answer through orjson (encode), the
# rest (problems, registry listings, an answer orjson refuses) through json's
# C encoder, which runs only with indent=None; indented on request (the
# `indent` query parameter), for a person reading at a terminal. In json's
# compact encoder, no check for circular references: every
# answer is a tree the envelope's one pass has just built (a cycle would
# have stopped that pass), every problem a tree of fresh dicts, and the
# check's bookkeeping for each container was 40 % of encoding a worksheet.
# A cycle would still fail, on the recursion limit, not pass unnoticed.
_COMPACT = json.JSONEncoder(separators=(",", ":"), ensure_ascii=False, allow_nan=False, check_circular=False).encode
MAX_INDENT = 8
INDENT_PARAMETER = "indent"


def encode(obj, indent: int = 0) -> str | bytes:
    """`obj` as the body of an answer or a problem, newline-terminated.
    Raises ValueError on a non-finite number.

    A calculation's answer, compact, goes through orjson: about ten times
    json's C encoder on a worksheet (128 to 11 us). orjson writes NaN and
    Infinity as null rather than refusing them, so it is given only a
    CheckedAnswer, whose numbers the envelope has checked. What orjson
    refuses and json writes (an integer beyond 64 bits echoed from a
    request, a lone surrogate) falls back to json, which answers as before.
    The two write the same values; only a float's spelling may differ
    (orjson's 0.00001 and 2.5e-7 for json's 1e-05 and 2.5e-07)."""
    if not indent:
        if type(obj) is CheckedAnswer:
            try:
                return orjson.dumps(obj) + b"\n"
            except orjson.JSONEncodeError:
                pass
        return _COMPACT(obj) + "\n"
    return json.dumps(obj, indent=indent, ensure_ascii=False, allow_nan=False) + "\n"


class StrictJSONProvider(DefaultJSONProvider):
    sort_keys = False
    ensure_ascii = False

    def loads(self, s, **kwargs):
        return strict_loads(s)

    def dumps(self, obj, **kwargs):
        kwargs.setdefault("allow_nan", False)
        return super().dumps(obj, **kwargs)
