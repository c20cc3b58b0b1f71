"""Read a plain-text lesson: paragraphs are separated by blank lines, nothing more.

Plain text states no structure, so none is guessed: every paragraph is a PARAGRAPH block
(a short line is not taken for a heading). Lines inside a paragraph are joined with a space;
a form feed (a page break in text exported from a word processor) ends a paragraph like a
blank line does.
"""

from __future__ import annotations

from pathlib import Path

from matcheck.limits import ReadLimits
from matcheck.model import BlockKind, Document
from matcheck.readers.builder import DocumentBuilder
from matcheck.readers.decode import read_lesson_text


def read_text(path: Path, limits: ReadLimits) -> Document:
    """Read ``path`` as plain text; ``Location.line`` is each paragraph's first line (1-based).

    Raises :class:`~matcheck.errors.LimitExceeded` beyond ``limits.max_words``.
    """
    text, warnings = read_lesson_text(path, limits, "text file")
    builder = DocumentBuilder(str(path), "text")
    for warning in warnings:
        builder.warn(warning)
    for first_line, lines in split_paragraphs(text):
        builder.add_block(BlockKind.PARAGRAPH, " ".join(lines), line=first_line)
    return builder.build()


def split_paragraphs(text: str) -> list[tuple[int, list[str]]]:
    """Split text into ``(first line number, lines)`` paragraphs at blank lines and form feeds."""
    paragraphs: list[tuple[int, list[str]]] = []
    current: list[str] = []
    first_line = 0

    def flush() -> None:
        nonlocal current
        if current:
            paragraphs.append((first_line, current))
            current = []

    # Split on "\n" only: str.splitlines() would also break at characters such as U+0085
    # that are ordinary text in some encodings, and would shift the line numbers.
    for number, line in enumerate(text.split("\n"), start=1):
        for index, piece in enumerate(line.split("\f")):
            if index:
                flush()
            if not piece.strip():
                flush()
                continue
            if not current:
                first_line = number
            current.append(piece)
    flush()
    return paragraphs
