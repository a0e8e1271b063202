"""Fixtures the registry tests share."""
from __future__ import annotations

import shutil
from pathlib import Path

import pytest

from registry.loader import DEFAULT_ROOT


@pytest.fixture()
def tree(tmp_path) -> Path:
    """A copy of the shipped registry tree to edit."""
    root = tmp_path / "data"
    shutil.copytree(DEFAULT_ROOT, root)
    return root
