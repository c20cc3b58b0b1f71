"""The table as CSV (RFC 4180, docs/references.md §16), for a spreadsheet."""

from __future__ import annotations

import csv
import io

from matcheck.report.formatter import RenderOptions
from matcheck.report.methods.model import MethodsTable


def render_csv(table: MethodsTable, options: RenderOptions | None = None) -> str:
    """RFC 4180 CSV; the note is the last row, ``Note.`` in the Group column, padded to width.

    Accepted differences come before the note, one row each with ``Accepted.`` in the Group
    column and the sentence with its reason in the next. Every row has the same number of
    fields, so spreadsheets and ``csv.reader`` read it as is; a reader that wants only the
    data drops the rows whose first field is ``Accepted.`` or ``Note.``.
    """
    buffer = io.StringIO()
    writer = csv.writer(buffer)
    width = len(table.header) + 1
    writer.writerow(("Group", *table.header))
    for row in table.rows:
        writer.writerow((row.group_label, row.label, *row.values, row.difference, row.verdict))
    for accepted in table.accepted:
        writer.writerow(("Accepted.", accepted.sentence, *([""] * (width - 2))))
    writer.writerow(("Note.", table.note, *([""] * (width - 2))))
    return buffer.getvalue()
