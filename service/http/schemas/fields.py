"""Strict fields that agree with the JSON Schema the spec publishes.

marshmallow's own Float accepts the string "1.5" and Boolean accepts "yes";
JSON Schema accepts neither, so schemathesis (and any client reading the spec)
would disagree with the server. These fields take JSON types only, and put
their bounds into field metadata so the spec states the same rule."""
from __future__ import annotations

import math
import re

from marshmallow import ValidationError, fields, validate

from service.http.jsonio import NonFiniteNumber
from service.http.schemas.rules import Fault

# The largest amount or number a request may carry: far beyond any batch, and
# small enough that sums and products stay finite.
MAX_MAGNITUDE = 1e9


class ValidatedOnce:
    """A field whose validators run through one validate.And built on first
    use: marshmallow's Field builds a new And on every value it loads, even
    for a field with no validators. Errors are And's, as before."""

    def _validate(self, value):
        if not self.validators:
            return
        check = self.__dict__.get("_all_validators")
        if check is None:
            check = self._all_validators = validate.And(*self.validators)
        check(value)


class String(ValidatedOnce, fields.String):
    pass


class Nested(ValidatedOnce, fields.Nested):
    pass


class Number(ValidatedOnce, fields.Float):
    """A JSON number (not a string, not a boolean), finite, within bounds."""

    default_error_messages = {"invalid": "Not a valid number: a JSON number is required (strings and booleans are refused)."}

    def __init__(self, *, minimum=None, maximum=MAX_MAGNITUDE, exclusive_minimum=None, exclusive_maximum=None, **kwargs):
        self.bounds = {"minimum": minimum, "maximum": maximum, "exclusiveMinimum": exclusive_minimum, "exclusiveMaximum": exclusive_maximum}
        metadata = dict(kwargs.pop("metadata", {}))
        metadata.update({k: v for k, v in self.bounds.items() if v is not None})
        super().__init__(allow_nan=False, metadata=metadata, **kwargs)

    def _deserialize(self, value, attr, data, **kwargs):
        if isinstance(value, NonFiniteNumber):
            raise ValidationError(Fault(f"{value.text} is not accepted: a finite number is required.", "finite_number"))
        if isinstance(value, bool) or not isinstance(value, (int, float)):
            raise self.make_error("invalid")
        # Bounds are compared before float(), so a 400-digit integer is refused
        # rather than overflowing.
        b = self.bounds
        if b["minimum"] is not None and value < b["minimum"]:
            raise ValidationError(Fault(f"Must be at least {b['minimum']:g}.", "minimum"))
        if b["maximum"] is not None and value > b["maximum"]:
            raise ValidationError(Fault(f"Must be at most {b['maximum']:g}.", "maximum"))
        if b["exclusiveMinimum"] is not None and value <= b["exclusiveMinimum"]:
            raise ValidationError(Fault(f"Must be greater than {b['exclusiveMinimum']:g}.", "exclusive_minimum"))
        if b["exclusiveMaximum"] is not None and value >= b["exclusiveMaximum"]:
            raise ValidationError(Fault(f"Must be less than {b['exclusiveMaximum']:g}.", "exclusive_maximum"))
        number = float(value)
        if not math.isfinite(number):
            raise self.make_error("invalid")
        return number


class Integer(ValidatedOnce, fields.Integer):
    """A JSON integer (2.0 counts, as JSON Schema says; 2.5, strings and
    booleans do not), within bounds."""

    default_error_messages = {"invalid": "Not a valid integer: a JSON integer is required."}

    def __init__(self, *, minimum=None, maximum=None, **kwargs):
        self.minimum, self.maximum = minimum, maximum
        metadata = dict(kwargs.pop("metadata", {}))
        metadata.update({k: v for k, v in {"minimum": minimum, "maximum": maximum}.items() if v is not None})
        super().__init__(strict=False, metadata=metadata, **kwargs)

    def _deserialize(self, value, attr, data, **kwargs):
        if isinstance(value, bool) or not isinstance(value, (int, float)) or (isinstance(value, float) and not value.is_integer()):
            raise self.make_error("invalid")
        if self.minimum is not None and value < self.minimum:
            raise ValidationError(Fault(f"Must be at least {self.minimum}.", "minimum"))
        if self.maximum is not None and value > self.maximum:
            raise ValidationError(Fault(f"Must be at most {self.maximum}.", "maximum"))
        return int(value)


class Boolean(ValidatedOnce, fields.Boolean):
    """true or false only."""

    default_error_messages = {"invalid": "Not a valid boolean: true or false is required."}

    def _deserialize(self, value, attr, data, **kwargs):
        if not isinstance(value, bool):
            raise self.make_error("invalid")
        return value


class FullMatch(validate.Regexp):
    """Regexp that must match the whole string: Python's `$` also matches
    before a final newline, which JSON Schema's pattern would not allow."""

    def __call__(self, value):
        if self.regex.fullmatch(value) is None:
            raise ValidationError(Fault(self._format_error(value), "pattern"))
        return value


