"""From a loaded request to the core's inputs: registry ids or inline values
become figures with their provenance, and amounts become canonical floats.

This is the edge where request units (through service.units) meet the core.

Lookups every calculation shares: the values an ingredient brings, with
their provenance recorded in values_used, and strict mode's refusal."""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Sequence

from registry import Ingredient, Registry, ValueRecord
from registry.lookup import closest, either
from registry.model import PLAUSIBLE_DENSITY_G_PER_ML
from service.core.amounts import ABSOLUTE, Amount
from service.core.blend import HlbValue
from service.core.errors import InvalidInput, UnverifiedValuesRefused, pointer
from service.units import to_canonical
from service.usecases.provenance import ValueUsed, ValuesUsed, figures_differ

DENSITY_RANGE_G_PER_ML = PLAUSIBLE_DENSITY_G_PER_ML
# Relative slack of the plausibility bounds: a figure at a bound, converted
# from another unit, may land a few ulps outside it.
BOUND_SLACK = 1e-9

RHLB_PROPERTY = {"O/W": "required_hlb_ow", "W/O": "required_hlb_wo"}


def invalid(path: tuple, rule: str, detail: str) -> InvalidInput:
    return InvalidInput.at(path, rule, detail)


def refused(faults: list[dict]) -> InvalidInput:
    """One InvalidInput for several faults, summed up by the first."""
    first = faults[0]
    return InvalidInput(faults, f"{len(faults)} input fault(s); first at {first['pointer']}: {first['detail']}")


class Faults:
    """The faults of one request, gathered across its items and steps so that
    the caller is told of every one in a single answer, not one per round
    trip. A step that fails gives None and the work goes on; raise_any()
    then refuses them all together, before anything is computed from the Nones."""

    def __init__(self):
        self.found: list[dict] = []

    def add(self, path: tuple, rule: str, detail: str) -> None:
        self.found.extend(invalid(path, rule, detail).faults)

    def run(self, fn, *args):
        """fn(*args), or None with its faults kept when it refuses the input."""
        try:
            return fn(*args)
        except InvalidInput as exc:
            self.found.extend(exc.faults)
            return None

    def each(self, fn, items) -> list:
        """fn(item) for every item, each fault kept and the others still done."""
        return [self.run(fn, item) for item in items]

    def raise_any(self) -> None:
        if self.found:
            raise refused(self.found)


@dataclass
class Resolved:
    """An ingredient named in a request, with the values it brings."""

    ingredient_id: str | None
    name: str
    ionic_class: str
    physical_state: str | None
    hlb_is_apparent: bool
    record: Ingredient | None
    inline: dict = field(default_factory=dict)
    density_override: dict | None = None
    path: tuple = ()

    @property
    def origin(self) -> str:
        return "registry" if self.record is not None else "caller"

    @property
    def label(self) -> str:
        return self.ingredient_id or f"inline '{self.name}'"


def unknown_ingredient(registry: Registry, ingredient_id: str) -> tuple[str, list[str]]:
    """What to say of an id the registry lacks: the detail, with the closest
    ids ("did you mean"), and those ids."""
    near = closest(registry, ingredient_id)
    hint = f": did you mean {either(near)}?" if near else ""
    return f"no ingredient '{ingredient_id}' in the registry{hint} (GET /v1/ingredients?q= searches by name or synonym)", near


def _references(data, path: tuple = (), found: list | None = None) -> list:
    """(path, id) of every registry reference in a loaded request, in body
    order: every object with an `ingredient` member is one (IngredientRefSchema).
    Collected into one list rather than yielded through nested generators,
    and only containers are descended into: it runs on every request."""
    if found is None:
        found = []
    if isinstance(data, dict):
        if isinstance(data.get("ingredient"), str):
            found.append((path, data["ingredient"]))
        for key, value in data.items():
            if isinstance(value, (dict, list)):
                _references(value, path + (key,), found)
    elif isinstance(data, list):
        for i, value in enumerate(data):
            if isinstance(value, (dict, list)):
                _references(value, path + (i,), found)
    return found


def check_references(data: dict, registry: Registry) -> None:
    """Refuse, in one 422, every ingredient id in the request that is unknown
    or retired, each by its pointer; an unknown one comes with the closest
    ids. Run before a calculation, so that a request with several wrong ids
    is put right in one round."""
    errors, near_by_id = [], {}
    for path, iid in _references(data):
        record = registry.get(iid)
        if record is not None and not record.retired:
            continue
        where = pointer(path + ("ingredient",))
        if record is None:
            if iid not in near_by_id:
                near_by_id[iid] = unknown_ingredient(registry, iid)
            detail, near = near_by_id[iid]
            errors.append({"pointer": where, "rule": "known_ingredient", "detail": detail, "suggestions": near})
        elif record.retired:
            errors.append({"pointer": where, "rule": "current_ingredient",
                           "detail": f"ingredient '{record.id}' was retired on {record.retired_on}: {record.retired_reason}"})
    if errors:
        raise InvalidInput(errors, f"{len(errors)} unknown or retired ingredient(s); first at {errors[0]['pointer']}: {errors[0]['detail']}")


