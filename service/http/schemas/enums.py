"""Named enumerations of the API, each published once as a component of the
OpenAPI document, so that a generated client has one `EmulsionType`, one
`ValueStatus`, one `WarningCode`..., with readable member names
(`x-enum-varnames`) and each member's meaning (`x-enum-descriptions`).

A field refers to one with `enum_field(name)`; service/http/spec.py replaces
each such field by a `$ref` to its component."""
from __future__ import annotations

from dataclasses import dataclass

from marshmallow import fields, validate

from registry.model import FUNCTIONS, KINDS, PROPERTIES, STATUSES
from service.core import codes
from service.core.procedure import SET_BY
from service.units import DENSITY_UNITS, MASS_UNITS, RELATIVE_UNITS, VOLUME_UNITS
from service.usecases.provenance import ORIGINS
from service.http.schemas.fields import String

# The rules of a request's schema, as problem items name them; the
# calculation's own refusals are in service/core/codes.py.
SCHEMA_RULES = {
    "required": "The field is required.",
    "unknown_field": "The field is not part of the schema (request schemas refuse unknown fields).",
    "not_null": "The field may not be null.",
    "type": "The value has the wrong JSON type.",
    "enum": "The value is not one of those allowed.",
    "pattern": "The text does not have the form required.",
    "min_length": "Too short (a text or a list).",
    "max_length": "Too long (a text or a list).",
    "length": "Not of the length required.",
    "minimum": "Below the minimum.",
    "maximum": "Above the maximum.",
    "exclusive_minimum": "At or below the exclusive minimum.",
    "exclusive_maximum": "At or above the exclusive maximum.",
    "finite_number": "NaN and Infinity are refused: a finite number is required.",
    "exactly_one_of": "Give exactly one of two fields.",
    "at_most_one_of": "Give one of two fields, not both.",
    "at_least_one_of": "Give at least one of these fields.",
    "requires": "One field needs another.",
    "not_above": "A minimum must not exceed its maximum.",
    "not_without_pair": "Without a surfactant pair, the fixed surfactants are the whole emulsifier system: no total, estimate or target.",
    "required_by_method": "The HLB estimate method needs this field.",
    "not_used_by_method": "The HLB estimate method does not use this field.",
    "same_observation_kind": "Every test of a series carries the same kinds of observation.",
    "distinct_test_hlb": "Each test of a series has its own HLB.",
    "plausible_amount": "An amount is plausible for its unit (1 µg to 1000 kg, 1 µL to 1000 L, % w/w up to 100): otherwise a slip of unit.",
    "plausible_density": "A density is from 0.05 to 25 g/mL (restated in each unit): otherwise a slip of unit.",
    "plausible_equipment": "Equipment figures are plausible for their unit: otherwise a slip of unit.",
    "list_length": "A list holds the number of items allowed (checked before any item is).",
    "no_control_characters": "Text holds no control characters (C0, DEL, C1; tab and newline included).",
    "no_lone_surrogates": "Text holds no lone UTF-16 surrogate.",
    "schema": "Another rule of the schema.",
}

# The operations a batch may hold (operationIds, service/http/spec.py).
BATCH_OPERATIONS = ("blendHlb", "blendProportions", "oilPhaseRequiredHlb", "emulsifierMinimum", "emulsifierInterfaceEstimate", "solveBlend",
                    "createWorksheet", "rescaleWorksheet", "checkAmountsTaken", "createCompoundingRecord", "candidatePairs", "hlbEstimate",
                    "requiredHlbSeriesPlan", "requiredHlbSeriesEvaluate", "soapInPlace", "gumEmulsion")


@dataclass(frozen=True)
class Enum:
    values: tuple[str, ...]
    description: str
    names: dict[str, str] | None = None          # value -> member name, where the value is not one
    meanings: dict[str, str] | None = None       # value -> what it means


def _unit_names(tokens) -> dict[str, str]:
    return {t: t.upper().replace("/", "_PER_").replace(" ", "_").replace("%", "PERCENT") for t in tokens}


