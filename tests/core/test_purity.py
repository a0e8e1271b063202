"""service.core is importable on its own: no Flask, marshmallow or pint comes
in with it (service/core/README.md). Run in a fresh interpreter, since this
test session has long since imported all three."""
from __future__ import annotations

import os
import pkgutil
import subprocess
import sys
from pathlib import Path

import service.core

CORE_MODULES = sorted(f"service.core.{m.name}" for m in pkgutil.iter_modules(service.core.__path__))
FORBIDDEN = {"flask", "marshmallow", "pint"}


def test_core_modules_found():
    # Guards the test below against passing vacuously on an empty list.
    assert "service.core.aliquot" in CORE_MODULES and len(CORE_MODULES) > 10


def test_core_imports_no_framework():
    code = (
        f"import sys\nimport {', '.join(CORE_MODULES)}\n"
        f"print(sorted(set({sorted(FORBIDDEN)!r}) & {{m.split('.')[0] for m in sys.modules}}))"
    )
    root = Path(__file__).resolve().parents[2]
    env = {**os.environ, "PYTHONPATH": str(root)}
    result = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, env=env, cwd=root)
    assert result.returncode == 0, result.stderr
    assert result.stdout.strip() == "[]", f"service.core pulled in {result.stdout.strip()}"
