"""A request's faults come in one answer, all of them: every missing density,
every unknown value, every implausible figure, not one per round trip."""
import copy

from tests.api.helpers import comp, inline, problem_pointers
from tests.api.test_worksheets import LOTION, SHEET, share


def rules(response):
    return [(e["pointer"], e["rule"]) for e in response.get_json()["errors"]]


def test_three_surfactants_by_volume_without_a_density(client):
    # Rule density_needed_for_volume, once for each: the core alone named the first.
    body = {"components": [inline("A (demo)", 2, "mL", hlb=4), inline("B (demo)", 3, "mL", hlb=15), inline("C (demo)", 1, "mL", hlb=9)]}
    r = client.post("/v1/blends/hlb", json=body)
    assert r.status_code == 422
    assert rules(r) == [(f"#/components/{i}/amount", "density_needed_for_volume") for i in range(3)]
    assert r.get_json()["detail"].startswith("3 input fault(s); first at #/components/0/amount")


def test_three_kinds_of_fault_in_one_blend(client):
    # A missing HLB, a second one, and a volume with no density: the calculation's faults, one answer.
    body = {"components": [inline("No HLB (demo)", 1, "g"), inline("No HLB either (demo)", 1, "g"),
                           inline("No density (demo)", 1, "mL", hlb=9)]}
    r = client.post("/v1/blends/hlb", json=body)
    assert r.status_code == 422
    assert sorted(rules(r)) == [("#/components/0/inline/hlb", "hlb_known"), ("#/components/1/inline/hlb", "hlb_known"),
                                ("#/components/2/amount", "density_needed_for_volume")]


def test_every_implausible_figure_in_one_answer(client):
    # Implausible densities and amounts are the schema's rules (bounds per
    # unit): all of them come in the one answer, each at its field.
    body = {"components": [comp("polysorbate-80", 1, "g", density={"value": 1000, "unit": "g/mL"}),
                           comp("sorbitan-monooleate", 5e-324, "g", density={"value": 0.001, "unit": "kg/L"})]}
    r = client.post("/v1/blends/hlb", json=body)
    assert r.status_code == 422
    assert sorted(rules(r)) == [("#/components/0/density/value", "plausible_density"), ("#/components/1/amount/value", "plausible_amount"),
                                ("#/components/1/density/value", "plausible_density")]


def test_every_missing_density_of_a_split_by_volume(client):
    body = {"target_hlb": 10, "pair": [{"inline": {"name": "L (demo)", "hlb": 4}}, {"inline": {"name": "H (demo)", "hlb": 15}}],
            "fixed": [{"inline": {"name": "F (demo)", "hlb": 9}, "amount": share(10)}], "total": {"value": 50, "unit": "mL"}}
    r = client.post("/v1/blends/proportions", json=body)
    assert r.status_code == 422
    assert rules(r) == [("#/pair/0", "density_needed_for_volume"), ("#/pair/1", "density_needed_for_volume"),
                        ("#/fixed/0", "density_needed_for_volume")]


def test_every_missing_required_hlb_and_density_of_an_oil_phase(client):
    body = {"emulsion_type": "O/W", "oil_phase": [inline("Oil A (demo)", 1, "mL", required_hlb=10), inline("Oil B (demo)", 1, "g"),
                                                  inline("Oil C (demo)", 1, "mL")]}
    r = client.post("/v1/oil-phases/required-hlb", json=body)
    assert r.status_code == 422
    assert sorted(rules(r)) == [("#/oil_phase/0/amount", "density_needed_for_volume"), ("#/oil_phase/1/inline/required_hlb", "required_hlb_known"),
                                ("#/oil_phase/2/amount", "density_needed_for_volume"), ("#/oil_phase/2/inline/required_hlb", "required_hlb_known")]


def test_three_faulty_worksheet_rows(client):
    sheet = copy.deepcopy(LOTION)
    sheet["ingredients"][0]["share"] = share(3, "parts")                                  # share_basis
    sheet["ingredients"][2]["share"] = share(3, "mL")                                     # cetyl alcohol is a solid: solids_by_weight
    sheet["ingredients"].insert(-1, {"inline": {"name": "Liquid (demo)", "physical_state": "liquid"}, "phase": "aqueous",
                                     "share": share(2, "mL")})                           # density_needed_for_volume
    r = client.post(SHEET, json=sheet)
    assert r.status_code == 422
    assert rules(r) == [("#/ingredients/0/share/unit", "share_basis"), ("#/ingredients/2/share/unit", "solids_by_weight"),
                        ("#/ingredients/4/share", "density_needed_for_volume")]


def test_three_implausible_equipment_figures(client):
    sheet = copy.deepcopy(LOTION)
    sheet["equipment"] = {"balance": {"sensitivity": {"value": 500, "unit": "g"}, "capacity": {"value": 0.01, "unit": "g"}},
                          "graduates": [{"capacity": {"value": 0.01, "unit": "mL"}}]}
    r = client.post(SHEET, json=sheet)
    assert r.status_code == 422
    assert rules(r) == [("#/equipment/balance/sensitivity/value", "plausible_equipment"), ("#/equipment/balance/capacity/value", "plausible_equipment"),
                        ("#/equipment/graduates/0/capacity/value", "plausible_equipment")]


def test_every_unknown_davies_group(client):
    body = {"method": "davies", "groups": [{"group": "no-such-group", "count": 1}, {"group": "another-one", "count": 1},
                                           {"group": "a-third", "count": 2}]}
    r = client.post("/v1/hlb-estimates", json=body)
    assert r.status_code == 422
    assert rules(r) == [(f"#/groups/{i}/group", "known_group") for i in range(3)]
    assert problem_pointers(r) == ["#/groups/0/group", "#/groups/1/group", "#/groups/2/group"]


def test_both_densities_of_the_minimum_estimate(client):
    sheet = copy.deepcopy(LOTION)
    sheet["emulsifier"] = {"pair": LOTION["emulsifier"]["pair"],
                           "minimum_estimate": {"surfactant_density": {"value": 900, "unit": "g/mL"},
                                                "dispersed_phase_density": {"value": 0.001, "unit": "g/mL"}}}
    r = client.post(SHEET, json=sheet)
    assert r.status_code == 422
    assert rules(r) == [("#/emulsifier/minimum_estimate/surfactant_density/value", "plausible_density"),
                        ("#/emulsifier/minimum_estimate/dispersed_phase_density/value", "plausible_density")]


def test_a_field_fault_and_a_rule_between_fields_in_one_answer(client):
    # A control character in a name (no_control_characters) and an oil phase
    # without its emulsion type (requires): both, at once.
    body = {"oil_phase": [inline("Oil\u0007 (demo)", 1, "parts", required_hlb=10)]}
    r = client.post("/v1/candidate-pairs", json=body)
    assert r.status_code == 422
    assert sorted(rules(r)) == [("#/emulsion_type", "requires"), ("#/oil_phase/0/inline/name", "no_control_characters")]


def test_a_rule_is_not_judged_on_a_field_that_failed(client):
    # The pair fails its length: the emulsifier's rules do not then report
    # it missing as well.
    sheet = copy.deepcopy(LOTION)
    sheet["emulsifier"] = {"pair": [{"ingredient": "polysorbate-80"}] * 3, "total_percent_w_w": 5}
    r = client.post(SHEET, json=sheet)
    assert rules(r) == [("#/emulsifier/pair", "list_length")]
