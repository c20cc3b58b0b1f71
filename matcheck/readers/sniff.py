"""Tell a file's format from its first bytes, not from its name.

The signatures are those of the format specifications (docs/references.md §13, §14, §16, §17).
"""

from __future__ import annotations

import codecs
import re
from collections.abc import Sequence
from pathlib import Path

from matcheck.errors import EncryptedFile, UnsupportedFormat

# Extension -> the format it promises.
EXTENSIONS = {
    ".docx": "docx",
    ".pdf": "pdf",
    ".md": "markdown",
    ".markdown": "markdown",
    ".mdown": "markdown",
    ".txt": "text",
    ".text": "text",
}

# Text files that are not lessons, and what to say about them.
NOT_LESSONS = {
    ".toml": "a study file (TOML): `check` and `table` take it, `compare` takes lessons",
    ".csv": "a CSV file (a post-test or learners' data belongs in the study file)",
    ".tsv": "a table of values, not a lesson",
    ".json": "a JSON file, not a lesson",
    ".yaml": "a YAML file, not a lesson",
    ".yml": "a YAML file, not a lesson",
    ".svg": "an SVG image, not a lesson (a figure belongs inside the lesson)",
    ".xml": "an XML file, not a lesson",
    ".html": "an HTML page, not a lesson (save it as .docx or .md)",
    ".htm": "an HTML page, not a lesson (save it as .docx or .md)",
    ".odt": "an OpenDocument file (.odt) (save it as .docx)",
    ".rtf": "an RTF document (save it as .docx)",
}

_PDF_VERSION = re.compile(rb"%PDF-\d\.\d")
_PDF_OBJECT = re.compile(rb"\n\d+ \d+ obj\b")
_ZIP_MAGIC = (b"PK\x03\x04", b"PK\x05\x06")
# OLE2 compound file: legacy .doc, or an Office file encrypted with a password.
_OLE_MAGIC = b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1"
# Byte-order marks of text encodings whose characters span several bytes. UTF-32 first: its
# little-endian mark begins with the UTF-16 one.
_WIDE_BOMS = (
    (codecs.BOM_UTF32_LE, "utf-32"),
    (codecs.BOM_UTF32_BE, "utf-32"),
    (codecs.BOM_UTF16_LE, "utf-16"),
    (codecs.BOM_UTF16_BE, "utf-16"),
)
_BINARY_MAGIC = {
    b"\x89PNG": "a PNG image",
    b"\xff\xd8\xff": "a JPEG image",
    b"GIF8": "a GIF image",
    b"{\\rtf": "an RTF document (save it as .docx)",
    b"\x1f\x8b": "a gzip archive",
    b"7z\xbc\xaf": "a 7-Zip archive",
    b"Rar!": "a RAR archive",
}


def sniff_format(head: bytes, path: Path) -> str:
    """Return ``'pdf'``, ``'docx'``, ``'markdown'`` or ``'text'`` for a file's first bytes.

    Raises :class:`UnsupportedFormat` or :class:`EncryptedFile` with a message that names
    what the file is instead.
    """
    shown = str(path)
    # A PDF header may follow a little junk (the PDF spec allows it within the first 1024 bytes).
    # Text that merely mentions "%PDF-" stays text: the junk or the head must be binary, or a
    # full header must be followed by an indirect object ("1 0 obj", PDF 32000-1 §7.3.10).
    marker = head.find(b"%PDF-", 0, 1024)
    if marker == 0 or (
        marker > 0
        and (
            _looks_binary(head[:marker])
            or _looks_binary(head)
            or (_PDF_VERSION.match(head, marker) and _PDF_OBJECT.search(head, marker))
        )
    ):
        return "pdf"
    if head.startswith(_ZIP_MAGIC):
        # An OpenDocument package stores its media type first, uncompressed (ODF 1.2 Part 3
        # §3.3), so it shows in the first bytes.
        if b"mimetypeapplication/vnd.oasis.opendocument" in head[:120]:
            raise UnsupportedFormat(
                "this is an OpenDocument file (.odt), not a Word document",
                path=shown,
                hint="save it as .docx, e.g. in LibreOffice with File, Save As, Word",
            )
        return "docx"
    if head.startswith(_OLE_MAGIC):
        if b"E\x00n\x00c\x00r\x00y\x00p\x00t\x00e\x00d\x00P\x00a\x00c\x00k\x00a\x00g\x00e" in head:
            raise EncryptedFile(
                "the Word file is password-protected",
                path=shown,
                hint="save an unprotected copy and check that",
            )
        # The directory of an OLE file need not sit in the first bytes; legacy .doc or an
        # encrypted .docx are the two things a lesson file in this container can be.
        if path.suffix.lower() == ".docx":
            raise EncryptedFile(
                "the file is an encrypted (password-protected) Office document, not a DOCX package",
                path=shown,
                hint="save an unprotected copy and check that",
            )
        raise UnsupportedFormat(
            "this is a legacy Word .doc (or other OLE) file",
            path=shown,
            hint="save it as .docx",
        )
    for magic, what in _BINARY_MAGIC.items():
        if head.startswith(magic):
            raise UnsupportedFormat(f"this is {what}, not a lesson document", path=shown)
    if _looks_binary(head):
        raise UnsupportedFormat("the file is binary, not DOCX, PDF, Markdown or text", path=shown)
    if path.suffix.lower() in NOT_LESSONS:
        raise UnsupportedFormat(f"this is {NOT_LESSONS[path.suffix.lower()]}", path=shown)
    if EXTENSIONS.get(path.suffix.lower()) == "text":
        return "text"
    if EXTENSIONS.get(path.suffix.lower()) in {"markdown", None}:
        return "markdown" if path.suffix.lower() in EXTENSIONS else "text"
    # A .docx or .pdf name over text content: read it as text (with the caller's warning).
    return "text"


def _looks_binary(head: bytes) -> bool:
    if not head:
        return False
    for bom, codec in _WIDE_BOMS:
        if head.startswith(bom):
            # Count controls in the decoded characters: in UTF-16/32 every ASCII letter brings
            # zero bytes, which would otherwise make any such text look binary. "replace"
            # absorbs a code unit cut off at the end of the head.
            return _control_share([ord(char) for char in head.decode(codec, "replace")]) > 0.05
    if b"\x00" in head:
        from matcheck.readers.wide import bomless_wide_codec

        wide = bomless_wide_codec(head)
        if wide is None:
            return True
        return _control_share([ord(char) for char in head.decode(wide, "replace")]) > 0.05
    return _control_share(head) > 0.05


def _control_share(codes: Sequence[int]) -> float:
    """Share of control characters other than tab, newline, carriage return, form feed."""
    if not codes:
        return 0.0
    controls = sum(1 for code in codes if code < 32 and code not in (9, 10, 12, 13))
    return controls / len(codes)


_MARKDOWN_LINE = re.compile(
    r"^(?:#{1,6} \S|[-*+] \S|\d+[.)] \S|> |```|\|.*\|\s*$)|\*\*\S[^*]*\*\*|\[[^\]]+\]\([^)]+\)"
)


def looks_like_markdown(text: str) -> bool:
    """Whether plain text carries Markdown markup on several lines (headings, lists, bold,
    links, tables, fences): then its structure is lost when it is read as plain text."""
    marked = sum(1 for line in text.splitlines()[:400] if _MARKDOWN_LINE.search(line))
    return marked >= 3
