"""The interface estimate of emulsifier (service/core/interface.py) against
hand-computed cases; the relations are standard colloid science
(McClements, Food Emulsions, chapters on interfacial properties and emulsion
formation; recalled, not read), the Avogadro constant the SI's exact value."""
from __future__ import annotations

import pytest
import scipy.constants

from service.core.errors import CalculationError
from service.core.interface import (AVOGADRO_PER_MOL, Member, ideal_mixed_cmc_mmol_per_l, interface_estimate, interfacial_area_m2,
                                    mole_weighted, sauter_mean_diameter_um)


def test_avogadro_constant_is_the_exact_si_value():
    # Reference library: scipy.constants (CODATA 2018), the exact value fixed by the 2019 SI.
    assert AVOGADRO_PER_MOL == scipy.constants.Avogadro == 6.02214076e23


@pytest.mark.parametrize("diameters, counts, d32", [
    # Hand-computed: Σn·d³ = 600·1 + 300·8 + 100·125 = 15500; Σn·d² = 600 + 1200 + 2500 = 4300; 15500/4300 = 3.6046512 µm.
    ([1.0, 2.0, 5.0], [600, 300, 100], 15500 / 4300),
    # Number fractions give the same d32 as the counts they are fractions of (only ratios matter).
    ([1.0, 2.0, 5.0], [0.6, 0.3, 0.1], 15500 / 4300),
    # One size: d32 is that size.
    ([4.0], [7], 4.0),
    # Hand-computed: 2 droplets of 1 µm, 1 of 3 µm: (2 + 27) / (2 + 9) = 29/11 = 2.6363636 µm.
    ([1.0, 3.0], [2, 1], 29 / 11),
])
def test_sauter_mean_diameter(diameters, counts, d32):
    assert sauter_mean_diameter_um(diameters, counts) == pytest.approx(d32, rel=1e-12)


def test_a_sauter_mean_lies_above_the_number_mean_of_a_spread():
    # Hand-computed: the number mean of the 1/2/5 µm example is (600 + 600 + 500)/1000 = 1.7 µm; d32 = 3.60 µm weights by volume.
    assert sauter_mean_diameter_um([1.0, 2.0, 5.0], [600, 300, 100]) > 1.7


@pytest.mark.parametrize("diameters, counts, rule", [
    ([1.0, 2.0], [0, 0], "distribution_has_droplets"),
    ([0.0, 2.0], [1, 1], "exclusive_minimum"),
    ([1.0], [-1], "minimum"),
])
def test_a_distribution_without_droplets_is_refused(diameters, counts, rule):
    with pytest.raises(CalculationError) as err:
        sauter_mean_diameter_um(diameters, counts)
    assert err.value.rule == rule


def test_interfacial_area():
    # Hand-computed: 20 mL = 2e-5 m3 in droplets of 2 µm = 2e-6 m: A = 6 x 2e-5 / 2e-6 = 60 m2.
    assert interfacial_area_m2(20.0, 2.0) == pytest.approx(60.0, rel=1e-12)
    # Hand-computed: 10 mL at 1 µm: 6 x 1e-5 / 1e-6 = 60 m2: halving the diameter doubles the area.
    assert interfacial_area_m2(10.0, 1.0) == pytest.approx(2 * interfacial_area_m2(10.0, 2.0), rel=1e-12)


def test_one_surfactant_with_its_cmc():
    # Hand-computed: A = 60 m2; a = 1.5 nm2 = 1.5e-18 m2: N = 60 / 1.5e-18 = 4.0e19 molecules;
    # n = 4.0e19 / 6.02214076e23 = 6.6421563e-5 mol; x 1309.66 g/mol = 0.0869897 g adsorbed.
    # Dissolved: 0.015 mmol/L x 0.080 L = 1.2e-3 mmol = 1.2e-6 mol; x 1309.66 = 1.571592e-3 g. Total 0.0885613 g.
    est = interface_estimate(20.0, 2.0, [Member(1.5, 1309.66, 1.0, 0.015)], 80.0)
    assert est.area_m2 == pytest.approx(60.0)
    assert est.molecules == pytest.approx(4.0e19)
    assert est.mol == pytest.approx(6.6421563e-5, rel=1e-7)
    assert est.adsorbed_g == pytest.approx(0.0869897, rel=1e-6)
    assert est.dissolved_g == pytest.approx(1.571592e-3, rel=1e-9)
    assert est.total_g == pytest.approx(0.0885613, rel=1e-6)


def test_an_unknown_cmc_leaves_the_dissolved_part_out():
    est = interface_estimate(20.0, 2.0, [Member(1.5, 1309.66, 1.0, None)], 80.0)
    assert est.dissolved_g is None and est.cmc_mmol_per_l is None and est.total_g == est.adsorbed_g


def test_a_blend_by_mole_fractions():
    # Hand-computed: mean area 0.6 x 1.45 + 0.4 x 0.5 = 1.07 nm2; A = 60 m2: N = 60 / 1.07e-18 = 5.6074766e19;
    # n = 5.6074766e19 / 6.02214076e23 = 9.3114340e-5 mol; member 1: 0.6 n x 1309.66 = 0.0731689 g; member 2: 0.4 n x 428.6 = 0.0159635 g.
    # Ideal mixed CMC (Clint): 1 / (0.6/0.015 + 0.4/0.05) = 1/48 = 0.0208333 mmol/L.
    est = interface_estimate(20.0, 2.0, [Member(1.45, 1309.66, 0.6, 0.015), Member(0.5, 428.6, 0.4, 0.05)], 80.0)
    assert est.mean_area_nm2 == pytest.approx(1.07)
    assert est.mol == pytest.approx(9.3114340e-5, rel=1e-7)
    assert est.adsorbed_g_by_member == pytest.approx((0.0731689, 0.0159635), rel=1e-5)
    assert est.cmc_mmol_per_l == pytest.approx(1 / 48)
    # Dissolved: 1/48 mmol/L x 0.080 L = 1.6666667e-6 mol; x mean molar mass (0.6 x 1309.66 + 0.4 x 428.6 = 957.236) = 1.5953933e-3 g.
    assert est.dissolved_g == pytest.approx(1.5953933e-3, rel=1e-7)
    assert est.mean_molar_mass_g_per_mol == pytest.approx(957.236)


def test_mole_weighted_and_ideal_mixed_cmc_of_one_member_are_its_own():
    assert mole_weighted([1.3], [1.0]) == 1.3 and ideal_mixed_cmc_mmol_per_l([0.0499], [1.0]) == pytest.approx(0.0499)


@pytest.mark.parametrize("members, rule", [
    ([Member(1.5, 1309.66, 0.5, None)], "mole_fractions_add_up"),
    ([Member(1.5, 1309.66, 0.7, None), Member(0.5, 428.6, 0.4, None)], "mole_fractions_add_up"),
    ([Member(0.0, 1309.66, 1.0, None)], "exclusive_minimum"),
    ([], "list_length"),
])
def test_a_blend_outside_the_domain_is_refused(members, rule):
    with pytest.raises(CalculationError) as err:
        interface_estimate(20.0, 2.0, members, 80.0)
    assert err.value.rule == rule
