"""The process's one pint UnitRegistry. It lives here, at the bottom of the
dependency order, so that the registry (reading data files) and the service
(reading requests) share it: service.units imports it from here."""
from __future__ import annotations

import pint

UREG = pint.UnitRegistry()
Q_ = UREG.Quantity
DENSITY_DIMENSION = UREG.Unit("gram / milliliter").dimensionality


def density_factor_to_g_per_ml(unit_text: str) -> float:
    """Factor from a density unit written in a data file to g/mL. Raises
    ValueError when the text is not a unit of density. Data files are curated,
    so their unit text is parsed; request units never are."""
    try:
        unit = UREG.Unit(unit_text)
    except (pint.errors.UndefinedUnitError, pint.errors.DefinitionSyntaxError, ValueError, TypeError, AttributeError) as exc:
        raise ValueError(f"'{unit_text}' is not a unit pint knows") from exc
    if unit.dimensionality != DENSITY_DIMENSION:
        raise ValueError(f"'{unit_text}' is not a unit of density (mass per volume)")
    return Q_(1.0, unit).to("gram / milliliter").magnitude
