"""The registry's data for the compounding record: melting ranges, how each
ingredient is handled ([processing]), Griffin's water-dispersibility bands
and USP <795>'s default beyond-use dates. The shipped data, the loader's
refusals, the review lock over the beyond-use dates, and what the steward's
commands show of them."""
from __future__ import annotations

import json
import re
import shutil
from pathlib import Path

import pytest

from registry import DEFAULT_ROOT, RegistryError, load_registry
from registry.errors import RegistryFaults
from registry.loader import SCHEMA_DIR
from registry.model import BUD_FORMS, BUD_STORAGE, MELTING_BASES, PHASES, PROPERTIES, UNITS
from tests.registry.helpers import edit, run

OVERLAY = Path(__file__).resolve().parents[1] / "fixtures" / "site-overlay"
FIELDS_MD = DEFAULT_ROOT.parent / "FIELDS.md"
BUD = "beyond_use_dates.toml"

# Solid or semisolid records without a melting range, each for a reason
# (registry/FIELDS.md, "Melting ranges"): hydrocolloids swell or dissolve and
# decompose rather than melt; soaps are dissolved in the water phase; for the
# others no figure was recalled from a source. A change here is on purpose.
SOLID_WITHOUT_MELTING_RANGE = {
    "acacia", "gelatin", "methylcellulose", "tragacanth",  # hydrocolloids
    "potassium-oleate", "sodium-oleate",  # soaps
    "lecithin", "polyoxyl-20-oleyl-ether", "polysorbate-61", "polysorbate-65", "shea-butter",  # no figure recalled
    "potassium-hydroxide", "sodium-borate", "sodium-hydroxide",  # alkalis, dissolved in the water phase
}
# Figures read in a stored copy of the pharmacopeial monograph (each value's
# note quotes the line): (id, source, basis, low, high).
READ_IN_MONOGRAPH = {
    ("cetostearyl-alcohol", "usp29-nf24", "melting_range", 48.0, 55.0),  # "Melting range 741: between 48 and 55."
    ("petrolatum", "usp32-nf27", "melting_range", 38.0, 60.0),  # "Melting range, Class III 741: between 38 and 60."
    ("white-wax", "usp-nf-copy-2017", "melting_range", 62.0, 65.0),  # "Melting range, Class II 741: between 62 and 65."
    ("propylene-glycol-monostearate", "usp32-nf27", "congealing_range", 45.0, 45.0),  # "Congealing temperature 651: not lower than 45."
    ("polyoxyl-40-hydrogenated-castor-oil", "usp32-nf27", "congealing_range", 16.0, 26.0),  # "Congealing temperature 651: between 16 and 26."
}
# Surfactants whose recorded phase (from the handbook's solubility, recalled)
# is not the one Griffin's band for their HLB gives by the registry's rule:
# HLB 8.6 and 9.7 are at the bands' edge. The recorded phase comes first.
PHASE_NOT_AS_BAND = {"sorbitan-monolaurate", "polyoxyl-4-lauryl-ether"}


def _refused(tree: Path, overlay: Path | None = None) -> list[RegistryError]:
    with pytest.raises(RegistryFaults) as err:
        load_registry(tree, overlay)
    return list(err.value.errors)


def _fields(errors) -> list[tuple[str, str]]:
    return [(e.file, e.field) for e in errors]


# Melting ranges

def test_melting_range_is_a_property_in_degc():
    assert "melting_range" in PROPERTIES and UNITS["melting_range"] == "degC"


def test_every_solid_or_semisolid_ingredient_has_a_melting_range_or_a_reason(registry):
    current = [i for i in registry.ingredients.values() if not i.retired]
    lacking = {i.id for i in current if i.physical_state != "liquid" and not i.active("melting_range")}
    assert lacking == SOLID_WITHOUT_MELTING_RANGE
    # And no liquid carries one: a liquid needs no heating to melt.
    assert [i.id for i in current if i.physical_state == "liquid" and i.active("melting_range")] == []


