"""The worksheet's processing temperature and what set it, and the warning
for an ethoxylated surfactant whose cloud point lies below it, on the
worksheet and on the compounding record. The rule (the usual 70 degC, or
5 degC above the highest melting range's top, rounded up to a whole 5) is
common practice, no source; the expected temperatures are hand-computed
from the registry's melting ranges, which each test reads from the registry."""
from __future__ import annotations

import copy

from tests.api.test_compounding_record import DEMO, PATH as RECORD
from tests.api.test_worksheets import HYDROPHILIC_OINTMENT, SHEET, share


def _sheet(*ingredients, pair=("sorbitan-monooleate", "polysorbate-80")):
    return {"emulsion_type": "O/W", "batch": {"value": 200, "unit": "g"},
            "ingredients": [{"ingredient": "mineral-oil", "phase": "oil", "share": share(10)}, *ingredients,
                            {"ingredient": "purified-water", "phase": "aqueous", "qs": True}],
            "emulsifier": {"pair": [{"ingredient": i} for i in pair], "total_percent_w_w": 5}}


def _solid(ingredient, percent=2):
    return {"ingredient": ingredient, "phase": "oil", "share": share(percent)}


def _top_c(registry, ingredient):
    return registry.get(ingredient).span_without_doubtful("melting_range")[1]


def _cloud(body):
    return [w for w in body["warnings"] if w["code"] == "cloud_point_below_processing"]


def test_a_low_melting_solid_heats_to_the_usual_70(client, registry):
    # Cetyl alcohol's top lies below 65 degC, so the floor of 70 degC sets it (common practice, no source).
    assert _top_c(registry, "cetyl-alcohol") + 5 <= 70
    body = client.post(SHEET, json=_sheet(_solid("cetyl-alcohol"))).get_json()
    heat = body["result"]["processing_temperature"]
    assert body["result"]["processing_temperature_c"] == heat["temperature_c"] == 70.0
    assert heat["set_by"] == "usual_floor" and heat["heated"]
    (used,) = heat["melting_ranges"]
    assert used["name"] == "Cetyl alcohol" and used["top_c"] == _top_c(registry, "cetyl-alcohol") and "usp-nf" in used["basis"]
    assert any(v["ingredient"] == "cetyl-alcohol" and v["property"] == "melting_range" for v in body["values_used"])


def test_a_high_melting_wax_sets_the_temperature(client, registry):
    # Carnauba wax, melting range up to 86 degC in the registry: 91, rounded up to 95 (hand-computed).
    assert _top_c(registry, "carnauba-wax") == 86.0
    body = client.post(SHEET, json=_sheet(_solid("cetyl-alcohol"), _solid("carnauba-wax"))).get_json()
    heat = body["result"]["processing_temperature"]
    assert (heat["temperature_c"], heat["set_by"]) == (95.0, "melting_range")
    assert "Carnauba wax, melting range up to 86 °C" in heat["note"] and "rounded up to a whole 5 °C" in heat["note"]
    assert "common practice, no source" in heat["note"]


def test_the_published_ointment_is_heated_near_its_monograph_temperature(client):
    # Hydrophilic Ointment, USP 28-NF 23 p. 1415 (the public copy read, tests/api/test_worksheets.py): "warm to about
    # 75". The rule gives 70 (stearyl alcohol up to 60 degC, petrolatum up to 60): within the usual 70 to 75 degC.
    body = client.post(SHEET, json=HYDROPHILIC_OINTMENT).get_json()
    assert abs(body["result"]["processing_temperature_c"] - 75.0) <= 5.0


def test_nothing_to_melt_is_a_cold_process_and_no_cloud_point_is_flagged(client):
    body = client.post(SHEET, json=_sheet()).get_json()
    heat = body["result"]["processing_temperature"]
    assert body["result"]["processing_temperature_c"] is None and heat["set_by"] == "cold_process" and not heat["heated"]
    assert not _cloud(body)


