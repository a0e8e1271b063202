"""The aliquot method of weighing, against published worked examples."""
import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from service.core.aliquot import aliquot_plan
from service.core.errors import CalculationError
from service.core.findings import minimum_weighable_quantity_g

# USP <1176>: a Class A balance of sensitivity 6 mg at 5 % error weighs no less than 120 mg.
MWQ_G = minimum_weighable_quantity_g(0.006, 5.0)


def test_textbook_worked_example_2_mg():
    # "Accurate Weighing for Prescriptions", a chapter of a pharmacy calculations
    # textbook reprinted at basicmedicalkey.com/accurate-weighing-for-prescriptions
    # (section "Aliquots"): Class A balance, SR 6 mg, 5 % error -> 120 mg least
    # weighable; for 2 mg weigh 120 mg (n = 60), choose a 125 mg aliquot:
    # 60 x 125 mg = 7500 mg of mixture, 7500 - 120 = 7380 mg lactose.
    assert MWQ_G == pytest.approx(0.120)
    plan = aliquot_plan(0.002, MWQ_G, 0.001, aliquot_g=0.125)
    assert plan.factor == 60
    assert plan.substance_g == pytest.approx(0.120)
    assert plan.mixture_g == pytest.approx(7.500)
    assert plan.diluent_g == pytest.approx(7.380)
    assert plan.delivered_g == pytest.approx(0.002)


def test_how_to_page_worked_example_10_mg():
    # "How to Calculate Aliquot", ehow.co.uk/how_7257845_calculate-aliquot.html
    # (a popular how-to page, steps 1 to 3): SR 6 mg / 0.05 = 120 mg; 10 mg x 12 =
    # 120 mg of drug; (120 - 10) mg x 12 = 1320 mg of diluent. The aliquot of
    # 120 mg and the mixture of 1440 mg follow (hand-computed).
    plan = aliquot_plan(0.010, MWQ_G, 0.001)
    assert (plan.factor, plan.substance_g, plan.diluent_g) == (12, pytest.approx(0.120), pytest.approx(1.320))
    assert plan.aliquot_g == pytest.approx(0.120) and plan.mixture_g == pytest.approx(1.440)


def test_factor_the_balance_can_read_exactly():
    # Hand-computed: 7 mg at a 10 mg reading: 18 x 7 = 126 mg cannot be read, 20 x 7 = 140 mg can.
    plan = aliquot_plan(0.007, MWQ_G, 0.01)
    assert plan.factor == 20 and plan.substance_g == pytest.approx(0.14)
    assert plan.delivered_g == pytest.approx(0.007) and plan.error_percent == pytest.approx(0.0, abs=1e-9)


def test_diluent_stays_weighable_near_the_limit():
    # Hand-computed: 100 mg needs a factor of 2; a 120 mg aliquot would leave 40 mg
    # of diluent, below 120 mg, so the aliquot grows to 160 mg (320 mg of mixture).
    plan = aliquot_plan(0.100, MWQ_G, 0.01)
    assert plan.factor == 2 and plan.aliquot_g == pytest.approx(0.16) and plan.diluent_g == pytest.approx(0.12)


@pytest.mark.parametrize(("desired_g", "aliquot_g", "rule"), [(0.2, None, "below_minimum_weighable"), (0.0, None, "positive"),
                                                              (0.01, 0.1, "aliquot_weighable")])
def test_refusals(desired_g, aliquot_g, rule):
    with pytest.raises(CalculationError) as exc:
        aliquot_plan(desired_g, MWQ_G, 0.01, aliquot_g=aliquot_g)
    assert exc.value.rule == rule


@settings(max_examples=300, deadline=None)
@given(desired_g=st.floats(min_value=0.0005, max_value=0.1199), readability_g=st.sampled_from([0.0001, 0.001, 0.01]))
def test_every_weighing_is_weighable(desired_g, readability_g):
    # The rule the compounding texts state: the substance, the diluent and the
    # aliquot are each at least the minimum weighable quantity, and each is a
    # whole number of the balance's readings.
    plan = aliquot_plan(desired_g, MWQ_G, readability_g)
    for mass_g in (plan.substance_g, plan.diluent_g, plan.aliquot_g):
        assert mass_g >= MWQ_G - 1e-12
        assert math.isclose(mass_g / readability_g, round(mass_g / readability_g), abs_tol=1e-6)
    assert abs(plan.error_percent) < 5.0
