"""The calculations, under /v1."""
from __future__ import annotations

from flask import Blueprint, current_app

from service.usecases import hlb_calculations
from service.http.bodies import answer, load_body
from service.http.schemas import responses as out
from service.http.schemas import calculation_requests as req
from service.http.schemas import blend_bodies
from service.usecases import constrained_blend
from service.http.schemas import interface_bodies
from service.usecases import interface_estimate

bp = Blueprint("calculations", __name__, url_prefix="/v1")

# Schemas are built once, at import.
BLEND_IN, BLEND_OUT = req.BlendRequestSchema(), out.BlendAnswerSchema()
SPLIT_IN, SPLIT_OUT = req.SplitRequestSchema(), out.SplitAnswerSchema()
RHLB_IN, RHLB_OUT = req.RequiredHlbRequestSchema(), out.RequiredHlbAnswerSchema()
MINEM_IN, MINEM_OUT = req.MinimumEmulsifierRequestSchema(), out.MinimumEmulsifierAnswerSchema()


def _registry():
    return current_app.extensions["registry"]


def _strict(data: dict) -> bool:
    """Strict when the service is set so (a request cannot relax it), or when
    the request asks."""
    return current_app.config["STRICT"] or data.get("strict", False)


@bp.post("/blends/hlb")
def blend_hlb():
    data = load_body(BLEND_IN)
    return answer(BLEND_OUT, hlb_calculations.blend(data, _registry(), _strict(data)))


@bp.post("/blends/proportions")
def blend_proportions():
    data = load_body(SPLIT_IN)
    return answer(SPLIT_OUT, hlb_calculations.split(data, _registry(), _strict(data)))


@bp.post("/oil-phases/required-hlb")
def oil_phase_required_hlb():
    data = load_body(RHLB_IN)
    return answer(RHLB_OUT, hlb_calculations.oil_phase_rhlb(data, _registry(), _strict(data)))


@bp.post("/emulsifier/minimum")
def emulsifier_minimum():
    return answer(MINEM_OUT, hlb_calculations.emulsifier_minimum(load_body(MINEM_IN), _registry()))


IFACE_IN, IFACE_OUT = interface_bodies.InterfaceEstimateRequestSchema(), interface_bodies.InterfaceEstimateAnswerSchema()


@bp.post("/emulsifier/interface-estimate")
def emulsifier_interface_estimate():
    data = load_body(IFACE_IN)
    return answer(IFACE_OUT, interface_estimate.estimate(data, _registry(), _strict(data)))


BLEND_SOLVE_IN, BLEND_SOLVE_OUT = blend_bodies.BlendSolveRequestSchema(), blend_bodies.BlendSolveAnswerSchema()


@bp.post("/blends/solve")
def blend_solve():
    data = load_body(BLEND_SOLVE_IN)
    return answer(BLEND_SOLVE_OUT, constrained_blend.solve(data, _registry(), _strict(data)))
