"""A value used, as a type (service/usecases/provenance.py): serialised to
exactly the `values_used` item answers have always carried. Hand-written
expectations."""
from __future__ import annotations

import pytest

from service.usecases.provenance import Citation, ValueUsed, ValuesUsed


def caller_density():
    return ValueUsed.from_caller(ingredient=None, name="my oil", path=("ingredients", 0), property="density", figure=0.91, unit="g/mL")


def test_a_caller_value_as_answers_show_it():
    assert caller_density().as_dict() == {
        "ingredient": None, "name": "my oil", "property": "density", "pointer": "#/ingredients/0", "figure": 0.91,
        "low": 0.91, "high": 0.91, "unit": "g/mL", "origin": "caller", "source": None, "locator": None, "kind": None,
        "status": "caller_supplied", "local": False, "recalled_from_memory": False, "sources_disagree": False,
        "note": "Supplied in the request; its provenance is the caller's.", "range_with_doubtful": None,
    }
    assert caller_density().label == "inline 'my oil' density"


def test_round_trip_through_the_answer():
    value = ValueUsed("polysorbate-80", "polysorbate 80", "hlb", "#/components/0", 15.0, 15.0, 15.0, None, "registry",
                      Citation("src", "A citation", "handbook"), "Table 1", "published", "unverified", False, False, True,
                      None, (14.9, 15.0))
    assert value.as_dict()["range_with_doubtful"] == {"low": 14.9, "high": 15.0}
    assert ValueUsed.from_dict(value.as_dict()) == value
    assert value.unverified_registry_value


def test_a_registry_value_needs_its_source():
    with pytest.raises(ValueError):
        ValueUsed("x", "x", "hlb", "#/", 1.0, 1.0, 1.0, None, "registry", None, None, None, "unverified", False, False, False, None)
    with pytest.raises(ValueError):
        ValueUsed("x", "x", "hlb", "#/", 1.0, 1.0, 1.0, None, "elsewhere", None, None, None, "unverified", False, False, False, None)


def test_the_collector_drops_repeats_by_key_only():
    values = ValuesUsed()
    by_place = lambda v: (v.pointer, v.property)  # noqa: E731
    values.add(caller_density(), key=by_place)
    values.add(caller_density(), key=by_place)
    assert len(values) == 1
    values.add(caller_density())  # no key: every use is recorded
    assert len(values) == 2 and values.as_dicts()[0] == caller_density().as_dict()
