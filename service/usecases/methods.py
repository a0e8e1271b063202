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
        "The estimate is nearly insensitive to the oil/water ratio: the continuous-phase term 4·Q/1000 adds at most 0.4 g per "
        "100 g over the whole range of Q; it does not scale with the oil load.",
        "An estimate above the highest usual emulsifier level in the registry is warned about; one above twice that level "
        "(never above 100 g per 100 g) cannot be a formula and is refused.",
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
# The one heating rule (service.core.procedure.heating), as both methods state it.
HEATING_FORMULA = "processing temperature = max(70 °C, top of the oil phase's highest melting range + 5 °C), rounded up to 5 °C"
HEATING_ASSUMPTION = ("The 70 °C floor and the 5 °C above the highest melting range are common practice, no source; only the oil phase is "
                      "melted (a solid of the aqueous phase is dissolved), and with nothing to melt the process is cold. An ethoxylated "
                      "surfactant whose cloud point on record lies below the processing temperature is warned about.")
WORKSHEET = Method(
    name="Batch worksheet: required HLB, emulsifier proportions, batch quantities and measurability",
    formula="RHLB = Σ wᵢ·RHLBᵢ / Σ wᵢ over the oil phase; pair split x_H = (T − HLB_L)/(HLB_H − HLB_L); mass = % w/w × batch / 100, "
    "rounded to the balance; q.s. = batch − Σ others; MWQ = sensitivity × 100 / acceptable % error; " + HEATING_FORMULA,
    source_ids=("griffin-1949", "pasquali-2008", "usp-1176", "graduate-practice"),
    assumptions=(
        ADDITIVITY,
        "Masses are rounded to the balance's readability; the q.s. vehicle takes the rounding residue, so the masses add up to the batch.",
        "A batch given as a volume is turned into a mass assuming the components' volumes add.",
        "Oily and viscous liquids, solids and the q.s. vehicle are weighed; other liquids are measured in a graduate where the volume "
        "suits one.",
        HEATING_ASSUMPTION,
    ),
)
WORKSHEET_WITH_ESTIMATE = Method(
    name=WORKSHEET.name + ", the emulsifier sized by the minimum estimate",
    formula=WORKSHEET.formula + "; emulsifier = (1 + margin) × (6·(ρs/ρd) / (10 − 0.5·RHLB) + 4·Q/1000), rounded up to 0.1 %",
    source_ids=WORKSHEET.source_ids + ("practice-minimum-emulsifier",),
    assumptions=WORKSHEET.assumptions + MINIMUM_EMULSIFIER.assumptions + (
        "The margin on the estimate is the request's margin_percent, or 25 % when none is given (common practice, no source): "
        "the estimate is a rough lower bound, never a dose to use as it is.",
    ),
)
WORKSHEET_CAUTIONS = (
    "Phases are usually heated to about 70 to 75 °C: hot oils and waxes cause burns; heat with care and consult each material's "
    "safety data sheet for flammability and handling.",
    "A second pharmacist should check every quantity against this worksheet before the batch is released.",
)

