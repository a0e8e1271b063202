"""What each ingredient does in a formula ([functions]), and values flagged
doubtful: the shipped data, the loader's refusals, and the schema, model and
FIELDS.md saying the same thing."""
from __future__ import annotations

import json
import re
import shutil
from pathlib import Path

import pytest

from registry import DEFAULT_ROOT, FunctionsRecord, RegistryError, load_registry
from registry.loader import SCHEMA_DIR
from registry.model import FUNCTIONS

OVERLAY = Path(__file__).resolve().parents[1] / "fixtures" / "site-overlay"
FIELDS_MD = DEFAULT_ROOT.parent / "FIELDS.md"
OLIVE_FUNCTIONS = '''[functions]
list = ["emollient", "oil_vehicle"]
source = "hpe-6"
locator = "monograph: Olive Oil, Functional Category"
status = "unverified"
recalled_from_memory = true
'''

# A record with a single value, and that value doubtful.
LONE_DOUBTFUL = '''id = "test-oil"
name = "Test oil"
roles = ["oil_phase"]
ionic_class = "not_applicable"
physical_state = "liquid"

[[values.required_hlb_ow]]
value = 7.0
source = "martin"
kind = "textbook"
status = "unverified"
recalled_from_memory = true
doubtful = true
doubtful_reason = "x"

[functions]
list = ["emollient", "oil_vehicle"]
source = "hpe-6"
status = "unverified"
recalled_from_memory = true
'''

# The surfactants (by role) that are not emulsifiers, and the ingredients that
# emulsify without the surfactant role. A change to either set is a change of
# what the service may propose as an emulsifier: make it here, on purpose.
SURFACTANTS_NOT_EMULSIFYING = {"ethylene-glycol-distearate"}
EMULSIFYING_WITHOUT_SURFACTANT_ROLE = {"anhydrous-lanolin"}


def _edit(path: Path, old: str, new: str) -> None:
    text = path.read_text()
    assert old in text
    path.write_text(text.replace(old, new, 1))


def _refused(tree: Path, overlay: Path | None = None) -> RegistryError:
    with pytest.raises(RegistryError) as err:
        load_registry(tree, overlay)
    return err.value


# The shipped data

def test_every_current_ingredient_says_what_it_does(registry):
    for ing in registry.ingredients.values():
        if ing.retired:
            continue
        record = ing.functions_record
        assert isinstance(record, FunctionsRecord), ing.id
        assert ing.functions == record.functions and ing.functions
        assert set(ing.functions) <= set(FUNCTIONS)
        assert record.source_id in registry.sources
        # Recalled, never read: nothing may claim to have been checked.
        assert not (record.recalled_from_memory and record.is_verified)


def test_the_surfactants_that_are_not_emulsifiers(registry):
    current = [i for i in registry.ingredients.values() if not i.retired]
    assert {i.id for i in current if "surfactant" in i.roles and "emulsifier" not in i.functions} == SURFACTANTS_NOT_EMULSIFYING
    assert {i.id for i in current if "surfactant" not in i.roles and "emulsifier" in i.functions} == EMULSIFYING_WITHOUT_SURFACTANT_ROLE


def test_an_opacifier_is_not_an_emulsifier(registry):
    egds = registry.get("ethylene-glycol-distearate")
    assert "emulsifier" not in egds.functions and "opacifier" in egds.functions
    assert egds.preferred("hlb") is not None  # it has an HLB figure all the same


@pytest.mark.parametrize("iid", ["cetyl-alcohol", "stearyl-alcohol", "cetostearyl-alcohol", "stearic-acid"])
def test_fatty_alcohols_and_stearic_acid_are_co_emulsifiers_only(registry, iid):
    functions = registry.get(iid).functions
    assert "co_emulsifier" in functions and "stiffening_agent" in functions and "emulsifier" not in functions


@pytest.mark.parametrize(("iid", "expected"), [
    ("poloxamer-188", {"emulsifier", "solubilizer", "wetting_agent"}),
    ("polysorbate-80", {"emulsifier", "solubilizer", "wetting_agent"}),
    ("sorbitan-monooleate", {"emulsifier"}),
    ("propylene-glycol-monostearate", {"emulsifier", "co_emulsifier"}),
    ("acacia", {"emulsifier", "suspending_agent", "thickener"}),
    ("purified-water", {"aqueous_vehicle", "solvent"}),
    ("castor-oil", {"emollient", "oil_vehicle"}),
    ("white-wax", {"stiffening_agent"}),
])
def test_functions_of_representative_ingredients(registry, iid, expected):
    assert expected <= set(registry.get(iid).functions)


