"""The calculations, under /v1."""
from __future__ import annotations

from flask import Blueprint, current_app

from service import calculations
from service.api.io import answer, load_body
from service.schemas import answers as out
from service.schemas import calculations as req

bp = Blueprint("calculations", __name__, url_prefix="/v1")

# Schemas are built once, at import.
BLEND_IN, BLEND_OUT = req.BlendRequestSchema(), out.BlendAnswerSchema()
SPLIT_IN, SPLIT_OUT = req.SplitRequestSchema(), out.SplitAnswerSchema()
RHLB_IN, RHLB_OUT = req.RequiredHlbRequestSchema(), out.RequiredHlbAnswerSchema()
MINEM_IN, MINEM_OUT = req.MinimumEmulsifierRequestSchema(), out.MinimumEmulsifierAnswerSchema()


def _registry():
    return current_app.extensions["registry"]


@bp.post("/blends/hlb")
def blend_hlb():
    return answer(BLEND_OUT, calculations.blend(load_body(BLEND_IN), _registry()))


@bp.post("/blends/proportions")
def blend_proportions():
    return answer(SPLIT_OUT, calculations.split(load_body(SPLIT_IN), _registry()))


@bp.post("/oil-phases/required-hlb")
def oil_phase_required_hlb():
    return answer(RHLB_OUT, calculations.oil_phase_rhlb(load_body(RHLB_IN), _registry()))


@bp.post("/emulsifier/minimum")
def emulsifier_minimum():
    return answer(MINEM_OUT, calculations.emulsifier_minimum(load_body(MINEM_IN), _registry()))
