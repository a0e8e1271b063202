"""The envelope every calculation answer shares.

Warnings of an answer: the core's findings, and what the provenance of the
values used calls for. Provenance warnings are grouped, one per kind, naming
each value they concern."""
from __future__ import annotations

import math
from typing import Iterable

from registry import Registry
from service.core.errors import CalculationError
from service.core.findings import Finding
from service.usecases.methods import CAUTIONS, Method
from service.usecases.provenance import ValueUsed, source_block


def registry_version(registry: Registry) -> dict:
    return {"release": registry.release, "digest": registry.digest, "site_overlay_digest": registry.overlay_digest,
            "version": registry.version}


def method_block(method: Method, registry: Registry) -> dict:
    sources = [registry.sources[sid] for sid in method.source_ids]
    return {
        "name": method.name,
        "formula": method.formula,
        "sources": [source_block(s) for s in sources],
        "assumptions": list(method.assumptions),
    }


class CheckedAnswer(dict):
    """An answer as the envelope returns it. Its numbers are all finite: the
    result, inputs and values used passed _final, and the rest (method,
    warnings, cautions, registry version) holds strings and booleans only.
    The HTTP layer may therefore write it with an encoder that does not
    check for NaN and Infinity itself (service/http/jsonio.py)."""

    __slots__ = ()


class _NonFinite(Exception):
    """A non-finite number met by _final."""


def _final(value):
    """`value` with its floats tidied (see tidy), in one pass that also
    refuses a non-finite number (raising _NonFinite; _where then finds it,
    only on that rare path, so the pass carries no path). Tuples are checked
    but left as they are, as tidy leaves them."""
    kind = type(value)
    if kind is float:
        if value - value != 0.0:  # inf - inf and nan - nan are nan; a finite float gives 0.0
            raise _NonFinite
        return value if value.is_integer() and -1e10 < value < 1e10 else float(f"{value:.10g}")
    if kind is dict:
        # Leaves are done here, without a call: most members of an answer
        # are strings, booleans, ints, None or floats (as above).
        out = {}
        for k, v in value.items():
            t = type(v)
            if t is str or v is None or t is bool or t is int:
                out[k] = v
            elif t is float:
                if v - v != 0.0:
                    raise _NonFinite
                # A whole number below 1e10 has at most 10 digits already:
                # half an answer's floats are such, and formatting is dear.
                out[k] = v if v.is_integer() and -1e10 < v < 1e10 else float(f"{v:.10g}")
            else:
                out[k] = _final(v)
        return out
    if kind is list:
        return [_final(v) for v in value]
    if kind is str or kind is int or kind is bool or value is None:
        return value
    if kind is tuple:
        for v in value:
            _final(v)
        return value
    # Subclasses (a numpy float, an OrderedDict) take the slower road.
    if isinstance(value, float):
        return _final(float(value))
    if isinstance(value, dict):
        return _final(dict(value))
    if isinstance(value, list):
        return _final(list(value))
    return value


def _where(value, path=()):
    """The path of the first non-finite number in `value`, or None."""
    if isinstance(value, float) and not math.isfinite(value):
        return path
    if isinstance(value, dict):
        items = value.items()
    elif isinstance(value, (list, tuple)):
        items = enumerate(value)
    else:
        return None
    for key, item in items:
        found = _where(item, path + (key,))
        if found is not None:
            return found
    return None


def _warning(w: dict) -> dict:
    # Members in the published order, whichever order the builder used.
    return {"code": w["code"], "message": w["message"], "subject": w["subject"]}


def envelope(result: dict, inputs: dict, method: Method, values_used: Iterable[ValueUsed], warnings: list[dict], registry: Registry,
             strict: bool = False, extra_cautions: tuple[str, ...] = ()) -> CheckedAnswer:
    """The whole answer. A result that overflowed (extreme but valid inputs)
    is refused rather than written out as a wrong number."""
    try:
        final = _final({"result": result, "inputs": inputs, "values_used": [v.as_dict() for v in values_used]})
    except _NonFinite:
        # The inputs passed the strict parse and the values used the
        # registry's checks: the result is where an overflow shows.
        where = _where({"result": result, "inputs": inputs})
        raise CalculationError((), "finite_result", f"the inputs give a result out of range ({'/'.join(map(str, where or ('result',)))}); "
                                                    "check the amounts and units") from None
    return CheckedAnswer({
        "result": final["result"],
        "inputs": final["inputs"],
        "method": method_block(method, registry),
        "values_used": final["values_used"],
        "warnings": [_warning(w) for w in warnings + provenance_warnings(values_used)],
        "cautions": list(CAUTIONS) + list(extra_cautions),
        "strict": strict,
        "registry": registry_version(registry),
    })


