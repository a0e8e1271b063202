"""The beyond-use date's date arithmetic and the procedure's rules, on hand-
worked cases. The rules themselves: USP <795> 2023 (the BUD never later than
the earliest component expiry; counted from the day compounding starts)
written from memory of the chapter, not read in it; the same two rules read
in regulations that follow the chapter: N.J.A.C. 13:39-11A.11(a) ("The
beyond-use date shall be determined from the date the preparation is
compounded") and the Alberta College of Pharmacy's guidance on USP ("The BUD
shall not be later than the expiration date on the container or any
component"). The temperatures and the order of the steps are common
practice, no source."""
from __future__ import annotations

import datetime as dt

import pytest

from service.core.beyond_use import Expiry, beyond_use_date, parse_expiry
from service.core.errors import CalculationError
from service.core.procedure import ProcedureRow, heating, rounded_heating_c, procedure

D = dt.date(2026, 12, 2)


def _exp(label, day, month_only=False):
    return Expiry(label, "L1", day, month_only, ("components", 0, "expiry"))


def test_category_limit_counts_days_from_the_compounding_date():
    # Hand count: 2 December + 35 days = 6 January of the next year.
    bud = beyond_use_date(D, 35, [_exp("glycerin", dt.date(2029, 2, 28))])
    assert bud.date == dt.date(2027, 1, 6) and bud.decided_by == "category_limit"


def test_the_earliest_component_expiry_caps_the_date():
    bud = beyond_use_date(D, 35, [_exp("a", dt.date(2027, 3, 1)), _exp("water", dt.date(2026, 12, 9))])
    assert bud.date == dt.date(2026, 12, 9) and bud.decided_by == "earliest_component_expiry"
    assert bud.earliest.label == "water" and bud.limit_date == dt.date(2027, 1, 6)


def test_an_expiry_on_the_limit_day_leaves_the_category_deciding():
    bud = beyond_use_date(D, 14, [_exp("a", dt.date(2026, 12, 16))])
    assert bud.date == dt.date(2026, 12, 16) and bud.decided_by == "category_limit"


def test_an_expired_component_is_refused():
    with pytest.raises(CalculationError) as err:
        beyond_use_date(D, 14, [_exp("cetyl alcohol", dt.date(2026, 12, 1))])
    assert err.value.rule == "component_not_expired" and err.value.path == ("components", 0, "expiry")


def test_a_component_expiring_on_the_compounding_day_may_still_be_used():
    bud = beyond_use_date(D, 14, [_exp("a", D)])
    assert bud.date == D


@pytest.mark.parametrize("text, day, month_only", [
    ("2027-02", dt.date(2027, 2, 28), True),     # month-only: its last day (USP General Notices, from memory)
    ("2028-02", dt.date(2028, 2, 29), True),     # a leap year
    ("2027-09-30", dt.date(2027, 9, 30), False),
])
def test_expiry_dates_are_read(text, day, month_only):
    assert parse_expiry(text, ()) == (day, month_only)


@pytest.mark.parametrize("text", ["2027-13", "2027-02-30", "27-02-01", "2027/02/01", "0000-00"])
def test_impossible_expiry_dates_are_refused(text):
    with pytest.raises(CalculationError) as err:
        parse_expiry(text, ("x",))
    assert err.value.rule == "expiry_date_format"


@pytest.mark.parametrize("tops, expected", [
    ([], 70.0),          # nothing to melt above the usual 70 degC
    ([49.0], 70.0),      # cetyl alcohol (up to about 49 degC): the usual 70
    ([65.0], 70.0),      # white wax (about 65): 70 is 5 above
    ([67.0], 75.0),      # 72 rounded up to a whole 5
    ([86.0], 95.0),      # carnauba wax (about 86): 91 rounded up
])
def test_heating_temperature(tops, expected):
    assert rounded_heating_c(tops) == expected


def _row(label, phase, role="ingredient", state="liquid", **kw):
    return ProcedureRow(label, phase, role, state, 10.0, **kw)


def test_procedure_places_each_component_and_orders_the_steps():
    rows = [_row("Light mineral oil", "oil"), _row("Cetyl alcohol", "oil", state="solid", melting_top_c=49.0, melting_basis="src"),
            _row("Sorbitan monostearate", "emulsifier", "emulsifier", "solid", dissolves_in="oil", dissolves_in_basis="b",
                 melting_top_c=53.0, melting_basis="src"),
            _row("Polysorbate 60", "emulsifier", "emulsifier", dissolves_in="water", dissolves_in_basis="b"),
            _row("Cyclomethicone", "oil", late="volatile"),
            _row("Purified water", "aqueous", "qs", is_water=True)]
    p = procedure("O/W", rows, 200.0)
    stages = [s.phase for s in p.steps]
    assert stages == ["weigh", "oil", "aqueous", "heat", "combine", "cool", "late", "qs", "finish"]
    oil = next(s for s in p.steps if s.phase == "oil").text
    aqueous = next(s for s in p.steps if s.phase == "aqueous").text
    assert "Sorbitan monostearate" in oil and "Polysorbate 60" not in oil and "Cyclomethicone" not in oil
    assert "Polysorbate 60" in aqueous and "Keep back part of the q.s. vehicle" in aqueous
    assert p.oil_phase_c == 70.0 and p.highest_melting.label == "Sorbitan monostearate"
    assert "oil phase (the dispersed phase) slowly to the aqueous phase" in next(s for s in p.steps if s.phase == "combine").text
    assert "below 40" in next(s for s in p.steps if s.phase == "late").text


def test_a_w_o_emulsion_adds_the_aqueous_phase_to_the_oil():
    p = procedure("W/O", [_row("Mineral oil", "oil"), _row("Water", "aqueous", "qs")], 100.0)
    assert "Add the aqueous phase (the dispersed phase) slowly to the oil phase" in next(s for s in p.steps if s.phase == "combine").text
    assert not p.heated and p.oil_phase_c is None


def test_unknown_melting_range_and_unplaced_components_are_flagged():
    rows = [_row("Wax (inline)", "oil", state="solid"), _row("Active (inline)", "other"), _row("Water", "aqueous", "qs")]
    p = procedure("O/W", rows, 100.0)
    codes = {f.code for f in p.findings}
    assert codes == {"melting_range_unknown", "procedure_phase_unknown"}
    assert next(s for s in p.steps if s.phase == "other").basis == "pharmacist_to_decide"


def test_a_high_melting_wax_is_flagged():
    p = procedure("O/W", [_row("Carnauba wax", "oil", state="solid", melting_top_c=86.0, melting_basis="s"), _row("Water", "aqueous", "qs")], 100.0)
    assert p.oil_phase_c == 95.0 and any(f.code == "high_process_temperature" for f in p.findings)
