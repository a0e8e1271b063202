"""An ethoxylated surfactant heated above its cloud point: its polyoxyethylene
chains lose their water of hydration, it turns less hydrophilic and may come
out of the aqueous phase while the phases are hot. Compared here with the
processing temperature, as plain floats in degC; the figures and their
provenance come from the registry."""
from __future__ import annotations

from dataclasses import dataclass

from service.core.findings import Finding


@dataclass(frozen=True)
class CloudPoint:
    label: str
    cloud_point_c: float
    basis: str              # where the figure comes from: source, locator, conditions, status
    unverified: bool


def below_processing(cloud_points: list[CloudPoint], processing_c: float | None) -> list[Finding]:
    """A finding for each surfactant whose cloud point lies below the
    processing temperature (None, a cold process: none)."""
    if processing_c is None:
        return []
    out = []
    for c in cloud_points:
        if c.cloud_point_c >= processing_c:
            continue
        doubt = "; the cloud point is unverified: confirm it in its source or the supplier's specification" if c.unverified else ""
        out.append(Finding("cloud_point_below_processing", subject=c.label,
                           message=f"{c.label} has a cloud point of {c.cloud_point_c:g} °C ({c.basis}), below the processing "
                                   f"temperature of {processing_c:g} °C: heated above it the surfactant dehydrates and turns less "
                                   "water-soluble, so the emulsion may thin, break or invert while hot (common practice, no source): "
                                   f"the pharmacist judges whether to process cooler{doubt}"))
    return out