def hlb_display(value: float) -> float:
    """HLB is shown to 0.1: the method is no more precise than that."""
    return round(value, 1)


def hlb_span_display(span: tuple[float, float] | None) -> dict | None:
    """A (low, high) HLB span as answers show it, or None."""
    return {"low": hlb_display(span[0]), "high": hlb_display(span[1])} if span else None


def unrounded(value: float) -> float:
    """The figure before display rounding, cut to 6 decimals so that float
    noise (11.600000000000001) does not pass for precision."""
    return round(value, 6)


def tidy(value):
    """Floats cut to 10 significant digits: float noise such as
    3.2352941176470584 is not precision, and no balance reads past it.
    Through the envelope's one pass, which gives the same values (tested)
    at about half the time; a tree holding a non-finite number takes the
    plain walk, which leaves it for the envelope to refuse, naming where."""
    try:
        return _final(value)
    except _NonFinite:
        return tidy_walk(value)


def tidy_walk(value):
    """tidy, a node at a time: the definition _final is held to."""
    if isinstance(value, float):
        return float(f"{value:.10g}")
    if isinstance(value, dict):
        return {k: tidy_walk(v) for k, v in value.items()}
    if isinstance(value, list):
        return [tidy_walk(v) for v in value]
    return value

UNPUBLISHED_METHOD = ("the minimum emulsifier estimate comes from calculation practice and no primary publication for it could be "
                      "found; treat it as a rough lower bound and confirm the emulsifier level by bench trial")

PROVENANCE_RULES = (
    ("unverified_value", lambda v: v.status == "unverified",
     "value(s) not yet checked against their cited source were used"),
    ("value_from_memory", lambda v: v.recalled_from_memory,
     "value(s) recalled from memory of a standard text, not read from it, were used"),
    ("caller_supplied_value", lambda v: v.origin == "caller",
     "value(s) supplied in the request, with no source in the registry, were used"),
    ("local_value", lambda v: v.local,
     "value(s) from this pharmacy's site overlay, not from the shipped registry, were used"),
    ("sources_disagree", lambda v: v.sources_disagree,
     "sources disagree on value(s) used; the preferred figure was used and the range is given"),
    ("doubtful_value_left_out", lambda v: v.range_with_doubtful is not None,
     "value(s) have a further figure the registry flags doubtful, left out of the range given (range_with_doubtful shows "
     "the span with it)"),
)


def provenance_warnings(values_used: Iterable[ValueUsed]) -> list[dict]:
    out = []
    for code, applies, message in PROVENANCE_RULES:
        hits = [v.label for v in values_used if applies(v)]
        if hits:
            out.append({"code": code, "message": f"{len(hits)} {message}: {', '.join(hits)}", "subject": ", ".join(hits)})
    return out


def apparent_hlb_warning(names: Iterable[str]) -> list[dict]:
    names = list(names)
    if not names:
        return []
    return [{"code": "apparent_hlb", "subject": ", ".join(names),
             "message": f"hydrocolloid(s) with an apparent HLB only were used: {', '.join(names)}; their HLB is not comparable with a surfactant's"}]


def solid_by_volume_warning(labels: Iterable[str]) -> list[dict]:
    labels = list(labels)
    if not labels:
        return []
    return [{"code": "solid_by_volume", "subject": ", ".join(labels),
             "message": f"solid or semisolid ingredient(s) given by volume: {', '.join(labels)}; weigh solids, never measure them by volume"}]


def finding_warnings(findings: Iterable[Finding | None]) -> list[dict]:
    return [{"code": f.code, "message": f.message, "subject": f.subject} for f in findings if f is not None]
