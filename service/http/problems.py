"""One error shape for every 4xx and 5xx: RFC 9457 problem details, served as
application/problem+json. Body faults list each field as a JSON pointer with
the rule it broke; query faults name the parameter."""
from __future__ import annotations

import logging
import uuid

from flask import Flask, json, Response
from marshmallow import ValidationError
from werkzeug.exceptions import HTTPException

# pointer is re-exported: the HTTP layer's own faults use it too.
from service.core.errors import CalculationError, InvalidInput, UnverifiedValuesRefused, pointer

PROBLEM_TYPE = "application/problem+json"
log = logging.getLogger("service")

# A type URI per kind of problem, resolved against the service: each is
# described on its docs page.
TYPE_INVALID_INPUT = "/docs#problem-invalid-input"
TYPE_CALCULATION = "/docs#problem-calculation-refused"
TYPE_MALFORMED = "/docs#problem-malformed-body"


class ApiProblem(Exception):
    """An error to answer as problem+json."""

    def __init__(self, status: int, title: str, detail: str, *, type_: str = "about:blank", errors: list | None = None, headers: dict | None = None, **extra):
        super().__init__(detail)
        self.status, self.title, self.detail, self.type = status, title, detail, type_
        self.errors = errors
        self.headers = headers or {}
        self.extra = extra


# marshmallow's own messages, by their opening words, and the rule each states;
# the service's own fields and rules carry theirs (schemas/rules.py's Fault).
MESSAGE_RULES = (
    ("Missing data for required field", "required"), ("Unknown field", "unknown_field"), ("Field may not be null", "not_null"),
    ("Must be one of", "enum"), ("Shorter than", "min_length"), ("Longer than", "max_length"), ("Length must be", "length"),
    ("Not a valid", "type"), ("Invalid input type", "type"), ("String does not match", "pattern"),
)


def rule_of(message) -> str:
    rule = getattr(message, "rule", None)
    if rule:
        return rule
    text = str(message)
    return next((r for prefix, r in MESSAGE_RULES if text.startswith(prefix)), "schema")


def flatten_messages(messages, path=()) -> list[dict]:
    """marshmallow's nested messages as a flat list of {pointer, rule, detail}."""
    out = []
    if isinstance(messages, dict):
        for key, value in messages.items():
            sub = path if key == "_schema" else path + (key,)
            out.extend(flatten_messages(value, sub))
    elif isinstance(messages, (list, tuple)):
        for item in messages:
            if isinstance(item, (dict, list, tuple)):
                out.extend(flatten_messages(item, path))
            else:
                out.append({"pointer": pointer(path), "rule": rule_of(item), "detail": str(item)})
    else:
        out.append({"pointer": pointer(path), "rule": rule_of(messages), "detail": str(messages)})
    return out


def problem_response(status: int, title: str, detail: str, *, type_: str = "about:blank", errors=None, headers=None, **extra) -> Response:
    body = {"type": type_, "title": title, "status": status, "detail": detail}
    if errors is not None:
        body["errors"] = errors
    body.update(extra)
    response = Response(json.dumps(body, indent=2) + "\n", status=status, mimetype=PROBLEM_TYPE)
    for name, value in (headers or {}).items():
        if name.lower() != "content-type":
            response.headers[name] = value
    return response


def validation_problem(messages, *, location: str = "body") -> ApiProblem:
    errors = flatten_messages(messages)
    if location == "query":
        errors = [{"parameter": e["pointer"][2:].split("/")[0], "rule": e["rule"], "detail": e["detail"]} for e in errors]
    first = errors[0]
    where = first.get("pointer") or first.get("parameter")
    return ApiProblem(422, "Invalid input", f"{len(errors)} input error(s); first at {where}: {first['detail']}", type_=TYPE_INVALID_INPUT, errors=errors)


def register_error_handlers(app: Flask) -> None:
    @app.errorhandler(ApiProblem)
    def _api_problem(exc: ApiProblem):
        return problem_response(exc.status, exc.title, exc.detail, type_=exc.type, errors=exc.errors, headers=exc.headers, **exc.extra)

    @app.errorhandler(ValidationError)
    def _validation(exc: ValidationError):
        p = validation_problem(exc.messages)
        return _api_problem(p)

    @app.errorhandler(CalculationError)
    def _calculation(exc: CalculationError):
        # Core paths are relative to the request body, so they are pointers as they stand.
        errors = [{"pointer": pointer(exc.path), "rule": exc.rule, "detail": exc.message, **exc.extra}]
        return problem_response(422, "Calculation refused", exc.message, type_=TYPE_CALCULATION, errors=errors)

    # The domain's refusals, each as the one problem the docs page describes.
    @app.errorhandler(InvalidInput)
    def _invalid_input(exc: InvalidInput):
        return problem_response(422, "Invalid input", exc.detail, type_=TYPE_INVALID_INPUT, errors=exc.faults)

    @app.errorhandler(UnverifiedValuesRefused)
    def _unverified(exc: UnverifiedValuesRefused):
        return problem_response(422, "Unverified values refused", exc.detail, type_=TYPE_CALCULATION, errors=exc.faults)

    @app.errorhandler(HTTPException)
    def _http(exc: HTTPException):
        headers = dict(exc.get_headers())
        return problem_response(exc.code or 500, exc.name, exc.description or exc.name, headers=headers)

    @app.errorhandler(Exception)
    def _unexpected(exc: Exception):
        error_id = uuid.uuid4().hex
        log.exception("unhandled error %s", error_id)
        detail = f"an internal error occurred; quote error id {error_id} when reporting it"
        if app.debug:
            detail += f" ({type(exc).__name__}: {exc})"
        return problem_response(500, "Internal Server Error", detail, error_id=error_id)
