"""Surfactant pairs that can reach a target HLB, ranked by a rule of thumb.

The rule (common practice, no source): pairs of one fatty-chain family first
(e.g. a sorbitan stearate with a polyoxyethylene sorbitan stearate), then
balanced proportions (shares near 50 : 50, in steps of 10 %), then nonionic
pairs before pairs with an ionic member. Anionic with cationic is never
proposed; hydrocolloids (apparent HLB only) are left out by the caller.
The ranking itself, which finds the first pairs without listing them all, is
in pair_ranking."""
from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence

RULE = ("with an oil phase whose fatty chain the registry knows, pairs of that chain first; then one fatty-chain family; "
        "then balanced proportions (shares nearest 50:50, in 10 % steps); then nonionic pairs before pairs with an ionic member; "
        "anionic with cationic never")
# A single surfactant within this of the target meets it on its own: HLB
# values are given to 0.1 and are no better than about half a unit
# (common practice, no source).
SINGLE_TOLERANCE_HLB = 0.5


@dataclass(frozen=True)
class Surfactant:
    id: str
    hlb: float
    ionic_class: str
    fatty_chain: str | None


@dataclass(frozen=True)
class Pair:
    low: Surfactant
    high: Surfactant
    share_high: float  # mass fraction of the higher-HLB surfactant
    oil_chain: str | None = None  # the oil phase's fatty chain, where known

    @property
    def same_chain(self) -> bool:
        return self.low.fatty_chain is not None and self.low.fatty_chain == self.high.fatty_chain

    @property
    def matches_oil(self) -> bool:
        return self.same_chain and self.oil_chain is not None and self.low.fatty_chain == self.oil_chain

    @property
    def ionic_members(self) -> int:
        return sum(s.ionic_class != "nonionic" for s in (self.low, self.high))

    def rank_key(self) -> tuple:
        imbalance = abs(self.share_high - 0.5)
        return (not self.matches_oil, not self.same_chain, round(imbalance * 10), self.ionic_members, imbalance, self.low.id, self.high.id)


def single_surfactants(target_hlb: float, surfactants: Sequence[Surfactant]) -> list[Surfactant]:
    """Surfactants that meet the target on their own (within
    SINGLE_TOLERANCE_HLB), nearest first."""
    near = [s for s in surfactants if abs(s.hlb - target_hlb) <= SINGLE_TOLERANCE_HLB + 1e-9]
    return sorted(near, key=lambda s: (abs(s.hlb - target_hlb), s.ionic_class != "nonionic", s.id))
