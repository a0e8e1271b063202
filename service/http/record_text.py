"""The compounding record as Markdown or plain text, from the blocks of
record_document.py. Every string from the answer passes through the form's
escape (worksheet_text's): no name or note can add a line, a cell or markup."""
from __future__ import annotations

from service.http.record_document import BLANK, Block, record_blocks
from service.http.worksheet_text import _md, _plain


def _table(block: Block, e, markdown: bool) -> list[str]:
    header = [e(h) for h in block.header]
    rows = [[e(c) for c in row] for row in block.items]
    if markdown:
        return (["| " + " | ".join(header) + " |", "|" + "|".join("---" for _ in header) + "|"]
                + ["| " + " | ".join(cells) + " |" for cells in rows])
    widths = [max(len(x) for x in col) for col in zip(header, *rows)]
    return (["  ".join(h.ljust(w) for h, w in zip(header, widths)).rstrip(), "  ".join("-" * w for w in widths)]
            + ["  ".join(c.ljust(w) for c, w in zip(cells, widths)).rstrip() for cells in rows])


def record_text(answer: dict, markdown: bool) -> str:
    e = _md if markdown else _plain
    lines: list[str] = []
    for block in record_blocks(answer):
        if block.kind == "h1":
            lines += [f"# {e(block.text)}", ""] if markdown else [e(block.text), "=" * 72, ""]
        elif block.kind == "h2":
            lines += [f"## {e(block.text)}", ""] if markdown else [e(block.text), "-" * len(block.text), ""]
        elif block.kind == "banner":
            lines += [f"> **{e(block.text)}**" if markdown else f"!!! {e(block.text)}", ""]
        elif block.kind == "p":
            lines += [e(block.text), ""]
        elif block.kind == "list":
            lines += [f"- {e(item)}" for item in block.items] + [""]
        elif block.kind == "numbered":
            lines += [f"{n}. {e(item)}" for n, item in enumerate(block.items, 1)] + [""]
        elif block.kind == "fields":
            lines += [f"- {e(label)}: {e(value) if value is not None else BLANK}" for label, value in block.items] + [""]
        elif block.kind == "table":
            lines += _table(block, e, markdown) + [""]
    return "\n".join(lines)
