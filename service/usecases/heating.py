"""What heating a batch needs of its rows, the one place the worksheet and
the compounding record get it: each row's melting range (with its source),
where a surfactant goes, what goes in late, and the ethoxylated surfactants'
cloud points; the temperature itself is service.core.procedure.heating.

Strict mode, as for a density that only reports a volume: an unverified
melting range does not set the temperature (it is left out, and a warning
names it with the temperature it would have set), and an unverified cloud
point is still warned about, said to be unverified, but is not listed among
the values used (strict mode refuses those). No Flask here."""
from __future__ import annotations

from registry import Registry
from registry.model import UNITS
from service.core.cloud_point import CloudPoint, below_processing
from service.core.procedure import Heating, ProcedureRow, heating, heating_note, left_out_findings
from service.usecases.answers import finding_warnings
from service.usecases.provenance import ValueUsed, ValuesUsed, figures_differ
from service.usecases.resolution import spans


def _basis(registry: Registry, value) -> str:
    source = registry.sources[value.source_id]
    return f"{source.id}{', ' + value.locator if value.locator else ''}, {value.status}"


# How the note names a figure, by its `basis` in the registry.
_FIGURE_WORDS = {"melting_range": "melting range up to", "congealing_range": "congealing temperature", "drop_point": "drop point"}


def _figure(melting, low: float, high: float) -> str:
    words = _FIGURE_WORDS.get(melting.basis or "melting_range", "melting range up to")
    if low == high and words == "melting range up to":
        words = "melting point"
    if melting.conditions and "lower limit" in melting.conditions:
        # A pharmacopeial minimum only: the material may melt higher.
        return f"{words.removesuffix(' up to')} not lower than {high:g} °C (a lower limit only)"
    return f"{words} {high:g} °C"


def processing_row(row: dict, entry: dict, registry: Registry, hlb_by_row: dict, values_used: ValuesUsed, path: tuple,
                   strict: bool = False) -> ProcedureRow:
    """What heating and the procedure need of a worksheet row: where it goes,
    what melts it, and whether it goes in late; each from the registry, with
    its source. `entry` is the record's component entry ({} for a worksheet)."""
    record = registry.get(row["ingredient"]) if row["ingredient"] else None
    melting = record.preferred("melting_range") if record else None
    top, melting_basis, left_out_top, left_out_basis, figure = None, None, None, None, None
    if melting is not None:
        # The top of every current source's range: enough heat to melt the
        # material whichever source is right.
        low, high = spans(record, "melting_range")[0]
        used = ValueUsed.from_registry(ingredient=record.id, name=record.name, path=path, record=melting, registry=registry,
                                       low=low, high=high, unit=UNITS["melting_range"], local=melting.local,
                                       sources_disagree=figures_differ(record.comparable("melting_range")))
        if strict and used.unverified_registry_value:
            left_out_top, left_out_basis = high, _basis(registry, melting)
        else:
            top, melting_basis, figure = high, _basis(registry, melting), _figure(melting, low, high)
            values_used.add(used, key=lambda v: (v.ingredient, v.property))
    processing = record.processing if record else None
    dissolves_in, basis = None, None
    if row["phase"] == "emulsifier":
        if processing is not None and processing.dissolves_in:
            dissolves_in = processing.dissolves_in
            basis = _basis(registry, processing)
        elif hlb_by_row.get(row["ingredient"] or row["name"]) is not None:
            hlb = hlb_by_row[row["ingredient"] or row["name"]]
            table = registry.water_dispersibility
            band = table.band_for(hlb)
            if band is not None:
                dissolves_in = band.dissolves_in
                basis = f"HLB {hlb:.1f}: {band.description} ({table.source_id}, {table.status})"
    late = None
    if entry.get("volatile") or (processing is not None and processing.volatile):
        late = "volatile"
    elif entry.get("heat_sensitive") or (processing is not None and processing.heat_sensitive):
        late = "heat-sensitive"
    water = bool(record and "aqueous_vehicle" in record.functions)
    return ProcedureRow(row["name"], row["phase"], row["role"], row["physical_state"], row["mass_g"], dissolves_in=dissolves_in,
                        dissolves_in_basis=basis, melting_top_c=top, melting_basis=melting_basis, melting_figure=figure,
                        melting_left_out_top_c=left_out_top,
                        melting_left_out_basis=left_out_basis, late=late, is_water=water)


