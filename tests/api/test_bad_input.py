"""Bad input gets an RFC 9457 problem naming the field and the rule; never a
500, never a silently wrong number."""
import io
import json

import pytest

from tests.api.helpers import comp, problem_pointers

BLEND = "/v1/blends/hlb"
GOOD = {"components": [comp("polysorbate-80", 9, "g"), comp("sorbitan-monooleate", 1, "g")]}


def post_raw(client, path, text, content_type="application/json"):
    return client.post(path, data=text, content_type=content_type)


@pytest.mark.parametrize(("text", "pointer"), [
    ('{"components":[{"ingredient":"polysorbate-80","amount":{"value":NaN,"unit":"g"}},{"ingredient":"sorbitan-monooleate","amount":{"value":1,"unit":"g"}}]}', "#/components/0/amount/value"),
    ('{"components":[{"ingredient":"polysorbate-80","amount":{"value":Infinity,"unit":"g"}},{"ingredient":"sorbitan-monooleate","amount":{"value":1,"unit":"g"}}]}', "#/components/0/amount/value"),
    ('{"components":[{"ingredient":"polysorbate-80","amount":{"value":-Infinity,"unit":"g"}},{"ingredient":"sorbitan-monooleate","amount":{"value":1,"unit":"g"}}]}', "#/components/0/amount/value"),
    ('{"components":[{"ingredient":"polysorbate-80","amount":{"value":1e400,"unit":"g"}},{"ingredient":"sorbitan-monooleate","amount":{"value":1,"unit":"g"}}]}', "#/components/0/amount/value"),
])
def test_non_finite_numbers_are_422_naming_the_field(client, text, pointer):
    r = post_raw(client, BLEND, text)
    assert r.status_code == 422
    assert problem_pointers(r) == [pointer]


@pytest.mark.parametrize(("mutate", "pointer"), [
    (lambda b: b["components"][0]["amount"].update(value="9"), "#/components/0/amount/value"),
    (lambda b: b["components"][0]["amount"].update(value=True), "#/components/0/amount/value"),
    (lambda b: b["components"][0]["amount"].update(value=0), "#/components/0/amount/value"),
    (lambda b: b["components"][0]["amount"].update(value=-1), "#/components/0/amount/value"),
    (lambda b: b["components"][0]["amount"].update(value=10 ** 400), "#/components/0/amount/value"),
    (lambda b: b["components"][0]["amount"].update(unit="grams"), "#/components/0/amount/unit"),
    (lambda b: b["components"][0]["amount"].update(unit="1e9999 g"), "#/components/0/amount/unit"),
    (lambda b: b["components"][0].update(colour="red"), "#/components/0/colour"),
    (lambda b: b.update(extra=1), "#/extra"),
    (lambda b: b["components"][0].update(density={"value": 0, "unit": "g/mL"}), "#/components/0/density/value"),
    (lambda b: b["components"][0].update(density={"value": -1.0, "unit": "g/mL"}), "#/components/0/density/value"),
    (lambda b: b["components"][0].update(density={"value": 1.0, "unit": "kg/m3"}), "#/components/0/density/value"),
    (lambda b: b.update(components=[]), "#/components"),
    (lambda b: b.update(components=b["components"][:1]), "#/components"),
    (lambda b: b["components"][0].update(inline={"name": "x", "hlb": 5}), "#/components/0/ingredient"),
    (lambda b: b["components"][0].update(ingredient="no-such-thing"), "#/components/0/ingredient"),
    (lambda b: b["components"][0].update(ingredient="Polysorbate 80"), "#/components/0/ingredient"),
    (lambda b: b["components"][0].update(ingredient="polysorbate-80\n"), "#/components/0/ingredient"),
    (lambda b: b["components"][0]["amount"].update(unit="parts"), "#/components/1/amount/unit"),
    (lambda b: [c["amount"].update(value=60, unit="% w/w") for c in b["components"]], "#/components"),
    (lambda b: b["components"][1].update(amount={"value": 2, "unit": "mL"}), "#/components/1/amount"),
    (lambda b: b.update(emulsion_type="oil-in-water"), "#/emulsion_type"),
])
def test_invalid_blend_bodies(client, mutate, pointer):
    body = json.loads(json.dumps(GOOD))
    mutate(body)
    r = client.post(BLEND, json=body)
    assert r.status_code == 422, r.get_data(as_text=True)
    assert pointer in problem_pointers(r)
    assert r.get_json()["errors"][0]["detail"]


