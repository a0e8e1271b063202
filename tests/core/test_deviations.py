"""Deviations of amounts taken from their targets, and a batch's yield.
Every expected figure here is hand-computed (taken − target, over the
unrounded target, × 100); the 5 % allowance is the acceptable error USP <1176>
works the minimum weighable quantity from."""
import pytest

from service.core.deviations import deviation, mass_g_from_volume, volume_ml_from_mass, yield_percent
from service.core.errors import CalculationError


def test_deviation_in_the_targets_unit_and_percent():
    # Hand-computed: 20.02 - 20 = 0.02 g; 0.02 / 20 x 100 = 0.1 %.
    d = deviation(20.0, 20.02, 5.0)
    assert d.deviation == pytest.approx(0.02) and d.percent == pytest.approx(0.1) and d.within


@pytest.mark.parametrize(("taken_g", "percent", "within"), [
    # Target 6.355140187 g unrounded (6.8 / 10.7 x 10 g, shown 6.36 g). Hand-computed:
    (6.04, -4.958823529, True),     # (6.04 - 6.355140187) / 6.355140187 = -4.9588 %: just inside 5 % ...
    (6.03, -5.116176470, False),    # ... and 6.03 g just outside.
    (6.67, 4.954411765, True),     # (6.67 x 10.7 / 68 - 1) x 100
    (6.68, 5.111764706, False),
])
def test_just_inside_and_just_outside_on_the_unrounded_target(taken_g, percent, within):
    d = deviation(6.8 / 10.7 * 10, taken_g, 5.0)
    assert d.percent == pytest.approx(percent, rel=1e-8)
    assert d.within is within


def test_the_rounded_target_would_give_another_verdict():
    # Hand-computed: against the displayed 6.36 g, 6.04 g is (6.04 - 6.36) / 6.36 = -5.03 %, outside;
    # against the unrounded 6.3551 g it is -4.96 %, inside. The verdict is the unrounded one's.
    assert (6.04 - 6.36) / 6.36 * 100 < -5.0
    assert deviation(6.8 / 10.7 * 10, 6.04, 5.0).within


def test_exactly_at_the_limit_is_within():
    # Hand-computed: 10.5 g for 10 g is +5 % exactly; "no more than" the allowed error passes.
    assert deviation(10.0, 10.5, 5.0).within
    assert not deviation(10.0, 10.5001, 5.0).within


def test_conversions_with_density():
    # Hand-computed: 18.85 mL at 0.84749 g/mL = 15.9752 g; back again.
    assert mass_g_from_volume(18.85, 0.84749) == pytest.approx(15.9751865)
    assert volume_ml_from_mass(15.9751865, 0.84749) == pytest.approx(18.85)


def test_yield():
    # Hand-computed: 198.6 / 200 x 100 = 99.3 %.
    assert yield_percent(198.6, 200.0) == pytest.approx(99.3)


@pytest.mark.parametrize("call", [lambda: deviation(0.0, 1.0, 5.0, ("t",)), lambda: yield_percent(1.0, 0.0, ("t",))])
def test_a_target_that_is_not_positive_is_refused(call):
    with pytest.raises(CalculationError) as exc:
        call()
    assert exc.value.rule == "positive" and exc.value.path == ("t",)
