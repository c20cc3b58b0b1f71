"""Read a PDF lesson into a :class:`~matcheck.model.Document`.

A PDF stores positioned glyphs, not paragraphs, so the structure is inferred from the layout
(see :mod:`matcheck.readers.pdf_layout` and :mod:`matcheck.readers.pdf_structure`): lines from
baselines, paragraphs from vertical gaps and font-size changes, headings from font size, bold
and italic from font names, list items from markers, captions from "Figure N" next to images,
simple tables from text set in aligned columns (see :mod:`matcheck.readers.pdf_tables`).
Running headers, footers and page numbers are left out and recorded in ``Document.excluded``.
The PDF sections cited in these modules are listed in docs/references.md §13.

What this reader does not do, by design:

- Only simple tables are found: a PDF has no table structure, only text placed in a grid, and
  a table that does not fit the rules of :mod:`matcheck.readers.pdf_tables` (drawn column by
  column, cells not aligned, ...) comes through as paragraphs.
- Alt text comes only from a tagged PDF's structure tree (the /Alt of the element around the
  image, see :mod:`matcheck.readers.pdf_alt`); an untagged PDF's figures have no alt text.
- Text is taken in content-stream order, which is reading order for PDFs written by word
  processors and typesetters; a PDF that draws its text out of order reads out of order.
- Rotated text is not set apart; footnotes are not told apart from body text; an encrypted
  PDF opens only with an empty user password (and AES only with pypdf's optional
  'cryptography' package).
- Paragraphs are told apart by vertical gaps, first-line indents and font changes;
  paragraphs set with none of these between them run together.
- Running headers and footers are found by repetition, so a short line at the very top or
  bottom of most pages that differs from page to page only in its digits is taken for one.

Images are the image XObjects drawn with ``Do`` (also inside form XObjects) and inline
images; an image drawn twice counts twice, as a reader sees it twice. Their pixel size is the
image dictionary's /Width and /Height (no pixel is decoded) and their displayed size comes
from the CTM in force when they are drawn.
"""

from __future__ import annotations

import io
import itertools
import logging
import warnings
from collections.abc import Iterator
from contextlib import contextmanager
from dataclasses import replace
from pathlib import Path
from typing import TYPE_CHECKING, NoReturn

from matcheck.errors import CorruptFile, EncryptedFile, LimitExceeded, NoText
from matcheck.limits import ReadLimits
from matcheck.model import BlockKind, Capability, Document
from matcheck.readers.builder import DocumentBuilder
from matcheck.readers.wordlimit import WordBudget

if TYPE_CHECKING:
    from pypdf import PdfReader

    from matcheck.readers.pdf_layout import Line
    from matcheck.readers.pdf_page import PageContent
    from matcheck.readers.pdf_structure import Piece

# Fewer visible characters per page than this, with images present, is a scan without OCR
# (common practice: a page of text holds well over a thousand).
_SCANNED_CHARS_PER_PAGE = 20
_REASON_LENGTH = 120

# What pypdf (and the standard library under it) raises on broken input.
_BROKEN = (
    ValueError,
    KeyError,
    TypeError,
    AttributeError,
    IndexError,
    AssertionError,
    RecursionError,
    ArithmeticError,
    OSError,
    EOFError,
    UnicodeError,
    # pypdf's word for a filter or feature it does not know (a damaged name, usually).
    NotImplementedError,
)


class _Collect(logging.Handler):
    def __init__(self) -> None:
        super().__init__(logging.WARNING)
        self.messages: list[str] = []

    def emit(self, record: logging.LogRecord) -> None:
        self.messages.append(record.getMessage())


@contextmanager
def _pypdf_messages() -> Iterator[list[str]]:
    """Collect what pypdf logs about repairs instead of letting it reach the terminal."""
    logger = logging.getLogger("pypdf")
    handler = _Collect()
    propagate = logger.propagate
    logger.addHandler(handler)
    logger.propagate = False
    try:
        with warnings.catch_warnings(record=True) as caught:
            warnings.simplefilter("always")
            yield handler.messages
        handler.messages.extend(str(warning.message) for warning in caught)
    finally:
        logger.removeHandler(handler)
        logger.propagate = propagate


def _short(message: str) -> str:
    text = " ".join(message.split())
    return text if len(text) <= _REASON_LENGTH else text[: _REASON_LENGTH - 3] + "..."


def _reason(exc: BaseException) -> str:
    return _short(str(exc)) or type(exc).__name__