def test_a_cloud_point_below_the_processing_temperature_is_warned_about(client, registry):
    # Polysorbate 80's cloud point in the registry (65 degC, recalled, unverified) against the 70 degC floor.
    cloud = registry.get("polysorbate-80").preferred("cloud_point")
    assert cloud.figure < 70
    body = client.post(SHEET, json=_sheet(_solid("cetyl-alcohol"))).get_json()
    (w,) = _cloud(body)
    assert w["subject"] == "Polysorbate 80"
    assert f"{cloud.figure:g} °C" in w["message"] and cloud.source_id in w["message"] and "unverified" in w["message"]
    assert "processing temperature of 70 °C" in w["message"]
    assert any(v["ingredient"] == "polysorbate-80" and v["property"] == "cloud_point" for v in body["values_used"])


def test_a_cloud_point_above_the_temperature_is_not_flagged(client, registry):
    # Polysorbate 20's cloud point in the registry lies above the 70 degC floor.
    assert registry.get("polysorbate-20").preferred("cloud_point").figure > 70
    body = client.post(SHEET, json=_sheet(_solid("cetyl-alcohol"), pair=("sorbitan-monolaurate", "polysorbate-20"))).get_json()
    assert not _cloud(body)


STRICT = {**_sheet({"ingredient": "isopropyl-myristate", "phase": "oil", "share": share(8)}, _solid("stearic-acid"),
                   {"ingredient": "glycerin", "phase": "aqueous", "share": share(5)}), "strict": True}


def test_strict_mode_leaves_an_unverified_melting_range_out_and_says_so(client, registry):
    # The README's strict worksheet: its HLBs and densities are read in their sources; stearic acid's melting range
    # is not, so strict mode does not let it set the temperature; it is warned about instead.
    stearic = registry.get("stearic-acid").preferred("melting_range")
    assert stearic.status == "unverified"
    r = client.post(SHEET, json=STRICT)
    assert r.status_code == 200, r.get_data(as_text=True)
    body = r.get_json()
    heat = body["result"]["processing_temperature"]
    assert (heat["temperature_c"], heat["set_by"], heat["melting_ranges"]) == (70.0, "usual_floor", [])
    assert [x["name"] for x in heat["unverified_left_out"]] == ["Stearic acid"]
    (w,) = [w for w in body["warnings"] if w["code"] == "melting_range_unverified_not_used"]
    assert w["subject"] == "Stearic acid" and f"{_top_c(registry, 'stearic-acid'):g} °C" in w["message"]
    assert not any(v["property"] in ("melting_range", "cloud_point") for v in body["values_used"])
    # The same worksheet out of strict mode uses the range.
    loose = client.post(SHEET, json={**STRICT, "strict": False}).get_json()["result"]["processing_temperature"]
    assert [x["name"] for x in loose["melting_ranges"]] == ["Stearic acid"] and not loose["unverified_left_out"]


def test_strict_mode_still_flags_an_unverified_cloud_point_and_says_it_is_unverified(client):
    body = client.post(SHEET, json=STRICT).get_json()
    (w,) = _cloud(body)
    assert w["subject"] == "Polysorbate 80" and "the cloud point is unverified" in w["message"]


def test_the_printed_worksheet_gives_the_processing_temperature(client):
    text = client.post(SHEET, json=_sheet(_solid("carnauba-wax")), headers={"Accept": "text/markdown"}).get_data(as_text=True)
    assert "## Processing temperature" in text and "Heat both phases to about 95 °C" in text
    plain = client.post(SHEET, json=_sheet(), headers={"Accept": "text/plain"}).get_data(as_text=True)
    assert "Processing temperature" in plain and "- Cold process: no component of the oil phase needs melting" in plain


