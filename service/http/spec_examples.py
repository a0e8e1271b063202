"""Request examples published in the OpenAPI document (and exercised by the
schemathesis run). The scenario is invented: a 200 g batch of a hand lotion
at a hospital's compounding unit."""
from __future__ import annotations

import copy

EXAMPLES = {
    "blendHlb": {
        "by_mass": {
            "summary": "Two surfactants weighed in grams",
            "value": {
                "components": [
                    {"ingredient": "polysorbate-60", "amount": {"value": 6.8, "unit": "g"}},
                    {"ingredient": "sorbitan-monostearate", "amount": {"value": 3.2, "unit": "g"}},
                ],
                "emulsion_type": "O/W",
            },
        },
        "by_volume": {
            "summary": "One surfactant measured by volume, with the lot's density given",
            "value": {
                "components": [
                    {"ingredient": "polysorbate-80", "amount": {"value": 4.5, "unit": "mL"}},
                    {"ingredient": "sorbitan-monooleate", "amount": {"value": 1.5, "unit": "g"}, "density": {"value": 0.99, "unit": "g/mL"}},
                ],
            },
        },
    },
    "blendProportions": {
        "scaled": {
            "summary": "A pair for HLB 11.6, scaled to 10 g of emulsifier",
            "value": {
                "target_hlb": 11.6,
                "pair": [{"ingredient": "sorbitan-monostearate"}, {"ingredient": "polysorbate-60"}],
                "total": {"value": 10, "unit": "g"},
                "emulsion_type": "O/W",
            },
        },
    },
    "oilPhaseRequiredHlb": {
        "lotion": {
            "summary": "The oil phase of the lotion, for an O/W emulsion",
            "value": {
                "emulsion_type": "O/W",
                "oil_phase": [
                    {"ingredient": "light-mineral-oil", "amount": {"value": 10, "unit": "% w/w"}},
                    {"ingredient": "isopropyl-myristate", "amount": {"value": 8, "unit": "% w/w"}},
                    {"ingredient": "cetyl-alcohol", "amount": {"value": 2, "unit": "% w/w"}},
                ],
            },
        },
    },
    "emulsifierMinimum": {
        "lotion": {
            "summary": "Minimum emulsifier for the lotion's 200 g batch",
            "value": {
                "required_hlb": 11.6,
                "surfactant_density": {"value": 1.05, "unit": "g/mL"},
                "dispersed_phase_density": {"value": 0.85, "unit": "g/mL"},
                "continuous_phase_percent": 80,
                "batch": {"value": 200, "unit": "g"},
            },
        },
    },
    "createWorksheet": {
        "lotion": {
            "summary": "The hand lotion, 200 g, with its emulsifier pair at 5 %",
            "value": {
                "emulsion_type": "O/W",
                "batch": {"value": 200, "unit": "g"},
                "ingredients": [
                    {"ingredient": "light-mineral-oil", "phase": "oil", "share": {"value": 10, "unit": "% w/w"}},
                    {"ingredient": "isopropyl-myristate", "phase": "oil", "share": {"value": 8, "unit": "% w/w"}},
                    {"ingredient": "cetyl-alcohol", "phase": "oil", "share": {"value": 2, "unit": "% w/w"}},
                    {"ingredient": "glycerin", "phase": "aqueous", "share": {"value": 5, "unit": "% w/w"}},
                    {"ingredient": "purified-water", "phase": "aqueous", "qs": True},
                ],
                "emulsifier": {"pair": [{"ingredient": "sorbitan-monostearate"}, {"ingredient": "polysorbate-60"}], "total_percent_w_w": 5},
            },
        },
    },
    "candidatePairs": {
        "target": {"summary": "Nonionic pairs for HLB 11.6", "value": {"target_hlb": 11.6, "limit": 3}},
    },
    "hlbEstimate": {
        "saponification": {"summary": "Griffin's 20(1 - S/A) for a polyol ester",
                           "value": {"method": "griffin_saponification", "saponification_number": 161, "acid_number": 198}},
        "davies": {"summary": "Davies' groups for an alkyl sulfate",
                   "value": {"method": "davies", "groups": [{"group": "sulfate-sodium", "count": 1}, {"group": "methylene", "count": 12}]}},
    },
    "requiredHlbSeriesPlan": {
        "screen": {"summary": "Eleven 50 g test emulsions of an unknown oil",
                   "value": {"emulsion_type": "O/W", "pair": [{"ingredient": "sorbitan-monooleate"}, {"ingredient": "polysorbate-80"}],
                             "oil_phase": [{"inline": {"name": "Unknown oil (demo)", "physical_state": "liquid"}, "amount": {"value": 1, "unit": "parts"}}],
                             "oil_percent": 20, "emulsifier_percent": 5, "test_batch": {"value": 50, "unit": "g"}}},
    },
    "requiredHlbSeriesEvaluate": {
        "scores": {"summary": "Stability scores read after a week",
                   "value": {"tests": [{"hlb": 8, "score": 2}, {"hlb": 9, "score": 5}, {"hlb": 10, "score": 8}, {"hlb": 11, "score": 6}, {"hlb": 12, "score": 3}],
                             "pair_hlb_range": {"low": 4.3, "high": 15.0}}},
    },
    "rescaleWorksheet": {
        "to_500_g": {"summary": "The hand lotion's worksheet for a 500 g batch",
                     "value": {"worksheet": None, "batch": {"value": 500, "unit": "g"}}},
    },
}
EXAMPLES["rescaleWorksheet"]["to_500_g"]["value"]["worksheet"] = EXAMPLES["createWorksheet"]["lotion"]["value"]
EXAMPLES["checkAmountsTaken"] = {
    "weighed": {"summary": "The hand lotion's 200 g batch as weighed, one oil measured by volume, and the final weight",
                "value": {"worksheet": EXAMPLES["createWorksheet"]["lotion"]["value"],
                          "taken": [{"row": 0, "ingredient": "light-mineral-oil", "amount": {"value": 20.02, "unit": "g"}},
                                    {"row": 1, "ingredient": "isopropyl-myristate", "amount": {"value": 18.85, "unit": "mL"}},
                                    {"row": 2, "ingredient": "cetyl-alcohol", "amount": {"value": 4.01, "unit": "g"}},
                                    {"row": 3, "ingredient": "sorbitan-monostearate", "amount": {"value": 3.24, "unit": "g"}},
                                    {"row": 4, "ingredient": "polysorbate-60", "amount": {"value": 6.75, "unit": "g"}},
                                    {"row": 5, "ingredient": "glycerin", "amount": {"value": 10.03, "unit": "g"}},
                                    {"row": 6, "ingredient": "purified-water", "amount": {"value": 140.1, "unit": "g"}}],
                          "final_weight": {"value": 198.6, "unit": "g"}}},
}

