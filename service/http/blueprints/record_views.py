"""The compounding record, under /v1: JSON (the machine form), Markdown,
plain text, or PDF for printing and filing, by the request's Accept."""
from __future__ import annotations

from flask import Blueprint, Response

from service.usecases import compounding_record
from service.http.blueprints.calculation_views import _registry, _strict
from service.http.blueprints.worksheet_views import negotiated
from service.http.bodies import answer, load_body
from service.http.record_pdf import record_pdf
from service.http.record_text import record_text
from service.http.schemas import record_bodies as schemas

bp = Blueprint("records", __name__, url_prefix="/v1")

RECORD_IN, RECORD_OUT = schemas.RecordRequestSchema(), schemas.RecordAnswerSchema()
OFFERED = ["application/json", "text/markdown", "text/plain", "application/pdf"]


@bp.post("/compounding-records")
def create_record():
    media = negotiated(OFFERED)
    data = load_body(RECORD_IN)
    payload = compounding_record.record(data, _registry(), _strict(data))
    if media == "application/json":
        return answer(RECORD_OUT, payload)
    dumped = RECORD_OUT.dump(payload)
    if media == "application/pdf":
        name = f"compounding-record-{dumped['result']['compounding']['date']}.pdf"
        return Response(record_pdf(dumped), mimetype=media, headers={"Content-Disposition": f'inline; filename="{name}"'})
    return Response(record_text(dumped, markdown=media == "text/markdown"), mimetype=media)
