"""Measurability (USP <1176>; Allen on USP <1176> and Newton 2003 for
graduates), batch masses, and the candidate-pair ranking rule."""
import pytest

from service.core.batch import mixture_mass_for_volume, qs_percent, rows_for_batch
from service.core.candidates import Surfactant
from service.core.pair_ranking import candidate_pairs
from service.core.errors import CalculationError
from service.core.measure import Balance, Graduate, choose_graduate, round_to, weighing_checks

CLASS_A = Balance(sensitivity_g=0.006, acceptable_error_percent=5.0, readability_g=0.01)
GRADUATES = [Graduate(c, c / 50) for c in (10.0, 25.0, 50.0, 100.0)]


@pytest.mark.parametrize(("mass_g", "ok"), [(0.119, False), (0.120, True), (5.0, True)])
def test_minimum_weighable_quantity(mass_g, ok):
    # USP <1176>: Class A balance, SR 6 mg, 5 % error -> MWQ 120 mg.
    assert CLASS_A.minimum_weighable_g == pytest.approx(0.12)
    [check] = weighing_checks(mass_g, CLASS_A, solid=True)
    assert check.ok is ok


def test_below_mwq_names_the_remedy():
    # USP <1176>: an aliquot method for liquids, trituration for solids, or a finer balance.
    assert "trituration" in weighing_checks(0.05, CLASS_A, solid=True)[0].message
    assert "aliquot" in weighing_checks(0.05, CLASS_A, solid=False)[0].message


@pytest.mark.parametrize(("volume_ml", "graduate_ml", "code", "ok"), [
    (8.0, 10.0, "graduate_at_least_20_percent", True),    # the graduate just above the volume
    (2.0, 10.0, "graduate_at_least_20_percent", True),    # exactly 20 % of capacity is allowed
    (30.0, 50.0, "graduate_at_least_20_percent", True),
    (0.5, None, "graduate_at_least_1_ml", False),         # below 1 mL: pipette or syringe
    (150.0, None, "graduate_large_enough", False),
])
def test_graduate_rules(volume_ml, graduate_ml, code, ok):
    # Allen (on USP <1176>) and Newton 2003: graduate equal to or just above the
    # volume, not below about 20 % of capacity, nothing below 1 mL.
    graduate, [check] = choose_graduate(volume_ml, GRADUATES)
    assert (graduate.capacity_ml if graduate else None) == graduate_ml
    assert (check.code, check.ok) == (code, ok)


def test_graduate_below_20_percent_of_the_smallest_that_holds_it():
    graduate, [check] = choose_graduate(1.5, [Graduate(10.0, 0.2)])
    assert graduate is None and check.code == "graduate_at_least_20_percent" and not check.ok


def test_round_to_rounds_half_up():
    assert round_to(0.025, 0.01) == 0.03 and round_to(0.0249, 0.01) == 0.02 and round_to(7.3, 0.5) == 7.5


def test_rows_add_up_with_the_qs_taking_the_residue():
    # Hand-computed: 3 x 33.333 % of 10 g at 0.01 g is 3.33 g each; the q.s. row takes 3.34 g.
    rows = rows_for_batch([100 / 3, 100 / 3, 100 / 3], 10.0, qs_index=2, increment_g=0.01)
    assert [r.mass_g for r in rows] == pytest.approx([3.33, 3.33, 3.34])
    assert sum(r.mass_g for r in rows) == pytest.approx(10.0)


def test_qs_needs_room():
    assert qs_percent([60.0, 30.0, None], 2, ("x",)) == pytest.approx(10.0)
    with pytest.raises(CalculationError) as err:
        qs_percent([60.0, 40.0, None], 2, ("x",))
    assert err.value.rule == "qs_has_room"


def test_mixture_mass_for_volume():
    # Hand-computed: 50 : 50 by mass of densities 0.8 and 1.0; 90 mL holds 90 / (0.625 + 0.5) = 80 g.
    assert mixture_mass_for_volume(90.0, [0.5, 0.5], [0.8, 1.0], ()) == pytest.approx(80.0)


def s(id, hlb, ionic="nonionic", chain=None):
    return Surfactant(id, hlb, ionic, chain)


def test_ranking_rule():
    # The documented rule (common practice, no source): one fatty-chain family
    # first, then balance in 10 % steps, then nonionic before ionic.
    pool = [s("sms", 4.7, chain="C18"), s("ps60", 14.9, chain="C18"), s("smo", 4.3, chain="C18:1"),
            s("ps20", 16.7, chain="C12"), s("ani", 11.0, "anionic", "C18"), s("cat", 12.0, "cationic", "C18")]
    ranked = candidate_pairs(8.0, pool)
    first = ranked[0]
    assert {first.low.id, first.high.id} == {"sms", "ps60"} or first.same_chain
    assert all(p.same_chain for p in ranked[:2])
    assert not any({p.low.id, p.high.id} == {"ani", "cat"} for p in ranked)  # never anionic with cationic
    for p in ranked:
        assert p.low.hlb <= 8.0 <= p.high.hlb
        assert p.share_high == pytest.approx((8.0 - p.low.hlb) / (p.high.hlb - p.low.hlb))


def test_nonionic_before_ionic_when_otherwise_equal():
    pool = [s("low", 5.0, chain="C18"), s("hi-n", 15.0, chain="C18"), s("hi-a", 15.0, "anionic", "C18")]
    ranked = candidate_pairs(10.0, pool)
    assert [p.high.id for p in ranked] == ["hi-n", "hi-a"]


def test_no_pair_reaches_an_extreme_target():
    assert candidate_pairs(30.0, [s("a", 4.0), s("b", 15.0)]) == []


def test_small_conical_graduates_are_not_used():
    # Allen (on USP <1176>): no conical graduates under 25 mL.
    graduate, _ = choose_graduate(8.0, [Graduate(10.0, 0.2, conical=True), Graduate(25.0, 0.5, conical=True)])
    assert graduate.capacity_ml == 25.0
