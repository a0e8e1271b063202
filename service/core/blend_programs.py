"""The linear and quadratic programs behind a constrained blend, on scipy.

Shares are mass fractions x of the blend (0 to 1), under equalities
A_eq·x = b_eq (the shares add up to 1, fixed shares, ratios, the target) and
bounds lo ≤ x ≤ hi. Linear programs (HiGHS, through scipy.optimize.linprog)
find the reachable HLB range and the least ionic share; the most even split
is a small strictly convex quadratic program, solved by SLSQP and then
polished exactly on the face SLSQP lands on, so that every equality holds to
rounding error rather than to the solver's tolerance.

scipy and numpy are imported inside the functions: a worker that never
solves a blend does not load them."""
from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence

# A share within this of a bound is taken to be on it when polishing.
ON_BOUND = 1e-9
# HiGHS's feasibility tolerances, tighter than its default 1e-7: the ends of
# the reachable range are reported to the caller and held to 1e-9.
LP_TOLERANCE = 1e-10
# What the polished equalities may miss by before the polish is given up.
POLISH_RESIDUAL = 1e-12


@dataclass(frozen=True)
class LinearOptimum:
    """The optimum of a linear program: the shares, the objective's value, and
    the marginal of each equality row and of each share's lower and upper
    bound (how fast the optimum moves as that constraint is relaxed)."""

    shares: tuple[float, ...]
    value: float
    row_marginals: tuple[float, ...]
    lower_marginals: tuple[float, ...]
    upper_marginals: tuple[float, ...]


def linear_optimum(cost: Sequence[float], rows: Sequence[Sequence[float]], rhs: Sequence[float],
                   bounds: Sequence[tuple[float, float]], maximise: bool = False,
                   band: tuple[Sequence[float], float, float] | None = None) -> LinearOptimum | None:
    """Minimise (or maximise) cost·x under rows·x = rhs, the bounds and, when
    given, band = (row, low, high): low ≤ row·x ≤ high; None when no x
    satisfies them."""
    from scipy.optimize import linprog

    sign = -1.0 if maximise else 1.0
    a_ub = b_ub = None
    if band is not None:
        row, low, high = band
        a_ub, b_ub = [list(row), [-v for v in row]], [high, -low]
    res = linprog([sign * c for c in cost], A_ub=a_ub, b_ub=b_ub, A_eq=[list(r) for r in rows] if rows else None,
                  b_eq=list(rhs) if rows else None, bounds=list(bounds), method="highs",
                  options={"primal_feasibility_tolerance": LP_TOLERANCE, "dual_feasibility_tolerance": LP_TOLERANCE})
    if res.status != 0:
        return None
    # HiGHS's marginals are of the minimised objective: flip them back.
    rows_m = tuple(sign * float(m) for m in res.eqlin.marginals) if rows else ()
    return LinearOptimum(tuple(float(v) for v in res.x), sign * float(res.fun), rows_m,
                         tuple(sign * float(m) for m in res.lower.marginals), tuple(sign * float(m) for m in res.upper.marginals))


def closest_shares(centre: Sequence[float], start: Sequence[float], rows: Sequence[Sequence[float]], rhs: Sequence[float],
                   bounds: Sequence[tuple[float, float]]) -> tuple[float, ...] | None:
    """The shares nearest `centre` (least sum of squared deviations) under
    rows·x = rhs and the bounds, from a feasible `start`; None when the
    solver fails."""
    import numpy as np
    from scipy.optimize import minimize

    c = np.asarray(centre, dtype=float)
    a, b = _independent_rows(np.asarray(rows, dtype=float), np.asarray(rhs, dtype=float))
    res = minimize(lambda x: float(np.sum((x - c) ** 2)), np.asarray(start, dtype=float), jac=lambda x: 2.0 * (x - c),
                   method="SLSQP", bounds=list(bounds),
                   constraints=[{"type": "eq", "fun": lambda x: a @ x - b, "jac": lambda x: a}],
                   options={"ftol": 1e-15, "maxiter": 500})
    lo = np.array([lb for lb, _ in bounds])
    hi = np.array([ub for _, ub in bounds])
    # A failed run's point still tells which shares sit on a bound; the
    # caller checks whatever comes back against every constraint.
    guess = np.clip(res.x if res.success else np.asarray(start, dtype=float), lo, hi)
    polished = _polish(guess, c, a, b, lo, hi)
    return tuple(float(v) for v in (polished if polished is not None else guess))


def _independent_rows(a, b):
    """The rows of a·x = b that are not combinations of earlier ones: SLSQP
    fails on a singular set of equalities (a ratio and fixed shares that
    together repeat the total, say). The rows dropped hold wherever the kept
    ones do, since the linear program found the whole set feasible."""
    import numpy as np

    kept: list[int] = []
    for i in range(len(a)):
        if np.linalg.matrix_rank(a[kept + [i]]) > len(kept):
            kept.append(i)
    return a[kept], b[kept]


def _polish(x, c, a, b, lo, hi):
    """The exact projection of c onto the face x lies on: the shares on a
    bound are held there, the others solved from the equalities by least
    norm (x_F = c_F + A_F⁺·(r − A_F·c_F)). A free share that this pushes past
    a bound is held at it and the face solved again. None when the face's
    equalities cannot be met."""
    import numpy as np

    held_low = x <= lo + ON_BOUND
    held_high = (x >= hi - ON_BOUND) & ~held_low
    for _ in range(len(x) + 1):
        held = held_low | held_high
        free = ~held
        fixed_values = np.where(held_low, lo, hi)[held]
        r = b - a[:, held] @ fixed_values
        af = a[:, free]
        xf = c[free] + np.linalg.pinv(af) @ (r - af @ c[free]) if free.any() else np.zeros(0)
        if np.max(np.abs(af @ xf - r), initial=0.0) > POLISH_RESIDUAL:
            return None
        below = xf < lo[free] - POLISH_RESIDUAL
        above = xf > hi[free] + POLISH_RESIDUAL
        if not below.any() and not above.any():
            out = np.empty_like(x)
            out[held] = fixed_values
            out[free] = np.clip(xf, lo[free], hi[free])
            return out
        index = np.flatnonzero(free)
        held_low[index[below]] = True
        held_high[index[above]] = True
    return None


__all__ = ["LinearOptimum", "closest_shares", "linear_optimum"]
