"""The batch worksheet, its rescaling, its text form, and candidate pairs."""
import copy

import pytest

from tests.api.helpers import problem_pointers

SHEET = "/v1/worksheets"


def share(value, unit="% w/w"):
    return {"value": value, "unit": unit}


# Hydrophilic Ointment, USP: the quantities are still from memory of the monograph,
# to be checked. The public copy of USP 28-NF 23 (p. 1415,
# http://newdruginfo.com/pharmacopeia/usp28/v28230/usp28nf23s0_m58430.htm) was read,
# but it keeps only the method ("Melt the Stearyl Alcohol and the White Petrolatum on
# a steam bath, and warm to about 75. Add the other ingredients, previously dissolved
# in the water and warmed to 75, and stir the mixture until it congeals."), not the
# formula table. Recalled: methylparaben 0.25 g, propylparaben 0.15 g, sodium lauryl
# sulfate 10 g, propylene glycol 120 g, stearyl alcohol 250 g, white petrolatum
# 250 g, purified water 370 g, to make about 1000 g.
HYDROPHILIC_OINTMENT = {
    "emulsion_type": "O/W",
    "batch": {"value": 1000, "unit": "g"},
    "ingredients": [
        {"inline": {"name": "Methylparaben", "physical_state": "solid"}, "phase": "other", "share": share(0.25, "g")},
        {"inline": {"name": "Propylparaben", "physical_state": "solid"}, "phase": "other", "share": share(0.15, "g")},
        {"ingredient": "propylene-glycol", "phase": "aqueous", "share": share(120, "g")},
        {"ingredient": "stearyl-alcohol", "phase": "oil", "share": share(250, "g")},
        {"ingredient": "petrolatum", "phase": "oil", "share": share(250, "g")},
        {"ingredient": "purified-water", "phase": "aqueous", "qs": True},
    ],
    "emulsifier": {"fixed": [{"ingredient": "sodium-lauryl-sulfate", "percent_w_w": 1.0}]},
}

LOTION = {
    "emulsion_type": "O/W",
    "batch": {"value": 200, "unit": "g"},
    "ingredients": [
        {"ingredient": "light-mineral-oil", "phase": "oil", "share": share(10)},
        {"ingredient": "isopropyl-myristate", "phase": "oil", "share": share(8)},
        {"ingredient": "cetyl-alcohol", "phase": "oil", "share": share(2)},
        {"ingredient": "glycerin", "phase": "aqueous", "share": share(5)},
        {"ingredient": "purified-water", "phase": "aqueous", "qs": True},
    ],
    "emulsifier": {"pair": [{"ingredient": "sorbitan-monostearate"}, {"ingredient": "polysorbate-60"}], "total_percent_w_w": 5},
}


def rows(body):
    return {r["name"]: r for r in body["result"]["rows"]}


def test_published_formulation_end_to_end(client):
    r = client.post(SHEET, json=HYDROPHILIC_OINTMENT)
    assert r.status_code == 200, r.get_data(as_text=True)
    body = r.get_json()
    got = {name: row["mass_g"] for name, row in rows(body).items()}
    # The monograph's quantities for 1000 g; water is the q.s. (the monograph's
    # 370 g makes "about" 1000 g: 1000.4 g in all).
    assert got == pytest.approx({"Methylparaben": 0.25, "Propylparaben": 0.15, "Propylene glycol": 120.0, "Stearyl alcohol": 250.0,
                                 "Petrolatum": 250.0, "Sodium lauryl sulfate": 10.0, "Purified water": 369.6})
    assert body["result"]["totals"]["mass_g"] == pytest.approx(1000.0)
    # Required HLB by Griffin's rule: (250 x 14 + 250 x 7.5) / 500 = 10.75 -> 10.8 shown.
    assert body["result"]["oil_phase"]["required_hlb"] == 10.8
    checks = {c["code"]: c["ok"] for c in body["result"]["checks"]}
    # Sodium lauryl sulfate (HLB 40, Davies) is off the O/W range: flagged, not hidden.
    assert checks["hlb_suits_emulsion_type"] is False and checks["totals_add_up"] is True
    assert all(row["measure"]["how"] == "weigh" for row in body["result"]["rows"])


