"""Rules between the fields of one request object, each written once: as the
check the service runs, and as the JSON Schema fragment (or, where JSON
Schema cannot say it, the relation text) that the OpenAPI document publishes.

A schema lists its rules in `RULES`; `RuleChecks` runs them all and reports
every broken rule at once, each at its field with its rule code.
tests/contract/test_rules.py checks, for every rule, that the Python check and
the published fragment agree on every combination of its fields."""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Callable

from marshmallow import ValidationError, validates_schema

from service.http.schemas.base_schema import Schema


class Fault(str):
    """A validation message that carries its rule code into the problem."""

    rule: str

    def __new__(cls, message: str, rule: str) -> "Fault":
        self = super().__new__(cls, message)
        self.rule = rule
        return self

    @classmethod
    def named(cls, rule: str, message: str) -> "Fault":
        return cls(message, rule)


@dataclass(frozen=True)
class Rule:
    code: str                       # the `rule` member of the problem item
    at: str                         # the field the fault is reported at
    message: str | Callable[[dict], str]
    holds: Callable[[dict], bool]
    fragment: dict | None = None    # JSON Schema the object must also match
    relation: str | None = None     # a relation JSON Schema cannot express
    fields: tuple[str, ...] = field(default=())


def _present(data: dict, name: str) -> bool:
    return name in data


def exactly_one(a: str, b: str, message: str | None = None) -> Rule:
    return Rule("exactly_one_of", a, message or f"Give exactly one of '{a}' or '{b}'.",
                lambda d: _present(d, a) != _present(d, b),
                {"oneOf": [{"required": [a]}, {"required": [b]}]}, fields=(a, b))


def at_most_one(a: str, b: str, message: str | None = None) -> Rule:
    return Rule("at_most_one_of", b, message or f"Give '{a}' or '{b}', not both.",
                lambda d: not (_present(d, a) and _present(d, b)),
                {"not": {"required": [a, b]}}, fields=(a, b))


def at_least_one(*names: str, message: str) -> Rule:
    return Rule("at_least_one_of", names[0], message, lambda d: any(_present(d, n) for n in names),
                {"anyOf": [{"required": [n]} for n in names]}, fields=names)


def requires(a: str, b: str, message: str) -> Rule:
    return Rule("requires", b, message, lambda d: not _present(d, a) or _present(d, b),
                {"dependentRequired": {a: [b]}}, fields=(a, b))


def not_above(low: str, high: str, message: str | None = None) -> Rule:
    text = f"`{low}` must not exceed `{high}`."
    return Rule("not_above", low, message or f"{low} must not exceed {high}.",
                lambda d: not (_present(d, low) and _present(d, high)) or d[low] <= d[high],
                relation=text, fields=(low, high))


def share_or_flag(share: str, flag: str) -> Rule:
    """Exactly one of `share`, or `flag: true` (a false flag counts as absent)."""
    flagged = {"required": [flag], "properties": {flag: {"const": True}}}
    return Rule("exactly_one_of", share, f"Give exactly one of '{share}' or '{flag}': true.",
                lambda d: _present(d, share) != bool(d.get(flag)),
                {"oneOf": [{"required": [share]}, flagged]}, fields=(share, flag))


def within_unit_bounds(code: str, bounds: dict[str, tuple[float, float]], what: str) -> Rule:
    """`value` within the bounds of its `unit` (bounds by unit token, in that
    unit): a figure outside is taken for a slip of unit and refused."""

    def holds(d: dict) -> bool:
        if "unit" not in d or "value" not in d or d["unit"] not in bounds:
            return True
        low, high = bounds[d["unit"]]
        return low <= d["value"] <= high

    def message(d: dict) -> str:
        low, high = bounds[d["unit"]]
        return f"{d['value']:g} {d['unit']} is not a plausible {what} (from {low:g} to {high:g} {d['unit']}): check the unit."

    branches = [{"required": ["unit"], "properties": {"unit": {"const": unit}, "value": {"minimum": low, "maximum": high}}}
                for unit, (low, high) in bounds.items()]
    # A missing or unknown unit is the unit field's own fault, not this rule's.
    branches.append({"not": {"required": ["unit"]}})
    branches.append({"required": ["unit"], "properties": {"unit": {"not": {"enum": list(bounds)}}}})
    return Rule(code, "value", message, holds, {"oneOf": branches}, fields=("value", "unit"))


def _loaded(rule: Rule, data: dict, original) -> bool:
    """Whether every field of the rule loaded as sent: a field that failed is
    missing from `data`, and the rule is then not judged."""
    if not isinstance(original, dict):
        return False
    return all((name in original) == (name in data) for name in rule.fields)


def _holds(rule: Rule, data: dict) -> bool:
    """A rule over fields that did not load (left out of `data`, or partly
    loaded) is not judged: the field's own fault is reported instead."""
    try:
        return rule.holds(data)
    except (KeyError, TypeError, AttributeError):
        return True


class RuleChecks(Schema):
    """Runs the schema's RULES after its fields are valid; every broken rule is
    reported, not only the first."""

    RULES: tuple[Rule, ...] = ()

    # Run beside the fields' own faults, so that a request's every fault comes
    # in one answer; a rule over a field that failed is judged on what loaded.
    @validates_schema(skip_on_field_errors=False, pass_original=True)
    def _rules(self, data, original, **kwargs):
        faults: dict[str, list] = {}
        for rule in type(self).RULES:
            if not _loaded(rule, data, original):
                continue
            if not _holds(rule, data):
                message = rule.message(data) if callable(rule.message) else rule.message
                faults.setdefault(rule.at, []).append(Fault(message, rule.code))
        if faults:
            raise ValidationError(faults)


def published(schema_class: type) -> tuple[list[dict], list[str]]:
    """The fragments and relation texts of a schema's rules, for the spec."""
    rules = getattr(schema_class, "RULES", ())
    return [r.fragment for r in rules if r.fragment is not None], [r.relation for r in rules if r.relation]


__all__ = ["Fault", "Rule", "RuleChecks", "at_least_one", "at_most_one", "exactly_one", "not_above", "published", "requires", "share_or_flag", "within_unit_bounds"]
