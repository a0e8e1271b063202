"""The site overlay (a pharmacy's own records and overrides) and strict mode."""
from __future__ import annotations

import json
import shutil
from pathlib import Path

import pytest

from registry import RegistryError, load_registry
from service.http.app import create_app
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
    from service.http.config import Settings

    assert Settings.from_env({"EMULSION_STRICT": "true"}).strict is True
    assert Settings.from_env({}).strict is False
    with pytest.raises(ValueError, match="EMULSION_STRICT"):
        Settings.from_env({"EMULSION_STRICT": "maybe"})


# A shipped record meets a site record (registry/FIELDS.md, "The site overlay"):
# the site record is used, the start-up log and `check` name both records.

SHIPPED_RECORD = '''id = "{id}"
name = "{name}"
synonyms = {synonyms}
roles = ["oil_phase"]
ionic_class = "not_applicable"
physical_state = "liquid"

[[values.required_hlb_ow]]
value = 11.0
source = "martin"
kind = "textbook"
status = "checked_against_source"
reviewed_by = "registry steward"
reviewed_on = "2026-12-01"
note = "Test fixture: invented."

[functions]
list = ["oil_vehicle"]
source = "hpe-6"
status = "unverified"
recalled_from_memory = true
'''


def _upgraded_tree(tmp_path, iid: str, name: str, synonyms: list[str]) -> Path:
    """A copy of the shipped tree whose next release ships a record the
    fixture overlay's site record meets, with its review in the lock."""
    from registry import DEFAULT_ROOT
    from registry.cli import main

    root = tmp_path / "data"
    shutil.copytree(DEFAULT_ROOT, root)
    (root / "ingredients" / f"{iid}.toml").write_text(SHIPPED_RECORD.format(id=iid, name=name, synonyms=json.dumps(synonyms)))
    assert main(["lock", "--root", str(root)]) == 0
    return root


def test_a_shipped_record_with_a_site_records_id(tmp_path, capsys, caplog):
    root = _upgraded_tree(tmp_path, "caprylic-capric-triglyceride", "Caprylic/capric triglyceride", [])
    site = load_registry(root, OVERLAY)
    record = site.get("caprylic-capric-triglyceride")
    # The site's own record, whole, as before the upgrade: its figure, not the shipped one.
    assert record.local and record.preferred("required_hlb_ow").figure == 10.5
    assert [r.figure for r in record.values["required_hlb_ow"]] == [10.5]
    assert site.shadowed["caprylic-capric-triglyceride"].preferred("required_hlb_ow").figure == 11.0
    (collision,) = site.collisions
    assert (collision.kind, collision.site_file, collision.shipped_file) == (
        "id", "site-overlay/ingredients/caprylic-capric-triglyceride.toml", "data/ingredients/caprylic-capric-triglyceride.toml")
    # check passes (the shipped record's reviewed value is still under the lock) and says so.
    capsys.readouterr()
    from registry.cli import main
    assert main(["check", "--root", str(root), "--overlay", str(OVERLAY)]) == 0
    err = capsys.readouterr().err
    assert err.startswith("warning: site-overlay/ingredients/caprylic-capric-triglyceride.toml: id: site record "
                          "'caprylic-capric-triglyceride' has the id of shipped record 'caprylic-capric-triglyceride' "
                          "(data/ingredients/caprylic-capric-triglyceride.toml): this site uses its own record")
    assert "keep only id, values and note in the site file" in err
    # The service starts, uses the site record, and logs the collision.
    with caplog.at_level("WARNING", logger="service"):
        app = create_app({"registry_root": str(root), "site_overlay": str(OVERLAY)})
    assert any("site overlay: site-overlay/ingredients/caprylic-capric-triglyceride.toml: id:" in m for m in caplog.messages)
    body = app.test_client().post("/v1/oil-phases/required-hlb", json={"emulsion_type": "O/W", "oil_phase": [
        comp("caprylic-capric-triglyceride", 1, "g")]}).get_json()
    assert body["result"]["required_hlb"] == 10.5 and body["values_used"][0]["local"]


