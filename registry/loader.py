"""Read a registry tree (and optionally a site overlay) from disk, validate
every file, and build the frozen Registry.

Both entry points go through every file and gather every fault, each named
by file and field. `load_registry` raises them together (RegistryFaults): the
service never serves a partial registry, and its start-up message lists
every fault. `check_tree` returns them, with the overlay's collisions, for the
steward's `check` command."""
from __future__ import annotations

import hashlib
import os
from dataclasses import dataclass, field
from pathlib import Path

from registry.errors import RegistryError, RegistryFaults
from registry.model import Ingredient, OverlayCollision, Registry, frozen_mapping
from registry.records import (Faults, beyond_use_dates, davies, folder_fault, ingredient, override, read_toml, rel, release,
                              sources_table, toml_files, under)
from registry.validation import SCHEMA_DIR, schema_faults, validator

PACKAGE_DIR = Path(__file__).resolve().parent
DEFAULT_ROOT = PACKAGE_DIR / "data"
TREE_FILES = ("registry.toml", "sources.toml", "davies_groups.toml", "beyond_use_dates.toml", "ingredients")

__all__ = ["DEFAULT_ROOT", "SCHEMA_DIR", "TREE_FILES", "TreeCheck", "check_tree", "load_registry"]


@dataclass
class TreeCheck:
    """What `check_tree` found: the registry (None when any file is at
    fault), every fault, and where the site overlay meets shipped records."""

    registry: Registry | None
    errors: list[RegistryError]
    collisions: list[OverlayCollision] = field(default_factory=list)


class _Builder:
    """The state of one load: records so far, the lookup index, the faults."""

    def __init__(self):
        self.errors: list[RegistryError] = []
        self.ingredients: dict[str, Ingredient] = {}
        self.names: dict[str, str] = {}  # casefolded name or synonym -> id
        self.files: dict[str, str] = {}  # shipped id -> its file, as faults name it
        self.shadowed: dict[str, Ingredient] = {}
        self.collisions: list[OverlayCollision] = []

    def table(self, path: Path, tree_root: Path, build, *args):
        """Read one whole-tree file and build it, keeping its faults."""
        try:
            data = read_toml(path, tree_root)
        except RegistryError as exc:
            self.errors.append(exc)
            return None
        faults = Faults(rel(path, tree_root))
        built = build(data, faults, *args)
        self.errors.extend(faults.errors)
        return built

    def ingredient_file(self, path: Path, tree_root: Path, local: bool, sources: dict | None) -> None:
        file = rel(path, tree_root)
        try:
            data = read_toml(path, tree_root)
        except RegistryError as exc:
            self.errors.append(exc)
            return
        iid = data["id"] if isinstance(data.get("id"), str) else None
        base = self.ingredients.get(iid) if local and iid else None
        shipped = base if base is not None and not base.local else None
        # A site file for a shipped id adds values to it, unless it is a whole
        # record (a name and [functions]): then it is the site's own record,
        # written before the registry shipped one of that id (FIELDS.md).
        whole = shipped is None or ("name" in data and "functions" in data)
        faults = Faults(file)
        found = schema_faults(data, validator("ingredient.schema.json", override=not whole), file)
        faults.errors.extend(error for _, error in found)
        bad = {where for where, _ in found}
        if iid is not None and iid != path.stem:
            faults.add("id", f"id '{iid}' differs from the file name '{path.stem}'")
        if not whole:
            self._override(shipped, data, faults, sources, bad)
            return
        claimed = self._labels(data, iid, file, local, faults, bad)
        record = ingredient(data, faults, sources, local, bad)
        self.errors.extend(faults.errors)
        if record is None or faults.errors:
            return
        if shipped is not None:
            self.shadowed[iid] = shipped
            self.collisions.append(OverlayCollision("id", iid, "id", iid, file, iid, self.files[iid]))
            # The shipped record is set aside, and its names with it (those
            # still its own): looked up by label, not by a scan of every name,
            # so that an overlay of many records costs no more than its size.
            for label in [shipped.name, *shipped.synonyms]:
                if self.names.get(label.casefold()) == iid:
                    del self.names[label.casefold()]
        if record.retired:
            # A retired site record gives its shared names back: lookups never
            # offer a retired record, so they would find nothing by them.
            taken = {c.label.casefold() for c in claimed}
            claimed = []
        else:
            taken = set()
        self.collisions += claimed
        for label in [record.name, *record.synonyms]:
            if label.casefold() not in taken:
                self.names[label.casefold()] = iid
        self.ingredients[iid] = record
        if not local:
            self.files[iid] = file

    def _override(self, shipped: Ingredient, data: dict, faults: Faults, sources: dict | None, bad: set) -> None:
        # The overlay adds local values; what a shipped ingredient does, and
        # how it is handled, are the registry's statements, and a local one
        # could not be told apart.
        refused = [table for table in ("functions", "processing") if table in data]
        for table in refused:
            faults.add(table, f"a site overlay cannot change a shipped ingredient's {table} (a whole site record, "
                       "with its own name and [functions], would set the shipped one aside: see registry/FIELDS.md)")
        if refused:
            record = None
        else:
            record = override(shipped, data, faults, sources, bad)
        self.errors.extend(faults.errors)
        if record is not None and not faults.errors:
            self.ingredients[shipped.id] = record

    def _labels(self, data: dict, iid: str | None, file: str, local: bool, faults: Faults, bad: set) -> list[OverlayCollision]:
        """Check that no name or synonym names another ingredient. A site
        record may take one from a shipped record: that is a collision, not
        a fault, so that an upgrade shipping it cannot stop the site."""
        name = data.get("name")
        if not isinstance(name, str) or under(bad, ("name",)) or under(bad, ("synonyms",)):
            return []
        claimed = []
        for where, label in [("name", name)] + [("synonyms", s) for s in data.get("synonyms", ())]:
            owner = self.names.get(label.casefold())
            if owner is None or owner == iid:
                continue
            if local and not self.ingredients[owner].local:
                claimed.append(OverlayCollision("label", label, where, iid, file, owner, self.files[owner]))
            else:
                faults.add("synonyms", f"'{label}' already names ingredient '{owner}'")
        return claimed


