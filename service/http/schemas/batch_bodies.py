"""The batch call: many calculations in one request, answered item by item."""
from __future__ import annotations

from marshmallow import fields, validate

from service.http.schemas.base_schema import Schema
from service.http.schemas.enums import BATCH_OPERATIONS
from service.http.schemas.fields import Boolean, BoundedList, Nested
from service.http.schemas.meta import ProblemSchema
from service.http.schemas.responses import CitationSchema, RegistryVersionSchema, ValueUsedSchema

# At most this many items in one batch (the body size limit still applies).
MAX_ITEMS = 100


class BatchItemRequestSchema(Schema):
    """One calculation: its operation and the body its own request would send."""

    operation = fields.String(required=True, validate=validate.OneOf(
        BATCH_OPERATIONS, error="Must be one of the batchable operations, the JSON calculations ({choices}); {input!r} is not one."),
        metadata={"x-enum-names": ["BatchOperation"], "description": "The operationId of a JSON calculation."})
    body = fields.Dict(required=True, metadata={
        "description": "The request body of that operation, as its own request would send it; loaded by that operation's schema."})


class BatchRequestSchema(Schema):
    items = BoundedList(Nested(BatchItemRequestSchema), required=True, min_items=1, max_items=MAX_ITEMS, metadata={
        "description": f"1 to {MAX_ITEMS} calculations, answered in this order."})
    strict = Boolean(metadata={"description": "Strict mode for every item (an item's body may also ask for it; a service running in "
                                              "strict mode is strict whatever this says)."})


class SharedValueSchema(ValueUsedSchema):
    """A value used by one or more items of the batch, listed once."""

    class Meta:
        exclude = ("pointer",)

    id = fields.String(required=True, metadata={"description": "The id the items' `values_used` refer to it by (valid in this answer only)."})
    source = fields.String(required=True, allow_none=True, metadata={"description": "The id of its source in the batch's `sources`; null for a caller's value."})


class BatchItemAnswerSchema(Schema):
    """One item's outcome: `answer` when `status` is 200, else `problem`."""

    index = fields.Integer(required=True, metadata={"description": "The item's place in the request's `items`, from 0."})
    operation = fields.String(required=True, metadata={"x-enum-names": ["BatchOperation"]})
    status = fields.Integer(required=True, metadata={"description": "200 for an answer; the status its own request would have had for a problem (422, or 500)."})
    answer = fields.Dict(metadata={"description": (
        "The operation's answer, as its own request's 200 answer (application/json) except that what the batch lists once is "
        "referred to: no `registry` (the batch's); `method.sources` are source ids of the batch's `sources`; `values_used` items are "
        "`{value, pointer}` referring to the batch's `values_used`; `cautions` holds only those beyond the batch's `cautions`. "
        "Sources inside a result (a compounding record's beyond-use date) stay as the operation gives them.")})
    problem = Nested(ProblemSchema, metadata={"description": (
        "The problem its own request would have been answered with: pointers relative to the item's body. A fault of the "
        "service's (500) carries the `error_id` of its log line.")})


class BatchAnswerSchema(Schema):
    registry = Nested(RegistryVersionSchema, required=True)
    cautions = fields.List(fields.String(), required=True, metadata={"description": "The cautions every answer of the batch carries."})
    sources = fields.List(Nested(CitationSchema), required=True, metadata={
        "description": "Each source the items' methods and values used cite, once."})
    values_used = fields.List(Nested(SharedValueSchema), required=True, metadata={
        "description": "Each value the items used, once, with its provenance."})
    items = fields.List(Nested(BatchItemAnswerSchema), required=True, metadata={"description": "One per request item, in order."})
    answered = fields.Integer(required=True, metadata={"description": "How many items have an answer."})
    refused = fields.Integer(required=True, metadata={"description": "How many items have a problem."})


# Published on BatchItemAnswer (service/http/spec.py): exactly one of the two.
ITEM_ONE_OF = [{"required": ["answer"], "not": {"required": ["problem"]}}, {"required": ["problem"], "not": {"required": ["answer"]}}]
