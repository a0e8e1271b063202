"""Response examples of the OpenAPI document: each request example of
spec_examples.py, answered by the service on the shipped registry, recorded
in openapi/response_examples.json by `emulsion-spec --write` and read back
when the spec is built. tests/contract/test_spec.py fails when a recorded
answer is no longer what the service gives."""
from __future__ import annotations

import json
from pathlib import Path

from service.http.spec_examples import EXAMPLES, GET_EXAMPLES

RESPONSE_EXAMPLES_PATH = Path(__file__).resolve().parents[2] / "openapi" / "response_examples.json"
# The path each operation's request examples go to; GET examples carry theirs.
POST_PATHS = {
    "blendHlb": "/v1/blends/hlb", "blendProportions": "/v1/blends/proportions", "oilPhaseRequiredHlb": "/v1/oil-phases/required-hlb",
    "emulsifierMinimum": "/v1/emulsifier/minimum", "createWorksheet": "/v1/worksheets", "rescaleWorksheet": "/v1/worksheets/rescale",
    "checkAmountsTaken": "/v1/worksheets/amounts-taken", "createCompoundingRecord": "/v1/compounding-records",
    "candidatePairs": "/v1/candidate-pairs", "hlbEstimate": "/v1/hlb-estimates", "requiredHlbSeriesPlan": "/v1/required-hlb-series/plan",
    "requiredHlbSeriesEvaluate": "/v1/required-hlb-series/evaluate",
    "soapInPlace": "/v1/soaps/in-place", "gumEmulsion": "/v1/gum-emulsions",
    "solveBlend": "/v1/blends/solve", "emulsifierInterfaceEstimate": "/v1/emulsifier/interface-estimate",
    "batch": "/v1/batch",
}
# Operations whose example is also recorded as the Markdown worksheet.
MARKDOWN = ("createWorksheet", "checkAmountsTaken", "createCompoundingRecord")


def record(app) -> dict:
    """{operationId: {media type: {example name: {summary, value}}}}, every
    answer a 200 (anything else is a broken example, and raises)."""
    client = app.test_client()
    out: dict = {}
    for op_id, path in POST_PATHS.items():
        for name, example in EXAMPLES.get(op_id, {}).items():
            answer = client.post(path, json=example["value"])
            if answer.status_code != 200:
                raise RuntimeError(f"example {op_id}/{name} is answered {answer.status_code}: {answer.get_data(as_text=True)[:300]}")
            out.setdefault(op_id, {}).setdefault("application/json", {})[name] = {"summary": example["summary"], "value": answer.get_json()}
            if op_id in MARKDOWN:
                text = client.post(path, json=example["value"], headers={"Accept": "text/markdown"}).get_data(as_text=True)
                out[op_id].setdefault("text/markdown", {})[name] = {"summary": example["summary"] + ", as Markdown", "value": text}
    for op_id, (name, summary, path) in GET_EXAMPLES.items():
        answer = client.get(path)
        if answer.status_code != 200:
            raise RuntimeError(f"example {op_id}/{name} is answered {answer.status_code}")
        out.setdefault(op_id, {}).setdefault("application/json", {})[name] = {"summary": summary, "value": answer.get_json()}
    return out


def examples_json(examples: dict) -> str:
    return json.dumps(examples, indent=1, sort_keys=True, ensure_ascii=False) + "\n"


def load() -> dict:
    if not RESPONSE_EXAMPLES_PATH.exists():
        return {}
    return json.loads(RESPONSE_EXAMPLES_PATH.read_text(encoding="utf-8"))


__all__ = ["MARKDOWN", "POST_PATHS", "RESPONSE_EXAMPLES_PATH", "examples_json", "load", "record"]
