"""Request examples published in the OpenAPI document (and exercised by the
schemathesis run). The scenario is invented: a 200 g batch of a hand lotion
at a hospital's compounding unit."""
from __future__ import annotations

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
}
