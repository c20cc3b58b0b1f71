"""Give each PDF block its kind: heading, list item, caption, table cell or paragraph.

- Body size: the font size that carries the most characters.
- Headings: a short block (at most 20 words, no final period) set at least 1.15 times the
  body size; the distinct heading sizes, largest first, are levels 1, 2, 3 ... A short
  (12 words at most) all-bold block at body size, not ending in punctuation, that is directly
  followed by a body paragraph not in bold is a heading one
  level below the smallest larger heading size; so is one set a little larger than the body
  but below the 1.15 threshold (a 12 pt bold heading over 11 pt text).
- A heading set wholly in bold or italic carries no emphasis spans: that is its style.
- List items: a block whose first line starts with a bullet or an enumerator and a space; the
  marker is stripped; consecutive items form one list; the level is the rank of the marker's
  x among the list's marker positions, counting from the first item's.
- Captions: "Figure N" / "Fig. N" / "Table N" just below an image on the page, or
  "Figure N:" / "Figure N." anywhere; the nearest image on the page gets the caption.
- Table cells: the blocks :mod:`matcheck.readers.pdf_tables` made of a table's cells, one
  group per table; a table that ends a page and one with the same columns that starts the
  next page are one table.
- Paragraph continuation: a block that ends without final punctuation at the bottom of a page
  (or column) and a block starting with a lowercase letter at the top of the next one are one
  paragraph.

The thresholds are common practice for PDF layout analysis, not published values.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field
from itertools import pairwise

from matcheck.model import BlockKind, Emphasis
from matcheck.readers.builder import Run
from matcheck.readers.pdf_layout import RawBlock, dominant_size, round_size
from matcheck.readers.pdf_page import PlacedImage
from matcheck.readers.pdf_tables import same_columns
from matcheck.readers.pdf_text import (
    all_emphasised,
    ends_sentence,
    join_lines,
    list_marker_length,
    marker_kind,
    plain,
    strip_prefix,
)

_HEADING_RATIO = 1.15
_HEADING_WORDS = 20
_BOLD_HEADING_WORDS = 12
_MAX_LEVEL = 6
# Sizes within this ratio of the body size are body size.
_BODY_TOLERANCE = 1.08
# Marker positions closer than this (points) are one indentation level.
_INDENT_TOLERANCE = 3.0
# A caption this close below an image (in font sizes, at least 30 pt) belongs to it.
_CAPTION_REACH = 3.0
_CAPTION_MIN_REACH = 30.0
_CAPTION_BELOW = re.compile(r"(?:figure|fig\.|table)\s*\d+", re.IGNORECASE)
_CAPTION_ANYWHERE = re.compile(r"(?:figure|fig\.)\s*\d+[.:]", re.IGNORECASE)


@dataclass(slots=True)
class Piece:
    """A classified block, ready for the builder."""

    kind: BlockKind
    block: RawBlock
    level: int = 0
    group: int | None = None
    # Index into the page's images of the figure this caption belongs to.
    caption_of: int | None = None
    marker: int = 0
    extra: list[RawBlock] = field(default_factory=list)

    @property
    def page(self) -> int:
        return self.block.page

    def raw_runs(self) -> list[Run]:
        lines = [line.runs for block in (self.block, *self.extra) for line in block.lines]
        runs = join_lines(lines)
        return strip_prefix(runs, self.marker) if self.marker else runs

    def runs(self) -> list[Run]:
        runs = self.raw_runs()
        if self.kind is BlockKind.HEADING:
            # A heading set wholly in bold (or italic) has that as its style, not as emphasis,
            # as in DOCX heading styles and Markdown headings.
            whole = frozenset(kind for kind in Emphasis if all_emphasised(runs, kind))
            runs = [(text, emphasis - whole) for text, emphasis in runs]
        return runs

    def text(self) -> str:
        return plain(self.runs())


def body_size(blocks: list[RawBlock]) -> float:
    return dominant_size(line for block in blocks for line in block.lines)


def _words(text: str) -> int:
    return len(text.split())


def _heading_size(block: RawBlock, text: str, body: float) -> float | None:
    size = round_size(block.size)
    if (
        body > 0
        and size >= _HEADING_RATIO * body
        and _words(text) <= _HEADING_WORDS
        and not text.rstrip().endswith(".")
        and any(char.isalnum() for char in text)
    ):
        return size
    return None


def _is_body(block: RawBlock, body: float) -> bool:
    size = max(block.size, 0.1)
    return max(size, body) / max(min(size, body), 0.1) <= _BODY_TOLERANCE


def _caption_target(
    block: RawBlock, text: str, images: list[PlacedImage], taken: set[int]
) -> tuple[bool, int | None]:
    """Whether the block is a caption, and the index of the image it belongs to."""
    stripped = text.lstrip()
    if _CAPTION_BELOW.match(stripped) is None:
        return False, None
    reach = max(_CAPTION_REACH * block.size, _CAPTION_MIN_REACH)
    for index, image in enumerate(images):
        if index not in taken and -2.0 <= image.bottom - block.top <= reach:
            return True, index
    if _CAPTION_ANYWHERE.match(stripped) is None:
        return False, None
    if not images:
        return True, None

    def distance(index: int) -> tuple[bool, float]:
        image = images[index]
        if image.bottom > block.top:
            gap = image.bottom - block.top
        elif image.top < block.bottom:
            gap = block.bottom - image.top
        else:
            gap = 0.0
        # An image that has its caption already comes last.
        return (index in taken, gap)

    return True, min(range(len(images)), key=distance)


def classify(blocks: list[RawBlock], images: dict[int, list[PlacedImage]]) -> list[Piece]:
    body = body_size(blocks)
    texts = [plain(join_lines(line.runs for line in block.lines)) for block in blocks]
    heading_sizes = sorted(
        {size for b, t in zip(blocks, texts, strict=True) if (size := _heading_size(b, t, body))},
        reverse=True,
    )[:_MAX_LEVEL]
    levels = {size: rank + 1 for rank, size in enumerate(heading_sizes)}
    taken: dict[int, set[int]] = {}
    pieces: list[Piece] = []
    for block, text in zip(blocks, texts, strict=True):
        size = _heading_size(block, text, body)
        page_images = images.get(block.page, [])
        page_taken = taken.setdefault(block.page, set())
        is_caption, target = _caption_target(block, text, page_images, page_taken)
        if block.table is not None:
            pieces.append(Piece(BlockKind.TABLE_CELL, block))
        elif all(line.monospace for line in block.lines):
            pieces.append(Piece(BlockKind.CODE, block))
        elif size is not None and size in levels:
            pieces.append(Piece(BlockKind.HEADING, block, level=levels[size]))
        elif is_caption:
            pieces.append(Piece(BlockKind.CAPTION, block, caption_of=target))
            if target is not None:
                page_taken.add(target)
        elif marker := list_marker_length(block.lines[0].text):
            pieces.append(Piece(BlockKind.LIST_ITEM, block, marker=marker))
        else:
            pieces.append(Piece(BlockKind.PARAGRAPH, block))
    _bold_headings(pieces, body, min(len(heading_sizes) + 1, _MAX_LEVEL))
    pieces = _join_continued(pieces)
    _group_lists(pieces)
    return _group_tables(pieces)


def _bold_headings(pieces: list[Piece], body: float, level: int) -> None:
    for piece, following in pairwise(pieces):
        if piece.kind is not BlockKind.PARAGRAPH or following.kind is not BlockKind.PARAGRAPH:
            continue
        runs = piece.raw_runs()
        text = plain(runs).strip()
        if (
            piece.block.size * _BODY_TOLERANCE >= body
            and all_emphasised(runs, Emphasis.BOLD)
            and _words(text) <= _BOLD_HEADING_WORDS
            and not ends_sentence(text)
            and not text.endswith(",")
            and _is_body(following.block, body)
            and not all_emphasised(following.raw_runs(), Emphasis.BOLD)
        ):
            piece.kind = BlockKind.HEADING
            piece.level = level


def _join_continued(pieces: list[Piece]) -> list[Piece]:
    joined: list[Piece] = []
    for piece in pieces:
        previous = joined[-1] if joined else None
        if (
            previous is not None
            and piece.block.flow_start
            and not piece.extra
            and previous.kind in (BlockKind.PARAGRAPH, BlockKind.LIST_ITEM)
            and piece.kind is BlockKind.PARAGRAPH
            and abs(round_size(previous.block.size) - round_size(piece.block.size)) < 0.6
            and not ends_sentence(previous.text())
            and piece.text().lstrip()[:1].islower()
        ):
            previous.extra.append(piece.block)
            continue
        joined.append(piece)
    return joined


def _group_lists(pieces: list[Piece]) -> None:
    group = 0
    run: list[Piece] = []

    def close() -> None:
        if not run:
            return
        first = run[0].block.lines[0].x
        xs: list[float] = []
        for x in sorted(max(item.block.lines[0].x, first) for item in run):
            if not xs or x - xs[-1] > _INDENT_TOLERANCE:
                xs.append(x)
        for item in run:
            x = max(item.block.lines[0].x, first)
            rank = sum(1 for step in xs if step < x - _INDENT_TOLERANCE)
            item.level = min(rank + 1, _MAX_LEVEL)
        run.clear()

    for piece in pieces:
        if piece.kind is BlockKind.LIST_ITEM:
            if run and _starts_new_list(run, piece):
                close()
            if not run:
                group += 1
            piece.group = group
            run.append(piece)
        else:
            close()
    close()


def _starts_new_list(run: list[Piece], piece: Piece) -> bool:
    """A top-level item whose marker changes kind (bullet, number, letter) or restarts the
    numbering ends the list before it, as in DOCX numbering and Markdown."""
    first = run[0].block.lines[0].x
    if piece.block.lines[0].x > first + _INDENT_TOLERANCE:
        return False  # a nested item stays in its list
    top = [item for item in run if item.block.lines[0].x <= first + _INDENT_TOLERANCE]
    kind, value = marker_kind(top[-1].block.lines[0].text)
    new_kind, new_value = marker_kind(piece.block.lines[0].text)
    if kind != new_kind:
        return True
    return value is not None and new_value is not None and new_value <= value


def _group_tables(pieces: list[Piece]) -> list[Piece]:
    """One group per table, numbered after the lists' groups. A table that ends its page and
    one that starts the next page with the same columns are one table the page break split;
    a header row the word processor repeats at the top of the continued part is dropped."""
    first = max((piece.group for piece in pieces if piece.group is not None), default=0)
    starts: dict[int, list[float]] = {}
    for piece in pieces:
        if piece.block.table is not None:
            starts.setdefault(piece.block.table, []).append(piece.block.lines[0].x)
    continues: dict[int, int] = {}
    for before, after in pairwise(pieces):
        above, below = before.block.table, after.block.table
        if (
            above is not None
            and below is not None
            and after.page == before.page + 1
            and same_columns(starts[above], starts[below])
        ):
            continues[below] = continues.get(above, above)
    for piece in pieces:
        if (table := piece.block.table) is not None:
            piece.group = first + continues.get(table, table)
    repeated = {
        id(cell)
        for part, table in continues.items()
        for cell in _repeated_header(pieces, table, part)
    }
    return [piece for piece in pieces if id(piece) not in repeated]


def _first_row(pieces: list[Piece], table: int) -> list[Piece]:
    cells = [piece for piece in pieces if piece.block.table == table]
    if not cells:
        return []
    top = cells[0].block.lines[0].y
    return [cell for cell in cells if abs(cell.block.lines[0].y - top) < 1.0]


def _repeated_header(pieces: list[Piece], table: int, part: int) -> list[Piece]:
    """The continued part's first row when it repeats the table's first row word for word."""
    header, row = _first_row(pieces, table), _first_row(pieces, part)
    if header and [cell.text() for cell in header] == [cell.text() for cell in row]:
        return row
    return []
