"""The OpenAPI 3.1 document, built from the marshmallow schemas.

The app builds it once at start and serves it at /openapi.json; the committed
copy in openapi/openapi.json is rewritten with `emulsion-spec --write` (or
`python -m service.http.spec --write`), and a test fails when the two differ."""
from __future__ import annotations

import argparse
import json
import sys
from pathlib import Path

from service.http import answer_examples
from service.http.access import OPEN_PATHS
from service.http.spec_examples import EXAMPLES, PATH_EXAMPLES, QUERY_EXAMPLES
from service.http.schemas import calculation_requests as calculations, estimate_bodies as estimates, ingredient_bodies as ingredients, meta
from service.http.schemas import soap_bodies as soap_schemas
from service.http.schemas import amounts_taken_bodies as taken, record_bodies as records, responses as answers, worksheet_bodies as worksheets
from service.http.schemas.fields import Boolean, Number, QueryNumber
from service.http.schemas import batch_bodies, blend_bodies, interface_bodies
from service.http.schemas.enums import publish as publish_enums
from service.http.schemas.rules import RuleChecks, published
from service.http.jsonio import INDENT_PARAMETER as INDENT_PARAMETER_NAME, MAX_INDENT
from service.http.logs import REQUEST_ID_PATTERN

SPEC_PATH = Path(__file__).resolve().parents[2] / "openapi" / "openapi.json"
VERSION = "0.1.0"

DESCRIPTION = (
    "Emulsion formulation calculations by the HLB system, on a curated ingredient registry with provenance. "
    "Every calculation answer carries the method and its sources, the values used with their provenance, "
    "warnings and cautions. Results are decision aids for a qualified pharmacist; local regulations and "
    "compounding standards come first. "
    "A deployment may require a bearer token (Authorization: Bearer <token>) on every operation but the probes and "
    "this document, and answers 401 without one; a service run on one machine, as shipped, requires none."
)

# The scheme every operation but the probes declares. The empty requirement
# beside it says that a deployment may run without tokens (the default):
# the document describes the service however it is configured.
SECURITY_SCHEME = {
    "type": "http", "scheme": "bearer",
    "description": "A token the deployment configured (EMULSION_API_TOKENS_FILE or EMULSION_API_TOKENS); "
                   "without any configured, no token is asked for.",
}
SECURITY = [{"bearerAuth": []}, {}]

PROBLEM = {"application/problem+json": {"schema": {"$ref": "#/components/schemas/Problem"}}}
ERRORS = {
    "400": "The body is not strict JSON.",
    "401": "No bearer token, or one the deployment does not accept; only where the deployment requires tokens.",
    "404": "No such resource.",
    "405": "Method not allowed on this path; the Allow header lists those that are.",
    "411": "A body was sent without Content-Length (chunked bodies are refused).",
    "413": "The body is too large.",
    "406": "None of the media types the request accepts is offered (application/json, text/markdown, text/plain; application/pdf for a compounding record; "
           "application/json or image/svg+xml only for a required-HLB series' read-back).",
    "415": "The body is not application/json.",
    "422": "The input broke a rule of the schema or of the calculation; each fault is named by pointer and rule. Every unknown or "
           "retired ingredient id is named at once, an unknown one with the closest ids in `suggestions`.",
}
BODY_ERRORS = ("400", "405", "411", "413", "415", "422")
SHEET_ERRORS = ("400", "405", "406", "411", "413", "415", "422")
GET_ERRORS = ("405",)
# Operations that also answer application/pdf.
PDF_OPERATIONS = ("createCompoundingRecord",)
# Operations that answer JSON or an SVG plot (and no text form).
SVG_OPERATIONS = ("requiredHlbSeriesEvaluate",)