COMPOUNDING_RECORD = Method(
    name="Compounding record: the worksheet, the beyond-use date by USP <795>'s default categories, the procedure, the label "
    "and the quality checks",
    formula="BUD = min(compounding date + the category's days, the earliest component expiry); category by water (aqueous when the "
    "formula holds water or the measured water activity is at least the threshold), preservative and oral liquid; " + HEATING_FORMULA,
    source_ids=("usp-795-2023", "griffin-1949", "pasquali-2008", "usp-1176", "graduate-practice"),
    assumptions=(
        "The beyond-use categories are the chapter's defaults where no USP-NF compounded preparation monograph or stability study of "
        "the preparation applies; each category is shown with its source, locator and status.",
        "An expiry written as a month and a year is read as the last day of that month.",
        HEATING_ASSUMPTION,
        "A surfactant goes into the phase it dissolves or disperses in: the registry's record where it has one, else Griffin's bands of "
        "behaviour in water for its HLB.",
        "The procedure's steps are the usual practice of the trade, for the pharmacist to confirm; the formula's own reference comes first.",
    ),
)
RECORD_CAUTIONS = WORKSHEET_CAUTIONS + (
    "A beyond-use date here is a default, not a stability finding: a stability study may support another, and local rules or the "
    "pharmacy's own standards may set a shorter one.",
    "Fields left blank (________) are for the people who compound and check the preparation to fill in; the record is complete only "
    "when they are.",
)
AMOUNTS_TAKEN = Method(
    name="Amounts taken against the batch worksheet: deviations, batch total and yield",
    formula="deviation = taken − target, in the unit the row is measured in (g weighed, mL measured); deviation % = deviation / "
    "unrounded target × 100; within when |deviation %| ≤ allowed %; yield % = final weight / batch mass × 100",
    source_ids=("usp-1176", "graduate-practice"),
    assumptions=(
        "The worksheet is recomputed from its request; no figure sent back with the amounts is used.",
        "Deviations are taken against the unrounded target (mass_g_unrounded, or the unrounded volume), never the displayed "
        "figure, so that display rounding cannot decide a verdict.",
        "A weighed row is allowed the balance's acceptable error (the error USP <1176> bases the minimum weighable quantity on).",
        "A row measured by volume is allowed the same percentage: no sourced rule for the error of a graduate, pipette or syringe "
        "was found in the parts of USP <1176> read (the guidance on choosing graduates sets no percentage); common practice, no source.",
        "A mass taken on the balance (for a weighed row, or for a measured row weighed instead) is flagged below the balance's "
        "minimum weighable quantity (USP <1176>: sensitivity × 100 / acceptable % error).",
        "A volume given for a weighed row, or a mass for a measured one, is converted with the density the worksheet used for "
        "the row (its unrounded mass over its volume); a row with no density known is refused such an amount, a solid always.",
        "The final weight's tolerance is the request's, or else the balance's acceptable error (common practice, no source).",
        "The worksheet's own checks concern the plan and are not repeated; their failures are counted and warned about.",
    ),
)
AMOUNTS_TAKEN_CAUTIONS = (
    "may_pass_to_checker says only that the amounts recorded here are within tolerance; the checking pharmacist still verifies "
    "each amount, the materials and their lots against the record before the batch is released.",
)

GRIFFIN_SCOPE = ("Griffin's composition formulas hold for nonionic surfactants only, and not for those containing propylene "
                 "oxide, nitrogen or sulfur (Griffin 1954).")
IDEALISED = ("Commercial surfactants are mixtures: an idealised structure does not reproduce their catalogue values (idealised "
             "sorbitan monostearate gives about 6.8 against the published 4.7). Never recompute a catalogue value from an idealised formula.")
GRIFFIN_MASS_FRACTION = Method(
    name="Griffin's mass fraction of the hydrophile", formula="HLB = 20·Mh/M", source_ids=("griffin-1954",),
    assumptions=(GRIFFIN_SCOPE, IDEALISED, "Molar masses from formulas use standard atomic weights (molmass)."),
)
GRIFFIN_SAPONIFICATION = Method(
    name="Griffin's saponification-number formula for fatty-acid esters of polyols", formula="HLB = 20·(1 − S/A)",
    source_ids=("griffin-1954",), assumptions=(GRIFFIN_SCOPE, IDEALISED),
)
GRIFFIN_OXYETHYLENE = Method(
    name="Griffin's oxyethylene and polyol formula", formula="HLB = (E + P)/5; E/5 where oxyethylene is the only hydrophile",
    source_ids=("griffin-1954",), assumptions=(GRIFFIN_SCOPE, IDEALISED),
)
DAVIES = Method(
    name="Davies' group contributions", formula="HLB = 7 + Σ (group number × count); lipophilic group numbers are negative",
    source_ids=("davies-1957", "guo-2006"),
    assumptions=("Group numbers are the registry's, each listed with its provenance in values_used.",
                 "The method badly underestimates the HLB of ethoxylated surfactants (Guo, Rong & Ying 2006).",
                 "Ionic values (20 to 40) lie off Griffin's nonionic scale."),
)
SERIES_PLAN = Method(
    name="Required-HLB test series: plan",
    formula="test i: blend HLB_i from the pair's proportions; masses = % w/w × test batch, rounded to the balance",
    source_ids=("griffin-1949", "usp-1176", "graduate-practice"),
    assumptions=("Each test emulsion has the same oil phase, oil level and emulsifier level; only the pair's proportions change.",
                 "Griffin used excess emulsifier in such screens, and the best ratio depends on the pair's chemical family: "
                 "the required HLB found is that of this oil with this pair.", ADDITIVITY),
)
SERIES_EVALUATE = Method(
    name="Required-HLB test series: reading the results",
    formula="the best test's HLB, refined by the vertex of the parabola through it and its two neighbours",
    source_ids=("griffin-1949",),
    assumptions=("The refinement is a local quadratic fit (common practice, no source); it is only as good as the scores.",
                 "The uncertainty is set by the test spacing: run the finer series to narrow it."),
)

