"""POST /v1/blends/solve: the shares of two or more surfactants under
constraints, over the Flask test client. Expected shares are hand-computed
from Griffin 1949's mass-weighted mean; two members must answer exactly as
/v1/blends/proportions does."""
import pytest

from service.usecases.methods import CAUTIONS
from tests.api.helpers import problem_pointers

SOLVE = "/v1/blends/solve"
SPLIT = "/v1/blends/proportions"


def ref(ingredient, **constraints):
    return {"ingredient": ingredient, **constraints}


def inline(name, hlb, **values):
    return {"inline": {"name": name, "hlb": hlb, **values}}


def test_three_members_with_a_bound_and_a_total(client, registry):
    # Hand-computed: sorbitan monostearate 4.7, polysorbate 60 14.9 and
    # polysorbate 80 15.0 (the registry's figures) for 11.6, polysorbate 80 at
    # most 20 %: it sits at 20 % and the other two share 80 %, polysorbate 60
    # taking (8.6 − 0.8·4.7) / 10.2 = 47.4509...%. 10 g of blend.
    body = {"target_hlb": 11.6, "total": {"value": 10, "unit": "g"},
            "surfactants": [ref("sorbitan-monostearate"), ref("polysorbate-60"), ref("polysorbate-80", max_percent_w_w=20)]}
    r = client.post(SOLVE, json=body)
    assert r.status_code == 200, r.get_json()
    answer = r.get_json()
    assert answer["cautions"] == list(CAUTIONS) and answer["registry"]["version"] == registry.version
    result = answer["result"]
    x60 = (8.6 - 0.8 * 4.7) / 10.2 * 100
    shares = [s["percent_w_w"] for s in result["surfactants"]]
    assert shares == pytest.approx([80 - x60, x60, 20.0], abs=1e-7)
    assert [s["percent_w_w_rounded"] for s in result["surfactants"]] == [round(80 - x60, 2), round(x60, 2), 20.0]
    assert [s["mass_g"] for s in result["surfactants"]] == pytest.approx([(80 - x60) / 10, x60 / 10, 2.0], abs=1e-8)
    assert result["hlb_reached_unrounded"] == pytest.approx(11.6, abs=1e-9)
    assert result["objective"] == "most_even"
    assert result["constraints"] == [{"kind": "upper_bound", "pointer": "#/surfactants/2/max_percent_w_w",
                                      "description": "polysorbate-80 at most 20 % w/w", "given": True, "active": True}]
    assert result["reachable_range"] == pytest.approx({"low": 4.7, "high": 0.2 * 15.0 + 0.8 * 14.9})
    assert {(v["ingredient"], v["property"]) for v in answer["values_used"]} >= {
        ("sorbitan-monostearate", "hlb"), ("polysorbate-60", "hlb"), ("polysorbate-80", "hlb")}


def test_a_ratio_and_a_fixed_share(client):
    # Hand-computed (as tests/core/test_blend_shares.py): m0 : m1 = 1 : 1, m2
    # fixed at 20 %, target 9.5: a = 0.62 / 2.1 of the blend each, d = 0.8 − 2a.
    body = {"target_hlb": 9.5, "surfactants": [inline("A", 4.3), inline("B", 15.0), inline("C", 10.0, ionic_class="nonionic") | {"fixed_percent_w_w": 20},
                                               inline("D", 8.6)],
            "ratios": [{"a": 0, "b": 1, "a_parts": 1, "b_parts": 1}]}
    result = client.post(SOLVE, json=body).get_json()["result"]
    a = 62 / 2.1
    assert [s["percent_w_w"] for s in result["surfactants"]] == pytest.approx([a, a, 20.0, 80 - 2 * a], abs=1e-7)
    assert [(c["kind"], c["active"]) for c in result["constraints"]] == [("ratio", True), ("fixed", True)]


@pytest.mark.parametrize("total", [None, {"value": 10, "unit": "g"}, {"value": 12, "unit": "mL"}])
@pytest.mark.parametrize("target", [6.0, 11.6, 14.0])
def test_two_members_answer_as_the_pair_split(client, target, total):
    # The issue asks for identical answers: two members leave no freedom.
    # Densities given for the volume total (demo figures, not the registry's).
    pair = [ref("sorbitan-monostearate", density={"value": 1.0, "unit": "g/mL"}), ref("polysorbate-60", density={"value": 1.08, "unit": "g/mL"})]
    extra = {"total": total} if total else {}
    split = client.post(SPLIT, json={"target_hlb": target, "pair": pair, **extra}).get_json()["result"]
    solved = client.post(SOLVE, json={"target_hlb": target, "surfactants": pair, **extra}).get_json()["result"]
    assert solved["hlb_reached"] == split["hlb_reached"]
    for mine, theirs in zip(solved["surfactants"], split["surfactants"], strict=True):
        assert mine["ingredient"] == theirs["ingredient"]
        for key in ("percent_w_w", "mass_g", "volume_ml"):
            if theirs[key] is None:
                assert mine[key] is None
            else:
                assert abs(mine[key] - theirs[key]) <= 1e-9, key
    assert solved["total_mass_g"] == pytest.approx(split["total_mass_g"], abs=1e-9) if total else solved["total_mass_g"] is None