# The hand lotion's compounding record: the same formula with a preservative
# (inline, as the registry holds none), invented suppliers, lots and dates.
_RECORD_SHEET = copy.deepcopy(EXAMPLES["createWorksheet"]["lotion"]["value"])
_RECORD_SHEET["ingredients"].insert(4, {"inline": {"name": "Phenoxyethanol", "physical_state": "liquid", "ionic_class": "nonionic"},
                                        "phase": "other", "share": {"value": 0.5, "unit": "% w/w"}})
EXAMPLES["createCompoundingRecord"] = {
    "lotion": {
        "summary": "The hand lotion's record: 200 g, preserved, compounded on 2026-12-02",
        "value": {
            "worksheet": _RECORD_SHEET,
            "preparation": {"name": "Hand lotion (demo)", "dosage_form": "lotion", "route": "topical",
                            "container": "250 mL white polyethylene bottle, screw cap", "formula_reference": "Pharmacy formula HL-1 (demo)",
                            "internal_id": "B-0001", "description": "white, smooth, pourable lotion"},
            "components": [
                {"ingredient": "light-mineral-oil", "supplier": "Supplier A (demo)", "lot": "LMO-2611", "expiry": "2028-06"},
                {"ingredient": "isopropyl-myristate", "supplier": "Supplier A (demo)", "lot": "IPM-2604", "expiry": "2027-09-30"},
                {"ingredient": "cetyl-alcohol", "supplier": "Supplier B (demo)", "lot": "CA-2588", "expiry": "2028-01"},
                {"ingredient": "sorbitan-monostearate", "supplier": "Supplier B (demo)", "lot": "SMS-2602", "expiry": "2027-11"},
                {"ingredient": "polysorbate-60", "supplier": "Supplier B (demo)", "lot": "PS60-2597", "expiry": "2027-08"},
                {"ingredient": "glycerin", "supplier": "Supplier A (demo)", "lot": "GLY-2620", "expiry": "2029-02"},
                {"name": "Phenoxyethanol", "supplier": "Supplier C (demo)", "lot": "PE-2615", "expiry": "2028-03", "preservative": True},
                {"ingredient": "purified-water", "supplier": "in-house (demo)", "lot": "PW-261202", "expiry": "2027-01"},
            ],
            "compounding": {"date": "2026-12-02", "prepared_by": "TK (demo)"},
        },
    },
}

