"""A typed Python client generated from the committed spec by a common
generator (openapi-python-client, from PyPI), with no hand edits: every
operation is generated, the package compiles, the named enums are Python
enums with readable members, and the README's blend calculation sent through
the generated client comes back as typed models."""
from __future__ import annotations

import compileall
import importlib
import subprocess
import sys

import httpx
import pytest

from service.http.spec import SPEC_PATH


@pytest.fixture(scope="module")
def client_package(tmp_path_factory):
    out = tmp_path_factory.mktemp("generated")
    run = subprocess.run([sys.executable, "-m", "openapi_python_client", "generate", "--path", str(SPEC_PATH), "--meta", "none",
                          "--output-path", str(out / "emulsion_client")], capture_output=True, text=True, timeout=300)
    assert run.returncode == 0, run.stdout + run.stderr
    # The generator warns and drops what it cannot read; it may only note that
    # its optional formatter (ruff on PATH) was skipped.
    for line in (run.stdout + run.stderr).splitlines():
        assert "will not be generated" not in line and "Unable to process" not in line and "removal of" not in line, line
    assert compileall.compile_dir(str(out / "emulsion_client"), quiet=1)
    sys.path.insert(0, str(out))
    try:
        yield importlib.import_module("emulsion_client")
    finally:
        sys.path.remove(str(out))
        for name in [m for m in sys.modules if m == "emulsion_client" or m.startswith("emulsion_client.")]:
            del sys.modules[name]


def test_every_operation_is_generated(client_package):
    spec_ops = {op["operationId"] for item in __import__("json").loads(SPEC_PATH.read_text())["paths"].values() for op in item.values()}
    import pkgutil

    api = importlib.import_module("emulsion_client.api")
    generated = {m.name for tag in pkgutil.iter_modules(api.__path__) for m in pkgutil.iter_modules([f"{api.__path__[0]}/{tag.name}"])}
    snake = {"".join("_" + c.lower() if c.isupper() else c for c in op) for op in spec_ops}
    assert snake <= generated


def test_named_enums_with_readable_members(client_package):
    models = importlib.import_module("emulsion_client.models")
    assert models.EmulsionType.OIL_IN_WATER.value == "O/W"
    assert models.RelativeUnit.PERCENT_W_W.value == "% w/w"
    assert models.ValueStatus.CHECKED_AGAINST_SOURCE.value == "checked_against_source"
    assert models.WarningCode.UNVERIFIED_VALUE.value == "unverified_value"
    assert models.RuleCode.KNOWN_INGREDIENT.value == "known_ingredient"


def test_a_typed_call_through_the_generated_client(client_package, app):
    models = importlib.import_module("emulsion_client.models")
    blend_hlb = importlib.import_module("emulsion_client.api.calculations.blend_hlb")
    client = client_package.Client(base_url="http://service")
    client.set_httpx_client(httpx.Client(transport=httpx.WSGITransport(app=app), base_url="http://service"))
    body = models.BlendRequest(components=[
        models.Component(ingredient="polysorbate-80", amount=models.Amount(value=7.0, unit=models.MassUnit.G)),
        models.Component(ingredient="sorbitan-monooleate", amount=models.Amount(value=3.0, unit=models.MassUnit.G)),
    ], emulsion_type=models.EmulsionType.OIL_IN_WATER)
    answer = blend_hlb.sync(client=client, body=body)
    assert isinstance(answer, models.BlendAnswer)
    # 0.7 x 15.0 + 0.3 x 4.3 = 11.79 (Griffin's mass-weighted mean; the HLBs
    # as read in the registry's checked sources).
    assert answer.result.hlb == pytest.approx(11.8, abs=0.05)
    assert {v.status for v in answer.values_used} <= set(models.ValueStatus)
