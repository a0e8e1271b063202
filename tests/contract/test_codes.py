"""The code catalogue (service/core/codes.py) and the code base agree: every
warning, check and refusal code the service can emit is catalogued with its
meaning, and nothing catalogued is dead. The codes are read from the source
with Python's ast module, where they are written as literals."""
from __future__ import annotations

import ast
from pathlib import Path

from service.core import codes
from service.http.problems import MESSAGE_RULES
from service.http.spec import _rule_schemas
from service.http.schemas.enums import SCHEMA_RULES

SERVICE = Path(__file__).resolve().parents[2] / "service"
# Chosen by property at run time (resolution.py: KNOWN_RULES).
DYNAMIC_REFUSALS = {"hlb_known", "required_hlb_known"}


def literals() -> dict[str, set[str]]:
    found = {"check": set(), "warning": set(), "refusal": set(), "schema": set(), "quality": set()}
    for path in SERVICE.rglob("*.py"):
        if path.name == "codes.py":
            continue
        for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
            if isinstance(node, ast.Call):
                name = node.func.id if isinstance(node.func, ast.Name) else getattr(node.func, "attr", None)
                index, kind = {"Check": (0, "check"), "Finding": (0, "warning"), "CalculationError": (1, "refusal"),
                               "invalid": (1, "refusal"), "at": (1, "refusal"), "add": (1, "refusal"),
                               "Fault": (1, "schema"), "named": (0, "schema"),
                               "ConstraintsRefused": (1, "refusal")}.get(name, (None, None))
                if index is not None and len(node.args) > index and isinstance(node.args[index], ast.Constant):
                    found[kind].add(node.args[index].value)
            elif isinstance(node, ast.Dict):
                keys = {k.value: v for k, v in zip(node.keys, node.values) if isinstance(k, ast.Constant)}
                code = keys.get("code")
                if isinstance(code, ast.Constant) and isinstance(code.value, str):
                    found["quality" if "passed" in keys else "check" if "ok" in keys else "warning"].add(code.value)
                rule = keys.get("rule")
                if isinstance(rule, ast.Constant) and isinstance(rule.value, str):
                    found["refusal"].add(rule.value)
            elif isinstance(node, ast.Assign) and any(getattr(t, "id", None) == "PROVENANCE_RULES" for t in node.targets):
                found["warning"] |= {elt.elts[0].value for elt in node.value.elts}
    return found


def test_every_code_used_is_catalogued():
    used = literals()
    assert used["check"] - set(codes.CHECKS) == set()
    assert used["quality"] - set(codes.QUALITY_CHECKS) == set()
    assert used["warning"] - set(codes.WARNINGS) == set()
    assert (used["refusal"] | DYNAMIC_REFUSALS) - set(codes.REFUSALS) - set(SCHEMA_RULES) - {"target_outside_reachable_range"} == set()


def test_nothing_catalogued_is_unused():
    used = literals()
    assert set(codes.CHECKS) - used["check"] == set()
    assert set(codes.QUALITY_CHECKS) - used["quality"] == set()
    base_warnings = set(codes.FINDINGS) | set(codes.PROVENANCE_WARNINGS) | set(codes.ANSWER_WARNINGS)
    assert base_warnings - used["warning"] == set()
    # InfeasibleTarget sets its rule in its constructor's super() call.
    assert set(codes.REFUSALS) - used["refusal"] - DYNAMIC_REFUSALS - {"target_outside_reachable_range"} == set()


def test_every_schema_rule_is_catalogued():
    emitted = {r for _, r in MESSAGE_RULES} | {"schema"}
    emitted |= {rule.code for cls in _rule_schemas().values() for rule in cls.RULES}
    emitted |= literals()["schema"]
    assert emitted - set(SCHEMA_RULES) == set()
    assert set(SCHEMA_RULES) & set(codes.REFUSALS) == set(), "a code means one thing"


README = Path(__file__).resolve().parents[2] / "README.md"
START, END = "<!-- codes:start -->\n", "<!-- codes:end -->\n"


def codes_markdown() -> str:
    """The README's code tables, from the catalogue."""
    from service.http.schemas.enums import ENUMS

    out = []
    for name, title in (("WarningCode", "Warnings (`warnings[].code`)"), ("CheckCode", "Checks (`checks[].code`; a failed one is also warned as `check_<code>`)"),
                        ("QualityCheckCode", "Quality checks of a compounding record (`quality_checks[].code`)"),
                        ("RuleCode", "Rules (`errors[].rule` of a problem)")):
        e = ENUMS[name]
        out += [f"{title}:", "", "| code | meaning |", "|---|---|"]
        out += [f"| `{v}` | {e.meanings.get(v, '')} |" for v in e.values if not (name == "WarningCode" and v.startswith("check_"))]
        out.append("")
    return "\n".join(out)


def readme_block() -> str:
    text = README.read_text(encoding="utf-8")
    return text[text.index(START) + len(START):text.index(END)]


def test_readme_lists_every_code_with_its_meaning():
    assert readme_block() == codes_markdown(), "README's code tables are stale: run `python -m tests.contract.test_codes --write`"


if __name__ == "__main__":
    import sys

    if "--write" in sys.argv:
        text = README.read_text(encoding="utf-8")
        head, rest = text.split(START, 1)
        _, tail = rest.split(END, 1)
        README.write_text(head + START + codes_markdown() + END + tail, encoding="utf-8")
        print(f"wrote the code tables of {README}")


def test_enum_members_are_unique_and_named():
    from service.http.schemas.enums import ENUMS, component

    for name in ENUMS:
        c = component(name)
        assert len(set(c["enum"])) == len(c["enum"]), name
        assert len(set(c["x-enum-varnames"])) == len(c["x-enum-varnames"]), name
        assert all(v.isidentifier() and v.isupper() for v in c["x-enum-varnames"]), name
