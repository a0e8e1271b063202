"""Helpers the registry tests share: run the steward's command, edit a file."""
from __future__ import annotations

from pathlib import Path

from registry.cli import main


def run(capsys, *argv):
    code = main(list(map(str, argv)))
    out, err = capsys.readouterr()
    return code, out, err


def edit(path: Path, old: str, new: str) -> None:
    text = path.read_text()
    assert old in text
    path.write_text(text.replace(old, new, 1))