def resolve(ref: dict, path: tuple, registry: Registry) -> Resolved:
    """Resolve {ingredient | inline, density?} at `path` in the body."""
    override = ref.get("density")
    if "ingredient" in ref:
        record = registry.get(ref["ingredient"])
        if record is None:
            # check_references has refused every id in the request before this;
            # an id the service supplies itself (a default vehicle) may still land here.
            detail, near = unknown_ingredient(registry, ref["ingredient"])
            raise InvalidInput.at(path + ("ingredient",), "known_ingredient", detail, suggestions=near)
        if record.retired:
            raise invalid(path + ("ingredient",), "current_ingredient", f"ingredient '{record.id}' was retired on {record.retired_on}: {record.retired_reason}")
        return Resolved(record.id, record.name, record.ionic_class, record.physical_state, record.hlb_is_apparent, record,
                        density_override=override, path=path)
    inline = ref["inline"]
    return Resolved(None, inline["name"], inline.get("ionic_class", "unspecified"), inline.get("physical_state"), False, None,
                    inline=inline, density_override=override, path=path)


def spans(ing: Ingredient, prop: str) -> tuple[tuple[float, float], tuple[float, float] | None]:
    """The span of a property's current values with those flagged doubtful
    left out (the documented rule), and the span with them where any are."""
    return ing.span_without_doubtful(prop), (ing.span(prop) if ing.has_doubtful(prop) else None)


def _registry_value(item: Resolved, record: ValueRecord, registry: Registry, unit: str | None) -> ValueUsed:
    ing = item.record
    span, wide = spans(ing, record.property)
    return ValueUsed.from_registry(ingredient=item.ingredient_id, name=item.name, path=item.path, record=record, registry=registry,
                                   low=span[0], high=span[1], unit=unit, local=record.local,
                                   sources_disagree=figures_differ(ing.comparable(record.property)), range_with_doubtful=wide)


def _caller_value(item: Resolved, prop: str, figure: float, unit: str | None) -> ValueUsed:
    return ValueUsed.from_caller(ingredient=item.ingredient_id, name=item.name, path=item.path, property=prop, figure=figure, unit=unit)


def scalar_value(item: Resolved, prop: str, inline_key: str, registry: Registry) -> tuple[HlbValue, ValueUsed] | None:
    """An HLB-like value (hlb, required_hlb_ow, required_hlb_wo) and its record
    for values_used; None when none is known."""
    if item.record is None:
        if inline_key not in item.inline:
            return None
        figure = item.inline[inline_key]
        return HlbValue(figure, figure, figure), _caller_value(item, prop, figure, None)
    record = item.record.preferred(prop)
    if record is None:
        return None
    (low, high), wide = spans(item.record, prop)
    return HlbValue(record.figure, low, high, wide), _registry_value(item, record, registry, None)


def density_value(item: Resolved, registry: Registry) -> tuple[float, ValueUsed] | None:
    """Density in g/mL and its record: the request's override, then the
    inline value, then the registry's preferred value."""
    given = item.density_override or item.inline.get("density")
    if given is not None:
        where = item.path + (("density",) if item.density_override else ("inline", "density"))
        g_per_ml = checked_density(given, where)
        return g_per_ml, _caller_value(item, "density", g_per_ml, "g/mL")
    if item.record is None:
        return None
    record = item.record.preferred("density")
    if record is None:
        return None
    return record.figure, _registry_value(item, record, registry, "g/mL")


def checked_density(given: dict, path: tuple) -> float:
    """A density from the request in g/mL, refused when implausible."""
    _, g_per_ml = to_canonical(given["value"], given["unit"])
    low, high = DENSITY_RANGE_G_PER_ML
    if not low * (1 - BOUND_SLACK) <= g_per_ml <= high * (1 + BOUND_SLACK):
        raise invalid(path + ("value",), "plausible_density",
                      f"{g_per_ml:g} g/mL is not a plausible density for a pharmaceutical ingredient ({low:g} to {high:g} g/mL): check the unit")
    return g_per_ml


def amount(given: dict) -> Amount:
    """A request amount {value, unit} as a core Amount in g, mL, parts or % w/w."""
    kind, value = to_canonical(given["value"], given["unit"])
    return Amount(kind, value)

