"""The steward's command line: exit codes and messages, on the shipped
registry and on broken working copies."""
from __future__ import annotations

import json
import re
import subprocess
import sys
from pathlib import Path

import pytest

from registry import DEFAULT_ROOT
from registry.cli import main
from tests.registry.helpers import run, edit

OVERLAY = Path(__file__).resolve().parents[1] / "fixtures" / "site-overlay"


def test_check_shipped_registry(capsys, registry):
    code, out, err = run(capsys, "check")
    assert code == 0 and err == ""
    assert out.startswith(f"ok: release {registry.release}, {len(registry.ingredients)} ingredients")


def test_check_reports_every_broken_file(capsys, tree):
    edit(tree / "ingredients" / "olive-oil.toml", 'source = "martin"', 'source = "nowhere"')
    edit(tree / "ingredients" / "castor-oil.toml", 'id = "castor-oil"', 'id = "castor"')
    edit(tree / "ingredients" / "glycerin.toml", "value = 1.249", "value = 1249.0")
    code, out, err = run(capsys, "check", "--root", tree)
    assert code == 1 and out == ""
    assert "error: data/ingredients/olive-oil.toml: values/required_hlb_ow/0/source: unknown source 'nowhere'" in err
    assert "error: data/ingredients/castor-oil.toml: id: id 'castor' differs from the file name 'castor-oil'" in err
    assert "glycerin.toml: values/density/0/value:" in err and "not a plausible density" in err
    assert "3 error(s)" in err


def test_check_lists_every_fault_of_a_file_at_once(capsys, tree):
    # In one file: a schema fault (a status the schema does not know), a
    # fault only the loader sees (an unknown source) and a wrong id; in
    # another, an implausible density. One run names all four.
    olive = tree / "ingredients" / "olive-oil.toml"
    edit(olive, 'status = "unverified"', 'status = "trusted"')
    edit(olive, 'source = "hpe-6"', 'source = "nowhere"')
    edit(olive, 'id = "olive-oil"', 'id = "olive"')
    edit(tree / "ingredients" / "glycerin.toml", "value = 1.249", "value = 1249.0")
    code, out, err = run(capsys, "check", "--root", tree)
    assert code == 1 and out == ""
    assert "error: data/ingredients/olive-oil.toml: values/required_hlb_ow/0/status: 'trusted' is not one of" in err
    assert "error: data/ingredients/olive-oil.toml: functions/source: unknown source 'nowhere'" in err
    assert "error: data/ingredients/olive-oil.toml: id: id 'olive' differs from the file name 'olive-oil'" in err
    assert "error: data/ingredients/glycerin.toml: values/density/0/value:" in err
    assert "4 error(s)" in err


def test_check_lists_every_schema_fault_of_a_file(capsys, tree):
    olive = tree / "ingredients" / "olive-oil.toml"
    edit(olive, 'status = "unverified"', 'status = "trusted"')
    edit(olive, 'physical_state = "liquid"', 'physical_state = "gas"')
    code, _, err = run(capsys, "check", "--root", tree)
    assert code == 1 and "2 error(s)" in err
    assert "olive-oil.toml: physical_state: 'gas' is not one of" in err and "olive-oil.toml: values/required_hlb_ow/0/status:" in err


def test_a_broken_bibliography_is_one_fault_not_one_per_value(capsys, tree):
    # Without a readable sources.toml no reference can be checked: the
    # references are left alone rather than each reported as unknown.
    edit(tree / "sources.toml", 'kind = "textbook"', 'kind = "rumour"')
    code, _, err = run(capsys, "check", "--root", tree)
    assert code == 1 and "sources.toml: sources/martin/kind" in err
    assert "unknown source" not in err and "1 error(s)" in err


def test_check_json(capsys, tree):
    code, out, _ = run(capsys, "check", "--json")
    data = json.loads(out)
    assert code == 0 and data["accepted"] and data["errors"] == [] and data["counts"]["ingredients"] > 0
    edit(tree / "ingredients" / "olive-oil.toml", 'source = "martin"', 'source = "nowhere"')
    code, out, err = run(capsys, "check", "--root", tree, "--json")
    data = json.loads(out)
    assert code == 1 and err == "" and not data["accepted"] and data["counts"] is None
    assert data["errors"] == [{"file": "data/ingredients/olive-oil.toml", "field": "values/required_hlb_ow/0/source",
                               "message": "unknown source 'nowhere' (not in sources.toml)"}]


@pytest.mark.parametrize("given", [lambda: DEFAULT_ROOT, lambda: DEFAULT_ROOT.parent], ids=["data folder", "registry folder"])
def test_root_takes_the_registry_folder_or_its_data_folder(capsys, given):
    code, out, _ = run(capsys, "check", "--root", given())
    assert code == 0 and out.startswith("ok: release")
    code, out, _ = run(capsys, "diff", given(), DEFAULT_ROOT.parent)
    assert code == 0


