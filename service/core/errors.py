"""Errors of the calculations. Each names where in the input the fault lies
(a path of keys and indexes, as the caller's input is shaped) and the rule."""
from __future__ import annotations


class CalculationError(ValueError):
    def __init__(self, path: tuple, rule: str, message: str, **extra):
        self.path = tuple(path)
        self.rule = rule
        self.message = message
        self.extra = extra
        super().__init__(message)


class InfeasibleTarget(CalculationError):
    """The target HLB lies outside what the blend can reach."""

    def __init__(self, path: tuple, target: float, reachable_low: float, reachable_high: float):
        nearest = min(max(target, reachable_low), reachable_high)
        super().__init__(
            path,
            "target_outside_reachable_range",
            f"target HLB {target:g} is outside the range this blend can reach, "
            f"{reachable_low:.2f} to {reachable_high:.2f}; the nearest reachable HLB is {nearest:.2f}",
            reachable_low=reachable_low,
            reachable_high=reachable_high,
            nearest_reachable=nearest,
        )
