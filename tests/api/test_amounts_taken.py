"""POST /v1/worksheets/amounts-taken: the amounts actually weighed or
measured, checked against the worksheet recomputed from its request.

Expected figures are hand-computed from the worksheet's own targets (the
pair's split by Griffin's mean: polysorbate 80 takes (11.1 - 4.3) / (15.0 - 4.3)
of the 10 g of emulsifier, 6.355140187 g, shown 6.36 g); the 5 % allowance is
the balance's acceptable error, the default of the worksheet (USP <1176>
works the minimum weighable quantity from it)."""
import copy

import pytest

from tests.api.helpers import problem_pointers

TAKEN = "/v1/worksheets/amounts-taken"


def share(value):
    return {"value": value, "unit": "% w/w"}


# The README's hand lotion (invented demo scenario), with a buffer solution
# measured in a graduate and a fragrance with no density known.
SHEET = {
    "emulsion_type": "O/W",
    "batch": {"value": 200, "unit": "g"},
    "ingredients": [
        {"ingredient": "mineral-oil", "phase": "oil", "share": share(10)},
        {"ingredient": "isopropyl-myristate", "phase": "oil", "share": share(8)},
        {"ingredient": "stearic-acid", "phase": "oil", "share": share(2)},
        {"ingredient": "glycerin", "phase": "aqueous", "share": share(5)},
        {"inline": {"name": "Buffer solution (demo)", "physical_state": "liquid", "density": {"value": 1.0, "unit": "g/mL"}},
         "phase": "aqueous", "share": share(10)},
        {"inline": {"name": "Fragrance (demo)", "physical_state": "liquid"}, "phase": "other", "share": share(0.5)},
        {"ingredient": "purified-water", "phase": "aqueous", "qs": True},
    ],
    "emulsifier": {"pair": [{"ingredient": "sorbitan-monooleate"}, {"ingredient": "polysorbate-80"}], "total_percent_w_w": 5},
}
# Rows of its worksheet: the emulsifier pair goes after the oil phase.
ROWS = ["mineral-oil", "isopropyl-myristate", "stearic-acid", "sorbitan-monooleate", "polysorbate-80", "glycerin", None, None, "purified-water"]
# Each row's displayed target, in the unit it is measured in (row 6 in mL, in a 25 mL graduate).
AT_TARGET = [(20.0, "g"), (16.0, "g"), (4.0, "g"), (3.64, "g"), (6.36, "g"), (10.0, "g"), (20.0, "mL"), (1.0, "g"), (119.0, "g")]


def taken(**changes):
    """Every row taken at its displayed target, `row=(value, unit)` changed, `row=None` left out."""
    out = []
    for i, (value, unit) in enumerate(AT_TARGET):
        given = changes.get(f"r{i}", (value, unit))
        if given is not None:
            item = {"row": i, "amount": {"value": given[0], "unit": given[1]}}
            if ROWS[i]:
                item["ingredient"] = ROWS[i]
            out.append(item)
    return out


def post(client, items, **extra):
    return client.post(TAKEN, json={"worksheet": SHEET, "taken": items, **extra})


def faults(r):
    pointers = problem_pointers(r)
    return list(zip(pointers, [e["rule"] for e in r.get_json()["errors"]]))


def test_a_record_at_target_may_pass_to_the_checker(client):
    r = post(client, taken(), final_weight={"value": 198.6, "unit": "g"})
    assert r.status_code == 200, r.get_data(as_text=True)
    result = r.get_json()["result"]
    assert result["may_pass_to_checker"] is True and result["reasons"] == [] and result["not_taken"] == []
    assert [x["ingredient"] for x in result["rows"]] == ROWS
    assert all(k["ok"] for x in result["rows"] for k in x["checks"])
    # Hand-computed: the graduate row is compared in mL, 20 mL for 20 mL.
    buffer = result["rows"][6]
    assert (buffer["how"], buffer["unit"], buffer["target_unrounded"], buffer["deviation"]) == ("graduate", "mL", 20.0, 0.0)
    # Hand-computed: the masses taken add up to 200.01 g (3.64 + 6.36 = 10.00 g of emulsifier, the rest at target);
    # yield 198.6 / 200 = 99.3 %, -0.7 %, within the default 5 %.
    totals = result["totals"]
    assert totals["taken_mass_g"] == pytest.approx(200.0)
    assert totals["yield_percent"] == pytest.approx(99.3) and totals["final_weight_deviation_percent"] == pytest.approx(-0.7)
    assert totals["tolerance_percent"] == 5.0 and {c["code"]: c["ok"] for c in result["checks"]} == {"every_row_taken": True, "final_weight_within_tolerance": True}
    body = r.get_json()
    assert body["method"]["sources"][0]["id"] == "usp-1176"
    assert any("qualified pharmacist" in c for c in body["cautions"]) and any("checking pharmacist" in c for c in body["cautions"])


