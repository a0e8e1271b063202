"""The plain-Python programs of service/core/blend_programs.py against
scipy.optimize as the outside reference: linprog with HiGHS for the linear
programs (feasibility, optimal value, shares where the optimum is unique,
marginals where the optimum is not degenerate) and, for the projection, the
KKT conditions of a strictly convex quadratic program (whose minimiser is
unique) beside SLSQP's answer."""
import math

import pytest
from hypothesis import HealthCheck, example, given, settings, strategies as st

scipy_optimize = pytest.importorskip("scipy.optimize")

from service.core.blend_programs import closest_shares, linear_optimum  # noqa: E402


def highs(cost, rows, rhs, bounds, maximise=False, band=None):
    """Reference: scipy.optimize.linprog, method 'highs'."""
    sign = -1.0 if maximise else 1.0
    a_ub = b_ub = None
    if band is not None:
        row, low, high = band
        a_ub, b_ub = [list(row), [-v for v in row]], [high, -low]
    return scipy_optimize.linprog([sign * c for c in cost], A_ub=a_ub, b_ub=b_ub, A_eq=rows or None, b_eq=rhs or None,
                                  bounds=bounds, method="highs",
                                  options={"primal_feasibility_tolerance": 1e-10, "dual_feasibility_tolerance": 1e-10})


def slsqp(centre, start, rows, rhs, bounds):
    """Reference: scipy.optimize.minimize, method 'SLSQP'."""
    import numpy as np

    c = np.asarray(centre, dtype=float)
    a = np.asarray(rows, dtype=float)
    b = np.asarray(rhs, dtype=float)
    return scipy_optimize.minimize(lambda x: float(np.sum((x - c) ** 2)), np.asarray(start, dtype=float), jac=lambda x: 2.0 * (x - c),
                                   method="SLSQP", bounds=bounds,
                                   constraints=[{"type": "eq", "fun": lambda x: a @ x - b, "jac": lambda x: a}],
                                   options={"ftol": 1e-15, "maxiter": 500})


def feasible(x, rows, rhs, bounds, tol=1e-9):
    return (all(lo - tol <= v <= hi + tol for v, (lo, hi) in zip(x, bounds))
            and all(abs(sum(a * v for a, v in zip(r, x)) - b) <= tol * max(1.0, abs(b)) for r, b in zip(rows, rhs)))


def check_against_highs(cost, rows, rhs, bounds, maximise=False, band=None):
    ours = linear_optimum(cost, rows, rhs, bounds, maximise=maximise, band=band)
    ref = highs(cost, rows, rhs, bounds, maximise=maximise, band=band)
    assert (ours is not None) == (ref.status == 0), (ours, ref.message)
    if ours is None:
        return None
    assert feasible(ours.shares, rows, rhs, bounds)
    if band is not None:
        assert band[1] - 1e-9 <= sum(a * v for a, v in zip(band[0], ours.shares)) <= band[2] + 1e-9
    ref_value = (-1.0 if maximise else 1.0) * ref.fun
    assert ours.value == pytest.approx(ref_value, abs=1e-9 * max(1.0, abs(ref_value)))
    return ours, ref


# The programs solve_shares sets for the cases of tests/core/test_blend_shares.py.
ONES3 = [1.0, 1.0, 1.0]
CASES = [
    # (cost, rows, rhs, bounds): HLB range of three free members
    ([4.3, 15.0, 10.0], [ONES3], [1.0], [(0.0, 1.0)] * 3),
    # the third at most 20 %
    ([4.7, 14.9, 15.0], [ONES3], [1.0], [(0.0, 1.0), (0.0, 1.0), (0.0, 0.2)]),
    # m0 : m1 = 1 : 1 and m2 fixed at 20 % (four members)
    ([4.3, 15.0, 10.0, 8.6], [[1.0] * 4, [0.0, 0.0, 1.0, 0.0], [1.0, -1.0, 0.0, 0.0]], [1.0, 0.2, 0.0], [(0.0, 1.0)] * 4),
    # a ratio that keeps the target out of reach
    ([4.3, 15.0, 8.0], [ONES3, [1.0, -1.0, 0.0]], [1.0, 0.0], [(0.0, 1.0)] * 3),
    # fixed shares and a ratio that cannot hold together: infeasible
    ([1.0, 1.0, 1.0], [[1.0, 0.0, 0.0], [0.0, 1.0, 0.0], [2.0, -1.0, 0.0]], [0.2, 0.2, 0.0], [(0.0, 1.0)] * 3),
    # redundant rows: two fixed shares and a ratio repeating the total
    ([4.3, 15.0, 10.0], [ONES3, [1.0, 0.0, 0.0], [0.0, 1.0, 0.0], [0.0, 0.0, 1.0]], [1.0, 0.2, 0.3, 0.5], [(0.0, 1.0)] * 3),
    # lower bounds adding up past 100 %: the shares' total, bounds alone
    ([1.0, 1.0, 1.0], [], [], [(0.5, 1.0), (0.6, 1.0), (0.0, 1.0)]),
]