def hlb_by_row(values_used: ValuesUsed) -> dict:
    """The HLB each surfactant was used at in the worksheet, by id or name."""
    return {v.ingredient or v.name: v.figure for v in values_used if v.property == "hlb"}


def cloud_points(rows: list[dict], registry: Registry, values_used: ValuesUsed, strict: bool, rows_path: tuple) -> list[CloudPoint]:
    """The cloud point on record for each row that has one (only ethoxylated
    surfactants do), with its source and status; listed in values_used unless
    strict mode would refuse it (it is then only warned about)."""
    out = []
    for i, row in enumerate(rows):
        record = registry.get(row["ingredient"]) if row["ingredient"] else None
        value = record.preferred("cloud_point") if record else None
        if value is None:
            continue
        low, high = spans(record, "cloud_point")[0]
        used = ValueUsed.from_registry(ingredient=record.id, name=record.name, path=rows_path + (i,), record=value,
                                       registry=registry, low=low, high=high, unit=UNITS["cloud_point"], local=value.local,
                                       sources_disagree=figures_differ(record.comparable("cloud_point")))
        if not (strict and used.unverified_registry_value):
            values_used.add(used, key=lambda v: (v.ingredient, v.property))
        memory = ", recalled from memory" if value.recalled_from_memory else ""
        conditions = f"{value.conditions}; " if value.conditions else ""
        # The preferred figure; where another current source gives a lower
        # one, that is the figure compared (the surfactant clouds at the
        # first of them whichever is right), and the basis says so.
        other = f"; its figure {value.figure:g} °C, another source's lower" if low < value.figure else ""
        basis = f"{conditions}{_basis(registry, value)}{memory}{other}"
        out.append(CloudPoint(row["name"], low, basis, used.unverified_registry_value))
    return out


def processing_block(heat: Heating) -> dict:
    """The worksheet's processing temperature and what set it."""
    return {
        "temperature_c": heat.temperature_c, "heated": heat.heated, "set_by": heat.set_by, "note": heat_note(heat),
        "melting_ranges": [{"name": r.label, "top_c": r.melting_top_c, "basis": r.melting_basis} for r in heat.used],
        "without_melting_range": [r.label for r in heat.unknown],
        "unverified_left_out": [{"name": r.label, "top_c": r.melting_left_out_top_c, "basis": r.melting_left_out_basis} for r in heat.left_out],
    }


def heat_note(heat: Heating) -> str:
    basis = "common practice, no source: for the pharmacist to confirm"
    return f"{heating_note(heat)}; {basis}"


def worksheet_heating(result: dict, registry: Registry, values_used: ValuesUsed, strict: bool) -> tuple[dict, list[dict]]:
    """The worksheet's processing temperature block and its warnings (an
    unverified melting range left out; a cloud point below the temperature)."""
    hlbs = hlb_by_row(values_used)
    rows_path = ("result", "rows")
    rows = [processing_row(row, {}, registry, hlbs, values_used, rows_path + (i,), strict) for i, row in enumerate(result["rows"])]
    heat = heating(rows)
    warnings = finding_warnings(left_out_findings(heat))
    warnings += cloud_point_warnings(result["rows"], heat.temperature_c, registry, values_used, strict, rows_path)
    return processing_block(heat), warnings


def cloud_point_warnings(rows: list[dict], processing_c: float | None, registry: Registry, values_used: ValuesUsed,
                         strict: bool, rows_path: tuple) -> list[dict]:
    """A warning for each cloud point on record below the processing temperature."""
    return finding_warnings(below_processing(cloud_points(rows, registry, values_used, strict, rows_path), processing_c))


# Codes the worksheet's heating warns with; a compounding record warns with
# its own, from its procedure, in their place.
HEATING_CODES = ("melting_range_unverified_not_used", "cloud_point_below_processing")