# (path, method, operationId, summary, description, request schema, query schema, answer schema, errors, tag)
OPERATIONS = [
    ("/v1/blends/hlb", "post", "blendHlb", "HLB of a surfactant blend",
     "Mass-weighted mean HLB of two or more surfactants. Amounts may be masses, volumes (converted with each "
     "ingredient's density) or relative (parts, or % w/w of the formula).",
     calculations.BlendRequestSchema, None, answers.BlendAnswerSchema, BODY_ERRORS, "calculations"),
    ("/v1/blends/proportions", "post", "blendProportions", "Proportions of a surfactant pair for a target HLB",
     "Solves the shares of two surfactants that give a target HLB, optionally beside further surfactants at fixed "
     "shares, and optionally scaled to a total mass or volume. A target outside the reachable range is a 422 that "
     "names the range.",
     calculations.SplitRequestSchema, None, answers.SplitAnswerSchema, BODY_ERRORS, "calculations"),
    ("/v1/oil-phases/required-hlb", "post", "oilPhaseRequiredHlb", "Required HLB of an oil phase",
     "Mass-weighted mean of the oil-phase ingredients' required HLB for an O/W or W/O emulsion, with the range "
     "the result spans where sources disagree.",
     calculations.RequiredHlbRequestSchema, None, answers.RequiredHlbAnswerSchema, BODY_ERRORS, "calculations"),
    ("/v1/emulsifier/minimum", "post", "emulsifierMinimum", "Minimum emulsifier estimate",
     "An empirical estimate of the least emulsifier, in g per 100 g of emulsion, rounded up; optionally for a "
     "batch, rounded up to a weighable amount.",
     calculations.MinimumEmulsifierRequestSchema, None, answers.MinimumEmulsifierAnswerSchema, BODY_ERRORS, "calculations"),
    ("/v1/worksheets", "post", "createWorksheet", "Batch worksheet",
     "From a formula and a batch size to every quantity to weigh or measure: the oil phase's required HLB, the emulsifier "
     "pair's proportions (given or proposed), each ingredient's % w/w, mass and volume rounded to the equipment, the q.s. "
     "amount, and checks of measurability, HLB, ionic compatibility and emulsifier level. JSON, or the same worksheet as "
     "text with Accept: text/markdown or text/plain.",
     worksheets.WorksheetRequestSchema, None, worksheets.WorksheetAnswerSchema, SHEET_ERRORS, "worksheets"),
    ("/v1/worksheets/rescale", "post", "rescaleWorksheet", "Rescale a worksheet",
     "The worksheet for another batch size; every share keeps the % w/w it had in the original.",
     worksheets.RescaleRequestSchema, None, worksheets.WorksheetAnswerSchema, SHEET_ERRORS, "worksheets"),
    ("/v1/worksheets/amounts-taken", "post", "checkAmountsTaken", "Check the amounts taken for a worksheet",
     "The amounts actually weighed or measured for a batch, against the worksheet recomputed from its request: each row's deviation "
     "from its unrounded target against the equipment's acceptable error, a mass below the balance's minimum weighable quantity "
     "flagged, the rows not taken, the batch total, the final weight and the yield, and whether the record may pass to the checking "
     "pharmacist, with every reason it may not. Nothing is stored. JSON, or the same record as text with Accept: text/markdown or text/plain.",
     taken.AmountsTakenRequestSchema, None, taken.AmountsTakenAnswerSchema, SHEET_ERRORS, "worksheets"),
    ("/v1/compounding-records", "post", "createCompoundingRecord", "Compounding record",
     "The worksheet with what the pharmacy adds (the preparation, each component's supplier, lot and expiry, the compounding date "
     "and the people), made into a nonsterile compounding record: the beyond-use date by USP <795>'s default categories (never later "
     "than the earliest component expiry), the procedure in steps, the label text, the quality checks to record, and the chapter's "
     "required elements with what is still to fill. JSON, or the same record as text/markdown, text/plain or application/pdf "
     "(A4 or US Letter). Nothing is stored.",
     records.RecordRequestSchema, None, records.RecordAnswerSchema, SHEET_ERRORS, "worksheets"),
    ("/v1/candidate-pairs", "post", "candidatePairs", "Candidate surfactant pairs",
     "Registry pairs that reach a target HLB (or an oil phase's required HLB), ranked: one fatty-chain family first, "
     "balanced proportions, nonionic before ionic; filterable by ionic class.",
     worksheets.CandidateRequestSchema, None, worksheets.CandidateAnswerSchema, BODY_ERRORS, "worksheets"),
    ("/v1/hlb-estimates", "post", "hlbEstimate", "HLB estimated from composition",
     "Griffin's formulas (20·Mh/M; 20(1 − S/A); (E + P)/5), for nonionics only, or Davies' group contributions from the "
     "registry's group numbers. Molar masses may be given or computed from molecular formulas. Input outside a method's scope "
     "is refused with the reason.",
     estimates.HlbEstimateRequestSchema, None, estimates.HlbEstimateAnswerSchema, BODY_ERRORS, "estimates"),
    ("/v1/required-hlb-series/plan", "post", "requiredHlbSeriesPlan", "Plan a required-HLB test series",
     "Test emulsions of an oil with blends of one surfactant pair across an HLB range: each test's HLB and the quantities of "
     "every component, checked for measurability.",
     estimates.SeriesPlanRequestSchema, None, estimates.SeriesPlanAnswerSchema, BODY_ERRORS, "estimates"),
    ("/v1/required-hlb-series/evaluate", "post", "requiredHlbSeriesEvaluate", "Read a required-HLB test series",
     "From each test's score, pass/fail or droplet size: the oil's estimated required HLB (the best test, refined by a fit "
     "through its neighbours), how well the tests pin it down, and a finer series to run next. JSON, or with Accept: image/svg+xml "
     "a plot of it: each test's observation against its HLB, the refining parabola, and the estimate with its uncertainty band.",
     estimates.SeriesEvaluateRequestSchema, None, estimates.SeriesEvaluateAnswerSchema, SHEET_ERRORS, "estimates"),
    ("/v1/davies-groups", "get", "listDaviesGroups", "Davies group numbers",
     "The group numbers Davies' method uses, with their sources and status.",
     None, None, estimates.DaviesGroupListSchema, GET_ERRORS, "registry"),
    ("/v1/soaps/in-place", "post", "soapInPlace", "Soap made in place",
     "A fatty acid (or the free acids of a wax) partly neutralised in the batch by triethanolamine, potassium or sodium hydroxide, or "
     "borax: from its acid value (the registry's or the request's) and the fraction to neutralise (or the alkali's mass), the alkali "
     "to weigh, the soap formed, the free acid left and the coproducts (water, boric acid). The soap is an anionic emulsifier.",
     soap_schemas.SoapRequestSchema, None, soap_schemas.SoapAnswerSchema, BODY_ERRORS, "calculations"),
    ("/v1/gum-emulsions", "post", "gumEmulsion", "Gum (acacia) emulsion",
     "The primary emulsion for an amount of oil by kind of oil (fixed 4:2:1, mineral 3:2:1, volatile 2:2:1 oil : water : gum, "
     "common practice), the dry-gum and wet-gum methods as steps, and the rest of the water to a final volume (q.s.) or mass.",
     soap_schemas.GumEmulsionRequestSchema, None, soap_schemas.GumEmulsionAnswerSchema, BODY_ERRORS, "calculations"),
    ("/v1/ingredients", "get", "listIngredients", "List ingredients",
     "Current ingredients in the registry, sorted by name, with their preferred figures: searched with `q` (a case-insensitive "
     "part of a name, synonym or id), and filtered by role, function, ionic class and HLB range.",
     None, ingredients.IngredientQuerySchema, ingredients.IngredientListSchema, ("405", "422"), "registry"),
    ("/v1/ingredients/{ingredient_id}", "get", "getIngredient", "One ingredient with every value and its provenance",
     "Every recorded value of the ingredient, with its source, locator, status and notes. An unknown id is a 404 whose "
     "`suggestions` hold the closest ids.",
     None, None, ingredients.IngredientAnswerSchema, ("404", "405"), "registry"),
    ("/v1/sources", "get", "listSources", "The bibliography", "Every source the registry and the methods cite.",
     None, None, ingredients.SourceListSchema, GET_ERRORS, "registry"),
    ("/healthz", "get", "healthz", "Liveness", "200 while the service runs, with the registry version it serves.",
     None, None, meta.HealthSchema, GET_ERRORS, "service"),
    ("/readyz", "get", "readyz", "Readiness",
     "200 once the registry is loaded, with the registry version served. The service binds its port only after loading "
     "the registry, and refuses to start on a broken one, so an answer is always 200.",
     None, None, meta.ReadySchema, GET_ERRORS, "service"),
    ("/v1/blends/solve", "post", "solveBlend", "Shares of three or more surfactants for a target HLB, under constraints",
     "Solves the shares of two or more surfactants (registry ids or inline) that reach a target HLB under the caller's constraints: "
     "a member fixed at a share, a ratio between two members, bounds on each member's share; optionally scaled to a total mass or "
     "volume. Among the many answers the objective chooses one: most_even (nearest to equal shares, the default) or least_ionic. "
     "The answer gives each share, the HLB reached (recomputed), the reachable range under the constraints and which constraints are "
     "active. Constraints that cannot hold, or a target out of reach under them, are a 422 naming the nearest reachable HLB and the "
     "constraints that bind there, in words and by pointer.",
     blend_bodies.BlendSolveRequestSchema, None, blend_bodies.BlendSolveAnswerSchema, BODY_ERRORS, "calculations"),
    ("/v1/emulsifier/interface-estimate", "post", "emulsifierInterfaceEstimate", "Emulsifier estimated from the interface",
     "The emulsifier one saturated monolayer on the droplets takes (area 6·V/d32 over each surfactant's area per molecule, in moles "
     "by the Avogadro constant, in grams by the molar mass), plus what stays dissolved in the continuous phase up to the CMC where it "
     "is known; the droplet size as a Sauter mean d32 or a number distribution; a blend by mole fractions. With a required HLB, the "
     "practice formula's minimum (as POST /v1/emulsifier/minimum) for the same emulsion is given beside it, each with its assumptions. "
     "Areas per molecule, molar masses and CMCs come from the registry or the request.",
     interface_bodies.InterfaceEstimateRequestSchema, None, interface_bodies.InterfaceEstimateAnswerSchema, BODY_ERRORS, "calculations"),
    ("/v1/batch", "post", "batch", "Many calculations in one request",
     f"Up to {batch_bodies.MAX_ITEMS} calculations of any of the JSON operations (BatchOperation: each item its `operation`, an operationId, "
     "and the `body` its own request would send; the body size limit still applies), answered in order: each item its answer, or the "
     "problem its own request would have had (pointers relative to the item's body, and its status), none failing the others. The "
     "registry version, the cautions every answer carries, and the sources and values used are listed once for the batch; each item's "
     "answer refers to them by id. The batch is answered 200 whenever it is well formed; an unknown or unbatchable operation (a text, "
     "PDF or SVG form, a registry resource) is a 422 naming the item's pointer. `strict` applies to every item. Answers are compact JSON.",
     batch_bodies.BatchRequestSchema, None, batch_bodies.BatchAnswerSchema, BODY_ERRORS, "calculations"),
]

