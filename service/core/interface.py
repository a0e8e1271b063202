"""Emulsifier estimated from the interface it must cover (standard colloid
science; McClements, Food Emulsions; Hiemenz & Rajagopalan):

    A   = 6·V_d / d32                 interfacial area of droplets of Sauter diameter d32
    N   = A / a                       molecules in one saturated monolayer, a the area per molecule
    n   = N / N_A                     moles
    m_a = n·M                         mass adsorbed
    m_s = CMC·V_c·M                   mass left dissolved in the continuous phase at the CMC

Inputs are plain floats in the units their names carry (mL, µm, nm2, g/mol,
mmol/L); the conversions to SI are here, once: V_d [m3] = mL x 1e-6,
d32 [m] = µm x 1e-6, a [m2] = nm2 x 1e-18, V_c [L] = mL x 1e-3."""
from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence

from service.core.errors import CalculationError

# The Avogadro constant, exact since the SI revision of 20 May 2019 (SI
# Brochure, 9th ed.; CODATA 2018): a definition, so no uncertainty is carried.
AVOGADRO_PER_MOL = 6.02214076e23
M3_PER_ML = 1e-6
M_PER_UM = 1e-6
M2_PER_NM2 = 1e-18
L_PER_ML = 1e-3
# Mole fractions of a blend must add up to 1 within this (rounding in a request).
MOLE_FRACTION_SLACK = 1e-6


def sauter_mean_diameter_um(diameters_um: Sequence[float], counts: Sequence[float]) -> float:
    """d32 = Σ nᵢ dᵢ³ / Σ nᵢ dᵢ², in µm, from diameters (µm) and their counts
    or number fractions (any scale: only their ratios matter)."""
    if len(diameters_um) != len(counts) or not diameters_um:
        raise CalculationError(("droplets", "distribution"), "distribution_has_droplets", "give at least one diameter with its count")
    for i, (d, n) in enumerate(zip(diameters_um, counts)):
        if d <= 0:
            raise CalculationError(("droplets", "distribution", i, "diameter_um"), "exclusive_minimum", "a diameter must be positive")
        if n < 0:
            raise CalculationError(("droplets", "distribution", i, "count"), "minimum", "a count cannot be negative")
    second = sum(n * d * d for d, n in zip(diameters_um, counts))
    if second <= 0:
        raise CalculationError(("droplets", "distribution"), "distribution_has_droplets", "every count is zero: no droplets to size")
    return sum(n * d ** 3 for d, n in zip(diameters_um, counts)) / second


def interfacial_area_m2(dispersed_volume_ml: float, d32_um: float) -> float:
    """A = 6·V/d32 in m2, for V mL of dispersed phase in droplets of Sauter diameter d32 µm."""
    if dispersed_volume_ml <= 0 or d32_um <= 0:
        raise CalculationError(("droplets",), "exclusive_minimum", "the dispersed volume and the droplet diameter must be positive")
    return 6.0 * dispersed_volume_ml * M3_PER_ML / (d32_um * M_PER_UM)


@dataclass(frozen=True)
class Member:
    """One surfactant of the emulsifier: its area per molecule (nm2), molar
    mass (g/mol), mole fraction in the blend, and CMC (mmol/L, None when unknown)."""

    area_nm2: float
    molar_mass_g_per_mol: float
    mole_fraction: float
    cmc_mmol_per_l: float | None = None


def mole_weighted(values: Sequence[float], fractions: Sequence[float]) -> float:
    """Σ xᵢ vᵢ: a blend's mean area per molecule, or its mean molar mass."""
    return sum(x * v for x, v in zip(fractions, values))


def ideal_mixed_cmc_mmol_per_l(cmcs: Sequence[float], fractions: Sequence[float]) -> float:
    """1 / CMC_mix = Σ xᵢ / CMCᵢ: the CMC of an ideally mixing blend (Clint's
    ideal mixed-micelle rule), mmol/L."""
    return 1.0 / sum(x / c for x, c in zip(fractions, cmcs))


@dataclass(frozen=True)
class InterfaceEstimate:
    d32_um: float
    area_m2: float
    mean_area_nm2: float
    molecules: float
    mol: float
    mean_molar_mass_g_per_mol: float
    adsorbed_g: float
    adsorbed_g_by_member: tuple[float, ...]
    cmc_mmol_per_l: float | None
    dissolved_g: float | None
    dissolved_g_by_member: tuple[float, ...] | None

    @property
    def total_g(self) -> float:
        """Adsorbed plus dissolved; the adsorbed part alone when the CMC is unknown."""
        return self.adsorbed_g + (self.dissolved_g or 0.0)


def interface_estimate(dispersed_volume_ml: float, d32_um: float, members: Sequence[Member],
                       continuous_volume_ml: float) -> InterfaceEstimate:
    """The emulsifier one monolayer on the droplets takes, plus what stays
    dissolved at the CMC in the continuous phase (left out, as None, when any
    member's CMC is unknown). Raises CalculationError for inputs outside the domain."""
    if not members:
        raise CalculationError(("surfactants",), "list_length", "give at least one surfactant")
    fractions = [m.mole_fraction for m in members]
    if any(x <= 0 for x in fractions) or abs(sum(fractions) - 1.0) > MOLE_FRACTION_SLACK:
        raise CalculationError(("surfactants",), "mole_fractions_add_up", "the mole fractions must be positive and add up to 1")
    if any(m.area_nm2 <= 0 or m.molar_mass_g_per_mol <= 0 for m in members):
        raise CalculationError(("surfactants",), "exclusive_minimum", "an area per molecule and a molar mass must be positive")
    if continuous_volume_ml <= 0:
        raise CalculationError(("continuous_phase",), "exclusive_minimum", "the continuous phase must have a positive volume")
    area_m2 = interfacial_area_m2(dispersed_volume_ml, d32_um)
    # Each molecule of the blend takes its own area: the monolayer's mean area
    # per molecule is the mole-fraction mean (the film taken as ideal).
    mean_area = mole_weighted([m.area_nm2 for m in members], fractions)
    molecules = area_m2 / (mean_area * M2_PER_NM2)
    mol = molecules / AVOGADRO_PER_MOL
    by_member = tuple(mol * m.mole_fraction * m.molar_mass_g_per_mol for m in members)
    mean_molar = mole_weighted([m.molar_mass_g_per_mol for m in members], fractions)
    cmc = dissolved = dissolved_by = None
    if all(m.cmc_mmol_per_l is not None and m.cmc_mmol_per_l > 0 for m in members):
        cmc = ideal_mixed_cmc_mmol_per_l([m.cmc_mmol_per_l for m in members], fractions)
        dissolved_mol = cmc * 1e-3 * continuous_volume_ml * L_PER_ML
        dissolved_by = tuple(dissolved_mol * m.mole_fraction * m.molar_mass_g_per_mol for m in members)
        dissolved = sum(dissolved_by)
    return InterfaceEstimate(d32_um, area_m2, mean_area, molecules, mol, mean_molar, sum(by_member), by_member,
                             cmc, dissolved, dissolved_by)
