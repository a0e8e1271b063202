"""Shares of a blend of two or more surfactants that reach a target HLB under
constraints (Griffin 1949's mass-weighted mean, solved for the shares).

With n members the target and the shares' total leave n − 2 degrees of
freedom; bounds, fixed shares and ratios narrow them, and an objective picks
one answer among those left: `most_even` (least sum of squared deviations
from equal shares) or `least_ionic` (least total share of ionic members, ties
broken by most_even). The reachable HLB range under the constraints is the
minimum and maximum of the blend HLB over them, two linear programs; a target
outside it is refused with the nearest reachable HLB and the constraints that
bind there (those whose marginal in the linear program is not zero:
relaxing one would move the end of the range towards the target).

Paths in the errors and constraints are those of the request body
(`surfactants`, `ratios`, `target_hlb`)."""
from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence

from service.core.blend import HlbValue
from service.core.blend_programs import LinearOptimum, closest_shares, linear_optimum
from service.core.errors import CalculationError, pointer
from service.core.mixing import Mean, Term, weighted_mean

OBJECTIVES = ("most_even", "least_ionic")
# The slack the target and the constraints are held to: relative to the
# figures' size, as in split.py, since a float cannot do better.
TOLERANCE = 1e-9
# A marginal below this (HLB per unit of share) is taken for zero.
MARGINAL_ZERO = 1e-9


@dataclass(frozen=True)
class Member:
    """One surfactant: its HLB, whether it is ionic, its label for the words,
    and its constraints as fractions of the blend (bounds default to 0 and 1;
    `given_low`/`given_high` say whether the caller set them)."""

    hlb: HlbValue
    label: str
    ionic: bool = False
    low: float = 0.0
    high: float = 1.0
    fixed: float | None = None
    given_low: bool = False
    given_high: bool = False


@dataclass(frozen=True)
class Ratio:
    """share of member a : share of member b = a_parts : b_parts."""

    a: int
    b: int
    a_parts: float
    b_parts: float


@dataclass(frozen=True)
class Constraint:
    kind: str            # fixed, lower_bound, upper_bound, ratio
    path: tuple
    description: str
    given: bool          # false for the natural bounds, 0 and 100 %
    active: bool = False

    def as_dict(self) -> dict:
        return {"kind": self.kind, "pointer": pointer(self.path), "description": self.description, "given": self.given, "active": self.active}


@dataclass(frozen=True)
class BlendShares:
    fractions: tuple[float, ...]
    hlb: Mean
    objective: str
    reachable_low: float
    reachable_high: float
    ionic_fraction: float
    constraints: tuple[Constraint, ...]


class ConstraintsRefused(CalculationError):
    """The constraints, or the target under them, cannot be met; `binding`
    names the constraints that decide it."""

    def __init__(self, path: tuple, rule: str, message: str, binding: Sequence[Constraint], **extra):
        # Figures cut to 10 significant digits, as every answer's are: 10.594999999999999 is float noise, not precision.
        super().__init__(path, rule, message, binding=[_binding_dict(c) for c in binding], **{k: float(f"{v:.10g}") for k, v in extra.items()})


def _binding_dict(c: Constraint) -> dict:
    d = c.as_dict()
    d.pop("active")
    return d


def _rows(members: Sequence[Member], ratios: Sequence[Ratio]) -> tuple[list[list[float]], list[float], list[Constraint]]:
    """The equalities other than the total: a row per fixed share and per
    ratio, with the constraint each states."""
    n = len(members)
    rows, rhs, said = [], [], []
    for i, m in enumerate(members):
        if m.fixed is not None:
            rows.append([1.0 if j == i else 0.0 for j in range(n)])
            rhs.append(m.fixed)
            said.append(Constraint("fixed", ("surfactants", i, "fixed_percent_w_w"), f"{m.label} fixed at {m.fixed * 100:g} % w/w", True))
    for k, r in enumerate(ratios):
        row = [0.0] * n
        # x_a / x_b = a_parts / b_parts, written without a division.
        row[r.a] += r.b_parts
        row[r.b] -= r.a_parts
        rows.append(row)
        rhs.append(0.0)
        said.append(Constraint("ratio", ("ratios", k), f"{members[r.a].label} : {members[r.b].label} = {r.a_parts:g} : {r.b_parts:g}", True))
    return rows, rhs, said