def test_published_formulation_rescaled_flags_small_weighings(client):
    r = client.post(SHEET + "/rescale", json={"worksheet": HYDROPHILIC_OINTMENT, "batch": {"value": 100, "unit": "g"}})
    body = r.get_json()
    got = rows(body)
    assert got["Stearyl alcohol"]["mass_g"] == pytest.approx(25.0)
    assert got["Methylparaben"]["mass_g"] == pytest.approx(0.03)  # 25 mg, to the 10 mg balance
    # USP <1176>: 25 mg and 15 mg are below the 120 mg MWQ of a Class A balance: trituration.
    for name in ("Methylparaben", "Propylparaben"):
        [check] = [k for k in got[name]["checks"] if k["code"] == "minimum_weighable_quantity"]
        assert not check["ok"] and "trituration" in check["message"]
        assert got[name]["measure"]["aliquot"]["substance_g"] >= 0.12
    assert body["result"]["rescaled_from"] == {"value": 1000, "unit": "g"}


def test_lotion_worksheet(client, registry):
    body = client.post(SHEET, json=LOTION).get_json()
    result = body["result"]
    assert result["oil_phase"]["required_hlb"] == 11.6
    got = rows(body)
    # Hand-computed: x(polysorbate 60) = (11.6 - 4.7) / (14.9 - 4.7) of 5 % of 200 g.
    assert got["Polysorbate 60"]["mass_g"] == pytest.approx(round(6.9 / 10.2 * 10, 2))
    assert got["Sorbitan monostearate"]["mass_g"] == pytest.approx(round(3.3 / 10.2 * 10, 2))
    assert got["Purified water"]["role"] == "qs"
    assert sum(r["mass_g"] for r in result["rows"]) == pytest.approx(200.0)
    assert got["Glycerin"]["measure"]["how"] == "weigh"  # viscous: by weight
    assert got["Cetyl alcohol"]["volume_ml"] is None      # solid: no volume
    assert any("70 to 75" in c for c in body["cautions"])
    assert body["result"]["emulsifier"]["hlb_reached"] == 11.6


def test_liquids_in_graduates_and_units(client):
    sheet = copy.deepcopy(LOTION)
    sheet["ingredients"].insert(4, {"inline": {"name": "Rose water (demo)", "physical_state": "liquid", "density": {"value": 1.0, "unit": "g/mL"}},
                                    "phase": "aqueous", "share": share(4)})
    sheet["output_units"] = {"mass": "oz", "volume": "fl_oz"}
    body = client.post(SHEET, json=sheet).get_json()
    rose = rows(body)["Rose water (demo)"]
    # 8 g at 1.0 g/mL = 8 mL: the 10 mL graduate (80 % of capacity), to 0.2 mL.
    assert rose["measure"]["how"] == "graduate" and rose["measure"]["graduate_ml"] == 10.0
    assert rose["measure"]["volume_ml_rounded"] == pytest.approx(8.0)
    assert rose["mass"] == {"value": pytest.approx(8 / 28.349523125, rel=1e-5), "unit": "oz"}  # NIST HB44
    assert rose["volume"]["unit"] == "fl_oz"


def test_proposed_pair_and_minimum_estimate(client):
    sheet = copy.deepcopy(LOTION)
    sheet["emulsifier"] = {"propose": {}, "minimum_estimate": {"margin_percent": 50, "surfactant_density": {"value": 1.05, "unit": "g/mL"}}}
    # Cetyl alcohol has no density in the registry, so the oil phase's is needed.
    assert problem_pointers(client.post(SHEET, json=sheet)) == ["#/emulsifier/minimum_estimate/dispersed_phase_density"]
    sheet["emulsifier"]["minimum_estimate"]["dispersed_phase_density"] = {"value": 0.85, "unit": "g/mL"}
    body = client.post(SHEET, json=sheet).get_json()
    em = body["result"]["emulsifier"]
    assert em["proposed"] is True and len(em["surfactants"]) == 2
    assert "pair_proposed" in {w["code"] for w in body["warnings"]}
    # Hand-computed: A = 6 (1.05 / 0.85) / (10 - 5.8) = 1.7647; the continuous (aqueous) phase is
    # 80 % less the emulsifier; E = 1.5 (A + 0.004 (80 - E)) -> E = 1.5 (A + 0.32) / 1.006 = 3.108,
    # rounded up to 3.2 % w/w; the estimate itself A + 0.004 (80 - 3.108) = 2.072.
    assert em["total_percent_w_w"] == pytest.approx(3.2)
    assert em["minimum_estimate_g_per_100g"] == pytest.approx(2.072, abs=1e-3)
    assert em["hlb_reached"] == 11.6