# Every answer carries the request's id; a caller may choose it.
REQUEST_ID_PARAMETER = {
    "in": "header", "name": "X-Request-ID", "required": False, "example": "order-2291.line-3",
    # No pattern in the schema: a value outside it is replaced, not refused.
    "description": "An id for this request, kept when it is 1 to 128 characters of A-Z, a-z, 0-9, `.`, `_` and `-` "
                   f"({REQUEST_ID_PATTERN}); any other value is replaced by a generated one. It comes back in the "
                   "X-Request-ID response header, in every log line of the request and as `request_id` in a problem.",
    "schema": {"type": "string"},
}
# Every JSON answer and problem is compact unless a person asks for it laid out.
INDENT_PARAMETER = {
    "in": "query", "name": INDENT_PARAMETER_NAME, "required": False, "example": 2,
    "description": f"Spaces of indentation for a JSON answer or problem, 1 to {MAX_INDENT}, for reading at a terminal "
                   "(`?indent=2`); 0 or absent gives compact JSON. Any other value is refused (422, naming `indent`). "
                   "Markdown, text, PDF and SVG answers and the OpenAPI document are not affected.",
    "schema": {"type": "integer", "minimum": 0, "maximum": MAX_INDENT},
}
REQUEST_ID_RESPONSE_HEADER = {
    "description": "The request's id: the caller's X-Request-ID when it was kept, else a generated one (32 hex digits).",
    "required": True, "schema": {"type": "string", "pattern": REQUEST_ID_PATTERN},
}


