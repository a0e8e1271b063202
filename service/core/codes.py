"""Every code an answer or a refusal can carry, with what it means: the one
catalogue the OpenAPI enums, the /docs page and the README are built from.
tests/contract/test_codes.py fails when the code base uses a code that is not
here, or this lists one that nothing uses."""
from __future__ import annotations

# Checks: an `ok` true/false verdict in a worksheet or a test series. A failed
# check also appears among the warnings as `check_<code>`.
ROW_CHECKS = {
    "minimum_weighable_quantity": "The row's unrounded mass is at or above the balance's minimum weighable quantity (USP <1176>: sensitivity x 100 / acceptable error).",
    "balance_capacity": "The row's mass is within the balance's capacity.",
    "rounding_error": "Rounding the row's amount to the equipment changes it by no more than the acceptable error.",
    "graduate_at_least_1_ml": "The volume is at least 1 mL; smaller volumes need a pipette or syringe, or weighing.",
    "graduate_at_least_20_percent": "The volume fills at least 20 % of the graduate chosen.",
    "graduate_large_enough": "A graduate at hand holds the volume.",
}
WORKSHEET_CHECKS = {
    "totals_add_up": "The rounded amounts add up to the batch.",
    "batch_within_balance_capacity": "A batch made up to weight fits on the balance.",
    "dispersed_phase_volume": "The dispersed phase stays below the close-packing limit of equal spheres (about 74 % by volume).",
    "hlb_suits_emulsion_type": "The emulsifier blend's HLB lies in the range usual for the emulsion type.",
    "blend_matches_required_hlb": "The emulsifier blend's HLB matches the oil phase's required HLB within 0.5.",
    "ionic_compatibility": "No anionic surfactant is combined with a cationic one.",
    "emulsifier_level": "Each surfactant is within the levels usual for it, where the registry records them.",
}
RECORD_CHECKS = {
    "component_expiries_given": "Every component of a compounding record has its expiry date, so the beyond-use date is final.",
    "component_lots_given": "Every component of a compounding record has its supplier and lot.",
}

# Checks of the amounts actually taken against a worksheet (POST /v1/worksheets/amounts-taken).
TAKEN_CHECKS = {
    "taken_within_tolerance": "The amount taken deviates from the row's unrounded target by no more than the allowed percentage.",
    "taken_at_least_minimum_weighable": "A mass taken on the balance is at or above its minimum weighable quantity (USP <1176>).",
    "every_row_taken": "Every row of the worksheet has an amount taken recorded.",
    "final_weight_within_tolerance": "The finished preparation weighs the batch mass within the tolerance given (default: the balance's acceptable error).",
}
CHECKS = {**ROW_CHECKS, **WORKSHEET_CHECKS, **TAKEN_CHECKS, **RECORD_CHECKS}

# Quality checks a compounding record leaves to record at the bench, each
# with a pass/fail field (`passed`, null until filled).
QUALITY_CHECKS = {
    "appearance": "Colour, texture and uniformity against the description; no lumps, grit or foreign matter.",
    "phase_separation": "No separation, creaming or oil droplets after standing.",
    "ph": "The pH, where the preparation has an aqueous phase, against the range given.",
    "final_weight": "The finished preparation's weight against the batch, within the tolerance.",
}

