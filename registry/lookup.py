"""Finding ingredients by what people call them: a search by name, synonym
or id, and the ids closest to one that is not in the registry.

Both go through `Registry.names`, so that a shipped name or synonym a site
record has claimed finds the site record only (registry/FIELDS.md, "The
site overlay"). Retired records are never offered."""
from __future__ import annotations

import difflib
import re

from registry.model import Ingredient, Registry

# How alike (difflib's ratio, 0 to 1) a name must be to be suggested: its
# default, which keeps "polysorbate-8" -> polysorbate-80 and drops noise.
SUGGESTION_CUTOFF = 0.6
MAX_SUGGESTIONS = 3


def labels(registry: Registry, ing: Ingredient) -> list[str]:
    """The record's name and synonyms that lookups find it by."""
    return [label for label in (ing.name, *ing.synonyms) if registry.names.get(label.casefold()) == ing.id]


def search(registry: Registry, text: str) -> list[Ingredient]:
    """Current ingredients whose id, name or a synonym holds `text`
    (case-insensitive), sorted by name."""
    needle = text.casefold()
    found = [ing for ing in registry.ingredients.values()
             if not ing.retired and (needle in ing.id or any(needle in label.casefold() for label in labels(registry, ing)))]
    return sorted(found, key=lambda ing: (ing.name.casefold(), ing.id))


def _id_form(text: str) -> str:
    # "Polysorbate 80" compares with polysorbate-80 as the id it would have.
    return re.sub(r"[^0-9a-z]+", "-", text.casefold()).strip("-")


def closest(registry: Registry, word: str, n: int = MAX_SUGGESTIONS) -> list[str]:
    """Up to `n` current ids nearest to `word` by difflib's ratio, compared
    with each id and with each name and synonym written as an id; best
    first, ties in alphabetical order."""
    by_form: dict[str, str] = {}
    for ing in registry.ingredients.values():
        if ing.retired:
            continue
        for form in [ing.id, *map(_id_form, labels(registry, ing))]:
            by_form.setdefault(form, ing.id)
    # difflib.get_close_matches, with ties broken alphabetically rather than
    # in reverse (polysorbate-80 before polysorbate-85).
    matcher = difflib.SequenceMatcher()
    matcher.set_seq2(_id_form(word))
    scored = []
    for form in by_form:
        matcher.set_seq1(form)
        if matcher.real_quick_ratio() >= SUGGESTION_CUTOFF and matcher.quick_ratio() >= SUGGESTION_CUTOFF:
            ratio = matcher.ratio()
            if ratio >= SUGGESTION_CUTOFF:
                scored.append((-ratio, form))
    out: list[str] = []
    for _, form in sorted(scored):
        if by_form[form] not in out:
            out.append(by_form[form])
    return out[:n]


def either(ids: list[str]) -> str:
    """'a', 'b' or 'c', for a "did you mean" message."""
    quoted = [f"'{i}'" for i in ids]
    return quoted[0] if len(quoted) == 1 else ", ".join(quoted[:-1]) + " or " + quoted[-1]