@pytest.mark.parametrize("given", [lambda: DEFAULT_ROOT / "ingredients", lambda: DEFAULT_ROOT / "no-such-folder"], ids=["not a tree", "missing"])
def test_root_that_is_not_a_tree_is_a_usage_error(capsys, given):
    with pytest.raises(SystemExit) as exc:
        main(["check", "--root", str(given())])
    assert exc.value.code == 2
    err = capsys.readouterr().err
    assert "argument --root:" in err and "give the registry folder (e.g. registry/, which holds data/) or its data folder" in err
    with pytest.raises(SystemExit) as exc:
        main(["diff", str(DEFAULT_ROOT), str(given())])
    assert exc.value.code == 2 and "argument new:" in capsys.readouterr().err


def test_version(capsys, registry):
    with pytest.raises(SystemExit) as exc:
        main(["--version"])
    out = capsys.readouterr().out
    assert exc.value.code == 0
    assert re.fullmatch(rf"emulsion-registry [0-9][^;]*; registry {re.escape(registry.version)} \(.*\)\n", out)


def test_list_json(capsys, registry):
    code, out, _ = run(capsys, "list", "--role", "oil_phase", "--json")
    data = json.loads(out)
    assert code == 0 and data["version"] == registry.version
    by_id = {i["id"]: i for i in data["ingredients"]}
    assert "castor-oil" in by_id and "polysorbate-80" not in by_id
    assert all("oil_phase" in i["roles"] for i in data["ingredients"])
    assert by_id["castor-oil"]["preferred"]["required_hlb_ow"]["figure"] == registry.get("castor-oil").preferred("required_hlb_ow").figure


def test_show_json(capsys, registry):
    code, out, _ = run(capsys, "show", "castor-oil", "--json")
    data = json.loads(out)["ingredient"]
    assert code == 0 and data["id"] == "castor-oil" and data["functions"]["source"]["id"] == "hpe-6"
    rhlb = data["values"]["required_hlb_ow"]
    assert [v["doubtful"] for v in rhlb] == [r.doubtful for r in registry.get("castor-oil").values["required_hlb_ow"]]
    density = data["values"]["density"][0]
    assert density["basis"] == "specific_gravity_25_25" and density["canonical_unit"] == "g/mL" and density["recorded"] == {"low": 0.957, "high": 0.961}


def test_check_refuses_a_unit_that_is_not_a_density(capsys, tree):
    edit(tree / "ingredients" / "purified-water.toml", 'unit = "g/mL"', 'unit = "g/m"')
    code, _, err = run(capsys, "check", "--root", tree)
    assert code == 1
    assert "purified-water.toml: values/density/0/unit: 'g/m' is not a unit of density" in err


def test_check_refuses_a_duplicate_synonym(capsys, tree):
    edit(tree / "ingredients" / "olive-oil.toml", 'name = "Olive oil"', 'name = "Olive oil"\nsynonyms = ["glycerol"]')
    code, _, err = run(capsys, "check", "--root", tree)
    assert code == 1 and "'glycerol' already names ingredient 'glycerin'" in err


def test_check_with_overlay(capsys):
    code, out, _ = run(capsys, "check", "--overlay", OVERLAY)
    assert code == 0 and ".site." in out


def test_list_and_filter(capsys):
    code, out, _ = run(capsys, "list", "--role", "oil_phase")
    assert code == 0
    assert "castor-oil" in out and "polysorbate-80" not in out


def test_show_gives_provenance(capsys):
    code, out, _ = run(capsys, "show", "castor-oil")
    assert code == 0
    assert "source: martin:" in out and "why preferred:" in out and "recorded as specific gravity 25/25" in out


def test_show_gives_functions_and_marks_doubtful_values(capsys):
    code, out, _ = run(capsys, "show", "castor-oil")
    assert code == 0
    functions = out.split("functions:\n", 1)[1]
    assert functions.startswith("  emollient, oil_vehicle  [recalled from memory]\n    source: hpe-6:")
    assert "6 to 7  [midpoint of range, recalled from memory, DOUBTFUL]" in out and "why doubtful: Far from the textbook" in out
    _, out, _ = run(capsys, "show", "ethylene-glycol-distearate")
    assert "  opacifier, thickener  [recalled from memory]" in out


def test_show_unknown_id(capsys):
    code, out, err = run(capsys, "show", "no-such-thing")
    assert code == 1 and "no ingredient 'no-such-thing'" in err
    code, _, err = run(capsys, "show", "glycerol")
    assert code == 1 and "did you mean 'glycerin'?" in err


