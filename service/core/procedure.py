"""The compounding procedure of a hot-process (or cold-process) emulsion in
steps, from the formula's rows: which vessel each component goes into, the
temperature the phases are heated to, the order of addition, cooling, the
late additions and the q.s. Every rule here is the usual practice of the
trade (common practice, no source) and each step says so, for the
pharmacist to confirm; the data it works on (melting ranges, where a
surfactant dissolves, volatility) come from the registry with their sources.

Temperatures are degrees Celsius throughout."""
from __future__ import annotations

import math
from dataclasses import dataclass, field

from service.core.findings import Finding

# Phases are usually heated to about 70-75 degC (common practice, no source);
# a component melting higher needs the oil phase this far above its melting
# range's top to melt it fully and keep it molten while the phases are
# combined (common practice, no source).
USUAL_HEATING_C = 70.0
ABOVE_MELTING_C = 5.0
# Heat-sensitive and volatile components go in once the emulsion has cooled
# below this (common practice, no source).
LATE_ADDITION_BELOW_C = 40.0
# Above this an aqueous phase loses water quickly and nears boiling: the
# pharmacist should reconsider the method (common practice, no source).
HIGH_PROCESS_C = 90.0

COMMON_PRACTICE = "common_practice"
REGISTRY_DATA = "registry_data"
PHARMACIST = "pharmacist_to_decide"


@dataclass(frozen=True)
class ProcedureRow:
    label: str
    phase: str                      # oil | aqueous | other | emulsifier
    role: str                       # ingredient | emulsifier | qs
    physical_state: str | None      # liquid | semisolid | solid | None (unknown)
    mass_g: float
    dissolves_in: str | None = None     # oil | water, for a surfactant: where it goes
    dissolves_in_basis: str | None = None
    melting_top_c: float | None = None
    melting_basis: str | None = None
    # What the figure is, in words: a melting range's top, a congealing
    # temperature or a drop point, which the pharmacopoeias measure each its
    # own way (e.g. "congealing temperature 54 °C"); the note quotes it.
    melting_figure: str | None = None
    # A melting range on record but left out (strict mode: unverified); its
    # top and basis, so the procedure can say what was not used.
    melting_left_out_top_c: float | None = None
    melting_left_out_basis: str | None = None
    late: str | None = None         # "volatile" | "heat-sensitive": added on cooling
    is_water: bool = False


@dataclass(frozen=True)
class Step:
    number: int
    phase: str          # weigh | oil | aqueous | heat | combine | cool | late | qs | finish
    text: str
    basis: str          # common_practice | registry_data | pharmacist_to_decide
    basis_note: str


@dataclass
class Procedure:
    steps: list[Step]
    oil_phase_c: float | None
    aqueous_phase_c: float | None
    highest_melting: ProcedureRow | None
    heated: bool
    findings: list[Finding] = field(default_factory=list)


def _vessel(row: ProcedureRow) -> str:
    """oil | aqueous | late | other: where a row goes before emulsifying."""
    if row.late:
        return "late"
    if row.phase in ("oil", "aqueous"):
        return row.phase
    if row.phase == "emulsifier" and row.dissolves_in in ("oil", "water"):
        return "oil" if row.dissolves_in == "oil" else "aqueous"
    return "other"


def _needs_melting(row: ProcedureRow) -> bool:
    return row.physical_state in ("solid", "semisolid")


# What can set the processing temperature, with its meaning.
SET_BY = {
    "melting_range": "5 degC above the highest melting range's top, rounded up to a whole 5 degC (common practice, no source).",
    "usual_floor": "The usual 70 degC: nothing melts above 65 degC (common practice, no source).",
    "cold_process": "Nothing needs melting: the phases may be combined at room temperature.",
}


@dataclass(frozen=True)
class Heating:
    """The one heating rule's answer: the temperature both phases go to
    (None for a cold process) and what set it."""

    temperature_c: float | None
    heated: bool
    set_by: str                                 # melting_range | usual_floor | cold_process
    highest: ProcedureRow | None                # the highest-melting row whose range was used
    used: list[ProcedureRow]                    # the rows melted, each with its melting range used
    unknown: list[ProcedureRow]                 # solids with no melting range on record
    left_out: list[ProcedureRow]                # solids whose range was left out (strict mode: unverified)


