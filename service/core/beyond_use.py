"""The beyond-use date of a nonsterile preparation from its category's
limit and its components' expiry dates: date arithmetic only. Which
category applies, and its limit in days, come from the registry's table
(service/usecases/beyond_use.py); this module holds the rules that turn
them into a date."""
from __future__ import annotations

import calendar
import datetime as dt
import re
from dataclasses import dataclass

from service.core.errors import CalculationError

# A manufacturer's expiry written as a month and a year means the last day of
# that month (USP General Notices, labeling of expiration dates; from memory,
# not read in the text).
_MONTH_ONLY = re.compile(r"^(\d{4})-(\d{2})$")
_FULL_DATE = re.compile(r"^(\d{4})-(\d{2})-(\d{2})$")


def parse_expiry(text: str, path: tuple) -> tuple[dt.date, bool]:
    """An expiry date as YYYY-MM-DD, or YYYY-MM (read as the last day of the
    month): the date, and whether it was month-only."""
    month = _MONTH_ONLY.match(text)
    try:
        if month:
            year, mon = int(month.group(1)), int(month.group(2))
            return dt.date(year, mon, calendar.monthrange(year, mon)[1]), True
        full = _FULL_DATE.match(text)
        if full:
            return dt.date(int(full.group(1)), int(full.group(2)), int(full.group(3))), False
    except ValueError:
        pass
    raise CalculationError(path, "expiry_date_format", f"'{text}' is not a date: give YYYY-MM-DD, or YYYY-MM for a month-only expiry")


@dataclass(frozen=True)
class Expiry:
    label: str      # the component, as the record names it
    lot: str | None
    date: dt.date
    month_only: bool
    path: tuple


@dataclass(frozen=True)
class BeyondUseDate:
    date: dt.date
    limit_date: dt.date            # compounding date + the category's days
    decided_by: str                # "category_limit" | "earliest_component_expiry"
    earliest: Expiry | None        # the earliest expiry given, if any


def beyond_use_date(compounded_on: dt.date, limit_days: int, expiries: list[Expiry]) -> BeyondUseDate:
    """The BUD: counted from the day compounding starts, never later than the
    earliest component expiry. A component already expired on the day of
    compounding is refused: it may not go into the preparation at all."""
    expired = [e for e in expiries if e.date < compounded_on]
    if expired:
        e = expired[0]
        lot = f" (lot {e.lot})" if e.lot else ""
        raise CalculationError(e.path, "component_not_expired",
                               f"{e.label}{lot} expired on {e.date.isoformat()}, before the compounding date {compounded_on.isoformat()}: "
                               "an expired component may not be used")
    limit = compounded_on + dt.timedelta(days=limit_days)
    earliest = min(expiries, key=lambda e: e.date) if expiries else None
    if earliest is not None and earliest.date < limit:
        return BeyondUseDate(earliest.date, limit, "earliest_component_expiry", earliest)
    return BeyondUseDate(limit, limit, "category_limit", earliest)
