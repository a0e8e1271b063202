"""Proportions of a pair for a target HLB (the algebra of Griffin 1949)."""
import pytest

from service.core.blend import HlbValue
from service.core.errors import CalculationError, InfeasibleTarget
from service.core.split import split_for_target, total_mass_from_volume


def hv(x):
    return HlbValue(x, x, x)


def test_inverse_of_published_blend():
    # PMC4137601 Table 2: 9 : 1 polysorbate 80 (15.0) / sorbitan monooleate
    # (4.3) gives 13.93, so the split for 13.93 is 90 % / 10 %.
    s = split_for_target(13.93, [hv(4.3), hv(15.0)])
    assert s.fractions == pytest.approx((0.1, 0.9))
    assert s.hlb.figure == pytest.approx(13.93)


def test_order_of_the_pair_does_not_matter():
    # Hand-computed: x_H = (12 - 4.7) / (14.9 - 4.7) = 0.715686...
    a = split_for_target(12.0, [hv(4.7), hv(14.9)])
    b = split_for_target(12.0, [hv(14.9), hv(4.7)])
    assert a.fractions[1] == pytest.approx(7.3 / 10.2)
    assert b.fractions[0] == pytest.approx(7.3 / 10.2)


def test_with_a_fixed_third_surfactant():
    # Hand-computed: 20 % at HLB 40 contributes 8.0; the pair (4.3, 15.0) must
    # supply 4.0 over 80 %: x = (12 - 8 - 0.8*4.3) / (0.8*10.7) = 0.0654...
    s = split_for_target(12.0, [hv(4.3), hv(15.0)], [(0.2, hv(40.0))])
    assert sum(s.fractions) == pytest.approx(1.0)
    assert s.hlb.figure == pytest.approx(12.0)
    assert s.fractions[2] == pytest.approx(0.2)
    assert s.fractions[1] == pytest.approx((12 - 8 - 0.8 * 4.3) / (0.8 * 10.7) * 0.8)


@pytest.mark.parametrize("target", [3.0, 16.0])
def test_target_outside_the_pair_names_the_range(target):
    with pytest.raises(InfeasibleTarget) as err:
        split_for_target(target, [hv(4.3), hv(15.0)])
    assert err.value.extra["reachable_low"] == pytest.approx(4.3)
    assert err.value.extra["reachable_high"] == pytest.approx(15.0)
    assert err.value.extra["nearest_reachable"] == pytest.approx(4.3 if target < 4.3 else 15.0)


def test_the_ends_of_the_range_are_reachable():
    assert split_for_target(15.0, [hv(4.3), hv(15.0)]).fractions == pytest.approx((0.0, 1.0))
    assert split_for_target(4.3, [hv(4.3), hv(15.0)]).fractions == pytest.approx((1.0, 0.0))


def test_equal_hlbs_cannot_be_split():
    with pytest.raises(CalculationError) as err:
        split_for_target(10.0, [hv(10.0), hv(10.0)])
    assert err.value.rule == "pair_hlbs_differ"


def test_fixed_shares_must_leave_room():
    with pytest.raises(CalculationError) as err:
        split_for_target(10.0, [hv(4.3), hv(15.0)], [(0.6, hv(9.0)), (0.4, hv(9.0))])
    assert err.value.rule == "fixed_share_below_100"


def test_total_from_volume_assumes_additive_volumes():
    # Hand-computed: half and half by mass at 1.0 and 1.1 g/mL; 100 mL holds
    # 100 / (0.5/1.0 + 0.5/1.1) g.
    assert total_mass_from_volume(100.0, [0.5, 0.5], [1.0, 1.1]) == pytest.approx(100 / (0.5 + 0.5 / 1.1))
    with pytest.raises(CalculationError):
        total_mass_from_volume(100.0, [0.5, 0.5], [1.0, None])