def build_spec() -> dict:
    """The OpenAPI document as a plain dict (deterministic for a given code
    and the recorded response examples). Built on the first request for
    the document (service/http/app.py), not at start: apispec is loaded then."""
    from apispec import APISpec
    from apispec.ext.marshmallow import MarshmallowPlugin

    answers_recorded = answer_examples.load()
    plugin = MarshmallowPlugin()
    spec = APISpec(
        title="Emulsion formulation service",
        version=VERSION,
        openapi_version="3.1.0",
        plugins=[plugin],
        info={"description": DESCRIPTION, "license": {"name": "MIT", "identifier": "MIT"}},
    )
    plugin.map_to_openapi_type(Number, "number", None)
    plugin.map_to_openapi_type(QueryNumber, "number", None)
    plugin.map_to_openapi_type(Boolean, "boolean", None)
    spec.components.schema("Problem", schema=meta.ProblemSchema)
    spec.components.security_scheme("bearerAuth", SECURITY_SCHEME)
    for path, method, op_id, summary, description, body, query, out, errors, tag in OPERATIONS:
        operation: dict = {
            "operationId": op_id, "summary": summary, "description": description, "tags": [tag],
            "responses": {"200": {"description": "OK", "content": {"application/json": {"schema": out}}}},
        }
        if "406" in errors and op_id not in SVG_OPERATIONS:
            operation["responses"]["200"]["content"].update({"text/markdown": {"schema": {"type": "string"}}, "text/plain": {"schema": {"type": "string"}}})
        if op_id in PDF_OPERATIONS:
            operation["responses"]["200"]["content"]["application/pdf"] = {"schema": {"type": "string", "contentMediaType": "application/pdf"}}
        if op_id in SVG_OPERATIONS:
            operation["responses"]["200"]["content"]["image/svg+xml"] = {"schema": {"type": "string", "contentMediaType": "image/svg+xml"}}
        for media, named in answers_recorded.get(op_id, {}).items():
            operation["responses"]["200"]["content"][media]["examples"] = named
        if body is not None:
            content = {"schema": body}
            if op_id in EXAMPLES:
                content["examples"] = EXAMPLES[op_id]
            operation["requestBody"] = {"required": True, "content": {"application/json": content}}
        parameters = [REQUEST_ID_PARAMETER, INDENT_PARAMETER]
        if "422" not in errors:
            errors = (*errors, "422")
        if query is not None:
            parameters.append({"in": "query", "schema": query})
        if "{ingredient_id}" in path:
            parameters.append({"in": "path", "name": "ingredient_id", "required": True, "example": PATH_EXAMPLES[op_id]["ingredient_id"],
                               "schema": {"type": "string", "minLength": 1, "maxLength": 200}})
        operation["parameters"] = parameters
        for code in errors:
            response = {"description": ERRORS[code], "content": PROBLEM}
            if code == "405":
                response["headers"] = {"Allow": {"description": "The methods this path allows.", "schema": {"type": "string"}}}
            operation["responses"][code] = response
        if path in OPEN_PATHS:
            operation["security"] = []
        else:
            operation["security"] = SECURITY
            operation["responses"]["401"] = {"description": ERRORS["401"], "content": PROBLEM, "headers": {"WWW-Authenticate": {
                "description": 'The challenge: Bearer realm="emulsion", with error="invalid_token" when a token was refused.',
                "schema": {"type": "string"}}}}
        for response in operation["responses"].values():
            response["headers"] = {**response.get("headers", {}), "X-Request-ID": REQUEST_ID_RESPONSE_HEADER}
        if query is not None:
            _publish_query_relations(operation, query)
        spec.path(path=path, operations={method: operation})
    document = spec.to_dict()
    _query_examples(document)
    _publish_rules(document["components"]["schemas"])
    document["components"]["schemas"]["BatchItemAnswer"]["oneOf"] = batch_bodies.ITEM_ONE_OF
    publish_enums(document)
    _open_answers(document)
    return document


