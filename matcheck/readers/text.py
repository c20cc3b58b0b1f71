"""Read a plain-text lesson: paragraphs, list items and title lines, as a reader sees them.

Paragraphs are separated by blank lines; a form feed (a page break in text exported from a
word processor) ends a paragraph like a blank line does. Lines inside a paragraph are joined
with a space. Two kinds of line are recognised (docs/formats.md, "Plain text"):

- a **list item** is a line that starts with a bullet (``-``, ``*``, ``+``, ``•``, ``–`` ...)
  or a number or lower-case letter followed by ``.`` or ``)``, then a space and text. The
  marker is left out of the text, as Markdown leaves it out; the lines that follow without a
  marker, up to a blank line, continue the item. Items indented by two spaces or more are
  nested (level 2 and deeper). Consecutive items form one list. A paragraph that is a single
  marked line, alone between blank lines, stays a paragraph with its marker;
- a **title** is a paragraph of a single line, of at most :data:`TITLE_MAX_WORDS` words, that
  does not end in sentence punctuation (``. ! ? : ; ,``), or such a line directly above a list.

Everything else is a paragraph. The structure counts (headings, lists) are still reported as
unknown for plain text, since the file does not mark them; the recognised units serve the
sentences: a title or a list item is never glued to the next sentence.
"""

from __future__ import annotations

import re
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
        _add_paragraph(builder, first_line, lines)
    return builder.build()


# Titles are short: 10 words covers chapter and section titles of lessons (judgment).
TITLE_MAX_WORDS = 10
_ITEM = re.compile(r"^(?P<indent>[ \t]*)(?:[-*+•◦▪‣⁃–]|\d{1,3}[.)]|[a-z][.)])[ \t]+(?=\S)")
_SENTENCE_END = ".!?:;,…"


def _is_title(line: str) -> bool:
    words = line.split()
    return (
        0 < len(words) <= TITLE_MAX_WORDS
        and line.rstrip()[-1] not in _SENTENCE_END
        and any(char.isalnum() for char in line)
    )


def _add_paragraph(builder: DocumentBuilder, first_line: int, lines: list[str]) -> None:
    """Add the blocks of one paragraph: leading text, then any list items."""
    lead: list[str] = []
    items: list[tuple[int, int, list[str]]] = []  # (line, level, lines)
    for offset, line in enumerate(lines):
        marker = _ITEM.match(line)
        if marker is not None:
            indent = len(marker.group("indent").expandtabs(4))
            level = 1 + min(indent // 2, 5)
            items.append((first_line + offset, level, [line[marker.end() :]]))
        elif items:
            items[-1][2].append(line)
        else:
            lead.append(line)
    if len(items) == 1 and not lead and len(items[0][2]) == len(lines):
        # A lone marked line between blank lines ("5) Which beans suit espresso?") is read as
        # written: a numbered paragraph keeps its number (post-tests state ids this way).
        lead, items = lines, []
    if lead:
        title = len(lead) == 1 and _is_title(lead[0])
        kind = BlockKind.HEADING if title else BlockKind.PARAGRAPH
        builder.add_block(kind, " ".join(lead), level=1 if title else 0, line=first_line)
    if items:
        group = builder.new_group()
        for line_number, level, item_lines in items:
            builder.add_block(
                BlockKind.LIST_ITEM, " ".join(item_lines), level=level, group=group,
                line=line_number,
            )  # fmt: skip


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
