"""The domain's error vocabulary (service/core/errors.py): what the HTTP
layer maps to problem+json. Hand-computed expectations."""
from __future__ import annotations

import pytest

from service.core.errors import CalculationError, InvalidInput, UnverifiedValuesRefused, pointer


@pytest.mark.parametrize(("path", "expected"), [
    ((), "#/"),
    (("ingredients", 0, "ingredient"), "#/ingredients/0/ingredient"),
    (("a/b", "c~d"), "#/a~1b/c~0d"),  # RFC 6901 escapes
])
def test_pointer(path, expected):
    assert pointer(path) == expected


def test_invalid_input_at_one_path():
    exc = InvalidInput.at(("fixed", 1, "amount"), "fixed_share_basis", "give a share", suggestions=["x"])
    assert exc.detail == "at #/fixed/1/amount: give a share"
    assert exc.faults == [{"pointer": "#/fixed/1/amount", "rule": "fixed_share_basis", "detail": "give a share", "suggestions": ["x"]}]


@pytest.mark.parametrize("cls", [InvalidInput, UnverifiedValuesRefused])
def test_fault_lists_are_not_calculation_errors(cls):
    # The use cases catch CalculationError to re-word it; a refusal must pass through.
    exc = cls([], "none")
    assert isinstance(exc, ValueError) and not isinstance(exc, CalculationError)
