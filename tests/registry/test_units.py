"""Density units of data files: the table of texts the loader looks up
without pint gives what pint computes from the same text (pint, PyPI), and
texts outside it still go to pint."""
import math

import pytest

from registry.units import KNOWN_DENSITY_UNITS, density_factor_to_g_per_ml, pint_density_factor


@pytest.mark.parametrize("text", sorted(KNOWN_DENSITY_UNITS))
def test_table_matches_pint(text):
    assert math.isclose(KNOWN_DENSITY_UNITS[text], pint_density_factor(text), rel_tol=1e-12)


def test_other_texts_go_to_pint():
    # 1 lb/gal = 453.592 37 g / 3 785.411 784 mL (NIST Handbook 44, Appendix C).
    assert math.isclose(density_factor_to_g_per_ml("lb/gal"), 453.59237 / 3785.411784, rel_tol=1e-12)
    with pytest.raises(ValueError, match="not a unit of density"):
        density_factor_to_g_per_ml("g/m")
    with pytest.raises(ValueError, match="not a unit pint knows"):
        density_factor_to_g_per_ml("furlongs per glorp")