def _corrupt(exc: BaseException, shown: str) -> NoReturn:
    from pypdf.errors import LimitReachedError

    if isinstance(exc, LimitReachedError):
        # pypdf's own guards (a stream that inflates past 75 MB, a page tree too deep or too
        # large, ...): a hostile or absurd file, not a damaged one.
        raise LimitExceeded(
            f"the PDF is beyond one of pypdf's safety limits: {_reason(exc)}",
            path=shown,
            hint="a lesson PDF should never reach these; check where this file came from",
        ) from exc
    if isinstance(exc, NotImplementedError):
        raise CorruptFile(
            f"the PDF uses something that cannot be read: {_reason(exc)}", path=shown
        ) from exc
    raise CorruptFile(f"the PDF is damaged or truncated: {_reason(exc)}", path=shown) from exc


def _open(data: bytes, shown: str) -> PdfReader:
    from pypdf import PasswordType, PdfReader
    from pypdf.errors import DependencyError, PyPdfError

    protected = EncryptedFile(
        "the PDF is protected by a password", path=shown, hint="save an unprotected copy"
    )
    try:
        reader = PdfReader(io.BytesIO(data), strict=False)
        encrypted = reader.is_encrypted
    except (PyPdfError, *_BROKEN) as exc:
        _corrupt(exc, shown)
    if not encrypted:
        return reader
    try:
        if reader.decrypt("") == PasswordType.NOT_DECRYPTED:
            raise protected
    except DependencyError as exc:
        # AES needs the optional 'cryptography' package in pypdf.
        raise EncryptedFile(
            "the PDF is encrypted with AES, which cannot be decrypted in this installation",
            path=shown,
            hint="save an unprotected copy, or install the 'cryptography' package",
        ) from exc
    except NotImplementedError as exc:
        raise EncryptedFile(
            f"the PDF uses an encryption that cannot be opened: {_reason(exc)}",
            path=shown,
            hint="save an unprotected copy",
        ) from exc
    except (PyPdfError, *_BROKEN) as exc:
        _corrupt(exc, shown)
    return reader


def _read_pages(
    reader: PdfReader, limits: ReadLimits, shown: str
) -> tuple[list[PageContent], bool]:
    """The pages' content, and whether the PDF is tagged (has a structure tree)."""
    from pypdf.errors import PyPdfError

    from matcheck.readers.pdf_alt import alt_texts
    from matcheck.readers.pdf_fonts import FontStyles
    from matcheck.readers.pdf_page import read_page

    try:
        count = len(reader.pages)
    except (PyPdfError, *_BROKEN) as exc:
        _corrupt(exc, shown)
    if count > limits.max_pages:
        raise LimitExceeded(
            f"the PDF has {count} pages, above the limit of {limits.max_pages} pages",
            path=shown,
            hint="raise it with --limit max_pages=N if this is really a lesson",
        )
    styles = FontStyles()
    tags = alt_texts(reader)
    pages: list[PageContent] = []
    budget = WordBudget(limits, shown, "PDF")
    for index in range(count):
        try:
            page = reader.pages[index]
            reference = page.indirect_reference
            number = reference.idnum if reference is not None else None
            page_alt = tags.by_mcid.get(number, {}) if number is not None else {}
            content = read_page(page, index + 1, styles, page_alt)
        except (PyPdfError, *_BROKEN) as exc:
            _corrupt(exc, shown)
        _attach_alt(content, tags.unattached.get(number, []) if number is not None else [])
        for fragment in content.fragments:
            budget.add(fragment.text)
        pages.append(content)
    return pages, tags.tagged


def _monospace_body(lines: list[list[Line]]) -> None:
    """A PDF whose text is mostly monospace (a typewriter look) marks no code by font."""
    characters = monospace = 0
    for page_lines in lines:
        for line in page_lines:
            for fragment in line.fragments:
                visible = len(fragment.text.strip())
                characters += visible
                monospace += visible if fragment.monospace else 0
    if monospace * 2 <= characters:
        return
    for page_lines in lines:
        for line in page_lines:
            line.fragments = [replace(f, monospace=False) for f in line.fragments]


def _attach_alt(content: PageContent, alts: list[str]) -> None:
    """Give a page's unattached figure alt texts to its images without one, in order."""
    if not alts:
        return
    pending = iter(alts)
    for index, image in enumerate(content.images):
        if image.alt_text:
            continue
        alt = next(pending, None)
        if alt is None:
            return
        content.images[index] = replace(image, alt_text=alt)


