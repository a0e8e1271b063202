"""POST /v1/batch: many calculations in one request, each item loaded by its
operation's schema and run by its use case (service/http/operations.py, as
its own request is), answered in order with its answer or its problem; what
the answers share is listed once (service/usecases/shared_provenance.py)."""
from __future__ import annotations

import json

from flask import Blueprint, Response, current_app

from service.http.blueprints.calculation_views import _registry
from service.http.bodies import load_body
from service.http.operations import CALCULATIONS
from service.http.problems import encodable_problem, internal_error_body, refusal_body
from service.http.schemas.batch_bodies import BatchRequestSchema
from service.usecases.answers import registry_version
from service.usecases.shared_provenance import COMMON_CAUTIONS, SharedProvenance

bp = Blueprint("batch", __name__, url_prefix="/v1")

BATCH_IN = BatchRequestSchema()


def _item(index: int, op_id: str, body: dict, shared: SharedProvenance, registry, strict: bool) -> dict:
    op = CALCULATIONS[op_id]
    try:
        # Not dumped by its answer schema: the use cases build answers in
        # their final form, which the dump leaves as they are
        # (tests/api/test_batch.py holds them to it), and a dump would cost
        # more than the calculation.
        payload = op.run(op.request.load(body), registry, strict)
    except Exception as exc:  # noqa: BLE001 - one item's fault, even ours, must not fail the others
        problem = refusal_body(exc) or internal_error_body(exc, debug=current_app.debug)
        return {"index": index, "operation": op_id, "status": problem["status"], "problem": encodable_problem(problem)}
    return {"index": index, "operation": op_id, "status": 200, "answer": shared.refer(payload)}


@bp.post("/batch")
def batch():
    data = load_body(BATCH_IN)
    registry = _registry()
    strict = current_app.config["STRICT"] or data.get("strict", False)
    shared = SharedProvenance()
    items = [_item(i, item["operation"], item["body"], shared, registry, strict) for i, item in enumerate(data["items"])]
    answered = sum(1 for item in items if item["status"] == 200)
    payload = {"registry": registry_version(registry), "cautions": COMMON_CAUTIONS, "sources": list(shared.sources.values()),
               "values_used": shared.values_used, "items": items, "answered": answered, "refused": len(items) - answered}
    # Encoded once, compact, by the C encoder: a hundred answers indented by
    # the pure-Python encoder would cost more than computing them.
    body = json.dumps(payload, ensure_ascii=False, allow_nan=False, separators=(",", ":")) + "\n"
    return Response(body, mimetype="application/json")
