"""Minimum emulsifier estimate, an empirical formula of pharmaceutical
calculation practice with no primary publication found:

    Qs = 6·(ρs/ρd) / (10 − 0.5·RHLB) + 4·Q/1000

ρs density of the surfactant blend, ρd density of the dispersed phase, RHLB
required HLB of the oil phase, Q percentage of the continuous phase. Qs is in
grams, read per 100 g of emulsion (our inference from its percentage inputs).
The formula is singular at RHLB 20 and negative above it."""
from __future__ import annotations

from dataclasses import dataclass

from service.core.errors import CalculationError
from service.core.findings import ceil_to

RHLB_SINGULAR = 20.0


@dataclass(frozen=True)
class MinimumEmulsifier:
    g_per_100g: float
    g_per_100g_rounded_up: float


def minimum_emulsifier(
    surfactant_density_g_per_ml: float,
    dispersed_density_g_per_ml: float,
    required_hlb: float,
    continuous_phase_percent: float,
    rounding_increment_g_per_100g: float = 0.1,
) -> MinimumEmulsifier:
    """The estimate in g per 100 g of emulsion, and rounded up to the
    increment. Raises CalculationError outside the formula's domain."""
    if not 0.0 <= required_hlb < RHLB_SINGULAR:
        raise CalculationError(("required_hlb",), "below_20", "the formula is singular at a required HLB of 20 and meaningless above it; it needs 0 <= RHLB < 20")
    if not 0.0 < continuous_phase_percent < 100.0:
        raise CalculationError(("continuous_phase_percent",), "between_0_and_100", "the continuous phase must be more than 0 and less than 100 % of the emulsion")
    qs = 6.0 * (surfactant_density_g_per_ml / dispersed_density_g_per_ml) / (10.0 - 0.5 * required_hlb) + 4.0 * continuous_phase_percent / 1000.0
    return MinimumEmulsifier(qs, ceil_to(qs, rounding_increment_g_per_100g))
