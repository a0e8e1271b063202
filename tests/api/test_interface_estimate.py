"""POST /v1/emulsifier/interface-estimate over the Flask test client (every
200 answer is also checked against the committed spec by the client fixture)."""
from __future__ import annotations

import pytest

from tests.api.conftest import answer_validator

URL = "/v1/emulsifier/interface-estimate"
LOTION = {
    "dispersed_phase": {"ingredient": "light-mineral-oil", "amount": {"value": 20, "unit": "mL"}},
    "continuous_phase": {"ingredient": "purified-water", "amount": {"value": 80, "unit": "mL"}},
    "droplets": {"d32_um": 2},
    "surfactants": [{"ingredient": "polysorbate-80"}],
    "required_hlb": 12,
}


def _body(**changes) -> dict:
    body = {k: v for k, v in LOTION.items()}
    body.update(changes)
    return {k: v for k, v in body.items() if v is not None}


def _rules(response) -> set[tuple[str, str]]:
    return {(e["pointer"], e["rule"]) for e in response.get_json()["errors"]}


def test_polysorbate_80_on_light_mineral_oil(client):
    r = client.post(URL, json=LOTION)
    assert r.status_code == 200
    body = r.get_json()
    assert answer_validator("POST", URL).is_valid(body)
    est = body["result"]["interface_estimate"]
    # Hand-computed: A = 6 x 20e-6 m3 / 2e-6 m = 60 m2; the registry's area is the midpoint of 1.2 to 1.7 nm2, 1.45 nm2:
    # N = 60 / 1.45e-18 = 4.1379310e19; n = N / 6.02214076e23 = 6.8711961e-5 mol; x 1309.66 g/mol = 0.0899893 g.
    # Dissolved at the CMC read in mahmood-2013 (0.015 mmol/L): 0.015e-3 x 0.080 L x 1309.66 = 1.571592e-3 g.
    assert est["interfacial_area_m2"] == pytest.approx(60.0)
    assert est["mol"] == pytest.approx(6.8711961e-5, rel=1e-7)
    assert est["adsorbed_g"] == pytest.approx(0.0899893, rel=1e-6)
    assert est["dissolved_g"] == pytest.approx(1.571592e-3, rel=1e-6)
    assert est["total_g"] == pytest.approx(0.0899893 + 1.571592e-3, rel=1e-6)
    assert est["members"][0]["area_basis"] == "air_water" and est["assumptions"]
    codes = {w["code"] for w in body["warnings"]}
    assert {"area_measured_at_air_water", "unverified_value", "value_from_memory"} <= codes
    used = {v["property"]: v for v in body["values_used"] if v["ingredient"] == "polysorbate-80"}
    assert used["cmc"]["status"] == "checked_against_source" and used["cmc"]["source"]["id"] == "mahmood-2013"
    assert used["area_per_molecule"]["status"] == "unverified"
    assert body["cautions"] and body["registry"]["version"] and body["method"]["sources"]
    assert "codata-2018" in {s["id"] for s in body["method"]["sources"]}


def test_the_practice_estimate_is_the_minimum_endpoints_for_the_same_emulsion(client):
    practice = client.post(URL, json=LOTION).get_json()["result"]["practice_estimate"]
    assert practice["assumptions"]
    same = client.post("/v1/emulsifier/minimum", json={
        "required_hlb": 12, "surfactant_density": {"value": practice["surfactant_density_g_per_ml"], "unit": "g/mL"},
        "dispersed_phase_density": {"value": practice["dispersed_phase_density_g_per_ml"], "unit": "g/mL"},
        "continuous_phase_percent": practice["continuous_phase_percent"]}).get_json()["result"]
    assert practice["g_per_100g"] == pytest.approx(same["g_per_100g"], rel=1e-9)


def test_without_required_hlb_the_practice_estimate_is_left_out(client):
    body = client.post(URL, json=_body(required_hlb=None)).get_json()
    assert body["result"]["practice_estimate"] is None and body["result"]["practice_to_interface_ratio"] is None
    assert "practice_estimate_left_out" in {w["code"] for w in body["warnings"]}


def test_a_distribution_and_a_blend_with_a_member_of_unknown_cmc(client):
    r = client.post(URL, json=_body(
        droplets={"distribution": [{"diameter_um": 1, "count": 600}, {"diameter_um": 2, "count": 300}, {"diameter_um": 5, "count": 100}]},
        surfactants=[{"ingredient": "polysorbate-80", "mole_fraction": 0.6},
                     {"ingredient": "sorbitan-monooleate", "mole_fraction": 0.4, "area_per_molecule": {"nm2": 0.5, "basis": "oil_water"},
                      "molar_mass_g_per_mol": 428.6}],
        required_hlb=None))
    assert r.status_code == 200
    body = r.get_json()
    est = body["result"]["interface_estimate"]
    # Hand-computed: d32 = 15500 / 4300 = 3.6046512 µm; mean area 0.6 x 1.45 + 0.4 x 0.5 = 1.07 nm2.
    assert est["sauter_diameter_um"] == pytest.approx(15500 / 4300) and est["sauter_diameter_from"] == "distribution"
    assert est["mean_area_per_molecule_nm2"] == pytest.approx(1.07)
    assert est["dissolved_g"] is None and est["total_g"] == est["adsorbed_g"]
    codes = {w["code"] for w in body["warnings"]}
    assert {"cmc_unknown", "caller_supplied_value"} <= codes


