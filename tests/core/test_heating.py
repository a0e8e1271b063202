"""The one heating rule and the cloud-point comparison. The rule itself, the
usual 70 degC and 5 degC above the highest melting range's top rounded up to
a whole 5 degC, is common practice, no source; every figure below is a hand
case of that rule, hand-computed."""
from __future__ import annotations

import pytest

from service.core.cloud_point import CloudPoint, below_processing
from service.core.procedure import ProcedureRow, heating, left_out_findings


def _solid(label, top=None, phase="oil", left_out_top=None, late=None):
    return ProcedureRow(label, phase, "ingredient", "solid", 10.0, melting_top_c=top, melting_basis="src" if top else None,
                        melting_left_out_top_c=left_out_top, melting_left_out_basis="src2, unverified" if left_out_top else None,
                        late=late)


LIQUID = ProcedureRow("Mineral oil", "oil", "ingredient", "liquid", 10.0)
WATER = ProcedureRow("Water", "aqueous", "qs", "liquid", 80.0, is_water=True)


@pytest.mark.parametrize("tops, temperature, set_by", [
    ([49.0], 70.0, "usual_floor"),             # 54 is below the usual 70 (common practice, no source)
    ([65.0], 70.0, "usual_floor"),             # exactly 70: the floor and the melting range agree; the floor is named
    ([66.0], 75.0, "melting_range"),           # 71 rounded up to a whole 5 (hand-computed)
    ([49.0, 86.0], 95.0, "melting_range"),     # the highest top sets it: 91 rounded up to 95 (hand-computed)
])
def test_the_melting_ranges_or_the_usual_floor_set_the_temperature(tops, temperature, set_by):
    h = heating([LIQUID] + [_solid(f"Solid {i}", t) for i, t in enumerate(tops)] + [WATER])
    assert (h.temperature_c, h.heated, h.set_by) == (temperature, True, set_by)
    assert h.highest.melting_top_c == max(tops) and len(h.used) == len(tops)


def test_nothing_to_melt_is_a_cold_process():
    h = heating([LIQUID, WATER])
    assert (h.temperature_c, h.heated, h.set_by, h.highest) == (None, False, "cold_process", None)


def test_a_solid_added_late_does_not_set_the_temperature():
    # A heat-sensitive solid goes in on cooling: it is not melted with the phases.
    h = heating([LIQUID, _solid("Heat-sensitive solid", 86.0, late="heat-sensitive"), WATER])
    assert not h.heated and h.temperature_c is None


def test_a_solid_without_a_melting_range_heats_at_the_floor_and_is_listed():
    h = heating([_solid("Wax (inline)"), WATER])
    assert (h.temperature_c, h.set_by) == (70.0, "usual_floor")
    assert [r.label for r in h.unknown] == ["Wax (inline)"] and not h.left_out


def test_a_melting_range_left_out_does_not_raise_the_temperature_and_is_said():
    # Strict mode: the unverified 86 degC top is left out, so the floor sets the
    # temperature, and the finding names what it alone would have set (91 -> 95).
    h = heating([_solid("Cetyl alcohol", 49.0), _solid("Carnauba wax", left_out_top=86.0), WATER])
    assert (h.temperature_c, h.set_by) == (70.0, "usual_floor")
    assert [r.label for r in h.left_out] == ["Carnauba wax"] and not h.unknown
    (finding,) = left_out_findings(h)
    assert finding.code == "melting_range_unverified_not_used" and finding.subject == "Carnauba wax"
    assert "86 °C" in finding.message and "95 °C" in finding.message and "unverified" in finding.message


# Cloud points: hand cases against a processing temperature.
@pytest.mark.parametrize("cloud_c, processing_c, flagged", [
    (65.0, 70.0, True),      # below
    (76.0, 70.0, False),     # above
    (70.0, 70.0, False),     # at the temperature: not below
    (76.0, 95.0, True),
    (65.0, None, False),     # a cold process heats nothing
])
def test_a_cloud_point_below_the_processing_temperature_is_flagged(cloud_c, processing_c, flagged):
    found = below_processing([CloudPoint("Surfactant A", cloud_c, "src, checked_against_source", False)], processing_c)
    assert bool(found) == flagged
    if flagged:
        (f,) = found
        assert f.code == "cloud_point_below_processing" and f.subject == "Surfactant A"
        assert f"{cloud_c:g} °C (src, checked_against_source)" in f.message and f"{processing_c:g} °C" in f.message
        assert "unverified" not in f.message


def test_an_unverified_cloud_point_is_flagged_and_said_unverified():
    (f,) = below_processing([CloudPoint("Surfactant B", 60.0, "src, unverified", True)], 70.0)
    assert "the cloud point is unverified" in f.message


def test_a_solid_of_the_aqueous_phase_is_dissolved_not_melted():
    # Sodium lauryl sulfate melts near 205 degC (registry, hpe-6) but dissolves in the water: only the oil phase
    # is melted (registry/FIELDS.md, "Melting ranges"; common practice, no source).
    sls = ProcedureRow("Sodium lauryl sulfate", "emulsifier", "emulsifier", "solid", 10.0, dissolves_in="water",
                       dissolves_in_basis="b", melting_top_c=207.0, melting_basis="src")
    h = heating([_solid("Stearyl alcohol", 60.0), sls, _solid("Methylparaben", 131.0, phase="aqueous"), WATER])
    assert (h.temperature_c, h.set_by, [r.label for r in h.used]) == (70.0, "usual_floor", ["Stearyl alcohol"])
