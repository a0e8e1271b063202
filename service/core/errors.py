"""The service's one error vocabulary, below the HTTP layer. Each error names
where in the input the fault lies (a path of keys and indexes, as the caller's
input is shaped, or its JSON pointer) and the rule broken; only service/http/problems.py
turns them into problem+json with a status."""
from __future__ import annotations

import re

# Control characters (C0, DEL, C1) and lone surrogates: what an answer must
# never carry raw. A surrogate cannot be encoded as UTF-8 at all, and a
# control character in a pointer or a detail could break a log line.
_UNPRINTABLE = re.compile(r"[\x00-\x1f\x7f-\x9f\ud800-\udfff]")


def printable(text: str) -> str:
    """`text` with each control character and lone surrogate written as a
    visible \\uXXXX escape, so that what the caller sent can be echoed."""
    return _UNPRINTABLE.sub(lambda m: f"\\u{ord(m.group()):04x}", text)


def _pointer_part(p) -> str:
    # An index needs no escaping, and printable() is called only when there
    # is something to escape: a pointer is made for every value an answer
    # uses, and the member names the schemas define are plain.
    if type(p) is int:
        return str(p)
    text = str(p)
    if _UNPRINTABLE.search(text) is not None:
        text = printable(text)
    return text.replace("~", "~0").replace("/", "~1")


def pointer(path) -> str:
    """A JSON pointer in the URI-fragment form RFC 9457's examples use. A key
    the caller sent (an unknown member) is echoed through printable(), so a
    pointer is always encodable."""
    return "#/" + "/".join([_pointer_part(p) for p in path])


class CalculationError(ValueError):
    def __init__(self, path: tuple, rule: str, message: str, **extra):
        self.path = tuple(path)
        self.rule = rule
        self.message = message
        self.extra = extra
        super().__init__(message)


class InfeasibleTarget(CalculationError):
    """The target HLB lies outside what the blend can reach."""

    def __init__(self, path: tuple, target: float, reachable_low: float, reachable_high: float):
        nearest = min(max(target, reachable_low), reachable_high)
        super().__init__(
            path,
            "target_outside_reachable_range",
            f"target HLB {target:g} is outside the range this blend can reach, "
            f"{reachable_low:.2f} to {reachable_high:.2f}; the nearest reachable HLB is {nearest:.2f}",
            reachable_low=reachable_low,
            reachable_high=reachable_high,
            nearest_reachable=nearest,
        )


class FaultList(ValueError):
    """Several faults refused together: `faults` is a list of dicts, each with
    its pointer, rule and detail (and any extra member, e.g. suggestions);
    `detail` sums them up. Not a CalculationError, so the use cases' handlers
    of calculation errors never swallow one."""

    def __init__(self, faults: list[dict], detail: str):
        self.faults = list(faults)
        self.detail = detail
        super().__init__(detail)


class InvalidInput(FaultList):
    """The request names something unknown, retired or implausible."""

    @classmethod
    def at(cls, path: tuple, rule: str, detail: str, **extra) -> "InvalidInput":
        """One fault at `path` in the request body."""
        return cls([{"pointer": pointer(path), "rule": rule, "detail": detail, **extra}], f"at {pointer(path)}: {detail}")


class UnverifiedValuesRefused(FaultList):
    """Strict mode: the calculation would use registry values not yet checked
    against their source."""
