"""Soaps made in place and gum primary emulsions, against published formulas
and hand computations. Molar masses by molmass (IUPAC standard atomic weights)."""
from __future__ import annotations

import pytest
from molmass import Formula

from service.core import gum_emulsions as gum
from service.core import soaps
from service.core.errors import CalculationError

KOH = Formula("KOH").mass  # 56.1056 g/mol
WATER = soaps.Coproduct("water", "H2O", 1.0, Formula("H2O").mass)
POTASSIUM_HYDROXIDE = soaps.Alkali("potassium hydroxide", KOH, 1.0, (WATER,))
BORAX = soaps.Alkali("sodium borate", Formula("Na2B4O7(H2O)10").mass, 2.0,
                     (soaps.Coproduct("boric acid", "H3BO3", 2.0, Formula("H3BO3").mass), soaps.Coproduct("water", "H2O", 2.5, Formula("H2O").mass)))
STEARIC_AV = (194 + 212) / 2  # USP 35-NF 30, Stearic Acid: 194 to 212 (read; the registry's midpoint)
WHITE_WAX_AV = (17 + 24) / 2  # USP 32-NF 27, White Wax: 17 to 24 (read)


def test_acid_moles_and_mean_molar_mass_hand_computed():
    # Hand-computed: 10 g at AV 200 holds 200 x 10 / 56.1056 / 1000 = 0.035647 mol; 1000 x 56.1056 / 200 = 280.53 g/mol.
    assert soaps.acid_mol(200.0, 10.0, KOH) == pytest.approx(0.0356471, rel=1e-5)
    assert soaps.mean_acid_molar_mass(200.0, KOH) == pytest.approx(280.528, rel=1e-5)
    # A pure acid's acid value gives back its molar mass (molmass): stearic acid, AV 1000·M(KOH)/M = 197.22.
    m = Formula("C18H36O2").mass
    assert soaps.mean_acid_molar_mass(1000 * KOH / m, KOH) == pytest.approx(m)


def test_vanishing_cream_koh_neutralises_a_fifth_of_the_stearic_acid():
    # Published teaching formula (solutionpharmacy.in, "How to make vanishing cream", read 2026-12-03): stearic acid 17 g,
    # KOH 0.7 g; the page says "KOH neutralizes only 20-30% of the free acid of stearic acid". With the USP acid value's
    # midpoint (203) the KOH given neutralises 20.3 % (hand-computed: 0.7/56.1056 / (203 x 17/56105.6)).
    n = soaps.acid_mol(STEARIC_AV, 17.0, KOH)
    result = soaps.neutralise(n, POTASSIUM_HYDROXIDE, alkali_weighed_g=0.7, acid_molar_mass_g_per_mol=soaps.mean_acid_molar_mass(STEARIC_AV, KOH))
    assert result.neutralised_fraction == pytest.approx(0.2028, abs=5e-4)
    assert 0.20 <= result.neutralised_fraction <= 0.30
    assert result.excess_alkali_g == 0 and not result.findings
    # The water formed: one mole per mole of acid neutralised (stoichiometry), 0.7/56.1056 x 18.0153 = 0.2248 g.
    [(water, water_g)] = result.coproducts_g
    assert water_g == pytest.approx(0.22476, rel=1e-4)
    # Mass balance (hand-computed): acid neutralised + KOH = soap + water.
    assert result.acid_neutralised_g + result.alkali_pure_g == pytest.approx(result.soap_g + water_g)


def test_galens_cerate_borax_neutralises_all_the_free_acid():
    # British Pharmaceutical Codex 1911, Ceratum Galeni (cold cream), read at henriettes-herb.com: white beeswax 12.50,
    # borax 1.00 (parts by weight). The Codex states no fraction; with the USP acid value's midpoint (20.5) the borax is
    # 1.15 times the free acid (hand-computed: 2 x 1/381.37 / (20.5 x 12.5/56105.6)), so all is neutralised and the rest
    # stays as free borax (a magazine page read, gcimagazine.com, says excess borax can crystallise out of a cold cream).
    n = soaps.acid_mol(WHITE_WAX_AV, 12.5, KOH)
    result = soaps.neutralise(n, BORAX, alkali_weighed_g=1.0)
    assert result.neutralised_fraction == 1.0
    equivalents = 2 * 1.0 / Formula("Na2B4O7(H2O)10").mass
    assert equivalents / n == pytest.approx(1.148, abs=1e-3)
    assert result.excess_alkali_g == pytest.approx((equivalents - n) / 2 * Formula("Na2B4O7(H2O)10").mass)
    assert [f.code for f in result.findings] == ["alkali_in_excess"]
    assert result.soap_g is None  # a wax: the free acids' molar mass is not its mass per mole of acid


