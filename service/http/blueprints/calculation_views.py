"""The calculations, under /v1."""
from __future__ import annotations

from flask import Blueprint, current_app

from service.http.bodies import answer, load_body
from service.http.operations import CALCULATIONS, Operation

bp = Blueprint("calculations", __name__, url_prefix="/v1")


def _registry():
    return current_app.extensions["registry"]


def payload_of(op: Operation) -> dict:
    """The request loaded by the operation's schema and run by its use case."""
    return op.run(load_body(op.request), _registry(), current_app.config["STRICT"])


def answered(op_id: str):
    """The view of a calculation that answers JSON only."""
    op = CALCULATIONS[op_id]
    return lambda: answer(op.answer, payload_of(op))


bp.add_url_rule("/blends/hlb", "blend_hlb", answered("blendHlb"), methods=["POST"])
bp.add_url_rule("/blends/proportions", "blend_proportions", answered("blendProportions"), methods=["POST"])
bp.add_url_rule("/oil-phases/required-hlb", "oil_phase_required_hlb", answered("oilPhaseRequiredHlb"), methods=["POST"])
bp.add_url_rule("/emulsifier/minimum", "emulsifier_minimum", answered("emulsifierMinimum"), methods=["POST"])
bp.add_url_rule("/emulsifier/interface-estimate", "emulsifier_interface_estimate", answered("emulsifierInterfaceEstimate"), methods=["POST"])
bp.add_url_rule("/blends/solve", "blend_solve", answered("solveBlend"), methods=["POST"])
