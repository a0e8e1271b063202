"""Curated values checked against the references they cite, through
reference libraries: water density against IAPWS-95 (CoolProp), molar masses
and Griffin's E/5 against standard atomic weights (molmass), and the Davies
group numbers against the published HLBs they reproduce. Every calculated HLB
in the registry is recomputed here from its nominal structure, so that a
recorded figure cannot drift from its computation."""
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


def _published(ing, prop="hlb"):
    # The calculated record may be the preferred one; the published figure is
    # the record that is not calculated (there is one per ingredient here).
    [record] = [r for r in ing.active(prop) if r.kind != "calculated"]
    return record


@pytest.mark.parametrize("iid", ETHERS)
def test_alkyl_ether_hlb_reproduces_griffin_e_over_5(registry, iid):
    # The handbook HLBs of the polyoxyl alkyl ethers reproduce Griffin's E/5 for
    # the nominal structure (DOMAIN notes); molar masses by molmass.
    ing = registry.get(iid)
    handbook = _published(ing)
    assert handbook.source_id == "hpe-6"
    assert handbook.figure == pytest.approx(_e_over_5(ing.molecular_formula), abs=0.06)


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
    # Every published figure, not just one: an ingredient may carry the same
    # figure read in more than one source (sodium lauryl sulfate: Davies and IUPAC).
    published = [r.figure for r in registry.get(iid).active("hlb") if r.kind != "calculated"]
    assert published
    assert all(_davies(registry, groups) == pytest.approx(f, abs=0.05) for f in published), published


def test_davies_sulfate_discrepancy_is_recorded(registry):
    values = registry.davies_groups["sulfate-sodium"].values
    assert sorted(v.figure for v in values) == [38.6, 38.7]
    assert registry.davies_groups["sulfate-sodium"].number == 38.7


# How each calculated HLB is recomputed. Griffin's E/5 holds only where
# oxyethylene is the only hydrophile, so only the plain alkyl ethers have one:
# poloxamers carry propylene oxide, and sorbitan esters and polysorbates are
# mixtures whose catalogue values no idealised structure reproduces (DOMAIN).
ALKYL_ETHER = re.compile(r"C\d+H\d+\(OCH2CH2\)\d+OH")
# Mixtures of nominal structures, equimolar, for records with no single formula.
EQUIMOLAR_STRUCTURES = {"polyoxyl-20-cetostearyl-ether": ("C16H33(OCH2CH2)20OH", "C18H37(OCH2CH2)20OH")}
# Davies group counts per ingredient: the hydrophilic group once, and n the
# -CH3, -CH2- and =CH- groups of the fatty chain (12 for lauryl, 17 for the
# oleate chain beside its carboxylate carbon).
DAVIES_GROUPS = {
    "sodium-lauryl-sulfate": {"sulfate-sodium": 1, "methylene": 12},
    "sodium-oleate": {"carboxylate-sodium": 1, "methylene": 17},
    "potassium-oleate": {"carboxylate-potassium": 1, "methylene": 17},
}


def _e_over_5_equimolar(formulas: tuple[str, ...]) -> float:
    oxyethylene = sum(int(re.search(r"\(OCH2CH2\)(\d+)", f).group(1)) * Formula("C2H4O").mass for f in formulas)
    return oxyethylene / sum(Formula(f).mass for f in formulas) * 100.0 / 5.0


def _recompute(registry, ing, record) -> float:
    if record.source_id == "griffin-1954":
        if ing.id in EQUIMOLAR_STRUCTURES:
            return _e_over_5_equimolar(EQUIMOLAR_STRUCTURES[ing.id])
        assert ing.molecular_formula and ALKYL_ETHER.fullmatch(ing.molecular_formula), \
            f"{ing.id}: E/5 needs a nominal alkyl ether structure, oxyethylene its only hydrophile"
        return _e_over_5(ing.molecular_formula)
    if record.source_id == "davies-1957":
        assert ing.id in DAVIES_GROUPS, f"{ing.id}: a Davies value with no group counts in this test"
        return _davies(registry, DAVIES_GROUPS[ing.id])
    raise AssertionError(f"{ing.id}: calculated HLB from {record.source_id}, which this test cannot recompute")


def _calculated_hlbs(registry):
    return [(ing, r) for ing in registry.ingredients.values() for r in ing.active("hlb") if r.kind == "calculated"]


def test_the_calculated_hlbs_expected_are_present(registry):
    # So that the recomputation below cannot pass by finding nothing.
    have = {(ing.id, r.source_id) for ing, r in _calculated_hlbs(registry)}
    expected = ({(iid, "griffin-1954") for iid in ETHERS + list(EQUIMOLAR_STRUCTURES)}
                | {(iid, "davies-1957") for iid in DAVIES_GROUPS})
    assert expected <= have


def test_every_calculated_hlb_matches_its_computation(registry):
    # All mismatches at once, each with its recomputed figure.
    drifted = [(ing.id, record.source_id, record.figure, round(computed, 3))
               for ing, record in _calculated_hlbs(registry)
               if abs(record.figure - (computed := _recompute(registry, ing, record))) > 0.05]
    assert drifted == []


def test_calculated_hlbs_name_their_method(registry):
    for ing, record in _calculated_hlbs(registry):
        expected = "Griffin" if record.source_id == "griffin-1954" else "Davies"
        assert record.method and expected in record.method, ing.id


def test_no_hlb_is_calculated_for_mixtures_or_propylene_oxide(registry):
    # Griffin's formulas do not apply to poloxamers; sorbitan esters and
    # polysorbates are mixtures, never recomputed from idealised structures.
    for ing, _ in _calculated_hlbs(registry):
        assert not ing.id.startswith(("poloxamer-", "sorbitan-", "polysorbate-")), ing.id


@pytest.mark.parametrize("iid", ETHERS)
def test_checked_e_over_5_value_is_preferred_and_agrees_with_the_handbook(registry, iid):
    # The computed figure is preferred where it reproduces the handbook's to 0.1.
    ing = registry.get(iid)
    preferred = ing.preferred("hlb")
    assert (preferred.kind, preferred.source_id, preferred.status) == ("calculated", "griffin-1954", "checked_against_source")
    assert preferred.figure == _published(ing).figure


def _number_record(group):
    # The record DaviesGroup.number takes its figure from.
    return next((r for r in group.values if r.preferred and not r.retired), group.values[0])


@pytest.mark.parametrize("iid", list(DAVIES_GROUPS))
def test_davies_calculation_is_no_better_checked_than_its_group_numbers(registry, iid):
    # The molmass check stands on standard atomic weights; a Davies calculation
    # stands on the registry's own group numbers, so while any of them is
    # unverified the result is too, and the published figure stays preferred.
    ing = registry.get(iid)
    [calculated] = [r for r in ing.active("hlb") if r.kind == "calculated"]
    if not all(_number_record(registry.davies_groups[g]).is_verified for g in DAVIES_GROUPS[iid]):
        assert calculated.status == "unverified"
        # A published figure is preferred, not the calculation; there may be
        # more than one published record (sodium lauryl sulfate: Davies and IUPAC).
        assert ing.preferred("hlb").kind != "calculated"
