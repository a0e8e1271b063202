"""Soaps made in place and gum emulsions, under /v1."""
from __future__ import annotations

from flask import Blueprint

from service.usecases import gum_emulsions, soaps
from service.http.blueprints.calculation_views import _registry, _strict
from service.http.bodies import answer, load_body
from service.http.schemas import soap_bodies as schemas

bp = Blueprint("soaps", __name__, url_prefix="/v1")

SOAP_IN, SOAP_OUT = schemas.SoapRequestSchema(), schemas.SoapAnswerSchema()
GUM_IN, GUM_OUT = schemas.GumEmulsionRequestSchema(), schemas.GumEmulsionAnswerSchema()


@bp.post("/soaps/in-place")
def soap_in_place():
    data = load_body(SOAP_IN)
    return answer(SOAP_OUT, soaps.in_place(data, _registry(), _strict(data)))


@bp.post("/gum-emulsions")
def gum_emulsion():
    data = load_body(GUM_IN)
    return answer(GUM_OUT, gum_emulsions.gum_emulsion(data, _registry(), _strict(data)))