@pytest.mark.parametrize("maximise", [False, True])
@pytest.mark.parametrize("case", CASES)
def test_the_cases_of_the_blend_tests_match_highs(case, maximise):
    cost, rows, rhs, bounds = case
    check_against_highs(cost, rows, rhs, bounds, maximise)


def test_a_band_matches_highs():
    # least ionic share with the target as a band, as solve_shares's fallback
    check_against_highs([0.0, 0.0, 1.0], [ONES3], [1.0], [(0.0, 1.0)] * 3, band=([4.3, 15.0, 40.0], 17.0 - 1e-8, 17.0 + 1e-8))


@st.composite
def programs(draw):
    """A random small program: 2 to 6 shares, the total, up to 3 more rows
    (fixed shares, ratios, a target), random bounds. Feasible or not as it falls."""
    n = draw(st.integers(2, 6))
    bounds = []
    for _ in range(n):
        a, b = draw(st.floats(0.0, 1.0)), draw(st.floats(0.0, 1.0))
        bounds.append((0.0, 1.0) if draw(st.booleans()) else (min(a, b), max(a, b)))
    rows, rhs = [[1.0] * n], [1.0]
    for _ in range(draw(st.integers(0, 3))):
        kind = draw(st.sampled_from(["fixed", "ratio", "target"]))
        if kind == "fixed":
            i = draw(st.integers(0, n - 1))
            rows.append([1.0 if j == i else 0.0 for j in range(n)])
            rhs.append(draw(st.floats(0.0, 0.6)))
        elif kind == "ratio":
            i, j = draw(st.permutations(range(n)))[:2]
            row = [0.0] * n
            row[i], row[j] = draw(st.floats(0.1, 5.0)), -draw(st.floats(0.1, 5.0))
            rows.append(row)
            rhs.append(0.0)
        else:
            rows.append(draw(st.lists(st.floats(1.0, 40.0), min_size=n, max_size=n)))
            rhs.append(draw(st.floats(1.0, 40.0)))
    cost = draw(st.lists(st.floats(-40.0, 40.0), min_size=n, max_size=n))
    return cost, rows, rhs, bounds


def _decisive(rows, rhs, bounds):
    """Whether HiGHS's verdict is clear of its tolerance: a program feasible
    only to ~1e-10 may be called either way by two correct solvers."""
    ref = highs([0.0] * len(bounds), rows, rhs, bounds)
    if ref.status != 0:
        loose = scipy_optimize.linprog([0.0] * len(bounds), A_eq=rows, b_eq=rhs, bounds=bounds, method="highs",
                                       options={"primal_feasibility_tolerance": 1e-6})
        return loose.status != 0
    tight = [(lo + 1e-7, hi - 1e-7) if hi - lo > 2e-7 else (lo, hi) for lo, hi in bounds]
    return highs([0.0] * len(bounds), rows, rhs, tight).status == 0


@settings(max_examples=300, deadline=None, suppress_health_check=[HealthCheck.too_slow, HealthCheck.filter_too_much])
@given(programs(), st.booleans())
def test_random_programs_match_highs(program, maximise):
    cost, rows, rhs, bounds = program
    if not _decisive(rows, rhs, bounds):
        return
    check_against_highs(cost, rows, rhs, bounds, maximise)


