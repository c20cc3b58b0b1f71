"""Simple tables on a PDF page: lines of text set in aligned columns.

A PDF has no table structure, only text placed in a grid (and maybe ruled lines, which are not
read). pypdf gives where each piece of text starts, not where it ends, so ends are estimated
from Helvetica's character widths (Adobe's Core 14 AFM files; bold 8 % wider). The rules:

- A line falls into *chunks* where a fragment starts well past the estimated end of the text
  before it: by more than 1 em (over three spaces) and more than 15 % of that text's width
  (the margin for fonts wider than the estimate), and by more than twice the widest gap
  between words that the producer placed one by one on that line (a justified line's gaps
  are all alike, so none of them is a cell gap).
- A *row* is a line of two or more chunks, two of them with a letter or digit, that does not
  start with a list marker (a bullet or "1." and its text are a list item) and is not set
  larger than body text. A line of three or more single words at like gaps under 3 em looks
  like justified text and does not start a table.
- A table starts at a row and takes the lines after (and rows before) it while each is within
  3 font sizes of its neighbour and every chunk starts at one of the table's columns (within
  2 pt; a row may leave a column empty). Once the columns are known, a fragment starting at
  one begins a chunk after a narrower gap too (a full cell). A lone chunk at line spacing
  from the line before that fits its column is the wrapped text of a cell.
- Cells are drawn left to right: a line that has a chunk in the first column starts a new
  row (unless it is a lone chunk right below the first column's text); a line without one
  carries wrapped text of the cells of the row above.
- A table needs two rows of two or more cells.

Each non-empty cell becomes one TABLE_CELL block, row by row, left to right. A table that
ends a page and one in the same columns that starts the next are joined into one table (in
:mod:`matcheck.readers.pdf_structure`); a header row repeated on the new page stays in it.

Limits, by design: a column must be left-aligned (centred or right-aligned cells of other
widths end the table); a table drawn column by column, or whose cells of one row come as one
piece of text (the producer moves between cells without a new text object or font), is read
as paragraphs; a row whose only text is in one column after the first, or whose first cell is
empty, is read as wrapped text of the row above; two tables set within 3 font sizes of each
other with the same columns are one table; text laid out in aligned columns with wide gaps (a
form or a table of contents with tab stops, two text columns written line by line across the
page, a narrow justified column whose words are placed one by one and happen to line up) is
read as a table.

The thresholds are common practice for PDF layout analysis, not published values.
"""

from __future__ import annotations

import math
from collections.abc import Iterator, Sequence
from dataclasses import dataclass, field

from matcheck.model import Emphasis
from matcheck.readers.pdf_layout import (
    _PARAGRAPH_GAP,
    _SIZE_CHANGE,
    Line,
    RawBlock,
    split_blocks,
)
from matcheck.readers.pdf_page import Fragment
from matcheck.readers.pdf_text import list_marker_length

# Helvetica's advance widths (1/1000 em) for the printable ASCII characters U+0020..U+007E,
# from Adobe's Helvetica.afm (Core 14 AFM files).
_HELVETICA = (
    278, 278, 355, 556, 556, 889, 667, 191, 333, 333, 389, 584, 278, 333, 278, 278, 556, 556,
    556, 556, 556, 556, 556, 556, 556, 556, 278, 278, 584, 584, 584, 556, 1015, 667, 667, 722,
    722, 667, 611, 778, 722, 278, 500, 667, 556, 833, 722, 778, 667, 778, 722, 667, 611, 722,
    667, 944, 667, 667, 611, 278, 278, 278, 469, 556, 333, 556, 556, 500, 556, 556, 278, 556,
    556, 222, 222, 500, 222, 833, 556, 556, 556, 556, 333, 500, 278, 556, 500, 722, 500, 500,
    500, 334, 260, 334, 584,
)  # fmt: skip
# Helvetica's default width for other characters; ideographs are one em wide.
_OTHER_WIDTH = 556
_WIDE_WIDTH = 1000
_WIDE_FROM = 0x2E80
# Helvetica-Bold over Helvetica on running English text (same AFM files).
_BOLD_FACTOR = 1.08
# A chunk starts this far (in font sizes, and in shares of the text before) past its end.
_GAP_EM = 1.0
_GAP_SHARE = 0.15
# Chunk starts this close (points) are one column.
_ALIGN = 2.0
# Consecutive lines of a table are at most this many font sizes apart.
_ROW_PITCH = 3.0
# Gaps within this ratio of each other are alike; a justified line's are, and are narrower
# than this many font sizes (a table's cells may be set far apart).
_LIKE_GAPS = 1.5
_SPREAD_EM = 3.0


