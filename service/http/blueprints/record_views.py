"""The compounding record, under /v1: JSON (the machine form), Markdown,
plain text, or PDF for printing and filing, by the request's Accept."""
from __future__ import annotations

from flask import Blueprint, Response

from service.http.blueprints.calculation_views import payload_of
from service.http.blueprints.worksheet_views import negotiated
from service.http.bodies import answer
from service.http.operations import CALCULATIONS
from service.http.record_pdf import record_pdf
from service.http.record_text import record_text

bp = Blueprint("records", __name__, url_prefix="/v1")

RECORD = CALCULATIONS["createCompoundingRecord"]
RECORD_OUT = RECORD.answer
OFFERED = ["application/json", "text/markdown", "text/plain", "application/pdf"]


@bp.post("/compounding-records")
def create_record():
    media = negotiated(OFFERED)
    payload = payload_of(RECORD)
    if media == "application/json":
        return answer(RECORD_OUT, payload)
    # Printed from the payload as it stands, like the JSON: it is already in
    # the published form (tests/api/test_text_from_payload.py).
    if media == "application/pdf":
        name = f"compounding-record-{payload['result']['compounding']['date']}.pdf"
        return Response(record_pdf(payload), mimetype=media, headers={"Content-Disposition": f'inline; filename="{name}"'})
    return Response(record_text(payload, markdown=media == "text/markdown"), mimetype=media)