def test_report_counts_and_disagreements(capsys, registry):
    code, out, _ = run(capsys, "report", "--json")
    assert code == 0
    data = json.loads(out)
    assert sum(data["by_status"].values()) == data["values"]
    assert {d["ingredient"] for d in data["disagreements"]} >= {"castor-oil", "dimethicone", "white-wax"}
    assert "glyceryl-monostearate" in data["oil_phase_lacking_required_hlb_ow"]
    code, out, _ = run(capsys, "report", "--threshold", "5")
    assert "castor-oil required_hlb_ow: 6 to 14" in out and "white-wax" not in out.split("sources disagreeing")[1]


def test_report_counts_unverified_functions_and_doubtful_values(capsys, registry):
    _, out, _ = run(capsys, "report", "--json")
    data = json.loads(out)
    current = [i for i in registry.ingredients.values() if not i.retired]
    assert len(data["functions_unverified"]) == data["current_ingredients"] == len(current)
    assert [(d["ingredient"], d["property"]) for d in data["doubtful_values"]] == [("castor-oil", "required_hlb_ow")]
    castor = next(d for d in data["disagreements"] if d["ingredient"] == "castor-oil")
    assert castor["without_doubtful"] == [14.0, 14.0]
    _, out, _ = run(capsys, "report")
    assert f"functions unverified: {len(current)} of {len(current)} current ingredients" in out
    assert "doubtful values (1): castor-oil required_hlb_ow (secondary-rhlb-tables)" in out
    assert "castor-oil required_hlb_ow: 6 to 14 (martin, secondary-rhlb-tables); 14 to 14 without doubtful values" in out


def test_diff_shows_functions_and_doubt(capsys, tree):
    edit(tree / "ingredients" / "olive-oil.toml", 'list = ["emollient", "oil_vehicle"]', 'list = ["emollient"]')
    castor = tree / "ingredients" / "castor-oil.toml"
    castor.write_text(re.sub(r"doubtful(_reason)? = .*\n", "", castor.read_text()))
    _, out, _ = run(capsys, "diff", DEFAULT_ROOT, tree)
    assert "~ olive-oil functions: functions ('emollient', 'oil_vehicle') -> ('emollient',)" in out
    assert "~ castor-oil required_hlb_ow [secondary-rhlb-tables]: doubtful True -> False" in out


def test_diff_shows_changes(capsys, tree):
    edit(tree / "ingredients" / "olive-oil.toml", "value = 7.0", "value = 7.5")
    edit(tree / "ingredients" / "olive-oil.toml", 'status = "unverified"\nrecalled_from_memory = true',
         'status = "checked_against_source"\nreviewed_by = "steward"\nreviewed_on = "2026-12-01"')
    code, out, _ = run(capsys, "diff", DEFAULT_ROOT, tree)
    assert code == 0
    assert "~ olive-oil required_hlb_ow [martin]: low 7.0 -> 7.5" in out
    assert "~ olive-oil required_hlb_ow [martin]: status 'unverified' -> 'checked_against_source'" in out
    assert "bump it in registry.toml" in out


def test_diff_flags_deletion_instead_of_retirement(capsys, tree):
    (tree / "ingredients" / "olive-oil.toml").unlink()
    code, out, _ = run(capsys, "diff", DEFAULT_ROOT, tree)
    assert code == 1 and "- olive-oil: ingredient deleted (records are retired, never deleted)" in out


def test_retiring_a_record(capsys, tree):
    edit(tree / "ingredients" / "olive-oil.toml", 'physical_state = "liquid"',
         'physical_state = "liquid"\nretired = true\nretired_on = "2026-12-01"\nretired_reason = "merged into another record"')
    code, out, _ = run(capsys, "diff", DEFAULT_ROOT, tree)
    assert code == 0 and "~ olive-oil: retired on 2026-12-01: merged into another record" in out
    code, out, _ = run(capsys, "list", "--root", tree)
    assert "olive-oil" not in out


def test_retired_without_reason_is_refused(capsys, tree):
    edit(tree / "ingredients" / "olive-oil.toml", 'physical_state = "liquid"', 'physical_state = "liquid"\nretired = true')
    code, _, err = run(capsys, "check", "--root", tree)
    assert code == 1 and "olive-oil.toml: (top level):" in err and "retired_on" in err


def test_diff_on_a_broken_tree(capsys, tree):
    edit(tree / "sources.toml", 'kind = "textbook"', 'kind = "rumour"')
    code, _, err = run(capsys, "diff", DEFAULT_ROOT, tree)
    assert code == 2 and "sources.toml: sources/martin/kind" in err and "nothing was compared" in err


def test_usage_error_exits_2(capsys):
    with pytest.raises(SystemExit) as exc:
        main(["frobnicate"])
    assert exc.value.code == 2


def test_installed_command():
    # The command is installed with the package (pyproject [project.scripts]).
    exe = Path(sys.executable).with_name("emulsion-registry")
    done = subprocess.run([str(exe), "check"], capture_output=True, text=True, timeout=60)
    assert done.returncode == 0 and done.stdout.startswith("ok: release")
