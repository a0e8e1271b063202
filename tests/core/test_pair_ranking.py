"""The pair ranking that stops after the first few (core/pair_ranking.py)
gives the same pairs, in the same order, as listing every pair and sorting
it by Pair.rank_key (the reference below, the service's ranking before issue
15), and the same count of qualifying pairs. The rule itself is common
practice, no source (candidates.RULE); these tests check only that the two
ways of applying it agree: on the shipped registry and on seeded random
registries with ties in HLB and in fatty chains."""
from __future__ import annotations

import random
from itertools import combinations

import pytest
from hypothesis import given, settings, strategies as st

from service.core.candidates import Pair, Surfactant
from service.core.pair_ranking import PairIndex, candidate_pairs
from service.usecases.pairs import ranked, registry_surfactants, surfactant_index

IONIC_CLASSES = ("nonionic", "anionic", "cationic", "amphoteric", "not_applicable")
FILTERS = [("nonionic",), ("nonionic", "anionic"), ("nonionic", "cationic"), ("anionic", "cationic", "amphoteric"), IONIC_CLASSES]


def reference_pairs(target_hlb, surfactants, oil_chain=None):
    """Every pair, sorted: the all-pairs ranking as it was (n^2)."""
    pairs = []
    for a, b in combinations(surfactants, 2):
        low, high = (a, b) if a.hlb <= b.hlb else (b, a)
        if low.hlb == high.hlb or not low.hlb <= target_hlb <= high.hlb:
            continue
        if {low.ionic_class, high.ionic_class} == {"anionic", "cationic"}:
            continue
        pairs.append(Pair(low, high, (target_hlb - low.hlb) / (high.hlb - low.hlb), oil_chain))
    return sorted(pairs, key=Pair.rank_key)


def targets():
    return [round(1.0 + 0.1 * i, 1) for i in range(191)]  # 1.0 to 20.0 in steps of 0.1


@pytest.fixture(scope="module")
def shipped(registry):
    return {(ionic, strict): registry_surfactants(registry, ionic, strict) for ionic in FILTERS for strict in (False, True)}


@pytest.mark.parametrize("strict", [False, True])
@pytest.mark.parametrize("ionic", FILTERS)
def test_shipped_registry_every_target(shipped, ionic, strict):
    surfactants = shipped[(ionic, strict)]
    chains = sorted({s.fatty_chain for s in surfactants if s.fatty_chain})
    index = PairIndex(surfactants)
    compared = 0
    for target in targets():
        for chain in [None, *chains[:3], "no-such-chain"]:
            expected = reference_pairs(target, surfactants, chain)
            assert index.ranked(target, chain) == expected, (target, chain)
            assert index.ranked(target, chain, 10) == expected[:10], (target, chain)
            assert index.ranked(target, chain, 1) == expected[:1], (target, chain)
            assert index.count(target) == len(expected), (target, chain)
            compared += len(expected)
    # Every filter leaves pairs to compare, except strict mode's verified HLBs
    # of ionic surfactants alone, which may be none.
    assert compared > 0 or (strict and "nonionic" not in ionic)


def test_shipped_registry_through_the_cache(registry):
    """The use case's ranking (cached per registry and filter) is the reference's."""
    for ionic in FILTERS:
        surfactants = registry_surfactants(registry, ionic, False)
        for target in (4.5, 8.0, 10.3, 12.0, 15.7):
            assert ranked(registry, target, ionic, False, chain="C18", limit=5) == reference_pairs(target, surfactants, "C18")[:5]
    assert surfactant_index(registry, ("nonionic",), False) is surfactant_index(registry, ("nonionic",), False)
    assert surfactant_index(registry, ("nonionic",), False) is not surfactant_index(registry, ("nonionic",), True)


def synthetic(n: int, seed: int) -> list[Surfactant]:
    """Invented surfactants: HLBs on a 0.1 grid (and some on a 1.0 grid, for
    ties), a few chains (and none), every ionic class."""
    rng = random.Random(seed)
    chains = ["C12", "C16", "C18", "C18:1", None]
    out = []
    for i in range(n):
        hlb = round(rng.uniform(1.0, 20.0), 1) if rng.random() < 0.7 else float(rng.randint(1, 20))
        ionic = rng.choices(IONIC_CLASSES, weights=[6, 2, 2, 1, 1])[0]
        out.append(Surfactant(f"s{rng.randrange(10**6):06d}-{i}", hlb, ionic, rng.choice(chains)))
    return out


