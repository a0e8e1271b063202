"""The balance and graduates a worksheet is checked against, from the
request or from the defaults."""
from __future__ import annotations

from service.core.measure import Balance, Graduate
from service.lookups import DEFAULT_ERROR_PERCENT, DEFAULT_SENSITIVITY_G
from service.resolve import invalid
from service.units import to_canonical

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
    if not low <= value <= high:
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
    b = Balance(
        sensitivity_g=_value(balance["sensitivity"], ("equipment", "balance", "sensitivity"), SENSITIVITY_G, "g")
        if "sensitivity" in balance else DEFAULT_SENSITIVITY_G,
        acceptable_error_percent=balance.get("acceptable_error_percent", DEFAULT_ERROR_PERCENT),
        readability_g=_value(balance["readability"], ("equipment", "balance", "readability"), READABILITY_G, "g")
        if "readability" in balance else DEFAULT_READABILITY_G,
        capacity_g=_value(balance["capacity"], ("equipment", "balance", "capacity"), CAPACITY_G, "g")
        if "capacity" in balance else DEFAULT_CAPACITY_G,
    )
    if "graduates" in data:
        graduates = []
        for i, g in enumerate(data["graduates"]):
            path = ("equipment", "graduates", i)
            capacity = _value(g["capacity"], path + ("capacity",), CAPACITY_ML, "mL")
            subdivision = (_value(g["subdivision"], path + ("subdivision",), SUBDIVISION_ML, "mL")
                           if "subdivision" in g else capacity / DEFAULT_SUBDIVISIONS)
            graduates.append(Graduate(capacity, min(subdivision, capacity), g.get("conical", False)))
    else:
        defaults.append("cylindrical graduates of 10, 25, 50, 100, 250, 500 and 1000 mL, each divided into 50")
        graduates = [Graduate(c, c / DEFAULT_SUBDIVISIONS) for c in DEFAULT_GRADUATES_ML]
    return b, tuple(sorted(graduates, key=lambda g: g.capacity_ml)), defaults


def equipment_out(balance: Balance, graduates, defaults: list[str]) -> dict:
    """The equipment as answers report it."""
    return {"balance": {"sensitivity_g": balance.sensitivity_g, "acceptable_error_percent": balance.acceptable_error_percent,
                        "readability_g": balance.readability_g, "capacity_g": balance.capacity_g,
                        "minimum_weighable_quantity_g": balance.minimum_weighable_g},
            "graduates": [{"capacity_ml": g.capacity_ml, "subdivision_ml": g.subdivision_ml, "conical": g.conical} for g in graduates],
            "defaults_assumed": defaults}
