"""Health and the problem-details shape, for the spec."""
from __future__ import annotations

from marshmallow import fields

from service.http.schemas.base_schema import Schema
from service.http.schemas.enums import enum_field
from service.http.problems import MAX_ERRORS
from service.http.schemas.responses import RegistryVersionSchema


class HealthSchema(Schema):
    status = fields.String(required=True)
    registry = fields.Nested(RegistryVersionSchema, required=True)


class ReadySchema(Schema):
    status = fields.String(required=True, metadata={"description": "`ready`: the registry is loaded and calculations are answered."})
    registry = fields.Nested(RegistryVersionSchema, required=True)


class BindingConstraintSchema(Schema):
    kind = fields.String(required=True, metadata={"description": "fixed, lower_bound, upper_bound or ratio."})
    pointer = fields.String(required=True, metadata={"description": "The request field that states it; a member's own pointer for its natural bounds."})
    description = fields.String(required=True)
    given = fields.Boolean(required=True, metadata={"description": "false for the natural bounds of a share, 0 and 100 %."})


class ProblemItemSchema(Schema):
    pointer = fields.String(metadata={"description": "JSON pointer (URI-fragment form) to the offending field of the body."})
    parameter = fields.String(metadata={"description": "The offending query parameter."})
    rule = enum_field("RuleCode", metadata={"description": "The rule broken: one of the schema's, or one of the calculation's refusals."})
    detail = fields.String(required=True)
    suggestions = fields.List(fields.String(), metadata={
        "description": "For an unknown ingredient id (rule known_ingredient): the closest registry ids, best first; may be empty."})
    binding = fields.List(fields.Nested(BindingConstraintSchema), metadata={
        "description": "For a blend's constraints or target refused (constraints_consistent, target_reachable_under_constraints): "
                       "the constraints that bind at the nearest reachable point, the caller's first."})

    class Meta:
        unknown = "include"


class ProblemSchema(Schema):
    """RFC 9457 problem details. At most MAX_ERRORS (50) error items are listed, in the
    order found; when there were more, `errors_total` and `errors_omitted` say
    how many. Text echoed from the request (an unknown key, an id) has its
    control characters and lone surrogates written as `\\uXXXX`."""

    type = fields.String(required=True)
    title = fields.String(required=True)
    status = fields.Integer(required=True)
    detail = fields.String(required=True)
    errors = fields.List(fields.Nested(ProblemItemSchema), metadata={
        "maxItems": MAX_ERRORS, "description": f"Each fault, at most {MAX_ERRORS} (the first found)."})
    errors_total = fields.Integer(metadata={"description": "Present when errors were left out: how many faults were found in all."})
    errors_omitted = fields.Integer(metadata={"description": "Present when errors were left out: how many the list leaves out "
                                                  f"(errors_total less {MAX_ERRORS})."})
    error_id = fields.String(metadata={"description": "For a 500: the id of the error's log line, to quote when reporting it."})
    request_id = fields.String(metadata={"description": "The request's id, as in the X-Request-ID response header and every log line of the request."})
    suggestions = fields.List(fields.String(), metadata={"description": "For an unknown ingredient in the path: the closest registry ids, best first."})

    class Meta:
        unknown = "include"
