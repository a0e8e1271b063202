"""The first few candidate pairs in the order of candidates.RULE, found
without building and sorting every pair.

Pair.rank_key is (not matches_oil, not same_chain, balance step, ionic
members, imbalance, low id, high id). The index sorts the surfactants once by
HLB, in groups by ionic class and by (fatty chain, ionic class). For a target
T, the pairs of one chain tier and one count of ionic members come out of a
heap in (imbalance, low id, high id) order: for each low member l, the
imbalance |(T - l)/(h - l) - 0.5| of its high members h does not fall as h
moves away, on either side, from where the share is 50 : 50, so two pointers
walk outward from that point. The balance step is round(imbalance * 10), which
does not fall as the imbalance grows; so for each tier and each step, the
three streams (0, 1 or 2 ionic members) are drained in turn while their next
pair is still in that step. The work is n log n to start a stream and log n a
pair taken; only the streams reached are started.

Ties: ids are unique in a registry, so the rank key orders every pair and the
order does not depend on how the pairs were enumerated."""
from __future__ import annotations

import heapq
from bisect import bisect_left, bisect_right
from itertools import count as counter
from typing import Iterator, Sequence

from service.core.candidates import Pair, Surfactant

NONIONIC = "nonionic"
# Never proposed together (candidates.RULE).
_OPPOSED = frozenset({"anionic", "cationic"})


def _imbalance(target: float, low: float, high: float) -> float:
    # The same arithmetic as Pair.share_high and Pair.rank_key, so that the
    # order found is the order the key gives.
    return abs((target - low) / (high - low) - 0.5)


class _Sorted:
    """Surfactants sorted by (HLB, id), with their HLBs for bisection."""

    __slots__ = ("items", "hlbs", "_above")

    def __init__(self, items: Sequence[Surfactant]):
        self.items = sorted(items, key=lambda s: (s.hlb, s.id))
        self.hlbs = [s.hlb for s in self.items]
        self._above: tuple[float, list[Surfactant]] | None = None

    def above_by_id(self, target: float) -> list[Surfactant]:
        """The members above the target, by id: the high members, all at
        imbalance 0.5, of every low member whose HLB is the target. Kept for
        the last target, so that many such low members sort them once."""
        memo = self._above
        if memo is None or memo[0] != target:
            memo = self._above = (target, sorted(self.items[self.at_most(target):], key=lambda s: s.id))
        return memo[1]

    def below(self, target: float) -> int:
        return bisect_left(self.hlbs, target)

    def at_most(self, target: float) -> int:
        return bisect_right(self.hlbs, target)


def _crossing(lows: _Sorted, highs: _Sorted, target: float) -> int:
    """How many pairs have their low member in `lows`, their high member in
    `highs` and reach the target: low <= target <= high, the HLBs unequal."""
    lo_lt, lo_le = lows.below(target), lows.at_most(target)
    hi_lt, hi_le = highs.below(target), highs.at_most(target)
    hi_gt, hi_eq = len(highs.hlbs) - hi_le, hi_le - hi_lt
    return lo_lt * (hi_gt + hi_eq) + (lo_le - lo_lt) * hi_gt


def _outward(low: Surfactant, highs: _Sorted, target: float, skip_chain: str | None) -> Iterator[tuple[float, str, Surfactant]]:
    """The high members for `low` (HLB at or above the target and above the
    low member's), in (imbalance, id) order; members of `skip_chain` left out."""
    items, hlbs, t, lh = highs.items, highs.hlbs, target, low.hlb
    if lh == t:  # every share is 0: one group, ordered by id alone
        for s in highs.above_by_id(t):
            if skip_chain is None or s.fatty_chain != skip_chain:
                yield 0.5, s.id, s
        return
    start, end = highs.below(t), len(items)
    # First index whose share is at most 0.5 (the share falls as h rises).
    a, b = start, end
    while a < b:
        mid = (a + b) // 2
        if (t - lh) / (items[mid].hlb - lh) - 0.5 <= 0:
            b = mid
        else:
            a = mid + 1
    left, right = a - 1, a  # left walks down to start, right up to end

    def imb(i: int) -> float:
        return _imbalance(t, lh, hlbs[i])

    while left >= start or right < end:
        value = min(imb(left) if left >= start else 1.0, imb(right) if right < end else 1.0)
        # A group of equal imbalance is made of runs of equal HLB (each in id
        # order already): one run, or one each side; more only where floats
        # round two HLBs to one imbalance.
        runs = []
        while left >= start and imb(left) == value:
            first = bisect_left(hlbs, hlbs[left], start, left + 1)
            runs.append(range(first, left + 1))
            left = first - 1
        while right < end and imb(right) == value:
            past = bisect_right(hlbs, hlbs[right], right, end)
            runs.append(range(right, past))
            right = past
        group = (items[i] for i in runs[0]) if len(runs) == 1 else \
            heapq.merge(*[(items[i] for i in r) for r in runs], key=lambda s: s.id)
        for s in group:
            if skip_chain is None or s.fatty_chain != skip_chain:
                yield value, s.id, s


