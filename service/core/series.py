"""The experimental series that finds an oil's required HLB (Griffin 1949):
emulsions of the oil with blends of one surfactant pair across an HLB range;
the best one's HLB is the oil's required HLB, and a finer series around it
refines the value."""
from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence

from service.core.errors import CalculationError

MAX_TESTS = 41


@dataclass(frozen=True)
class Point:
    hlb: float
    share_high: float  # mass fraction of the pair's higher-HLB member


def plan_points(pair_low: float, pair_high: float, range_low: float, range_high: float,
                step_hlb: float | None = None, proportion_step: float | None = None) -> list[Point]:
    """Test points from range_low to range_high (clamped to what the pair
    reaches), every step_hlb HLB units, or every proportion_step of the pair
    (a fraction, e.g. 0.1). Raises when the range is empty or too fine."""
    if pair_low >= pair_high:
        raise CalculationError(("pair",), "pair_hlbs_differ", "the pair's two HLBs must differ")
    low, high = max(range_low, pair_low), min(range_high, pair_high)
    if low > high:
        raise CalculationError(("hlb_range",), "range_reachable", f"the pair reaches HLB {pair_low:g} to {pair_high:g}, outside the range asked")
    span = pair_high - pair_low
    if proportion_step is not None:
        start, stop, step = (low - pair_low) / span, (high - pair_low) / span, proportion_step
    else:
        start, stop, step = low, high, step_hlb
    n = int((stop - start) / step + 1e-9) + 1
    if n > MAX_TESTS:
        raise CalculationError(("step",), "at_most_41_tests", f"that step gives {n} tests; at most {MAX_TESTS} are planned at once")
    values = [start + i * step for i in range(n)]
    if stop - values[-1] > 1e-9 * max(1.0, abs(stop)):
        values.append(stop)  # the range's end is always tested
    if proportion_step is not None:
        return [Point(pair_low + x * span, x) for x in values]
    return [Point(h, (h - pair_low) / span) for h in values]


@dataclass(frozen=True)
class Estimate:
    best_hlb: float
    estimate_hlb: float
    basis: str            # score | droplet_size | pass_fail
    refined: bool         # a fit through the best test's neighbours moved the estimate
    bracketed: bool       # the best test has a worse test on each side
    uncertainty_hlb: float
    note: str
    # The three test HLBs the refining parabola went through (ascending),
    # empty when the estimate was not refined by one.
    fit_hlbs: tuple[float, ...] = ()


def parabola_through(x: Sequence[float], y: Sequence[float]) -> tuple[float, float, float]:
    """(a, b, c) of y = a·x² + b·x + c through three points of distinct x."""
    (x1, x2, x3), (y1, y2, y3) = x, y
    denom = (x1 - x2) * (x1 - x3) * (x2 - x3)
    a = (x3 * (y2 - y1) + x2 * (y1 - y3) + x1 * (y3 - y2)) / denom
    b = (x3 * x3 * (y1 - y2) + x2 * x2 * (y3 - y1) + x1 * x1 * (y2 - y3)) / denom
    c = (x2 * x3 * (x2 - x3) * y1 + x3 * x1 * (x3 - x1) * y2 + x1 * x2 * (x1 - x2) * y3) / denom
    return a, b, c


def _vertex(x: Sequence[float], y: Sequence[float]) -> float | None:
    """The vertex of the parabola through three points, or None when they lie
    on a line."""
    a, b, _ = parabola_through(x, y)
    if a == 0:
        return None
    return -b / (2 * a)


def parabola_points(x: Sequence[float], y: Sequence[float], n: int = 41) -> list[tuple[float, float]]:
    """n points (x, y) of the parabola through three points, evenly from the
    first x to the last: the refining fit, drawn."""
    a, b, c = parabola_through(x, y)
    low, high = x[0], x[-1]
    xs = [low + i * (high - low) / (n - 1) for i in range(n)]
    return [(h, (a * h + b) * h + c) for h in xs]