def _refs(node, found: set[str]) -> set[str]:
    if isinstance(node, dict):
        ref = node.get("$ref", "")
        if ref.startswith("#/components/schemas/"):
            found.add(ref.rsplit("/", 1)[1])
        for value in node.values():
            _refs(value, found)
    elif isinstance(node, list):
        for value in node:
            _refs(value, found)
    return found


def _closure(names: set[str], schemas: dict) -> set[str]:
    todo, seen = list(names), set()
    while todo:
        name = todo.pop()
        if name not in seen:
            seen.add(name)
            todo.extend(_refs(schemas[name], set()) - seen)
    return seen


def _open_answers(document: dict) -> None:
    """Answers may grow (the compatibility rule of /v1): a schema used only in
    answers does not forbid further members; request schemas still do."""
    schemas = document["components"]["schemas"]
    requests: set[str] = set()
    for operations in document["paths"].values():
        for operation in operations.values():
            _refs(operation.get("requestBody", {}), requests)
            _refs(operation.get("parameters", []), requests)
    in_requests = _closure(requests, schemas)
    for name, schema in schemas.items():
        if name not in in_requests and schema.get("additionalProperties") is False:
            del schema["additionalProperties"]


def _query_examples(document: dict) -> None:
    """A request example for the operations whose request is a query."""
    for operations in document["paths"].values():
        for operation in operations.values():
            example = QUERY_EXAMPLES.get(operation["operationId"], {})
            for parameter in operation.get("parameters", []):
                if parameter["in"] == "query" and parameter["name"] in example:
                    parameter["example"] = example[parameter["name"]]


