"""Each rule between request fields is written once (service/http/schemas/rules.py)
as a Python check and as the JSON Schema fragment the spec publishes: the two
must agree on every combination of the rule's fields. A fault of the trade
is not involved here; the reference is the JSON Schema 2020-12 validator of
the `jsonschema` library (PyPI)."""
from __future__ import annotations

import itertools

import jsonschema
import pytest

from service.http.spec import _rule_schemas
from service.http.schemas.estimate_bodies import METHODS

ABSENT = object()
# Values a field takes in the combinations: those that decide the rules.
CHOICES = {
    "qs": [True, False],
    "fixed": [[], [{}]],
    "method": list(METHODS) + ["other"],
    # Units of every kind, and figures at and beyond the bounds of each.
    "unit": ["g", "mg", "kg", "mL", "uL", "L", "gal", "g/mL", "kg/m3", "parts", "% w/w", "furlong"],
    "value": [1e-9, 1e-6, 1e-3, 0.05, 0.1, 1, 25, 100, 100.0001, 1e5, 1e6, 1e7, 5e9],
    "tests": [
        [{"hlb": 1, "score": 1}, {"hlb": 2, "score": 2}],
        [{"hlb": 1, "score": 1}, {"hlb": 2}],
        [{"hlb": 1, "passed": True}, {"hlb": 2, "score": 1}],
        [{"hlb": 1, "passed": True, "score": 1}, {"hlb": 2, "passed": False, "score": 1}],
    ],
}

CASES = [(name, i, rule) for name, cls in sorted(_rule_schemas().items()) for i, rule in enumerate(cls.RULES) if rule.fragment is not None]


@pytest.mark.parametrize(("schema", "index", "rule"), CASES, ids=[f"{n}-{i}-{r.code}" for n, i, r in CASES])
def test_published_fragment_agrees_with_the_check(schema, index, rule):
    names = rule.fields
    options = [[ABSENT] + CHOICES.get(n, [1]) for n in names]
    validator = jsonschema.Draft202012Validator(rule.fragment)
    for combo in itertools.product(*options):
        data = {n: v for n, v in zip(names, combo) if v is not ABSENT}
        assert validator.is_valid(data) == rule.holds(data), (schema, rule.code, data)


def test_every_rule_names_its_fields():
    for name, cls in _rule_schemas().items():
        for rule in cls.RULES:
            assert rule.fields and rule.at in rule.fields, (name, rule.code)
