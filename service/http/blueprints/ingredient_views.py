"""The registry, read-only, under /v1."""
from __future__ import annotations

from flask import Blueprint, current_app

from service.http.bodies import answer, load_query
from service.http.problems import ApiProblem
from service.usecases.resolution import unknown_ingredient
from service.usecases import registry_views
from service.http.schemas import ingredient_bodies as schemas

bp = Blueprint("ingredients", __name__, url_prefix="/v1")

QUERY = schemas.IngredientQuerySchema()
LIST_OUT, ONE_OUT, SOURCES_OUT = schemas.IngredientListSchema(), schemas.IngredientAnswerSchema(), schemas.SourceListSchema()


@bp.get("/ingredients")
def list_ingredients():
    return answer(LIST_OUT, registry_views.ingredient_list(current_app.extensions["registry"], load_query(QUERY)))


@bp.get("/ingredients/<ingredient_id>")
def get_ingredient(ingredient_id: str):
    registry = current_app.extensions["registry"]
    found = registry_views.ingredient_detail(registry, ingredient_id)
    if found is None:
        detail, near = unknown_ingredient(registry, ingredient_id)
        raise ApiProblem(404, "Not Found", detail, suggestions=near)
    return answer(ONE_OUT, found)


@bp.get("/sources")
def list_sources():
    return answer(SOURCES_OUT, registry_views.source_list(current_app.extensions["registry"]))
