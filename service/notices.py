"""Warnings of an answer: the core's findings, and what the provenance of the
values used calls for. Provenance warnings are grouped, one per kind, naming
each value they concern."""
from __future__ import annotations

from typing import Iterable, Sequence

from service.core.findings import Finding

UNPUBLISHED_METHOD = ("the minimum emulsifier estimate comes from calculation practice and no primary publication for it could be "
                      "found; treat it as a rough lower bound and confirm the emulsifier level by bench trial")

PROVENANCE_RULES = (
    ("unverified_value", lambda v: v["status"] == "unverified",
     "value(s) not yet checked against their cited source were used"),
    ("value_from_memory", lambda v: v["recalled_from_memory"],
     "value(s) recalled from memory of a standard text, not read from it, were used"),
    ("caller_supplied_value", lambda v: v["origin"] == "caller",
     "value(s) supplied in the request, with no source in the registry, were used"),
    ("local_value", lambda v: v["local"],
     "value(s) from this pharmacy's site overlay, not from the shipped registry, were used"),
    ("sources_disagree", lambda v: v["sources_disagree"],
     "sources disagree on value(s) used; the preferred figure was used and the range is given"),
    ("doubtful_value_left_out", lambda v: v["range_with_doubtful"] is not None,
     "value(s) have a further figure the registry flags doubtful, left out of the range given (range_with_doubtful shows "
     "the span with it)"),
)


def _label(v: dict) -> str:
    who = v["ingredient"] or f"inline '{v['name']}'"
    return f"{who} {v['property']}"


def provenance_warnings(values_used: Sequence[dict]) -> list[dict]:
    out = []
    for code, applies, message in PROVENANCE_RULES:
        hits = [_label(v) for v in values_used if applies(v)]
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
