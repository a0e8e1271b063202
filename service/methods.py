"""The methods the service uses, each with its formula, its sources (ids in
the registry's bibliography) and the assumptions an answer must state."""
from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class Method:
    name: str
    formula: str
    source_ids: tuple[str, ...]
    assumptions: tuple[str, ...]


ADDITIVITY = (
    "HLB values are assumed additive by mass; additivity holds only approximately and many catalogue values "
    "were calculated rather than measured (Pasquali, Taurozzi & Bregni 2008)."
)
BY_MASS = "Amounts by volume are converted to masses with the density shown for each ingredient in values_used."

BLEND_HLB = Method(
    name="Mass-weighted mean HLB of a surfactant blend",
    formula="HLB_blend = Σ wᵢ·HLBᵢ / Σ wᵢ, with wᵢ the mass of surfactant i",
    source_ids=("griffin-1949", "pasquali-2008"),
    assumptions=(ADDITIVITY, BY_MASS),
)
SPLIT = Method(
    name="Proportions of a surfactant pair for a target HLB",
    formula="x_H = (T − Σfᵢ·HLBᵢ − R·HLB_L) / (R·(HLB_H − HLB_L)), R = 1 − Σfᵢ; "
    "x_H share of the pair's remainder R taken by the higher-HLB surfactant, fᵢ fixed mass fractions",
    source_ids=("griffin-1949", "pasquali-2008"),
    assumptions=(
        ADDITIVITY,
        "A total given as a volume assumes the surfactants' volumes add on mixing.",
    ),
)
REQUIRED_HLB = Method(
    name="Required HLB of an oil phase, mass-weighted",
    formula="RHLB = Σ wᵢ·RHLBᵢ / Σ wᵢ over the oil-phase ingredients that count, wᵢ their masses",
    source_ids=("griffin-1949", "pasquali-2008"),
    assumptions=(
        "Required HLB values are assumed additive by mass; additivity was never fully demonstrated.",
        "Fractions are of the oil phase, not of the whole formula.",
        "Ingredients marked counts_toward_rhlb=false are weighed in the oil phase but left out of the mean.",
        BY_MASS,
    ),
)
MINIMUM_EMULSIFIER = Method(
    name="Minimum emulsifier estimate (empirical)",
    formula="Qs = 6·(ρs/ρd) / (10 − 0.5·RHLB) + 4·Q/1000; ρs surfactant density, ρd dispersed-phase density, "
    "Q % continuous phase",
    source_ids=("practice-minimum-emulsifier", "usp-1176"),
    assumptions=(
        "An empirical estimate from pharmaceutical calculation practice; no primary publication was found.",
        "The result is read as grams per 100 g of emulsion; that basis is inferred from its percentage inputs.",
        "The figure is rounded up, never down, since it is a minimum; a weighable batch amount is at least the "
        "minimum weighable quantity (USP <1176>: sensitivity x 100 / acceptable % error).",
    ),
)

CANDIDATES = Method(
    name="Candidate surfactant pairs for a target HLB, ranked by a rule of thumb",
    formula="every registry pair with HLB_L <= T <= HLB_H; share of H = (T - HLB_L) / (HLB_H - HLB_L); ranked: one fatty-chain "
    "family first, then balanced proportions, then nonionic before ionic",
    source_ids=("griffin-1949", "pasquali-2008"),
    assumptions=(
        ADDITIVITY,
        "The ranking is a rule of thumb of formulation practice (no source): pairs of one fatty-chain family tend to pack "
        "together at the interface; it does not predict stability.",
        "Hydrocolloids (apparent HLB only) and anionic-with-cationic pairs are never proposed.",
    ),
)
WORKSHEET = Method(
    name="Batch worksheet: required HLB, emulsifier proportions, batch quantities and measurability",
    formula="RHLB = Σ wᵢ·RHLBᵢ / Σ wᵢ over the oil phase; pair split x_H = (T − HLB_L)/(HLB_H − HLB_L); mass = % w/w × batch / 100, "
    "rounded to the balance; q.s. = batch − Σ others; MWQ = sensitivity × 100 / acceptable % error",
    source_ids=("griffin-1949", "pasquali-2008", "usp-1176", "graduate-practice"),
    assumptions=(
        ADDITIVITY,
        "Masses are rounded to the balance's readability; the q.s. vehicle takes the rounding residue, so the masses add up to the batch.",
        "A batch given as a volume is turned into a mass assuming the components' volumes add.",
        "Oily and viscous liquids, solids and the q.s. vehicle are weighed; other liquids are measured in a graduate where the volume "
        "suits one.",
    ),
)
WORKSHEET_CAUTIONS = (
    "Phases are usually heated to about 70 to 75 °C: hot oils and waxes cause burns; heat with care and consult each material's "
    "safety data sheet for flammability and handling.",
    "A second pharmacist should check every quantity against this worksheet before the batch is released.",
)

CAUTIONS = (
    "Decision aid for a qualified pharmacist: every figure must be checked by a pharmacist before use. "
    "Results are starting points for bench trials, never a promise of a stable emulsion.",
    "Local regulations, the applicable pharmacopoeia and compounding standards (such as USP <795> where it is "
    "adopted) take precedence over this answer.",
    "HLB and required-HLB values are approximate and published values disagree; each value used is listed "
    "with its source and status, and a range is given where sources differ.",
)