def estimate_from_scores(hlbs: Sequence[float], goodness: Sequence[float], basis: str) -> Estimate:
    """Best test by `goodness` (higher is better), refined by a parabola
    through it and its neighbours when it is bracketed."""
    order = sorted(range(len(hlbs)), key=lambda i: hlbs[i])
    x = [hlbs[i] for i in order]
    y = [goodness[i] for i in order]
    best = max(range(len(x)), key=lambda i: (y[i], -abs(i - (len(x) - 1) / 2)))
    ties = [i for i in range(len(x)) if y[i] == y[best]]
    gaps = [b - a for a, b in zip(x, x[1:])]
    local_step = min(gaps) if gaps else 0.0
    if len(ties) > 1:
        mid = (x[ties[0]] + x[ties[-1]]) / 2
        return Estimate(x[best], mid, basis, False, 0 < ties[0] and ties[-1] < len(x) - 1,
                        (x[ties[-1]] - x[ties[0]]) / 2 + local_step / 2,
                        "several tests share the best result: the estimate is the middle of that run; a finer series should separate them")
    if best in (0, len(x) - 1):
        return Estimate(x[best], x[best], basis, False, False, local_step,
                        "the best test is at the end of the series: the required HLB may lie beyond it; extend the range")
    vertex = _vertex(x[best - 1: best + 2], y[best - 1: best + 2])
    left, right = x[best] - x[best - 1], x[best + 1] - x[best]
    if vertex is None or not x[best - 1] <= vertex <= x[best + 1]:
        return Estimate(x[best], x[best], basis, False, True, max(left, right) / 2, "bracketed by worse tests; no curvature to refine by")
    refined = abs(vertex - x[best]) > 1e-12
    return Estimate(x[best], vertex, basis, refined, True, max(left, right) / 2,
                    "bracketed by worse tests; refined by a parabola through the best test and its two neighbours",
                    tuple(x[best - 1: best + 2]) if refined else ())


def estimate_from_pass_fail(hlbs: Sequence[float], passed: Sequence[bool]) -> Estimate:
    """The middle of the longest run of passing tests."""
    order = sorted(range(len(hlbs)), key=lambda i: hlbs[i])
    x = [hlbs[i] for i in order]
    ok = [passed[i] for i in order]
    if not any(ok):
        raise CalculationError(("tests",), "some_test_passed", "no test passed: the required HLB is not in this series; widen the range or change the pair")
    runs, start = [], None
    for i, flag in enumerate(ok + [False]):
        if flag and start is None:
            start = i
        elif not flag and start is not None:
            runs.append((start, i - 1))
            start = None
    first, last = max(runs, key=lambda r: (r[1] - r[0], -r[0]))
    gaps = [b - a for a, b in zip(x, x[1:])]
    step = min(gaps) if gaps else 0.0
    bracketed = first > 0 and last < len(x) - 1
    note = ("the passing run is bracketed by failures" if bracketed else
            "the passing run reaches the end of the series: the required HLB may lie beyond it")
    return Estimate(x[(first + last) // 2], (x[first] + x[last]) / 2, "pass_fail", False, bracketed,
                    (x[last] - x[first]) / 2 + step / 2, note)


def finer_series(estimate: Estimate, step_hlb: float, reach_low: float, reach_high: float, n: int = 5) -> list[float]:
    """A finer series around the estimate: n points over ± one previous step
    (two steps beyond the end when the best was at an end), clamped to what
    the pair reaches."""
    half = step_hlb if estimate.bracketed else 2 * step_hlb
    low, high = max(reach_low, estimate.estimate_hlb - half), min(reach_high, estimate.estimate_hlb + half)
    if high <= low:
        return [round(estimate.estimate_hlb, 2)]
    return [round(low + i * (high - low) / (n - 1), 2) for i in range(n)]
