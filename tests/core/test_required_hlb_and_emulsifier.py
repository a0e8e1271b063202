"""Required HLB of an oil phase (Griffin 1949) and the minimum emulsifier
estimate (calculation practice, unpublished), and the USP <1176> rule."""
import pytest

from service.core.amounts import Amount
from service.core.blend import HlbValue
from service.core.emulsifier import minimum_emulsifier
from service.core.errors import CalculationError
from service.core.findings import ceil_to, minimum_weighable_quantity_g
from service.core.required_hlb import required_hlb


def hv(x, low=None, high=None):
    return HlbValue(x, x if low is None else low, x if high is None else high)


def test_required_hlb_is_mass_weighted_over_the_oil_phase():
    # Hand-computed from Griffin's rule (1949): 10 g at 11, 8 g at 11.5, 2 g at 15
    # -> (110 + 92 + 30) / 20 = 11.6.
    r = required_hlb([hv(11, 10, 12), hv(11.5), hv(15)], [Amount("mass", 10), Amount("mass", 8), Amount("mass", 2)], [None] * 3, [True] * 3)
    assert r.required_hlb.figure == pytest.approx(11.6)
    # Span: the first ingredient at 10 and at 12 -> 11.1 and 12.1.
    assert (r.required_hlb.low, r.required_hlb.high) == pytest.approx((11.1, 12.1))
    assert r.phase_fractions == pytest.approx((0.5, 0.4, 0.1))


def test_fractions_are_of_the_oil_phase_not_the_formula():
    # Percentages of the whole formula give the same answer as the masses they stand for.
    by_pct = required_hlb([hv(10), hv(15)], [Amount("percent_w_w", 30), Amount("percent_w_w", 5)], [None] * 2, [True] * 2)
    by_mass = required_hlb([hv(10), hv(15)], [Amount("mass", 60), Amount("mass", 10)], [None] * 2, [True] * 2)
    assert by_pct.required_hlb.figure == pytest.approx(by_mass.required_hlb.figure)
    assert by_pct.required_hlb.figure == pytest.approx((30 * 10 + 5 * 15) / 35)


def test_an_ingredient_can_be_left_out_of_the_mean():
    r = required_hlb([hv(10), None], [Amount("mass", 9), Amount("mass", 1)], [None] * 2, [True, False])
    assert r.required_hlb.figure == pytest.approx(10.0)
    assert r.phase_fractions == pytest.approx((0.9, 0.1))
    assert r.counted_fractions == pytest.approx((1.0, 0.0))


def test_a_counted_ingredient_needs_a_value():
    with pytest.raises(CalculationError) as err:
        required_hlb([hv(10), None], [Amount("mass", 1), Amount("mass", 1)], [None] * 2, [True, True])
    assert err.value.path == ("oil_phase", 1)


def test_minimum_emulsifier_formula():
    # Hand-computed (no published worked example could be found):
    # 6 * (1.05 / 0.85) / (10 - 0.5 * 11.6) + 4 * 80 / 1000 = 2.0847...
    m = minimum_emulsifier(1.05, 0.85, 11.6, 80.0)
    assert m.g_per_100g == pytest.approx(6 * (1.05 / 0.85) / 4.2 + 0.32)
    assert m.g_per_100g_rounded_up == pytest.approx(2.1)


@pytest.mark.parametrize("rhlb", [20.0, 25.0, -1.0])
def test_minimum_emulsifier_domain_is_guarded(rhlb):
    with pytest.raises(CalculationError) as err:
        minimum_emulsifier(1.0, 0.9, rhlb, 70.0)
    assert err.value.rule == "below_20"


def test_minimum_weighable_quantity_class_a_balance():
    # USP <1176>: sensitivity requirement 6 mg at 5 % error -> 120 mg.
    assert minimum_weighable_quantity_g(0.006, 5.0) == pytest.approx(0.120)


def test_ceil_to_rounds_up_but_not_float_noise():
    assert ceil_to(2.0847, 0.1) == pytest.approx(2.1)
    assert ceil_to(1.2000000000000002, 0.1) == pytest.approx(1.2)
    assert ceil_to(4.16941, 0.01) == pytest.approx(4.17)