def test_usp_cold_cream_borax_neutralises_about_three_fifths():
    # USP cold cream, from memory (not read): white wax 120 g and sodium borate 5 g per 1000 g (with cetyl esters wax 125 g,
    # mineral oil 560 g, purified water 190 g). Hand-computed: 2 x 5/381.372 / (20.5 x 120/56105.6) = 0.598.
    n = soaps.acid_mol(WHITE_WAX_AV, 120.0, KOH)
    result = soaps.neutralise(n, BORAX, alkali_weighed_g=5.0)
    assert result.neutralised_fraction == pytest.approx(0.598, abs=1e-3)


def test_borax_soap_gains_sodium_less_hydrogen():
    # Stoichiometry: Na2B4O7.10H2O + 2 RCOOH -> 2 RCOONa + 4 H3BO3 + 5 H2O, so the soap weighs M(Na) - M(H) = 21.98 g/mol
    # more than its acid (molmass), and the equation balances by mass.
    assert BORAX.soap_gain_g_per_mol_acid == pytest.approx(Formula("Na").mass - Formula("H").mass, abs=1e-6)
    assert POTASSIUM_HYDROXIDE.soap_gain_g_per_mol_acid == pytest.approx(Formula("K").mass - Formula("H").mass, abs=1e-6)


def test_fraction_to_neutralise_gives_the_alkali_hand_computed():
    # Hand-computed: 0.1 mol of acid, half neutralised by borax (2 equivalents per mole): 0.025 mol, 9.5343 g;
    # at an assay of 95 % 10.036 g is weighed.
    result = soaps.neutralise(0.1, BORAX, fraction=0.5, assay_fraction=0.95, acid_molar_mass_g_per_mol=284.48)
    assert result.alkali_mol == pytest.approx(0.025)
    assert result.alkali_pure_g == pytest.approx(0.025 * Formula("Na2B4O7(H2O)10").mass)
    assert result.alkali_weighed_g == pytest.approx(result.alkali_pure_g / 0.95)
    assert result.free_acid_g == pytest.approx(0.05 * 284.48)


def test_fraction_and_mass_together_are_refused():
    with pytest.raises(CalculationError) as err:
        soaps.neutralise(0.1, BORAX, fraction=0.5, alkali_weighed_g=1.0)
    assert err.value.rule == "fraction_or_alkali_mass"


@pytest.mark.parametrize("kind, water_ml, gum_g", [("fixed", 20.0, 10.0), ("mineral", 26.6666667, 13.3333333), ("volatile", 40.0, 20.0)])
def test_primary_emulsion_for_40_ml_of_oil(kind, water_ml, gum_g):
    # Common practice, from memory of standard pharmaceutics texts (4:2:1, 3:2:1, 2:2:1; two teaching pages read agree);
    # quantities hand-computed for 40 mL of oil: water = 40 x 2/oil parts mL, gum = 40 x 1/oil parts g.
    p = gum.primary_emulsion(kind, 40.0)
    assert (p.water_ml, p.gum_g) == (pytest.approx(water_ml), pytest.approx(gum_g))


def test_rest_of_water_to_a_final_mass_hand_computed():
    # Hand-computed: 100 g final from 40 g oil, 20 g water and 10 g gum leaves 30 g of water to add.
    assert gum.rest_of_water_g(100.0, 40.0, 20.0, 10.0) == pytest.approx(30.0)
    with pytest.raises(CalculationError) as err:
        gum.rest_of_water_g(60.0, 40.0, 20.0, 10.0)
    assert err.value.rule == "final_holds_primary_emulsion"
    with pytest.raises(CalculationError):
        gum.check_final_volume(50.0, 40.0, 20.0)