def text_width(text: str, size: float, emphasis: frozenset[Emphasis]) -> float:
    """Estimated advance width of ``text`` in points at ``size`` (Helvetica's metrics)."""
    units = 0
    for char in text:
        code = ord(char)
        if 32 <= code <= 126:
            units += _HELVETICA[code - 32]
        else:
            units += _WIDE_WIDTH if code >= _WIDE_FROM else _OTHER_WIDTH
    factor = _BOLD_FACTOR if Emphasis.BOLD in emphasis else 1.0
    return units * size * factor / 1000


@dataclass(slots=True)
class _Chunk:
    """Text of one line that starts at ``x`` and ends (by estimate) at ``end``."""

    line: Line
    x: float
    end: float
    fragments: list[Fragment]
    # The gap from the text before (infinite for the first chunk of a line).
    gap: float
    # Set apart by a wide gap (or first on its line), not only by starting at a column.
    clear: bool

    @property
    def text(self) -> str:
        return "".join(fragment.text for fragment in self.fragments)

    @property
    def real(self) -> bool:
        return any(char.isalnum() for char in self.text)


@dataclass(frozen=True, slots=True)
class _Placed:
    """A visible fragment: its index on the line, start, gap from the text before, end."""

    index: int
    x: float
    gap: float
    end: float
    size: float


def _placed(line: Line) -> list[_Placed]:
    placed: list[_Placed] = []
    pen: float | None = None
    for index, fragment in enumerate(line.fragments):
        text = fragment.text
        if not text.strip():
            # Spaces carry no reliable position; they only separate words on their line.
            continue
        own = fragment.x + text_width(text.lstrip(), fragment.size, fragment.emphasis)
        if pen is None:
            gap, end = math.inf, own
        else:
            # pypdf reports text that flows on from a fragment at that fragment's start, so
            # the end moves on by the width whatever the reported start.
            gap = fragment.x - pen
            end = max(pen + text_width(text, fragment.size, fragment.emphasis), own)
        placed.append(_Placed(index, fragment.x, gap, end, fragment.size))
        pen = end
    return placed


def _splits(placed: list[_Placed], columns: Sequence[float]) -> dict[int, bool]:
    """Where chunks start (positions in ``placed``), True if at a wide gap."""
    splits: dict[int, bool] = {}
    start = placed[0].x if placed else 0.0
    words: list[float] = []
    for k in range(1, len(placed)):
        item = placed[k]
        if item.gap > max(_GAP_EM * item.size, _GAP_SHARE * (placed[k - 1].end - start)):
            splits[k] = True
            start = item.x
        elif item.gap > 0:
            words.append(item.gap)
    # The producer's own word gaps on this line (words placed one by one): a cell gap is much
    # wider than they are, a justified line's gaps are all alike.
    word = max(words, default=0.0)
    splits = {k: clear for k, clear in splits.items() if placed[k].gap > 2 * word}
    if not columns:
        return splits
    start = placed[0].x if placed else 0.0
    for k in range(1, len(placed)):
        item = placed[k]
        if k in splits:
            start = item.x
            continue
        # A full cell leaves a narrow gap (negative by the estimate, for a narrow font).
        floor = 2 * word if word else -_GAP_SHARE * (placed[k - 1].end - start)
        if item.x > start + _ALIGN and item.gap > floor and _column(item.x, columns) is not None:
            splits[k] = False
            start = item.x
    return splits