def test_inline_without_hlb_is_named(client):
    r = client.post(BLEND, json={"components": [{"inline": {"name": "x"}, "amount": {"value": 1, "unit": "g"}}, comp("polysorbate-80", 1, "g")]})
    assert r.status_code == 422 and problem_pointers(r) == ["#/components/0/inline/hlb"]


@pytest.mark.parametrize("text", ['{"components": [1, 2], "components": []}', "{", "", "[" * 5000 + "]" * 5000, '"just a string"'])
def test_malformed_bodies(client, text):
    r = post_raw(client, BLEND, text)
    assert r.status_code in (400, 422)
    problem_pointers(r)


def test_duplicate_keys_are_refused(client):
    r = post_raw(client, BLEND, '{"emulsion_type": "O/W", "emulsion_type": "W/O", "components": []}')
    assert r.status_code == 400 and "duplicate key" in r.get_json()["detail"]


def test_wrong_content_type_is_415(client):
    r = post_raw(client, BLEND, json.dumps(GOOD), content_type="text/plain")
    assert r.status_code == 415
    problem_pointers(r)


def test_too_large_is_413(client, app):
    big = json.dumps({"components": GOOD["components"], "pad": "x" * (app.config["MAX_BODY_BYTES"] + 1)})
    r = post_raw(client, BLEND, big)
    assert r.status_code == 413
    problem_pointers(r)


def test_chunked_body_is_411(client):
    r = client.post(BLEND, input_stream=io.BytesIO(json.dumps(GOOD).encode()), headers={"Content-Type": "application/json", "Transfer-Encoding": "chunked"})
    assert r.status_code == 411
    problem_pointers(r)


def test_405_carries_allow(client):
    r = client.get(BLEND)
    assert r.status_code == 405
    assert "POST" in r.headers["Allow"]
    problem_pointers(r)


def test_unknown_path_is_404_problem(client):
    r = client.get("/v1/nothing-here")
    assert r.status_code == 404
    problem_pointers(r)


@pytest.mark.parametrize(("path", "body", "pointer"), [
    ("/v1/blends/proportions", {"target_hlb": 10, "pair": [{"ingredient": "polysorbate-80"}]}, "#/pair"),
    ("/v1/blends/proportions", {"target_hlb": 10, "pair": [{"ingredient": "polysorbate-80"}, {"ingredient": "polysorbate-80"}]}, "#/pair"),
    ("/v1/blends/proportions", {"target_hlb": 10, "pair": [{"ingredient": "polysorbate-80"}, {"ingredient": "sorbitan-monooleate"}],
                                "fixed": [comp("polysorbate-20", 2, "g")]}, "#/fixed/0/amount/unit"),
    ("/v1/blends/proportions", {"target_hlb": 10, "pair": [{"ingredient": "polysorbate-80"}, {"ingredient": "sorbitan-monooleate"}],
                                "fixed": [comp("polysorbate-20", 100, "% w/w")]}, "#/fixed"),
    ("/v1/blends/proportions", {"target_hlb": 10, "pair": [{"ingredient": "polysorbate-80"}, {"ingredient": "sorbitan-monooleate"}],
                                "total": {"value": 5, "unit": "parts"}}, "#/total/unit"),
    ("/v1/oil-phases/required-hlb", {"emulsion_type": "O/W", "oil_phase": []}, "#/oil_phase"),
    ("/v1/oil-phases/required-hlb", {"emulsion_type": "O/W", "oil_phase": [comp("glyceryl-monostearate", 1, "g")]}, "#/oil_phase/0/ingredient"),
    ("/v1/oil-phases/required-hlb", {"emulsion_type": "O/W", "oil_phase": [comp("mineral-oil", 1, "g", counts_toward_rhlb="yes")]}, "#/oil_phase/0/counts_toward_rhlb"),
    ("/v1/oil-phases/required-hlb", {"emulsion_type": "O/W", "oil_phase": [comp("mineral-oil", 1, "g", counts_toward_rhlb=False)]}, "#/oil_phase"),
    ("/v1/emulsifier/minimum", {"required_hlb": 20, "surfactant_density": {"value": 1, "unit": "g/mL"},
                                "dispersed_phase_density": {"value": 1, "unit": "g/mL"}, "continuous_phase_percent": 70}, "#/required_hlb"),
    ("/v1/emulsifier/minimum", {"required_hlb": 10, "surfactant_density": {"value": 1, "unit": "g/mL"},
                                "dispersed_phase_density": {"value": 1, "unit": "g/mL"}, "continuous_phase_percent": 100}, "#/continuous_phase_percent"),
    ("/v1/emulsifier/minimum", {"required_hlb": 10, "surfactant_density": {"value": 1, "unit": "g/mL"},
                                "dispersed_phase_density": {"value": 1, "unit": "g/mL"}, "continuous_phase_percent": 70,
                                "batch": {"value": 100, "unit": "mL"}}, "#/batch/unit"),
])
def test_other_calculations_refuse_bad_input(client, path, body, pointer):
    r = client.post(path, json=body)
    assert r.status_code == 422, r.get_data(as_text=True)
    assert pointer in problem_pointers(r)