# The unit's vanishing-cream base (invented for the demo): stearic acid a
# fifth neutralised by triethanolamine; and an oral mineral-oil emulsion.
EXAMPLES["soapInPlace"] = {
    "vanishing_cream": {
        "summary": "Stearic acid for a 200 g cream, a fifth neutralised by triethanolamine",
        "value": {"ingredient": "stearic-acid", "acid_mass": {"value": 30, "unit": "g"}, "base": "triethanolamine",
                  "neutralised_fraction": 0.2},
    },
    "cold_cream": {
        "summary": "White wax with the borax of a cold cream: the fraction neutralised",
        "value": {"ingredient": "white-wax", "acid_mass": {"value": 24, "unit": "g"}, "base": "sodium-borate",
                  "base_mass": {"value": 1, "unit": "g"}},
    },
}
EXAMPLES["gumEmulsion"] = {
    "mineral_oil": {
        "summary": "50 mL of mineral oil made into 100 mL of emulsion with acacia",
        "value": {"oil_kind": "mineral", "oil": {"ingredient": "mineral-oil"}, "oil_amount": {"value": 50, "unit": "mL"},
                  "final": {"value": 100, "unit": "mL"}},
    },
}

# Requests without a body: the query or path of each operation's example.
GET_EXAMPLES = {
    "listDaviesGroups": ("all", "The group numbers", "/v1/davies-groups"),
    "listIngredients": ("oleates", "Emulsifying agents whose name holds 'oleate'", "/v1/ingredients?q=oleate&function=emulsifier"),
    "getIngredient": ("polysorbate_80", "One surfactant with every value", "/v1/ingredients/polysorbate-80"),
    "listSources": ("all", "The bibliography", "/v1/sources"),
    "healthz": ("up", "The service is up", "/healthz"),
    "readyz": ("ready", "The registry is loaded", "/readyz"),
}
QUERY_EXAMPLES = {"listIngredients": {"q": "oleate", "function": "emulsifier"}}
PATH_EXAMPLES = {"getIngredient": {"ingredient_id": "polysorbate-80"}}


