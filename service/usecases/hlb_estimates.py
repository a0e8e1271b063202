"""HLB estimated from composition, end to end. Molar masses from formulas
are computed here, at the edge, with molmass."""
from __future__ import annotations

from molmass import Formula, FormulaError

from registry import Registry
from service.usecases import methods
from service.core import findings as core_findings
from service.usecases.answers import envelope, finding_warnings, hlb_display, unrounded
from service.core.estimates import (
    Scope,
    check_griffin_scope,
    davies,
    griffin_mass_fraction,
    griffin_oxyethylene,
    griffin_saponification,
)
from service.usecases.provenance import ValueUsed, ValuesUsed, figures_differ
from service.usecases.resolution import hlb_ranges, Faults, enforce_strict, invalid

MAX_MOLAR_MASS = 1e6

SCOPES = {
    "griffin_mass_fraction": methods.GRIFFIN_SCOPE,
    "griffin_saponification": methods.GRIFFIN_SCOPE,
    "griffin_oxyethylene": methods.GRIFFIN_SCOPE,
    "davies": "Davies' group contributions apply to ionic and nonionic surfactants alike; ionic values lie off Griffin's scale.",
}


def _molar(part: dict, path: tuple) -> tuple[float, set[str]]:
    """Molar mass in g/mol and the elements present (empty when only a molar
    mass was given)."""
    if "molar_mass_g_per_mol" in part:
        return part["molar_mass_g_per_mol"], set()
    try:
        formula = Formula(part["formula"])
        mass = formula.mass
        elements = set(formula.composition().keys())
    except FormulaError as exc:
        raise invalid(path + ("formula",), "valid_formula", f"not a molecular formula: {str(exc).splitlines()[0]}") from None
    if not 0 < mass <= MAX_MOLAR_MASS:
        raise invalid(path + ("formula",), "plausible_molar_mass", f"gives {mass:g} g/mol, outside 0 to {MAX_MOLAR_MASS:g}")
    return mass, elements


def _group_values(data: dict, registry: Registry) -> tuple[list[dict], ValuesUsed, list[tuple[float, float]]]:
    contributions, values_used, terms, faults = [], ValuesUsed(), [], Faults()
    for i, g in enumerate(data["groups"]):
        group = registry.davies_groups.get(g["group"])
        if group is None:
            # Every unknown group is named, not the first alone.
            faults.add(("groups", i, "group"), "known_group", f"no Davies group '{g['group']}'; GET /v1/davies-groups lists them")
            continue
        record = next((r for r in group.values if r.preferred and not r.retired), group.values[0])
        current = [r for r in group.values if not r.retired]
        values_used.add(ValueUsed.from_registry(
            ingredient=None, name=f"Davies group {group.id} ({group.formula})", property="davies_group_number", path=("groups", i),
            record=record, registry=registry, low=min(r.low for r in current), high=max(r.high for r in current), unit=None,
            local=False, sources_disagree=figures_differ(current)))
        contributions.append({"group": group.id, "formula": group.formula, "number": record.figure, "count": g["count"],
                              "contribution": record.figure * g["count"]})
        terms.append((record.figure, g["count"]))
    faults.raise_any()
    return contributions, values_used, terms


def estimate(data: dict, registry: Registry, strict: bool = False) -> dict:
    method = data["method"]
    warnings, values_used = [], ValuesUsed()
    contributions = molar = None
    weaknesses = [methods.IDEALISED] if method.startswith("griffin") else []
    if method.startswith("griffin"):
        elements: set[str] = set()
        if method == "griffin_mass_fraction":
            faults = Faults()
            hydrophile, molecule = faults.run(_molar, data["hydrophile"], ("hydrophile",)), faults.run(_molar, data["molecule"], ("molecule",))
            faults.raise_any()
            (mh, eh), (m, em) = hydrophile, molecule
            elements = eh | em
            molar = {"hydrophile_g_per_mol": mh, "molecule_g_per_mol": m,
                     "computed_from_formulas": "formula" in data["hydrophile"] or "formula" in data["molecule"]}
        scope = Scope(data.get("ionic_class", "nonionic"), data.get("has_oxypropylene", False),
                      data.get("contains_nitrogen", False) or "N" in elements, data.get("contains_sulfur", False) or "S" in elements)
        check_griffin_scope(scope)
        if method == "griffin_mass_fraction":
            hlb = griffin_mass_fraction(molar["hydrophile_g_per_mol"], molar["molecule_g_per_mol"])
            chosen = methods.GRIFFIN_MASS_FRACTION
        elif method == "griffin_saponification":
            hlb = griffin_saponification(data["saponification_number"], data["acid_number"])
            chosen = methods.GRIFFIN_SAPONIFICATION
        else:
            hlb = griffin_oxyethylene(data["oxyethylene_percent"], data.get("polyol_percent", 0.0))
            chosen = methods.GRIFFIN_OXYETHYLENE
    else:
        contributions, values_used, terms = _group_values(data, registry)
        enforce_strict(values_used, strict)
        hlb = davies(terms)
        chosen = methods.DAVIES
        weaknesses.append("Davies' method badly underestimates ethoxylated surfactants (Guo, Rong & Ying 2006).")
        if any(c["group"] == "oxyethylene" for c in contributions):
            warnings.append({"code": "davies_ethoxylate", "subject": "oxyethylene",
                             "message": "this surfactant is ethoxylated: Davies' method badly underestimates its HLB; prefer Griffin's E/5 for a nonionic"})
        if hlb > 20.0:
            warnings.append({"code": "off_griffin_scale", "subject": None,
                             "message": f"HLB {hlb:.1f} lies above Griffin's 0 to 20 scale, as ionic values do; mix it with nonionic HLBs only with care"})
    warnings += finding_warnings([core_findings.usual_range_finding(hlb, data.get("emulsion_type"), hlb_ranges(registry), "estimated HLB")])
    result = {"method": method, "hlb": hlb_display(hlb), "hlb_unrounded": unrounded(hlb), "scope": SCOPES[method],
              "weaknesses": weaknesses, "contributions": contributions, "molar_masses": molar}
    return envelope(result, {"request": data}, chosen, values_used, warnings, registry, strict=strict)
