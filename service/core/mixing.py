"""The mass-weighted mean of the HLB system, carried with its span.

Blend HLB and required HLB of an oil phase are both Σ wᵢ·xᵢ / Σ wᵢ over mass
weights wᵢ (Griffin 1949). Where sources disagree on a value xᵢ, the mean is
monotone in each xᵢ, so the lowest and highest means come from every
ingredient's lowest and highest figures."""
from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence


@dataclass(frozen=True)
class Term:
    weight: float
    figure: float
    low: float
    high: float


@dataclass(frozen=True)
class Mean:
    figure: float
    low: float
    high: float
    fractions: tuple[float, ...]


def weighted_mean(terms: Sequence[Term]) -> Mean:
    """Mass-weighted mean of the terms' figures, and of their lows and highs.
    Weights must be positive; the fractions returned sum to 1."""
    total = sum(t.weight for t in terms)
    fractions = tuple(t.weight / total for t in terms)
    return Mean(
        figure=sum(f * t.figure for f, t in zip(fractions, terms)),
        low=sum(f * t.low for f, t in zip(fractions, terms)),
        high=sum(f * t.high for f, t in zip(fractions, terms)),
        fractions=fractions,
    )