ID_PATTERN = r"^[a-z0-9]+(-[a-z0-9]+)*$"


def ingredient_id(**kwargs) -> fields.String:
    return String(
        validate=[validate.Length(min=1, max=80), FullMatch(ID_PATTERN, error="Must be a registry id: lower-case letters, digits and single hyphens.")],
        metadata={"description": "Registry id of an ingredient, e.g. `polysorbate-80`.", **kwargs.pop("metadata", {})},
        **kwargs,
    )


def _items(n: int) -> str:
    return f"{n} item" if n == 1 else f"{n} items"


class BoundedList(ValidatedOnce, fields.List):
    """A JSON array whose length is checked before any item is loaded:
    marshmallow's List loads every item and only then runs validate.Length,
    so a body of thousands of bad items cost a full validation of each, and
    an error per fault, before the count alone refused it. The same
    validate.Length stays among the validators, for apispec to publish it as
    minItems and maxItems; by then it always passes."""

    def __init__(self, cls_or_instance, *, min_items: int | None = None, max_items: int | None = None,
                 exact_items: int | None = None, **kwargs):
        self.length = validate.Length(min=min_items, max=max_items, equal=exact_items)
        super().__init__(cls_or_instance, validate=self.length, **kwargs)

    def _deserialize(self, value, attr, data, **kwargs):
        if isinstance(value, list):
            n, length = len(value), self.length
            if length.equal is not None and n != length.equal:
                raise ValidationError(Fault.named("list_length", f"Must hold exactly {_items(length.equal)} (holds {n})."))
            if length.min is not None and n < length.min:
                raise ValidationError(Fault.named("list_length", f"Must hold at least {_items(length.min)} (holds {n})."))
            if length.max is not None and n > length.max:
                raise ValidationError(Fault.named("list_length", f"Must hold at most {_items(length.max)} (holds {n}); nothing in it was checked."))
        return super()._deserialize(value, attr, data, **kwargs)


def one_of(choices, **kwargs) -> fields.String:
    return String(validate=validate.OneOf(list(choices)), **kwargs)


# C0 (tab, newline and CR included), DEL and C1: none belongs in a name or a
# search, and each could break a printed worksheet or a log line. The spec
# publishes the same set as a JSON Schema pattern, in backslash-u escapes that
# ECMA-262 and Python's re read alike.
TEXT_PATTERN = r"^[^\u0000-\u001f\u007f-\u009f]*$"
_CONTROL = re.compile(r"[\x00-\x1f\x7f-\x9f]")
# A lone surrogate (JSON's "\ud800" unpaired) is no character at all: it cannot
# be encoded as UTF-8, so an answer echoing it could not be sent.
_SURROGATE = re.compile(r"[\ud800-\udfff]")


def plain_text(value: str) -> str:
    """Refuse lone surrogates and control characters, naming the rule broken;
    the message gives the code point, never the character itself."""
    found = _SURROGATE.search(value)
    if found:
        raise ValidationError(Fault.named("no_lone_surrogates", f"Must not hold a lone surrogate (U+{ord(found.group()):04X} at offset {found.start()})."))
    found = _CONTROL.search(value)
    if found:
        raise ValidationError(Fault.named("no_control_characters",
                                          f"Must not hold control characters (U+{ord(found.group()):04X} at offset {found.start()}; tabs and newlines included)."))
    return value


def text(max_length: int = 120, **kwargs) -> fields.String:
    """Free text from the caller (a name): printable, 1 to max_length characters."""
    metadata = {"pattern": TEXT_PATTERN, **kwargs.pop("metadata", {})}
    return String(validate=[validate.Length(min=1, max=max_length), plain_text], metadata=metadata, **kwargs)


__all__ = ["Boolean", "BoundedList", "FullMatch", "ID_PATTERN", "MAX_MAGNITUDE", "Integer", "Nested", "Number", "String", "ValidatedOnce", "QueryNumber", "TEXT_PATTERN", "ingredient_id", "one_of", "plain_text", "text"]


class QueryNumber(Number):
    """A number written in a query string: a plain decimal, refused otherwise
    (Python's float() would also take 'nan', 'inf' and '1_0')."""

    default_error_messages = {"invalid": "Not a valid number: a plain decimal number is required."}
    _DECIMAL = re.compile(r"-?(0|[1-9][0-9]*)(\.[0-9]+)?([eE][+-]?[0-9]+)?")

    def _deserialize(self, value, attr, data, **kwargs):
        if not isinstance(value, str) or self._DECIMAL.fullmatch(value) is None:
            raise self.make_error("invalid")
        number = float(value)
        if not math.isfinite(number):
            raise self.make_error("invalid")
        return super()._deserialize(number, attr, data, **kwargs)
