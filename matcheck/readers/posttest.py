"""Read a post-test: its items, each with an id, the question and optionally the answer.

Two layouts are read (documented in docs/study-file.md):

- **CSV** (by the ``.csv`` extension): a header row with the columns ``id`` and ``question``
  and optionally ``answer`` or ``key`` (names case-insensitive, spaces trimmed; other columns
  are ignored). UTF-8, with or without a byte-order mark.
- **A document** (Markdown, DOCX, PDF or text), read like a lesson: every top-level list item
  is a question, and so is every paragraph that starts ``Q3.``, ``3.`` or ``Question 3:``. A
  block after it that starts ``Answer:`` or ``Key:`` (a paragraph, or a list item, nested or
  not) is its answer. Other blocks (headings, instructions, the options of a multiple-choice
  item) are not read, so that a distractor's words are not taken for what the item needs.

Ids are ``Q1``, ``Q2``, ... in order, unless the text states a number (``Q3.``, ``3.``,
``Question 3:``), which then gives the id ``Q3``.
"""

from __future__ import annotations

import csv
import io
import re
from collections.abc import Iterable, Sequence
from pathlib import Path

from matcheck.errors import ConfigError, CorruptFile, InputError, LimitExceeded
from matcheck.limits import ReadLimits
from matcheck.model import BlockKind, Document, Location, PostTestItem
from matcheck.readers.builder import DocumentBuilder, normalize_text

LAYOUT_HINT = (
    "write each question as a numbered list item, or as a paragraph starting 'Q1.', followed "
    "by a paragraph starting 'Answer:'; or use a CSV file with the columns id, question, answer"
)
# "Q3." / "Q3:" / "Q3)" / "Question 3:" / "3." / "3)" at the start of a block.
_NUMBERED = re.compile(
    r"^(?:q(?:uestion)?\s*(?P<q>\d+[a-z]?)\s*[.:)]|(?P<n>\d+)\s*[.)])\s*", re.IGNORECASE
)
_ANSWER = re.compile(r"^(?:answer|key)\s*:\s*", re.IGNORECASE)
# Plain text joins a paragraph's lines, so "1. Question?\nAnswer: ..." is one block.
_INLINE_ANSWER = re.compile(r"\s(?:Answer|ANSWER|Key|KEY)\s*:\s+")


def read_posttest(path: Path, limits: ReadLimits) -> list[PostTestItem]:
    """Read the items of one post-test file, in order.

    Raises :class:`~matcheck.errors.ConfigError` naming the file when it holds no item, two
    items with one id, or (CSV) a row without an id or a question;
    :class:`~matcheck.errors.InputError` when the file cannot be read.
    """
    path = Path(path)
    if path.suffix.lower() == ".csv":
        items = _read_csv(path, limits)
    else:
        items = _read_document(path, limits)
    if not items:
        raise ConfigError("no post-test items found", path=str(path), hint=LAYOUT_HINT)
    return items


def _read_csv(path: Path, limits: ReadLimits) -> list[PostTestItem]:
    from matcheck.inputs import note
    from matcheck.readers.decode import decode_lesson_text

    note(path)
    shown = str(path)
    if not path.is_file():
        raise InputError("no such file" if not path.exists() else "is not a file", path=shown)
    size = path.stat().st_size
    if size > limits.max_file_bytes:
        raise LimitExceeded(
            f"the file is {size / 2**20:.0f} MiB, above the limit of "
            f"{limits.max_file_bytes / 2**20:.0f} MiB",
            path=shown,
        )
    try:
        data = path.read_bytes()
    except OSError as error:
        raise InputError(f"cannot be read ({error.strerror})", path=shown) from None
    if data.startswith((b"PK\x03\x04", b"%PDF-", b"\xd0\xcf\x11\xe0")):
        raise InputError(
            "is named .csv but is not CSV text (it looks like a Word, PDF or other binary "
            "file); export the post-test as CSV, or give the document with its own extension",
            path=shown,
        )
    text, _ = decode_lesson_text(data, path)
    try:
        rows = list(csv.reader(io.StringIO(text, newline="")))
    except csv.Error as error:
        raise CorruptFile(f"is not valid CSV ({error})", path=shown) from None
    if not rows:
        return []
    header = [name.strip().lower() for name in rows[0]]
    columns = {name: index for index, name in reversed(list(enumerate(header))) if name}
    missing = [name for name in ("id", "question") if name not in columns]
    if missing:
        raise ConfigError(
            f"the header row has no {' or '.join(missing)} column "
            f"(found: {', '.join(repr(name) for name in header) or 'nothing'})",
            path=shown,
            hint="the first row must name the columns id, question and optionally answer",
        )
    if "answer" in columns and "key" in columns:
        raise ConfigError(
            "the header row has both an answer and a key column; keep one", path=shown
        )
    answer_column = columns.get("answer", columns.get("key"))

    def cell(row: list[str], index: int | None) -> str:
        return normalize_text(row[index]) if index is not None and index < len(row) else ""

    found: list[tuple[PostTestItem, str]] = []
    # Row numbers as a spreadsheet shows them: the header is row 1.
    for number, row in enumerate(rows[1:], start=2):
        if not any(value.strip() for value in row):
            continue
        item_id, question = cell(row, columns["id"]), cell(row, columns["question"])
        for name, value in (("id", item_id), ("question", question)):
            if not value:
                raise ConfigError(f"row {number} has an empty {name}", path=shown)
        item = PostTestItem(item_id, question, cell(row, answer_column), path.name, None)
        found.append((item, f"row {number}"))
    return _unique(found, shown)


