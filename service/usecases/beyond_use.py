"""The beyond-use date of a compounded nonsterile emulsion: which of the
registry's default categories (USP <795>) applies, decided from the
formula and the record's inputs, and the date it gives once the
components' expiry dates are weighed in. Every decision is stated with the
rule that made it; a category that cannot be decided is refused, naming
the field that would decide it."""
from __future__ import annotations

import datetime as dt

from registry import Registry
from service.core.beyond_use import Expiry, beyond_use_date, parse_expiry
from service.core.errors import CalculationError
from service.usecases.provenance import source_block
from service.usecases.resolution import invalid

LIQUID_FORMS = ("lotion", "emulsion")
# A compounding date outside these years is a slip of the keyboard.
PLAUSIBLE_YEARS = (2000, 2100)
STORAGE_TEXT = {
    # USP General Notices' storage definitions (from memory, not read).
    "refrigerator": "Store in a refrigerator, 2 °C to 8 °C (36 °F to 46 °F).",
    "controlled_room_temperature": "Store at controlled room temperature, 20 °C to 25 °C (68 °F to 77 °F).",
}
STORAGE_NAMES = {"refrigerator": "refrigerator (2 °C to 8 °C)", "controlled_room_temperature": "controlled room temperature (20 °C to 25 °C)"}


def parse_day(text: str, path: tuple) -> dt.date:
    """A calendar day as YYYY-MM-DD; anything else is refused."""
    try:
        day, month_only = parse_expiry(text, path)
    except CalculationError:
        raise invalid(path, "date_format", f"'{text}' is not a date: give YYYY-MM-DD") from None
    if month_only:
        raise invalid(path, "date_format", f"'{text}' is a month: give the day, YYYY-MM-DD")
    if not PLAUSIBLE_YEARS[0] <= day.year <= PLAUSIBLE_YEARS[1]:
        raise invalid(path, "date_format", f"{day.isoformat()} is outside the years {PLAUSIBLE_YEARS[0]} to {PLAUSIBLE_YEARS[1]}: check the date")
    return day


def _provenance(item, registry: Registry) -> dict:
    return {"source": source_block(registry.sources[item.source_id]), "locator": item.locator, "status": item.status,
            "recalled_from_memory": item.recalled_from_memory}


def _water(prep: dict, rows: list[dict], registry: Registry, threshold: float) -> tuple[str, str]:
    """aqueous | nonaqueous, and why."""
    if "water_activity" in prep:
        aw = prep["water_activity"]
        kind = "aqueous" if aw >= threshold else "nonaqueous"
        return kind, f"measured water activity {aw:g} is {'at or above' if kind == 'aqueous' else 'below'} {threshold:g}"
    water = [r for r in rows if r["ingredient"] and "aqueous_vehicle" in (registry.get(r["ingredient"]).functions or ())]
    if water:
        return "aqueous", (f"the formula contains water ({', '.join(r['name'] for r in water)}): an emulsion that contains water is an "
                           f"aqueous preparation, its water activity taken to be at least {threshold:g} unless measured")
    aqueous_rows = [r for r in rows if r["phase"] == "aqueous"]
    if not aqueous_rows:
        return "nonaqueous", "the formula has no aqueous phase and no water"
    raise invalid(("preparation", "water_activity"), "bud_category_decidable",
                  f"the aqueous phase ({', '.join(r['name'] for r in aqueous_rows)}) holds no water the registry knows of, so whether the "
                  f"preparation is aqueous (water activity {threshold:g} or more) cannot be decided: measure its water activity and give "
                  "preparation.water_activity")


def _preserved(prep: dict, components: list[dict]) -> tuple[bool, str]:
    named = [c["label"] for c in components if c.get("preservative")]
    if "preserved" in prep:
        if prep["preserved"] and not named:
            raise invalid(("preparation", "preserved"), "preservative_named",
                          "preserved is true but no component is marked preservative: mark the preservative in components")
        if not prep["preserved"]:
            return False, "stated not preserved" + (f" (the preservative {', '.join(named)} is not relied on)" if named else "")
        return True, f"stated preserved, with {', '.join(named)}"
    if named:
        return True, f"preserved with {', '.join(named)} (marked preservative in components)"
    return False, "no component is marked preservative"