def test_text_forms(client):
    md = client.post(SHEET, json=LOTION, headers={"Accept": "text/markdown"})
    assert md.status_code == 200 and md.mimetype == "text/markdown"
    text = md.get_data(as_text=True)
    assert text.startswith("# Batch worksheet: O/W emulsion, 200 g") and "| Purified water (q.s.) |" in text
    assert "qualified pharmacist" in text and "Checked by:" in text
    plain = client.post(SHEET, json=LOTION, headers={"Accept": "text/plain"})
    assert plain.mimetype == "text/plain" and "Purified water (q.s.)" in plain.get_data(as_text=True)
    refused = client.post(SHEET, json=LOTION, headers={"Accept": "application/xml"})
    assert refused.status_code == 406
    problem_pointers(refused)


@pytest.mark.parametrize(("mutate", "pointer"), [
    (lambda s: s["ingredients"][-1].pop("qs"), "#/ingredients/4/share"),
    (lambda s: s["ingredients"][-1].update(share=share(5)), "#/ingredients/4/share"),
    (lambda s: s["ingredients"][0].update(qs=True, share=None) or s["ingredients"][0].pop("share"), "#/ingredients"),
    (lambda s: s["ingredients"][2].update(share=share(3, "mL")), "#/ingredients/2/share/unit"),
    (lambda s: s["ingredients"][0].update(share=share(80)), "#/ingredients/4"),
    (lambda s: s["ingredients"][0].update(share=share(95)), "#/ingredients"),
    (lambda s: s["emulsifier"].update(total_percent_w_w=5, minimum_estimate={}), "#/emulsifier/total_percent_w_w"),
    (lambda s: s["emulsifier"].update(pair=[{"ingredient": "polysorbate-80"}, {"ingredient": "polysorbate-20"}]), "#/emulsifier/target_hlb"),
    (lambda s: s.update(ingredients=[i for i in s["ingredients"] if i.get("phase") != "oil"]), "#/ingredients"),
    (lambda s: s["ingredients"][0].update(share=share(3, "parts")), "#/ingredients/0/share/unit"),
    (lambda s: s.update(batch={"value": 200, "unit": "mL"}), "#/ingredients/2"),
])
def test_worksheet_refuses_bad_formulas(client, mutate, pointer):
    sheet = copy.deepcopy(LOTION)
    mutate(sheet)
    r = client.post(SHEET, json=sheet)
    assert r.status_code == 422, r.get_data(as_text=True)
    assert pointer in problem_pointers(r)


def test_batch_by_volume_with_all_densities(client):
    sheet = {"emulsion_type": "O/W", "batch": {"value": 100, "unit": "mL"},
             "ingredients": [{"ingredient": "light-mineral-oil", "phase": "oil", "share": share(20)},
                             {"ingredient": "purified-water", "phase": "aqueous", "qs": True}],
             "emulsifier": {"pair": [{"ingredient": "sorbitan-monooleate", "density": {"value": 0.99, "unit": "g/mL"}},
                                     {"ingredient": "polysorbate-80"}], "total_percent_w_w": 5}}
    body = client.post(SHEET, json=sheet).get_json()
    assert body["result"]["batch_volume_ml"] == 100
    total_volume = sum(r["volume_ml"] for r in body["result"]["rows"])
    assert total_volume == pytest.approx(100.0, rel=2e-3)  # volumes assumed additive; masses rounded to 10 mg


def test_candidate_pairs(client):
    r = client.post("/v1/candidate-pairs", json={"target_hlb": 11.6, "limit": 5})
    body = r.get_json()
    assert r.status_code == 200 and len(body["result"]["candidates"]) == 5
    top = body["result"]["candidates"][0]
    assert top["same_fatty_chain"] and top["low"]["hlb"] <= 11.6 <= top["high"]["hlb"]
    assert top["low"]["percent_of_blend"] + top["high"]["percent_of_blend"] == pytest.approx(100.0)
    assert all(c["low"]["ionic_class"] == "nonionic" and c["high"]["ionic_class"] == "nonionic" for c in body["result"]["candidates"])


