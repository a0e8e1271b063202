"""How far the shipped registry has been checked: a floor that may rise and
never fall, and a locator on every value said to be checked."""
from registry import load_registry
from registry.coverage import HLB_PROPERTIES, by_computation, hlb_coverage, read_in_source

# The share of HLB and required-HLB figures in use whose preferred value was
# read in its cited source with a locator. Raise it when values are checked;
# a change that lowers it fails here.
READ_IN_SOURCE_FLOOR = 0.21  # 19 of 89 on 2026-12-02


def test_coverage_does_not_fall():
    coverage = hlb_coverage(load_registry())
    assert coverage.share(coverage.read_in_source) >= READ_IN_SOURCE_FLOOR


def test_every_checked_value_has_a_locator():
    # A value read in its source says where (table, page, section); one checked
    # by a reference library (a calculated value, or a standard such as IAPWS-95
    # through CoolProp) names that check, which recomputes it in the tests.
    registry = load_registry()
    checked = [(ing.id, prop, r) for ing in registry.ingredients.values() for prop in ing.values for r in ing.active(prop)
               if r.status == "checked_against_source"]
    by_library = [(i, p, r) for i, p, r in checked if r.reviewed_by and r.reviewed_by.startswith("reference-library check")]
    assert [f"{i} {p}" for i, p, r in checked if (i, p, r) not in by_library and not r.locator] == []
    assert [f"{i} {p}" for i, p, r in by_library if r.kind == "calculated" and not r.method] == []


def test_coverage_counts_each_property_once():
    registry = load_registry()
    coverage = hlb_coverage(registry)
    expected = sum(1 for ing in registry.ingredients.values() if not ing.retired for p in HLB_PROPERTIES if ing.preferred(p))
    assert coverage.properties == expected
    assert len(coverage.read_in_source) + len(coverage.by_computation) + len(coverage.unchecked) == expected
    for label in coverage.read_in_source:
        iid, prop = label.split()
        assert read_in_source(registry.get(iid).preferred(prop))
    for label in coverage.by_computation:
        iid, prop = label.split()
        assert by_computation(registry.get(iid).preferred(prop))
