"""A row of a batch (a worksheet's, or a test emulsion's): its density and
how to measure it with the equipment at hand.

The balance and graduates a worksheet is checked against, from the
request or from the defaults."""
from __future__ import annotations

from dataclasses import dataclass, field

from registry import Registry
from service.core.aliquot import aliquot_plan
from service.core.batch import BatchRow
from service.core.measure import Balance, Check, Graduate, choose_graduate, rounding_check, round_to, weighing_checks
from service.usecases.resolution import BOUND_SLACK, DEFAULT_ERROR_PERCENT, DEFAULT_SENSITIVITY_G, Faults, Resolved, density_value, invalid
from service.units import to_canonical
from service.usecases.provenance import ValuesUsed


@dataclass
class Row:
    item: Resolved
    phase: str
    role: str  # ingredient | emulsifier | qs
    percent: float | None = None
    path: tuple = ()
    # density_value of the item, looked up once: a worksheet asks for a
    # row's density in several passes (volume batch, measures, dispersed
    # phase). The item and the registry do not change under a row.
    looked_up_density: object = field(default=None, repr=False, compare=False)


_NOT_LOOKED_UP = None


def found_density(row: Row, registry: Registry):
    """density_value(row.item, registry), once a row."""
    if row.looked_up_density is _NOT_LOOKED_UP:
        row.looked_up_density = (density_value(row.item, registry),)
    return row.looked_up_density[0]


def row_density(row: Row, registry: Registry, values_used: ValuesUsed, strict: bool = False) -> float | None:
    """The row's density, recorded in values_used. In strict mode an
    unverified one is not used for reporting volumes (the row is weighed)."""
    found = found_density(row, registry)
    if found is None or (strict and found[1].unverified_registry_value):
        return None
    values_used.add(found[1], key=lambda v: (v.pointer, v.property))
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

# A Class A balance commonly reads to 10 mg (common practice, no source).
DEFAULT_READABILITY_G = 0.01
# A common set of cylindrical graduates (common practice, no source).
DEFAULT_GRADUATES_ML = (10.0, 25.0, 50.0, 100.0, 250.0, 500.0, 1000.0)
# Class A (Class III) torsion prescription balances are commonly sold for
# loads up to 120 g (common practice, no authoritative source found). NBS
# Handbook 44 as quoted in USP 29 <1176> ("Capacity") assumes only 15.5 g
# where nothing else is known: the README's methods table says both, and
# every answer lists this default among the assumptions.
DEFAULT_CAPACITY_G = 120.0
# Graduates are commonly divided into about 50 parts (common practice, no source).
DEFAULT_SUBDIVISIONS = 50.0


# Plausible equipment, in g and mL: outside these a figure is a slip of unit.
READABILITY_G = (1e-6, 100.0)
SENSITIVITY_G = (1e-6, 100.0)
CAPACITY_G = (0.1, 1000000.0)
CAPACITY_ML = (0.1, 100000.0)
SUBDIVISION_ML = (1e-4, 1000.0)


def _value(given: dict, path: tuple, bounds: tuple[float, float], unit: str) -> float:
    value = to_canonical(given["value"], given["unit"])[1]
    low, high = bounds
    # The relative slack absorbs float error of a unit conversion at a bound.
    if not low * (1 - BOUND_SLACK) <= value <= high * (1 + BOUND_SLACK):
        raise invalid(path + ("value",), "plausible_equipment", f"{value:g} {unit} is outside {low:g} to {high:g} {unit}: check the unit")
    return value


def equipment_from(data: dict) -> tuple[Balance, tuple[Graduate, ...], list[str]]:
    """Balance, graduates, and a note of each default assumed."""
    defaults = []
    balance = data.get("balance", {})
    if "sensitivity" not in balance:
        defaults.append("balance sensitivity 6 mg (Class A prescription balance, USP <1176>)")
    if "acceptable_error_percent" not in balance:
        defaults.append("acceptable weighing error 5 %")
    if "readability" not in balance:
        defaults.append("balance readability 10 mg")
    if "capacity" not in balance:
        defaults.append(f"balance capacity {DEFAULT_CAPACITY_G:g} g (Class A prescription balance)")
    # Every implausible figure is refused with the others (faults.run gives None for each).
    faults = Faults()

    def given(key: str, bounds: tuple[float, float], default: float) -> float | None:
        return faults.run(_value, balance[key], ("equipment", "balance", key), bounds, "g") if key in balance else default

    sensitivity_g, readability_g = given("sensitivity", SENSITIVITY_G, DEFAULT_SENSITIVITY_G), given("readability", READABILITY_G, DEFAULT_READABILITY_G)
    capacity_g = given("capacity", CAPACITY_G, DEFAULT_CAPACITY_G)
    if "graduates" in data:
        graduates = []
        for i, g in enumerate(data["graduates"]):
            path = ("equipment", "graduates", i)
            capacity = faults.run(_value, g["capacity"], path + ("capacity",), CAPACITY_ML, "mL")
            subdivision = (faults.run(_value, g["subdivision"], path + ("subdivision",), SUBDIVISION_ML, "mL") if "subdivision" in g
                           else None if capacity is None else capacity / DEFAULT_SUBDIVISIONS)
            if capacity is not None and subdivision is not None:
                graduates.append(Graduate(capacity, min(subdivision, capacity), g.get("conical", False)))
    else:
        defaults.append("cylindrical graduates of 10, 25, 50, 100, 250, 500 and 1000 mL, each divided into 50")
        graduates = [Graduate(c, c / DEFAULT_SUBDIVISIONS) for c in DEFAULT_GRADUATES_ML]
    faults.raise_any()
    b = Balance(sensitivity_g=sensitivity_g, acceptable_error_percent=balance.get("acceptable_error_percent", DEFAULT_ERROR_PERCENT),
                readability_g=readability_g, capacity_g=capacity_g)
    return b, tuple(sorted(graduates, key=lambda g: g.capacity_ml)), defaults


def equipment_out(balance: Balance, graduates, defaults: list[str]) -> dict:
    """The equipment as answers report it."""
    return {"balance": {"sensitivity_g": balance.sensitivity_g, "acceptable_error_percent": balance.acceptable_error_percent,
                        "readability_g": balance.readability_g, "capacity_g": balance.capacity_g,
                        "minimum_weighable_quantity_g": balance.minimum_weighable_g},
            "graduates": [{"capacity_ml": g.capacity_ml, "subdivision_ml": g.subdivision_ml, "conical": g.conical} for g in graduates],
            "defaults_assumed": defaults}
