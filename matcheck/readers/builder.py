"""Assemble a :class:`~matcheck.model.Document` from the pieces a reader finds.

Every reader feeds text as *runs* (a piece of text plus the emphasis it carries) to
:class:`DocumentBuilder`. The builder owns what must be the same for every format, so that the
same lesson read from DOCX, PDF or Markdown comes out the same:

- Unicode and white space are normalised (:func:`matcheck.textnorm.fold`: NFKC, quotes,
  apostrophes and dashes folded to ASCII, soft hyphens and zero-width characters gone; then
  runs of white space collapse to one plain space);
- emphasis spans are recomputed on the normalised text;
- empty blocks are dropped;
- block indices, paragraph ordinals and the enclosing section heading are assigned;
- heading levels become ranks in the document's outline: the distinct levels a document uses,
  shallowest first, are ranks 1, 2, 3, ... (a Word Title above Heading 1, read as level 0, is
  rank 1), so the same outline gives the same levels in every format.
"""

from __future__ import annotations

import unicodedata
from collections.abc import Iterable
from dataclasses import replace
from typing import TYPE_CHECKING

from matcheck.model import Block, BlockKind, Document, Emphasis, Figure, Location, Span
from matcheck.textnorm import fold

if TYPE_CHECKING:
    from matcheck.readers.wordlimit import WordBudget

Run = tuple[str, frozenset[Emphasis]]

NO_EMPHASIS: frozenset[Emphasis] = frozenset()

# Distinct warnings kept per document; a hostile file (100,000 broken image links) would
# otherwise bury the report in them. The rest are counted in one last warning.
MAX_WARNINGS = 50


def normalize_text(text: str) -> str:
    """Normalise one string the way block text is normalised (runs not needed)."""
    return normalize_runs([(text, NO_EMPHASIS)])[0]


def normalize_runs(runs: Iterable[Run]) -> tuple[str, tuple[Span, ...]]:
    """Join runs into normalised block text and the emphasis spans over it."""
    chars: list[str] = []
    kinds: list[frozenset[Emphasis]] = []
    pending_space = False
    for raw, emphasis in runs:
        for char in fold(raw):
            if char.isspace() or unicodedata.category(char) == "Zs":
                pending_space = bool(chars)
                continue
            if pending_space:
                chars.append(" ")
                # A space between two emphasised pieces of one kind keeps the emphasis whole.
                kinds.append(kinds[-1] & emphasis if kinds else NO_EMPHASIS)
                pending_space = False
            chars.append(char)
            kinds.append(emphasis)
    return "".join(chars), _spans(kinds)


def _spans(kinds: list[frozenset[Emphasis]]) -> tuple[Span, ...]:
    spans: list[Span] = []
    for kind in Emphasis:
        start: int | None = None
        for index, char_kinds in enumerate([*kinds, NO_EMPHASIS]):
            if kind in char_kinds and start is None:
                start = index
            elif kind not in char_kinds and start is not None:
                spans.append(Span(start, index, kind))
                start = None
    spans.sort(key=lambda span: (span.start, span.end, span.kind))
    return tuple(spans)