def _column(x: float, columns: Sequence[float]) -> int | None:
    for index, column in enumerate(columns):
        if abs(x - column) <= _ALIGN:
            return index
    return None


def same_columns(starts: Sequence[float], others: Sequence[float]) -> bool:
    """Whether two tables' cell starts fall into the same columns."""
    return all(_column(x, others) is not None for x in starts) and all(
        _column(x, starts) is not None for x in others
    )


def _chunks(line: Line, columns: Sequence[float] = ()) -> list[_Chunk]:
    placed = _placed(line)
    splits = _splits(placed, columns)
    chunks: list[_Chunk] = []
    for k, item in enumerate(placed):
        if not chunks or k in splits:
            chunks.append(_Chunk(line, item.x, item.end, [], item.gap, splits.get(k, True)))
        chunks[-1].end = item.end
    if not chunks:
        return chunks
    # Every fragment (spaces too) goes with the chunk of the visible fragment before it.
    owner = 0
    starts = {placed[k].index for k in splits}
    for index, fragment in enumerate(line.fragments):
        if index in starts:
            owner += 1
        chunks[owner].fragments.append(fragment)
    return chunks


def _is_row(chunks: list[_Chunk]) -> bool:
    return (
        len(chunks) >= 2
        and sum(chunk.real for chunk in chunks) >= 2
        and not list_marker_length(chunks[0].text.lstrip() + " ")
    )


def _spread_words(chunks: list[_Chunk]) -> bool:
    """Single words at like, moderate gaps: a justified line whose words are placed one by
    one (it may still join a table that other rows start, if every word is at a column)."""
    gaps = [chunk.gap for chunk in chunks[1:]]
    return (
        len(chunks) >= 3
        and all(len(chunk.text.split()) == 1 for chunk in chunks)
        and max(gaps) <= min(_LIKE_GAPS * min(gaps), _SPREAD_EM * chunks[0].line.size)
    )


@dataclass(slots=True)
class _Table:
    columns: list[float]
    lines: list[tuple[Line, list[_Chunk]]] = field(default_factory=list)

    def column(self, chunk: _Chunk) -> int:
        """Rank of the chunk's column from the left (the chunk is known to be in one)."""
        ordered = sorted(self.columns)
        index = _column(chunk.x, ordered)
        return index if index is not None else len(ordered)


