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
from service.core.findings import Finding, ceil_to

RHLB_SINGULAR = 20.0
# An estimate above the highest usual level of use is warned about; one above
# this multiple of it (and never above the whole emulsion) cannot be a
# formula and is refused. The usual levels are registry data with a source.
CEILING_MULTIPLE_OF_USUAL = 2.0
# The continuous-phase term 4·Q/1000 adds at most 0.4 g per 100 g over the
# whole range of Q: the estimate hardly depends on the oil/water ratio.
OIL_LOAD_NOTE = ("the estimate is nearly insensitive to the oil/water ratio: its continuous-phase term, 4·Q/1000, adds at most "
                 "0.4 g per 100 g between Q = 0 and Q = 100, so it does not scale with the oil load; the required HLB and the "
                 "densities decide it")


@dataclass(frozen=True)
class MinimumEmulsifier:
    g_per_100g: float
    g_per_100g_rounded_up: float


# The continuous-phase term's coefficient: 4·Q/1000 g per 100 g for Q % of continuous phase.
CONTINUOUS_TERM_G_PER_PERCENT = 4.0 / 1000.0


def constant_part(surfactant_density_g_per_ml: float, dispersed_density_g_per_ml: float, required_hlb: float) -> float:
    """6·(ρs/ρd) / (10 − 0.5·RHLB), g per 100 g: the estimate without its
    continuous-phase term. Raises CalculationError outside the domain."""
    if not 0.0 <= required_hlb < RHLB_SINGULAR:
        raise CalculationError(("required_hlb",), "below_20", "the formula is singular at a required HLB of 20 and meaningless above it; it needs 0 <= RHLB < 20")
    return 6.0 * (surfactant_density_g_per_ml / dispersed_density_g_per_ml) / (10.0 - 0.5 * required_hlb)


def continuous_term(continuous_phase_percent: float) -> float:
    """4·Q/1000, g per 100 g."""
    return CONTINUOUS_TERM_G_PER_PERCENT * continuous_phase_percent


def minimum_emulsifier(
    surfactant_density_g_per_ml: float,
    dispersed_density_g_per_ml: float,
    required_hlb: float,
    continuous_phase_percent: float,
    rounding_increment_g_per_100g: float = 0.1,
) -> MinimumEmulsifier:
    """The estimate in g per 100 g of emulsion, and rounded up to the
    increment. Raises CalculationError outside the formula's domain."""
    constant = constant_part(surfactant_density_g_per_ml, dispersed_density_g_per_ml, required_hlb)
    if not 0.0 < continuous_phase_percent < 100.0:
        raise CalculationError(("continuous_phase_percent",), "between_0_and_100", "the continuous phase must be more than 0 and less than 100 % of the emulsion")
    qs = constant + continuous_term(continuous_phase_percent)
    return MinimumEmulsifier(qs, ceil_to(qs, rounding_increment_g_per_100g))


@dataclass(frozen=True)
class SizedEmulsifier:
    """An emulsifier total sized by the estimate plus a margin (% w/w,
    unrounded), the estimate itself (g per 100 g), and the continuous phase's
    share it was computed at (%)."""

    total_percent: float
    estimate_g_per_100g: float
    continuous_percent: float


def sized_with_margin(constant_g_per_100g: float, margin_fraction: float, continuous_percent: float,
                      takes_from_continuous: bool) -> SizedEmulsifier:
    """E = (1 + m)(A + k·Q). When the emulsifier's share is taken from the
    continuous phase (its q.s. vehicle is there), `continuous_percent` is
    what the continuous phase would be without it, C, and Q = C − E, so
    E = (1 + m)(A + k·C) / (1 + (1 + m)·k)."""
    k, grow = CONTINUOUS_TERM_G_PER_PERCENT, 1.0 + margin_fraction
    if takes_from_continuous:
        total = grow * (constant_g_per_100g + k * continuous_percent) / (1.0 + grow * k)
        q = continuous_percent - total
    else:
        total = grow * (constant_g_per_100g + k * continuous_percent)
        q = continuous_percent
    return SizedEmulsifier(total, constant_g_per_100g + k * q, q)


def estimate_limits(usual_high_percent: float) -> tuple[float, float]:
    """(warning threshold, refusal ceiling) in g per 100 g, from the highest
    usual emulsifier level (% w/w)."""
    return usual_high_percent, min(100.0, CEILING_MULTIPLE_OF_USUAL * usual_high_percent)


def plausibility_finding(g_per_100g: float, usual_high_percent: float, path: tuple) -> Finding | None:
    """Refuses an estimate that cannot be a formula (above the ceiling of
    `estimate_limits`); a finding when it is above the usual levels."""
    warn_at, ceiling = estimate_limits(usual_high_percent)
    if g_per_100g > ceiling:
        raise CalculationError(path, "estimate_plausible",
                               f"the estimate is {g_per_100g:.3g} g per 100 g of emulsion, above the ceiling of {ceiling:g} g "
                               f"(twice the highest usual emulsifier level, {usual_high_percent:g} %): it cannot be a formula. A required "
                               "HLB this close to 20 is outside what the formula can estimate; find the emulsifier level by bench trial")
    if g_per_100g > warn_at:
        return Finding("estimate_above_usual_levels",
                       f"the estimate, {g_per_100g:.3g} g per 100 g, is above the highest usual emulsifier level of {usual_high_percent:g} %: "
                       "treat it with suspicion and confirm the level by bench trial", "estimate")
    return None