def test_least_ionic_keeps_the_anionic_out(client):
    # Hand-computed: the nonionics (4.7 and 14.9) reach 11.6 alone, so sodium
    # lauryl sulfate takes 0 % and the pair splits (11.6 − 4.7)/10.2.
    body = {"target_hlb": 11.6, "objective": "least_ionic",
            "surfactants": [ref("sorbitan-monostearate"), ref("polysorbate-60"), ref("sodium-lauryl-sulfate")]}
    result = client.post(SOLVE, json=body).get_json()["result"]
    assert [s["percent_w_w"] for s in result["surfactants"]] == pytest.approx([100 * 3.3 / 10.2, 100 * 6.9 / 10.2, 0.0], abs=1e-7)
    assert result["ionic_share_percent_w_w"] == pytest.approx(0.0, abs=1e-9)
    assert result["objective"] == "least_ionic"


def test_bounds_too_tight_name_the_nearest_hlb_and_the_bound(client):
    # Hand-computed: polysorbate 60 (14.9) at most 30 % beside sorbitan
    # monostearate (4.7) and an inline 10.0: the highest blend is
    # 0.3·14.9 + 0.7·10.0 = 11.47, short of 13.
    body = {"target_hlb": 13, "surfactants": [ref("sorbitan-monostearate"), ref("polysorbate-60", max_percent_w_w=30), inline("Ten", 10.0)]}
    r = client.post(SOLVE, json=body)
    assert problem_pointers(r) == ["#/target_hlb"]
    (item,) = r.get_json()["errors"]
    assert item["rule"] == "target_reachable_under_constraints"
    assert item["nearest_reachable"] == pytest.approx(11.47, abs=1e-9)
    assert item["binding"][0] == {"kind": "upper_bound", "pointer": "#/surfactants/1/max_percent_w_w",
                                  "description": "polysorbate-60 at most 30 % w/w", "given": True}


def test_a_ratio_that_prevents_the_target(client):
    # Hand-computed: A : B = 1 : 1 holds them at (4.3 + 15.0)/2 = 9.65 and C
    # (8.0) only lowers the blend, so 12 is out of reach; the ratio binds.
    body = {"target_hlb": 12, "surfactants": [inline("A", 4.3), inline("B", 15.0), inline("C", 8.0)],
            "ratios": [{"a": 0, "b": 1, "a_parts": 1, "b_parts": 1}]}
    item = client.post(SOLVE, json=body).get_json()["errors"][0]
    assert item["nearest_reachable"] == pytest.approx(9.65, abs=1e-9)
    assert item["binding"][0]["pointer"] == "#/ratios/0" and "inline 'A' : inline 'B' = 1 : 1" in item["detail"]


def test_shares_that_cannot_add_up(client):
    # Hand-computed: fixed 70 % and at least 40 % make at least 110 %.
    body = {"target_hlb": 10, "surfactants": [inline("A", 4.3) | {"fixed_percent_w_w": 70}, inline("B", 15.0) | {"min_percent_w_w": 40}, inline("C", 8.0)]}
    item = client.post(SOLVE, json=body).get_json()["errors"][0]
    assert item["rule"] == "constraints_consistent" and item["shares_total_low_percent"] == pytest.approx(110.0)
    assert {b["pointer"] for b in item["binding"] if b["given"]} == {"#/surfactants/0/fixed_percent_w_w", "#/surfactants/1/min_percent_w_w"}


def test_bad_ratios_and_bounds_are_refused_by_field(client):
    body = {"target_hlb": 10, "surfactants": [inline("A", 4.3), inline("B", 15.0) | {"min_percent_w_w": 50, "max_percent_w_w": 40},
                                              inline("C", 8.0) | {"fixed_percent_w_w": 10, "min_percent_w_w": 5}]}
    r = client.post(SOLVE, json=body)
    rules = {(e["pointer"], e["rule"]) for e in r.get_json()["errors"]}
    assert rules == {("#/surfactants/1/min_percent_w_w", "not_above"), ("#/surfactants/2/fixed_percent_w_w", "at_most_one_of")}
    body = {"target_hlb": 10, "surfactants": [inline("A", 4.3), inline("B", 15.0), inline("C", 8.0)],
            "ratios": [{"a": 0, "b": 3, "a_parts": 1, "b_parts": 1}, {"a": 1, "b": 1, "a_parts": 1, "b_parts": 2}]}
    r = client.post(SOLVE, json=body)
    assert {(e["pointer"], e["rule"]) for e in r.get_json()["errors"]} == {("#/ratios/0/b", "ratio_member_exists"), ("#/ratios/1/b", "ratio_members_differ")}


def test_least_ionic_needs_every_ionic_class(client):
    body = {"target_hlb": 10, "objective": "least_ionic", "surfactants": [inline("A", 4.3), inline("B", 15.0, ionic_class="nonionic"), inline("C", 8.0)]}
    r = client.post(SOLVE, json=body)
    assert problem_pointers(r) == ["#/surfactants/0/inline/ionic_class", "#/surfactants/2/inline/ionic_class"]
    assert {e["rule"] for e in r.get_json()["errors"]} == {"ionic_class_known"}
