"""The compounding record as a PDF to print and file: black on white, A4 or
US Letter, from the same blocks as the text forms (record_document.py).

fpdf2's built-in Helvetica covers Latin-1 only, and a font file would be one
more thing to ship; the few characters of the answers outside Latin-1
(≥, −, Σ, subscripts) are written out instead."""
from __future__ import annotations

import unicodedata

from service.http.record_document import BLANK, Block, record_blocks

_SPELLED = {"≥": ">=", "≤": "<=", "−": "-", "–": "-", "—": "-", "Σ": "sum ", "ᵢ": "i", "→": "->", "‘": "'", "’": "'",
            "“": '"', "”": '"', "…": "...", "×": "x", "·": "*", "≈": "~"}
PAPER = {"A4": "A4", "Letter": "Letter"}


def latin1(text: str) -> str:
    """Text the core fonts can print: Latin-1, with the rest spelled out or
    decomposed (a character with no such form becomes '?')."""
    out = []
    for ch in str(text):
        if ch in _SPELLED:
            out.append(_SPELLED[ch])
        elif ord(ch) < 256:
            out.append(ch)
        else:
            out.append(unicodedata.normalize("NFKD", ch).encode("latin-1", "replace").decode("latin-1")[:1] or "?")
    return "".join(out)


def _pdf(paper: str, footer: str):
    # Imported here: only a PDF request pays for loading fpdf2 (and Pillow).
    from fpdf import FPDF

    class RecordPdf(FPDF):
        def footer(self):
            # Every page names its record and its place, for a filed copy.
            self.set_y(-11)
            self.set_font("helvetica", size=7.5)
            self.cell(0, 5, latin1(f"{footer} - page {self.page_no()} of {{nb}}"), align="C")

    pdf = RecordPdf(orientation="portrait", unit="mm", format=PAPER[paper])
    pdf.set_auto_page_break(auto=True, margin=15)
    pdf.set_margins(15, 15, 15)
    pdf.set_text_color(0, 0, 0)
    pdf.set_draw_color(0, 0, 0)
    pdf.set_creator("emulsion formulation service")
    pdf.alias_nb_pages()
    return pdf


def _table(pdf, block: Block) -> None:
    from fpdf.fonts import FontFace

    pdf.set_font("helvetica", size=7 if len(block.header) > 5 else 8.5)
    head = FontFace(emphasis="BOLD", fill_color=None)
    # Each column as wide as its longest cell (free text capped, to wrap),
    # scaled down together when they do not fit the page.
    def natural(i: int) -> float:
        texts = [block.header[i]] + [str(row[i]) for row in block.items]
        return min(38.0, 2.5 + max(pdf.get_string_width(latin1(t)) for t in texts))
    widths = [natural(i) for i in range(len(block.header))]
    if sum(widths) > pdf.epw:
        widths = [w * pdf.epw / sum(widths) for w in widths]
    with pdf.table(headings_style=head, line_height=3.6 if len(block.header) > 5 else 4.2, first_row_as_headings=True,
                   text_align="LEFT", borders_layout="ALL", col_widths=tuple(widths), width=sum(widths), align="LEFT") as table:
        row = table.row()
        for h in block.header:
            row.cell(latin1(h))
        for cells in block.items:
            row = table.row()
            for c in cells:
                row.cell(latin1(c))
    pdf.ln(2)


def record_pdf(answer: dict) -> bytes:
    r = answer["result"]
    footer = (f"Compounding record {r['preparation']['internal_id'] or ''}: {r['preparation']['name']}, compounded "
              f"{r['compounding']['date']}; a decision aid for a qualified pharmacist")
    pdf = _pdf(r["paper"], footer)
    pdf.add_page()
    width = pdf.epw
    for block in record_blocks(answer):
        if block.kind == "h1":
            pdf.set_font("helvetica", "B", 14)
            pdf.multi_cell(width, 7, latin1(block.text), new_x="LMARGIN", new_y="NEXT")
            pdf.ln(1)
        elif block.kind == "h2":
            if pdf.get_y() > pdf.h - 45:
                # No heading alone at the foot of a page.
                pdf.add_page()
            pdf.ln(1.5)
            pdf.set_font("helvetica", "B", 11)
            pdf.multi_cell(width, 6, latin1(block.text), new_x="LMARGIN", new_y="NEXT", border="B")
            pdf.ln(1)
        elif block.kind == "banner":
            pdf.set_font("helvetica", "B", 9.5)
            pdf.multi_cell(width, 5, latin1(block.text), border=1, new_x="LMARGIN", new_y="NEXT", padding=1.5)
            pdf.ln(1.5)
        elif block.kind == "p":
            pdf.set_font("helvetica", size=9)
            pdf.multi_cell(width, 4.5, latin1(block.text), new_x="LMARGIN", new_y="NEXT")
            pdf.ln(1)
        elif block.kind in ("list", "numbered"):
            pdf.set_font("helvetica", size=9)
            for n, item in enumerate(block.items, 1):
                mark = f"{n}." if block.kind == "numbered" else "-"
                pdf.cell(7, 4.5, mark)
                pdf.multi_cell(width - 7, 4.5, latin1(item), new_x="LMARGIN", new_y="NEXT")
            pdf.ln(1)
        elif block.kind == "fields":
            pdf.set_font("helvetica", size=9)
            for label, value in block.items:
                pdf.set_font("helvetica", "B", 9)
                if pdf.get_string_width(latin1(label) + ":") > 53:
                    # A long label takes its own line; the value goes under it.
                    pdf.multi_cell(width, 5.5, latin1(label) + ":", new_x="LMARGIN", new_y="NEXT")
                    pdf.cell(55, 5.5, "")
                else:
                    pdf.cell(55, 5.5, latin1(label) + ":")
                pdf.set_font("helvetica", size=9)
                pdf.multi_cell(width - 55, 5.5, latin1(value) if value is not None else BLANK * 3, new_x="LMARGIN", new_y="NEXT")
            pdf.ln(1)
        elif block.kind == "table":
            _table(pdf, block)
    return bytes(pdf.output())