def test_castor_oil_6_to_7_is_doubtful_and_left_out_of_the_span_without_doubtful(registry):
    castor = registry.get("castor-oil")
    doubtful = [r for r in castor.active("required_hlb_ow") if r.doubtful]
    assert [(r.low, r.high, r.source_id) for r in doubtful] == [(6.0, 7.0, "secondary-rhlb-tables")]
    assert doubtful[0].doubtful_reason and not doubtful[0].preferred
    assert castor.span("required_hlb_ow") == (6.0, 14.0)  # span is unchanged
    assert castor.span_without_doubtful("required_hlb_ow") == (14.0, 14.0)
    assert castor.has_doubtful("required_hlb_ow") and not castor.has_doubtful("density")
    assert castor.span_without_doubtful("density") == castor.span("density")
    assert castor.span_without_doubtful("required_hlb_wo") is None


def test_no_other_shipped_value_is_doubtful(registry):
    flagged = {(i.id, prop) for i in registry.ingredients.values() for prop in i.values for r in i.values[prop] if r.doubtful}
    assert flagged == {("castor-oil", "required_hlb_ow")}


# The loader's refusals

def test_a_doubtful_preferred_value_is_refused(tree):
    _edit(tree / "ingredients" / "castor-oil.toml", "preferred = true\n", 'preferred = true\ndoubtful = true\ndoubtful_reason = "x"\n')
    err = _refused(tree)
    assert (err.file, err.field) == ("data/ingredients/castor-oil.toml", "values/required_hlb_ow/0/preferred")
    assert "doubtful value cannot be preferred" in err.message


def test_a_lone_doubtful_value_is_refused(tree):
    # The only current value is preferred without saying so. The record is the
    # test's own, so that the test does not hang on how many values a shipped
    # record holds: shipped records gain values as their sources are read.
    (tree / "ingredients" / "test-oil.toml").write_text(LONE_DOUBTFUL)
    err = _refused(tree)
    assert err.file == "data/ingredients/test-oil.toml"
    assert err.field == "values/required_hlb_ow/0/doubtful" and "only current value" in err.message


def test_doubtful_without_its_reason_is_refused(tree):
    path = tree / "ingredients" / "castor-oil.toml"
    path.write_text(re.sub(r"doubtful_reason = .*\n", "", path.read_text()))
    err = _refused(tree)
    assert err.field == "values/required_hlb_ow/1" and "'doubtful_reason' is a required property" in err.message


def test_a_reason_without_doubtful_is_refused(tree):
    _edit(tree / "ingredients" / "castor-oil.toml", "doubtful = true\n", "")
    err = _refused(tree)
    assert err.field == "values/required_hlb_ow/1" and "doubtful" in err.message


def test_a_doubtful_value_may_be_retired(tree):
    # Retired, it is no longer the castor oil span's concern, doubtful or not.
    _edit(tree / "ingredients" / "castor-oil.toml", "doubtful = true\n",
          'doubtful = true\nretired = true\nretired_on = "2026-12-01"\nretired_reason = "replaced"\n')
    assert load_registry(tree).get("castor-oil").span("required_hlb_ow") == (14.0, 14.0)


def test_an_unknown_function_is_refused(tree):
    _edit(tree / "ingredients" / "olive-oil.toml", 'list = ["emollient"', 'list = ["emulsifying_agent"')
    err = _refused(tree)
    assert err.field == "functions/list/0" and "is not one of" in err.message


def test_a_function_named_twice_is_refused(tree):
    _edit(tree / "ingredients" / "olive-oil.toml", 'list = ["emollient", "oil_vehicle"]', 'list = ["emollient", "emollient"]')
    assert _refused(tree).field == "functions/list"


def test_a_current_ingredient_without_functions_is_refused(tree):
    _edit(tree / "ingredients" / "olive-oil.toml", OLIVE_FUNCTIONS, "")
    err = _refused(tree)
    assert (err.file, err.field) == ("data/ingredients/olive-oil.toml", "functions")
    assert "needs [functions]" in err.message


def test_a_retired_ingredient_may_lack_functions(tree):
    path = tree / "ingredients" / "olive-oil.toml"
    _edit(path, OLIVE_FUNCTIONS, "")
    _edit(path, 'physical_state = "liquid"', 'physical_state = "liquid"\nretired = true\nretired_on = "2026-12-01"\nretired_reason = "merged"')
    olive = load_registry(tree).get("olive-oil")
    assert olive.functions == () and olive.functions_record is None