def test_every_melting_range_says_what_it_is(registry):
    for ing in registry.ingredients.values():
        for r in ing.active("melting_range"):
            assert r.unit == "degC" and r.basis in MELTING_BASES and r.low <= r.high, ing.id
            assert r.source_id in registry.sources and r.locator, ing.id
            # Recalled, never read: nothing may claim to have been checked.
            assert not (r.recalled_from_memory and r.is_verified), ing.id


def test_the_figures_read_in_their_monographs(registry):
    read = set()
    for ing in registry.ingredients.values():
        for r in ing.active("melting_range"):
            if r.status == "checked_against_source":
                read.add((ing.id, r.source_id, r.basis, r.low, r.high))
                # The quoted line, and the page it was read on.
                assert re.search(r'"[^"]*(between|not lower than) [0-9]', r.note) and "http" in r.note, ing.id
                assert r.reviewed_by and r.reviewed_on, ing.id
    assert read == READ_IN_MONOGRAPH


def test_a_pharmacopeial_minimum_says_it_is_one(registry):
    # USP 32-NF 27, Propylene Glycol Monostearate: "Congealing temperature 651: not lower than 45."
    for iid in ("propylene-glycol-monostearate", "stearic-acid"):
        record = registry.get(iid).preferred("melting_range")
        assert not record.is_range and "lower limit" in record.conditions


def test_a_melting_range_needs_its_unit_and_basis(tree):
    edit(tree / "ingredients" / "petrolatum.toml", 'unit = "degC"\nbasis = "melting_range"\n', 'unit = "degF"\n')
    errors = _refused(tree)
    assert ("data/ingredients/petrolatum.toml", "values/melting_range/0") in _fields(errors)
    assert ("data/ingredients/petrolatum.toml", "values/melting_range/0/unit") in _fields(errors)


def test_a_melting_range_runs_low_to_high(tree):
    edit(tree / "ingredients" / "cetyl-alcohol.toml", "low = 45.0\nhigh = 50.0", "low = 50.0\nhigh = 45.0")
    assert _fields(_refused(tree)) == [("data/ingredients/cetyl-alcohol.toml", "values/melting_range/0/low")]


# How each ingredient is handled: [processing]

def test_cyclomethicone_is_volatile_and_goes_in_the_oil_phase(registry):
    record = registry.get("cyclomethicone").processing
    assert record.volatile and record.dissolves_in == "oil" and not record.heat_sensitive
    assert record.source_id in registry.sources and record.recalled_from_memory and not record.is_verified


@pytest.mark.parametrize(("iid", "phase"), [
    # Handbook of Pharmaceutical Excipients, each monograph's Solubility (recalled, not read).
    ("polysorbate-80", "water"), ("sorbitan-monooleate", "oil"), ("sorbitan-monostearate", "oil"),
    ("glyceryl-monostearate", "oil"), ("sodium-lauryl-sulfate", "water"), ("poloxamer-188", "water"),
    ("polyoxyl-40-stearate", "water"), ("polyoxyl-2-stearyl-ether", "oil"), ("anhydrous-lanolin", "oil"),
])
def test_the_phase_each_surfactant_goes_in(registry, iid, phase):
    assert registry.get(iid).processing.dissolves_in == phase


def test_every_processing_record_keeps_the_provenance_rules(registry):
    records = [(i.id, i.processing) for i in registry.ingredients.values() if i.processing]
    assert len(records) >= 30
    for iid, record in records:
        assert record.dissolves_in in PHASES + (None,), iid
        assert record.source_id in registry.sources and record.locator, iid
        assert not (record.recalled_from_memory and record.is_verified), iid


def test_the_recorded_phase_agrees_with_griffins_band_but_for_two(registry):
    bands = registry.water_dispersibility
    differ = {i.id for i in registry.ingredients.values() if "surfactant" in i.roles and i.processing
              and i.processing.dissolves_in and i.preferred("hlb")
              and bands.band_for(i.preferred("hlb").figure).dissolves_in != i.processing.dissolves_in}
    assert differ == PHASE_NOT_AS_BAND


