"""Acid values (mg KOH per g) and the alkalis that make soaps in place."""
from __future__ import annotations

import pytest
from molmass import Formula

from registry.model import FUNCTIONS, PROPERTIES, UNITS

# Read in stored copies of the monographs (each value's note quotes the line):
# (id, source, low, high).
READ_IN_MONOGRAPH = [
    ("stearic-acid", "usp35-nf30", 194.0, 212.0),  # "Acceptance criteria: 194212" (the dash lost in the copy; NF 34: "194-212")
    ("oleic-acid", "usp32-nf27", 196.0, 204.0),  # "Acid value 401: between 196 and 204"
    ("white-wax", "usp32-nf27", 17.0, 24.0),  # "the acid value so obtained is between 17 and 24."
]
ALKALIS = {"triethanolamine": "C6H15NO3", "potassium-hydroxide": "KOH", "sodium-hydroxide": "NaOH", "sodium-borate": "Na2B4O7(H2O)10"}


def test_acid_value_is_a_property_in_mg_koh_per_g():
    assert "acid_value" in PROPERTIES and UNITS["acid_value"] == "mg KOH/g"
    assert "alkalizing_agent" in FUNCTIONS


@pytest.mark.parametrize("iid, source, low, high", READ_IN_MONOGRAPH)
def test_acid_values_read_in_the_monographs(registry, iid, source, low, high):
    record = registry.get(iid).preferred("acid_value")
    assert (record.source_id, record.low, record.high, record.unit) == (source, low, high, "mg KOH/g")
    assert record.status == "checked_against_source" and not record.recalled_from_memory
    assert record.locator and "Read" in record.note


def test_lauric_acid_value_is_the_pure_compounds_by_molmass(registry):
    # Reference library: molmass (IUPAC standard atomic weights); acid value = 1000 x M(KOH) / M(acid).
    record = registry.get("lauric-acid").preferred("acid_value")
    assert record.kind == "calculated"
    assert record.figure == pytest.approx(1000 * Formula("KOH").mass / Formula("C12H24O2").mass, abs=5e-4)


@pytest.mark.parametrize("iid, formula", sorted(ALKALIS.items()))
def test_alkalis_are_recorded_with_formula_and_function(registry, iid, formula):
    ing = registry.get(iid)
    assert ing.molecular_formula == formula and ing.functions == ("alkalizing_agent",)
    assert "emulsifier" not in ing.functions  # it emulsifies only as the soap it forms
    assert ing.preferred("molar_mass").figure == pytest.approx(Formula(formula).mass, abs=5e-4)  # molmass
    assert ing.processing.dissolves_in == "water"


def test_borax_decahydrate_molar_mass():
    # Reference library: molmass; the decahydrate 381.37 g/mol (handbook figure, from memory: 381.37).
    assert Formula("Na2B4O7(H2O)10").mass == pytest.approx(381.37, abs=0.01)
