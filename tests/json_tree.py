"""Paths into a tree of JSON (or TOML) data and copies changed at one of
them, for the tests that change a body or a data file at every point."""
from __future__ import annotations

import copy

DROP = object()  # as the value given to changed(): remove the member or item


def paths(value, path: tuple = ()):
    """Every member's and item's path, the root's () first."""
    yield path
    if isinstance(value, dict):
        for key, item in value.items():
            yield from paths(item, path + (key,))
    elif isinstance(value, list):
        for i, item in enumerate(value):
            yield from paths(item, path + (i,))


def get(value, path: tuple):
    for step in path:
        value = value[step]
    return value


def changed(value, path: tuple, new):
    """A deep copy of `value` with the member or item at `path` (not the
    root) set to `new`, added if a dict lacks it, or removed for DROP."""
    out = copy.deepcopy(value)
    target = get(out, path[:-1])
    if new is DROP:
        del target[path[-1]]
    else:
        target[path[-1]] = new
    return out