PROCESSING = '\n[processing]\ndissolves_in = "water"\nsource = "hpe-6"\nstatus = "unverified"\nrecalled_from_memory = true\n'


def test_processing_needs_a_known_source_and_a_fact(tree):
    olive = tree / "ingredients" / "olive-oil.toml"
    olive.write_text(olive.read_text() + PROCESSING.replace('"hpe-6"', '"nowhere"'))
    glycerin = tree / "ingredients" / "glycerin.toml"
    glycerin.write_text(glycerin.read_text() + PROCESSING.replace('dissolves_in = "water"\n', ""))
    errors = _refused(tree)
    assert _fields(errors) == [("data/ingredients/glycerin.toml", "processing"), ("data/ingredients/olive-oil.toml", "processing/source")]
    assert "unknown source 'nowhere'" in errors[1].message


def test_processing_obeys_the_value_rules_for_status(tree):
    olive = tree / "ingredients" / "olive-oil.toml"
    olive.write_text(olive.read_text() + PROCESSING.replace('status = "unverified"', 'status = "checked_against_source"\n'
                                                            'reviewed_by = "steward"\nreviewed_on = "2026-12-02"'))
    assert _fields(_refused(tree)) == [("data/ingredients/olive-oil.toml", "processing/status")]


def test_processing_refuses_an_unknown_phase(tree):
    olive = tree / "ingredients" / "olive-oil.toml"
    olive.write_text(olive.read_text() + PROCESSING.replace('"water"', '"alcohol"'))
    assert _fields(_refused(tree)) == [("data/ingredients/olive-oil.toml", "processing/dissolves_in")]


def test_an_overlay_cannot_change_a_shipped_ingredients_processing(tmp_path):
    overlay = tmp_path / "overlay"
    shutil.copytree(OVERLAY, overlay)
    path = overlay / "ingredients" / "sorbitan-monooleate.toml"
    path.write_text(path.read_text() + PROCESSING)
    (error,) = _refused(DEFAULT_ROOT, overlay)
    assert error.file.endswith("ingredients/sorbitan-monooleate.toml") and error.field == "processing"


# Griffin's water-dispersibility bands

@pytest.mark.parametrize(("hlb", "description", "phase"), [
    # Griffin (1949), as recalled (unverified); the phase is common practice, no source.
    (0.0, "no dispersibility in water", "oil"),  # below the lowest band: in it
    (2.0, "no dispersibility in water", "oil"),
    (3.5, "poor dispersion", "oil"),  # in 1-4 and 3-6: the higher band
    (4.3, "poor dispersion", "oil"),  # sorbitan monooleate
    (7.0, "milky dispersion after vigorous agitation", "oil"),
    (8.0, "stable milky dispersion (the upper end almost translucent)", "water"),  # a shared end: the higher band
    (11.0, "translucent to clear dispersion", "water"),
    (15.0, "clear solution", "water"),  # polysorbate 80
    (40.0, "clear solution", "water"),  # sodium lauryl sulfate: the top band is open
])
def test_band_for(registry, hlb, description, phase):
    band = registry.water_dispersibility.band_for(hlb)
    assert (band.description, band.dissolves_in) == (description, phase)


def test_the_bands_as_recalled(registry):
    table = registry.water_dispersibility
    assert [(b.low, b.high) for b in table.bands] == [(1, 4), (3, 6), (6, 8), (8, 10), (10, 13), (13, None)]
    assert table.source_id == "griffin-1949" and table.status == "unverified" and table.recalled_from_memory


def test_band_for_refuses_a_negative_hlb(registry):
    with pytest.raises(ValueError, match="not negative"):
        registry.water_dispersibility.band_for(-1.0)


