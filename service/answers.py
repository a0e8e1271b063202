"""The envelope every calculation answer shares."""
from __future__ import annotations

from registry import Registry
from service.methods import CAUTIONS, Method
from service.notices import provenance_warnings


def registry_version(registry: Registry) -> dict:
    return {"release": registry.release, "digest": registry.digest, "version": registry.version}


def method_block(method: Method, registry: Registry) -> dict:
    sources = [registry.sources[sid] for sid in method.source_ids]
    return {
        "name": method.name,
        "formula": method.formula,
        "sources": [{"id": s.id, "citation": s.citation, "kind": s.kind} for s in sources],
        "assumptions": list(method.assumptions),
    }


def envelope(result: dict, inputs: dict, method: Method, values_used: list[dict], warnings: list[dict], registry: Registry) -> dict:
    return {
        "result": result,
        "inputs": inputs,
        "method": method_block(method, registry),
        "values_used": values_used,
        "warnings": warnings + provenance_warnings(values_used),
        "cautions": list(CAUTIONS),
        "registry": registry_version(registry),
    }


def hlb_display(value: float) -> float:
    """HLB is shown to 0.1: the method is no more precise than that."""
    return round(value, 1)
