"""The site overlay (a pharmacy's own records and overrides) and strict mode."""
from __future__ import annotations

import shutil
from pathlib import Path

import pytest

from registry import RegistryError, load_registry
from service import create_app
from tests.api.helpers import comp, inline, problem_pointers, unverified_surfactants

OVERLAY = Path(__file__).resolve().parents[1] / "fixtures" / "site-overlay"


@pytest.fixture(scope="module")
def site_app():
    return create_app({"site_overlay": str(OVERLAY)})


def test_overlay_adds_and_overrides(registry):
    site = load_registry(overlay=OVERLAY)
    smo = site.get("sorbitan-monooleate")
    assert smo.preferred("density").figure == 0.994 and smo.preferred("density").local
    assert registry.get("sorbitan-monooleate").preferred("density") is None  # shipped record untouched
    assert site.get("caprylic-capric-triglyceride").local
    assert site.sources["site-lab-log"].local
    assert site.version.startswith(registry.version + ".site.")


def test_local_values_are_marked_in_answers(site_app):
    client = site_app.test_client()
    body = client.post("/v1/blends/hlb", json={"components": [comp("polysorbate-80", 3, "g"), comp("sorbitan-monooleate", 2, "mL")]}).get_json()
    used = [v for v in body["values_used"] if v["ingredient"] == "sorbitan-monooleate" and v["property"] == "density"]
    assert used and used[0]["local"] and used[0]["status"] == "measured"
    assert "local_value" in {w["code"] for w in body["warnings"]}
    assert body["registry"]["site_overlay_digest"]
    assert client.get("/healthz").headers["Registry-Version"] == body["registry"]["version"]


def test_local_record_in_a_calculation(site_app):
    body = site_app.test_client().post("/v1/oil-phases/required-hlb", json={"emulsion_type": "O/W", "oil_phase": [
        comp("caprylic-capric-triglyceride", 1, "g")]}).get_json()
    assert body["result"]["required_hlb"] == 10.5
    assert body["values_used"][0]["local"]


def _copy_overlay(tmp_path) -> Path:
    target = tmp_path / "overlay"
    shutil.copytree(OVERLAY, target)
    return target


def test_a_bad_overlay_file_stops_the_service(tmp_path):
    overlay = _copy_overlay(tmp_path)
    path = overlay / "ingredients" / "sorbitan-monooleate.toml"
    path.write_text(path.read_text().replace('status = "measured"', 'status = "measured-ish"'))
    with pytest.raises(RegistryError) as err:
        create_app({"site_overlay": str(overlay)})
    assert err.value.file.endswith("ingredients/sorbitan-monooleate.toml")
    assert err.value.field == "values/density/0/status"


def test_an_overlay_source_cannot_shadow_a_shipped_one(tmp_path):
    overlay = _copy_overlay(tmp_path)
    (overlay / "sources.toml").write_text('[sources.hpe-6]\ncitation = "x"\nkind = "handbook"\n')
    with pytest.raises(RegistryError, match="reuse a shipped source"):
        load_registry(overlay=overlay)


def test_a_measured_value_needs_its_reviewer(tmp_path):
    overlay = _copy_overlay(tmp_path)
    path = overlay / "ingredients" / "caprylic-capric-triglyceride.toml"
    path.write_text(path.read_text().replace('reviewed_by = "second pharmacist (demo)"\n', ""))
    with pytest.raises(RegistryError) as err:
        load_registry(overlay=overlay)
    assert err.value.field == "values/required_hlb_ow/0" and "reviewed_by" in err.value.message


def test_an_overlay_without_ingredients_folder(tmp_path):
    with pytest.raises(RegistryError, match="ingredients/ folder"):
        load_registry(overlay=tmp_path)


def unverified_blend(registry):
    first, second = unverified_surfactants(registry)
    return {"components": [comp(first, 3, "g"), comp(second, 2, "g")]}


def test_strict_request_refuses_unverified_values_and_names_them(client, registry):
    r = client.post("/v1/blends/hlb", json={**unverified_blend(registry), "strict": True})
    assert r.status_code == 422
    assert problem_pointers(r) == ["#/components/0", "#/components/1"]
    assert all(e["rule"] == "verified_values_only" for e in r.get_json()["errors"])


def test_strict_accepts_verified_and_caller_values(site_app):
    client = site_app.test_client()
    body = {"emulsion_type": "O/W", "strict": True, "oil_phase": [comp("caprylic-capric-triglyceride", 1, "g"), inline("house oil", 1, "g", required_hlb=9.0)]}
    r = client.post("/v1/oil-phases/required-hlb", json=body)
    assert r.status_code == 200 and r.get_json()["strict"] is True
    assert r.get_json()["result"]["required_hlb"] == 9.8


def test_strict_accepts_registry_values_read_in_their_sources(client):
    # Both HLBs were checked against their sources (PMC4137601, Griffin 1949); by mass, no density is needed.
    body = {"components": [comp("polysorbate-80", 3, "g"), comp("sorbitan-monooleate", 2, "g")], "strict": True}
    r = client.post("/v1/blends/hlb", json=body)
    assert r.status_code == 200 and r.get_json()["strict"] is True


def test_strict_service_cannot_be_relaxed_by_a_request(registry):
    client = create_app({"strict": True}).test_client()
    r = client.post("/v1/blends/hlb", json={**unverified_blend(registry), "strict": False})
    assert r.status_code == 422 and r.get_json()["title"] == "Unverified values refused"


def test_non_strict_answers_say_so(client, registry):
    assert client.post("/v1/blends/hlb", json=unverified_blend(registry)).get_json()["strict"] is False


def test_strict_flag_from_environment():
    from service.config import Settings

    assert Settings.from_env({"EMULSION_STRICT": "true"}).strict is True
    assert Settings.from_env({}).strict is False
    with pytest.raises(ValueError, match="EMULSION_STRICT"):
        Settings.from_env({"EMULSION_STRICT": "maybe"})