def test_bands_without_a_gap_and_in_order(tree):
    edit(tree / "registry.toml", "low = 6.0\nhigh = 8.0", "low = 7.0\nhigh = 8.0")
    edit(tree / "registry.toml", "low = 13.0\n", "low = 10.0\n")
    errors = _refused(tree)
    assert _fields(errors) == [("data/registry.toml", "water_dispersibility/bands/2/low"),
                               ("data/registry.toml", "water_dispersibility/bands/5/low")]
    assert errors[0].message == "leaves a gap after the band before, which ends at 6"
    assert errors[1].message.startswith("bands run from the lowest HLB up")


def test_only_the_top_band_is_open(tree):
    edit(tree / "registry.toml", "low = 1.0\nhigh = 4.0", "low = 1.0")
    assert _fields(_refused(tree)) == [("data/registry.toml", "water_dispersibility/bands/0/high")]


# USP <795> beyond-use dates

@pytest.mark.parametrize(("water", "preserved", "form", "expected"), [
    # USP <795> (2023) default BUDs, section 10.3, written from memory (unverified: the chapter itself was not read).
    # Secondary pages quoting the chapter agree on the days: 14 days refrigerated and 35 days for non-preserved and
    # preserved aqueous forms (aw >= 0.6) (pccarx.com/Blog/usp-chapter-795-related-changes-to-formulations, 2023);
    # 90 days for nonaqueous oral liquids and 180 for other nonaqueous forms (restorehealthconsulting.com, on the
    # 2021 proposal, "the BUD default limits were not changed"). The storage of the 35/90/180-day rows is from memory.
    ("aqueous", False, None, ("aqueous-nonpreserved", 14, ("refrigerator",))),
    ("aqueous", True, "other", ("aqueous-preserved", 35, ("controlled_room_temperature", "refrigerator"))),
    ("nonaqueous", None, "oral_liquid", ("nonaqueous-oral-liquid", 90, ("controlled_room_temperature", "refrigerator"))),
    ("nonaqueous", None, "other", ("nonaqueous-other", 180, ("controlled_room_temperature", "refrigerator"))),
    ("nonaqueous", True, "solid", ("nonaqueous-other", 180, ("controlled_room_temperature", "refrigerator"))),
])
def test_the_category_of_a_preparation(registry, water, preserved, form, expected):
    category = registry.beyond_use_dates.category(water, preserved, form)
    assert (category.id, category.days, category.storage) == expected
    assert category.source_id == "usp-795-2023" and category.status == "unverified" and category.recalled_from_memory


@pytest.mark.parametrize(("water", "preserved", "form"), [
    ("aqueous", None, None),  # preserved or not decides it
    ("nonaqueous", None, None),  # the form decides it
])
def test_no_category_when_the_facts_do_not_decide(registry, water, preserved, form):
    assert registry.beyond_use_dates.category(water, preserved, form) is None


def test_the_rules_over_the_table(registry):
    table = registry.beyond_use_dates
    assert set(table.rules) == {"aw_threshold", "component_expiry", "count_from"}
    # USP <795> (2023), from memory: aqueous at aw >= 0.6.
    assert table.aw_threshold == 0.6
    assert table.water_class(0.6) == "aqueous" and table.water_class(0.59) == "nonaqueous"
    assert "earliest expiration date" in table.rules["component_expiry"].text
    assert "compounding of the preparation begins" in table.rules["count_from"].text
    for rule in table.rules.values():
        assert rule.provenance.source_id == "usp-795-2023" and rule.provenance.status == "unverified"
    assert (table.source_id, table.status, table.recalled_from_memory) == ("usp-795-2023", "unverified", True) and table.locator


def test_every_category_uses_the_vocabulary(registry):
    for c in registry.beyond_use_dates.categories:
        assert c.form in BUD_FORMS + (None,) and set(c.storage) <= set(BUD_STORAGE) and c.days > 0


def test_two_categories_one_preparation_could_fit_are_refused(tree):
    text = (tree / BUD).read_text()
    (tree / BUD).write_text(text.replace('preserved = true\n', ''))
    errors = _refused(tree)
    assert _fields(errors) == [(f"data/{BUD}", "categories/1")] and "'aqueous-nonpreserved'" in errors[0].message


