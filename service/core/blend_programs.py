"""The linear and quadratic programs behind a constrained blend, in plain
Python.

Shares are mass fractions x of the blend (0 to 1), under equalities
A_eq·x = b_eq (the shares add up to 1, fixed shares, ratios, the target) and
bounds lo ≤ x ≤ hi, every one finite. Linear programs (a bounded-variable
primal simplex, two phases, Bland's rule against cycling) find the reachable
HLB range and the least ionic share; the most even split is a small strictly
convex quadratic program (the projection of a point onto the polytope),
solved by a primal active-set method that moves in the null space of the
equalities of the free shares and ends with an exact least-norm polish on
the face it stops on, so that every equality holds to rounding error.

The problems hold a handful of shares and rows: the standard library does
them in well under a millisecond, where numpy and scipy cost ~56 MB per
worker and a per-call overhead larger than the whole answer. The tests
check both programs against scipy.optimize (linprog with HiGHS, SLSQP)."""
from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Sequence

from service.core.errors import CalculationError

# A share within this of a bound is taken to be on it (the quadratic
# program's start).
ON_BOUND = 1e-9
# The largest row residual a feasible program may leave, relative to the
# row's size: as HiGHS's primal feasibility tolerance was set before (1e-10,
# tighter than its default 1e-7), since the ends of the reachable range are
# reported to the caller and held to 1e-9.
LP_TOLERANCE = 1e-10
# A pivot smaller than this (in a row scaled to its largest entry) is taken
# for zero: the row is a combination of the others there.
PIVOT_ZERO = 1e-9
# Reduced costs and bound multipliers within this (relative to the costs'
# size) are taken for zero: the point is optimal.
OPTIMALITY = 1e-11
# What the polished equalities may miss by before the polish is given up.
POLISH_RESIDUAL = 1e-12
# A row of the free shares' equalities whose part independent of the rows
# before it is below this fraction of its length is a combination of them.
RANK_ZERO = 1e-12


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
    satisfies them.

    The marginals follow HiGHS's convention for the minimised objective
    (row: ∂value/∂rhs; a share on its lower bound: its reduced cost ≥ 0; on
    its upper: ≤ 0; a basic share: 0), flipped back for maximise. Where the
    optimum is degenerate the marginals are not unique, and these may differ
    from another solver's."""
    n = len(cost)
    sign = -1.0 if maximise else 1.0
    a = [[float(v) for v in r] for r in rows]
    b = [float(v) for v in rhs]
    lo = [float(lb) for lb, _ in bounds]
    hi = [float(ub) for _, ub in bounds]
    c = [sign * float(v) for v in cost]
    if band is not None:
        # The band as a row with a slack s, row·x − s = 0, low ≤ s ≤ high.
        row, low, high = band
        a = [r + [0.0] for r in a] + [[float(v) for v in row] + [-1.0]]
        b = b + [0.0]
        lo, hi, c = lo + [float(low)], hi + [float(high)], c + [0.0]
    solved = _simplex(c, a, b, lo, hi)
    if solved is None:
        return None
    x, y, d, at_upper, basic = solved
    lower_m = tuple(0.0 if basic[j] or at_upper[j] else sign * d[j] for j in range(n))
    upper_m = tuple(sign * d[j] if at_upper[j] and not basic[j] else 0.0 for j in range(n))
    value = sign * math.fsum(cj * xj for cj, xj in zip(c[:n], x[:n]))
    return LinearOptimum(tuple(x[:n]), value, tuple(sign * v for v in y[:len(rows)]), lower_m, upper_m)


