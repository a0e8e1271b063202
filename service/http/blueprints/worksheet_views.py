"""The batch worksheet, its rescaling, the amounts taken for it, and
candidate pairs, under /v1. The worksheet and the amounts taken are JSON, or
text when the request asks for text/markdown or text/plain."""
from __future__ import annotations

from flask import Blueprint, Response, request

from service.usecases import amounts_taken, pairs, worksheet
from service.http.blueprints.calculation_views import _registry, _strict
from service.http.bodies import answer, load_body
from service.http.problems import ApiProblem
from service.http.taken_text import taken_text
from service.http.worksheet_text import worksheet_text
from service.http.schemas import amounts_taken_bodies, worksheet_bodies as schemas

bp = Blueprint("worksheets", __name__, url_prefix="/v1")

SHEET_IN, RESCALE_IN, SHEET_OUT = schemas.WorksheetRequestSchema(), schemas.RescaleRequestSchema(), schemas.WorksheetAnswerSchema()
TAKEN_IN, TAKEN_OUT = amounts_taken_bodies.AmountsTakenRequestSchema(), amounts_taken_bodies.AmountsTakenAnswerSchema()
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


def _as(schema, render, payload: dict, media: str) -> Response:
    """The answer as JSON, or rendered as text in the media type asked."""
    if media == "application/json":
        return answer(schema, payload)
    return Response(render(schema.dump(payload), markdown=media == "text/markdown"), mimetype=media)


def _sheet(payload: dict, media: str) -> Response:
    return _as(SHEET_OUT, worksheet_text, payload, media)


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


@bp.post("/worksheets/amounts-taken")
def check_amounts_taken():
    media = negotiated()
    data = load_body(TAKEN_IN)
    return _as(TAKEN_OUT, taken_text, amounts_taken.amounts_taken(data, _registry(), _strict(data["worksheet"])), media)


@bp.post("/candidate-pairs")
def candidate_pairs():
    data = load_body(PAIRS_IN)
    return answer(PAIRS_OUT, pairs.candidates(data, _registry(), _strict(data)))