# Warnings: something a pharmacist should read before relying on the answer.
FINDINGS = {
    "ionic_incompatibility": "An anionic and a cationic surfactant are combined: they are expected to interact.",
    "ionic_with_nonionic": "An ionic surfactant is blended arithmetically with nonionic ones: the blend HLB is a rough guide.",
    "ionic_class_unknown": "An inline ingredient has no ionic class, so compatibility could not be checked.",
    "hlb_off_griffin_scale": "A nonionic's HLB is above 20, off Griffin's scale: the figure is nominal.",
    "hlb_outside_usual_range": "The blend's (or an estimated) HLB is outside the range usual for the emulsion type.",
    "estimate_above_usual_levels": "The minimum emulsifier estimate is above the highest usual level in the registry.",
    "dispersed_phase_above_packing_limit": "The dispersed phase is above the close-packing limit: the emulsion may invert or fail.",
    "dispersed_phase_high": "The dispersed phase is above 60 % by volume: expect a thick, less stable emulsion.",
}
PROVENANCE_WARNINGS = {
    "unverified_value": "Values not yet checked against their cited source were used.",
    "value_from_memory": "Values recalled from memory of a standard text, not read from it, were used.",
    "caller_supplied_value": "Values supplied by the caller (inline or as an override) were used; they carry no source.",
    "local_value": "Values from this pharmacy's site overlay, not from the shipped registry, were used.",
    "sources_disagree": "Sources disagree on a value used; the preferred figure was used and the range is given.",
    "doubtful_value_left_out": "A value has a further figure the registry flags doubtful, left out of the range given.",
}
ANSWER_WARNINGS = {
    "apparent_hlb": "An HLB is an apparent value (e.g. of a hydrocolloid or an ionic surfactant), not on Griffin's scale.",
    "solid_by_volume": "A solid or semisolid was given by volume.",
    "unpublished_method": "The minimum emulsifier estimate is an empirical rule with no published derivation.",
    "estimate_insensitive_to_oil_load": "The minimum emulsifier estimate barely depends on how much oil there is.",
    "below_minimum_weighable_quantity": "An amount is below the balance's minimum weighable quantity.",
    "required_hlb_near_singularity": "The required HLB is close to 20, where the minimum estimate is singular.",
    "pair_proposed": "The service chose the surfactant pair; check it suits the formula.",
    "davies_ethoxylate": "Davies' method is unreliable for ethoxylated surfactants.",
    "off_griffin_scale": "The estimate lies off Griffin's 0 to 20 scale.",
    "not_all_measurable": "Some test emulsions have amounts that cannot be measured with the equipment given.",
    "optimum_not_bracketed": "The best test is at the edge of the series: the required HLB may lie outside it.",
    "no_candidate_pair": "No registry pair reaches the target.",
    "rounding_residue_to_largest_share": "A formula stated in full has no q.s. vehicle: its largest share takes the rounding residue.",
    "unverified_bud_category": "The beyond-use category used is not yet checked against the chapter it cites.",
    "procedure_phase_unknown": "The registry holds no phase for a component: the procedure leaves where it goes to the pharmacist.",
    "melting_range_unknown": "A solid or semisolid has no melting range on record: heat until melted, by the material's specification.",
    "melting_range_unverified_not_used": "Strict mode: a solid's melting range on record is unverified and does not set the processing temperature: heat until melted, by the material's specification.",
    "cloud_point_below_processing": "An ethoxylated surfactant's cloud point on record lies below the processing temperature: heated above it, it turns less water-soluble.",
    "high_process_temperature": "The oil phase must be heated near the aqueous phase's boiling point.",
    "water_activity_at_threshold": "A measured water activity is exactly the aqueous threshold, where readings of the chapter differ.",
    "taken_converted_with_density": "An amount taken was given as a volume for a weighed row, or as a mass for a measured one, and converted with the row's density.",
    "worksheet_checks_failed": "The worksheet the amounts were checked against has failed checks of its own, judged on the worksheet.",
    "soap_is_anionic": "A soap formed in the batch is an anionic emulsifier: count it in the emulsifier system, keep cationics out.",
    "alkali_in_excess": "The alkali given is more than the free acid takes: the excess stays unreacted and the preparation alkaline.",
    "soap_mass_needs_acid_molar_mass": "The material is not all free acid: the soap's mass needs the free acids' mean molar mass.",
    "alkali_assay_assumed": "A hydroxide was taken as 100 % pure; the pharmacopeial material is less: give its assay.",
    "area_measured_at_air_water": "An area per molecule measured at the air-water interface is used for the oil-water one: the interface estimate is approximate.",
    "cmc_unknown": "No CMC is known for a surfactant: the interface estimate leaves out what stays dissolved in the continuous phase.",
    "practice_estimate_left_out": "No required HLB was given: the practice formula's minimum is not computed beside the interface estimate.",
    "gum_proportions_common_practice": "The primary-emulsion proportions are common practice, recalled, not read in a text.",
}
WARNINGS = {**FINDINGS, **PROVENANCE_WARNINGS, **ANSWER_WARNINGS,
            **{f"check_{code}": f"A check failed: {meaning}" for code, meaning in CHECKS.items()}}