@pytest.mark.parametrize(("taken_g", "ok", "percent"), [
    (6.04, True, -4.958823529),    # hand-computed: (6.04 - 6.355140187) / 6.355140187; against the shown 6.36 g it would be -5.03 %
    (6.03, False, -5.116176471),
])
def test_a_deviation_just_inside_and_just_outside_on_the_unrounded_target(client, taken_g, ok, percent):
    r = post(client, taken(r4=(taken_g, "g")))
    result = r.get_json()["result"]
    row = result["rows"][4]
    assert (row["target_unrounded"], row["target_displayed"]) == (pytest.approx(6.355140187), 6.36)
    assert row["deviation_percent"] == pytest.approx(percent, rel=1e-8) and row["allowed_percent"] == 5.0
    check = row["checks"][0]
    assert (check["code"], check["ok"]) == ("taken_within_tolerance", ok)
    assert result["may_pass_to_checker"] is ok
    if not ok:
        assert result["reasons"] == [f"row 4 (polysorbate-80): {check['message']}"]
        assert "check_taken_within_tolerance" in [w["code"] for w in r.get_json()["warnings"]]


def test_a_row_not_taken_stops_the_record(client):
    r = post(client, taken(r5=None))
    result = r.get_json()["result"]
    assert result["not_taken"] == [{"row": 5, "ingredient": "glycerin", "name": "Glycerin"}]
    assert result["checks"][0]["code"] == "every_row_taken" and result["checks"][0]["ok"] is False
    assert result["may_pass_to_checker"] is False and "row 5 (glycerin)" in result["reasons"][0]


def test_the_other_measure_is_converted_with_the_rows_density(client):
    # The buffer (graduate, 1.0 g/mL given inline) weighed at 20.5 g is 20.5 mL, +2.5 %;
    # isopropyl myristate (weighed) measured at 18.85 mL, at the worksheet's density 16 / 18.87926856 g/mL, is 15.97519517 g.
    r = post(client, taken(r6=(20.5, "g"), r1=(18.85, "mL")))
    body = r.get_json()
    rows = body["result"]["rows"]
    assert (rows[6]["unit"], rows[6]["taken"], rows[6]["converted_with_density_g_per_ml"]) == ("mL", pytest.approx(20.5), pytest.approx(1.0))
    assert rows[6]["deviation_percent"] == pytest.approx(2.5)
    assert rows[1]["taken"] == pytest.approx(18.85 * 16 / 18.87926856) and rows[1]["unit"] == "g"
    # The buffer was weighed, so the balance's minimum weighable quantity applies; the myristate was not.
    assert [k["code"] for k in rows[6]["checks"]] == ["taken_within_tolerance", "taken_at_least_minimum_weighable"]
    assert [k["code"] for k in rows[1]["checks"]] == ["taken_within_tolerance"]
    assert "taken_converted_with_density" in [w["code"] for w in body["warnings"]]


def test_a_mass_below_the_minimum_weighable_quantity_is_flagged(client):
    sheet = copy.deepcopy(SHEET)
    sheet["ingredients"].insert(6, {"inline": {"name": "Preservative (demo)", "physical_state": "solid"}, "phase": "other", "share": share(0.05)})
    items = taken()
    items[-1]["row"] = 9  # the water, after the preservative's row 8
    items.insert(8, {"row": 8, "amount": {"value": 100, "unit": "mg"}})
    r = client.post(TAKEN, json={"worksheet": sheet, "taken": items})
    result = r.get_json()["result"]
    row = result["rows"][8]
    assert row["name"] == "Preservative (demo)" and row["checks"][0]["ok"] is True
    # USP <1176>: 6 mg x 100 / 5 % = 120 mg; 100 mg taken is below it.
    assert row["checks"][1]["code"] == "taken_at_least_minimum_weighable" and row["checks"][1]["ok"] is False
    assert result["may_pass_to_checker"] is False


def test_the_final_weight_against_a_tolerance_given(client):
    # Hand-computed: 196 / 200 = 98 %, -2 %, beyond a 1 % tolerance.
    r = post(client, taken(), final_weight={"value": 196, "unit": "g"}, final_weight_tolerance_percent=1)
    result = r.get_json()["result"]
    assert result["totals"]["yield_percent"] == pytest.approx(98.0) and result["totals"]["tolerance_from"] == "the request"
    assert result["checks"][1]["code"] == "final_weight_within_tolerance" and result["checks"][1]["ok"] is False
    assert result["may_pass_to_checker"] is False