def _bound_constraints(members: Sequence[Member], i: int) -> tuple[Constraint, Constraint]:
    m = members[i]
    low = (Constraint("lower_bound", ("surfactants", i, "min_percent_w_w"), f"{m.label} at least {m.low * 100:g} % w/w", True)
           if m.given_low else Constraint("lower_bound", ("surfactants", i), f"{m.label} cannot be below 0 %", False))
    high = (Constraint("upper_bound", ("surfactants", i, "max_percent_w_w"), f"{m.label} at most {m.high * 100:g} % w/w", True)
            if m.given_high else Constraint("upper_bound", ("surfactants", i), f"{m.label} cannot exceed 100 %", False))
    return low, high


def _binding(opt: LinearOptimum, members: Sequence[Member], said: Sequence[Constraint], first_row: int) -> list[Constraint]:
    """The constraints whose marginal at the optimum is not zero: caller's
    first, then the natural bounds; the rows from `first_row` are `said`."""
    out = [c for c, m in zip(said, opt.row_marginals[first_row:]) if abs(m) > MARGINAL_ZERO]
    for i in range(len(members)):
        low, high = _bound_constraints(members, i)
        if abs(opt.lower_marginals[i]) > MARGINAL_ZERO and members[i].fixed is None:
            out.append(low)
        if abs(opt.upper_marginals[i]) > MARGINAL_ZERO and members[i].fixed is None:
            out.append(high)
    return sorted(out, key=lambda c: not c.given)


def _words(constraints: Sequence[Constraint]) -> str:
    return "; ".join(c.description for c in constraints) or "no constraint: the members' own HLBs"


def _check_total(members, rows, rhs, said, bounds) -> None:
    """Refuse constraints that cannot add up to 100 %, naming those that
    bind at the nearer end of the totals they allow."""
    n = len(members)
    if not rows:
        # Bounds alone: the totals reachable run from the sum of the lower
        # bounds to the sum of the upper ones, exactly. Well inside 100 % the
        # two programs below would only confirm it; at or past an edge they
        # still run, for the figures and the binding bounds they report.
        margin = TOLERANCE / 2
        if (all(lo <= hi for lo, hi in bounds) and sum(lo for lo, _ in bounds) <= 1.0 + margin
                and sum(hi for _, hi in bounds) >= 1.0 - margin):
            return
    ones = [1.0] * n
    low = linear_optimum(ones, rows, rhs, bounds)
    if low is None:
        ratios = [c for c in said if c.kind == "ratio"]
        raise ConstraintsRefused(("ratios",), "constraints_consistent",
                                 f"the ratios cannot hold together with the fixed shares and bounds of their members: {_words(ratios)}", ratios)
    high = linear_optimum(ones, rows, rhs, bounds, maximise=True)
    if low.value <= 1.0 + TOLERANCE and high.value >= 1.0 - TOLERANCE:
        return
    end = low if low.value > 1.0 else high
    binding = _binding(end, members, said, 0)
    side = "at least" if end is low else "at most"
    raise ConstraintsRefused(("surfactants",), "constraints_consistent",
                             f"the constraints make the shares add up to {side} {end.value * 100:.4g} %, never 100 %: {_words(binding)}",
                             binding, shares_total_low_percent=low.value * 100, shares_total_high_percent=high.value * 100)


