"""The document model: what every reader produces and everything downstream reads.

A :class:`Document` is an ordered tuple of :class:`Block` objects (headings, paragraphs, list
items, table cells, captions, footnotes) plus the :class:`Figure` objects found in it. Every
block and figure carries a :class:`Location` so that a finding can point to a place in the
lesson. The model is frozen: nothing after the reader changes it.

Offsets inside a block count characters of ``Block.text``; every ``end`` is exclusive.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from enum import StrEnum


class BlockKind(StrEnum):
    """The kinds of text block a lesson is made of."""

    HEADING = "heading"
    PARAGRAPH = "paragraph"
    LIST_ITEM = "list_item"
    TABLE_CELL = "table_cell"
    CAPTION = "caption"
    FOOTNOTE = "footnote"
    # One line of a code block; ``group`` identifies the code block.
    CODE = "code"


class Emphasis(StrEnum):
    """Typographic signals a lesson uses to draw attention to words."""

    BOLD = "bold"
    ITALIC = "italic"
    UNDERLINE = "underline"
    HIGHLIGHT = "highlight"


class Capability(StrEnum):
    """What a file format can show. A reader declares the ones its format cannot show, and a
    measure that needs one is then unknown for that document instead of a misleading zero."""

    HEADINGS = "headings"
    LISTS = "lists"
    TABLES = "tables"
    EMPHASIS = "emphasis"
    UNDERLINE = "underline"
    HIGHLIGHT = "highlight"
    CODE = "code"
    ALT_TEXT = "alt_text"


@dataclass(frozen=True, slots=True)
class Span:
    """One kind of emphasis over ``Block.text[start:end]`` (characters, end exclusive)."""

    start: int
    end: int
    kind: Emphasis


@dataclass(frozen=True, slots=True)
class Location:
    """Where a block or figure stands in its document.

    ``block`` is the 0-based index of the block in ``Document.blocks`` (for a figure: the
    index of the block it follows, or -1 before the first block). ``page`` is 1-based and
    known for PDFs; ``line`` is the 1-based source line for Markdown and text; ``section`` is
    the text of the nearest heading above, ``None`` before the first heading; ``paragraph``
    numbers the body paragraphs of the document (1-based; paragraphs only).
    """

    block: int
    page: int | None = None
    line: int | None = None
    section: str | None = None
    paragraph: int | None = None
    # For a lesson read from several files: the 0-based index of the file (page and line
    # belong to that file). None for a one-file lesson.
    part: int | None = None
    # For a block other than a paragraph, or a figure: how many body paragraphs precede it,
    # so that a place in a DOCX (no page, no line) can still be found by counting.
    after_paragraph: int | None = None

    def describe(self) -> str:
        """A short human-readable place, e.g. ``'§ Cables, paragraph 4, page 2'``."""
        parts = []
        if self.section:
            parts.append(f"§ {self.section}")
        if self.paragraph is not None:
            parts.append(f"paragraph {self.paragraph}")
        elif self.after_paragraph is not None and self.line is None:
            # A line number says it already; without one, count paragraphs.
            parts.append(
                f"after paragraph {self.after_paragraph}"
                if self.after_paragraph
                else "before paragraph 1"
            )
        if self.page is not None:
            parts.append(f"page {self.page}")
        if self.line is not None:
            parts.append(f"line {self.line}")
        if not parts:
            parts.append(f"block {self.block + 1}")
        return ", ".join(parts)


@dataclass(frozen=True, slots=True)
class Block:
    """A unit of lesson text.

    ``level`` is the heading's rank in the document's outline (1 = top) for headings and the
    nesting depth (1 = top) for list items; 0 otherwise. ``group`` identifies the list, table or
    code block a list item, table cell or code line belongs to (equal numbers: same list, table
    or code block), so they can be counted.
    """

    kind: BlockKind
    text: str
    location: Location
    level: int = 0
    group: int | None = None
    emphasis: tuple[Span, ...] = ()


@dataclass(frozen=True, slots=True)
class Figure:
    """A picture in the lesson.

    Sizes are ``None`` where the format does not state them or the image cannot be decoded.
    Display sizes are in centimetres as laid out on the page.
    """

    location: Location
    source: str
    width_px: int | None = None
    height_px: int | None = None
    display_width_cm: float | None = None
    display_height_cm: float | None = None
    alt_text: str = ""
    caption: str = ""
    remote: bool = False
    readable: bool = True

    @property
    def pixel_area(self) -> int | None:
        if self.width_px is None or self.height_px is None:
            return None
        return self.width_px * self.height_px

    @property
    def display_area_cm2(self) -> float | None:
        if self.display_width_cm is None or self.display_height_cm is None:
            return None
        return self.display_width_cm * self.display_height_cm


@dataclass(frozen=True, slots=True)
class Document:
    """One version of a lesson, as read from one file (or several parts, in order).

    ``excluded`` names what the reader deliberately left out of the lesson text (running
    headers, comments, ...) so a report can say so; ``warnings`` are problems that did not
    stop the reading; ``cannot_show`` names what this format cannot show (a PDF draws
    underline as shapes), so the measures that need it are unknown rather than zero.
    ``outline`` holds the heading levels as the source numbered them, in rank order (a heading
    of level ``r`` stood at ``outline[r - 1]``: Markdown's ``#`` count, Word's Heading n), so
    that the parts of one lesson are ranked together when joined.
    """

    path: str
    format: str
    blocks: tuple[Block, ...]
    figures: tuple[Figure, ...] = ()
    pages: int | None = None
    excluded: tuple[str, ...] = ()
    warnings: tuple[str, ...] = field(default=())
    cannot_show: frozenset[Capability] = frozenset()
    outline: tuple[int, ...] = ()

    @property
    def name(self) -> str:
        from pathlib import PurePath

        return PurePath(self.path).name

    def blocks_of(self, *kinds: BlockKind) -> tuple[Block, ...]:
        return tuple(block for block in self.blocks if block.kind in kinds)


@dataclass(frozen=True, slots=True)
class PostTestItem:
    """One post-test item; ``source`` is the file name, ``location`` where the question is."""

    id: str
    question: str
    answer: str
    source: str
    location: Location | None