def _digest(root: Path, paths: list[Path]) -> str:
    digest = hashlib.sha256()
    for path in paths:
        digest.update(path.relative_to(root).as_posix().encode() + b"\0" + path.read_bytes() + b"\0")
    return digest.hexdigest()


def _tree_files(b: _Builder, folder: Path, tree_root: Path) -> list[Path] | None:
    """A folder's *.toml files, or None (its fault recorded) when it cannot be listed."""
    try:
        return toml_files(folder, tree_root)
    except RegistryError as exc:
        b.errors.append(exc)
        return None


def _overlay(b: _Builder, overlay: Path, sources: dict | None) -> tuple[dict, list[Path]]:
    """Apply the site overlay: (the sources with the site's, the overlay's files read)."""
    fault = folder_fault(overlay, str(overlay), "the site overlay")
    if fault is None and not os.path.lexists(overlay / "ingredients"):
        fault = RegistryError(str(overlay), "(folder)", "a site overlay needs an ingredients/ folder")
    fault = fault or folder_fault(overlay / "ingredients", rel(overlay / "ingredients", overlay), "the site overlay's ingredients/")
    if fault is not None:
        b.errors.append(fault)
        return dict(sources or {}), []
    all_sources = dict(sources or {})
    site_sources_ok = True
    site_sources_path = overlay / "sources.toml"
    # lexists: a link to nothing, or a loop, is a fault to report, not an absent file.
    has_sources = os.path.lexists(site_sources_path)
    if has_sources:
        local = b.table(site_sources_path, overlay, sources_table, True)
        site_sources_ok = local is not None
        for sid in local or {}:
            if sid in all_sources:
                b.errors.append(RegistryError(rel(site_sources_path, overlay), f"sources/{sid}", "a site source cannot reuse a shipped source's id"))
        all_sources.update(local or {})
    paths = _tree_files(b, overlay / "ingredients", overlay) or []
    checkable = all_sources if sources is not None and site_sources_ok else None
    for path in paths:
        b.ingredient_file(path, overlay, True, checkable)
    return all_sources, [site_sources_path] * has_sources + paths


