"""The text forms (worksheet, rescaled worksheet, amounts taken, compounding
record) are rendered from the answer as the use case built it, with no
marshmallow dump first, like the JSON form. That holds only while a dump
would change nothing the text shows: checked here for every spec example
of those operations, at three batch sizes, in Markdown and in plain text,
against the text rendered from the response schema's dump of the same
answer; and the endpoint's own Markdown is that text."""
from __future__ import annotations

import copy

import pytest

from service.http.operations import CALCULATIONS
from service.http.record_text import record_text
from service.http.spec import build_spec
from service.http.spec_examples import EXAMPLES
from service.http.taken_text import taken_text
from service.http.worksheet_text import worksheet_text

RENDER = {"createWorksheet": worksheet_text, "rescaleWorksheet": worksheet_text, "checkAmountsTaken": taken_text,
          "createCompoundingRecord": record_text}
PATHS = {item["post"]["operationId"]: path for path, item in build_spec()["paths"].items() if "post" in item}


def _bodies(body: dict):
    """The example, and the example at a small and a large batch (the
    worksheet's own batch, or the batch of the worksheet it holds)."""
    yield body
    for value in (3, 2000):
        changed = copy.deepcopy(body)
        holder = changed["worksheet"] if "worksheet" in changed else changed
        holder["batch"] = dict(holder["batch"], value=value)
        yield changed


CASES = [(op, name, i, body) for op in RENDER for name, example in EXAMPLES[op].items()
         for i, body in enumerate(_bodies(example["value"]))]


@pytest.mark.parametrize(("op", "name", "variant", "body"), CASES, ids=[f"{c[0]}-{c[1]}-{c[2]}" for c in CASES])
def test_text_from_the_answer_is_the_text_from_its_dump(client, op, name, variant, body):
    response = client.post(PATHS[op], json=body)
    assert response.status_code == 200, response.get_data(as_text=True)
    answer = response.get_json()
    dumped = CALCULATIONS[op].answer.dump(answer)
    render = RENDER[op]
    for markdown in (True, False):
        assert render(answer, markdown=markdown) == render(dumped, markdown=markdown)
    served = client.post(PATHS[op], json=body, headers={"Accept": "text/markdown"}).get_data(as_text=True)
    assert served == render(answer, markdown=True)
