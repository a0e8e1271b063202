"""Shares of a blend of two or more surfactants under constraints
(service/core/blend_shares.py). The HLB arithmetic is Griffin 1949's
mass-weighted mean; every expected share below is hand-computed from it,
and the two-member answers are checked against the closed form of
split.py (the alligation), which /v1/blends/proportions answers with."""
import math

import pytest
from hypothesis import HealthCheck, given, settings, strategies as st

from service.core.blend import HlbValue
from service.core.blend_shares import TOLERANCE, ConstraintsRefused, Member, Ratio, solve_shares
from service.core.errors import CalculationError
from service.core.split import split_for_target


def hv(x):
    return HlbValue(x, x, x)


def members(*hlbs, **constraints):
    return [Member(hv(h), f"m{i}", **constraints.get(f"m{i}", {})) for i, h in enumerate(hlbs)]


def test_three_members_most_even_is_the_projection_of_equal_shares():
    # Hand-computed: with no bound reached, the shares nearest (1/3, 1/3, 1/3)
    # on {Σx = 1, Σx·h = T} are x = 1/3 + α(h − h̄), α = (T − h̄) / Σ(h − h̄)².
    h = (4.3, 15.0, 10.0)
    mean = sum(h) / 3
    alpha = (10.0 - mean) / sum((v - mean) ** 2 for v in h)
    s = solve_shares(10.0, members(*h))
    assert s.fractions == pytest.approx([1 / 3 + alpha * (v - mean) for v in h], abs=1e-12)
    assert s.hlb.figure == pytest.approx(10.0, abs=1e-12)
    assert (s.reachable_low, s.reachable_high) == pytest.approx((4.3, 15.0), abs=1e-12)


def test_three_members_with_a_bound_reached():
    # Hand-computed: HLBs 4.7, 14.9, 15.0 for 11.6, the third at most 20 %.
    # Unbounded the projection would put the third above 20 %, so it sits at
    # 20 %: the other two share 80 % and supply 11.6 − 3.0 = 8.6,
    # x₂ = (8.6 − 0.8·4.7) / (14.9 − 4.7) = 0.474509..., x₁ = 0.8 − x₂.
    s = solve_shares(11.6, members(4.7, 14.9, 15.0, m2={"high": 0.2, "given_high": True}))
    x2 = (8.6 - 0.8 * 4.7) / 10.2
    assert s.fractions == pytest.approx((0.8 - x2, x2, 0.2), abs=1e-12)
    (bound,) = s.constraints
    assert bound.kind == "upper_bound" and bound.active and bound.path == ("surfactants", 2, "max_percent_w_w")


def test_a_ratio_and_a_fixed_share():
    # Hand-computed: m0 : m1 = 1 : 1, m2 fixed at 20 %, target 9.5. Then
    # 2a + d = 0.8 and 19.3a + 2.0 + 8.6d = 9.5, so 2.1a = 0.62:
    # a = 0.295238..., d = 0.8 − 2a = 0.209523...
    ms = members(4.3, 15.0, 10.0, 8.6, m2={"fixed": 0.2})
    s = solve_shares(9.5, ms, [Ratio(0, 1, 1.0, 1.0)])
    a = 0.62 / 2.1
    assert s.fractions == pytest.approx((a, a, 0.2, 0.8 - 2 * a), abs=1e-12)
    assert {c.kind: c.active for c in s.constraints} == {"ratio": True, "fixed": True}


def test_an_unequal_ratio_holds_exactly():
    # Hand-computed: m0 : m1 = 1 : 2 gives that pair a mean of (4.7 + 2·14.9)/3
    # = 11.5; with m2 (HLB 15.0) free the most even answer for 12.0 keeps 1 : 2.
    s = solve_shares(12.0, members(4.7, 14.9, 15.0), [Ratio(0, 1, 1.0, 2.0)])
    assert s.fractions[1] == pytest.approx(2 * s.fractions[0], abs=1e-12)
    assert sum(x * h for x, h in zip(s.fractions, (4.7, 14.9, 15.0))) == pytest.approx(12.0, abs=1e-12)


@pytest.mark.parametrize("target", [4.3, 7.0, 9.65, 13.93, 15.0])
def test_two_members_give_the_pair_split(target):
    # The closed form of split.py (x_H = (T − HLB_L)/(HLB_H − HLB_L)); two
    # members leave no freedom, so the solver must find the same shares.
    pair = [hv(4.3), hv(15.0)]
    s = solve_shares(target, members(4.3, 15.0))
    assert s.fractions == pytest.approx(split_for_target(target, pair).fractions, abs=1e-12)