def _build(root: Path, overlay: Path | None) -> TreeCheck:
    fault = folder_fault(root, str(root), "the registry root")
    if fault is not None:
        return TreeCheck(None, [fault])
    b = _Builder()
    release_path, sources_path, davies_path, bud_path = (root / name for name in TREE_FILES[:4])
    for required in (release_path, sources_path, davies_path, bud_path, root / "ingredients"):
        if not os.path.lexists(required):
            return TreeCheck(None, [RegistryError(rel(required, root), "(file)", "missing from the registry tree")])
    fault = folder_fault(root / "ingredients", rel(root / "ingredients", root), "the registry's ingredients/")
    if fault is not None:
        return TreeCheck(None, [fault])

    sources = b.table(sources_path, root, sources_table, False)
    tables = b.table(release_path, root, release, sources)
    groups = b.table(davies_path, root, davies, sources)
    buds = b.table(bud_path, root, beyond_use_dates, sources)
    listed = _tree_files(b, root / "ingredients", root)
    ingredient_paths = listed or []
    for path in ingredient_paths:
        b.ingredient_file(path, root, False, sources)
    if listed == []:
        b.errors.append(RegistryError(rel(root / "ingredients", root), "(folder)", "holds no ingredient files"))

    overlay_paths: list[Path] = []
    all_sources = dict(sources or {})
    if overlay is not None:
        all_sources, overlay_paths = _overlay(b, Path(overlay), sources)

    if b.errors or tables is None or groups is None or buds is None:
        return TreeCheck(None, b.errors, b.collisions)
    release_number, hlb_ranges, levels, dispersibility = tables
    registry = Registry(
        release=release_number,
        # The data files only: reviewed.lock.toml is derived from them (see
        # registry/review.py), and the service never reads it.
        # Digests are taken only once every file was read as a regular file.
        digest=_digest(root, [release_path, sources_path, davies_path, bud_path, *ingredient_paths]),
        ingredients=frozen_mapping(b.ingredients),
        sources=frozen_mapping(all_sources),
        hlb_ranges=hlb_ranges,
        davies_groups=frozen_mapping(groups),
        emulsifier_levels=levels,
        overlay_digest=_digest(Path(overlay), overlay_paths) if overlay is not None else None,
        overlay_root=str(overlay) if overlay is not None else None,
        names=frozen_mapping(b.names),
        shadowed=frozen_mapping(b.shadowed),
        collisions=tuple(b.collisions),
        water_dispersibility=dispersibility,
        beyond_use_dates=buds,
    )
    return TreeCheck(registry, [], b.collisions)


def load_registry(root: Path | str = DEFAULT_ROOT, overlay: Path | str | None = None) -> Registry:
    """Load and validate the registry tree at `root` (registry.toml,
    sources.toml, davies_groups.toml, beyond_use_dates.toml, ingredients/), with an optional site
    overlay folder (ingredients/, optional sources.toml). Raises
    RegistryFaults (a RegistryError naming the first) listing every fault.
    Where the overlay meets shipped records, `Registry.collisions` says how."""
    checked = _build(Path(root), Path(overlay) if overlay else None)
    if checked.errors:
        raise RegistryFaults(checked.errors)
    return checked.registry


def check_tree(root: Path | str = DEFAULT_ROOT, overlay: Path | str | None = None) -> TreeCheck:
    """Validate a tree and report every fault found, and every collision."""
    return _build(Path(root), Path(overlay) if overlay else None)
