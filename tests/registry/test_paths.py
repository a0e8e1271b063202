"""What the loader says of a path it cannot use: a registry root or site
overlay missing, unreadable, a loop of links or not a folder, and a *.toml
that is not a regular file. Each is a RegistryError naming the path, never an
OSError's traceback, and a named pipe is never opened (it would wait for a
writer for ever). Common practice, no source."""
from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path

import pytest

from registry.errors import RegistryError, RegistryFaults
from registry.loader import check_tree, load_registry

ROOT = Path(__file__).resolve().parents[2]


def overlay_dir(tmp_path: Path) -> Path:
    site = tmp_path / "site"
    (site / "ingredients").mkdir(parents=True)
    return site


def fault_of(root, overlay=None) -> RegistryError:
    with pytest.raises(RegistryFaults) as err:
        load_registry(root, overlay)
    assert len(err.value.errors) == 1, str(err.value)
    return err.value.errors[0]


def loop(path: Path) -> Path:
    os.symlink(path.name + ".other", path)
    os.symlink(path.name, path.with_name(path.name + ".other"))
    return path


@pytest.mark.parametrize("make, message", [
    (lambda p: p, "the registry root is missing (or is a symbolic link to nothing)"),
    (lambda p: (p.write_text("x"), p)[1], "the registry root is a regular file, not a folder"),
    (loop, "the registry root is a loop of symbolic links"),
])
def test_a_registry_root_that_cannot_be_walked(tmp_path, make, message):
    root = make(tmp_path / "data")
    fault = fault_of(root)
    assert (fault.file, fault.field, fault.message) == (str(root), "(folder)", message)


@pytest.mark.parametrize("make, message", [
    (lambda p: p, "the site overlay is missing (or is a symbolic link to nothing)"),
    (lambda p: (p.write_text("x"), p)[1], "the site overlay is a regular file, not a folder"),
    (loop, "the site overlay is a loop of symbolic links"),
    (lambda p: (os.mkfifo(p), p)[1], "the site overlay is a named pipe (FIFO), not a folder"),
])
def test_a_site_overlay_that_cannot_be_walked(tmp_path, make, message):
    site = make(tmp_path / "site")
    fault = fault_of(ROOT / "registry" / "data", site)
    assert (fault.file, fault.field, fault.message) == (str(site), "(folder)", message)


def test_an_overlay_whose_ingredients_is_not_a_folder(tmp_path):
    site = tmp_path / "site"
    site.mkdir()
    (site / "ingredients").write_text("")
    fault = fault_of(ROOT / "registry" / "data", site)
    assert (fault.file, fault.message) == ("site/ingredients", "the site overlay's ingredients/ is a regular file, not a folder")


def test_an_unreadable_folder_is_named(tmp_path, monkeypatch):
    # The suite may run as root, which reads every folder: the refusal is
    # made by the operating system, so it is simulated at os.scandir.
    site = overlay_dir(tmp_path)
    real = os.scandir

    def scandir(path="."):
        if Path(path) == site:
            raise PermissionError(13, "Permission denied", str(path))
        return real(path)

    monkeypatch.setattr(os, "scandir", scandir)
    fault = fault_of(ROOT / "registry" / "data", site)
    assert (fault.file, fault.message) == (str(site), "the site overlay cannot be read: permission denied")


def test_an_error_while_reading_a_file_names_it(tree, monkeypatch):
    target = tree / "ingredients" / "olive-oil.toml"
    real = Path.read_text

    def read_text(self, *args, **kwargs):
        if self == target:
            raise OSError(5, "Input/output error", str(self))
        return real(self, *args, **kwargs)

    monkeypatch.setattr(Path, "read_text", read_text)
    fault = fault_of(tree)
    assert (fault.file, fault.field, fault.message) == ("data/ingredients/olive-oil.toml", "(file)",
                                                        "the file cannot be read: Input/output error")


@pytest.mark.parametrize("make, message", [
    (lambda p: p.mkdir(), "is a folder, not a regular file (it was not opened)"),
    (loop, "the file is a loop of symbolic links"),
    (lambda p: os.symlink("nowhere.toml", p), "the file is missing (or is a symbolic link to nothing)"),
])
def test_an_ingredient_entry_that_is_not_a_regular_file(tree, make, message):
    make(tree / "ingredients" / "odd.toml")
    fault = fault_of(tree)
    assert (fault.file, fault.field, fault.message) == ("data/ingredients/odd.toml", "(file)", message)


def test_a_shipped_file_that_is_a_loop_is_named(tree):
    (tree / "sources.toml").unlink()
    loop(tree / "sources.toml")
    assert "data/sources.toml: (file): the file is a loop of symbolic links" in [str(e) for e in check_tree(tree).errors]


def test_a_linked_regular_file_is_read(tree, tmp_path):
    # A link to a regular file is a regular file: sites deploy with links.
    target = tmp_path / "olive-oil.toml"
    (tree / "ingredients" / "olive-oil.toml").rename(target)
    os.symlink(target, tree / "ingredients" / "olive-oil.toml")
    assert load_registry(tree).ingredients["olive-oil"]


# In a child process with a timeout: a loader that opened the pipe would wait
# for a writer for ever, and must fail this test, not hang the suite.
FIFO_CHECK = """
import sys
from registry.loader import check_tree
print("\\n".join(str(e) for e in check_tree(sys.argv[1], sys.argv[2] if len(sys.argv) > 2 else None).errors))
"""


@pytest.mark.parametrize("where", ["site", "shipped"])
def test_a_named_pipe_is_refused_without_being_opened(tree, tmp_path, where):
    site = overlay_dir(tmp_path)
    folder = site if where == "site" else tree
    os.mkfifo(folder / "ingredients" / "x.toml")
    done = subprocess.run([sys.executable, "-c", FIFO_CHECK, str(tree), str(site)], cwd=ROOT, capture_output=True,
                          text=True, timeout=60, env={**os.environ, "PYTHONPATH": str(ROOT)})
    assert done.returncode == 0, done.stderr
    name = "site" if where == "site" else "data"
    assert done.stdout.strip() == f"{name}/ingredients/x.toml: (file): is a named pipe (FIFO), not a regular file (it was not opened)"
