"""The registry, read-only over HTTP."""
import pytest

from tests.api.helpers import problem_pointers


def test_list_all(client, registry):
    body = client.get("/v1/ingredients").get_json()
    assert body["count"] == len(registry.ingredients) == len(body["ingredients"])
    assert body["registry"]["version"] == registry.version


def test_filter_by_role_and_hlb(client):
    body = client.get("/v1/ingredients?role=surfactant&hlb_min=4&hlb_max=5").get_json()
    ids = {i["id"] for i in body["ingredients"]}
    assert {"sorbitan-monooleate", "sorbitan-monostearate"} <= ids
    assert all(4 <= i["hlb"] <= 5 for i in body["ingredients"])
    assert "polysorbate-80" not in ids


def test_filter_by_ionic_class(client):
    body = client.get("/v1/ingredients?ionic_class=anionic").get_json()
    assert "sodium-lauryl-sulfate" in {i["id"] for i in body["ingredients"]}
    assert all(i["ionic_class"] == "anionic" for i in body["ingredients"])


@pytest.mark.parametrize(("query", "param"), [
    ("hlb_min=abc", "hlb_min"), ("hlb_min=nan", "hlb_min"), ("hlb_min=inf", "hlb_min"), ("hlb_min=1_0", "hlb_min"),
    ("hlb_min=-1", "hlb_min"), ("hlb_min=9&hlb_max=2", "hlb_min"), ("role=emulsifier", "role"),
    ("colour=red", "colour"), ("role=surfactant&role=oil_phase", "role"),
])
def test_bad_queries(client, query, param):
    r = client.get(f"/v1/ingredients?{query}")
    assert r.status_code == 422
    assert problem_pointers(r) == [param]


def test_one_ingredient_with_provenance(client):
    body = client.get("/v1/ingredients/castor-oil").get_json()["ingredient"]
    rhlb = body["values"]["required_hlb_ow"]
    assert len(rhlb) == 2 and sum(v["preferred"] for v in rhlb) == 1
    assert all(v["source"]["citation"] for v in rhlb)
    density = body["values"]["density"][0]
    assert density["basis"] == "specific_gravity_25_25" and density["recorded"] == {"low": 0.957, "high": 0.961}
    assert density["unit"] == "g/mL"


def test_a_melting_range_is_shown_in_degc_with_its_basis(client):
    # USP 32-NF 27, Petrolatum: "Melting range, Class III 741: between 38 and 60."
    body = client.get("/v1/ingredients/petrolatum").get_json()["ingredient"]
    (melting,) = body["values"]["melting_range"]
    assert (melting["low"], melting["high"], melting["unit"], melting["basis"]) == (38.0, 60.0, "degC", "melting_range")
    assert melting["status"] == "checked_against_source" and melting["locator"]
    # A liquid has none.
    assert client.get("/v1/ingredients/olive-oil").get_json()["ingredient"]["values"]["melting_range"] == []


def test_unknown_ingredient_is_404(client):
    r = client.get("/v1/ingredients/no-such-thing")
    assert r.status_code == 404
    problem_pointers(r)


def test_unknown_ingredient_404_suggests_the_closest_ids(client):
    body = client.get("/v1/ingredients/castr-oil").get_json()
    assert body["suggestions"][0] == "castor-oil" and "did you mean 'castor-oil'" in body["detail"]
    # A synonym, written as an id, finds its record.
    assert client.get("/v1/ingredients/glycerol").get_json()["suggestions"] == ["glycerin"]


def test_search_by_name_ignores_case_and_sorts_by_name(client, registry):
    body = client.get("/v1/ingredients?q=OLEATE").get_json()
    names = [i["name"] for i in body["ingredients"]]
    assert body["count"] == len(names) > 1
    assert all("oleate" in n.casefold() for n in names)
    assert names == sorted(names, key=str.casefold)
    assert "sorbitan-monooleate" in {i["id"] for i in body["ingredients"]}


def test_search_by_synonym_and_with_filters(client, registry):
    # glycerin.toml: synonyms = ["glycerol"]
    assert "glycerin" in [i["id"] for i in client.get("/v1/ingredients?q=glycerol").get_json()["ingredients"]]
    found = client.get("/v1/ingredients?q=oleate&role=surfactant&hlb_max=5").get_json()["ingredients"]
    assert found and all(i["hlb"] <= 5 and "surfactant" in i["roles"] for i in found)
    assert client.get("/v1/ingredients?q=no-such-name").get_json() | {"registry": None} == {"count": 0, "ingredients": [], "registry": None}


def test_every_listing_is_sorted_by_name(client):
    names = [i["name"] for i in client.get("/v1/ingredients").get_json()["ingredients"]]
    assert names == sorted(names, key=str.casefold)


@pytest.mark.parametrize("query", ["q=", "q=" + "x" * 121, "q=a&q=b"])
def test_bad_searches(client, query):
    r = client.get(f"/v1/ingredients?{query}")
    assert r.status_code == 422 and problem_pointers(r) == ["q"]


def test_bibliography(client, registry):
    body = client.get("/v1/sources").get_json()
    assert body["count"] == len(registry.sources)
    assert "griffin-1949" in {s["id"] for s in body["sources"]}


def test_health(client, registry):
    body = client.get("/healthz").get_json()
    assert body == {"status": "ok", "registry": {"release": registry.release, "digest": registry.digest,
                                                 "site_overlay_digest": None, "version": registry.version}}


def test_docs_page(client):
    r = client.get("/docs")
    assert r.status_code == 200 and r.mimetype == "text/html"
    html = r.get_data(as_text=True)
    assert "/v1/blends/hlb" in html and 'id="problem-invalid-input"' in html


def test_docs_page_shows_examples_codes_and_linked_schemas(client):
    from service.core.codes import WARNINGS

    html = client.get("/docs").get_data(as_text=True)
    # Every operation's request and response examples, folded.
    assert html.count("Request example") >= 10 and html.count("Response example") >= 15
    # Each schema reference is a link to the schema's own heading.
    assert '<a href="#schema-Amount">&#34;#/components/schemas/Amount&#34;</a>' in html and 'id="schema-Amount"' in html
    # The code catalogue, each code with its meaning.
    assert 'id="code-WarningCode"' in html and 'id="code-RuleCode"' in html
    assert "<code>unverified_value</code></td><td>" + WARNINGS["unverified_value"] in html


def test_functions_and_doubtful_values_are_shown(client):
    opacifiers = client.get("/v1/ingredients?function=opacifier").get_json()
    assert "ethylene-glycol-distearate" in [i["id"] for i in opacifiers["ingredients"]]
    assert all("opacifier" in i["functions"] for i in opacifiers["ingredients"])
    castor = client.get("/v1/ingredients/castor-oil").get_json()["ingredient"]
    doubtful = [v for v in castor["values"]["required_hlb_ow"] if v["doubtful"]]
    assert len(doubtful) == 1 and doubtful[0]["low"] == 6.0 and doubtful[0]["doubtful_reason"] and not doubtful[0]["preferred"]
    provenance = castor["functions_provenance"]
    assert provenance["list"] == castor["functions"] and provenance["source"]["id"] and provenance["status"] == "unverified"
    assert client.get("/v1/ingredients?function=levitation").status_code == 422
