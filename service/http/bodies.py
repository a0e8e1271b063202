"""Reading requests and writing answers, the same way for every view."""
from __future__ import annotations

import re

from flask import Response, current_app, json, request
from marshmallow import Schema, ValidationError

from service.http.problems import TYPE_MALFORMED, ApiProblem, validation_problem
from service.http.jsonio import StrictJSONError, strict_loads

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
    repeated = {k: ["Give this parameter once."] for k, v in args.items() if len(v) > 1}
    if repeated:
        raise validation_problem(repeated, location="query")
    try:
        return schema.load({k: v[0] for k, v in args.items()})
    except ValidationError as exc:
        raise validation_problem(exc.messages, location="query") from None


def answer(schema: Schema, payload: dict, status: int = 200) -> Response:
    # Indented, so that an answer read through curl is legible as it stands.
    body = json.dumps(schema.dump(payload), indent=2) + "\n"
    return Response(body, status=status, mimetype="application/json")
