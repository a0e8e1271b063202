"""HLB estimated from composition.

Griffin (1954), for nonionic surfactants only, and not for those containing
propylene oxide, nitrogen or sulfur:
    HLB = 20·Mh/M            (Mh molar mass of the hydrophilic part, M of the whole)
    HLB = 20·(1 − S/A)       (S saponification number of the ester, A acid number of the acid)
    HLB = (E + P)/5, or E/5  (E wt % oxyethylene, P wt % polyol)
Davies (1957): HLB = 7 + Σ group numbers (lipophilic ones negative)."""
from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence

from service.core.errors import CalculationError


@dataclass(frozen=True)
class Scope:
    """What Griffin's formulas need to know of the surfactant."""

    ionic_class: str
    has_oxypropylene: bool = False
    has_nitrogen: bool = False
    has_sulfur: bool = False


def check_griffin_scope(scope: Scope, path: tuple = ()) -> None:
    """Refuse a surfactant outside the scope of Griffin's composition formulas."""
    if scope.ionic_class != "nonionic":
        raise CalculationError(path + ("ionic_class",), "griffin_nonionic_only",
                               f"Griffin's composition formulas are for nonionic surfactants only; this one is {scope.ionic_class}: use Davies' group method")
    for flag, what in ((scope.has_oxypropylene, "propylene oxide"), (scope.has_nitrogen, "nitrogen"), (scope.has_sulfur, "sulfur")):
        if flag:
            raise CalculationError(path, "griffin_scope", f"Griffin's composition formulas do not hold for nonionics containing {what}")


def griffin_mass_fraction(hydrophile_g_per_mol: float, molecule_g_per_mol: float) -> float:
    if not 0.0 < hydrophile_g_per_mol < molecule_g_per_mol:
        raise CalculationError(("hydrophile",), "hydrophile_smaller", "the hydrophilic part must be lighter than the whole molecule")
    return 20.0 * hydrophile_g_per_mol / molecule_g_per_mol


def griffin_saponification(saponification_number: float, acid_number: float) -> float:
    if not 0.0 < saponification_number < acid_number:
        raise CalculationError(("saponification_number",), "s_below_a",
                               "the ester's saponification number must be below the fatty acid's acid number (else HLB <= 0)")
    return 20.0 * (1.0 - saponification_number / acid_number)


def griffin_oxyethylene(oxyethylene_percent: float, polyol_percent: float = 0.0) -> float:
    if oxyethylene_percent + polyol_percent > 100.0:
        raise CalculationError(("polyol_percent",), "percent_total_at_most_100", "oxyethylene and polyol cannot exceed 100 % of the molecule")
    return (oxyethylene_percent + polyol_percent) / 5.0


DAVIES_CONSTANT = 7.0


def davies(groups: Sequence[tuple[float, float]]) -> float:
    """7 + Σ count·number over (number, count) pairs."""
    return DAVIES_CONSTANT + sum(number * count for number, count in groups)
