"""Curated values checked against the references they cite, through
reference libraries: water density against IAPWS-95 (CoolProp), molar masses
and Griffin's E/5 against standard atomic weights (molmass), and the Davies
group numbers against the published HLBs they reproduce."""
from __future__ import annotations

import re

import pytest
from CoolProp.CoolProp import PropsSI
from molmass import Formula

from registry.model import WATER_DENSITY_25C_G_PER_ML

ATMOSPHERE_PA = 101325.0


@pytest.mark.parametrize("record", ["first", "second"])
def test_water_density_matches_iapws95(registry, record):
    # IAPWS-95 through CoolProp, liquid water at 0.101325 MPa.
    values = registry.get("purified-water").values["density"]
    value = values[0 if record == "first" else 1]
    reference_g_per_ml = PropsSI("D", "T", 273.15 + value.temperature_c, "P", ATMOSPHERE_PA, "Water") / 1000.0
    assert value.figure == pytest.approx(reference_g_per_ml, abs=5e-8)  # recorded to 7 decimals
    assert value.source_id == "iapws-95"


def test_specific_gravity_conversion_uses_iapws95_water():
    reference = PropsSI("D", "T", 298.15, "P", ATMOSPHERE_PA, "Water") / 1000.0
    assert WATER_DENSITY_25C_G_PER_ML == pytest.approx(reference, abs=5e-8)


def _with_molar_mass(registry):
    return [ing for ing in registry.ingredients.values() if ing.molecular_formula]


def test_formulas_are_recorded_for_pure_compounds(registry):
    assert len(_with_molar_mass(registry)) >= 25


@pytest.mark.parametrize("iid", ["purified-water", "glycerin", "propylene-glycol", "cetyl-alcohol", "stearic-acid",
                                 "sodium-lauryl-sulfate", "isopropyl-myristate", "polyoxyl-20-stearyl-ether", "squalane"])
def test_molar_mass_matches_molmass(registry, iid):
    ing = registry.get(iid)
    recorded = ing.preferred("molar_mass").figure
    assert recorded == pytest.approx(Formula(ing.molecular_formula).mass, abs=5e-4)  # recorded to 3 decimals


def test_every_recorded_molar_mass_matches_its_formula(registry):
    for ing in _with_molar_mass(registry):
        assert ing.preferred("molar_mass").figure == pytest.approx(Formula(ing.molecular_formula).mass, abs=5e-4), ing.id


def _e_over_5(formula: str) -> float:
    """Griffin (1954): HLB = E/5, E the weight percent of oxyethylene, for
    ethoxylated fatty alcohols with oxyethylene as the only hydrophile."""
    n = int(re.search(r"\(OCH2CH2\)(\d+)", formula).group(1))
    return Formula("C2H4O").mass * n / Formula(formula).mass * 100.0 / 5.0


ETHERS = ["polyoxyl-4-lauryl-ether", "polyoxyl-23-lauryl-ether", "polyoxyl-2-cetyl-ether", "polyoxyl-10-cetyl-ether",
          "polyoxyl-20-cetyl-ether", "polyoxyl-2-stearyl-ether", "polyoxyl-10-stearyl-ether", "polyoxyl-20-stearyl-ether",
          "polyoxyl-100-stearyl-ether", "polyoxyl-2-oleyl-ether", "polyoxyl-10-oleyl-ether", "polyoxyl-20-oleyl-ether"]


@pytest.mark.parametrize("iid", ETHERS)
def test_alkyl_ether_hlb_reproduces_griffin_e_over_5(registry, iid):
    # The handbook HLBs of the polyoxyl alkyl ethers reproduce Griffin's E/5 for
    # the nominal structure (DOMAIN notes); molar masses by molmass.
    ing = registry.get(iid)
    assert ing.preferred("hlb").figure == pytest.approx(_e_over_5(ing.molecular_formula), abs=0.06)


def test_calculated_cetostearyl_ether_value():
    # Equimolar cetyl and stearyl nominal structures, E/5 (Griffin 1954).
    cetyl, stearyl = "C16H33(OCH2CH2)20OH", "C18H37(OCH2CH2)20OH"
    e = 20 * Formula("C2H4O").mass / ((Formula(cetyl).mass + Formula(stearyl).mass) / 2) * 100
    assert round(e / 5, 1) == 15.5


def _davies(registry, groups: dict[str, int]) -> float:
    return 7.0 + sum(registry.davies_groups[g].number * n for g, n in groups.items())


@pytest.mark.parametrize(("iid", "groups"), [
    # Davies (1957): sodium lauryl sulfate 7 + 38.7 - 12 x 0.475 = 40.0.
    ("sodium-lauryl-sulfate", {"sulfate-sodium": 1, "methylene": 12}),
    # Sodium oleate: 7 + 19.1 - 17 x 0.475 = 18.0; potassium oleate 20.0 (Davies 1957).
    ("sodium-oleate", {"carboxylate-sodium": 1, "methylene": 17}),
    ("potassium-oleate", {"carboxylate-potassium": 1, "methylene": 17}),
])
def test_davies_groups_reproduce_published_hlbs(registry, iid, groups):
    assert _davies(registry, groups) == pytest.approx(registry.get(iid).preferred("hlb").figure, abs=0.05)


def test_davies_sulfate_discrepancy_is_recorded(registry):
    values = registry.davies_groups["sulfate-sodium"].values
    assert sorted(v.figure for v in values) == [38.6, 38.7]
    assert registry.davies_groups["sulfate-sodium"].number == 38.7