@pytest.mark.parametrize(("items", "expected"), [
    ([{"row": 0, "ingredient": "isopropyl-myristate", "amount": {"value": 20, "unit": "g"}}], [("#/taken/0/ingredient", "taken_ingredient_matches_row")]),
    ([{"row": 1, "amount": {"value": 16, "unit": "g"}}, {"row": 1, "amount": {"value": 16, "unit": "g"}}], [("#/taken/1/row", "taken_row_once")]),
    ([{"row": 20, "amount": {"value": 16, "unit": "g"}}], [("#/taken/0/row", "taken_row_exists")]),
    ([{"row": -1, "amount": {"value": 16, "unit": "g"}}], [("#/taken/0/row", "minimum")]),
    ([{"row": 2, "ingredient": "stearic-acid", "amount": {"value": 4.5, "unit": "mL"}}], [("#/taken/0/amount/unit", "solids_by_weight")]),
    ([{"row": 7, "amount": {"value": 1.1, "unit": "mL"}}], [("#/taken/0/amount", "density_needed_for_volume")]),
    ([{"row": 0, "amount": {"value": -20, "unit": "g"}}], [("#/taken/0/amount/value", "exclusive_minimum")]),
    ([{"row": 0, "amount": {"value": 20, "unit": "parts"}}], [("#/taken/0/amount/unit", "enum")]),
])
def test_each_refusal_names_the_field_and_the_rule(client, items, expected):
    r = post(client, items)
    assert r.status_code == 422
    assert faults(r) == expected


def test_nan_is_refused(client):
    body = ('{"worksheet": {"emulsion_type": "O/W", "batch": {"value": 100, "unit": "g"}, "ingredients": [], "emulsifier": {}}, '
            '"taken": [{"row": 0, "amount": {"value": NaN, "unit": "g"}}]}')
    r = client.post(TAKEN, data=body, content_type="application/json")
    assert ("#/taken/0/amount/value", "finite_number") in faults(r)


def test_every_fault_of_the_amounts_at_once(client):
    items = [{"row": 0, "ingredient": "glycerin", "amount": {"value": 20, "unit": "g"}}, {"row": 9, "amount": {"value": 1, "unit": "g"}},
             {"row": 2, "amount": {"value": 4, "unit": "mL"}}, {"row": 2, "amount": {"value": 4, "unit": "g"}}]
    assert faults(post(client, items)) == [("#/taken/0/ingredient", "taken_ingredient_matches_row"), ("#/taken/1/row", "taken_row_exists"),
                                           ("#/taken/2/amount/unit", "solids_by_weight"), ("#/taken/3/row", "taken_row_once")]


def test_the_worksheets_own_faults_point_inside_it(client):
    sheet = copy.deepcopy(SHEET)
    sheet["ingredients"][0]["ingredient"] = "mineral-oi"
    r = client.post(TAKEN, json={"worksheet": sheet, "taken": taken()})
    assert faults(r) == [("#/worksheet/ingredients/0/ingredient", "known_ingredient")]
    sheet = copy.deepcopy(SHEET)
    sheet["ingredients"][-1] = {"ingredient": "purified-water", "phase": "aqueous", "share": share(10)}
    r = client.post(TAKEN, json={"worksheet": sheet, "taken": taken()})
    assert faults(r) == [("#/worksheet/ingredients", "formula_adds_up")]


def test_the_record_can_reuse_a_worksheet_answers_result(client):
    # check_amounts_taken works on a worksheet answer's result alone, as a compounding record keeps it.
    from service.usecases.amounts_taken import check_amounts_taken

    sheet = client.post("/v1/worksheets", json=SHEET).get_json()
    result = check_amounts_taken(sheet["result"], taken(r4=(6.03, "g")), 198.6, None)
    via_http = post(client, taken(r4=(6.03, "g")), final_weight={"value": 198.6, "unit": "g"}).get_json()["result"]
    assert result["may_pass_to_checker"] is False and result["reasons"] == via_http["reasons"]
    assert result["rows"][4]["deviation_percent"] == pytest.approx(via_http["rows"][4]["deviation_percent"])


def test_the_record_as_markdown_and_plain_text(client):
    sheet = copy.deepcopy(SHEET)
    sheet["ingredients"][5]["inline"]["name"] = "Fragrance | # (demo)"
    body = {"worksheet": sheet, "taken": taken(r4=(6.03, "g"), r5=None)}
    md = client.post(TAKEN, json=body, headers={"Accept": "text/markdown"})
    assert md.status_code == 200 and md.mimetype == "text/markdown"
    text = md.get_data(as_text=True)
    assert "DO NOT PASS TO THE CHECKER: 2 check(s) failed" in text
    # A name can add no cell or heading: its pipe and hash are escaped.
    assert "Fragrance \\| \\# (demo)" in text and "| 4 | Polysorbate 80 | weigh | 6.36 g | 6.35514 | 6.03 g | -5.12 % | 5 % | CHECK: taken_within_tolerance |" in text
    plain = client.post(TAKEN, json=body, headers={"Accept": "text/plain"}).get_data(as_text=True)
    assert "!!! DO NOT PASS TO THE CHECKER" in plain and "row 5: Glycerin" in plain and "Fragrance | # (demo)" in plain
    assert client.post(TAKEN, json=body, headers={"Accept": "image/png"}).status_code == 406
