"""The benchmark's generated registry (tests/benchmarks/big_registry.py):
accepted by the loader and by the steward's check (the review lock included),
every invented record marked as invented and unverified, and the shipped tree
left as it was. The benchmark itself is run by hand, not here."""
from __future__ import annotations

from registry import DEFAULT_ROOT, load_registry
from registry import cli
from tests.benchmarks.big_registry import SOURCE_ID, write_big_registry


def test_a_copy_with_invented_surfactants_that_the_loader_and_the_check_accept(tmp_path, capsys):
    shipped_before = load_registry().version
    root = write_big_registry(tmp_path / "big", n=200)
    registry = load_registry(root)
    surfactants = [i for i in registry.ingredients.values() if "surfactant" in i.roles]
    assert len(surfactants) == 200
    invented = [i for i in surfactants if i.id.startswith("benchmark-surfactant-")]
    assert invented and all(i.name.startswith("benchmark surfactant ") for i in invented)
    hlbs = []
    for ingredient in invented:
        (value,) = ingredient.values["hlb"]
        assert value.source_id == SOURCE_ID and value.status == "unverified"
        hlbs.append(value.low)
    # Spread over the scale, with the ionic classes and chains pair ranking sorts by.
    assert min(hlbs) < 2 and max(hlbs) > 17
    assert {"nonionic", "anionic", "cationic"} <= {i.ionic_class for i in invented}
    assert len({i.fatty_chain for i in invented}) > 3
    assert "invented" in registry.sources[SOURCE_ID].citation.lower()
    assert cli.main(["check", "--root", str(root)]) == 0
    assert load_registry().version == shipped_before
    assert not (DEFAULT_ROOT / "ingredients" / "benchmark-surfactant-0001.toml").exists()