def _simplex(c, a, b, lo, hi):
    """min c·x under a·x = b, lo ≤ x ≤ hi (finite): (x, row duals, reduced
    costs, which shares sit on their upper bound, which are basic), or None
    when infeasible. Phase 1 minimises the sum of one artificial per row,
    starting from every share on its lower bound; phase 2 the cost."""
    m, n = len(a), len(c)
    if any(l > h for l, h in zip(lo, hi)):
        return None
    val = list(lo)
    resid = [b[i] - math.fsum(a[i][j] * val[j] for j in range(n)) for i in range(m)]
    sgn = [1.0 if r >= 0 else -1.0 for r in resid]
    # The tableau B⁻¹·[A | diag(sgn)], the basis being the artificials.
    tab = [[sgn[i] * v for v in a[i]] + [1.0 if k == i else 0.0 for k in range(m)] for i in range(m)]
    basis = [n + i for i in range(m)]
    val += [abs(r) for r in resid]
    lo_all, hi_all = lo + [0.0] * m, hi + [math.inf] * m
    at_upper = [False] * (n + m)
    enter_ok = [True] * n + [False] * m
    _iterate(tab, basis, val, at_upper, [0.0] * n + [1.0] * m, lo_all, hi_all, enter_ok, 1e-12)
    for i, k in enumerate(basis):
        if k >= n and val[k] > LP_TOLERANCE * max(1.0, abs(b[i]), *map(abs, a[i])):
            return None
    # The artificials are held at 0 from here on; those still basic are
    # swapped for a share where their row allows it, else their row is a
    # combination of the others (a ratio and fixed shares that repeat the
    # total) and the artificial stays basic at 0, its row's dual 0.
    for k in range(n, n + m):
        hi_all[k] = 0.0
    for i in range(m):
        if basis[i] >= n:
            row = tab[i]
            scale = max((abs(v) for v in row[:n]), default=0.0)
            j = max((j for j in range(n) if not _is_basic(basis, j)), key=lambda j: abs(row[j]), default=None)
            if j is not None and abs(row[j]) > PIVOT_ZERO * max(1.0, scale):
                val[basis[i]] = 0.0
                _pivot(tab, basis, i, j)
    scale = max((abs(v) for v in c), default=1.0) or 1.0
    _iterate(tab, basis, val, at_upper, c + [0.0] * m, lo_all, hi_all, enter_ok, OPTIMALITY * scale)
    return _clean_vertex(c, a, b, lo, hi, sgn, basis, at_upper)


def _is_basic(basis, j) -> bool:
    return j in basis


def _iterate(tab, basis, val, at_upper, c, lo, hi, enter_ok, tol_d) -> None:
    """Bounded-variable primal simplex steps on the tableau until no reduced
    cost improves: the first improving column enters (Bland's rule), the
    first blocking share leaves, a share that reaches its other bound first
    just moves there."""
    m, total = len(tab), len(c)
    for _ in range(50 * (total + 1) ** 2):
        inb = set(basis)
        cb = [c[k] for k in basis]
        entering = direction = None
        for j in range(total):
            if j in inb or not enter_ok[j] or hi[j] <= lo[j]:
                continue
            d = c[j] - sum(cb[i] * tab[i][j] for i in range(m))
            if not at_upper[j] and d < -tol_d:
                entering, direction = j, 1.0
            elif at_upper[j] and d > tol_d:
                entering, direction = j, -1.0
            else:
                continue
            break
        if entering is None:
            return
        j = entering
        step, leave = hi[j] - lo[j], None
        for i in range(m):
            alpha = tab[i][j] * direction      # the basic share falls by alpha per unit step
            k = basis[i]
            if alpha > PIVOT_ZERO:
                t = (val[k] - lo[k]) / alpha
            elif alpha < -PIVOT_ZERO:
                t = (hi[k] - val[k]) / -alpha
            else:
                continue
            t = max(t, 0.0)
            if t < step or (t == step and leave is not None and k < basis[leave]):
                step, leave = t, i
        for i in range(m):
            val[basis[i]] -= tab[i][j] * direction * step
        if leave is None:
            at_upper[j] = direction > 0
            val[j] = hi[j] if at_upper[j] else lo[j]
            continue
        k = basis[leave]
        at_upper[k] = tab[leave][j] * direction < 0
        val[k] = hi[k] if at_upper[k] else lo[k]
        val[j] += direction * step
        at_upper[j] = False
        _pivot(tab, basis, leave, j)
    raise CalculationError(("target_hlb",), "solution_found", "the linear program did not end; no answer is given")


def _pivot(tab, basis, r, j) -> None:
    row = tab[r]
    p = row[j]
    row[:] = [v / p for v in row]
    for i, other in enumerate(tab):
        f = other[j]
        if i != r and f != 0.0:
            other[:] = [v - f * w for v, w in zip(other, row)]
    basis[r] = j