ENUMS = {
    "EmulsionType": Enum(("O/W", "W/O"), "Oil-in-water or water-in-oil.", {"O/W": "OIL_IN_WATER", "W/O": "WATER_IN_OIL"},
                         {"O/W": "Oil dispersed in water.", "W/O": "Water dispersed in oil."}),
    "MassUnit": Enum(tuple(MASS_UNITS), "A mass unit: metric, avoirdupois (lb, oz, gr) or apothecaries' (`_apoth`).", _unit_names(MASS_UNITS)),
    "VolumeUnit": Enum(tuple(VOLUME_UNITS), "A volume unit: metric, or US fluid measure.", _unit_names(VOLUME_UNITS)),
    "DensityUnit": Enum(tuple(DENSITY_UNITS), "A density unit.", _unit_names(DENSITY_UNITS)),
    "RelativeUnit": Enum(tuple(RELATIVE_UNITS), "A relative amount: parts, or % w/w of the formula.", {"parts": "PARTS", "% w/w": "PERCENT_W_W"},
                         {"parts": "Parts by weight of the whole given.", "% w/w": "Percent weight in weight of the formula."}),
    "ValueStatus": Enum(STATUSES + ("caller_supplied",), "How far a value has been checked.", None, {
        "unverified": "Not yet checked against the source it cites.",
        "checked_against_source": "Its figure was read in the source it cites, at the locator given.",
        "measured": "Measured in-house.",
        "caller_supplied": "Given by the caller; it carries no source."}),
    "ValueKind": Enum(KINDS, "The kind of source a value comes from."),
    "Origin": Enum(ORIGINS, "Where a value used came from.", None, {"registry": "The ingredient registry (shipped or site overlay).",
                                                                    "caller": "The request (inline values or an override)."}),
    "Property": Enum(PROPERTIES + ("davies_group_number",), "A property a value is recorded or used for: the registry's, and the Davies group numbers."),
    "IngredientFunction": Enum(tuple(FUNCTIONS), "What an ingredient does in a formula."),
    "WarningCode": Enum(tuple(codes.WARNINGS), "What a warning is about.", None, codes.WARNINGS),
    "CheckCode": Enum(tuple(codes.CHECKS), "What a check verifies.", None, codes.CHECKS),
    "QualityCheckCode": Enum(tuple(codes.QUALITY_CHECKS), "A quality check a compounding record leaves to record.", None, codes.QUALITY_CHECKS),
    "RuleCode": Enum(tuple(SCHEMA_RULES) + tuple(codes.REFUSALS),
                     "The rule a problem item names: a rule of the request's schema, or a refusal of the calculation.", None,
                     {**SCHEMA_RULES, **codes.REFUSALS}),
    "HeatingSetBy": Enum(tuple(SET_BY), "What set the processing temperature.", None, SET_BY),
    # Checked against service/http/operations.py's table by tests/api/test_batch.py.
    "BatchOperation": Enum(BATCH_OPERATIONS, "A calculation a batch may hold, by its operationId: the JSON calculations. Their text, PDF "
                           "and SVG forms, the registry's resources and the probes are not batchable."),
    "BlendObjective": Enum(("most_even", "least_ionic"), "How a blend's shares are chosen among the many that reach the target.", None, {
        "most_even": "The shares nearest to equal shares (least sum of squared deviations).",
        "least_ionic": "The least total share of ionic members; ties broken by most_even."}),
}


def enum_field(*names: str, request: bool = False, **kwargs) -> fields.String:
    """A string field whose values are those of the enums `names` (one, or a
    union such as the mass, volume and relative units of an amount):
    validated in a request, documented in an answer."""
    metadata = {"x-enum-names": list(names), **kwargs.pop("metadata", {})}
    if request:
        kwargs["validate"] = validate.OneOf([v for n in names for v in ENUMS[n].values])
    return String(metadata=metadata, **kwargs)


def publish(document: dict) -> None:
    """Every field marked with x-enum-names becomes a $ref (or an anyOf of
    refs) to the named components, which are added to the document."""
    used: set[str] = set()

    def visit(node):
        if isinstance(node, dict):
            names = node.pop("x-enum-names", None)
            if names is not None:
                used.update(names)
                refs = [{"$ref": f"#/components/schemas/{n}"} for n in names]
                nullable = isinstance(node.get("type"), list) and "null" in node["type"]
                for key in ("type", "enum"):
                    node.pop(key, None)
                if nullable:
                    refs.append({"type": "null"})
                if len(refs) == 1:
                    node.update(refs[0])
                else:
                    node["anyOf"] = refs
            for value in node.values():
                visit(value)
        elif isinstance(node, list):
            for value in node:
                visit(value)

    visit(document)
    schemas = document["components"]["schemas"]
    for name in sorted(used):
        schemas[name] = component(name)


def component(name: str) -> dict:
    e = ENUMS[name]
    out = {"type": "string", "enum": list(e.values), "description": e.description}
    out["x-enum-varnames"] = [(e.names or {}).get(v, v.upper()) for v in e.values]
    if e.meanings:
        out["x-enum-descriptions"] = [e.meanings.get(v, "") for v in e.values]
        out["description"] += "\n\n" + "\n".join(f"- `{v}`: {e.meanings.get(v, '')}" for v in e.values)
    return out


__all__ = ["ENUMS", "SCHEMA_RULES", "component", "enum_field", "publish"]
