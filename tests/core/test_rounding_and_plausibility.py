"""Checks on unrounded amounts, rounding error, balance capacity, the phase
volume and the minimum estimate's plausibility guard."""
import math

import pytest

from service.core.batch import rows_for_batch
from service.core.emulsifier import estimate_limits, minimum_emulsifier, plausibility_finding
from service.core.errors import CalculationError
from service.core.findings import MAX_PACKING_FRACTION, off_scale_findings, phase_volume_findings
from service.core.measure import Balance, capacity_check, rounding_check, weighing_checks

CLASS_A = Balance(sensitivity_g=0.006, acceptable_error_percent=5.0, readability_g=0.01, capacity_g=120.0)


@pytest.mark.parametrize(("percent", "rounded_g", "error_percent"), [(0.015, 0.02, 100 / 3), (0.025, 0.03, 20.0)])
def test_rounding_error_of_small_shares(percent, rounded_g, error_percent):
    # Hand-computed: 0.015 % of 100 g is 15 mg, read as 20 mg on a 10 mg balance (+33 %); 0.025 % is 25 mg, read as 30 mg (+20 %).
    row = rows_for_batch([percent, 100 - percent], 100.0, qs_index=1, increment_g=0.01)[0]
    assert row.mass_g == pytest.approx(rounded_g) and row.mass_g_unrounded == pytest.approx(percent)
    assert row.rounding_error_percent == pytest.approx(error_percent)
    check = rounding_check(row.mass_g_unrounded, row.mass_g, 5.0, "g", "weighed as")
    assert check.code == "rounding_error" and not check.ok


def test_minimum_weighable_quantity_checked_on_the_unrounded_mass():
    # USP <1176>: MWQ 120 mg for SR 6 mg at 5 %. 115 mg reads as 120 mg but is below it.
    row = rows_for_batch([0.115, 99.885], 100.0, qs_index=1, increment_g=0.01)[0]
    assert row.mass_g == pytest.approx(0.12)
    mwq = next(k for k in weighing_checks(row.mass_g_unrounded, CLASS_A, solid=True) if k.code == "minimum_weighable_quantity")
    assert not mwq.ok


def test_qs_percent_agrees_with_its_mass():
    # Hand-computed: 25.135 % of 100 g in three rows rounds to 25.14 g, so the
    # q.s. row weighs 74.86 g and shows 74.86 %, not the formula's 74.865 %.
    rows = rows_for_batch([10.0, 15.13, 0.005, 74.865], 100.0, qs_index=3, increment_g=0.01)
    assert rows[3].mass_g == pytest.approx(74.86) and rows[3].percent_w_w == pytest.approx(74.86)
    assert sum(r.mass_g for r in rows) == pytest.approx(100.0)


def test_balance_capacity():
    assert capacity_check(120.0, 120.0).ok and not capacity_check(120.01, 120.0).ok
    codes = {k.code: k.ok for k in weighing_checks(150.0, CLASS_A, solid=False)}
    assert codes == {"minimum_weighable_quantity": True, "balance_capacity": False}


def test_packing_limit_of_uniform_spheres():
    # A geometric fact: the densest packing of equal spheres fills π/(3√2) ≈ 0.74048
    # of space (Gauss for lattices; Hales' proof of the Kepler conjecture for any).
    assert MAX_PACKING_FRACTION == pytest.approx(0.74048, abs=1e-5)
    assert [f.code for f in phase_volume_findings(0.75, "by volume")] == ["dispersed_phase_above_packing_limit"]
    assert [f.code for f in phase_volume_findings(0.65, "by volume")] == ["dispersed_phase_high"]  # common practice, no source
    assert phase_volume_findings(0.30, "by volume") == []


def test_off_scale_hlb_is_named():
    # Poloxamer 188's nominal HLB of 29 lies above Griffin's 0 to 20 nonionic scale (Griffin 1954, from memory).
    [f] = off_scale_findings([("poloxamer-188", 29.0, "nonionic"), ("polysorbate-80", 15.0, "nonionic")])
    assert f.code == "hlb_off_griffin_scale" and "poloxamer-188" in f.message and "polysorbate-80" not in f.message
    assert off_scale_findings([("sodium-lauryl-sulfate", 40.0, "anionic")]) == []  # ionic ones have their own warning


def test_minimum_estimate_limits():
    # Hand-computed from the practice formula: RHLB 19.9, densities 1 -> 6 / 0.05 + 0.32 = 120.32 g per 100 g.
    est = minimum_emulsifier(1.0, 1.0, 19.9, 80.0)
    assert est.g_per_100g == pytest.approx(120.32)
    assert estimate_limits(15.0) == (15.0, 30.0) and estimate_limits(60.0) == (60.0, 100.0)
    with pytest.raises(CalculationError) as exc:
        plausibility_finding(est.g_per_100g, 15.0, ("required_hlb",))
    assert exc.value.rule == "estimate_plausible"
    assert plausibility_finding(20.0, 15.0, ()).code == "estimate_above_usual_levels"
    assert plausibility_finding(5.0, 15.0, ()) is None


def test_minimum_estimate_hardly_depends_on_the_oil_load():
    # Hand-computed: between 10 % and 90 % continuous phase the estimate moves by 4 x 80 / 1000 = 0.32 g per 100 g.
    low, high = (minimum_emulsifier(1.05, 0.85, 11.6, q).g_per_100g for q in (10.0, 90.0))
    assert math.isclose(high - low, 0.32, rel_tol=1e-9)


def test_emulsifier_sized_with_a_margin():
    from service.core.emulsifier import constant_part, sized_with_margin
    # Hand-computed: A = 6 (1.05 / 0.85) / (10 - 5.8) = 1.7647. With the emulsifier taken from an 80 % continuous
    # phase and a 25 % margin: E = 1.25 (A + 0.32) / (1 + 1.25 x 0.004) = 2.5929, Q = 80 - E, estimate A + 0.004 Q.
    a = constant_part(1.05, 0.85, 11.6)
    assert a == pytest.approx(6 * 1.05 / 0.85 / 4.2)
    sized = sized_with_margin(a, 0.25, 80.0, True)
    assert sized.total_percent == pytest.approx(1.25 * (a + 0.32) / 1.005)
    assert sized.continuous_percent == pytest.approx(80.0 - sized.total_percent)
    assert sized.estimate_g_per_100g == pytest.approx(a + 0.004 * sized.continuous_percent)
    fixed = sized_with_margin(a, 0.0, 70.0, False)  # the continuous phase does not give way
    assert fixed.total_percent == pytest.approx(a + 0.28) and fixed.continuous_percent == 70.0