@pytest.mark.parametrize(("n", "seed", "how_many_targets"), [(50, 1, 60), (50, 2, 60), (300, 3, 6), (300, 4, 6)])
def test_synthetic_registries(n, seed, how_many_targets):
    pool = synthetic(n, seed)
    index = PairIndex(pool)
    rng = random.Random(seed)
    # Grid targets hit surfactants' HLBs exactly; off-grid ones fall between.
    chosen = rng.sample(targets(), how_many_targets // 2) + [rng.uniform(0.5, 20.5) for _ in range(how_many_targets // 2)]
    for target in chosen:
        for chain in (None, "C18", "C12"):
            expected = reference_pairs(target, pool, chain)
            assert index.ranked(target, chain) == expected, (target, chain)
            assert index.ranked(target, chain, 50) == expected[:50], (target, chain)
            assert index.count(target) == len(expected), target


@pytest.mark.parametrize("target", [3.0, 9.7, 17.45])
def test_synthetic_registry_of_1000(target):
    pool = synthetic(1000, 5)
    index = PairIndex(pool)
    for chain in (None, "C16"):
        expected = reference_pairs(target, pool, chain)
        assert index.ranked(target, chain, 50) == expected[:50]
        assert index.count(target) == len(expected)


def test_one_chain_everywhere_and_no_chain_anywhere():
    # Every pair in the same-chain tier, or every pair in the last tier.
    rng = random.Random(6)
    for chain in ("C18", None):
        pool = [Surfactant(f"x{i}", float(rng.randint(2, 18)), rng.choice(IONIC_CLASSES), chain) for i in range(120)]
        for target in (5.0, 9.5, 10.0, 14.0):
            expected = reference_pairs(target, pool, "C18")
            assert candidate_pairs(target, pool, "C18", 50) == expected[:50]
            assert candidate_pairs(target, pool, "C18") == expected


surfactant = st.builds(Surfactant, id=st.text("abc", min_size=1, max_size=4),
                       hlb=st.sampled_from([1.0, 4.3, 4.7, 8.0, 8.6, 10.0, 12.0, 14.9, 15.0, 16.7, 20.0]),
                       ionic_class=st.sampled_from(IONIC_CLASSES), fatty_chain=st.sampled_from([None, "C12", "C18"]))


@settings(max_examples=300, deadline=None, derandomize=True)
@given(pool=st.lists(surfactant, max_size=12, unique_by=lambda s: s.id),
       target=st.sampled_from([1.0, 4.7, 6.0, 8.0, 10.0, 11.1, 15.0, 20.0]),
       chain=st.sampled_from([None, "C12", "C18"]), limit=st.sampled_from([None, 1, 3]))
def test_small_registries_with_many_ties(pool, target, chain, limit):
    expected = reference_pairs(target, pool, chain)
    assert candidate_pairs(target, pool, chain, limit) == (expected if limit is None else expected[:limit])
    assert PairIndex(pool).count(target) == len(expected)


def test_answer_lists_each_hlb_once_in_order_of_first_use(registry):
    from service.usecases.pairs import candidates
    answer = candidates({"target_hlb": 10.0, "limit": 20, "ionic_classes": ["nonionic", "anionic"]}, registry)
    result = answer["result"]
    members = [m["ingredient"] for c in result["candidates"] for m in (c["low"], c["high"])]
    members += [s["ingredient"] for s in result["single_surfactants"]]
    first_use = list(dict.fromkeys(members))
    listed = [(v["ingredient"], v["property"]) for v in answer["values_used"]]
    assert listed == [(i, "hlb") for i in first_use]
    assert result["considered"] == len(reference_pairs(10.0, registry_surfactants(registry, ("nonionic", "anionic"), False)))


def test_the_cache_is_bounded_and_each_filter_keeps_its_own(registry):
    from itertools import chain as joined
    from service.usecases import pairs as usecase
    filters = [c for r in range(1, 6) for c in combinations(IONIC_CLASSES, r)]  # 31 ionic filters
    for strict, classes in joined(((False, c) for c in filters), ((True, c) for c in filters)):
        surfactants, index = surfactant_index(registry, classes, strict)
        assert surfactants == registry_surfactants(registry, classes, strict)
        assert len(usecase._INDEXES[id(registry)][1]) <= usecase.MAX_FILTERS
