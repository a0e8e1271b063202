"""HLB estimates from composition, the required-HLB test series (its
read-back also as an SVG plot), and the Davies group table, under /v1."""
from __future__ import annotations

from flask import Blueprint, Response, current_app

from service.usecases import series_picture
from service.usecases.answers import registry_version
from service.http.blueprints.calculation_views import _registry, answered
from service.http.blueprints.worksheet_views import negotiated
from service.http.bodies import answer, load_body
from service.http.operations import CALCULATIONS
from service.http.series_svg import series_svg
from service.http.schemas import estimate_bodies as schemas

bp = Blueprint("estimates", __name__, url_prefix="/v1")

EVALUATE = CALCULATIONS["requiredHlbSeriesEvaluate"]
GROUPS_OUT = schemas.DaviesGroupListSchema()
# The series' read-back is JSON, or a plot of it.
EVAL_OFFERED = ["application/json", "image/svg+xml"]


bp.add_url_rule("/hlb-estimates", "hlb_estimate", answered("hlbEstimate"), methods=["POST"])
bp.add_url_rule("/required-hlb-series/plan", "series_plan", answered("requiredHlbSeriesPlan"), methods=["POST"])


@bp.post("/required-hlb-series/evaluate")
def series_evaluate():
    media = negotiated(EVAL_OFFERED)
    data = load_body(EVALUATE.request)
    payload = EVALUATE.run(data, _registry(), current_app.config["STRICT"])
    if media == "image/svg+xml":
        return Response(series_svg(series_picture.picture(data, payload)), mimetype=media)
    return answer(EVALUATE.answer, payload)


@bp.get("/davies-groups")
def davies_groups():
    registry = _registry()
    groups = [{"id": g.id, "formula": g.formula, "kind": g.kind, "number": g.number,
               "values": [{"number": r.figure, "source": r.source_id, "status": r.status, "recalled_from_memory": r.recalled_from_memory,
                           "preferred": r.preferred, "note": r.note} for r in g.values if not r.retired]}
              for g in registry.davies_groups.values()]
    return answer(GROUPS_OUT, {"count": len(groups), "groups": groups, "registry": registry_version(registry)})