def test_a_category_id_used_twice_is_refused(tree):
    edit(tree / BUD, 'id = "aqueous-preserved"', 'id = "aqueous-nonpreserved"')
    assert (f"data/{BUD}", "categories/1/id") in _fields(_refused(tree))


def test_a_bad_storage_and_an_unknown_source_are_named_at_once(tree):
    edit(tree / BUD, 'storage = ["refrigerator"]', 'storage = ["freezer"]')
    edit(tree / "ingredients" / "olive-oil.toml", 'source = "martin"', 'source = "nowhere"')
    assert _fields(_refused(tree)) == [(f"data/{BUD}", "categories/0/storage/0"),
                                       ("data/ingredients/olive-oil.toml", "values/required_hlb_ow/0/source")]


def test_a_rule_needs_a_known_source(tree):
    edit(tree / BUD, 'value = 0.6\ntext = "A preparation whose water activity (aw) is 0.6 or more is aqueous; one below 0.6 is nonaqueous. '
         'Emulsions, creams, gels, solutions and suspensions are aqueous."\nsource = "usp-795-2023"',
         'value = 0.6\ntext = "aqueous at 0.6"\nsource = "nowhere"')
    assert _fields(_refused(tree)) == [(f"data/{BUD}", "rules/aw_threshold/source")]


def test_the_tree_needs_its_beyond_use_dates(tree):
    (tree / BUD).unlink()
    (error,) = _refused(tree)
    assert (error.file, error.message) == (f"data/{BUD}", "missing from the registry tree")


def test_the_beyond_use_dates_count_in_the_digest(tree):
    before = load_registry(tree).digest
    (tree / BUD).write_text((tree / BUD).read_text() + "\n# a comment changes the content\n")
    assert load_registry(tree).digest != before


# The review lock holds a reviewed beyond-use date

REVIEWED = 'status = "checked_against_source"\nreviewed_by = "steward A"\nreviewed_on = "2027-01-15"'
FIRST_CATEGORY = 'days = 14\nstorage = ["refrigerator"]\nsource = "usp-795-2023"\nlocator = "section 10.3 (establishing a BUD), table of maximum BUDs"\n' \
                 'status = "unverified"\nrecalled_from_memory = true'


def test_a_reviewed_category_is_held_to_the_lock(capsys, tree):
    edit(tree / BUD, FIRST_CATEGORY, FIRST_CATEGORY.replace('status = "unverified"\nrecalled_from_memory = true', REVIEWED))
    code, _, err = run(capsys, "check", "--root", tree)
    assert code == 1 and f"data/{BUD}: categories/0/status: checked_against_source but not in reviewed.lock.toml" in err
    code, out, _ = run(capsys, "lock", "--root", tree)
    assert code == 0 and out.startswith("wrote:")
    assert 'property = "bud_category"\ngroup = "aqueous-nonpreserved"' in (tree / "reviewed.lock.toml").read_text()
    edit(tree / BUD, "days = 14", "days = 28")
    code, _, err = run(capsys, "check", "--root", tree)
    assert code == 1 and f"data/{BUD}: categories/0/value: figure changed without a renewed review (value 14 -> 28" in err
    code, _, err = run(capsys, "lock", "--root", tree)
    assert code == 1 and "was not written" in err


# What the steward's commands show

def test_show_gives_the_processing(capsys):
    code, out, _ = run(capsys, "show", "cyclomethicone")
    assert code == 0
    assert out.split("processing:\n", 1)[1].startswith("  dissolved or dispersed in the oil phase; volatile  [recalled from memory]\n")
    _, out, _ = run(capsys, "show", "petrolatum")
    assert "melting_range:\n  38 to 60 degC  [preferred]" in out and "basis: melting_range" in out


