"""Reading requests and writing answers, the same way for every view."""
from __future__ import annotations

import re

from flask import Flask, Response, current_app, g, request
from marshmallow import Schema, ValidationError

from service.http.problems import TYPE_MALFORMED, ApiProblem, validation_problem
from service.http.jsonio import INDENT_PARAMETER, MAX_INDENT, StrictJSONError, encode, strict_loads

_JSON_TYPE = re.compile(r"^application/([a-z0-9.+-]+\+)?json$")


def load_body(schema: Schema) -> dict:
    """The request body, strictly parsed and loaded by `schema`.
    415 for a body that is not JSON, 411 for a body without a length (a
    chunked body could be cut short unseen), 413 when too large, 400 when it
    does not parse, 422 when it does not validate."""
    if not _JSON_TYPE.match(request.mimetype or ""):
        raise ApiProblem(415, "Unsupported Media Type", "the request body must be application/json")
    if request.content_length is None:
        if "chunked" in request.headers.get("Transfer-Encoding", "").lower():
            raise ApiProblem(411, "Length Required", "send the body with a Content-Length; chunked request bodies are not accepted")
        raise ApiProblem(400, "Malformed body", "the request body is empty; a JSON object is required", type_=TYPE_MALFORMED)
    limit = current_app.config["MAX_BODY_BYTES"]
    if request.content_length > limit:
        raise ApiProblem(413, "Content Too Large", f"the request body is {request.content_length} bytes; at most {limit} are accepted")
    raw = request.get_data(cache=False)
    try:
        data = strict_loads(raw)
    except StrictJSONError as exc:
        raise ApiProblem(400, "Malformed body", str(exc), type_=TYPE_MALFORMED) from None
    try:
        return schema.load(data)
    except ValidationError as exc:
        raise validation_problem(exc.messages) from None


def load_query(schema: Schema) -> dict:
    args = request.args.to_dict(flat=False)
    # The answer's layout, not an input of the operation (see install_indent).
    args.pop(INDENT_PARAMETER, None)
    repeated = {k: ["Give this parameter once."] for k, v in args.items() if len(v) > 1}
    if repeated:
        raise validation_problem(repeated, location="query")
    try:
        return schema.load({k: v[0] for k, v in args.items()})
    except ValidationError as exc:
        raise validation_problem(exc.messages, location="query") from None


def answer(schema: Schema, payload: dict, status: int = 200) -> Response:
    """`payload` as it stands: the use cases build it in its final form, and
    the tests check every answer against `schema`'s published form (tests/api/
    conftest.py), so no dump runs per request. `schema` names the shape."""
    return Response(encode(payload, g.get("indent", 0)), status=status, mimetype="application/json")


def install_indent(app: Flask) -> None:
    """The `indent` query parameter of every operation: 1 to 8 spaces of
    indentation for a person reading JSON at a terminal, 0 (the default)
    for compact JSON. Anything else is refused, naming the parameter."""

    @app.before_request
    def _indent():
        values = request.args.getlist(INDENT_PARAMETER)
        if not values:
            return None
        if len(values) > 1:
            raise validation_problem({INDENT_PARAMETER: ["Give this parameter once."]}, location="query")
        text = values[0]
        if not (text.isascii() and text.isdigit() and len(text) == 1 and int(text) <= MAX_INDENT):
            raise validation_problem({INDENT_PARAMETER: [f"Not a valid indent: give a whole number of spaces from 0 to {MAX_INDENT}."]},
                                     location="query")
        g.indent = int(text)
        return None