def rounded_heating_c(melting_tops_c: list[float]) -> float:
    """The usual 70 degC, or 5 degC above the highest melting range's top,
    rounded up to a whole 5 degC."""
    wanted = max([USUAL_HEATING_C] + [t + ABOVE_MELTING_C for t in melting_tops_c])
    return 5.0 * math.ceil(wanted / 5.0 - 1e-9)


def heating(rows: list[ProcedureRow]) -> Heating:
    """The temperature the phases are heated to, from the rows that go into
    the oil phase and need melting (solids and semisolids):
    the usual floor, raised by the melting ranges used. Nothing to melt: a
    cold process (temperature None)."""
    # The oil phase is melted; solids of the aqueous phase (a water-soluble
    # surfactant, a preservative) are dissolved in the water, never melted
    # (FIELDS.md, "Melting ranges"): sodium lauryl sulfate, melting near
    # 200 degC, would otherwise set the temperature.
    hot = [r for r in rows if _vessel(r) == "oil" and _needs_melting(r)]
    used = [r for r in hot if r.melting_top_c is not None]
    unknown = [r for r in hot if r.melting_top_c is None and r.melting_left_out_top_c is None]
    left_out = [r for r in hot if r.melting_top_c is None and r.melting_left_out_top_c is not None]
    if not hot:
        return Heating(None, False, "cold_process", None, [], [], [])
    highest = max(used, key=lambda r: r.melting_top_c) if used else None
    temperature = rounded_heating_c([r.melting_top_c for r in used])
    set_by = "melting_range" if highest and highest.melting_top_c + ABOVE_MELTING_C > USUAL_HEATING_C else "usual_floor"
    return Heating(temperature, True, set_by, highest, used, unknown, left_out)


def heating_note(h: Heating) -> str:
    """What set the temperature, in words, with each melting range's basis."""
    if not h.heated:
        return "no component of the oil phase needs melting: the phases may be combined at room temperature"
    if h.highest:
        why = (f"{ABOVE_MELTING_C:g} °C above it, rounded up to a whole 5 °C" if h.set_by == "melting_range" else
               f"{ABOVE_MELTING_C:g} °C above it is not above the usual {USUAL_HEATING_C:g} °C, which is used")
        note = (f"the highest-melting component of the oil phase is {h.highest.label}, {h.highest.melting_figure or f'melting range up to {h.highest.melting_top_c:g} °C'} "
                f"({h.highest.melting_basis}); {why}")
    else:
        note = f"no melting range is used for the solids; the usual {USUAL_HEATING_C:g} °C is used"
    if h.unknown:
        note += f"; no melting range is on record for {', '.join(r.label for r in h.unknown)}: heat until melted"
    if h.left_out:
        note += (f"; the melting range on record for {', '.join(r.label for r in h.left_out)} is unverified and left out (strict mode): "
                 "heat until melted")
    return note


def left_out_findings(h: Heating) -> list[Finding]:
    """Strict mode left an unverified melting range out: said, with the
    temperature it would have set, never dropped silently."""
    out = []
    for r in h.left_out:
        would = rounded_heating_c([r.melting_left_out_top_c])
        out.append(Finding("melting_range_unverified_not_used", subject=r.label,
                           message=f"the melting range on record for {r.label}, up to {r.melting_left_out_top_c:g} °C "
                                   f"({r.melting_left_out_basis}), is unverified and strict mode does not use it: alone it would set "
                                   f"{would:g} °C; heat until every solid has melted, and set the temperature by the material's specification"))
    return out


def _names(rows: list[ProcedureRow]) -> str:
    return ", ".join(f"{r.label} ({r.mass_g:.6g} g)" for r in rows)