class _Finder:
    def __init__(self, lines: list[Line], leading: float, body: float) -> None:
        self.lines = lines
        self.leading = leading
        self.largest = body * _SIZE_CHANGE if body > 0 else float("inf")

    def _sized(self, line: Line) -> bool:
        # Code is aligned by its spaces, not set in columns: never a table row.
        return 0 < line.size <= self.largest and not line.monospace

    def seed(self, index: int) -> list[_Chunk] | None:
        line = self.lines[index]
        if not self._sized(line) or len({f.x for f in line.fragments if f.text.strip()}) < 2:
            return None
        chunks = _chunks(line)
        if not _is_row(chunks) or _spread_words(chunks):
            return None
        return chunks if all(chunk.clear for chunk in chunks) else None

    def accept(self, table: _Table, line: Line, near: Line, forward: bool) -> list[_Chunk] | None:
        """The line's chunks if it belongs to the table next to ``near``, else None."""
        if not self._sized(line):
            return None
        distance = abs(near.y - line.y)
        if distance > _ROW_PITCH * max(near.size, line.size):
            return None
        chunks = _chunks(line, table.columns)
        if not chunks or list_marker_length(chunks[0].text.lstrip() + " "):
            return None
        if any(_column(chunk.x, table.columns) is None for chunk in chunks):
            return None
        if _is_row(chunks):
            return chunks
        gap = _PARAGRAPH_GAP * self.leading * line.size + 0.5
        if forward and len(chunks) == 1 and distance <= gap and self._fits(table, chunks[0]):
            return chunks
        return None

    def _fits(self, table: _Table, chunk: _Chunk) -> bool:
        """Whether a lone chunk stays inside its column (wrapped cell text, not prose)."""
        # The last column's right edge is unknown, but prose does not start there.
        right = [column for column in table.columns if column > chunk.x + _ALIGN]
        return not right or chunk.end - _GAP_SHARE * (chunk.end - chunk.x) <= min(right)

    def grow(self, index: int, chunks: list[_Chunk], floor: int) -> tuple[int, int, _Table]:
        """Lines ``[start, end)`` around the row at ``index`` (from ``floor`` on), and the
        table they make."""
        table = _Table([chunk.x for chunk in chunks], [(self.lines[index], chunks)])
        start = index
        while start > floor:
            line = self.lines[start - 1]
            # Only rows join before the start (a lone chunk is wrapped text of the line above).
            found = self.accept(table, line, table.lines[0][0], forward=False)
            if found is None:
                break
            table.lines.insert(0, (line, found))
            start -= 1
        end = index + 1
        # Rows are reached from the table's lowest line so far: a row whose first cell wraps
        # is drawn cell by cell (LibreOffice), so its last line drawn may be back up on the
        # row's first baseline.
        lowest = min((item for item, _ in table.lines), key=lambda item: item.y)
        while end < len(self.lines):
            line = self.lines[end]
            found = self.accept(table, line, lowest, forward=True)
            if found is None:
                break
            table.lines.append((line, found))
            lowest = line if line.y < lowest.y else lowest
            end += 1
        return start, end, table

    def rows(self, table: _Table) -> list[dict[int, list[_Chunk]]]:
        """The table's rows: column rank -> the chunks of that cell, top to bottom."""
        rows: list[dict[int, list[_Chunk]]] = []
        previous: tuple[int, Line] | None = None
        for line, chunks in table.lines:
            columns = [table.column(chunk) for chunk in chunks]
            if previous is None:
                new = True
            elif len(chunks) == 1:
                # A lone chunk is the wrapped text of a cell, unless it starts the first
                # column again away from the first column's text just before it.
                column, above = previous
                gap = _PARAGRAPH_GAP * self.leading * line.size + 0.5
                new = columns[0] == 0 and not (column == 0 and abs(above.y - line.y) <= gap)
            else:
                # Back to the first column: a new row; a line without it carries wrapped text
                # of the cells of the row above.
                new = min(columns) == 0
            if new:
                rows.append({})
            for chunk, column in zip(chunks, columns, strict=True):
                rows[-1].setdefault(column, []).append(chunk)
            previous = (columns[-1], line)
        return rows


@dataclass(frozen=True, slots=True)
class Table:
    """A table found on a page: lines ``[start, end)`` of it, cells row by row."""

    start: int
    end: int
    cells: list[list[Line]]


def find_tables(lines: list[Line], leading: float, body: float) -> list[Table]:
    """The tables among one page's lines, in order (see the module docstring)."""
    finder = _Finder(lines, leading, body)
    tables: list[Table] = []
    index = 0
    while index < len(lines):
        chunks = finder.seed(index)
        if chunks is None:
            index += 1
            continue
        start, end, table = finder.grow(index, chunks, tables[-1].end if tables else 0)
        rows = finder.rows(table)
        if sum(len(row) >= 2 for row in rows) < 2:
            index += 1
            continue
        cells = [
            [Line(c.line.page, c.fragments, c.x, c.line.y, c.line.size) for c in row[column]]
            for row in rows
            for column in sorted(row)
        ]
        tables.append(Table(start, end, cells))
        index = end
    return tables


def split_page(
    lines: list[Line], leading: float, body: float, ids: Iterator[int]
) -> list[RawBlock]:
    """One page's blocks: its tables' cells (``table`` set) and the text around them."""
    blocks: list[RawBlock] = []
    start = 0

    def prose(end: int | None) -> None:
        text = split_blocks(lines[start:end], leading)
        if start and text:
            # Text right after a table is not the continuation of a paragraph before it.
            text[0].flow_start = False
        blocks.extend(text)

    for table in find_tables(lines, leading, body):
        prose(table.start)
        number = next(ids)
        blocks.extend(RawBlock(cell[0].page, cell, False, table=number) for cell in table.cells)
        start = table.end
    prose(None)
    return blocks