def test_candidate_pairs_for_an_oil_phase_with_ionic_filter(client):
    r = client.post("/v1/candidate-pairs", json={"emulsion_type": "O/W", "ionic_classes": ["nonionic", "anionic"], "limit": 50,
                                                 "oil_phase": [{"ingredient": "mineral-oil", "amount": share(1, "g")}]})
    body = r.get_json()
    assert body["result"]["target_hlb"] == 10.0
    assert any(c["ionic_members"] for c in body["result"]["candidates"]) or body["result"]["considered"] > 0
    assert not any(c["low"]["ingredient"] == "acacia" or c["high"]["ingredient"] == "acacia" for c in body["result"]["candidates"])


@pytest.mark.parametrize("body", [{}, {"target_hlb": 10, "oil_phase": []}, {"oil_phase": [{"ingredient": "mineral-oil", "amount": share(1, "g")}]},
                                  {"target_hlb": 10, "limit": 0}, {"target_hlb": 10, "limit": 2.5}, {"target_hlb": 10, "ionic_classes": ["zwitterion"]}])
def test_candidate_pairs_bad_input(client, body):
    assert client.post("/v1/candidate-pairs", json=body).status_code == 422


def test_oily_qs_vehicle_for_a_w_o_base(client):
    # Hand-computed: mineral oil q.s. = 100 - 5 - 40 - 4 = 51 %; required HLB (W/O) of
    # white wax 5 and mineral oil 4-6 (5) is 5.0, range 4.1 to 5.9 ((5x5 + 51x4)/56 = 4.09).
    sheet = {"emulsion_type": "W/O", "batch": {"value": 100, "unit": "g"},
             "ingredients": [{"ingredient": "white-wax", "phase": "oil", "share": share(5)},
                             {"ingredient": "purified-water", "phase": "aqueous", "share": share(40)},
                             {"ingredient": "mineral-oil", "phase": "oil", "qs": True}],
             "emulsifier": {"pair": [{"ingredient": "sorbitan-sesquioleate"}, {"ingredient": "polysorbate-80"}], "total_percent_w_w": 4}}
    body = client.post(SHEET, json=sheet).get_json()
    assert body["result"]["oil_phase"] == {"required_hlb": 5.0, "required_hlb_unrounded": 5.0, "range": {"low": 4.1, "high": 5.9},
                                          "range_with_doubtful": None, "percent_w_w": 56.0}
    assert rows(body)["Mineral oil"]["mass_g"] == pytest.approx(51.0)
    sheet["emulsifier"] = {"pair": sheet["emulsifier"]["pair"], "minimum_estimate": {}}
    assert problem_pointers(client.post(SHEET, json=sheet)) == ["#/ingredients/2/qs"]


def test_a_pair_member_with_no_share_is_left_out(client):
    sheet = copy.deepcopy(LOTION)
    sheet["emulsifier"]["target_hlb"] = 14.9  # polysorbate 60 alone
    body = client.post(SHEET, json=sheet).get_json()
    names = [r["name"] for r in body["result"]["rows"]]
    assert "Polysorbate 60" in names and "Sorbitan monostearate" not in names


def test_strict_worksheet_refuses_unverified_values(client):
    r = client.post(SHEET, json={**LOTION, "strict": True})
    assert r.status_code == 422 and r.get_json()["title"] == "Unverified values refused"
    assert "#/ingredients/0" in problem_pointers(r)


def test_candidates_are_emulsifying_agents_only(client, registry):
    # Ethylene glycol distearate is an opacifier (its functions in the registry, from the handbook's functional
    # category, recalled from memory): never proposed, though it has an HLB.
    assert "emulsifier" not in registry.get("ethylene-glycol-distearate").functions
    body = client.post("/v1/candidate-pairs", json={"target_hlb": 8.0, "limit": 50}).get_json()
    members = {m["ingredient"] for c in body["result"]["candidates"] for m in (c["low"], c["high"])}
    assert members and "ethylene-glycol-distearate" not in members
    assert all("emulsifier" in registry.get(i).functions for i in members)