def test_every_unknown_ingredient_is_named_in_one_problem(client):
    body = {"components": [comp("polysorbate-8", 9, "g"), comp("sorbitan-monooleate", 1, "g"), comp("glycerol", 1, "g"),
                           comp("zzzz-qqqq", 1, "g")]}
    r = client.post(BLEND, json=body)
    assert problem_pointers(r) == ["#/components/0/ingredient", "#/components/2/ingredient", "#/components/3/ingredient"]
    errors = r.get_json()["errors"]
    assert all(e["rule"] == "known_ingredient" for e in errors)
    assert errors[0]["suggestions"][0] == "polysorbate-80" and "did you mean 'polysorbate-80'" in errors[0]["detail"]
    assert errors[1]["suggestions"] == ["glycerin"]  # a synonym of glycerin
    assert errors[2]["suggestions"] == [] and "did you mean" not in errors[2]["detail"]
    assert r.get_json()["detail"].startswith("3 unknown or retired ingredient(s); first at #/components/0/ingredient")


def test_ids_are_checked_before_the_calculation(client):
    # Mixed bases would be refused by the calculation; the unknown id is named first, with the others.
    body = {"components": [comp("polysorbate-80", 3, "g"), comp("sorbitan-monoolate", 1, "parts")]}
    r = client.post(BLEND, json=body)
    assert problem_pointers(r) == ["#/components/1/ingredient"] and r.get_json()["errors"][0]["rule"] == "known_ingredient"


def test_unknown_ids_everywhere_in_a_worksheet(client):
    sheet = {"emulsion_type": "O/W", "batch": {"value": 100, "unit": "g"},
             "ingredients": [{"ingredient": "mineral-oi", "phase": "oil", "share": {"value": 10, "unit": "% w/w"}},
                             {"ingredient": "purified-water", "phase": "aqueous", "qs": True}],
             "emulsifier": {"pair": [{"ingredient": "polysorbate-80"}, {"ingredient": "sorbitan-monoolate"}], "total_percent_w_w": 5}}
    r = client.post("/v1/worksheets", json=sheet)
    assert problem_pointers(r) == ["#/ingredients/0/ingredient", "#/emulsifier/pair/1/ingredient"]
    r = client.post("/v1/worksheets/rescale", json={"worksheet": sheet, "batch": {"value": 50, "unit": "g"}})
    assert problem_pointers(r) == ["#/worksheet/ingredients/0/ingredient", "#/worksheet/emulsifier/pair/1/ingredient"]
    assert [e["suggestions"][0] for e in r.get_json()["errors"]] == ["mineral-oil", "sorbitan-monooleate"]


def test_unknown_and_retired_ingredients_together(tmp_path):
    import shutil

    from registry import DEFAULT_ROOT
    from service.http.app import create_app

    root = tmp_path / "data"
    shutil.copytree(DEFAULT_ROOT, root)
    olive = root / "ingredients" / "olive-oil.toml"
    olive.write_text(olive.read_text().replace('physical_state = "liquid"', 'physical_state = "liquid"\nretired = true\n'
                                               'retired_on = "2026-12-01"\nretired_reason = "test fixture"', 1))
    client = create_app({"registry_root": str(root)}).test_client()
    r = client.post("/v1/oil-phases/required-hlb", json={"emulsion_type": "O/W", "oil_phase": [
        comp("olive-oil", 1, "g"), comp("mineral-oil", 1, "g"), comp("olive-oi", 1, "g")]})
    assert problem_pointers(r) == ["#/oil_phase/0/ingredient", "#/oil_phase/2/ingredient"]
    retired, unknown = r.get_json()["errors"]
    assert retired["rule"] == "current_ingredient" and "retired on 2026-12-01: test fixture" in retired["detail"]
    # A retired record is never suggested.
    assert unknown["rule"] == "known_ingredient" and "olive-oil" not in unknown["suggestions"]
