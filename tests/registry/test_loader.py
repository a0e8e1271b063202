"""The registry loader: every shipped file loads, and a broken tree is
refused with the file and the field named."""
from __future__ import annotations

from pathlib import Path

import pytest

from registry import DEFAULT_ROOT, RegistryError, load_registry
from registry.errors import RegistryFaults
from registry.model import WATER_DENSITY_25C_G_PER_ML
from service.http.app import create_app

INGREDIENT_FILES = sorted((DEFAULT_ROOT / "ingredients").glob("*.toml"))


@pytest.mark.parametrize("path", INGREDIENT_FILES, ids=lambda p: p.stem)
def test_every_shipped_ingredient_loads_with_sourced_values(path, registry):
    ing = registry.get(path.stem)
    assert ing is not None and ing.id == path.stem
    for records in ing.values.values():
        assert sum(r.preferred for r in records) == 1
        for r in records:
            assert r.source_id in registry.sources
            assert r.low <= r.high


def test_version_names_release_and_digest(registry):
    assert registry.version.startswith(registry.release + "+sha256.")
    assert len(registry.digest) == 64


def test_digest_changes_with_content(tree):
    before = load_registry(tree).digest
    path = tree / "ingredients" / "olive-oil.toml"
    path.write_text(path.read_text() + "\n# a comment changes the content\n")
    assert load_registry(tree).digest != before


def test_specific_gravity_becomes_density(registry):
    # USP <841>: specific gravity is 25 degC / 25 degC; density = SG x water at
    # 25 degC (0.9970476 g/mL, IAPWS-95). Castor oil SG 0.957-0.961 (USP monograph).
    rec = registry.get("castor-oil").preferred("density")
    assert rec.low == pytest.approx(0.957 * WATER_DENSITY_25C_G_PER_ML)
    assert rec.high == pytest.approx(0.961 * WATER_DENSITY_25C_G_PER_ML)
    assert rec.midpoint_of_range and rec.recorded == {"low": 0.957, "high": 0.961}


def test_water_density_at_25c(registry):
    # IAPWS-95 as quoted in DOMAIN notes: 0.9970476 g/mL at 25 degC.
    assert registry.get("purified-water").preferred("density").figure == pytest.approx(0.9970476, rel=1e-9)


def test_disagreeing_sources_keep_every_value(registry):
    castor = registry.get("castor-oil")
    assert castor.preferred("required_hlb_ow").figure == 14.0
    assert castor.span("required_hlb_ow") == (6.0, 14.0)


def _edit(path: Path, old: str, new: str) -> None:
    text = path.read_text()
    assert old in text
    path.write_text(text.replace(old, new, 1))


BROKEN = [
    ("ingredients/olive-oil.toml", 'source = "martin"', 'source = "nowhere"', "values/required_hlb_ow/0/source", "unknown source"),
    ("ingredients/olive-oil.toml", 'id = "olive-oil"', 'id = "olive"', "id", "differs from the file name"),
    ("ingredients/olive-oil.toml", "value = 7.0", "value = -7.0", "values/required_hlb_ow/0/value", "less than the minimum"),
    ("ingredients/olive-oil.toml", 'status = "unverified"', 'status = "trusted"', "values/required_hlb_ow/0/status", "is not one of"),
    ("ingredients/olive-oil.toml", 'physical_state = "liquid"', 'physical_state = "liquid"\ncolour = "green"', "(top level)", "Additional properties"),
    ("ingredients/castor-oil.toml", "preferred = true\n", "", "values/required_hlb_ow", "exactly one marked preferred"),
    ("ingredients/olive-oil.toml", 'name = "Olive oil"', 'name = "Olive oil"\nsynonyms = ["castor oil"]', "synonyms", "already names"),
    ("ingredients/olive-oil.toml", "value = 7.0", "value = 7.0\nlow = 6.0\nhigh = 8.0", "values/required_hlb_ow/0", "not both"),
    ("ingredients/olive-oil.toml", 'id = "olive-oil"', 'id = "olive-oil', "(file)", "not valid TOML"),
    ("sources.toml", 'kind = "textbook"', 'kind = "rumour"', "sources/martin/kind", "is not one of"),
    ("registry.toml", 'release = "0.7.0"', 'release = "first"', "release", "does not match"),
]


@pytest.mark.parametrize(("file", "old", "new", "field", "message"), BROKEN, ids=[b[3] + ":" + b[4] for b in BROKEN])
def test_a_broken_file_is_named_with_its_field(tree, file, old, new, field, message):
    _edit(tree / file, old, new)
    with pytest.raises(RegistryError) as err:
        load_registry(tree)
    assert err.value.file == f"data/{file}"
    assert err.value.field == field
    assert message in err.value.message


def test_the_service_refuses_to_start_on_a_broken_registry(tree):
    _edit(tree / "ingredients" / "olive-oil.toml", 'source = "martin"', 'source = "nowhere"')
    with pytest.raises(RegistryError, match="olive-oil.toml"):
        create_app({"registry_root": str(tree)})


def test_every_fault_is_raised_at_once(tree):
    _edit(tree / "ingredients" / "olive-oil.toml", 'source = "martin"', 'source = "nowhere"')
    _edit(tree / "ingredients" / "olive-oil.toml", 'physical_state = "liquid"', 'physical_state = "gas"')
    _edit(tree / "ingredients" / "castor-oil.toml", 'id = "castor-oil"', 'id = "castor"')
    with pytest.raises(RegistryFaults) as err:
        create_app({"registry_root": str(tree)})
    faults = [(e.file, e.field) for e in err.value.errors]
    assert faults == [("data/ingredients/castor-oil.toml", "id"), ("data/ingredients/olive-oil.toml", "physical_state"),
                      ("data/ingredients/olive-oil.toml", "values/required_hlb_ow/0/source")]
    # The first is also the error's own file and field, as a single fault was.
    assert (err.value.file, err.value.field) == faults[0]
    lines = str(err.value).splitlines()
    assert lines[0] == "the registry was not accepted: 3 fault(s) (file: field: rule)"
    assert lines[3] == "  data/ingredients/olive-oil.toml: values/required_hlb_ow/0/source: unknown source 'nowhere' (not in sources.toml)"


def test_missing_parts_of_the_tree(tmp_path):
    with pytest.raises(RegistryError, match="registry.toml"):
        load_registry(tmp_path)