def _rule_schemas() -> dict[str, type]:
    """Every request schema with rules between its fields, by component name."""
    found, todo = {}, list(RuleChecks.__subclasses__())
    while todo:
        cls = todo.pop()
        todo.extend(cls.__subclasses__())
        name = cls.__name__.removesuffix("Schema")
        found[name] = cls
    return found


def _relations_text(relations: list[str]) -> str:
    return "Also (not expressible in JSON Schema, checked by the service): " + " ".join(relations)


def _publish_rules(components: dict) -> None:
    """Each schema's rules between fields: as `allOf` fragments where JSON
    Schema can say them, and as `x-relations` and description text where not."""
    for name, cls in _rule_schemas().items():
        if name not in components:
            continue
        fragments, relations = published(cls)
        if fragments:
            components[name]["allOf"] = fragments
        if relations:
            components[name]["x-relations"] = relations
            described = components[name].get("description", "")
            components[name]["description"] = (described + " " if described else "") + _relations_text(relations)


def _publish_query_relations(operation: dict, query) -> None:
    fragments, relations = published(query)
    if relations:
        operation["x-relations"] = relations
        operation["description"] += " " + _relations_text(relations)


def spec_json(spec: dict) -> str:
    return json.dumps(spec, indent=2, sort_keys=True, ensure_ascii=False) + "\n"


def document(app) -> tuple[dict, str]:
    """(the OpenAPI document, its JSON text), built once per process on
    first need. Two threads may both build it: the same document, kept once."""
    built = app.extensions.get("openapi")
    if built is None:
        spec = build_spec()
        built = app.extensions.setdefault("openapi", (spec, spec_json(spec)))
    return built


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description="Print or write the OpenAPI document.")
    parser.add_argument("--write", action="store_true", help=f"record the response examples and write the document to {SPEC_PATH}")
    args = parser.parse_args(argv)
    if args.write:
        # The answers are recorded on the shipped registry, whatever the
        # environment says, so that the committed examples do not depend on it.
        from registry import DEFAULT_ROOT
        from service.http.app import create_app

        app = create_app({"registry_root": str(DEFAULT_ROOT), "site_overlay": None, "strict": False})
        answer_examples.RESPONSE_EXAMPLES_PATH.write_text(answer_examples.examples_json(answer_examples.record(app)), encoding="utf-8")
        print(f"wrote {answer_examples.RESPONSE_EXAMPLES_PATH}")
    text = spec_json(build_spec())
    if args.write:
        SPEC_PATH.write_text(text, encoding="utf-8")
        print(f"wrote {SPEC_PATH}")
    else:
        sys.stdout.write(text)
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
