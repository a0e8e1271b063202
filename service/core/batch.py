"""A formula's shares turned into the masses of one batch."""
from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence

from service.core.errors import CalculationError
from service.core.measure import relative_error_percent, round_to

# A q.s. vehicle must be a real part of the formula, not a rounding residue.
MIN_QS_PERCENT = 0.01


@dataclass(frozen=True)
class BatchRow:
    """`mass_g` is rounded to the balance; checks run on `mass_g_unrounded`.
    For the q.s. vehicle `percent_w_w` is the share its rounded mass takes,
    so that its % and its mass agree."""

    percent_w_w: float
    mass_g_unrounded: float
    mass_g: float

    @property
    def rounding_error_percent(self) -> float:
        return relative_error_percent(self.mass_g_unrounded, self.mass_g)


def qs_percent(percents: Sequence[float | None], qs_index: int, path: tuple) -> float:
    """The q.s. vehicle's share: 100 less every other share. Raises when the
    others leave nothing for it."""
    others = sum(p for i, p in enumerate(percents) if i != qs_index)
    remainder = 100.0 - others
    if remainder < MIN_QS_PERCENT:
        raise CalculationError(path, "qs_has_room", f"the other ingredients take {others:g} % w/w, leaving nothing for the q.s. vehicle")
    return remainder


def mixture_mass_for_volume(volume_ml: float, fractions: Sequence[float], densities_g_per_ml: Sequence[float | None], path: tuple) -> float:
    """Mass of a mixture of the given mass fractions that fills `volume_ml`,
    assuming volumes add (no contraction on mixing). Raises CalculationError
    naming the first item whose density is missing."""
    specific_volume_ml_per_g = 0.0
    for i, (fraction, density) in enumerate(zip(fractions, densities_g_per_ml, strict=True)):
        if density is None:
            raise CalculationError(path + (i,), "density_needed_for_volume",
                                   "an amount given as a volume needs the density of every component; none is known for this one")
        specific_volume_ml_per_g += fraction / density
    return volume_ml / specific_volume_ml_per_g


def rows_for_batch(percents: Sequence[float], batch_mass_g: float, qs_index: int, increment_g: float) -> list[BatchRow]:
    """Masses rounded to the balance increment; the q.s. vehicle takes the
    rounding residue, so the masses add up to the batch exactly."""
    rows = [BatchRow(p, p / 100.0 * batch_mass_g, round_to(p / 100.0 * batch_mass_g, increment_g)) for p in percents]
    others = sum(r.mass_g for i, r in enumerate(rows) if i != qs_index)
    qs_mass_g = round(batch_mass_g - others, 10)
    rows[qs_index] = BatchRow(qs_mass_g / batch_mass_g * 100.0, rows[qs_index].mass_g_unrounded, qs_mass_g)
    return rows