CAUTIONS = (
    "Decision aid for a qualified pharmacist: every figure must be checked by a pharmacist before use. "
    "Results are starting points for bench trials, never a promise of a stable emulsion.",
    "Local regulations, the applicable pharmacopoeia and compounding standards (such as USP <795> where it is "
    "adopted) take precedence over this answer.",
    "HLB and required-HLB values are approximate and published values disagree; each value used is listed "
    "with its source and status, and a range is given where sources differ.",
)

SOAP_IN_PLACE = Method(
    name="Soap made in place: a fatty acid (or a wax's free acids) partly neutralised by an alkali",
    formula="n_acid = AV × m / M(KOH) / 1000 (AV mg KOH/g, m g, M(KOH) = 56.1056 g/mol); n_alkali = f × n_acid / e "
    "(e = 1 for triethanolamine, potassium and sodium hydroxide, 2 for borax decahydrate); M_acid = 1000·M(KOH)/AV; "
    "soap = f·n_acid·(M_acid + M_alkali/e − Σ coproducts); free acid = (1 − f)·n_acid·M_acid",
    source_ids=("practice-soap-in-place", "iupac-atomic-weights"),
    assumptions=(
        "The acid value counts every free acid as monobasic; the moles of acid are those one mole of KOH each neutralises.",
        "M_acid = 1000·M(KOH)/AV is the saponification-equivalent mean molar mass: the acid's own only when the whole material is "
        "free acid. For a wax, whose free acids are a small part of it, it is the wax's mass per mole of free acid; the soap's "
        "and the free acid's masses then need the acids' own mean molar mass (free_acid_molar_mass_g_per_mol).",
        "Triethanolamine, potassium and sodium hydroxide give one equivalent of base per mole; borax decahydrate two "
        "(Na2B4O7·10H2O + 2 RCOOH → 2 RCOONa + 4 H3BO3 + 5 H2O): stoichiometry of the balanced equations.",
        "A hydroxide gives one mole of water per mole of acid; triethanolamine forms its salt with no water; borax releases its "
        "water of crystallisation and boric acid. The soap's mass follows by mass balance.",
        "The reaction is taken as complete for the fraction neutralised; the alkali's assay is 100 % unless given.",
        "Molar masses from formulas use standard atomic weights (molmass); the alkali's is the registry's, in values_used.",
    ),
)
GUM_EMULSION = Method(
    name="Gum (acacia) emulsion: the primary emulsion by kind of oil, and the water to final amount",
    formula="oil : water : gum = 4 : 2 : 1 (fixed oil), 3 : 2 : 1 (mineral oil), 2 : 2 : 1 (volatile oil); oil and water in parts "
    "by volume, gum in parts by weight: gum g = oil mL × 1/oil parts, water mL = oil mL × 2/oil parts",
    source_ids=("practice-gum-primary-emulsion",),
    assumptions=(
        "The proportions are common practice, recalled from memory of standard pharmaceutics texts (not read in one); two teaching "
        "pages read agree (see the source's note).",
        "The gum is the whole of the emulsifier, and the oil the whole of the oil phase; the primary emulsion's gum and oil are "
        "their amounts in the final emulsion.",
        "Oil given by mass is turned into a volume with its density; water is purified water at its density in values_used.",
        "The rest of the water is added after the primary emulsion has formed; to a final volume it is q.s. in a calibrated "
        "vessel (volumes do not add exactly), to a final mass it is weighed.",
    ),
)
# Shares of a blend of two or more surfactants under constraints (POST /v1/blends/solve).
BLEND_OBJECTIVES = {
    "most_even": "the shares nearest to equal shares: the least sum of squared deviations from 100/n % each",
    "least_ionic": "the least total share of ionic (anionic, cationic, amphoteric) members; among the answers with that share, "
                   "the most even",
}
BLEND_SOLVE = Method(
    name="Shares of a surfactant blend for a target HLB under constraints",
    formula="Σ xᵢ = 1, Σ xᵢ·HLBᵢ = T, lᵢ ≤ xᵢ ≤ uᵢ, xᵢ = fᵢ for a fixed share, b·x_a = a·x_b for a ratio a : b; "
    "reachable range = min and max of Σ xᵢ·HLBᵢ under the constraints (linear programs, HiGHS); most_even: min Σ (xᵢ − 1/n)² "
    "(SLSQP, then solved exactly on the face it reaches); least_ionic: min Σ ionic xᵢ first (a linear program), then most_even",
    source_ids=("griffin-1949", "pasquali-2008"),
    assumptions=(
        ADDITIVITY,
        "Shares are of the blend (the emulsifier system), by mass; bounds, fixed shares and ratios are by mass too.",
        "With more than two members many shares reach the target: the objective named in the answer chose one; the HLB "
        "arithmetic says nothing of which gives the more stable emulsion.",
        "The HLB reached is recomputed from the shares and must meet the target within 1e-9; a constraint is active when it "
        "holds with equality at the answer.",
        "A target out of reach is refused with the nearest reachable HLB and the constraints that bind there: those whose "
        "marginal in the linear program is not zero, so that relaxing one moves the end of the range towards the target.",
        "A total given as a volume assumes the surfactants' volumes add on mixing.",
    ),
)