def _clean_vertex(c, a, b, lo, hi, sgn, basis, at_upper):
    """The final basis solved afresh from the original rows (the tableau's
    updates leave rounding behind): the nonbasic shares exactly on their
    bounds, the basic ones from B·x_B = b − N·x_N, the duals from Bᵀ·y = c_B."""
    m, n = len(a), len(c)
    basic = [False] * n
    x = [hi[j] if at_upper[j] else lo[j] for j in range(n)]
    for k in basis:
        if k < n:
            basic[k] = True

    def column(k):
        return [a[i][k] for i in range(m)] if k < n else [sgn[i] if i == k - n else 0.0 for i in range(m)]

    cols = [column(k) for k in basis]
    bmat = [[cols[q][i] for q in range(m)] for i in range(m)]
    r = [b[i] - math.fsum(a[i][j] * x[j] for j in range(n) if not basic[j]) for i in range(m)]
    xb = _solve(bmat, r)
    yb = _solve([list(col) for col in cols], [c[k] if k < n else 0.0 for k in basis])
    if xb is None or yb is None:
        return None
    for q, k in enumerate(basis):
        if k < n:
            x[k] = min(max(xb[q], lo[k]), hi[k])
    d = [c[j] - math.fsum(yb[i] * a[i][j] for i in range(m)) for j in range(n)]
    return x, yb, d, at_upper[:n], basic


def _solve(mat, rhs):
    """x with mat·x = rhs, Gaussian elimination with partial pivoting; None
    when mat is singular."""
    size = len(rhs)
    aug = [list(row) + [v] for row, v in zip(mat, rhs)]
    for col in range(size):
        p = max(range(col, size), key=lambda i: abs(aug[i][col]))
        if aug[p][col] == 0.0:
            return None
        aug[col], aug[p] = aug[p], aug[col]
        pivot_row = aug[col]
        for i in range(col + 1, size):
            f = aug[i][col] / pivot_row[col]
            if f != 0.0:
                row = aug[i]
                for k in range(col, size + 1):
                    row[k] -= f * pivot_row[k]
    out = [0.0] * size
    for i in range(size - 1, -1, -1):
        out[i] = (aug[i][size] - sum(aug[i][k] * out[k] for k in range(i + 1, size))) / aug[i][i]
    return out


def closest_shares(centre: Sequence[float], start: Sequence[float], rows: Sequence[Sequence[float]], rhs: Sequence[float],
                   bounds: Sequence[tuple[float, float]]) -> tuple[float, ...] | None:
    """The shares nearest `centre` (least sum of squared deviations) under
    rows·x = rhs and the bounds, from a feasible `start`; None when the
    method does not end. The caller checks whatever comes back against every
    constraint."""
    n = len(centre)
    cen = [float(v) for v in centre]
    a = [[float(v) for v in r] for r in rows]
    b = [float(v) for v in rhs]
    lo = [float(lb) for lb, _ in bounds]
    hi = [float(ub) for _, ub in bounds]
    x = [min(max(float(v), l), h) for v, l, h in zip(start, lo, hi)]
    # Every share the start leaves on a bound is held there to begin with.
    held = [-1 if x[j] <= lo[j] + ON_BOUND else 1 if x[j] >= hi[j] - ON_BOUND else 0 for j in range(n)]
    for j in range(n):
        if held[j]:
            x[j] = lo[j] if held[j] < 0 else hi[j]
    for _ in range(10 * (n + 1) ** 2):
        free = [j for j in range(n) if not held[j]]
        basis = _row_basis([[r[j] for j in free] for r in a])
        # The step to the nearest point of the face: the part of (centre − x)
        # the free shares' equalities leave free (their null space).
        p = _null_part([cen[j] - x[j] for j in free], basis)
        if max(map(abs, p), default=0.0) > POLISH_RESIDUAL:
            step, block = 1.0, None
            for q, j in enumerate(free):
                if p[q] < 0 and x[j] + p[q] < lo[j]:
                    t = (x[j] - lo[j]) / -p[q]
                elif p[q] > 0 and x[j] + p[q] > hi[j]:
                    t = (hi[j] - x[j]) / p[q]
                else:
                    continue
                if t < step:
                    step, block = t, (j, -1 if p[q] < 0 else 1)
            for q, j in enumerate(free):
                x[j] = min(max(x[j] + step * p[q], lo[j]), hi[j])
            if block is not None:
                j, side = block
                held[j], x[j] = side, lo[j] if side < 0 else hi[j]
            continue
        # On the face's optimum: release the held share whose multiplier has
        # the wrong sign (the objective falls as it leaves its bound), if any.
        g = [x[j] - cen[j] for j in range(n)]
        mu = _row_multipliers([g[j] for j in free], basis)
        worst, release = OPTIMALITY, None
        for j in range(n):
            if held[j] and hi[j] > lo[j]:
                nu = g[j] - sum(m_i * a[i][j] for i, m_i in mu)
                wrong = -nu if held[j] < 0 else nu
                if wrong > worst:
                    worst, release = wrong, j
        if release is None:
            return tuple(_polish(x, held, a, b, lo, hi))
        held[release] = 0
    return None


