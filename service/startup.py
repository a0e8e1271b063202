"""How the service refuses to start: one line on stderr and a non-zero exit,
never a traceback through gunicorn's loader (the operator needs the setting
or the file at fault, not the call stack)."""
from __future__ import annotations

from typing import NoReturn

from registry.errors import RegistryError, RegistryFaults

PREFIX = "emulsion-service: cannot start: "
CHECK_HINT = ("(`emulsion-registry check --root <EMULSION_REGISTRY_ROOT> --overlay <EMULSION_SITE_OVERLAY>` "
              "lists the same faults)")


def refusal(exc: Exception) -> str:
    """The text shown for a setting (SettingError) or registry that cannot work."""
    if isinstance(exc, RegistryFaults) and len(exc.errors) > 1:
        # Every fault on a line of its own: the steward fixes them in one pass.
        return f"{PREFIX}{exc}\n{CHECK_HINT}"
    if isinstance(exc, RegistryError):
        return f"{PREFIX}the registry was not accepted: {exc.file}: {exc.field}: {exc.message}"
    return f"{PREFIX}{exc}"


def refuse(exc: Exception) -> NoReturn:
    # SystemExit with a text prints it to stderr and exits with status 1;
    # gunicorn lets it through (it reports only an Exception with a traceback).
    raise SystemExit(refusal(exc)) from None
