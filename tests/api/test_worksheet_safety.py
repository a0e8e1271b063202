"""A worksheet safe to weigh from: unrounded checks, rounding error, aliquots,
capacity, the phase volume, the minimum estimate's caveats, and the printed
figures agreeing with each other."""
import copy
import math

import pytest

from tests.api.helpers import problem_pointers
from tests.api.test_worksheets import LOTION, SHEET, rows, share


def lotion(batch_g=100.0, **extra_rows):
    sheet = copy.deepcopy(LOTION)
    sheet["batch"] = {"value": batch_g, "unit": "g"}
    for name, (percent, state) in extra_rows.items():
        sheet["ingredients"].insert(-1, {"inline": {"name": name, "physical_state": state}, "phase": "other", "share": share(percent)})
    return sheet


def test_small_shares_carry_the_unrounded_mass_and_the_rounding_error(client):
    # Hand-computed: 0.015 % of 100 g is 15 mg, read as 20 mg on a 10 mg balance (+33 %); 0.025 % is 25 mg -> 30 mg (+20 %).
    body = client.post(SHEET, json=lotion(**{"A (demo)": (0.015, "solid"), "B (demo)": (0.025, "solid")})).get_json()
    got = rows(body)
    for name, rounded, error in (("A (demo)", 0.02, 100 / 3), ("B (demo)", 0.03, 20.0)):
        row = got[name]
        assert row["mass_g"] == pytest.approx(rounded) and row["rounding_error_percent"] == pytest.approx(error, rel=1e-6)
        checks = {k["code"]: k["ok"] for k in row["checks"]}
        assert checks["rounding_error"] is False and checks["minimum_weighable_quantity"] is False


def test_the_minimum_weighable_check_runs_on_the_unrounded_mass(client):
    # USP <1176>: MWQ 120 mg; 0.115 % of 100 g is 115 mg, printed as 0.12 g, and still below it.
    row = rows(client.post(SHEET, json=lotion(**{"C (demo)": (0.115, "solid")})).get_json())["C (demo)"]
    assert row["mass_g"] == pytest.approx(0.12) and row["mass_g_unrounded"] == pytest.approx(0.115)
    mwq = next(k for k in row["checks"] if k["code"] == "minimum_weighable_quantity")
    assert not mwq["ok"] and "0.115 g is below" in mwq["message"]
    aliquot = row["measure"]["aliquot"]
    # Hand-computed by the aliquot method: factor 2, 230 mg weighed, 130 mg diluent, 180 mg aliquot of a 360 mg mixture.
    assert (aliquot["factor"], aliquot["substance_g"], aliquot["diluent_g"], aliquot["aliquot_g"]) == (
        2, pytest.approx(0.23), pytest.approx(0.13), pytest.approx(0.18))
    assert aliquot["delivered_g"] == pytest.approx(0.115)
    assert all(m >= 0.12 for m in (aliquot["substance_g"], aliquot["diluent_g"], aliquot["aliquot_g"]))


def test_percent_and_mass_agree_on_every_printed_row(client):
    # The q.s. row takes the rounding residue; its % is the share of its rounded mass.
    sheet = lotion(**{"D (demo)": (0.005, "solid")})
    body = client.post(SHEET, json=sheet).get_json()
    batch = body["result"]["batch_mass_g"]
    for row in body["result"]["rows"]:
        # A second pharmacist's check: % x batch / 100, to the balance, gives the mass.
        assert round(row["percent_w_w"] * batch / 100, 2) == pytest.approx(row["mass_g"]), row["name"]
    text = client.post(SHEET, json=sheet, headers={"Accept": "text/markdown"}).get_data(as_text=True)
    table = [line.split(" | ") for line in text.splitlines() if line.startswith("| ") and "---" not in line][1:]
    for cells in table:
        percent, mass = float(cells[2]), float(cells[3])
        assert abs(percent * batch / 100 - mass) <= 0.005 + 0.0005 * batch / 100 + 1e-9, cells


