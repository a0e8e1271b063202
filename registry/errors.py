"""The errors the registry raises: a bad data file, named with its field, and
every such fault of a tree at once."""
from __future__ import annotations

from typing import Sequence


class RegistryError(ValueError):
    """A data file failed validation. Carries the file and the field so that a
    data steward can go straight to the fault."""

    def __init__(self, file: str, field: str, message: str):
        self.file = file
        self.field = field
        self.message = message
        super().__init__(f"{file}: {field}: {message}")


class RegistryFaults(RegistryError):
    """Every fault found in a tree (and its overlay), in file order. It is a
    RegistryError naming the first, so that code which reads one fault still
    works; `errors` holds them all, and str() lists them one to a line."""

    def __init__(self, errors: Sequence[RegistryError]):
        if not errors:
            raise ValueError("RegistryFaults needs at least one fault")
        first = errors[0]
        super().__init__(first.file, first.field, first.message)
        self.errors = tuple(errors)

    def __str__(self) -> str:
        lines = [f"the registry was not accepted: {len(self.errors)} fault(s) (file: field: rule)"]
        lines += [f"  {e.file}: {e.field}: {e.message}" for e in self.errors]
        return "\n".join(lines)
