"""The layering in DEVELOPERS.md, checked by import-linter against the
contracts in pyproject.toml's [tool.importlinter]: a broken contract fails
the test run and names the offending import chain."""
from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
# The console script installed beside this interpreter, so the venv's own
# import-linter runs whichever way pytest was started.
LINT_IMPORTS = Path(sys.executable).with_name("lint-imports")


def lint(*args: str) -> subprocess.CompletedProcess:
    env = {**os.environ, "PYTHONPATH": str(ROOT)}
    # --no-cache: no .import_linter_cache left in the tree.
    return subprocess.run([str(LINT_IMPORTS), "--no-cache", *args], capture_output=True, text=True, env=env, cwd=ROOT)


def test_layering_contracts_kept():
    result = lint()
    assert result.returncode == 0, result.stdout + result.stderr
    assert "0 broken" in result.stdout


def test_a_broken_contract_fails(tmp_path):
    # Guards the test above: the linter must report a contract the code breaks.
    config = tmp_path / "broken.toml"
    config.write_text(
        '[tool.importlinter]\nroot_packages = ["service", "registry"]\ninclude_external_packages = true\n'
        '[[tool.importlinter.contracts]]\nname = "deliberately broken"\ntype = "forbidden"\n'
        'source_modules = ["service.http"]\nforbidden_modules = ["flask"]\n'
    )
    result = lint("--config", str(config))
    assert result.returncode != 0
    assert "deliberately broken BROKEN" in result.stdout