def test_two_free_members_and_a_fixed_one_give_the_split_with_a_fixed_share():
    # As tests/core/test_split.py: 20 % at HLB 40 fixed, the pair (4.3, 15.0) for 12.
    s = solve_shares(12.0, members(4.3, 15.0, 40.0, m2={"fixed": 0.2}))
    assert s.fractions == pytest.approx(split_for_target(12.0, [hv(4.3), hv(15.0)], [(0.2, hv(40.0))]).fractions, abs=1e-12)


def test_least_ionic_leaves_the_ionic_member_out_when_it_can():
    # Hand-computed: nonionics 4.3 and 15.0 reach 12.0 alone, so the anionic
    # member (HLB 40) takes 0 % and the pair splits as the alligation says.
    ms = [Member(hv(4.3), "a"), Member(hv(15.0), "b"), Member(hv(40.0), "c", ionic=True)]
    s = solve_shares(12.0, ms, objective="least_ionic")
    assert s.fractions == pytest.approx(((15.0 - 12.0) / 10.7, (12.0 - 4.3) / 10.7, 0.0), abs=1e-12)
    assert s.ionic_fraction == pytest.approx(0.0, abs=1e-12)
    # most_even, by contrast, gives the ionic member a share.
    assert solve_shares(12.0, ms).fractions[2] > 0.01


def test_least_ionic_takes_only_what_the_target_needs():
    # Hand-computed: 17.0 is above the nonionics' 15.0; the least anionic
    # share s solves 15(1 − s) + 40s = 17, s = 0.08, with the 4.3 member at 0.
    ms = [Member(hv(4.3), "a"), Member(hv(15.0), "b"), Member(hv(40.0), "c", ionic=True)]
    s = solve_shares(17.0, ms, objective="least_ionic")
    assert s.fractions == pytest.approx((0.0, 0.92, 0.08), abs=1e-9)


def test_bounds_too_tight_for_the_target():
    # Hand-computed: m1 (15.0) at most 30 %; the highest blend puts 30 % on m1
    # and 70 % on m2 (10.0): 4.5 + 7.0 = 11.5 < 14, bound by m1's maximum.
    ms = members(4.3, 15.0, 10.0, m1={"high": 0.3, "given_high": True})
    with pytest.raises(ConstraintsRefused) as err:
        solve_shares(14.0, ms)
    e = err.value
    assert e.rule == "target_reachable_under_constraints" and e.path == ("target_hlb",)
    assert e.extra["nearest_reachable"] == pytest.approx(11.5, abs=1e-9)
    assert e.extra["reachable_low"] == pytest.approx(4.3, abs=1e-9)
    given_binding = [b for b in e.extra["binding"] if b["given"]]
    assert given_binding == [{"kind": "upper_bound", "pointer": "#/surfactants/1/max_percent_w_w",
                              "description": "m1 at most 30 % w/w", "given": True}]


def test_a_ratio_that_prevents_the_target():
    # Hand-computed: m0 : m1 = 1 : 1 holds that pair at (4.3 + 15.0)/2 = 9.65,
    # and m2 (8.0) only lowers the blend: 12 is out of reach, the nearest
    # reachable HLB is 9.65 (m2 at 0 %), and the ratio binds.
    with pytest.raises(ConstraintsRefused) as err:
        solve_shares(12.0, members(4.3, 15.0, 8.0), [Ratio(0, 1, 1.0, 1.0)])
    e = err.value
    assert e.extra["nearest_reachable"] == pytest.approx(9.65, abs=1e-9)
    assert e.extra["reachable_low"] == pytest.approx(8.0, abs=1e-9)
    pointers = [b["pointer"] for b in e.extra["binding"]]
    assert pointers[0] == "#/ratios/0"
    assert "#/surfactants/2" in pointers          # m2 cannot go below 0 %


def test_lower_bounds_that_add_up_past_100_percent():
    # Hand-computed: at least 50 % and at least 60 % make at least 110 %.
    ms = members(4.3, 15.0, 10.0, m0={"low": 0.5, "given_low": True}, m1={"low": 0.6, "given_low": True})
    with pytest.raises(ConstraintsRefused) as err:
        solve_shares(10.0, ms)
    e = err.value
    assert e.rule == "constraints_consistent"
    assert e.extra["shares_total_low_percent"] == pytest.approx(110.0, abs=1e-9)
    assert {b["pointer"] for b in e.extra["binding"] if b["given"]} == {"#/surfactants/0/min_percent_w_w", "#/surfactants/1/min_percent_w_w"}


def test_a_ratio_against_fixed_shares():
    # Hand-computed: m0 and m1 both fixed at 20 % cannot stand in the ratio 1 : 2.
    ms = members(4.3, 15.0, 10.0, m0={"fixed": 0.2}, m1={"fixed": 0.2})
    with pytest.raises(ConstraintsRefused) as err:
        solve_shares(10.0, ms, [Ratio(0, 1, 1.0, 2.0)])
    assert err.value.rule == "constraints_consistent" and err.value.path == ("ratios",)


