"""A row of a batch (a worksheet's, or a test emulsion's): its density and
how to measure it with the equipment at hand."""
from __future__ import annotations

from dataclasses import dataclass

from registry import Registry
from service.core.aliquot import aliquot_plan
from service.core.batch import BatchRow
from service.core.measure import Balance, Check, choose_graduate, rounding_check, round_to, weighing_checks
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


def _weighed(b: BatchRow, balance: Balance, solid: bool) -> list[Check]:
    """Checks of a weighed amount: on the unrounded mass, then the rounding."""
    return weighing_checks(b.mass_g_unrounded, balance, solid) + [
        rounding_check(b.mass_g_unrounded, b.mass_g, balance.acceptable_error_percent, "g", "weighed as")]


def aliquot_out(mass_g: float, balance: Balance, solid: bool) -> dict:
    """The aliquot method for an amount below the minimum weighable quantity,
    as a row reports it."""
    plan = aliquot_plan(mass_g, balance.minimum_weighable_g, balance.readability_g)
    # In an emulsion the diluent ends up in the batch: part of the vehicle the
    # substance goes into is the usual choice (a liquid aliquot, weighed).
    diluent = ("a diluent compatible with the preparation: part of the vehicle or a solvent it dissolves in (a liquid aliquot), "
               "or an inert powder such as lactose by trituration where a solid suits" if solid
               else "a miscible solvent, or part of the vehicle it goes into")
    return {
        "factor": plan.factor, "substance_g": plan.substance_g, "diluent_g": plan.diluent_g, "mixture_g": plan.mixture_g,
        "aliquot_g": plan.aliquot_g, "delivered_g": plan.delivered_g, "error_percent": plan.error_percent,
        "diluent_in_aliquot_g": plan.diluent_in_aliquot_g, "diluent": diluent,
        "steps": [f"weigh {plan.substance_g:g} g of the substance ({plan.factor} x the {mass_g:.6g} g wanted)",
                  f"add {plan.diluent_g:g} g of {diluent}, and mix well to {plan.mixture_g:g} g",
                  f"weigh {plan.aliquot_g:g} g of the mixture: it holds {plan.delivered_g:.6g} g of the substance "
                  f"and {plan.diluent_in_aliquot_g:.6g} g of diluent, which goes into the batch with it"],
    }


def measure_row(row: Row, b: BatchRow, density: float | None, balance: Balance, graduates) -> tuple[dict, list[Check], float | None]:
    """How the row is measured, its checks, and its volume in mL (None
    without a density). Checks run on the unrounded amount."""
    state = row.item.physical_state
    volume = b.mass_g_unrounded / density if density else None
    weigh = {"how": "weigh", "graduate_ml": None, "volume_ml_rounded": None, "aliquot": None}
    solid = state in ("solid", "semisolid")
    if row.role == "qs":
        # Made up to the batch mass in a tared vessel: the balance must hold the batch (a global check).
        return {**weigh, "why": "q.s. vehicle: add to the batch mass in a tared vessel"}, [], volume
    if solid:
        measure, checks = {**weigh, "why": f"a {state}: solids are weighed, never measured by volume"}, _weighed(b, balance, True)
    elif state is None:
        measure, checks = {**weigh, "why": "physical state unknown: weigh it"}, _weighed(b, balance, False)
    elif row.phase in ("oil", "emulsifier") or row.item.record is not None and row.item.record.viscous:
        measure, checks = {**weigh, "why": "an oily or viscous liquid: measured by weight"}, _weighed(b, balance, False)
    elif volume is None:
        measure, checks = {**weigh, "why": "no density known, so it cannot be measured by volume"}, _weighed(b, balance, False)
    else:
        graduate, checks = choose_graduate(volume, graduates)
        if graduate is not None:
            rounded = round_to(volume, graduate.subdivision_ml)
            checks = checks + [rounding_check(volume, rounded, balance.acceptable_error_percent, "mL", "read as")]
            return ({"how": "graduate", "graduate_ml": graduate.capacity_ml, "volume_ml_rounded": rounded, "aliquot": None,
                     "why": f"a liquid measured in the {graduate.capacity_ml:g} mL graduate"}, checks, volume)
        if volume < 1.0:
            return ({"how": "pipette_or_syringe", "graduate_ml": None, "volume_ml_rounded": round(volume, 3), "aliquot": None,
                     "why": "under 1 mL: a pipette or a syringe"}, checks, volume)
        measure, checks = {**weigh, "why": "no graduate suits the volume: weigh it"}, checks + _weighed(b, balance, False)
    if b.mass_g_unrounded < balance.minimum_weighable_g:
        measure["aliquot"] = aliquot_out(b.mass_g_unrounded, balance, solid)
    return measure, checks, volume
