"""A registry root of many surfactants, for the benchmark only (not collected
by pytest: its name does not start with test_).

It copies the shipped tree (registry/data) into a folder of its own and adds
invented surfactant records until the registry holds `n` surfactants in all.
Every invented record says so: its name is "benchmark surfactant 0001", its
one HLB value cites the source `benchmark-invented`, whose citation says the
figures are invented for benchmarking, and its status is unverified. The
shipped tree and its review lock are never touched: the copy is written
elsewhere, and the invented values are unverified, so the copied lock
(which records only reviewed values) still matches.

The HLB values are spread over 1-18, with a mix of ionic classes and fatty
chains (some records with none), so that candidate-pair ranking meets every
one of its rules: same chain, balance, ionic members, anionic with cationic.

    python -m tests.benchmarks.big_registry DIR --n 1000
    EMULSION_REGISTRY_ROOT=DIR gunicorn -c service/gunicorn_conf.py ...
"""
from __future__ import annotations

import argparse
import shutil
from pathlib import Path

from registry import DEFAULT_ROOT, load_registry

SOURCE_ID = "benchmark-invented"
SOURCE_ENTRY = f'''
[sources.{SOURCE_ID}]
citation = "Invented for benchmarking (tests/benchmarks/big_registry.py): no substance, no measurement. Never use these figures."
kind = "practice_unpublished"
note = "Written only into a benchmark copy of the registry, never into registry/data."
'''
# Ionic classes in rough proportion to a real surfactant list: mostly
# nonionic, some ionic, so that the "never anionic with cationic" rule and the
# nonionic-first rule both have work to do.
IONIC_CLASSES = ("nonionic",) * 6 + ("anionic", "anionic", "cationic", "amphoteric")
FATTY_CHAINS = ("C12", "C14", "C16", "C18", "C18:1", None)
STATES = ("liquid", "semisolid", "solid")
# HLB from 1 to 18: a step that is coprime with the number of slots spreads
# consecutive records over the whole scale.
HLB_LOW, HLB_HIGH, HLB_SLOTS, HLB_STEP = 1.0, 18.0, 171, 37


def invented_record(number: int) -> tuple[str, str]:
    """The id and the TOML text of invented surfactant `number` (from 1)."""
    iid = f"benchmark-surfactant-{number:04d}"
    hlb = round(HLB_LOW + (HLB_HIGH - HLB_LOW) * ((number * HLB_STEP) % HLB_SLOTS) / (HLB_SLOTS - 1), 1)
    chain = FATTY_CHAINS[number % len(FATTY_CHAINS)]
    lines = ["# Invented for benchmarking: not a substance.",
             f'id = "{iid}"',
             f'name = "benchmark surfactant {number:04d}"',
             'roles = ["surfactant"]',
             f'ionic_class = "{IONIC_CLASSES[number % len(IONIC_CLASSES)]}"',
             f'physical_state = "{STATES[number % len(STATES)]}"']
    if chain is not None:
        lines.append(f'fatty_chain = "{chain}"')
    lines += ["",
              "[[values.hlb]]",
              f"value = {hlb}",
              f'source = "{SOURCE_ID}"',
              'locator = "tests/benchmarks/big_registry.py"',
              # The figure is computed by this script (kind "calculated",
              # with its method), not measured or read anywhere.
              'kind = "calculated"',
              'method = "invented: spread over 1-18 by the record number, for benchmarking"',
              'status = "unverified"',
              "recalled_from_memory = false",
              'note = "Invented for benchmarking; not a measurement."',
              "",
              "[functions]",
              'list = ["emulsifier"]',
              f'source = "{SOURCE_ID}"',
              'locator = "tests/benchmarks/big_registry.py"',
              'status = "unverified"',
              "recalled_from_memory = false"]
    return iid, "\n".join(lines) + "\n"


def write_big_registry(target: Path | str, n: int = 1000, source: Path | str = DEFAULT_ROOT) -> Path:
    """Write a registry root at `target` (which must not exist): a copy of
    `source` plus invented surfactants up to `n` surfactants in all. Returns
    the root, ready for load_registry or EMULSION_REGISTRY_ROOT."""
    target, source = Path(target), Path(source)
    if target.exists():
        raise FileExistsError(f"{target} exists; give a new folder")
    if source.resolve() in (target.resolve(), *target.resolve().parents):
        raise ValueError("the benchmark registry must not be written inside the shipped one")
    shutil.copytree(source, target)
    shipped = sum(1 for ingredient in load_registry(source).ingredients.values() if "surfactant" in ingredient.roles)
    with open(target / "sources.toml", "a", encoding="utf-8") as sources:
        sources.write(SOURCE_ENTRY)
    for number in range(1, max(0, n - shipped) + 1):
        iid, text = invented_record(number)
        (target / "ingredients" / f"{iid}.toml").write_text(text, encoding="utf-8")
    return target


def main(argv: list[str] | None = None) -> None:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("dir", type=Path, help="a new folder to write the registry root into")
    parser.add_argument("--n", type=int, default=1000, help="surfactants in all, shipped ones included (default 1000)")
    args = parser.parse_args(argv)
    root = write_big_registry(args.dir, args.n)
    registry = load_registry(root)
    count = sum(1 for ingredient in registry.ingredients.values() if "surfactant" in ingredient.roles)
    print(f"{root}: {count} surfactants, {len(registry.ingredients)} ingredients")


if __name__ == "__main__":
    main()