# The hand lotion's emulsifier system as three surfactants: the 10 g of the
# 200 g batch, polysorbate 80 held to at most a fifth of it; and the same with
# a ratio and a fixed share, chosen for the least ionic share.
EXAMPLES["solveBlend"] = {
    "three_surfactants": {
        "summary": "Three surfactants for HLB 11.6, one bounded, scaled to 10 g",
        "value": {
            "target_hlb": 11.6,
            "surfactants": [{"ingredient": "sorbitan-monostearate"}, {"ingredient": "polysorbate-60"},
                            {"ingredient": "polysorbate-80", "max_percent_w_w": 20}],
            "total": {"value": 10, "unit": "g"},
            "emulsion_type": "O/W",
        },
    },
    "ratio_and_fixed": {
        "summary": "Five surfactants, one fixed at 10 %, two in the ratio 1 : 2, the least ionic share",
        "value": {
            "target_hlb": 11.6,
            "surfactants": [{"ingredient": "sorbitan-monostearate"}, {"ingredient": "polysorbate-60"},
                            {"ingredient": "glyceryl-monostearate", "fixed_percent_w_w": 10}, {"ingredient": "polysorbate-80"},
                            {"ingredient": "sodium-lauryl-sulfate", "max_percent_w_w": 5}],
            "ratios": [{"a": 0, "b": 1, "a_parts": 1, "b_parts": 2}],
            "objective": "least_ionic",
            "emulsion_type": "O/W",
        },
    },
}


# A 100 g lotion of our own: 20 mL of light mineral oil in 80 mL of water,
# droplets of 2 µm, polysorbate 80 alone; and the same oil by mass, sized by a
# distribution, with a blend whose second member's figures are given.
EXAMPLES["emulsifierInterfaceEstimate"] = {
    "polysorbate_80": {
        "summary": "Polysorbate 80 on 20 mL of light mineral oil at d32 = 2 µm, beside the practice minimum",
        "value": {
            "dispersed_phase": {"ingredient": "light-mineral-oil", "amount": {"value": 20, "unit": "mL"}},
            "continuous_phase": {"ingredient": "purified-water", "amount": {"value": 80, "unit": "mL"}},
            "droplets": {"d32_um": 2},
            "surfactants": [{"ingredient": "polysorbate-80"}],
            "required_hlb": 12,
        },
    },
    "blend_and_distribution": {
        "summary": "A two-member blend by mole fractions, the droplet sizes as a distribution",
        "value": {
            "dispersed_phase": {"ingredient": "light-mineral-oil", "amount": {"value": 17, "unit": "g"}},
            "continuous_phase": {"ingredient": "purified-water", "amount": {"value": 80, "unit": "g"}},
            "droplets": {"distribution": [{"diameter_um": 1, "count": 600}, {"diameter_um": 2, "count": 300},
                                          {"diameter_um": 5, "count": 100}]},
            "surfactants": [{"ingredient": "polysorbate-80", "mole_fraction": 0.6},
                            {"ingredient": "sorbitan-monooleate", "mole_fraction": 0.4, "area_per_molecule": {"nm2": 0.5, "basis": "oil_water"},
                             "molar_mass_g_per_mol": 428.6}],
        },
    },
}

# A batch of our own: the lotion's two blend HLBs, its oil phase's required
# HLB, and a pair asked for an HLB it cannot reach (that item alone refused).
EXAMPLES["batch"] = {
    "lotion_checks": {
        "summary": "Two blend HLBs, a required HLB, and a refused pair, in one request",
        "value": {"items": [
            {"operation": "blendHlb", "body": copy.deepcopy(EXAMPLES["blendHlb"]["by_mass"]["value"])},
            {"operation": "blendHlb", "body": copy.deepcopy(EXAMPLES["blendHlb"]["by_volume"]["value"])},
            {"operation": "oilPhaseRequiredHlb", "body": copy.deepcopy(EXAMPLES["oilPhaseRequiredHlb"]["lotion"]["value"])},
            {"operation": "blendProportions", "body": {"target_hlb": 17.5, "pair": [{"ingredient": "sorbitan-monostearate"},
                                                                                     {"ingredient": "polysorbate-60"}]}},
        ]},
    },
}
