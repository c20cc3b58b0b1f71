"""The table as CSV (RFC 4180, docs/references.md §16), for a spreadsheet."""

from __future__ import annotations

import csv
import io

from matcheck.report.formatter import RenderOptions
from matcheck.report.methods.model import MethodsTable


def render_csv(table: MethodsTable, options: RenderOptions | None = None) -> str:
    """RFC 4180 CSV; the note is the last row, ``Note.`` in the Group column, padded to width.

    Every row has the same number of fields, so spreadsheets and ``csv.reader`` read it as is;
    a reader that wants only the data drops the rows whose first field is ``Accepted.`` or
    ``Note.``. Accepted differences come before the note, one row each with ``Accepted.`` in
    the Group column and the sentence with its reason in the next.
    """
    from matcheck.report.escape import csv_cell

    buffer = io.StringIO()
    writer = csv.writer(buffer)
    width = len(table.header) + 1
    # Text that can come from a study (condition names in the header, the note) must not
    # become a formula in a spreadsheet (escape.csv_cell); the values are matcheck's own
    # numbers, such as +5.9%, which a spreadsheet should read as numbers.
    writer.writerow([csv_cell(cell) for cell in ("Group", *table.header)])
    for row in table.rows:
        label = (csv_cell(row.group_label), csv_cell(row.label))
        writer.writerow((*label, *row.values, *row.contrasts, row.verdict))
    for accepted in table.accepted:
        writer.writerow(("Accepted.", csv_cell(accepted.sentence), *([""] * (width - 2))))
    writer.writerow(("Note.", csv_cell(table.note), *([""] * (width - 2))))
    return buffer.getvalue()
