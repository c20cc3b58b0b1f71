"""Readers: turn a lesson file into a :class:`~matcheck.model.Document`.

:func:`read` checks the path, sniffs the format from the bytes (the extension only breaks a
tie between Markdown and plain text), and hands the file to the reader registered for that
format. A file whose content contradicts its extension (a PDF named ``.docx``) is read as what
its bytes say, with a warning. Readers know nothing of measures or reports.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import replace
from pathlib import Path

from matcheck.errors import InputError, LimitExceeded, NoText
from matcheck.limits import DEFAULT_LIMITS, ReadLimits
from matcheck.model import Document
from matcheck.readers.sniff import EXTENSIONS, sniff_format

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


# Format name -> reader. Readers are imported only when used, so ``--help`` stays fast.
READERS: dict[str, Reader] = {
    "docx": _docx,
    "pdf": _pdf,
    "markdown": _markdown,
    "text": _text,
}


# What a format cannot show, so its measure is unknown rather than zero.
UNDETECTED: dict[str, tuple[str, ...]] = {
    # A PDF's text layer has no table structure; table text comes through as paragraphs.
    "pdf": ("tables",),
}


def read(path: str | Path, limits: ReadLimits = DEFAULT_LIMITS) -> Document:
    """Read one lesson file.

    Raises :class:`~matcheck.errors.InputError` (or a subclass) naming the file when it does
    not exist, is not a regular file, is empty, too large, of an unknown or broken format, or
    holds no lesson text.
    """
    path = Path(path)
    shown = str(path)
    if not path.exists():
        raise InputError("no such file", path=shown)
    if path.is_dir():
        raise InputError("is a directory, not a lesson file", path=shown)
    if not path.is_file():
        raise InputError("is not a regular file", path=shown)
    size = path.stat().st_size
    if size == 0:
        raise NoText("the file is empty", path=shown)
    if size > limits.max_file_bytes:
        raise LimitExceeded(
            f"the file is {size / 2**20:.0f} MiB, above the limit of "
            f"{limits.max_file_bytes / 2**20:.0f} MiB",
            path=shown,
            hint="raise ReadLimits.max_file_bytes if this is really a lesson",
        )
    with path.open("rb") as handle:
        head = handle.read(8192)
    fmt = sniff_format(head, path)
    document = READERS[fmt](path, limits)
    if fmt in UNDETECTED:
        document = replace(document, undetected=UNDETECTED[fmt])
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
    if not any(block.text for block in document.blocks):
        raise NoText("the file holds no lesson text", path=shown)
    return document