def _read_document(path: Path, limits: ReadLimits) -> list[PostTestItem]:
    from matcheck.readers import read

    document = read(path, limits)
    shown = str(path)
    # Each entry: stated id or None, question, answer parts, location.
    drafts: list[tuple[str | None, str, list[str], Location]] = []
    for block in document.blocks:
        if block.kind not in (BlockKind.PARAGRAPH, BlockKind.LIST_ITEM):
            continue
        label = _ANSWER.match(block.text)
        if label:
            if not drafts:
                raise ConfigError(
                    f"an answer ({block.location.describe()}) comes before any question",
                    path=shown,
                    hint=LAYOUT_HINT,
                )
            drafts[-1][2].append(block.text[label.end() :])
            continue
        numbered = _NUMBERED.match(block.text)
        top_item = block.kind is BlockKind.LIST_ITEM and block.level <= 1
        if not (top_item or (numbered and block.kind is BlockKind.PARAGRAPH)):
            continue
        stated = None
        text = block.text
        if numbered:
            stated = f"Q{(numbered.group('q') or numbered.group('n')).upper()}"
            text = text[numbered.end() :]
        question, answer = text, []
        inline = _INLINE_ANSWER.search(text)
        if inline:
            question, answer = text[: inline.start()], [text[inline.end() :]]
        if not question.strip():
            raise ConfigError(
                f"the item at {block.location.describe()} has no question text", path=shown
            )
        drafts.append((stated, question.strip(), answer, block.location))
    found = [
        (
            PostTestItem(
                stated or f"Q{ordinal}",
                question,
                " ".join(part.strip() for part in answer if part.strip()),
                path.name,
                location,
            ),
            location.describe(),
        )
        for ordinal, (stated, question, answer, location) in enumerate(drafts, start=1)
    ]
    return _unique(found, shown)


def _unique(found: Iterable[tuple[PostTestItem, str]], shown: str) -> list[PostTestItem]:
    """The items, or a ConfigError naming the first id given twice and both places."""
    seen: dict[str, str] = {}
    items = []
    for item, where in found:
        if item.id in seen:
            raise ConfigError(
                f"post-test item id {item.id!r} is used twice ({seen[item.id]} and {where})",
                path=shown,
            )
        seen[item.id] = where
        items.append(item)
    return items


# Block numbers of an item's question and answer in :func:`items_document` (None: empty).
Slots = tuple[tuple[int | None, int | None], ...]


def items_document(items: Sequence[PostTestItem]) -> tuple[Document, Slots]:
    """One throwaway document, two blocks per item, so that the items' text is normalised and
    tokenised exactly as lesson text is; with where each item's question and answer are."""
    builder = DocumentBuilder("post-test", "text")
    slots = []
    for item in items:
        question = builder.add_block(BlockKind.PARAGRAPH, item.question)
        answer = builder.add_block(BlockKind.PARAGRAPH, item.answer)
        slots.append(
            (
                None if question is None else question.location.block,
                None if answer is None else answer.location.block,
            )
        )
    return builder.build(), tuple(slots)