def solve_shares(target_hlb: float, members: Sequence[Member], ratios: Sequence[Ratio] = (), objective: str = "most_even") -> BlendShares:
    """Shares of `members` for `target_hlb` under their bounds, fixed shares
    and `ratios`, chosen by `objective`. Raises ConstraintsRefused
    (constraints_consistent, target_reachable_under_constraints) or
    CalculationError (solution_found) when the solver fails its own check."""
    n = len(members)
    if n < 2:
        raise CalculationError(("surfactants",), "at_least_two", "a blend needs at least two surfactants")
    hlbs = [m.hlb.figure for m in members]
    bounds = [(m.low, m.high) for m in members]
    rows, rhs, said = _rows(members, ratios)
    _check_total(members, rows, rhs, said, bounds)
    # The total is row 0 of every program from here on.
    rows, rhs = [[1.0] * n, *rows], [1.0, *rhs]
    low = linear_optimum(hlbs, rows, rhs, bounds)
    high = linear_optimum(hlbs, rows, rhs, bounds, maximise=True)
    reach_low, reach_high = _blend_hlb(low.shares, hlbs), _blend_hlb(high.shares, hlbs)
    slack = TOLERANCE * max(1.0, abs(target_hlb))
    if not reach_low - slack <= target_hlb <= reach_high + slack:
        end = low if target_hlb < reach_low else high
        nearest = reach_low if end is low else reach_high
        binding = _binding(end, members, said, 1)
        raise ConstraintsRefused(
            ("target_hlb",), "target_reachable_under_constraints",
            f"target HLB {target_hlb:g} cannot be reached under the constraints, which allow {reach_low:.2f} to {reach_high:.2f}; "
            f"the nearest reachable HLB is {nearest:.2f}, where these bind: {_words(binding)}",
            binding, reachable_low=reach_low, reachable_high=reach_high, nearest_reachable=nearest)
    # Between the two ends of the range lies a point on target that meets
    # every constraint, the equalities being linear: the solver starts there.
    weight = 0.0 if reach_high == reach_low else min(max((target_hlb - reach_low) / (reach_high - reach_low), 0.0), 1.0)
    start = tuple((1.0 - weight) * a + weight * b for a, b in zip(low.shares, high.shares))
    rows, rhs = [*rows, hlbs], [*rhs, target_hlb]
    ionic = [1.0 if m.ionic else 0.0 for m in members]
    if objective == "least_ionic" and any(ionic):
        # On target within the slack when the exact row is too tight for the
        # solver's own tolerance (a single reachable point).
        least = linear_optimum(ionic, rows, rhs, bounds) or linear_optimum(ionic, rows[:-1], rhs[:-1], bounds, band=(hlbs, target_hlb - slack, target_hlb + slack))
        if least is None:
            raise CalculationError(("target_hlb",), "solution_found", "the solver found no least ionic share for a target within the reachable range")
        rows, rhs, start = [*rows, ionic], [*rhs, least.value], least.shares
    shares = closest_shares([1.0 / n] * n, start, rows, rhs, bounds)
    if shares is None or not _holds(shares, rows, rhs, bounds, target_hlb, hlbs):
        raise CalculationError(("target_hlb",), "solution_found",
                               "the solver's shares did not pass the check of every constraint and the target; no answer is given")
    terms = [Term(max(x, 0.0), m.hlb.figure, m.hlb.low, m.hlb.high) for x, m in zip(shares, members)]
    return BlendShares(shares, weighted_mean(terms), objective, reach_low, reach_high, sum(x for x, i in zip(shares, ionic) if i),
                       _with_activity(members, said, shares, ratios))


def _blend_hlb(shares: Sequence[float], hlbs: Sequence[float]) -> float:
    return sum(x * h for x, h in zip(shares, hlbs)) / sum(shares)


def _holds(shares, rows, rhs, bounds, target_hlb, hlbs) -> bool:
    """Every constraint within TOLERANCE, and the recomputed mean on target."""
    if any(x < lo - TOLERANCE or x > hi + TOLERANCE for x, (lo, hi) in zip(shares, bounds)):
        return False
    if any(abs(sum(a * x for a, x in zip(row, shares)) - b) > TOLERANCE * max(1.0, abs(b), max(map(abs, row))) for row, b in zip(rows, rhs)):
        return False
    return abs(_blend_hlb(shares, hlbs) - target_hlb) <= TOLERANCE * max(1.0, abs(target_hlb))


def _with_activity(members, said, shares, ratios) -> tuple[Constraint, ...]:
    """The caller's constraints, each marked active when it holds with
    equality at the answer: a bound reached; a fixed share or a ratio always."""
    out = [Constraint(c.kind, c.path, c.description, c.given, True) for c in said]
    for i, m in enumerate(members):
        low, high = _bound_constraints(members, i)
        if m.given_low:
            out.append(Constraint(low.kind, low.path, low.description, True, abs(shares[i] - m.low) <= TOLERANCE))
        if m.given_high:
            out.append(Constraint(high.kind, high.path, high.description, True, abs(shares[i] - m.high) <= TOLERANCE))
    return tuple(sorted(out, key=lambda c: c.path))


__all__ = ["BlendShares", "Constraint", "ConstraintsRefused", "Member", "OBJECTIVES", "Ratio", "solve_shares"]