def test_phases_of_unknown_density_by_volume_leave_the_per_100_g_figures_out(client):
    r = client.post(URL, json=_body(continuous_phase={"inline": {"name": "a buffer"}, "amount": {"value": 80, "unit": "mL"}},
                                    required_hlb=None))
    assert r.status_code == 200
    res = r.get_json()["result"]
    assert res["emulsion_mass_g"] is None and res["interface_estimate"]["g_per_100g"] is None
    assert res["interface_estimate"]["interfacial_area_m2"] == pytest.approx(60.0)


def test_a_mass_with_its_density(client):
    # Hand-computed: 17 g of an inline oil at 0.85 g/mL is 20 mL: the same 60 m2 at 2 µm as 20 mL.
    r = client.post(URL, json=_body(dispersed_phase={"inline": {"name": "oil", "density": {"value": 0.85, "unit": "g/mL"}},
                                                     "amount": {"value": 17, "unit": "g"}}, required_hlb=None))
    assert r.status_code == 200 and r.get_json()["result"]["interface_estimate"]["interfacial_area_m2"] == pytest.approx(60.0)


@pytest.mark.parametrize("changes, fault", [
    ({"droplets": {"d32_um": 0}}, ("#/droplets/d32_um", "exclusive_minimum")),
    ({"droplets": {"d32_um": -3}}, ("#/droplets/d32_um", "exclusive_minimum")),
    ({"droplets": {"distribution": [{"diameter_um": 0, "count": 5}]}}, ("#/droplets/distribution/0/diameter_um", "exclusive_minimum")),
    ({"droplets": {"distribution": [{"diameter_um": 1, "count": 0}]}}, ("#/droplets/distribution", "distribution_has_droplets")),
    ({"droplets": {"d32_um": 2, "distribution": [{"diameter_um": 1, "count": 1}]}}, ("#/droplets/d32_um", "exactly_one_of")),
    ({"dispersed_phase": {"inline": {"name": "oil"}, "amount": {"value": 17, "unit": "g"}}},
     ("#/dispersed_phase/density", "density_needed_for_mass")),
    ({"surfactants": [{"ingredient": "sorbitan-monooleate"}]}, ("#/surfactants/0/area_per_molecule", "area_per_molecule_known")),
    ({"surfactants": [{"ingredient": "polysorbate-80", "area_per_molecule": {"nm2": 1.2}}]}, ("#/surfactants/0/area_per_molecule/basis", "required")),
    ({"surfactants": [{"ingredient": "polysorbate-80", "area_per_molecule": {"nm2": 0, "basis": "oil_water"}}]},
     ("#/surfactants/0/area_per_molecule/nm2", "exclusive_minimum")),
    ({"surfactants": [{"inline": {"name": "an ester"}, "area_per_molecule": {"nm2": 0.5, "basis": "oil_water"}}]},
     ("#/surfactants/0/molar_mass_g_per_mol", "molar_mass_known")),
    ({"surfactants": [{"ingredient": "polysorbate-80"}, {"ingredient": "polysorbate-20"}]},
     ("#/surfactants/0/mole_fraction", "mole_fractions_given")),
    ({"surfactants": [{"ingredient": "polysorbate-80", "mole_fraction": 0.5}, {"ingredient": "polysorbate-20", "mole_fraction": 0.3}]},
     ("#/surfactants", "mole_fractions_add_up")),
    ({"required_hlb": 20}, ("#/required_hlb", "exclusive_maximum")),
    ({"continuous_phase": {"inline": {"name": "a buffer"}, "amount": {"value": 80, "unit": "mL"}}},
     ("#/continuous_phase/density", "density_needed")),
    ({"dispersed_phase": {"inline": {"name": "an oil"}, "amount": {"value": 20, "unit": "mL"}}},
     ("#/dispersed_phase/density", "density_needed")),
])
def test_bad_input_is_a_422_naming_the_field_and_rule(client, changes, fault):
    r = client.post(URL, json=_body(**changes))
    assert r.status_code == 422 and r.content_type.startswith("application/problem+json")
    assert fault in _rules(r)


def test_strict_mode_refuses_the_recalled_area(client):
    r = client.post(URL, json=_body(strict=True))
    assert r.status_code == 422
    assert ("#/surfactants/0", "verified_values_only") in _rules(r)
