"""The table as a Markdown pipe table, with its number, title and note."""

from __future__ import annotations

from matcheck.report.formatter import RenderOptions
from matcheck.report.methods.model import MethodsTable


def _md(text: str) -> str:
    from matcheck.report.escape import markdown

    return markdown(text)


def render_markdown(table: MethodsTable, options: RenderOptions | None = None) -> str:
    """A pipe table (one line per row, the group in its own column), number, title and note."""
    header = ("Group", *table.header)
    lines = [
        f"**Table {table.number}**",
        "",
        f"*{_md(table.title)}*",
        "",
        "| " + " | ".join(_md(cell) for cell in header) + " |",
        "|---|---|" + "--:|" * (len(table.header) - 2) + "---|",
    ]
    for row in table.rows:
        cells = (row.group_label, *row.cells)
        lines.append("| " + " | ".join(_md(cell) for cell in cells) + " |")
    lines += ["", f"*Note.* {_md(table.note)}"]
    if table.accepted:
        lines += ["", "*Accepted differences.*", ""]
        lines += [f"- {_md(row.sentence)}" for row in table.accepted]
    if table.data is not None:
        from matcheck.report.study_data import methods_baseline_markdown

        lines += methods_baseline_markdown(table.data)
    lines += ["", table.sample_size] if table.sample_size else []
    return "\n".join(lines) + "\n"
