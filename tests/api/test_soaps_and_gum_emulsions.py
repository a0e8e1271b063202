"""POST /v1/soaps/in-place and /v1/gum-emulsions over the Flask test client."""
from __future__ import annotations

import pytest

SOAP = "/v1/soaps/in-place"
GUM = "/v1/gum-emulsions"


def _rules(body):
    return {(e["pointer"], e["rule"]) for e in body["errors"]}


def test_stearic_acid_with_triethanolamine(client):
    # Hand-computed: 30 g stearic acid at AV 203 holds 0.108545 mol; a fifth is 0.021709 mol of triethanolamine,
    # x 149.188 g/mol = 3.2387 g.
    r = client.post(SOAP, json={"ingredient": "stearic-acid", "acid_mass": {"value": 30, "unit": "g"}, "base": "triethanolamine",
                                "neutralised_fraction": 0.2})
    assert r.status_code == 200
    body = r.get_json()
    res = body["result"]
    assert res["base"]["mass_g"] == pytest.approx(3.2387, abs=1e-4)
    assert res["ionic_class"] == "anionic" and res["soap"]["ionic_class"] == "anionic"
    assert res["free_acid_g"] == pytest.approx(24.0) and res["coproducts"] == []
    assert "soap_is_anionic" in {w["code"] for w in body["warnings"]}
    used = {(v["ingredient"], v["property"]): v for v in body["values_used"]}
    assert used[("stearic-acid", "acid_value")]["status"] == "checked_against_source"
    assert used[("triethanolamine", "molar_mass")]["unit"] == "g/mol"
    assert body["method"]["sources"] and body["cautions"] and body["registry"]["version"]


def test_potassium_hydroxide_assay_is_asked_for(client):
    r = client.post(SOAP, json={"ingredient": "oleic-acid", "acid_mass": {"value": 10, "unit": "g"}, "base": "potassium-hydroxide",
                                "neutralised_fraction": 1})
    codes = {w["code"] for w in r.get_json()["warnings"]}
    assert "alkali_assay_assumed" in codes
    r = client.post(SOAP, json={"ingredient": "oleic-acid", "acid_mass": {"value": 10, "unit": "g"}, "base": "potassium-hydroxide",
                                "neutralised_fraction": 1, "base_assay_percent": 85})
    res = r.get_json()["result"]
    # Hand-computed: 10 g at AV 200 needs 2.0000 g pure KOH (to the 56.106 g/mol the registry rounds to), 2.3529 g at 85 %.
    assert res["base"]["pure_mass_g"] == pytest.approx(2.0, abs=1e-4) and res["base"]["mass_g"] == pytest.approx(2.0 / 0.85, abs=1e-4)


def test_inline_acid_needs_its_acid_value_and_both_amounts_are_refused(client):
    r = client.post(SOAP, json={"name": "palmitic acid", "acid_mass": {"value": 10, "unit": "g"}, "base": "sodium-hydroxide",
                                "neutralised_fraction": 0.5, "base_mass": {"value": 1, "unit": "g"}})
    assert r.status_code == 422
    assert {("#/ingredient", "at_least_one_of"), ("#/neutralised_fraction", "exactly_one_of")} <= _rules(r.get_json())


def test_an_acid_without_acid_value_is_refused(client):
    r = client.post(SOAP, json={"ingredient": "cetyl-alcohol", "acid_mass": {"value": 10, "unit": "g"}, "base": "sodium-hydroxide",
                                "neutralised_fraction": 0.5})
    assert r.status_code == 422 and ("#/ingredient", "acid_value_known") in _rules(r.get_json())


def test_wax_soap_mass_with_the_free_acids_molar_mass(client):
    # Hand-computed: 24 g white wax at AV 20.5 holds 0.0087692 mol of free acid; with cerotic acid's molar mass
    # (C26H52O2, 396.70 g/mol by molmass) all of it neutralised gives 0.0087692 x (396.70 + 21.98) = 3.6715 g of sodium soap.
    r = client.post(SOAP, json={"ingredient": "white-wax", "acid_mass": {"value": 24, "unit": "g"}, "base": "sodium-borate",
                                "neutralised_fraction": 1, "free_acid_molar_mass_g_per_mol": 396.70})
    res = r.get_json()["result"]
    assert res["soap"]["mass_g"] == pytest.approx(3.6715, abs=1e-3)


def test_mineral_oil_gum_emulsion_to_volume(client):
    # Hand-computed, 3:2:1 (common practice, from memory): 50 mL of mineral oil takes 33.33 mL of water and 16.67 g of acacia.
    r = client.post(GUM, json={"oil_kind": "mineral", "oil": {"ingredient": "mineral-oil"}, "oil_amount": {"value": 50, "unit": "mL"},
                               "final": {"value": 100, "unit": "mL"}})
    assert r.status_code == 200
    body = r.get_json()
    primary = body["result"]["primary_emulsion"]
    assert (primary["water_ml"], primary["gum_g"]) == (pytest.approx(100 / 3), pytest.approx(50 / 3))
    assert body["result"]["rest_of_water"]["quantum_satis"] is True
    assert len(body["result"]["steps"]["dry_gum"]) == 4 and len(body["result"]["steps"]["wet_gum"]) == 3
    assert "gum_proportions_common_practice" in {w["code"] for w in body["warnings"]}


def test_fixed_oil_by_mass_to_a_final_mass(client):
    # Hand-computed with the density given (0.91 g/mL): 36.4 g of oil is 40 mL, so 20 mL of water (x 0.9970476 g/mL =
    # 19.941 g) and 10 g of acacia; to 100 g, 100 - 36.4 - 19.941 - 10 = 33.659 g of water remain.
    r = client.post(GUM, json={"oil_kind": "fixed", "oil": {"ingredient": "olive-oil", "density": {"value": 0.91, "unit": "g/mL"}},
                               "oil_amount": {"value": 36.4, "unit": "g"}, "final": {"value": 100, "unit": "g"}})
    res = r.get_json()["result"]
    assert res["primary_emulsion"]["gum_g"] == pytest.approx(10.0)
    assert res["rest_of_water"]["mass_g"] == pytest.approx(100 - 36.4 - 20 * 0.9970476 - 10)


def test_gum_emulsion_refusals(client):
    r = client.post(GUM, json={"oil_kind": "fixed", "oil": {"inline": {"name": "an oil"}}, "oil_amount": {"value": 30, "unit": "g"}})
    assert r.status_code == 422 and ("#/oil/density", "density_needed_for_volume") in _rules(r.get_json())
    r = client.post(GUM, json={"oil_kind": "fixed", "oil": {"ingredient": "olive-oil"}, "oil_amount": {"value": 40, "unit": "mL"},
                               "final": {"value": 50, "unit": "mL"}})
    assert r.status_code == 422 and ("#/final", "final_holds_primary_emulsion") in _rules(r.get_json())