def _form(prep: dict) -> tuple[str, str]:
    if prep["route"] == "oral" and prep["dosage_form"] in LIQUID_FORMS:
        return "oral_liquid", "an oral liquid"
    return "other", f"a {prep['dosage_form']} for {prep['route']} use"


def beyond_use_block(prep: dict, compounded_on: dt.date, components: list[dict], rows: list[dict], registry: Registry) -> dict:
    """The beyond-use date with every decision that led to it.
    `components` are the record's components with `label` and a parsed
    `expiry` (Expiry) where given."""
    table = registry.beyond_use_dates
    water, water_why = _water(prep, rows, registry, table.aw_threshold)
    preserved, preserved_why = (_preserved(prep, components) if water == "aqueous" else (None, "not asked of a nonaqueous preparation"))
    form, form_why = _form(prep) if water == "nonaqueous" else (None, "not asked of an aqueous preparation")
    category = table.category(water, preserved, form)
    if category is None:
        raise invalid(("preparation",), "bud_category_decidable",
                      f"no default beyond-use category of the registry fits a {water} preparation (preserved: {preserved}, form: {form})")
    storage = prep.get("storage")
    if storage is not None and storage not in category.storage:
        raise invalid(("preparation", "storage"), "storage_for_bud_category",
                      f"the category '{category.description}' allows storage in: {', '.join(STORAGE_NAMES[s] for s in category.storage)}; "
                      f"not {STORAGE_NAMES[storage]}")
    storage_why = "as stated" if storage else f"not stated: the first the category allows ({', '.join(category.storage)})"
    storage = storage or category.storage[0]
    expiries = [c["expiry"] for c in components if c.get("expiry") is not None]
    missing = [c["label"] for c in components if c.get("expiry") is None]
    bud = beyond_use_date(compounded_on, category.days, expiries)
    if bud.decided_by == "category_limit":
        rule = f"{category.days} days from the compounding date ({compounded_on.isoformat()}), the category's limit"
    else:
        lot = f", lot {bud.earliest.lot}" if bud.earliest.lot else ""
        rule = (f"the earliest component expiry, {bud.earliest.label}{lot} on {bud.earliest.date.isoformat()}, which comes before the category's "
                f"limit of {category.days} days ({bud.limit_date.isoformat()})")
    aqueous_categories = [c for c in table.categories if c.water == "aqueous"]
    implication = None
    if water == "aqueous":
        implication = ("An aqueous preparation supports microbial growth and hydrolysis, so its default beyond-use dates are the shortest: "
                       + "; ".join(f"{c.description}: {c.days} days, {' or '.join(STORAGE_NAMES[s] for s in c.storage)}" for c in aqueous_categories)
                       + ". A longer date needs a stability study of this preparation.")
    earliest = bud.earliest
    return {
        "date": bud.date.isoformat(),
        "provisional": bool(missing),
        "decided_by": bud.decided_by,
        "rule": rule,
        "counted_from": compounded_on.isoformat(),
        "limit_date": bud.limit_date.isoformat(),
        "earliest_component_expiry": ({"component": earliest.label, "lot": earliest.lot, "date": earliest.date.isoformat(),
                                       "month_only": earliest.month_only} if earliest else None),
        "components_without_expiry": missing,
        "category": {**_provenance(category, registry), "id": category.id, "description": category.description, "days": category.days,
                     "storage": list(category.storage), "note": category.note},
        "decisions": {"water": water, "water_basis": water_why, "preserved": preserved, "preserved_basis": preserved_why,
                      "form": form, "form_basis": form_why},
        "aqueous_implication": implication,
        "storage": storage, "storage_basis": storage_why, "storage_text": STORAGE_TEXT[storage],
        "table_rules": {**_provenance(table, registry), "water_activity_threshold": table.aw_threshold,
                        "rules": [{**_provenance(rule.provenance, registry), "id": rule.id, "text": rule.text} for rule in table.rules.values()]},
        "caution": ("A default beyond-use date, for use where no USP-NF compounded preparation monograph or stability study of this "
                    "preparation applies: a stability study may support another date, and local rules or the pharmacy's own standards "
                    "may set a shorter one."),
    }


def component_expiry(component: dict, label: str, path: tuple) -> Expiry | None:
    if "expiry" not in component:
        return None
    day, month_only = parse_expiry(component["expiry"], path + ("expiry",))
    return Expiry(label, component.get("lot"), day, month_only, path + ("expiry",))
