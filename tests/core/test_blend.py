"""Blend HLB, the mass-weighted mean (Griffin 1949)."""
import math

import pytest

from service.core.amounts import Amount
from service.core.blend import HlbValue, blend_hlb
from service.core.errors import CalculationError


def hv(x):
    return HlbValue(x, x, x)


def test_published_binary_blend():
    # Polysorbate 80 (15.0) with sorbitan monooleate (4.3) at 9 : 1 gives 13.93:
    # open-access article PMC4137601, Table 2.
    result = blend_hlb([hv(15.0), hv(4.3)], [Amount("parts", 9), Amount("parts", 1)], [None, None])
    assert result.hlb.figure == pytest.approx(13.93, abs=0.005)
    assert result.hlb.fractions == pytest.approx((0.9, 0.1))
    assert result.total_mass_g is None


def test_seventy_thirty_blend():
    # 70 % polysorbate 80 with 30 % sorbitan monooleate gives 11.8: a widely
    # reproduced pharmacy worked example (from memory; hand-checked: 10.5 + 1.29).
    result = blend_hlb([hv(15.0), hv(4.3)], [Amount("percent_w_w", 70), Amount("percent_w_w", 30)], [None, None])
    assert round(result.hlb.figure, 1) == 11.8


def test_volumes_are_converted_with_density():
    # Hand-computed: 10 mL at 1.08 g/mL is 10.8 g; with 5 g of HLB 4.3:
    # (10.8*15 + 5*4.3) / 15.8 = 11.6139...
    result = blend_hlb([hv(15.0), hv(4.3)], [Amount("volume", 10), Amount("mass", 5)], [1.08, None])
    assert result.hlb.figure == pytest.approx((10.8 * 15 + 5 * 4.3) / 15.8)
    assert result.total_mass_g == pytest.approx(15.8)
    assert result.weighed[0].volume_ml == 10


def test_blend_by_volume_differs_from_naive_volume_mean():
    # Common practice, no source: mixing by millilitres without densities is
    # only approximately right; the service weighs by mass.
    by_mass = blend_hlb([hv(15.0), hv(4.3)], [Amount("volume", 5), Amount("volume", 5)], [1.08, 0.99]).hlb.figure
    naive = (15.0 + 4.3) / 2
    assert not math.isclose(by_mass, naive, abs_tol=0.05)


def test_span_follows_disagreeing_sources():
    # Hand-computed: equal masses of HLB 8-12 (preferred 8) and 4: 6.0, range 6.0 to 8.0.
    result = blend_hlb([HlbValue(8.0, 8.0, 12.0), hv(4.0)], [Amount("mass", 1), Amount("mass", 1)], [None, None])
    assert (result.hlb.figure, result.hlb.low, result.hlb.high) == pytest.approx((6.0, 6.0, 8.0))


@pytest.mark.parametrize(("amounts", "rule"), [
    ([Amount("mass", 1), Amount("parts", 1)], "one_basis"),
    ([Amount("parts", 1), Amount("percent_w_w", 1)], "one_basis"),
    ([Amount("percent_w_w", 60), Amount("percent_w_w", 50)], "percent_total_at_most_100"),
    ([Amount("volume", 1), Amount("mass", 1)], "density_needed_for_volume"),
])
def test_amounts_that_cannot_be_normalised(amounts, rule):
    with pytest.raises(CalculationError) as err:
        blend_hlb([hv(15.0), hv(4.3)], amounts, [None, None])
    assert err.value.rule == rule


def test_single_surfactant_is_not_a_blend():
    with pytest.raises(CalculationError) as err:
        blend_hlb([hv(15.0)], [Amount("mass", 1)], [None])
    assert err.value.rule == "at_least_two"
