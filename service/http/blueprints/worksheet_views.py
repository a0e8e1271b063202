"""The batch worksheet, its rescaling, and candidate pairs, under /v1. The
worksheet is JSON, or text when the request asks for text/markdown or
text/plain."""
from __future__ import annotations

from flask import Blueprint, Response, request

from service.usecases import pairs, worksheet
from service.http.blueprints.calculation_views import _registry, _strict
from service.http.bodies import answer, load_body
from service.http.problems import ApiProblem
from service.http.worksheet_text import worksheet_text
from service.http.schemas import worksheet_bodies as schemas

bp = Blueprint("worksheets", __name__, url_prefix="/v1")

SHEET_IN, RESCALE_IN, SHEET_OUT = schemas.WorksheetRequestSchema(), schemas.RescaleRequestSchema(), schemas.WorksheetAnswerSchema()
PAIRS_IN, PAIRS_OUT = schemas.CandidateRequestSchema(), schemas.CandidateAnswerSchema()
OFFERED = ["application/json", "text/markdown", "text/plain"]


def negotiated(offered: list[str] = OFFERED) -> str:
    """The media type to answer in; 406 when the client accepts none of ours."""
    if not request.headers.get("Accept"):
        return "application/json"
    best = request.accept_mimetypes.best_match(offered)
    if best is None:
        raise ApiProblem(406, "Not Acceptable", f"this resource is available as {', '.join(offered)}")
    return best


def _sheet(payload: dict, media: str) -> Response:
    if media == "application/json":
        return answer(SHEET_OUT, payload)
    dumped = SHEET_OUT.dump(payload)
    return Response(worksheet_text(dumped, markdown=media == "text/markdown"), mimetype=media)


@bp.post("/worksheets")
def create_worksheet():
    media = negotiated()
    data = load_body(SHEET_IN)
    return _sheet(worksheet.worksheet(data, _registry(), _strict(data)), media)


@bp.post("/worksheets/rescale")
def rescale_worksheet():
    media = negotiated()
    data = load_body(RESCALE_IN)
    return _sheet(worksheet.rescale(data, _registry(), _strict(data["worksheet"])), media)


@bp.post("/candidate-pairs")
def candidate_pairs():
    data = load_body(PAIRS_IN)
    return answer(PAIRS_OUT, pairs.candidates(data, _registry(), _strict(data)))
