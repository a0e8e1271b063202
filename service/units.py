"""The one pint UnitRegistry, and the allow-list of units a request may use.

Units arrive as fixed tokens from the allow-list, never as free text for pint
to parse (an exponent in a parsed string can take unbounded time). Each token
maps to a unit defined by pint; its factor to the canonical unit (g, mL or
g/mL) is computed once, here, so that a request costs one multiplication."""
from __future__ import annotations

from dataclasses import dataclass
from types import MappingProxyType

import pint

from registry.units import Q_, UREG

CANONICAL = {"mass": "gram", "volume": "milliliter", "density": "gram / milliliter"}

# token -> (kind, pint unit name). Mass: metric, avoirdupois and apothecaries'.
# Volume: metric and US fluid measure.
_MASS = {
    "g": "gram", "mg": "milligram", "mcg": "microgram", "kg": "kilogram",
    "lb": "pound", "oz": "ounce", "gr": "grain",
    "lb_apoth": "apothecary_pound", "oz_apoth": "apothecary_ounce", "dr_apoth": "apothecary_dram", "scruple": "scruple",
}
_VOLUME = {
    "mL": "milliliter", "L": "liter", "uL": "microliter",
    "fl_oz": "US_fluid_ounce", "fl_dr": "fluid_dram", "minim": "minim",
    "pt": "liquid_pint", "qt": "liquid_quart", "gal": "gallon",
}
_DENSITY = {"g/mL": "gram / milliliter", "g/cm3": "gram / centimeter ** 3", "kg/L": "kilogram / liter", "kg/m3": "kilogram / meter ** 3"}

# Relative amounts have no unit in pint's sense.
RELATIVE_UNITS = {"parts": "parts", "% w/w": "percent_w_w"}


@dataclass(frozen=True)
class UnitDef:
    token: str
    kind: str  # mass | volume | density | parts | percent_w_w
    pint_unit: pint.Unit | None
    to_canonical: float  # multiply a value in this unit to get g, mL or g/mL


def _defs(table: dict[str, str], kind: str) -> dict[str, UnitDef]:
    out = {}
    for token, name in table.items():
        unit = UREG.Unit(name)
        factor = Q_(1.0, unit).to(CANONICAL[kind]).magnitude
        out[token] = UnitDef(token, kind, unit, factor)
    return out


MASS_UNITS = MappingProxyType(_defs(_MASS, "mass"))
VOLUME_UNITS = MappingProxyType(_defs(_VOLUME, "volume"))
DENSITY_UNITS = MappingProxyType(_defs(_DENSITY, "density"))
RELATIVE = MappingProxyType({t: UnitDef(t, kind, None, 1.0) for t, kind in RELATIVE_UNITS.items()})
AMOUNT_UNITS = MappingProxyType({**MASS_UNITS, **VOLUME_UNITS, **RELATIVE})
ABSOLUTE_UNITS = MappingProxyType({**MASS_UNITS, **VOLUME_UNITS})


def to_canonical(value: float, token: str) -> tuple[str, float]:
    """(kind, value in g, mL, g/mL, parts or % w/w) for an allow-listed token."""
    unit = AMOUNT_UNITS.get(token) or DENSITY_UNITS[token]
    return unit.kind, value * unit.to_canonical


def from_canonical(value: float, token: str) -> float:
    """A canonical value (g, mL or g/mL) expressed in the allow-listed unit."""
    unit = AMOUNT_UNITS.get(token) or DENSITY_UNITS[token]
    return value / unit.to_canonical