def procedure(emulsion_type: str, rows: list[ProcedureRow], batch_g: float) -> Procedure:
    vessels = {v: [r for r in rows if _vessel(r) == v] for v in ("oil", "aqueous", "late", "other")}
    oil, aqueous, late, other = vessels["oil"], vessels["aqueous"], vessels["late"], vessels["other"]
    findings: list[Finding] = []
    steps: list[tuple[str, str, str, str]] = []
    practice = "common practice, no source: for the pharmacist to confirm"

    steps.append(("weigh", "Weigh or measure every component as the worksheet lists it, and have each checked against the worksheet.", COMMON_PRACTICE, practice))

    heat = heating(rows)
    heated, highest, oil_c = heat.heated, heat.highest, heat.temperature_c

    def placed(vessel: list[ProcedureRow]) -> tuple[str, str]:
        """A vessel's basis: where its surfactants' placing comes from."""
        surfactants = [r for r in vessel if r.phase == "emulsifier"]
        if not surfactants:
            return COMMON_PRACTICE, practice
        why = "; ".join(f"{r.label}: {r.dissolves_in}-soluble ({r.dissolves_in_basis})" for r in surfactants)
        return REGISTRY_DATA, f"a surfactant goes into the phase it dissolves or disperses in: {why}"

    if oil:
        steps.append(("oil", f"Oil phase: in a suitable vessel combine {_names(oil)}.", *placed(oil)))
    if aqueous:
        qs = [r for r in aqueous if r.role == "qs"]
        keep = " Keep back part of the q.s. vehicle, to make up to weight at the end." if qs else ""
        steps.append(("aqueous", f"Aqueous phase: in a second vessel dissolve or disperse {_names(aqueous)}.{keep}", *placed(aqueous)))
    if other:
        which = "it goes" if len(other) == 1 else "they go"
        steps.append(("other", f"{_names(other)}: the service holds no data on which phase {which} into; add "
                      f"{'it' if len(other) == 1 else 'each'} as the formula's reference directs.", PHARMACIST,
                      "no registry data on the phase: the pharmacist decides"))
        findings.append(Finding("procedure_phase_unknown", subject="other", message=f"no phase is known for {', '.join(r.label for r in other)}: the procedure leaves it to the pharmacist"))

    if heated:
        melt_note = heating_note(heat)
        if heat.unknown:
            names = ", ".join(r.label for r in heat.unknown)
            findings.append(Finding("melting_range_unknown", subject=names,
                                    message=f"no melting range is on record for {names}: heat until every solid has "
                                    "melted, and set the temperature by the material's specification"))
        findings += left_out_findings(heat)
        steps.append(("heat", f"Heat the oil phase on a water bath to about {oil_c:g} °C, stirring until every solid has melted; heat the "
                      f"aqueous phase to the same temperature (a few degrees above is usual, so that nothing congeals when the phases meet). "
                      "Hot oils and waxes cause burns.", COMMON_PRACTICE, f"{melt_note}; common practice, no source: for the pharmacist to confirm"))
        if oil_c >= HIGH_PROCESS_C:
            findings.append(Finding("high_process_temperature", subject=highest.label if highest else "oil phase",
                                    message=f"the oil phase must reach about {oil_c:g} °C, near the boiling point of the aqueous phase: water "
                                    "evaporates quickly; consider melting the high-melting component in part of the oil first"))
    else:
        steps.append(("heat", "No component needs melting: the phases may be combined at room temperature (a cold process).",
                      COMMON_PRACTICE, practice))

    internal, external = ("oil", "aqueous") if emulsion_type == "O/W" else ("aqueous", "oil")
    at = " at temperature" if heated else ""
    steps.append(("combine", f"Add the {internal} phase (the dispersed phase) slowly to the {external} phase (the continuous phase){at}, "
                  "stirring continuously.", COMMON_PRACTICE, f"the internal phase goes into the external one; {practice}"))
    if heated:
        steps.append(("cool", f"Keep stirring gently while the emulsion cools to below {LATE_ADDITION_BELOW_C:g} °C; avoid beating in air. "
                      "It thickens as it congeals.", COMMON_PRACTICE, practice))
    if late:
        when = f"once the emulsion is below {LATE_ADDITION_BELOW_C:g} °C" if heated else "last"
        steps.append(("late", f"Add {_names(late)} {when}, with stirring: {', '.join(f'{r.label} is {r.late}' for r in late)}.",
                      REGISTRY_DATA, f"volatile or heat-sensitive components go in on cooling; {practice}"))
    qs = [r for r in rows if r.role == "qs"]
    if qs:
        steps.append(("qs", f"Make up to the batch weight, {batch_g:.6g} g, with {qs[0].label} (q.s.), and mix until uniform.", COMMON_PRACTICE, practice))
    else:
        steps.append(("qs", f"Weigh the finished emulsion against the batch, {batch_g:.6g} g; the formula is stated in full, so there is no q.s.",
                      COMMON_PRACTICE, practice))
    steps.append(("finish", "Transfer to the container(s), weigh the contents, label, and record the quality checks.", COMMON_PRACTICE, practice))
    numbered = [Step(i + 1, *s) for i, s in enumerate(steps)]
    return Procedure(numbered, oil_c, oil_c, highest, heated, findings)