# The interface estimate's own assumptions; its answer states them beside the
# practice formula's (MINIMUM_EMULSIFIER.assumptions), each set under its estimate.
INTERFACE_ASSUMPTIONS = (
    "One saturated monolayer of emulsifier covers every droplet; nothing is adsorbed beyond it.",
    "Every droplet has the Sauter mean diameter d32 = Σn·d³ / Σn·d²: the size with the distribution's own ratio of volume to "
    "surface, so the area 6·V/d32 is the distribution's true interfacial area.",
    "The area per molecule is that of a saturated film measured at the interface its basis names; a figure measured against air "
    "is used for the oil-water interface only as an approximation (a molecule usually takes a different area against oil).",
    "A blend's monolayer is ideal: its mean area per molecule is the mole-fraction mean of its members' areas, and its "
    "composition is the blend's.",
    "Only what dissolves in the continuous phase up to the CMC is added: no excess micelles beyond it. A blend's CMC is the "
    "ideal mixed-micelle value, 1/CMC = Σ xᵢ/CMCᵢ (Clint), with the dissolved monomers in the blend's proportions.",
    "Nothing is lost to the dispersed phase (an oil-soluble surfactant partly dissolves in the oil) or to other surfaces.",
    "Molar masses of commercial surfactants are nominal (an idealised formula): the products are mixtures.",
    "The result is a physical lower bound: practice uses several times more, to form the droplets while they are being made "
    "and to give the film strength.",
)
INTERFACE_EMULSIFIER = Method(
    name="Emulsifier from the interface it covers, beside the practice formula's minimum",
    formula="A = 6·V_d/d32 (V_d m3, d32 m); N = A/a (a m2 per molecule); n = N/N_A, N_A = 6.02214076e23 /mol (exact, SI 2019); "
    "m_adsorbed = n·M; m_dissolved = CMC·V_c·M; practice: Qs = 6·(ρs/ρd) / (10 − 0.5·RHLB) + 4·Q/1000 g per 100 g",
    source_ids=("mcclements-food-emulsions", "codata-2018", "practice-minimum-emulsifier"),
    assumptions=INTERFACE_ASSUMPTIONS,
)