def test_banner_when_any_check_fails(client):
    clean = copy.deepcopy(LOTION)
    clean["batch"] = {"value": 100, "unit": "g"}
    ok = client.post(SHEET, json=clean, headers={"Accept": "text/markdown"}).get_data(as_text=True)
    assert client.post(SHEET, json=clean).get_json()["result"]["checks_failed"] == 0
    assert "CHECK BEFORE WEIGHING" not in ok
    bad = client.post(SHEET, json=lotion(**{"E (demo)": (0.05, "solid")}), headers={"Accept": "text/markdown"}).get_data(as_text=True)
    lines = bad.splitlines()
    assert lines[2].startswith("> **CHECK BEFORE WEIGHING: 1 check(s) failed")
    assert "## Aliquots" in bad
    plain = client.post(SHEET, json=lotion(**{"E (demo)": (0.05, "solid")}), headers={"Accept": "text/plain"}).get_data(as_text=True)
    assert "!!! CHECK BEFORE WEIGHING" in plain


def test_balance_capacity(client):
    # 200 g made up to weight on the default 120 g balance is flagged; a 500 g balance holds it.
    body = client.post(SHEET, json=LOTION).get_json()
    checks = {k["code"]: k["ok"] for k in body["result"]["checks"]}
    assert checks["batch_within_balance_capacity"] is False
    assert body["result"]["equipment"]["balance"]["capacity_g"] == 120.0
    assert any("capacity 120 g" in d for d in body["result"]["equipment"]["defaults_assumed"])
    sheet = copy.deepcopy(LOTION)
    sheet["equipment"] = {"balance": {"capacity": {"value": 500, "unit": "g"}}}
    body = client.post(SHEET, json=sheet).get_json()
    assert {k["code"]: k["ok"] for k in body["result"]["checks"]}["batch_within_balance_capacity"] is True
    sheet["equipment"] = {"balance": {"capacity": {"value": 15, "unit": "g"}}}
    row = rows(client.post(SHEET, json=sheet).get_json())["Light mineral oil"]
    assert {k["code"]: k["ok"] for k in row["checks"]}["balance_capacity"] is False


def test_dispersed_phase_above_the_packing_limit(client):
    # π/(3√2) ≈ 74.05 % (densest packing of equal spheres); 76 % oil phase is flagged, 65 % warned.
    def sheet(oil_percent):
        return {"emulsion_type": "O/W", "batch": {"value": 100, "unit": "g"},
                "ingredients": [{"ingredient": "light-mineral-oil", "phase": "oil", "share": share(oil_percent)},
                                {"ingredient": "purified-water", "phase": "aqueous", "qs": True}],
                "emulsifier": {"pair": [{"ingredient": "sorbitan-monooleate", "density": {"value": 0.99, "unit": "g/mL"}},
                                        {"ingredient": "polysorbate-80"}], "total_percent_w_w": 4}}
    packed = client.post(SHEET, json=sheet(72)).get_json()
    phase = packed["result"]["dispersed_phase"]
    assert phase["basis"].startswith("by volume") and phase["fraction"] > 0.7405
    assert {k["code"]: k["ok"] for k in packed["result"]["checks"]}["dispersed_phase_volume"] is False
    crowded = client.post(SHEET, json=sheet(58)).get_json()
    assert 0.60 < crowded["result"]["dispersed_phase"]["fraction"] < 0.7405
    assert "dispersed_phase_high" in {w["code"] for w in crowded["warnings"]}
    assert {k["code"]: k["ok"] for k in crowded["result"]["checks"]}["dispersed_phase_volume"] is True


