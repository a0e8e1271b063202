"""The unit allow-list against exact definitions.

Source: NIST Handbook 44, Appendix C, and NIST SP 811 (all exact by
definition). Compared with a relative tolerance, as floats must be."""
import math

import pytest

from service.units import AMOUNT_UNITS, DENSITY_UNITS, from_canonical, to_canonical

NIST_EXACT = [
    ("lb", "mass", 453.59237),            # NIST HB44 App. C: 1 lb = 453.592 37 g
    ("oz", "mass", 28.349523125),         # 1 oz avdp = 28.349 523 125 g
    ("gr", "mass", 0.06479891),           # 1 grain = 64.798 91 mg
    ("oz_apoth", "mass", 31.1034768),     # 1 apothecaries' ounce = 31.103 476 8 g
    ("dr_apoth", "mass", 3.8879346),      # 1 apothecaries' dram = 60 grains
    ("scruple", "mass", 1.2959782),       # 1 scruple = 20 grains
    ("lb_apoth", "mass", 373.2417216),    # 1 apothecaries' pound = 12 apothecaries' ounces
    ("gal", "volume", 3785.411784),       # 1 US gallon = 231 in3 = 3 785.411 784 mL
    ("fl_oz", "volume", 29.5735295625),   # 1 US fluid ounce = 1/128 gal
    ("pt", "volume", 473.176473),         # 1 US liquid pint = 1/8 gal
    ("qt", "volume", 946.352946),         # 1 US liquid quart = 1/4 gal
    ("fl_dr", "volume", 3.6966911953125), # 1 US fluid dram = 1/8 fl oz
    ("minim", "volume", 0.0616115199218750),  # 1 minim = 1/60 fl dr
    ("mg", "mass", 1e-3), ("kg", "mass", 1e3), ("mcg", "mass", 1e-6),
    ("L", "volume", 1e3), ("uL", "volume", 1e-3),
]


@pytest.mark.parametrize(("token", "kind", "canonical"), NIST_EXACT)
def test_unit_factor_matches_exact_definition(token, kind, canonical):
    got_kind, got = to_canonical(1.0, token)
    assert got_kind == kind
    assert math.isclose(got, canonical, rel_tol=1e-12)
    assert math.isclose(from_canonical(got, token), 1.0, rel_tol=1e-12)


def test_density_units():
    # 1 g/cm3 = 1 g/mL = 1 kg/L = 1000 kg/m3 (SI definitions, NIST SP 811).
    for token, value in [("g/mL", 1.0), ("g/cm3", 1.0), ("kg/L", 1.0), ("kg/m3", 1000.0)]:
        assert math.isclose(to_canonical(value, token)[1], 1.0, rel_tol=1e-12)


def test_relative_amounts_pass_through():
    assert to_canonical(3.0, "parts") == ("parts", 3.0)
    assert to_canonical(2.5, "% w/w") == ("percent_w_w", 2.5)


def test_allow_list_is_closed():
    # Free text is never parsed: only tokens in the allow-list exist.
    assert "gram" not in AMOUNT_UNITS and "1e9999 g" not in AMOUNT_UNITS
    assert set(DENSITY_UNITS) == {"g/mL", "g/cm3", "kg/L", "kg/m3"}


@pytest.mark.parametrize("unit", [*AMOUNT_UNITS.values(), *DENSITY_UNITS.values()], ids=lambda u: u.token)
def test_unit_factor_matches_pint(unit):
    # The factors are written from their definitions; pint (PyPI, its own
    # definitions file) converts the unit named beside each one the same way.
    from registry.units import unit_registry

    from service.units import CANONICAL

    if unit.pint_name is None:
        assert unit.to_canonical == 1.0  # parts and % w/w pass through
        return
    ureg = unit_registry()
    expected = ureg.Quantity(1.0, ureg.Unit(unit.pint_name)).to(CANONICAL[unit.kind]).magnitude
    assert math.isclose(unit.to_canonical, expected, rel_tol=1e-12)
