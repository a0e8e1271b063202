"""The allow-list of units a request may use, and each one's factor to the
canonical unit (g, mL or g/mL).

Units arrive as fixed tokens from the allow-list, never as free text to
parse (an exponent in a parsed string can take unbounded time). Each factor
is written here from its exact definition (NIST Handbook 44, Appendix C;
NIST SP 811), so that a request costs one multiplication and the service
starts without building pint's unit registry (about 0.4 s and 10 MB a
process). tests/core/test_units.py checks every factor against NIST's
figures and against pint's conversion of the unit named beside it."""
from __future__ import annotations

from dataclasses import dataclass
from types import MappingProxyType

CANONICAL = {"mass": "gram", "volume": "milliliter", "density": "gram / milliliter"}

# Exact by definition: the avoirdupois pound, and the grain as 1/7000 of it
# (apothecaries' weights are counted in grains); the US gallon as 231 cubic
# inches of 2.54 cm.
_LB_G = 453.59237
_GRAIN_G = _LB_G / 7000
_GALLON_ML = 231 * 2.54 ** 3
_FL_OZ_ML = _GALLON_ML / 128
_FL_DR_ML = _FL_OZ_ML / 8

# token -> (pint's name for the unit, factor to the canonical unit). Mass:
# metric, avoirdupois and apothecaries'. Volume: metric and US fluid measure.
_MASS = {
    "g": ("gram", 1.0), "mg": ("milligram", 1e-3), "mcg": ("microgram", 1e-6), "kg": ("kilogram", 1e3),
    "lb": ("pound", _LB_G), "oz": ("ounce", _LB_G / 16), "gr": ("grain", _GRAIN_G),
    "lb_apoth": ("apothecary_pound", 5760 * _GRAIN_G), "oz_apoth": ("apothecary_ounce", 480 * _GRAIN_G),
    "dr_apoth": ("apothecary_dram", 60 * _GRAIN_G), "scruple": ("scruple", 20 * _GRAIN_G),
}
_VOLUME = {
    "mL": ("milliliter", 1.0), "L": ("liter", 1e3), "uL": ("microliter", 1e-3),
    "fl_oz": ("US_fluid_ounce", _FL_OZ_ML), "fl_dr": ("fluid_dram", _FL_DR_ML), "minim": ("minim", _FL_DR_ML / 60),
    "pt": ("liquid_pint", _GALLON_ML / 8), "qt": ("liquid_quart", _GALLON_ML / 4), "gal": ("gallon", _GALLON_ML),
}
_DENSITY = {
    "g/mL": ("gram / milliliter", 1.0), "g/cm3": ("gram / centimeter ** 3", 1.0),
    "kg/L": ("kilogram / liter", 1.0), "kg/m3": ("kilogram / meter ** 3", 1e-3),
}

# Relative amounts have no unit in pint's sense.
RELATIVE_UNITS = {"parts": "parts", "% w/w": "percent_w_w"}


@dataclass(frozen=True)
class UnitDef:
    token: str
    kind: str  # mass | volume | density | parts | percent_w_w
    pint_name: str | None  # the unit's name in pint, which the tests convert by
    to_canonical: float  # multiply a value in this unit to get g, mL or g/mL


def _defs(table: dict[str, tuple[str, float]], kind: str) -> dict[str, UnitDef]:
    return {token: UnitDef(token, kind, name, factor) for token, (name, factor) in table.items()}


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