def test_candidates_leave_out_off_scale_hlb_unless_asked(client):
    # Poloxamers (nominal HLB 22 and 29) lie above Griffin's 0 to 20 nonionic scale; only they reach 19.5 here.
    plain = client.post("/v1/candidate-pairs", json={"target_hlb": 19.5, "limit": 50}).get_json()
    assert plain["result"]["candidates"] == [] and "no_candidate_pair" in {w["code"] for w in plain["warnings"]}
    asked = client.post("/v1/candidate-pairs", json={"target_hlb": 19.5, "limit": 50, "include_off_scale_hlb": True}).get_json()
    members = {m["ingredient"] for c in asked["result"]["candidates"] for m in (c["low"], c["high"])}
    assert members & {"poloxamer-188", "poloxamer-407"}
    assert "hlb_off_griffin_scale" in {w["code"] for w in asked["warnings"]}


def test_blend_with_a_poloxamer_is_flagged(client):
    body = client.post("/v1/blends/hlb", json={"components": [{"ingredient": "poloxamer-188", "amount": share(1, "g")},
                                                              {"ingredient": "sorbitan-monooleate", "amount": share(1, "g")}]}).get_json()
    assert "hlb_off_griffin_scale" in {w["code"] for w in body["warnings"]}


def test_single_surfactants_that_meet_the_target(client):
    # Polysorbate 80 (15.0) meets 15.0 on its own; the tolerance is half an HLB unit (common practice, no source).
    body = client.post("/v1/candidate-pairs", json={"target_hlb": 15.0, "limit": 3}).get_json()
    singles = {s["ingredient"]: s["difference_hlb"] for s in body["result"]["single_surfactants"]}
    assert singles["polysorbate-80"] == pytest.approx(0.0)
    assert all(abs(d) <= body["result"]["single_tolerance_hlb"] for d in singles.values())


def test_candidates_prefer_the_oils_own_fatty_chain(client):
    # An oil phase of stearic acid and stearyl alcohol (C18 by their names): pairs of the C18 family come first.
    body = client.post("/v1/candidate-pairs", json={"emulsion_type": "O/W", "limit": 5, "oil_phase": [
        {"ingredient": "stearic-acid", "amount": share(3, "g")}, {"ingredient": "stearyl-alcohol", "amount": share(1, "g")}]}).get_json()
    assert body["result"]["oil_fatty_chain"] == "C18"
    top = body["result"]["candidates"][0]
    assert top["matches_oil_chain"] and top["low"]["fatty_chain"] == top["high"]["fatty_chain"] == "C18"
    mixed = client.post("/v1/candidate-pairs", json={"emulsion_type": "O/W", "limit": 5, "oil_phase": [
        {"ingredient": "mineral-oil", "amount": share(3, "g")}, {"ingredient": "stearyl-alcohol", "amount": share(1, "g")}]}).get_json()
    assert mixed["result"]["oil_fatty_chain"] is None  # the C18 part is not the larger part of the oil phase


def _fully_stated(water_percent):
    body = copy.deepcopy(LOTION)
    body["ingredients"][-1] = {"ingredient": "purified-water", "phase": "aqueous", "share": share(water_percent)}
    return body


def test_a_formula_stated_in_full_needs_no_qs_vehicle(client):
    # 10 + 8 + 2 + 5 + 5 (emulsifier) + 70 = 100 % w/w: arithmetic of the
    # formula itself (common practice, no source), no vehicle marked q.s.
    r = client.post(SHEET, json=_fully_stated(70))
    assert r.status_code == 200, r.get_data(as_text=True)
    body = r.get_json()
    water = rows(body)["Purified water"]
    assert water["role"] != "qs"
    assert water["mass_g"] == pytest.approx(140.0, abs=0.02)
    assert body["result"]["totals"]["mass_g"] == pytest.approx(200.0)
    assert {c["code"]: c["ok"] for c in body["result"]["checks"]}["totals_add_up"] is True
    residue = [w for w in body["warnings"] if w["code"] == "rounding_residue_to_largest_share"]
    assert residue and residue[0]["subject"] == "purified-water"


def test_a_formula_without_qs_must_add_up_to_100(client):
    r = client.post(SHEET, json=_fully_stated(60))
    assert r.status_code == 422
    item = r.get_json()["errors"][0]
    assert (item["pointer"], item["rule"]) == ("#/ingredients", "formula_adds_up")
    assert "90 %" in item["detail"]


def test_two_qs_vehicles_are_refused(client):
    body = copy.deepcopy(LOTION)
    body["ingredients"][3] = {"ingredient": "glycerin", "phase": "aqueous", "qs": True}
    r = client.post(SHEET, json=body)
    assert r.status_code == 422 and r.get_json()["errors"][0]["rule"] == "one_qs_vehicle"