@st.composite
def feasible_problems(draw):
    """A random blend and shares x that meet random constraints built around
    them, so that the problem is feasible by construction; the target is x's HLB."""
    n = draw(st.integers(min_value=3, max_value=8))
    hlbs = draw(st.lists(st.floats(min_value=1.0, max_value=40.0), min_size=n, max_size=n))
    weights = draw(st.lists(st.floats(min_value=0.0, max_value=1.0), min_size=n, max_size=n).filter(lambda w: sum(w) > 0.1))
    x = [w / sum(weights) for w in weights]
    ms = []
    for i in range(n):
        kind = draw(st.sampled_from(["free", "bounded", "fixed", "low", "high"]))
        below, above = draw(st.floats(0.0, 0.3)), draw(st.floats(0.0, 0.3))
        low, high = max(0.0, x[i] - below), min(1.0, x[i] + above)
        ionic = draw(st.booleans())
        if kind == "fixed":
            ms.append(Member(hv(hlbs[i]), f"m{i}", ionic=ionic, fixed=x[i]))
        else:
            ms.append(Member(hv(hlbs[i]), f"m{i}", ionic=ionic,
                             low=low if kind in ("bounded", "low") else 0.0, high=high if kind in ("bounded", "high") else 1.0,
                             given_low=kind in ("bounded", "low"), given_high=kind in ("bounded", "high")))
    ratios = []
    for _ in range(draw(st.integers(0, 2))):
        a, b = draw(st.permutations(range(n)))[:2]
        if x[a] > 0.01 and x[b] > 0.01:
            ratios.append(Ratio(a, b, x[a], x[b]))
    target = sum(xi * h for xi, h in zip(x, hlbs))
    return target, ms, ratios, draw(st.sampled_from(["most_even", "least_ionic"]))


@settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.too_slow, HealthCheck.filter_too_much])
@given(feasible_problems())
def test_random_feasible_constraints_are_met(problem):
    # Property (no source needed): whatever the constraints, the answer meets
    # every one of them and reaches the target within the core's tolerance,
    # 1e-9 relative to the target (blend_shares.TOLERANCE): an absolute 1e-9
    # failed once on a target of 10 reached to 1.00000008e-9.
    target, ms, ratios, objective = problem
    s = solve_shares(target, ms, ratios, objective)
    x = s.fractions
    reach = TOLERANCE * max(1.0, abs(target))
    assert math.isclose(sum(x), 1.0, abs_tol=1e-9)
    assert abs(sum(xi * m.hlb.figure for xi, m in zip(x, ms)) - target) <= reach
    assert abs(s.hlb.figure - target) <= reach
    for xi, m in zip(x, ms):
        if m.fixed is not None:
            assert abs(xi - m.fixed) <= 1e-9
        assert m.low - 1e-9 <= xi <= m.high + 1e-9
    for r in ratios:
        assert abs(r.b_parts * x[r.a] - r.a_parts * x[r.b]) <= 1e-9


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(st.lists(st.tuples(st.floats(0.0, 0.6), st.floats(0.0, 0.6)), min_size=2, max_size=4))
def test_bounds_alone_refuse_a_total_exactly_when_the_box_cannot_hold_100_percent(boxes):
    # With bounds alone (no fixed share, no ratio) the totals reachable are
    # exactly Σ lower bounds to Σ upper bounds: the least and the most of a
    # sum over a box of bounds is taken at its corners (elementary linear
    # programming). The shortcut that skips the programs inside that range
    # and the programs at its edges must both follow this rule.
    ms = [Member(hv(4.0 + 4.0 * i), f"m{i}", low=min(a, b), high=max(a, b), given_low=True, given_high=True)
          for i, (a, b) in enumerate(boxes)]
    low, high = sum(m.low for m in ms), sum(m.high for m in ms)
    if min(abs(low - 1.0), abs(high - 1.0)) < 1e-6:
        return  # too near an edge for the rule to be told from the tolerance
    fits = low < 1.0 < high
    hlbs = [m.hlb.figure for m in ms]
    try:
        solve_shares(sum(hlbs) / len(hlbs), ms)
    except CalculationError as e:
        # Any other refusal (the target out of reach) comes after the totals passed.
        assert (e.rule == "constraints_consistent") == (not fits), (e.rule, low, high)
        if not fits:
            # The figure refused is the nearer end of the box's totals.
            side = e.extra["shares_total_low_percent"] if low > 1.0 else e.extra["shares_total_high_percent"]
            assert side == pytest.approx((low if low > 1.0 else high) * 100, abs=1e-6)
        return
    assert fits, (low, high)
