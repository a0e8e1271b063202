"""The compounding record as PDF: read back with pypdf (a PDF library from
PyPI, independent of the fpdf2 that writes it), every quantity and the
beyond-use date must be in its text; the page is A4 or US Letter as asked
(ISO 216: 210 x 297 mm = 595.28 x 841.89 pt; ANSI letter 8.5 x 11 in =
612 x 792 pt), and it is printed in black only (no colour operator other
than black or grey)."""
from __future__ import annotations

import copy
import io
import re

import pytest
from pypdf import PdfReader

from service.http.spec_examples import EXAMPLES

PATH = "/v1/compounding-records"
DEMO = EXAMPLES["createCompoundingRecord"]["lotion"]["value"]


def _pdf(client, body):
    r = client.post(PATH, json=body, headers={"Accept": "application/pdf"})
    assert r.status_code == 200 and r.mimetype == "application/pdf", r.get_data(as_text=True)[:300]
    assert r.headers["Content-Disposition"].startswith("inline; filename=")
    return PdfReader(io.BytesIO(r.data))


def _text(reader) -> str:
    # Line breaks inside table cells fall between words; join them back.
    return re.sub(r"\s+", " ", " ".join(page.extract_text() for page in reader.pages))


def test_every_quantity_and_the_beyond_use_date_are_in_the_pdf(client):
    answer = client.post(PATH, json=DEMO).get_json()
    text = _text(_pdf(client, DEMO))
    for row in answer["result"]["worksheet"]["rows"]:
        assert f"{row['mass']['value']:.2f} g" in text, row["name"]
    assert answer["result"]["beyond_use_date"]["date"] in text
    for c in answer["result"]["components"]:
        assert c["lot"] in text
    assert "Compounding record: Hand lotion (demo)" in text
    assert "decision aid" in text.lower()


@pytest.mark.parametrize("paper, size_pt", [("A4", (595.28, 841.89)), ("Letter", (612.0, 792.0))])
def test_the_paper_is_as_asked(client, paper, size_pt):
    body = copy.deepcopy(DEMO)
    body["paper"] = paper
    reader = _pdf(client, body)
    for page in reader.pages:
        assert (float(page.mediabox.width), float(page.mediabox.height)) == pytest.approx(size_pt, abs=0.01)


def test_the_pdf_is_black_and_white(client):
    reader = _pdf(client, DEMO)
    for page in reader.pages:
        ops = page.get_contents().get_data().decode("latin-1")
        for r_, g_, b_ in re.findall(r"([\d.]+) ([\d.]+) ([\d.]+) (?:rg|RG)", ops):
            assert r_ == g_ == b_, f"colour {r_} {g_} {b_}"
        assert not re.search(r"[\d.]+ [\d.]+ [\d.]+ [\d.]+ (?:k|K)\b", ops)


def test_text_outside_latin_1_is_spelled_out(client):
    from service.http.record_pdf import latin1
    assert latin1("RHLB ≥ 8 − Σ wᵢ") == "RHLB >= 8 - sum  wi"
    assert latin1("70 °C ± 2") == "70 °C ± 2"
    assert latin1("漢") == "?"
