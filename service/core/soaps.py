"""Soaps made in place: a fatty acid (or the free acids of a wax) partly
neutralised in the batch by an alkali. Pure stoichiometry on plain floats:
masses in g, amounts of substance in mol, molar masses in g/mol, acid values
in mg KOH per g. The molar masses come from the caller (the registry's, or
molmass at the use case's edge)."""
from __future__ import annotations

from dataclasses import dataclass

from service.core.errors import CalculationError
from service.core.findings import Finding


@dataclass(frozen=True)
class Coproduct:
    """What the neutralisation gives besides the soap, per mole of acid
    neutralised (water from a hydroxide, boric acid and water from borax)."""

    name: str
    formula: str
    mol_per_mol_acid: float
    molar_mass_g_per_mol: float


@dataclass(frozen=True)
class Alkali:
    """An alkali as the neutralisation sees it: its molar mass, the moles of
    acid one mole neutralises (its equivalents), and its coproducts."""

    name: str
    molar_mass_g_per_mol: float
    equivalents_per_mol: float
    coproducts: tuple[Coproduct, ...] = ()

    @property
    def soap_gain_g_per_mol_acid(self) -> float:
        """What the soap weighs above its acid, per mole: by mass balance, the
        alkali spent on one mole of acid less the coproducts it leaves."""
        return self.molar_mass_g_per_mol / self.equivalents_per_mol - sum(c.mol_per_mol_acid * c.molar_mass_g_per_mol for c in self.coproducts)


def acid_mol(acid_value_mg_koh_per_g: float, mass_g: float, koh_g_per_mol: float) -> float:
    """Moles of free acid in `mass_g`: the acid value is mg KOH per g, and
    one mole of KOH neutralises one mole of a monobasic acid."""
    return acid_value_mg_koh_per_g * mass_g / koh_g_per_mol / 1000.0


def mean_acid_molar_mass(acid_value_mg_koh_per_g: float, koh_g_per_mol: float) -> float:
    """The mass per mole of free acid, g/mol (1000·M(KOH)/AV, the
    saponification equivalent): the acid's mean molar mass when the whole
    material is acid; for a wax, the wax's mass per mole of its free acids."""
    return 1000.0 * koh_g_per_mol / acid_value_mg_koh_per_g


@dataclass(frozen=True)
class Neutralisation:
    acid_mol: float
    neutralised_fraction: float  # of the free acid, 0 to 1
    acid_neutralised_mol: float
    free_acid_mol: float
    alkali_pure_g: float  # the pure alkali that reacts, or that was given
    alkali_weighed_g: float  # as weighed, at the material's assay
    alkali_mol: float
    excess_alkali_g: float  # pure alkali beyond the free acid, left unreacted
    soap_g: float | None
    acid_neutralised_g: float | None
    free_acid_g: float | None
    coproducts_g: tuple[tuple[Coproduct, float], ...]
    findings: tuple[Finding, ...]


def neutralise(acid_mol_total: float, alkali: Alkali, *, fraction: float | None = None, alkali_weighed_g: float | None = None,
               assay_fraction: float = 1.0, acid_molar_mass_g_per_mol: float | None = None) -> Neutralisation:
    """Neutralise `fraction` of the free acid, or find the fraction that
    `alkali_weighed_g` (at `assay_fraction` purity) neutralises. Without the
    acid's molar mass the masses of soap and acid are None (moles only)."""
    if (fraction is None) == (alkali_weighed_g is None):
        raise CalculationError((), "fraction_or_alkali_mass", "give the fraction to neutralise or the mass of alkali, not both")
    if not 0 < assay_fraction <= 1:
        raise CalculationError(("base_assay_percent",), "positive", "the alkali's assay is above 0 and at most 100 %")
    if not acid_mol_total > 0:
        raise CalculationError(("acid_mass",), "positive", "the material holds no free acid to neutralise: check its mass and acid value")
    findings = []
    if fraction is not None:
        if not 0 < fraction <= 1:
            raise CalculationError(("neutralised_fraction",), "positive", "the fraction to neutralise is above 0 and at most 1")
        alkali_mol = acid_mol_total * fraction / alkali.equivalents_per_mol
        pure_g = alkali_mol * alkali.molar_mass_g_per_mol
        weighed_g, excess_g, reacted = pure_g / assay_fraction, 0.0, fraction
    else:
        pure_g = alkali_weighed_g * assay_fraction
        alkali_mol = pure_g / alkali.molar_mass_g_per_mol
        equivalents = alkali_mol * alkali.equivalents_per_mol
        reacted = min(equivalents / acid_mol_total, 1.0)
        excess_g = max(equivalents - acid_mol_total, 0.0) / alkali.equivalents_per_mol * alkali.molar_mass_g_per_mol
        weighed_g = alkali_weighed_g
        if excess_g > 0:
            findings.append(Finding("alkali_in_excess", f"the alkali given is more than the free acid takes: {excess_g:.4g} g of it "
                                    "(pure) stays unreacted, making the preparation alkaline; all the free acid is neutralised",
                                    alkali.name))
    neutralised = acid_mol_total * reacted
    coproducts = tuple((c, neutralised * c.mol_per_mol_acid * c.molar_mass_g_per_mol) for c in alkali.coproducts)
    if acid_molar_mass_g_per_mol is None:
        soap_g = acid_g = free_g = None
    else:
        soap_g = neutralised * (acid_molar_mass_g_per_mol + alkali.soap_gain_g_per_mol_acid)
        acid_g = neutralised * acid_molar_mass_g_per_mol
        free_g = (acid_mol_total - neutralised) * acid_molar_mass_g_per_mol
    return Neutralisation(acid_mol_total, reacted, neutralised, acid_mol_total - neutralised, pure_g, weighed_g, alkali_mol, excess_g,
                          soap_g, acid_g, free_g, coproducts, tuple(findings))


def anionic_soap_finding(soap_name: str) -> Finding:
    """A soap formed in the batch is an anionic emulsifier: it counts as such
    in the emulsifier system, and a cationic ingredient would precipitate it."""
    return Finding("soap_is_anionic", f"the soap formed in the batch ({soap_name}) is an anionic emulsifier: count it as one in the "
                   "emulsifier system, keep cationic ingredients out, and expect an alkaline pH", soap_name)
