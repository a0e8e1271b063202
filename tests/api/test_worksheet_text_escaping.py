"""The text worksheets print what came from the request as literal text: no
ingredient name can add a table row or cell, a heading, a list item, a link
or HTML to the Markdown form, nor a line to either form."""
import copy
import re

import pytest

from service.http.worksheet_text import worksheet_text
from tests.api.test_worksheets import LOTION, SHEET, share

HOSTILE = ["Oil | 999 g | x", "# Heading", "<script>alert(1)</script>", "*bold* _it_ [link](http://example.invalid) `code`",
           "back\\slash ~~gone~~ &amp; !", "- item", "1. first", "> quote", "---"]
CELL_SPLIT = re.compile(r"(?<!\\)\|")
UNESCAPE = re.compile(r"\\(.)")


def sheet_with(names):
    sheet = copy.deepcopy(LOTION)
    sheet["batch"] = {"value": 100, "unit": "g"}
    for name in names:
        sheet["ingredients"].insert(-1, {"inline": {"name": name, "physical_state": "solid"}, "phase": "other", "share": share(1)})
    return sheet


def table_rows(markdown: str) -> list[list[str]]:
    """The Quantities table's rows, split on unescaped pipes, cells unescaped."""
    lines = [line for line in markdown.splitlines() if line.startswith("| ")]
    return [[UNESCAPE.sub(r"\1", c.strip()) for c in CELL_SPLIT.split(line)[1:-1]] for line in lines]


def test_markdown_names_stay_inside_one_cell(client):
    # Rule: markdown_literal_text. Every row has the header's cell count, and the name cell reads back as sent.
    text = client.post(SHEET, json=sheet_with(HOSTILE), headers={"Accept": "text/markdown"}).get_data(as_text=True)
    header, *body = table_rows(text)
    assert all(len(row) == len(header) for row in body), body
    names = [row[0] for row in body]
    for name in HOSTILE:
        assert name in names


def test_markdown_names_add_no_block_or_markup(client):
    text = client.post(SHEET, json=sheet_with(HOSTILE), headers={"Accept": "text/markdown"}).get_data(as_text=True)
    lines = text.splitlines()
    assert "# Heading" not in lines and not any(line.startswith(("- item", "1. first", "> quote")) for line in lines)
    assert re.search(r"(?<!\\)<script", text) is None and "\\<script>" in text
    assert "[link](" not in text and "`code`" not in text and "*bold*" not in text
    # The template's own headings are all there is.
    assert [line for line in lines if line.startswith("#")] == [
        lines[0], "## Emulsifier system", "## Processing temperature", "## Quantities", "## Checks", "## Equipment", "## Warnings", "## Values used", "## Method", "## Cautions"]


def test_plain_text_names_are_one_cell_of_one_line(client):
    text = client.post(SHEET, json=sheet_with(HOSTILE), headers={"Accept": "text/plain"}).get_data(as_text=True)
    for name in HOSTILE:
        row = [line for line in text.splitlines() if line.startswith(name + "  ")]
        assert len(row) == 1, name


@pytest.mark.parametrize("markdown", [True, False])
def test_a_line_break_in_a_name_is_escaped_defensively(client, markdown):
    # Requests refuse control characters; the printer escapes them anyway, should one reach it.
    answer = client.post(SHEET, json=sheet_with(["Plain"])).get_json()
    for row in answer["result"]["rows"]:
        if row["name"] == "Plain":
            row["name"] = "Plain\n## Injected\r| 1 | 2 |\tx"
    text = worksheet_text(answer, markdown=markdown)
    lines = text.splitlines()
    assert "## Injected" not in lines and not any(line.startswith(("## Injected", "| 1 |")) for line in lines)
    assert "\t" not in text and "\r" not in text
    assert "u000a" in text
