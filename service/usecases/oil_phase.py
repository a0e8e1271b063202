"""The required HLB of an oil phase with its provenance, computed in one place
for the required-HLB calculation, the worksheet and the candidate pairs."""
from __future__ import annotations

from typing import Sequence

from registry import Registry
from service.core.amounts import Amount
from service.core.required_hlb import OilPhase, required_hlb
from service.usecases.provenance import ValuesUsed
from service.usecases.resolution import RHLB_PROPERTY, Faults, Resolved, amount_densities, required_value


def oil_phase_hlb(items: Sequence[Resolved], amounts: Sequence[Amount], counts: Sequence[bool], emulsion_type: str,
                  registry: Registry, values_used: ValuesUsed, strict: bool) -> OilPhase:
    """Required HLB (O/W or W/O by `emulsion_type`) of the oil phase, the
    values it used recorded in `values_used`. Densities are looked up only
    for amounts by mass or volume. Raises the core's CalculationError with
    the oil phase's own indexes."""
    prop = RHLB_PROPERTY[emulsion_type]
    # Every missing required HLB and every missing or implausible density, refused together.
    faults = Faults()
    rhlbs = [faults.run(required_value, it, prop, "required_hlb", registry, values_used, f"{emulsion_type} required HLB") if count else None
             for it, count in zip(items, counts)]
    densities = amount_densities(items, amounts, registry, values_used, strict, faults)
    faults.raise_any()
    return required_hlb(rhlbs, amounts, densities, counts)
