"""Amounts as the caller gave them, reduced to masses or to relative shares.

Weights in the HLB system are masses (Griffin 1949); an amount by volume is
turned into a mass with the ingredient's density. Relative amounts (parts,
% w/w of the formula) stand for masses in proportion."""
from __future__ import annotations

from dataclasses import dataclass
from typing import Literal, Sequence

from service.core.errors import CalculationError

AmountKind = Literal["mass", "volume", "parts", "percent_w_w"]
ABSOLUTE: frozenset[str] = frozenset({"mass", "volume"})

# Percentages of one formula cannot add up to more than 100; a small excess is
# allowed for rounding in the caller's own figures (common practice, no source).
PERCENT_TOLERANCE = 0.01


@dataclass(frozen=True)
class Amount:
    """`value` is in g for mass, mL for volume, parts, or % w/w."""

    kind: AmountKind
    value: float


@dataclass(frozen=True)
class Weighed:
    """An amount reduced to a mass (absolute) or a relative share.
    `mass_g` is None when the amounts were relative; `volume_ml` is None when
    the amount was a mass and no density is known."""

    weight: float
    mass_g: float | None
    volume_ml: float | None


def weigh(amounts: Sequence[Amount], densities_g_per_ml: Sequence[float | None], path: tuple) -> list[Weighed]:
    """Reduce amounts to weights proportional to mass.

    Either every amount is absolute (mass or volume) or every one is relative
    (all parts, or all % w/w); a mix cannot be put on one basis. Raises
    CalculationError naming the offending item."""
    if not amounts:
        raise CalculationError(path, "not_empty", "at least one amount is needed")
    kinds = {a.kind for a in amounts}
    absolute = kinds <= ABSOLUTE
    if not absolute and len(kinds) > 1:
        first_odd = next(i for i, a in enumerate(amounts) if a.kind != amounts[0].kind)
        raise CalculationError(
            path + (first_odd, "amount", "unit"),
            "one_basis",
            "amounts must all be masses or volumes, or all parts, or all % w/w; "
            "relative and absolute amounts (or parts and percentages) cannot be mixed",
        )
    if "percent_w_w" in kinds:
        total = sum(a.value for a in amounts)
        if total > 100.0 + PERCENT_TOLERANCE:
            raise CalculationError(
                path, "percent_total_at_most_100", f"percentages of the formula add up to {total:g} % w/w, more than 100"
            )
    out = []
    for i, (amount, density) in enumerate(zip(amounts, densities_g_per_ml, strict=True)):
        if amount.kind == "volume":
            if density is None:
                raise CalculationError(
                    path + (i, "amount"),
                    "density_needed_for_volume",
                    "an amount by volume needs the ingredient's density, and none is known: give it inline, or give a mass",
                )
            mass = amount.value * density
            out.append(Weighed(mass, mass, amount.value))
        elif amount.kind == "mass":
            out.append(Weighed(amount.value, amount.value, amount.value / density if density else None))
        else:
            out.append(Weighed(amount.value, None, None))
    return out