def _check_text(pages: list[PageContent], shown: str) -> None:
    chars = sum(
        len("".join(fragment.text.split())) for page in pages for fragment in page.fragments
    )
    if any(page.images for page in pages) and chars < _SCANNED_CHARS_PER_PAGE * len(pages):
        raise NoText(
            "the PDF has no text layer; it looks scanned", path=shown, hint="run OCR on it first"
        )
    if chars == 0:
        raise NoText("the PDF holds no text", path=shown)


def _emit(builder: DocumentBuilder, pages: list[PageContent], pieces: list[Piece]) -> None:
    captions = {
        (piece.page, piece.caption_of): piece.runs()
        for piece in pieces
        if piece.caption_of is not None
    }
    by_page: dict[int, list[Piece]] = {}
    for piece in pieces:
        by_page.setdefault(piece.page, []).append(piece)
    groups: dict[int, int] = {}
    for content in pages:
        # Figures go in reading order: before the first block that starts below their middle.
        order = sorted(range(len(content.images)), key=lambda i: -content.images[i].center)

        def figure(index: int, content: PageContent = content) -> None:
            image = content.images[index]
            caption = "".join(text for text, _ in captions.get((content.number, index), []))
            builder.add_figure(
                image.source,
                width_px=image.width_px,
                height_px=image.height_px,
                display_width_cm=image.width_cm,
                display_height_cm=image.height_cm,
                alt_text=image.alt_text,
                caption=caption,
                page=content.number,
            )

        for piece in by_page.get(content.number, []):
            while order and content.images[order[0]].center >= piece.block.top:
                figure(order.pop(0))
            if piece.kind is BlockKind.CODE:
                code = builder.new_group()
                for line in piece.block.lines:
                    builder.add_block(BlockKind.CODE, line.text, group=code, page=piece.page)
                continue
            group = None
            if piece.group is not None:
                group = groups.setdefault(piece.group, builder.new_group())
            builder.add_block(
                piece.kind, piece.runs(), level=piece.level, group=group, page=piece.page
            )
        for index in order:
            figure(index)


def read_pdf(path: Path, limits: ReadLimits) -> Document:
    """Read a PDF lesson (see the module docstring for what is inferred and what is not).

    Raises :class:`CorruptFile`, :class:`EncryptedFile`, :class:`LimitExceeded` or
    :class:`NoText` (scanned or empty) naming the file.
    """
    from matcheck.readers.pdf_layout import (
        build_lines,
        dominant_size,
        remove_running_images,
        remove_running_lines,
        typical_leading,
    )
    from matcheck.readers.pdf_structure import classify
    from matcheck.readers.pdf_tables import split_page
    from matcheck.readers.pdf_text import DOCUMENT_WORDS, document_words

    shown = str(path)
    try:
        data = path.read_bytes()
    except OSError as exc:
        raise CorruptFile(f"the PDF cannot be read: {_reason(exc)}", path=shown) from exc
    builder = DocumentBuilder(shown, "pdf")
    with _pypdf_messages() as problems:
        reader = _open(data, shown)
        pages, tagged = _read_pages(reader, limits, shown)
    builder.pages = len(pages)
    _check_text(pages, shown)
    lines = [build_lines(content) for content in pages]
    if remove_running_lines(pages, lines):
        builder.exclude("running headers, footers and page numbers")
    if remove_running_images(pages):
        builder.exclude("images repeated in running headers or footers (logos)")
    _monospace_body(lines)
    leading = typical_leading(lines)
    body = dominant_size(line for page_lines in lines for line in page_lines)
    ids = itertools.count(1)
    blocks = [block for page_lines in lines for block in split_page(page_lines, leading, body, ids)]
    words = document_words(line.text for page_lines in lines for line in page_lines)
    token = DOCUMENT_WORDS.set(words)
    try:
        pieces = classify(blocks, {content.number: content.images for content in pages})
        _emit(builder, pages, pieces)
    finally:
        DOCUMENT_WORDS.reset(token)
    if not builder.blocks:
        raise NoText("the PDF holds no text besides running headers and page numbers", path=shown)
    if problems:
        builder.warn(f"the PDF has errors that were worked around: {_short(problems[0])}")
    document = builder.build()
    if not tagged and document.figures:
        # Only a tagged PDF can carry alt text: unknown here, never "missing".
        document = replace(document, cannot_show=frozenset({Capability.ALT_TEXT}))
    return document