def test_a_shipped_record_with_a_site_records_names(tmp_path, capsys):
    from registry.cli import main
    from registry.lookup import labels, search

    # The shipped name is the site record's synonym, and a shipped synonym its name.
    root = _upgraded_tree(tmp_path, "medium-chain-triglycerides", "Medium-chain triglycerides",
                          ["caprylic/capric triglyceride", "fractionated coconut oil"])
    site = load_registry(root, OVERLAY)
    assert [(c.kind, c.label, c.field, c.shipped_id) for c in site.collisions] == [
        ("label", "Caprylic/capric triglyceride", "name", "medium-chain-triglycerides"),
        ("label", "medium-chain triglycerides", "synonyms", "medium-chain-triglycerides")]
    shipped = site.get("medium-chain-triglycerides")
    # Both records load whole; the shipped one keeps its names as data, but
    # lookups by the two it shares find the site record only.
    assert shipped.synonyms == ("caprylic/capric triglyceride", "fractionated coconut oil")
    assert labels(site, shipped) == ["fractionated coconut oil"]
    assert site.names["caprylic/capric triglyceride"] == site.names["medium-chain triglycerides"] == "caprylic-capric-triglyceride"
    assert [i.id for i in search(site, "caprylic/capric")] == ["caprylic-capric-triglyceride"]
    assert [i.id for i in search(site, "fractionated")] == ["medium-chain-triglycerides"]
    # Without the overlay the shipped record has every name.
    assert labels(load_registry(root), shipped) == ["Medium-chain triglycerides", "caprylic/capric triglyceride", "fractionated coconut oil"]
    capsys.readouterr()
    assert main(["check", "--root", str(root), "--overlay", str(OVERLAY)]) == 0
    err = capsys.readouterr().err
    assert ("warning: site-overlay/ingredients/caprylic-capric-triglyceride.toml: synonyms: 'medium-chain triglycerides' names "
            "site record 'caprylic-capric-triglyceride' and shipped record 'medium-chain-triglycerides' "
            "(data/ingredients/medium-chain-triglycerides.toml): lookups by it find the site record only") in err
    client = create_app({"registry_root": str(root), "site_overlay": str(OVERLAY)}).test_client()
    found = client.get("/v1/ingredients?q=Caprylic%2FCapric").get_json()["ingredients"]
    assert [i["id"] for i in found] == ["caprylic-capric-triglyceride"]
    # Resolved by retiring the site record: the shared names go back to the shipped one.
    overlay = _copy_overlay(tmp_path)
    path = overlay / "ingredients" / "caprylic-capric-triglyceride.toml"
    path.write_text(path.read_text().replace('physical_state = "liquid"', 'physical_state = "liquid"\nretired = true\n'
                                             'retired_on = "2026-12-01"\nretired_reason = "the registry ships it"', 1))
    site = load_registry(root, overlay)
    assert site.collisions == () and site.names["medium-chain triglycerides"] == "medium-chain-triglycerides"
    assert [i.id for i in search(site, "caprylic/capric")] == ["medium-chain-triglycerides"]


def test_two_site_records_may_not_share_a_name(tmp_path):
    overlay = _copy_overlay(tmp_path)
    text = (overlay / "ingredients" / "caprylic-capric-triglyceride.toml").read_text()
    (overlay / "ingredients" / "house-oil.toml").write_text(
        text.replace('id = "caprylic-capric-triglyceride"', 'id = "house-oil"').replace('name = "Caprylic/capric triglyceride"', 'name = "House oil"'))
    with pytest.raises(RegistryError) as err:
        load_registry(overlay=overlay)
    assert err.value.field == "synonyms" and "'medium-chain triglycerides' already names ingredient 'caprylic-capric-triglyceride'" in err.value.message