def test_show_the_tables(capsys, registry):
    code, out, _ = run(capsys, "show", "--table", "beyond-use-dates")
    assert code == 0 and "  aqueous-nonpreserved: 14 days, refrigerator  (aqueous, not preserved)" in out
    assert "  aw_threshold: A preparation whose water activity" in out
    code, out, _ = run(capsys, "show", "--table", "water-dispersibility")
    assert code == 0 and "  13 and over: clear solution; dissolved in the water phase" in out
    code, out, _ = run(capsys, "show", "--table", "beyond-use-dates", "--json")
    data = json.loads(out)["beyond_use_dates"]
    assert data["aw_threshold"] == 0.6 and [c["days"] for c in data["categories"]] == [14, 35, 90, 180]
    assert data["rules"]["count_from"]["provenance"]["source"]["id"] == "usp-795-2023"
    code, out, _ = run(capsys, "show", "cyclomethicone", "--json")
    assert json.loads(out)["ingredient"]["processing"]["volatile"] is True


def test_show_needs_an_id_or_a_table(capsys):
    code, _, err = run(capsys, "show")
    assert code == 2 and "an ingredient id or --table" in err


def test_report_counts_the_new_data(capsys, registry):
    code, out, _ = run(capsys, "report", "--json")
    data = json.loads(out)
    assert code == 0 and set(data["solid_lacking_melting_range"]) == SOLID_WITHOUT_MELTING_RANGE
    assert data["tables"]["beyond_use_dates"] == {"entries": 8, "categories": 4, "rules": 3, "by_status": {"unverified": 8},
                                                  "recalled_from_memory": 8}
    assert data["tables"]["water_dispersibility"]["entries"] == 6
    assert data["processing"]["volatile"] == ["cyclomethicone"]
    assert data["values"] == sum(data["by_status"].values())
    _, out, _ = run(capsys, "report")
    assert "table beyond_use_dates: 8 entries, by status: unverified 8; recalled from memory 8" in out
    assert f"solid or semisolid lacking a melting range ({len(SOLID_WITHOUT_MELTING_RANGE)}): acacia, gelatin" in out


def test_diff_shows_processing_and_table_changes(capsys, tree):
    edit(tree / "ingredients" / "cyclomethicone.toml", "volatile = true", "volatile = false")
    edit(tree / BUD, "days = 35", "days = 30")
    _, out, _ = run(capsys, "diff", DEFAULT_ROOT, tree)
    assert "~ cyclomethicone processing: volatile True -> False" in out
    assert "~ beyond-use-date category aqueous-preserved: changed" in out


# Schemas, model and FIELDS.md agree

def test_the_vocabularies_are_the_same_in_schemas_and_model():
    ingredient = json.loads((SCHEMA_DIR / "ingredient.schema.json").read_text(encoding="utf-8"))["$defs"]
    assert tuple(ingredient["melting_value"]["properties"]["basis"]["enum"]) == MELTING_BASES
    assert tuple(ingredient["processing"]["properties"]["dissolves_in"]["enum"]) == PHASES
    bud = json.loads((SCHEMA_DIR / "beyond_use_dates.schema.json").read_text(encoding="utf-8"))
    category = bud["properties"]["categories"]["items"]["properties"]
    assert tuple(category["form"]["enum"]) == BUD_FORMS and tuple(category["storage"]["items"]["enum"]) == BUD_STORAGE


def test_fields_md_documents_the_new_fields():
    text = FIELDS_MD.read_text(encoding="utf-8")
    section = text.split("## How an ingredient is handled: `[processing]`\n", 1)[1].split("\n## ", 1)[0]
    for name in ("dissolves_in", "volatile", "heat_sensitive"):
        assert f"| `{name}` |" in section
    bud = text.split("## Beyond-use dates: `beyond_use_dates.toml`\n", 1)[1].split("\n## ", 1)[0]
    for name in ("[rules.aw_threshold]", "[rules.component_expiry]", "[rules.count_from]", "`water`", "`preserved`", "`form`",
                 "`days`", "`storage`"):
        assert name in bud
    assert "`melting_range`" in text and "`degC`" in text