class DocumentBuilder:
    """Collect blocks and figures in reading order, then :meth:`build` the document."""

    def __init__(self, path: str, format: str, budget: WordBudget | None = None) -> None:
        self.path = path
        self.format = format
        # Counts the words of every block added and refuses past ReadLimits.max_words.
        self.budget = budget
        self._blocks: list[Block] = []
        self._figures: list[Figure] = []
        # Indices of figures added without a caption, latest last (some may have one since).
        self._uncaptioned: list[int] = []
        self._warnings: list[str] = []
        self._warned: set[str] = set()
        self._more_warnings = 0
        self._excluded: list[str] = []
        self._section: str | None = None
        self._paragraphs = 0
        self._groups = 0
        self.pages: int | None = None

    def new_group(self) -> int:
        """A fresh id for a list or a table."""
        self._groups += 1
        return self._groups

    def add_block(
        self,
        kind: BlockKind,
        runs: Iterable[Run] | str,
        *,
        level: int = 0,
        group: int | None = None,
        page: int | None = None,
        line: int | None = None,
    ) -> Block | None:
        """Add a block; returns it, or ``None`` when its text is empty after normalising."""
        if isinstance(runs, str):
            runs = [(runs, NO_EMPHASIS)]
        text, spans = normalize_runs(runs)
        if not text:
            return None
        if self.budget is not None:
            self.budget.add(text)
        if kind is BlockKind.HEADING:
            self._section = text
        ordinal = None
        if kind is BlockKind.PARAGRAPH:
            self._paragraphs += 1
            ordinal = self._paragraphs
        location = Location(
            len(self._blocks),
            page=page,
            line=line,
            section=self._section,
            paragraph=ordinal,
            after_paragraph=None if ordinal else self._paragraphs,
        )
        block = Block(kind, text, location, level, group, spans)
        self._blocks.append(block)
        return block

    def add_figure(
        self,
        source: str,
        *,
        width_px: int | None = None,
        height_px: int | None = None,
        display_width_cm: float | None = None,
        display_height_cm: float | None = None,
        alt_text: str = "",
        caption: str = "",
        remote: bool = False,
        readable: bool = True,
        page: int | None = None,
        line: int | None = None,
    ) -> Figure:
        location = Location(
            len(self._blocks) - 1,
            page=page,
            line=line,
            section=self._section,
            after_paragraph=self._paragraphs,
        )
        figure = Figure(
            location,
            source,
            width_px,
            height_px,
            display_width_cm,
            display_height_cm,
            normalize_text(alt_text),
            normalize_text(caption),
            remote,
            readable,
        )
        self._figures.append(figure)
        if not figure.caption:
            self._uncaptioned.append(len(self._figures) - 1)
        return figure

    def set_caption(self, figure_index: int, caption: str) -> None:
        """Attach a caption found after its figure (as in most layouts)."""
        figure = self._figures[figure_index]
        from dataclasses import replace

        self._figures[figure_index] = replace(figure, caption=normalize_text(caption))

    def caption_latest(self, caption: str) -> bool:
        """Caption the latest figure that has no caption yet; ``False`` if there is none.

        Constant time per caption, so a file of many captions cannot make reading quadratic.
        """
        while self._uncaptioned:
            index = self._uncaptioned.pop()
            if not self._figures[index].caption:
                self.set_caption(index, caption)
                return True
        return False

    @property
    def figures(self) -> tuple[Figure, ...]:
        return tuple(self._figures)

    @property
    def figure_count(self) -> int:
        """``len(figures)`` without copying them (readers ask once per caption)."""
        return len(self._figures)

    @property
    def blocks(self) -> tuple[Block, ...]:
        return tuple(self._blocks)

    def warn(self, message: str) -> None:
        if message in self._warned:
            return
        self._warned.add(message)
        if len(self._warnings) < MAX_WARNINGS:
            self._warnings.append(message)
        else:
            self._more_warnings += 1

    def exclude(self, what: str) -> None:
        """Record something deliberately left out of the lesson text."""
        if what not in self._excluded:
            self._excluded.append(what)

    def build(self) -> Document:
        outline = sorted({block.level for block in self._blocks if block.kind is BlockKind.HEADING})
        blocks = _outline_ranks(self._blocks, outline)
        warnings = tuple(self._warnings)
        if self._more_warnings:
            warnings += (f"and {self._more_warnings} more warnings not shown",)
        return Document(
            path=self.path,
            format=self.format,
            blocks=blocks,
            figures=tuple(self._figures),
            pages=self.pages,
            excluded=tuple(self._excluded),
            warnings=warnings,
            outline=tuple(outline),
        )


def _outline_ranks(blocks: list[Block], levels: list[int]) -> tuple[Block, ...]:
    """Heading levels replaced by their rank among the levels the document uses.

    A Word lesson with Title, Heading 1 and Heading 2, a Markdown one with ``#``, ``##`` and
    ``###`` and a PDF with three heading sizes all have ranks 1, 2 and 3. A skipped level (a
    ``###`` straight under ``#``) closes up, as it does in any outline view.
    """
    if levels == list(range(1, len(levels) + 1)):
        return tuple(blocks)
    rank = {level: index for index, level in enumerate(levels, start=1)}
    return tuple(
        replace(block, level=rank[block.level]) if block.kind is BlockKind.HEADING else block
        for block in blocks
    )
