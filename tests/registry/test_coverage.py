"""How far the shipped registry has been checked: a floor that may rise and
never fall, and a locator on every value said to be checked."""
from registry import load_registry
from registry.coverage import HLB_PROPERTIES, by_computation, hlb_coverage, read_in_source

# The share of HLB and required-HLB figures in use whose preferred value was
# read in its cited source with a locator. Raise it when values are checked;
# a change that lowers it fails here.
READ_IN_SOURCE_FLOOR = 0.0


def test_coverage_does_not_fall():
    coverage = hlb_coverage(load_registry())
    assert coverage.share(coverage.read_in_source) >= READ_IN_SOURCE_FLOOR


def test_every_checked_value_has_a_locator():
    # A value read in its source says where (table, page, section); a calculated
    # one names its method and the check that recomputes it.
    registry = load_registry()
    checked = [(ing.id, prop, r) for ing in registry.ingredients.values() for prop in ing.values for r in ing.active(prop)
               if r.status == "checked_against_source"]
    assert [f"{i} {p}" for i, p, r in checked if r.kind != "calculated" and not r.locator] == []
    assert [f"{i} {p}" for i, p, r in checked if r.kind == "calculated" and not (r.method and r.reviewed_by)] == []


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
