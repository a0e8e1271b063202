"""The envelope every calculation answer shares."""
from __future__ import annotations

import math

from registry import Registry
from service.core.errors import CalculationError
from service.methods import CAUTIONS, Method
from service.notices import provenance_warnings


def registry_version(registry: Registry) -> dict:
    return {"release": registry.release, "digest": registry.digest, "site_overlay_digest": registry.overlay_digest,
            "version": registry.version}


def method_block(method: Method, registry: Registry) -> dict:
    sources = [registry.sources[sid] for sid in method.source_ids]
    return {
        "name": method.name,
        "formula": method.formula,
        "sources": [{"id": s.id, "citation": s.citation, "kind": s.kind} for s in sources],
        "assumptions": list(method.assumptions),
    }


def _first_non_finite(value, path=()):
    if isinstance(value, float) and not math.isfinite(value):
        return path
    if isinstance(value, dict):
        items = value.items()
    elif isinstance(value, (list, tuple)):
        items = enumerate(value)
    else:
        return None
    for key, item in items:
        found = _first_non_finite(item, path + (key,))
        if found is not None:
            return found
    return None


def envelope(result: dict, inputs: dict, method: Method, values_used: list[dict], warnings: list[dict], registry: Registry,
             strict: bool = False, extra_cautions: tuple[str, ...] = ()) -> dict:
    """The whole answer. A result that overflowed (extreme but valid inputs)
    is refused rather than written out as a wrong number."""
    bad = _first_non_finite(result)
    if bad is not None:
        raise CalculationError((), "finite_result", f"the inputs give a result out of range (result/{'/'.join(map(str, bad))}); check the amounts and units")
    return {
        "result": tidy(result),
        "inputs": tidy(inputs),
        "method": method_block(method, registry),
        "values_used": tidy(values_used),
        "warnings": warnings + provenance_warnings(values_used),
        "cautions": list(CAUTIONS) + list(extra_cautions),
        "strict": strict,
        "registry": registry_version(registry),
    }


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
    3.2352941176470584 is not precision, and no balance reads past it."""
    if isinstance(value, float):
        return float(f"{value:.10g}")
    if isinstance(value, dict):
        return {k: tidy(v) for k, v in value.items()}
    if isinstance(value, list):
        return [tidy(v) for v in value]
    return value
