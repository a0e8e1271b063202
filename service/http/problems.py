"""One error shape for every 4xx and 5xx: RFC 9457 problem details, served as
application/problem+json. Body faults list each field as a JSON pointer with
the rule it broke; query faults name the parameter."""
from __future__ import annotations

import logging
import uuid

from flask import Flask, g, has_request_context, Response
from marshmallow import ValidationError
from werkzeug.exceptions import HTTPException

# pointer is re-exported: the HTTP layer's own faults use it too.
from service.core.errors import CalculationError, InvalidInput, UnverifiedValuesRefused, pointer, printable
from service.http.jsonio import encode

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


# At most this many error items in one problem: a body of thousands of bad
# items is answered in a few kilobytes, and the count of the rest is given
# (errors_total, errors_omitted), not each of them.
MAX_ERRORS = 50


def _faults(messages, path=()):
    """(path, message) for each of marshmallow's nested messages, in order."""
    if isinstance(messages, dict):
        for key, value in messages.items():
            yield from _faults(value, path if key == "_schema" else path + (key,))
    elif isinstance(messages, (list, tuple)):
        for item in messages:
            if isinstance(item, (dict, list, tuple)):
                yield from _faults(item, path)
            else:
                yield path, item
    else:
        yield path, messages


def _item(where: dict, message) -> dict:
    """One error item: where, the rule where the message names one, the detail."""
    return {**where, "rule": rule_of(message), "detail": str(message)}


def _encodable(node):
    """The problem body with every string made printable: a last guard, so
    that nothing echoed from the request (a lone surrogate most of all) can
    turn a 4xx into a 500 when the body is encoded."""
    if isinstance(node, str):
        return printable(node)
    if isinstance(node, dict):
        return {_encodable(k): _encodable(v) for k, v in node.items()}
    if isinstance(node, (list, tuple)):
        return [_encodable(v) for v in node]
    return node


def _capped(errors: list) -> dict:
    """The problem's error members: the first MAX_ERRORS items, and the count
    of the rest when there are more."""
    if len(errors) <= MAX_ERRORS:
        return {"errors": errors}
    return {"errors": errors[:MAX_ERRORS], "errors_total": len(errors), "errors_omitted": len(errors) - MAX_ERRORS}


def problem_body(status: int, title: str, detail: str, *, type_: str = "about:blank", errors=None, **extra) -> dict:
    """The problem's members, as a plain dict."""
    body = {"type": type_, "title": title, "status": status, "detail": detail}
    if errors is not None:
        body.update(_capped(errors))
    body.update(extra)
    return body


def refusal_body(exc: Exception) -> dict | None:
    """The problem a refusal of the request (a domain error, a schema's
    ValidationError, an ApiProblem) is answered with, as a plain dict; None
    for any other exception. The one mapping of the handlers below and of a
    batch's items."""
    if isinstance(exc, ApiProblem):
        return problem_body(exc.status, exc.title, exc.detail, type_=exc.type, errors=exc.errors, **exc.extra)
    if isinstance(exc, ValidationError):
        return refusal_body(validation_problem(exc.messages))
    if isinstance(exc, CalculationError):
        # Core paths are relative to the request body, so they are pointers as they stand.
        errors = [{"pointer": pointer(exc.path), "rule": exc.rule, "detail": exc.message, **exc.extra}]
        return problem_body(422, "Calculation refused", exc.message, type_=TYPE_CALCULATION, errors=errors)
    if isinstance(exc, InvalidInput):
        return problem_body(422, "Invalid input", exc.detail, type_=TYPE_INVALID_INPUT, errors=exc.faults)
    if isinstance(exc, UnverifiedValuesRefused):
        return problem_body(422, "Unverified values refused", exc.detail, type_=TYPE_CALCULATION, errors=exc.faults)
    return None


def encodable_problem(body: dict) -> dict:
    """The problem with every string made printable (see _encodable)."""
    return _encodable(body)


def problem_response(status: int, title: str, detail: str, *, type_: str = "about:blank", errors=None, headers=None, **extra) -> Response:
    body = problem_body(status, title, detail, type_=type_, errors=errors, **extra)
    # The id the caller can quote, the same as in the X-Request-ID header and the log lines.
    indent = 0
    if has_request_context():
        if g.get("request_id"):
            body["request_id"] = g.request_id
        # Laid out as the answer would have been (compact unless `indent` was given and valid).
        indent = g.get("indent", 0)
    response = Response(encode(_encodable(body), indent), status=status, mimetype=PROBLEM_TYPE)
    for name, value in (headers or {}).items():
        if name.lower() != "content-type":
            response.headers[name] = value
    return response


def validation_problem(messages, *, location: str = "body") -> ApiProblem:
    faults = list(_faults(messages))
    # Only the items that will be sent are built; the rest are only counted.
    shown = faults[:MAX_ERRORS]
    if location == "query":
        # A query parameter is named as sent (printable), not as a pointer.
        errors = [_item({"parameter": printable(str(p[0])) if p else ""}, m) for p, m in shown]
    else:
        errors = [_item({"pointer": pointer(p)}, m) for p, m in shown]
    first = errors[0]
    where = first.get("pointer") or first.get("parameter")
    counts = {} if len(faults) <= MAX_ERRORS else {"errors_total": len(faults), "errors_omitted": len(faults) - MAX_ERRORS}
    return ApiProblem(422, "Invalid input", f"{len(faults)} input error(s); first at {where}: {first['detail']}", type_=TYPE_INVALID_INPUT,
                      errors=errors, **counts)


def register_error_handlers(app: Flask) -> None:
    # The request's refusals, and the domain's, each as the one problem the docs page describes.
    @app.errorhandler(ApiProblem)
    @app.errorhandler(ValidationError)
    @app.errorhandler(CalculationError)
    @app.errorhandler(InvalidInput)
    @app.errorhandler(UnverifiedValuesRefused)
    def _refused(exc: Exception):
        body = refusal_body(exc)
        return problem_response(**_as_arguments(body), headers=getattr(exc, "headers", None))

    @app.errorhandler(HTTPException)
    def _http(exc: HTTPException):
        headers = dict(exc.get_headers())
        return problem_response(exc.code or 500, exc.name, exc.description or exc.name, headers=headers)

    @app.errorhandler(Exception)
    def _unexpected(exc: Exception):
        return problem_response(**_as_arguments(internal_error_body(exc, debug=app.debug)))


def _as_arguments(body: dict) -> dict:
    """A problem body as problem_response's arguments."""
    out = dict(body)
    out["type_"] = out.pop("type")
    return out


def internal_error_body(exc: Exception, *, debug: bool = False) -> dict:
    """The problem of a fault of ours: logged with its traceback under an id
    the problem gives, for the caller to quote; its detail only in debug."""
    error_id = uuid.uuid4().hex
    log.exception("unhandled error %s", error_id, extra={"error_id": error_id}, exc_info=exc)
    detail = f"an internal error occurred; quote error id {error_id} when reporting it"
    if debug:
        detail += f" ({type(exc).__name__}: {exc})"
    return problem_body(500, "Internal Server Error", detail, error_id=error_id)
