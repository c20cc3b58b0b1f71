"""Read a table of learners: a CSV file, or an XLSX workbook's first (or named) sheet.

Rows are numbered as a spreadsheet shows them (the header is row 1), so an error message
points at the line a researcher can find. Cells come back as trimmed strings; empty trailing
rows are dropped. XLSX needs openpyxl (the ``xlsx`` extra), imported only for such files.
"""

from __future__ import annotations

import csv
import io
from dataclasses import dataclass
from pathlib import Path

from matcheck.errors import DataError

MAX_ROWS = 100_000  # far beyond a classroom study; a guard against the wrong file


@dataclass(frozen=True, slots=True)
class Table:
    path: Path
    header: tuple[str, ...]
    rows: tuple[tuple[int, tuple[str, ...]], ...]  # (row number, cells)


def read_table(path: Path, sheet: str | None = None) -> Table:
    from matcheck.inputs import note

    note(path)  # an input of the run: no output may replace it
    if not path.is_file():
        raise DataError("no such data file", path=str(path))
    suffix = path.suffix.lower()
    if suffix in (".xlsx", ".xlsm"):
        raw = _xlsx_rows(path, sheet)
    elif suffix in (".csv", ".txt", ".tsv"):
        raw = _csv_rows(path)
    else:
        raise DataError(
            f"unsupported data file type {path.suffix or '(none)'!r}; use .csv or .xlsx",
            path=str(path),
        )
    while raw and not any(raw[-1]):
        raw.pop()
    if not raw:
        raise DataError("the data file is empty", path=str(path))
    if len(raw) > MAX_ROWS:
        raise DataError(f"more than {MAX_ROWS:,} rows", path=str(path))
    header = tuple(cell.strip() for cell in raw[0])
    while header and not header[-1]:
        header = header[:-1]
    seen: set[str] = set()
    for column, name in enumerate(header, 1):
        if not name:
            raise DataError(f"row 1, column {column}: the header cell is empty", path=str(path))
        if name in seen:
            raise DataError(f"row 1: column {name!r} appears twice", path=str(path))
        seen.add(name)
    rows = []
    for number, cells in enumerate(raw[1:], 2):
        if not any(cells):
            continue
        trimmed = [cell.strip() for cell in cells]
        while len(trimmed) > len(header) and not trimmed[-1]:
            trimmed.pop()
        if len(trimmed) != len(header):
            raise DataError(
                f"row {number}: {len(trimmed)} cells, but the header has {len(header)} columns",
                path=str(path),
            )
        rows.append((number, tuple(trimmed)))
    return Table(path, header, tuple(rows))


def _csv_rows(path: Path) -> list[list[str]]:
    try:
        text = path.read_text(encoding="utf-8-sig")
    except UnicodeDecodeError:
        raise DataError("the data file is not UTF-8 text", path=str(path)) from None
    sample = text[:4096]
    delimiter = (
        "\t" if path.suffix.lower() == ".tsv" or sample.count("\t") > sample.count(",") else ","
    )
    if delimiter == "," and sample.count(";") > sample.count(","):
        delimiter = ";"  # spreadsheets in decimal-comma locales
    try:
        return list(csv.reader(io.StringIO(text, newline=""), delimiter=delimiter))
    except csv.Error as problem:
        raise DataError(f"not valid CSV: {problem}", path=str(path)) from None


def _xlsx_rows(path: Path, sheet: str | None) -> list[list[str]]:
    try:
        import openpyxl
    except ImportError:
        raise DataError(
            "reading .xlsx needs openpyxl (pip install 'matcheck[xlsx]'), or save the sheet as CSV",
            path=str(path),
        ) from None
    try:
        book = openpyxl.load_workbook(path, read_only=True, data_only=True)
    except Exception as problem:  # openpyxl raises many kinds for a broken file
        raise DataError(f"not a readable XLSX workbook ({problem})", path=str(path)) from None
    try:
        if sheet is not None and sheet not in book.sheetnames:
            raise DataError(
                f"no sheet {sheet!r}; sheets: {', '.join(book.sheetnames)}", path=str(path)
            )
        worksheet = book[sheet] if sheet is not None else book.worksheets[0]
        return [[_cell(value) for value in row] for row in worksheet.iter_rows(values_only=True)]
    finally:
        book.close()


def _cell(value: object) -> str:
    if value is None:
        return ""
    if isinstance(value, float) and value.is_integer():
        return str(int(value))
    return str(value)