class PairIndex:
    """Surfactants grouped and sorted once, for ranking pairs at any target."""

    def __init__(self, surfactants: Sequence[Surfactant]):
        self.all = _Sorted(surfactants)
        by_class: dict[str, list[Surfactant]] = {}
        by_chain: dict[tuple[str, str], list[Surfactant]] = {}
        for s in surfactants:
            by_class.setdefault(s.ionic_class, []).append(s)
            if s.fatty_chain is not None:
                by_chain.setdefault((s.fatty_chain, s.ionic_class), []).append(s)
        self.by_class = {k: _Sorted(v) for k, v in by_class.items()}
        self.by_chain = {k: _Sorted(v) for k, v in by_chain.items()}

    def count(self, target: float) -> int:
        """How many pairs reach the target (low <= target <= high, unequal
        HLBs, never anionic with cationic), without listing them."""
        total = _crossing(self.all, self.all, target)
        an, cat = self.by_class.get("anionic"), self.by_class.get("cationic")
        if an and cat:
            total -= _crossing(an, cat, target) + _crossing(cat, an, target)
        return total

    def _stream(self, target: float, tier: int, ionic: int, oil_chain: str | None) -> Iterator[tuple]:
        """Pairs of one chain tier (0: the oil's chain, 1: another shared
        chain, 2: no shared chain) and one count of ionic members, in
        (imbalance, low id, high id) order."""
        heap, tie = [], counter()
        for low_class, lows in self.by_class.items():
            for high_class in self.by_class:
                if ({low_class, high_class} == _OPPOSED
                        or (low_class != NONIONIC) + (high_class != NONIONIC) != ionic):
                    continue
                for low in lows.items[:lows.at_most(target)]:
                    chain = low.fatty_chain
                    if tier == 2:
                        highs, skip = self.by_class[high_class], chain
                    elif chain is None or (chain == oil_chain) != (tier == 0):
                        continue
                    else:
                        highs, skip = self.by_chain.get((chain, high_class)), None
                    if highs is None:
                        continue
                    it = _outward(low, highs, target, skip)
                    first = next(it, None)
                    if first is not None:
                        heap.append((first[0], low.id, first[1], next(tie), low, first[2], it))
        heapq.heapify(heap)
        while heap:
            value, low_id, high_id, _, low, high, it = heap[0]
            yield value, low, high
            following = next(it, None)
            if following is None:
                heapq.heappop(heap)
            else:
                heapq.heapreplace(heap, (following[0], low_id, following[1], next(tie), low, following[2], it))

    def ranked(self, target: float, oil_chain: str | None = None, limit: int | None = None) -> list[Pair]:
        """The first `limit` pairs (all when None) in Pair.rank_key order."""
        out: list[Pair] = []
        want = self.count(target) if limit is None else limit
        tiers = (0, 1, 2) if oil_chain is not None else (1, 2)
        for tier in tiers:
            streams = [None, None, None]
            heads = [None, None, None]
            for step in range(6):  # round(imbalance * 10) runs from 0 to 5
                for ionic in range(3):
                    if len(out) >= want:
                        return out
                    if streams[ionic] is None:
                        streams[ionic] = self._stream(target, tier, ionic, oil_chain)
                        heads[ionic] = next(streams[ionic], None)
                    while heads[ionic] is not None and round(heads[ionic][0] * 10) == step and len(out) < want:
                        _, low, high = heads[ionic]
                        out.append(Pair(low, high, (target - low.hlb) / (high.hlb - low.hlb), oil_chain))
                        heads[ionic] = next(streams[ionic], None)
        return out


def candidate_pairs(target_hlb: float, surfactants: Sequence[Surfactant], oil_chain: str | None = None,
                    limit: int | None = None) -> list[Pair]:
    """The pairs with one HLB below and one above the target (or equal to
    it), ranked by RULE (the first `limit`, or all); `oil_chain` is the oil
    phase's fatty chain."""
    return PairIndex(surfactants).ranked(target_hlb, oil_chain, limit)