def _record_with_polysorbate_80(drop=()):
    """The demo record (cetyl alcohol in the oil phase) with polysorbate 80 for polysorbate 60."""
    body = copy.deepcopy(DEMO)
    sheet = body["worksheet"]
    sheet["emulsifier"]["pair"] = [{"ingredient": "sorbitan-monostearate"}, {"ingredient": "polysorbate-80"}]
    sheet["ingredients"] = [i for i in sheet["ingredients"] if i.get("ingredient") not in drop]
    body["components"] = [{**c, "ingredient": "polysorbate-80"} if c.get("ingredient") == "polysorbate-60" else c
                          for c in body["components"] if c.get("ingredient") not in drop]
    return body


def test_the_record_warns_of_a_cloud_point_below_its_procedure_temperature(client):
    r = client.post(RECORD, json=_record_with_polysorbate_80())
    assert r.status_code == 200, r.get_data(as_text=True)
    body = r.get_json()
    proc = body["result"]["procedure"]
    (w,) = _cloud(body)
    assert proc["heated"] and f"processing temperature of {proc['oil_phase_c']:g} °C" in w["message"]
    assert w["subject"] == "Polysorbate 80"
    # The record's worksheet and its procedure agree on the temperature.
    assert body["result"]["worksheet"]["processing_temperature_c"] == proc["oil_phase_c"]


def test_a_record_of_a_cold_process_has_no_cloud_point_warning(client):
    # Sorbitan monostearate is a solid of the oil phase too: both solids out, a liquid pair in.
    body = _record_with_polysorbate_80(drop=("cetyl-alcohol",))
    body["worksheet"]["emulsifier"]["pair"][0] = {"ingredient": "sorbitan-monooleate"}
    body["components"] = [{**c, "ingredient": "sorbitan-monooleate"} if c.get("ingredient") == "sorbitan-monostearate" else c
                          for c in body["components"]]
    answer = client.post(RECORD, json=body)
    assert answer.status_code == 200, answer.get_data(as_text=True)
    answer = answer.get_json()
    assert not answer["result"]["procedure"]["heated"] and not _cloud(answer)


def test_a_congealing_minimum_is_named_as_such(client, registry):
    # Stearic acid's monograph states a congealing temperature of not lower than 54 degC (registry basis
    # congealing_range, conditions "a lower limit only"): the note must not call it a melting range's top.
    melting = registry.get("stearic-acid").preferred("melting_range")
    assert melting.basis == "congealing_range" and "lower limit" in melting.conditions
    body = client.post(SHEET, json=_sheet(_solid("stearic-acid"))).get_json()
    note = body["result"]["processing_temperature"]["note"]
    assert "Stearic acid, congealing temperature not lower than 54 °C (a lower limit only)" in note
    assert "melting range up to 54" not in note


def test_a_solid_the_record_adds_on_cooling_no_longer_sets_its_worksheet_s_temperature(client, registry):
    # Carnauba wax (melting range up to 86 degC: 95 degC on a worksheet, test above) marked heat-sensitive in
    # the record goes in on cooling, so the record's procedure heats to the usual 70 degC set by the other
    # solids (common practice, no source); the worksheet printed inside the record must say the same.
    assert _top_c(registry, "carnauba-wax") == 86.0
    body = copy.deepcopy(DEMO)
    body["worksheet"]["ingredients"].insert(0, _solid("carnauba-wax", 1))
    alone = client.post(SHEET, json=body["worksheet"]).get_json()["result"]["processing_temperature_c"]
    assert alone == 95.0
    body["components"].append({"ingredient": "carnauba-wax", "heat_sensitive": True, "lot": "W1", "supplier": "S (demo)"})
    r = client.post(RECORD, json=body)
    assert r.status_code == 200, r.get_data(as_text=True)
    result = r.get_json()["result"]
    assert result["procedure"]["oil_phase_c"] == 70.0
    sheet_heat = result["worksheet"]["processing_temperature"]
    assert result["worksheet"]["processing_temperature_c"] == sheet_heat["temperature_c"] == 70.0
    assert "Carnauba wax" not in [m["name"] for m in sheet_heat["melting_ranges"]]
