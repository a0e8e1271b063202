"""Soaps made in place and gum emulsions, under /v1."""
from __future__ import annotations

from flask import Blueprint

from service.http.blueprints.calculation_views import answered

bp = Blueprint("soaps", __name__, url_prefix="/v1")

bp.add_url_rule("/soaps/in-place", "soap_in_place", answered("soapInPlace"), methods=["POST"])
bp.add_url_rule("/gum-emulsions", "gum_emulsion", answered("gumEmulsion"), methods=["POST"])
