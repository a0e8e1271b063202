"""schemathesis hooks for this API, loaded by the in-process run
(test_schemathesis.py) and by the run over HTTP (SCHEMATHESIS_HOOKS=
tests.contract.schemathesis_hooks).

1. Relations the spec states in `x-relations` because JSON Schema cannot
   (a minimum not above its maximum; distinct test HLBs) are kept out of the
   generated data, as the spec tells a client to (in the fuzzing phase; a
   relation the coverage phase breaks is answered 422 naming it, and allowed).
2. A check that keeps positive_data_acceptance meaningful: the configuration
   lets a valid request be answered 422, since a calculation may refuse valid
   input (a target out of reach, an unverified value in strict mode, an
   unknown ingredient id); this check fails any such 422 whose items name a
   rule of the schema, so that no rule the schema could state is left out of it."""
from __future__ import annotations

import schemathesis

from service.core.codes import REFUSALS
from service.http.schemas.enums import SCHEMA_RULES
from service.http.spec import _rule_schemas

# Rules that schema-valid data can still meet: the calculation's refusals,
# and the relations the spec states in x-relations (the coverage phase builds
# its cases without the filter hooks below). plausible_density and
# plausible_equipment are schema rules (bounds per unit) that the use cases
# also enforce for callers other than HTTP: schema-valid data never meets them.
RELATION_RULES = {rule.code for cls in _rule_schemas().values() for rule in cls.RULES if rule.relation}
CALCULATION_RULES = set(REFUSALS) | {"target_outside_reachable_range"} | RELATION_RULES


def _breaks_a_relation(node) -> bool:
    if isinstance(node, dict):
        low, high = node.get("low"), node.get("high")
        if isinstance(low, (int, float)) and isinstance(high, (int, float)) and low > high:
            return True
        tests = node.get("tests")
        if isinstance(tests, list):
            hlbs = [t.get("hlb") for t in tests if isinstance(t, dict)]
            if len(hlbs) != len(set(map(repr, hlbs))):
                return True
        return any(_breaks_a_relation(v) for v in node.values())
    if isinstance(node, list):
        return any(_breaks_a_relation(v) for v in node)
    return False


@schemathesis.hook
def filter_body(ctx, body):
    return not _breaks_a_relation(body)


@schemathesis.hook
def filter_query(ctx, query):
    if not isinstance(query, dict):
        return True
    low, high = query.get("hlb_min"), query.get("hlb_max")
    try:
        return low is None or high is None or float(low) <= float(high)
    except (TypeError, ValueError):
        return True


@schemathesis.check
def refused_only_by_the_calculation(ctx, response, case):
    meta = case.meta
    if meta is None or not meta.generation.mode.is_positive or response.status_code != 422:
        return None
    items = response.json().get("errors") or []
    schema_rules = sorted({item.get("rule") for item in items} - CALCULATION_RULES)
    if schema_rules:
        raise AssertionError(f"schema-valid data refused by rules of the schema: {', '.join(map(str, schema_rules))}; "
                             "the spec must state them")
    return None


__all__ = ["SCHEMA_RULES", "filter_body", "filter_query", "refused_only_by_the_calculation"]
