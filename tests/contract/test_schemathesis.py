"""schemathesis over every operation, in process, against the spec the app
serves: no server errors, documented status codes and content types,
responses that conform to their schemas, and invalid data rejected."""
from __future__ import annotations

from pathlib import Path

import pytest
import schemathesis
from hypothesis import settings
from schemathesis.config import SchemathesisConfig
from schemathesis.specs.openapi.checks import (
    content_type_conformance,
    negative_data_rejection,
    response_schema_conformance,
    status_code_conformance,
)
from schemathesis.checks import not_a_server_error

from service.http.app import create_app

CONFIG = SchemathesisConfig.from_path(Path(__file__).with_name("schemathesis.toml"))
APP = create_app()
schema = schemathesis.openapi.from_wsgi("/openapi.json", APP, config=CONFIG)

CHECKS = [not_a_server_error, status_code_conformance, content_type_conformance, response_schema_conformance, negative_data_rejection]


@schema.parametrize()
def test_every_operation(case):
    case.call_and_validate(checks=CHECKS)


@pytest.mark.slow
@schema.parametrize()
@settings(max_examples=300)
def test_every_operation_long(case):
    case.call_and_validate(checks=CHECKS)
