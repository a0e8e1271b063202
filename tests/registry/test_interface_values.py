"""Areas per molecule (nm2, by interface), critical micelle concentrations
(mmol/L) and cloud points (degC): the properties the interface estimate of
emulsifier reads, their data and the loader's refusals."""
from __future__ import annotations

import json
from pathlib import Path

import pytest
from molmass import Formula

from registry import RegistryError, load_registry
from registry.errors import RegistryFaults
from registry.loader import SCHEMA_DIR
from registry.model import AREA_BASES, PROPERTIES, UNITS
from tests.registry.helpers import edit, run

# Read in the abstract (p. 1) of mahmood-2013, a stored copy of the
# open-access article: "at 298k the CMC for [polysorbate] (20, 21, 40, 60 and
# 80) were (0.0499, 0.063, 0.0333, 0.0167 and 0.015) mM respectively".
CMC_READ = [("polysorbate-20", 0.0499), ("polysorbate-21", 0.063), ("polysorbate-40", 0.0333),
            ("polysorbate-60", 0.0167), ("polysorbate-80", 0.015)]
# Idealised formulas: one fatty acid ester and 20 oxyethylene units on sorbitan
# (the monographs' "approximately 20 moles of ethylene oxide").
IDEALISED = {"polysorbate-20": "C58H114O26", "polysorbate-40": "C62H122O26", "polysorbate-60": "C64H126O26",
             "polysorbate-80": "C64H124O26"}


def _refused(tree: Path) -> list[RegistryError]:
    with pytest.raises(RegistryFaults) as err:
        load_registry(tree)
    return list(err.value.errors)


def test_the_three_properties_and_their_units():
    assert {"area_per_molecule", "cmc", "cloud_point"} <= set(PROPERTIES)
    assert (UNITS["area_per_molecule"], UNITS["cmc"], UNITS["cloud_point"]) == ("nm2", "mmol/L", "degC")


def test_the_interfaces_are_the_same_in_schema_and_model():
    defs = json.loads((SCHEMA_DIR / "ingredient.schema.json").read_text(encoding="utf-8"))["$defs"]
    assert tuple(defs["area_per_molecule_value"]["properties"]["basis"]["enum"]) == AREA_BASES == ("oil_water", "air_water")


@pytest.mark.parametrize("iid, cmc_mmol_per_l", CMC_READ)
def test_cmcs_read_in_the_paper(registry, iid, cmc_mmol_per_l):
    record = registry.get(iid).preferred("cmc")
    assert (record.source_id, record.figure, record.unit, record.temperature_c) == ("mahmood-2013", cmc_mmol_per_l, "mmol/L", 25)
    assert record.status == "checked_against_source" and not record.recalled_from_memory
    assert record.locator and "Read" in record.note


@pytest.mark.parametrize("iid", ["polysorbate-20", "polysorbate-80"])
def test_recalled_areas_and_cloud_points_stay_unverified(registry, iid):
    ing = registry.get(iid)
    area, cloud = ing.preferred("area_per_molecule"), ing.preferred("cloud_point")
    assert area.basis == "air_water" and area.unit == "nm2" and area.is_range
    for record in (area, cloud):
        assert record.status == "unverified" and record.recalled_from_memory and "Recalled, not read" in record.note


@pytest.mark.parametrize("iid, formula", sorted(IDEALISED.items()))
def test_polysorbate_molar_masses_are_their_idealised_formulas(registry, iid, formula):
    # Reference library: molmass (IUPAC standard atomic weights).
    record = registry.get(iid).preferred("molar_mass")
    assert record.kind == "calculated" and formula in record.method and record.status == "unverified"
    assert record.figure == pytest.approx(Formula(formula).mass, abs=5e-3)


def test_an_area_needs_its_interface(tree):
    edit(tree / "ingredients" / "polysorbate-80.toml", 'basis = "air_water"\n', "")
    fields = [(e.file, e.field) for e in _refused(tree)]
    assert ("data/ingredients/polysorbate-80.toml", "values/area_per_molecule/0") in fields


def test_an_area_at_an_unknown_interface_is_refused(tree):
    edit(tree / "ingredients" / "polysorbate-80.toml", 'basis = "air_water"\n', 'basis = "solid_water"\n')
    fields = [(e.file, e.field) for e in _refused(tree)]
    assert ("data/ingredients/polysorbate-80.toml", "values/area_per_molecule/0/basis") in fields


def test_a_cmc_in_another_unit_is_refused(tree):
    edit(tree / "ingredients" / "polysorbate-21.toml", 'unit = "mmol/L"\n', 'unit = "mol/L"\n')
    fields = [(e.file, e.field) for e in _refused(tree)]
    assert ("data/ingredients/polysorbate-21.toml", "values/cmc/0/unit") in fields


def test_show_prints_the_interface_of_an_area(capsys):
    _, out, _ = run(capsys, "show", "polysorbate-80")
    assert "area_per_molecule:\n  1.2 to 1.7 nm2" in out and "basis: air_water" in out
    assert "cmc:\n  0.015 mmol/L  [preferred]" in out and "cloud_point:\n  65 degC" in out
