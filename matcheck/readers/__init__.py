"""Readers: turn a lesson file into a :class:`~matcheck.model.Document`.

:func:`read` checks the path, sniffs the format from the bytes (the extension only breaks a
tie between Markdown and plain text), and hands the file to the reader registered for that
format. A file whose content contradicts its extension (a PDF named ``.docx``) is read as what
its bytes say, with a warning. Readers know nothing of measures or reports.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, replace
from pathlib import Path

from matcheck.errors import InputError, LimitExceeded, MatcheckError, NoText
from matcheck.limits import DEFAULT_LIMITS, ReadLimits
from matcheck.model import BlockKind, Capability, Document
from matcheck.readers.builder import MAX_WARNINGS
from matcheck.readers.deadline import deadline
from matcheck.readers.sniff import EXTENSIONS, looks_like_markdown, sniff_format

Reader = Callable[[Path, ReadLimits], Document]


def _docx(path: Path, limits: ReadLimits) -> Document:
    from matcheck.readers.docx import read_docx

    return read_docx(path, limits)


def _pdf(path: Path, limits: ReadLimits) -> Document:
    from matcheck.readers.pdf import read_pdf

    return read_pdf(path, limits)


def _markdown(path: Path, limits: ReadLimits) -> Document:
    from matcheck.readers.markdown import read_markdown

    return read_markdown(path, limits)


def _text(path: Path, limits: ReadLimits) -> Document:
    from matcheck.readers.text import read_text

    return read_text(path, limits)


@dataclass(frozen=True, slots=True)
class ReaderSpec:
    """One registered reader: its format name, the function, and what the format cannot show
    (``why`` says so in the docs and in the note of each measure left unknown)."""

    format: str
    read: Reader
    cannot_show: frozenset[Capability] = frozenset()
    why: str = ""


# Format name -> reader. Readers are imported only when used, so ``--help`` stays fast.
READERS: dict[str, ReaderSpec] = {}


def register_reader(spec: ReaderSpec) -> ReaderSpec:
    """Add a reader (the format must also be recognised by :mod:`matcheck.readers.sniff`)."""
    READERS[spec.format] = spec
    return spec


register_reader(ReaderSpec("docx", _docx))
register_reader(
    ReaderSpec(
        "pdf",
        _pdf,
        frozenset({Capability.UNDERLINE, Capability.HIGHLIGHT}),
        "underline and highlight are drawn shapes in a PDF, not text properties; the reader "
        "sees bold and italic from font names",
    )
)
register_reader(ReaderSpec("markdown", _markdown))
register_reader(
    ReaderSpec(
        "text",
        _text,
        frozenset(Capability),
        "plain text has no markup: no headings, lists, tables, code or emphasis to count, "
        "and no pictures to describe",
    )
)


def read(path: str | Path, limits: ReadLimits = DEFAULT_LIMITS) -> Document:
    """Read one lesson file.

    Raises :class:`~matcheck.errors.InputError` (or a subclass) naming the file when it does
    not exist, is not a regular file, is empty, too large, of an unknown or broken format,
    holds no lesson text, or takes longer than ``limits.max_read_seconds`` to read.
    """
    try:
        return _read(Path(path), limits)
    except MatcheckError as error:
        # The error is one line on stderr: a file name with a newline or other control
        # characters (or bytes that are not UTF-8) is shown escaped.
        if error.path is not None:
            error.path = _printable(error.path)
        raise


def _printable(text: str) -> str:
    """``text`` with unprintable characters (controls, lone surrogates) as Python escapes."""
    if text.isprintable():
        return text
    return "".join(char if char.isprintable() else repr(char)[1:-1] for char in text)


def _read(path: Path, limits: ReadLimits) -> Document:
    from matcheck.inputs import note

    note(path)
    shown = str(path)
    try:
        if not path.exists():
            raise InputError("no such file", path=shown)
        if path.is_dir():
            raise InputError("is a directory, not a lesson file", path=shown)
        if not path.is_file():
            raise InputError("is not a regular file", path=shown)
        size = path.stat().st_size
    except OSError as error:  # a folder on the way that cannot be searched, ...
        raise InputError(f"cannot be read ({error.strerror})", path=shown) from None
    if size == 0:
        raise NoText("the file is empty", path=shown)
    if size > limits.max_file_bytes:
        raise LimitExceeded(
            f"the file is {size / 2**20:.0f} MiB, above the limit of "
            f"{limits.max_file_bytes / 2**20:.0f} MiB",
            path=shown,
            hint="raise it with --limit max_file_bytes=N if this is really a lesson",
        )
    try:
        with path.open("rb") as handle:
            head = handle.read(8192)
    except OSError as error:
        raise InputError(f"cannot be read ({error.strerror})", path=shown) from None
    fmt = sniff_format(head, path)
    with deadline(limits.max_read_seconds, shown):
        reader = READERS[fmt]
        document = reader.read(path, limits)
    from matcheck.readers.wordlimit import refuse_long_tokens

    refuse_long_tokens((block.text for block in document.blocks), limits, shown)
    document = _flag_huge_images(document, limits)
    if reader.cannot_show:
        # A reader may add what one file cannot show (an untagged PDF has no alt text).
        document = replace(document, cannot_show=reader.cannot_show | document.cannot_show)
    expected = EXTENSIONS.get(path.suffix.lower())
    if expected is not None and expected != fmt and {expected, fmt} != {"markdown", "text"}:
        document = replace(
            document,
            warnings=(
                f"the file is named {path.suffix} but its content is {fmt.upper()}; "
                f"read it as {fmt.upper()}",
                *document.warnings,
            ),
        )
    # Code alone is not a lesson: no prose measure would be defined.
    if not any(block.text for block in document.blocks if block.kind is not BlockKind.CODE):
        raise NoText("the file holds no lesson text", path=shown)
    if fmt == "text" and looks_like_markdown(head.decode("utf-8", "replace")):
        document = replace(
            document,
            warnings=(
                "the text looks like Markdown (headings, lists or emphasis marked with #, - or "
                "**); name the file .md so that its structure is read",
                *document.warnings,
            ),
        )
    return document


def _flag_huge_images(document: Document, limits: ReadLimits) -> Document:
    """Warn about images whose header declares more than ``max_image_pixels`` pixels.

    No reader decodes pixels, so such an image costs nothing; it is still worth a word, as a
    real lesson picture is never that large and a decompression bomb is.
    """
    flagged = [
        f"the image {figure.source} declares {figure.width_px}x{figure.height_px} pixels, above "
        f"max_image_pixels ({limits.max_image_pixels:,}); its size is read from its header "
        "and its pixels are never decoded"
        for figure in document.figures
        if (figure.pixel_area or 0) > limits.max_image_pixels
    ]
    if not flagged:
        return document
    unique = list(dict.fromkeys(flagged))
    if len(unique) > MAX_WARNINGS:
        more = len(unique) - MAX_WARNINGS
        unique = [*unique[:MAX_WARNINGS], f"and {more} more images above max_image_pixels"]
    return replace(document, warnings=(*document.warnings, *unique))