def kkt_holds(x, centre, rows, bounds, tol=1e-7):
    """The KKT conditions of min ½|x − c|² under rows·x = rhs and the bounds:
    x − c = rowsᵀ·μ + ν with ν ≥ 0 on shares at their lower bound, ≤ 0 at
    their upper, 0 elsewhere; μ, ν fitted by scipy.optimize.lsq_linear."""
    import numpy as np

    n = len(x)
    g = np.asarray(x) - np.asarray(centre)
    cols, lb, ub = [np.asarray(r, dtype=float) for r in rows], [-np.inf] * len(rows), [np.inf] * len(rows)
    for j, (lo, hi) in enumerate(bounds):
        e = np.eye(n)[j]
        if abs(x[j] - lo) <= 1e-9 and abs(x[j] - hi) <= 1e-9:
            # A fixed share (lo = hi): its multiplier has either sign.
            cols.append(e); lb.append(-np.inf); ub.append(np.inf)
        elif abs(x[j] - lo) <= 1e-9:
            cols.append(e); lb.append(0.0); ub.append(np.inf)
        elif abs(x[j] - hi) <= 1e-9:
            cols.append(e); lb.append(-np.inf); ub.append(0.0)
    # 'bvls' (an exact active-set method) rather than the default 'trf': trf
    # starts inside the bounds and stops on a relative tolerance, so for a
    # gradient of ~1e-17 it can leave multipliers of ~1e-6 and a residual
    # larger than the gradient itself.
    fit = scipy_optimize.lsq_linear(np.column_stack(cols), g, bounds=(lb, ub), method="bvls")
    return float(np.max(np.abs(np.column_stack(cols) @ fit.x - g))) <= tol


@settings(max_examples=200, deadline=None, suppress_health_check=[HealthCheck.too_slow, HealthCheck.filter_too_much])
@given(programs())
# Found by CI: the projection lands on the centre to within 1 ulp and the
# reference fit, not our answer, was at fault (see kkt_holds).
@example(program=([0.0, 0.0, 0.0], [[1.0, 1.0, 1.0]], [1.0], [(0.0, 1.0), (1.0 / 3.0, 1.0), (0.0, 1.0)]))
def test_random_projections_meet_kkt_and_match_slsqp(program):
    _cost, rows, rhs, bounds = program
    if not _decisive(rows, rhs, bounds):
        return
    ref = highs([0.0] * len(bounds), rows, rhs, bounds)
    if ref.status != 0:
        return
    n = len(bounds)
    centre = [1.0 / n] * n
    start = [float(v) for v in ref.x]
    x = closest_shares(centre, start, rows, rhs, bounds)
    assert x is not None and feasible(x, rows, rhs, bounds)
    assert kkt_holds(x, centre, rows, bounds)
    other = slsqp(centre, start, rows, rhs, bounds)
    if other.success and feasible(other.x, rows, rhs, bounds, 1e-8):
        # The minimiser is unique (strictly convex): SLSQP's objective cannot be lower than ours.
        ours = math.fsum((a - c) ** 2 for a, c in zip(x, centre))
        assert ours <= math.fsum((a - c) ** 2 for a, c in zip(other.x, centre)) + 1e-8


def test_the_three_member_projection_matches_slsqp():
    # tests/core/test_blend_shares.py's first case: HLBs 4.3, 15.0, 10.0 for 10.
    rows, rhs, bounds = [ONES3, [4.3, 15.0, 10.0]], [1.0, 10.0], [(0.0, 1.0)] * 3
    x = closest_shares([1 / 3] * 3, [0.3, 0.3, 0.4], rows, rhs, bounds)
    ref = slsqp([1 / 3] * 3, [0.3, 0.3, 0.4], rows, rhs, bounds)
    assert ref.success and x == pytest.approx(list(ref.x), abs=1e-8)


def test_marginals_match_highs_where_they_are_unique():
    # A non-degenerate optimum (one share strictly inside its bounds, the
    # others on theirs), so the duals are unique: scipy.optimize.linprog
    # (HiGHS) is the reference; by hand, the row's marginal is the free
    # share's cost (10), the others' reduced costs 4.3 - 10 and 15 - 10.
    cost, rows, rhs, bounds = [4.3, 10.0, 15.0], [[1.0, 1.0, 1.0]], [1.0], [(0.0, 0.6), (0.0, 1.0), (0.0, 1.0)]
    ref = highs(cost, rows, rhs, bounds)
    ours = linear_optimum(cost, rows, rhs, bounds)
    assert ours is not None and ref.status == 0
    assert ours.shares == pytest.approx(tuple(ref.x), abs=1e-12)
    assert ours.shares == pytest.approx((0.6, 0.4, 0.0), abs=1e-12)
    assert ours.row_marginals == pytest.approx(tuple(ref.eqlin.marginals), abs=1e-9)
    assert ours.row_marginals == pytest.approx((10.0,))
    assert ours.lower_marginals == pytest.approx(tuple(ref.lower.marginals), abs=1e-9)
    assert ours.upper_marginals == pytest.approx(tuple(ref.upper.marginals), abs=1e-9)
    assert ours.upper_marginals[0] == pytest.approx(4.3 - 10.0) and ours.lower_marginals[2] == pytest.approx(5.0)
