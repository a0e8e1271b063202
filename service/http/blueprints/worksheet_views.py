"""The batch worksheet, its rescaling, the amounts taken for it, and
candidate pairs, under /v1. The worksheet and the amounts taken are JSON, or
text when the request asks for text/markdown or text/plain."""
from __future__ import annotations

from flask import Blueprint, Response, request

from service.http.blueprints.calculation_views import answered, payload_of
from service.http.bodies import answer
from service.http.operations import CALCULATIONS
from service.http.problems import ApiProblem
from service.http.taken_text import taken_text
from service.http.worksheet_text import worksheet_text

bp = Blueprint("worksheets", __name__, url_prefix="/v1")

SHEET, RESCALE, TAKEN = (CALCULATIONS[op] for op in ("createWorksheet", "rescaleWorksheet", "checkAmountsTaken"))
OFFERED = ["application/json", "text/markdown", "text/plain"]


def negotiated(offered: list[str] = OFFERED) -> str:
    """The media type to answer in; 406 when the client accepts none of ours."""
    if not request.headers.get("Accept"):
        return "application/json"
    best = request.accept_mimetypes.best_match(offered)
    if best is None:
        raise ApiProblem(406, "Not Acceptable", f"this resource is available as {', '.join(offered)}")
    return best


def _as(schema, render, payload: dict, media: str) -> Response:
    """The answer as JSON, or rendered as text in the media type asked. The
    text is rendered from the payload as it stands, like the JSON: it is
    already in the published form (tests/api/test_text_from_payload.py checks
    that a dump by `schema` would render the same text)."""
    if media == "application/json":
        return answer(schema, payload)
    return Response(render(payload, markdown=media == "text/markdown"), mimetype=media)


@bp.post("/worksheets")
def create_worksheet():
    media = negotiated()
    return _as(SHEET.answer, worksheet_text, payload_of(SHEET), media)


@bp.post("/worksheets/rescale")
def rescale_worksheet():
    media = negotiated()
    return _as(RESCALE.answer, worksheet_text, payload_of(RESCALE), media)


@bp.post("/worksheets/amounts-taken")
def check_amounts_taken():
    media = negotiated()
    return _as(TAKEN.answer, taken_text, payload_of(TAKEN), media)


bp.add_url_rule("/candidate-pairs", "candidate_pairs", answered("candidatePairs"), methods=["POST"])