def _row_basis(rows):
    """An orthonormal basis of the rows' span by modified Gram–Schmidt, with
    the factor L of the independent rows (rows_K = L·Q, L lower triangular):
    (kept row indices, Q, L). Rows that are combinations of earlier ones
    (a ratio and fixed shares that repeat the total) are dropped."""
    kept, q, lower = [], [], []
    for i, row in enumerate(rows):
        v = list(row)
        length = math.sqrt(sum(e * e for e in v))
        coeffs = []
        for u in q:
            f = sum(e * w for e, w in zip(v, u))
            coeffs.append(f)
            v = [e - f * w for e, w in zip(v, u)]
        norm = math.sqrt(sum(e * e for e in v))
        if length == 0.0 or norm <= RANK_ZERO * length:
            continue
        kept.append(i)
        q.append([e / norm for e in v])
        lower.append(coeffs + [norm])
    return kept, q, lower


def _null_part(vec, basis):
    """vec less its projection on the rows' span."""
    _kept, q, _lower = basis
    out = list(vec)
    for u in q:
        f = sum(e * w for e, w in zip(out, u))
        out = [e - f * w for e, w in zip(out, u)]
    return out


def _row_multipliers(g, basis):
    """μ with rows_Kᵀ·μ = g in least squares, as (row index, μ) pairs: Qg
    then back substitution through Lᵀ."""
    kept, q, lower = basis
    w = [sum(e * f for e, f in zip(u, g)) for u in q]
    mu = [0.0] * len(kept)
    for k in range(len(kept) - 1, -1, -1):
        mu[k] = (w[k] - sum(lower[r][k] * mu[r] for r in range(k + 1, len(kept)))) / lower[k][k]
    return list(zip(kept, mu))


def _polish(x, held, a, b, lo, hi):
    """x moved by the least-norm correction that makes the free shares meet
    the equalities to rounding error (Q·δ = L⁻¹·residual, δ = Qᵀ·that); x
    itself when the correction would break a bound or miss a row."""
    free = [j for j in range(len(x)) if not held[j]]
    residual = [bi - math.fsum(r[j] * x[j] for j in range(len(x))) for r, bi in zip(a, b)]
    kept, q, lower = _row_basis([[r[j] for j in free] for r in a])
    z = []
    for k, i in enumerate(kept):
        z.append((residual[i] - sum(lower[k][r] * z[r] for r in range(k))) / lower[k][k])
    out = list(x)
    for q_k, z_k in zip(q, z):
        for p, j in enumerate(free):
            out[j] += z_k * q_k[p]
    if any(v < l - POLISH_RESIDUAL or v > h + POLISH_RESIDUAL for v, l, h in zip(out, lo, hi)):
        return x
    out = [min(max(v, l), h) for v, l, h in zip(out, lo, hi)]
    worst = max((abs(bi - math.fsum(r[j] * out[j] for j in range(len(out)))) / max(1.0, abs(bi), *map(abs, r))
                 for r, bi in zip(a, b)), default=0.0)
    return out if worst <= POLISH_RESIDUAL else x


__all__ = ["LinearOptimum", "closest_shares", "linear_optimum"]
