"""Density units written in data files, as factors to g/mL.

Data files are curated, so their unit text is parsed by pint. The texts the
registry writes are looked up first, in a table of exact factors (SI
definitions, NIST SP 811), so that a load does not import pint and build its
unit registry (about 0.4 s at every start); any other text goes to pint,
built once, on first need. tests/registry/test_units.py checks that the table
gives what pint gives."""
from __future__ import annotations

from functools import lru_cache

# unit text -> factor to g/mL
KNOWN_DENSITY_UNITS = {
    "g/mL": 1.0, "g/ml": 1.0, "g/cm^3": 1.0, "g/cm**3": 1.0,
    "kg/L": 1.0, "kg/l": 1.0, "kg/m^3": 1e-3, "kg/m**3": 1e-3, "g/L": 1e-3, "g/l": 1e-3,
}


@lru_cache(maxsize=None)
def unit_registry():
    """pint's UnitRegistry, built on first need (a unit text not in the table)."""
    import pint

    return pint.UnitRegistry()


def density_factor_to_g_per_ml(unit_text: str) -> float:
    """Factor from a density unit written in a data file to g/mL. Raises
    ValueError when the text is not a unit of density."""
    factor = KNOWN_DENSITY_UNITS.get(unit_text)
    if factor is not None:
        return factor
    return pint_density_factor(unit_text)


def pint_density_factor(unit_text: str) -> float:
    """The factor as pint computes it, from the parsed text."""
    import pint

    ureg = unit_registry()
    try:
        unit = ureg.Unit(unit_text)
    except (pint.errors.UndefinedUnitError, pint.errors.DefinitionSyntaxError, ValueError, TypeError, AttributeError) as exc:
        raise ValueError(f"'{unit_text}' is not a unit pint knows") from exc
    if unit.dimensionality != ureg.Unit("gram / milliliter").dimensionality:
        raise ValueError(f"'{unit_text}' is not a unit of density (mass per volume)")
    return ureg.Quantity(1.0, unit).to("gram / milliliter").magnitude