# Refusals: the `rule` of a problem item that the calculation (not the
# request's schema) enforces. A request valid by the schema may still meet one.
REFUSALS = {
    "known_ingredient": "The ingredient id is in the registry (the problem suggests the closest ids).",
    "current_ingredient": "The ingredient has not been retired from the registry.",
    "verified_values_only": "Strict mode: every registry value used has been checked against its source.",
    "hlb_known": "An HLB is known for the surfactant.",
    "required_hlb_known": "A required HLB is known for the oil-phase ingredient and emulsion type.",
    "density_needed": "The minimum estimate needs a density that is not known: give it.",
    "density_needed_for_volume": "An amount given by volume needs a density that is not known: give it, or give a mass.",
    "plausible_molar_mass": "A molecular formula gives a plausible molar mass.",
    "valid_formula": "The molecular formula can be parsed.",
    "known_group": "The Davies group is in the registry.",
    "target_outside_reachable_range": "The target HLB lies within what the pair can reach.",
    "pair_hlbs_differ": "The pair's two HLBs differ.",
    "fixed_share_below_100": "Fixed surfactants leave room for the pair.",
    "fixed_share_basis": "Fixed shares are % w/w of the blend, or masses when the total is a mass.",
    "room_for_pair": "The fixed surfactants leave room for the pair in the emulsifier system.",
    "candidate_pair_exists": "A registry pair of the allowed ionic classes reaches the target.",
    "continuous_phase_share": "The continuous phase is more than 0 and less than 100 % of the emulsion.",
    "between_0_and_100": "The continuous phase is more than 0 and less than 100 % of the emulsion.",
    "below_20": "The required HLB is below 20, where the minimum estimate is defined.",
    "estimate_plausible": "The minimum emulsifier estimate is at most twice the highest usual level.",
    "solids_by_weight": "A solid or semisolid is given by mass or % w/w, never by volume.",
    "share_basis": "A worksheet share is % w/w or an amount for the batch, not parts.",
    "one_qs_vehicle": "A formula has at most one q.s. vehicle.",
    "qs_has_room": "The other ingredients leave room for the q.s. vehicle.",
    "qs_oil_needs_total": "An oily q.s. vehicle needs the emulsifier total given.",
    "formula_adds_up": "A formula without a q.s. vehicle adds up to 100 % w/w (within 0.01), emulsifier included.",
    "has_oil_phase": "The emulsion has at least one oil-phase ingredient.",
    "something_counts": "At least one oil-phase ingredient counts towards the required HLB.",
    "not_empty": "At least one amount is given.",
    "at_least_two": "A blend has at least two surfactants.",
    "one_basis": "Amounts are all masses or volumes, or all parts, or all % w/w.",
    "percent_total_at_most_100": "Percentages add up to at most 100.",
    "griffin_nonionic_only": "Griffin's formulas are used for nonionic surfactants only.",
    "griffin_scope": "Griffin's formulas are not used for nonionics with oxypropylene, nitrogen or sulfur.",
    "hydrophile_smaller": "The hydrophilic part is lighter than the whole molecule.",
    "s_below_a": "The saponification number is below the acid number.",
    "range_reachable": "The series' HLB range lies within what the pair reaches.",
    "at_most_41_tests": "A series plans at most 41 tests.",
    "room_for_vehicle": "Oil and emulsifier leave room for the vehicle.",
    "some_test_passed": "At least one test of the series passed.",
    "finite_result": "The inputs give a finite result.",
    "aliquot_weighable": "The aliquot is at least the minimum weighable quantity.",
    "below_minimum_weighable": "An aliquot is planned only for an amount below the minimum weighable quantity.",
    "positive": "An aliquot is planned for a positive amount (or a deviation or yield for a positive target).",
    "date_format": "A date is a real calendar day, YYYY-MM-DD, in a plausible year.",
    "expiry_date_format": "An expiry is a real date, YYYY-MM-DD, or a month, YYYY-MM.",
    "component_not_expired": "No component has expired before the compounding date.",
    "bud_category_decidable": "The beyond-use category can be decided from the formula and the record's inputs.",
    "preservative_named": "A preparation stated preserved names its preservative among the components.",
    "storage_for_bud_category": "The storage stated is one the beyond-use category allows.",
    "component_in_worksheet": "A record's component is one of the worksheet's.",
    "one_entry_per_component": "Each worksheet component is given at most once in the record.",
    "dosage_form_suits_route": "The dosage form suits the route (an oral preparation is an emulsion).",
    "taken_row_exists": "An amount taken names a row the worksheet has.",
    "taken_row_once": "Each worksheet row has at most one amount taken.",
    "taken_ingredient_matches_row": "An amount taken that names an ingredient names the one on its row.",
    "acid_value_known": "An acid value is known for the fatty acid or wax (the registry's, or given).",
    "fraction_or_alkali_mass": "A soap made in place is given the fraction to neutralise or the mass of alkali, not both.",
    "known_oil_kind": "The kind of oil is one the primary-emulsion proportions cover (fixed, mineral, volatile).",
    "final_holds_primary_emulsion": "The final amount is more than the primary emulsion it is made from.",
    # POST /v1/emulsifier/interface-estimate
    "area_per_molecule_known": "An area per molecule is known for each surfactant (the registry's, or given with its interface).",
    "molar_mass_known": "A molar mass is known for each surfactant (the registry's, or given).",
    "density_needed_for_mass": "A phase given by mass needs its density to find its volume: give it, or give a volume.",
    "mole_fractions_given": "Each member of a surfactant blend has its mole fraction.",
    "mole_fractions_add_up": "The mole fractions of a surfactant blend are positive and add up to 1 (within 1e-6).",
    "distribution_has_droplets": "A droplet-size distribution has at least one diameter with a count above zero.",
    # POST /v1/blends/solve
    "constraints_consistent": "A blend's bounds, fixed shares and ratios can hold together with its shares adding up to 100 %.",
    "target_reachable_under_constraints": "The target HLB lies within what the blend reaches under its constraints (the problem names the nearest reachable HLB and the constraints that bind there).",
    "ratio_member_exists": "A ratio names members the blend has (counted from 0).",
    "ratio_members_differ": "A ratio is between two different members.",
    "ionic_class_known": "The least_ionic objective knows every member's ionic class.",
    "solution_found": "The solver found shares that meet every constraint and the target within 1e-9.",
}

__all__ = ["ANSWER_WARNINGS", "CHECKS", "FINDINGS", "PROVENANCE_WARNINGS", "QUALITY_CHECKS", "RECORD_CHECKS", "REFUSALS", "ROW_CHECKS", "TAKEN_CHECKS", "WARNINGS", "WORKSHEET_CHECKS"]