# Class A prescription balance (USP <1176>): sensitivity requirement 6 mg, and
# the acceptable error pharmacies commonly work to, 5 %.
DEFAULT_SENSITIVITY_G = 0.006
DEFAULT_ERROR_PERCENT = 5.0
# Balance increment a batch amount is rounded up to (common practice, no source).
BATCH_INCREMENT_G = 0.01


# Minimum-estimate margin when the request names none: a rough lower bound
# plus a quarter (common practice, no source). Stated in every answer using it.
DEFAULT_ESTIMATE_MARGIN_PERCENT = 25.0
# Highest usual emulsifier level when a registry holds no table of them: the
# figure the shipped table gives polysorbates and sorbitan esters alone.
FALLBACK_USUAL_EMULSIFIER_HIGH_PERCENT = 15.0


def usual_emulsifier_high_percent(registry: Registry) -> float:
    """The highest usual emulsifier level (% w/w, used alone) the registry holds."""
    levels = registry.emulsifier_levels
    if levels is None or not levels.families:
        return FALLBACK_USUAL_EMULSIFIER_HIGH_PERCENT
    return max(level.alone[1] for level in levels.families)


def enforce_strict(values_used: ValuesUsed, strict: bool) -> None:
    """Strict mode: refuse registry values not yet checked against their
    source, naming each. Caller-supplied values are the caller's to vouch for."""
    if not strict:
        return
    refused = [v for v in values_used if v.unverified_registry_value]
    if refused:
        errors = [{"pointer": v.pointer, "rule": "verified_values_only",
                   "detail": f"{v.ingredient} {v.property} ({v.figure:g}, source {v.source.id}) is unverified"} for v in refused]
        raise UnverifiedValuesRefused(errors, f"strict mode: {len(refused)} value(s) used here are not yet checked against their source")


def hlb_ranges(registry: Registry) -> dict[str, tuple[float, float]]:
    return {name: (r.low, r.high) for name, r in registry.hlb_ranges.ranges.items()}


def densities_for(items: Sequence[Resolved], needed: Sequence[bool], registry: Registry, values_used: ValuesUsed,
               strict: bool, faults: Faults | None = None) -> list[float | None]:
    """Each item's density where one is known. `needed[i]` says the result
    depends on it (a volume to convert); otherwise it only reports a volume,
    so in strict mode an unverified one is left out rather than refused.
    Every implausible density given is refused, all at once; with `faults`
    they are kept there instead, for the caller to refuse with its own."""
    out, found_faults = [], faults if faults is not None else Faults()
    for item, need in zip(items, needed):
        found = found_faults.run(density_value, item, registry)
        if found is None or (strict and not need and found[1].status == "unverified"):
            out.append(None)
            continue
        out.append(found[0])
        values_used.add(found[1])
    if faults is None:
        found_faults.raise_any()
    return out


def density_given(item: Resolved) -> bool:
    """The request gives this item a density (an override, or inline)."""
    return (item.density_override or item.inline.get("density")) is not None


def amount_densities(items, amounts: Sequence[Amount], registry, values_used, strict, faults: Faults | None = None) -> list[float | None]:
    """Densities for amounts: none at all for relative amounts. Every amount
    by volume whose density is unknown is refused, all of them at once (the
    core would name only the first), with any implausible density given;
    with `faults` they are kept there instead."""
    if not any(a.kind in ABSOLUTE for a in amounts):
        return [None] * len(items)
    found_faults = faults if faults is not None else Faults()
    volumes = [a.kind == "volume" for a in amounts]
    densities = densities_for(items, volumes, registry, values_used, strict, found_faults)
    for item, by_volume, density in zip(items, volumes, densities):
        # A density given but implausible is refused already, at its own pointer.
        if by_volume and density is None and not density_given(item):
            found_faults.add(item.path + ("amount",), "density_needed_for_volume",
                             f"an amount by volume needs the density of {item.label}, and none is known: give it with 'density', or give a mass")
    if faults is None:
        found_faults.raise_any()
    return densities


# One refusal code per kind of value, whatever the emulsion type.
KNOWN_RULES = {"hlb": "hlb_known", "required_hlb_ow": "required_hlb_known", "required_hlb_wo": "required_hlb_known"}


def required_value(item: Resolved, prop: str, inline_key: str, registry: Registry, values_used: ValuesUsed, what: str):
    found = scalar_value(item, prop, inline_key, registry)
    if found is None:
        where = item.path + (("inline", inline_key) if item.record is None else ("ingredient",))
        raise invalid(where, KNOWN_RULES[prop], f"no {what} is known for {item.label}: describe the ingredient inline with a value from your own source, or choose another ingredient")
    values_used.add(found[1])
    return found[0]