def test_worksheet_sized_by_the_estimate_carries_its_caveats(client):
    sheet = copy.deepcopy(LOTION)
    sheet["emulsifier"] = {"pair": LOTION["emulsifier"]["pair"],
                           "minimum_estimate": {"surfactant_density": {"value": 1.05, "unit": "g/mL"},
                                                "dispersed_phase_density": {"value": 0.85, "unit": "g/mL"}}}
    body = client.post(SHEET, json=sheet).get_json()
    codes = {w["code"] for w in body["warnings"]}
    assert {"unpublished_method", "estimate_insensitive_to_oil_load"} <= codes
    assert "practice-minimum-emulsifier" in {s["id"] for s in body["method"]["sources"]}
    em = body["result"]["emulsifier"]
    assert "25 % margin (the default margin" in em["basis"]
    # Hand-computed: A = 6 (1.05 / 0.85) / (10 - 5.8) = 1.7647; E = 1.25 (A + 0.004 (80 - E)) -> E = 1.25 (A + 0.32) / 1.005 = 2.593,
    # rounded up to 2.6 % w/w.
    assert em["total_percent_w_w"] == pytest.approx(2.6)


def test_estimate_that_cannot_be_a_formula_is_refused(client):
    base = {"surfactant_density": {"value": 1.0, "unit": "g/mL"}, "dispersed_phase_density": {"value": 1.0, "unit": "g/mL"},
            "continuous_phase_percent": 80}
    r = client.post("/v1/emulsifier/minimum", json={**base, "required_hlb": 19.9})
    assert r.status_code == 422 and problem_pointers(r) == ["#/required_hlb"]
    assert r.get_json()["errors"][0]["rule"] == "estimate_plausible"
    # Hand-computed: RHLB 19.5 -> 6 / 0.25 + 0.32 = 24.32 g per 100 g: above the usual 15 %, below the 30 % ceiling.
    body = client.post("/v1/emulsifier/minimum", json={**base, "required_hlb": 19.5}).get_json()
    assert body["result"]["g_per_100g"] == pytest.approx(24.32)
    assert "estimate_above_usual_levels" in {w["code"] for w in body["warnings"]}
    assert body["result"]["limits_g_per_100g"] == {"warning_above": 15.0, "refused_above": 30.0}
    ok = client.post("/v1/emulsifier/minimum", json={**base, "required_hlb": 11.6}).get_json()
    assert math.isclose(ok["result"]["continuous_phase_term_g_per_100g"], 0.32)
    assert "nearly insensitive to the oil/water ratio" in ok["result"]["oil_load_note"]


def test_worksheet_solves_on_the_printed_required_hlb(client):
    # Hand-computed: light mineral oil 11 and isopropyl myristate 11.5 at 9 : 11 give 11.275, printed 11.3;
    # the pair is solved for 11.3: x(polysorbate 60) = (11.3 - 4.7) / (14.9 - 4.7) of 5 % of 100 g = 3.235 g -> 3.24 g.
    sheet = {"emulsion_type": "O/W", "batch": {"value": 100, "unit": "g"},
             "ingredients": [{"ingredient": "light-mineral-oil", "phase": "oil", "share": share(9)},
                             {"ingredient": "isopropyl-myristate", "phase": "oil", "share": share(11)},
                             {"ingredient": "purified-water", "phase": "aqueous", "qs": True}],
             "emulsifier": LOTION["emulsifier"]}
    body = client.post(SHEET, json=sheet).get_json()
    assert body["result"]["oil_phase"]["required_hlb"] == 11.3
    assert body["result"]["oil_phase"]["required_hlb_unrounded"] == pytest.approx(11.275)
    assert rows(body)["Polysorbate 60"]["mass_g_unrounded"] == pytest.approx(6.6 / 10.2 * 5)


def test_printed_worksheet_shows_the_range_with_doubtful_values(client):
    sheet = copy.deepcopy(LOTION)
    sheet["ingredients"][0] = {"ingredient": "castor-oil", "phase": "oil", "share": share(10)}
    body = client.post(SHEET, json=sheet).get_json()
    assert body["result"]["oil_phase"]["range_with_doubtful"] is not None
    text = client.post(SHEET, json=sheet, headers={"Accept": "text/markdown"}).get_data(as_text=True)
    assert "with values flagged doubtful" in text and "- Dispersed phase 20.0 % of the emulsion" in text
