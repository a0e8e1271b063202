"""A row of a batch (a worksheet's, or a test emulsion's): its density and
how to measure it with the equipment at hand."""
from __future__ import annotations

from dataclasses import dataclass

from registry import Registry
from service.core.measure import Check, choose_graduate, round_to, weighing_checks
from service.resolve import Resolved, density_value


@dataclass
class Row:
    item: Resolved
    phase: str
    role: str  # ingredient | emulsifier | qs
    percent: float | None = None
    path: tuple = ()



def row_density(row: Row, registry: Registry, values_used: list, strict: bool = False) -> float | None:
    """The row's density, recorded in values_used. In strict mode an
    unverified one is not used for reporting volumes (the row is weighed)."""
    found = density_value(row.item, registry)
    if found is None or (strict and found[1]["origin"] == "registry" and found[1]["status"] == "unverified"):
        return None
    if not any(v["pointer"] == found[1]["pointer"] and v["property"] == "density" for v in values_used):
        values_used.append(found[1])
    return found[0]



def measure_row(row: Row, mass_g: float, density: float | None, balance, graduates) -> tuple[dict, list[Check], float | None]:
    state = row.item.physical_state
    volume = mass_g / density if density else None
    weigh = {"how": "weigh", "graduate_ml": None, "volume_ml_rounded": None}
    solid = state in ("solid", "semisolid")
    if solid:
        return {**weigh, "why": f"a {state}: solids are weighed, never measured by volume"}, weighing_checks(mass_g, balance, True), volume
    if row.role == "qs":
        return {**weigh, "why": "q.s. vehicle: add to the batch mass in a tared vessel"}, [], volume
    if state is None:
        return {**weigh, "why": "physical state unknown: weigh it"}, weighing_checks(mass_g, balance, False), volume
    oily = row.phase in ("oil", "emulsifier") or row.item.record is not None and row.item.record.viscous
    if oily:
        return {**weigh, "why": "an oily or viscous liquid: measured by weight"}, weighing_checks(mass_g, balance, False), volume
    if volume is None:
        return {**weigh, "why": "no density known, so it cannot be measured by volume"}, weighing_checks(mass_g, balance, False), volume
    graduate, checks = choose_graduate(volume, graduates)
    if graduate is not None:
        return ({"how": "graduate", "graduate_ml": graduate.capacity_ml, "volume_ml_rounded": round_to(volume, graduate.subdivision_ml),
                 "why": f"a liquid measured in the {graduate.capacity_ml:g} mL graduate"}, checks, volume)
    if volume < 1.0:
        return ({"how": "pipette_or_syringe", "graduate_ml": None, "volume_ml_rounded": round(volume, 3),
                 "why": "under 1 mL: a pipette or a syringe"}, checks, volume)
    return {**weigh, "why": "no graduate suits the volume: weigh it"}, checks + weighing_checks(mass_g, balance, False), volume