def test_functions_need_a_known_source(tree):
    _edit(tree / "ingredients" / "olive-oil.toml", 'source = "hpe-6"', 'source = "nowhere"')
    err = _refused(tree)
    assert err.field == "functions/source" and "unknown source 'nowhere'" in err.message


def test_functions_obey_the_value_rules_for_status(tree):
    # Recalled from memory, a statement cannot have been checked against its source.
    path = tree / "ingredients" / "olive-oil.toml"
    _edit(path, OLIVE_FUNCTIONS, OLIVE_FUNCTIONS.replace('status = "unverified"',
          'status = "checked_against_source"\nreviewed_by = "steward"\nreviewed_on = "2026-12-01"'))
    assert _refused(tree).field == "functions/status"
    # Checked, it needs who checked it and when.
    shutil.copy(DEFAULT_ROOT / "ingredients" / "olive-oil.toml", path)
    _edit(path, OLIVE_FUNCTIONS, OLIVE_FUNCTIONS.replace('status = "unverified"\nrecalled_from_memory = true', 'status = "checked_against_source"'))
    err = _refused(tree)
    assert err.field == "functions" and "reviewed_by" in err.message


def test_functions_checked_against_their_source_load(tree):
    path = tree / "ingredients" / "olive-oil.toml"
    _edit(path, OLIVE_FUNCTIONS, OLIVE_FUNCTIONS.replace('status = "unverified"\nrecalled_from_memory = true',
          'status = "checked_against_source"\nreviewed_by = "steward"\nreviewed_on = "2026-12-01"'))
    record = load_registry(tree).get("olive-oil").functions_record
    assert record.is_verified and (record.reviewed_by, record.reviewed_on) == ("steward", "2026-12-01")


def test_an_overlay_cannot_change_a_shipped_ingredients_functions(tmp_path):
    overlay = tmp_path / "overlay"
    shutil.copytree(OVERLAY, overlay)
    path = overlay / "ingredients" / "sorbitan-monooleate.toml"
    path.write_text(path.read_text() + '\n[functions]\nlist = ["emulsifier"]\nsource = "hpe-6"\nstatus = "unverified"\n')
    err = _refused(DEFAULT_ROOT, overlay)
    assert err.file.endswith("ingredients/sorbitan-monooleate.toml") and err.field == "functions"


def test_a_new_overlay_record_needs_its_functions(tmp_path):
    overlay = tmp_path / "overlay"
    shutil.copytree(OVERLAY, overlay)
    path = overlay / "ingredients" / "caprylic-capric-triglyceride.toml"
    path.write_text(path.read_text().split("\n[functions]")[0] + "\n")
    assert _refused(DEFAULT_ROOT, overlay).field == "functions"


# Schema, model and FIELDS.md agree

def _schema() -> dict:
    return json.loads((SCHEMA_DIR / "ingredient.schema.json").read_text(encoding="utf-8"))


def _fields_md_table(heading: str) -> str:
    text = FIELDS_MD.read_text(encoding="utf-8")
    section = text.split(f"## {heading}\n", 1)[1]
    return re.split(r"\n#{2,3} ", section, maxsplit=1)[0]


def _documented(table: str) -> set[str]:
    # The first cell of each row, which may name several fields: `a`, `b`.
    return {name for line in table.splitlines() if line.startswith("| `") for name in re.findall(r"`([a-z_]+)`", line.split("|")[1])}


def test_the_function_names_are_the_same_in_schema_model_and_fields_md():
    defs = _schema()["$defs"]
    assert tuple(defs["function"]["enum"]) == FUNCTIONS
    table_fields = set(defs["functions"]["properties"]) | set(defs["attribution"]["properties"])
    vocabulary = _documented(_fields_md_table("What an ingredient does: `[functions]`")) - table_fields
    assert vocabulary == set(FUNCTIONS)


def test_every_schema_field_is_in_fields_md():
    schema = _schema()
    defs = schema["$defs"]
    assert set(schema["properties"]) <= _documented(_fields_md_table("An ingredient"))
    functions_fields = set(defs["functions"]["properties"]) | set(defs["attribution"]["properties"])
    assert functions_fields <= _documented(_fields_md_table("What an ingredient does: `[functions]`"))
    value_fields = set(defs["provenance"]["properties"]) | set(defs["attribution"]["properties"])
    value_fields |= {k for d in ("hlb_value", "density_value", "molar_mass_value", "melting_value") for k in defs[d]["properties"]}
    assert value_fields <= _documented(_fields_md_table("A value"))
