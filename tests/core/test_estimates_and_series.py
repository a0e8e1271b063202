"""HLB from composition (Griffin 1954; Davies 1957) and the required-HLB
series arithmetic."""
import pytest

from service.core.errors import CalculationError
from service.core.estimates import (
    Scope,
    check_griffin_scope,
    davies,
    griffin_mass_fraction,
    griffin_oxyethylene,
    griffin_saponification,
)
from service.core.series import estimate_from_pass_fail, estimate_from_scores, finer_series, parabola_points, parabola_through, plan_points


def test_griffin_saponification_glyceryl_monostearate():
    # Griffin 1954 textbook example: S 161, A 198 -> 3.74 (published HLB 3.8).
    assert griffin_saponification(161, 198) == pytest.approx(3.74, abs=0.005)


def test_griffin_saponification_polysorbate_20():
    # Griffin 1954: polysorbate 20, S 45.5, A 276 -> 16.7.
    assert round(griffin_saponification(45.5, 276), 1) == 16.7


def test_griffin_oxyethylene():
    # Griffin 1954: E/5; 78.4 % oxyethylene (polyoxyl 20 cetyl ether) -> 15.7, its
    # handbook HLB (HPE, from memory).
    assert round(griffin_oxyethylene(78.4), 1) == 15.7
    assert griffin_oxyethylene(50.0, 20.0) == pytest.approx(14.0)  # (E + P)/5, hand-computed


def test_griffin_mass_fraction():
    # 20 Mh/M with 20 C2H4O units (881.05 g/mol) in C16H33(OCH2CH2)20OH (1123.49 g/mol),
    # standard atomic weights from memory: 15.68.
    assert griffin_mass_fraction(881.05, 1123.49) == pytest.approx(15.68, abs=0.01)


@pytest.mark.parametrize(("scope", "rule"), [
    (Scope("anionic"), "griffin_nonionic_only"), (Scope("nonionic", has_oxypropylene=True), "griffin_scope"),
    (Scope("nonionic", has_nitrogen=True), "griffin_scope"), (Scope("nonionic", has_sulfur=True), "griffin_scope"),
])
def test_griffin_scope(scope, rule):
    # Griffin 1954 (and DOMAIN notes): nonionics only; not propylene oxide, nitrogen or sulfur.
    with pytest.raises(CalculationError) as err:
        check_griffin_scope(scope)
    assert err.value.rule == rule


@pytest.mark.parametrize(("groups", "expected"), [
    ([(38.7, 1), (-0.475, 12)], 40.0),   # sodium lauryl sulfate, Davies 1957
    ([(19.1, 1), (-0.475, 17)], 18.0),   # sodium oleate, Davies 1957
    ([(21.1, 1), (-0.475, 17)], 20.0),   # potassium oleate, Davies 1957
])
def test_davies_published(groups, expected):
    assert davies(groups) == pytest.approx(expected, abs=0.05)


def test_plan_points_in_proportion_steps():
    # Griffin 1949's screen: 10 % steps of the pair's proportions, both ends included.
    points = plan_points(4.3, 15.0, 0, 60, proportion_step=0.1)
    assert len(points) == 11
    assert points[9].hlb == pytest.approx(13.93)  # 90 % polysorbate 80: PMC4137601 Table 2
    assert points[0].share_high == 0 and points[-1].share_high == pytest.approx(1.0)


def test_plan_points_in_hlb_steps_keep_the_end():
    points = plan_points(4.3, 15.0, 8, 12.5, step_hlb=2)
    assert [p.hlb for p in points] == pytest.approx([8, 10, 12, 12.5])


def test_plan_refuses_unreachable_or_too_fine():
    with pytest.raises(CalculationError):
        plan_points(4.3, 15.0, 16, 18, step_hlb=1)
    with pytest.raises(CalculationError):
        plan_points(4.3, 15.0, 4.3, 15, step_hlb=0.1)


def test_parabola_refinement():
    # Hand-computed vertex through (9, 5), (10, 8), (11, 6): 10 + 1/10 = 10.1.
    est = estimate_from_scores([8, 9, 10, 11, 12], [2, 5, 8, 6, 3], "score")
    assert est.best_hlb == 10 and est.estimate_hlb == pytest.approx(10.1) and est.bracketed and est.refined
    assert est.uncertainty_hlb == pytest.approx(0.5)


def test_best_at_the_end_is_not_bracketed():
    est = estimate_from_scores([8, 9, 10], [1, 2, 3], "score")
    assert est.estimate_hlb == 10 and not est.bracketed
    nxt = finer_series(est, 1.0, 4.3, 15.0)
    assert nxt[0] == pytest.approx(8.0) and nxt[-1] == pytest.approx(12.0)


def test_ties_give_the_middle_of_the_run():
    est = estimate_from_scores([8, 9, 10, 11], [1, 5, 5, 2], "score")
    assert est.estimate_hlb == pytest.approx(9.5)


def test_pass_fail_run():
    est = estimate_from_pass_fail([8, 9, 10, 11, 12], [False, True, True, True, False])
    assert est.estimate_hlb == pytest.approx(10.0) and est.bracketed
    with pytest.raises(CalculationError):
        estimate_from_pass_fail([8, 9], [False, False])


def test_parabola_through_three_points():
    # Hand-computed: y = x² - 4x + 7 passes through (1, 4), (2, 3), (4, 7).
    assert parabola_through([1, 2, 4], [4, 3, 7]) == pytest.approx((1.0, -4.0, 7.0))
    # The curve drawn spans the three points and passes through each.
    points = parabola_points([1, 2, 4], [4, 3, 7], n=7)
    assert points[0] == pytest.approx((1.0, 4.0)) and points[-1] == pytest.approx((4.0, 7.0))
    assert (2.0, 3.0) in [pytest.approx(p) for p in points]


def test_a_refined_estimate_names_the_tests_its_parabola_went_through():
    # Hand-computed: the best test (10, 8) and its neighbours (9, 5), (11, 6).
    est = estimate_from_scores([12, 8, 10, 9, 11], [3, 2, 8, 5, 6], "score")
    assert est.refined and est.fit_hlbs == (9, 10, 11)
    a, b, _ = parabola_through(est.fit_hlbs, [5, 8, 6])
    assert -b / (2 * a) == pytest.approx(est.estimate_hlb)
    # Not refined: the best test at the end of the series, or pass/fail.
    assert estimate_from_scores([8, 9, 10], [1, 2, 3], "score").fit_hlbs == ()
    assert estimate_from_pass_fail([8, 9, 10], [False, True, False]).fit_hlbs == ()
