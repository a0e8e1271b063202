"""schemathesis over every operation, in process, against the spec the app
serves, with every check (no server errors, documented status codes, content
types and headers, answers that conform to their schemas, invalid data
rejected, valid data accepted) and this API's own
(schemathesis_hooks.refused_only_by_the_calculation), in the examples,
coverage and fuzzing phases."""
from __future__ import annotations

from pathlib import Path

import pytest
import schemathesis
from hypothesis import settings
from schemathesis.config import SchemathesisConfig

from service.http.app import create_app
from tests.contract import schemathesis_hooks

CONFIG = SchemathesisConfig.from_path(Path(__file__).with_name("schemathesis.toml"))
APP = create_app()
schema = schemathesis.openapi.from_wsgi("/openapi.json", APP, config=CONFIG)
OWN_CHECKS = [schemathesis_hooks.refused_only_by_the_calculation]


@schema.parametrize()
def test_every_operation(case):
    case.call_and_validate(additional_checks=OWN_CHECKS)


@pytest.mark.slow
@schema.parametrize()
@settings(max_examples=300)
def test_every_operation_long(case):
    case.call_and_validate(additional_checks=OWN_CHECKS)
