"""Tests for format sniffing (matcheck.readers.sniff) and the checks of matcheck.readers.read.

Magic numbers are those of the format specifications: "%PDF-" (ISO 32000-1:2008, 7.5.2 File
Header), the PNG signature 89 50 4E 47 0D 0A 1A 0A (PNG spec, ISO/IEC 15948, 5.2), the ZIP
local file header PK\\x03\\x04 (PKWARE APPNOTE.TXT 4.3.7), the OLE2 compound file signature
D0 CF 11 E0 A1 B1 1A E1 ([MS-CFB] 2.2), and byte-order marks of RFC 2781 (UTF-16). See
docs/references.md §13, §14, §16 and §17.
"""

from __future__ import annotations

import random
from pathlib import Path

import pytest

from matcheck.errors import EncryptedFile, InputError, NoText, UnsupportedFormat
from matcheck.limits import ReadLimits
from matcheck.model import BlockKind, Document
from matcheck.readers import READERS, Reader, ReaderSpec, read
from matcheck.readers.builder import DocumentBuilder
from matcheck.readers.sniff import sniff_format

OLE_MAGIC = b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1"


def _pdf_bytes() -> bytes:
    from fpdf import FPDF

    pdf = FPDF()
    pdf.add_page()
    pdf.set_font("helvetica", size=12)
    pdf.cell(text="Check the tyre pressure before every ride.")
    return bytes(pdf.output())


def _png_bytes(tmp_path: Path) -> bytes:
    from PIL import Image

    path = tmp_path / "pixel.png"
    Image.new("RGB", (4, 4)).save(path)
    return path.read_bytes()


def _stub_pdf_reader(calls: list[Path]) -> Reader:
    def reader(path: Path, limits: ReadLimits) -> Document:
        calls.append(path)
        builder = DocumentBuilder(str(path), "pdf")
        builder.add_block(BlockKind.PARAGRAPH, "Check the tyre pressure.")
        return builder.build()

    return reader


def test_sniff_pdf_named_docx_is_read_as_pdf_with_warning(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    path = tmp_path / "lesson.docx"
    path.write_bytes(_pdf_bytes())
    assert sniff_format(path.read_bytes()[:8192], path) == "pdf"
    # The PDF reader is someone else's module: a stub proves the dispatch and the warning.
    calls: list[Path] = []
    monkeypatch.setitem(READERS, "pdf", ReaderSpec("pdf", _stub_pdf_reader(calls)))
    document = read(path)
    assert calls == [path]
    assert document.warnings[0] == (
        "the file is named .docx but its content is PDF; read it as PDF"
    )


def test_sniff_pdf_header_after_junk(tmp_path: Path) -> None:
    # ISO 32000-1 Annex H notes readers accept the header within the first 1024 bytes.
    assert sniff_format(b"\x00" * 100 + b"%PDF-1.7\n", tmp_path / "a.pdf") == "pdf"


def test_sniff_pdf_named_docx_with_real_reader(tmp_path: Path) -> None:
    pytest.importorskip("matcheck.readers.pdf")
    path = tmp_path / "lesson.docx"
    path.write_bytes(_pdf_bytes())
    document = read(path)
    assert document.format == "pdf"
    assert any("content is PDF" in warning for warning in document.warnings)


def test_sniff_zip_is_docx(tmp_path: Path) -> None:
    assert sniff_format(b"PK\x03\x04" + b"\x00" * 26, tmp_path / "lesson.md") == "docx"


def test_sniff_png_named_md_is_unsupported(tmp_path: Path) -> None:
    path = tmp_path / "lesson.md"
    path.write_bytes(_png_bytes(tmp_path))
    with pytest.raises(UnsupportedFormat, match="PNG image") as caught:
        read(path)
    assert caught.value.path == str(path)


def test_sniff_random_binary_named_md_is_unsupported(tmp_path: Path) -> None:
    path = tmp_path / "lesson.md"
    path.write_bytes(random.Random(20240601).randbytes(4096))
    with pytest.raises(UnsupportedFormat, match="binary"):
        read(path)


def test_sniff_ole_named_docx_is_encrypted(tmp_path: Path) -> None:
    path = tmp_path / "lesson.docx"
    path.write_bytes(OLE_MAGIC + b"\x00" * 504)
    with pytest.raises(EncryptedFile, match="encrypted"):
        read(path)


def test_sniff_ole_with_encrypted_package_stream_is_encrypted(tmp_path: Path) -> None:
    # [MS-OFFCRYPTO] 2.3.4.4: an encrypted package is a stream named "EncryptedPackage",
    # whose directory entry stores the name in UTF-16LE.
    head = OLE_MAGIC + b"\x00" * 100 + "EncryptedPackage".encode("utf-16-le")
    with pytest.raises(EncryptedFile, match="password"):
        sniff_format(head, Path("lesson.bin"))


def test_sniff_ole_named_doc_is_unsupported(tmp_path: Path) -> None:
    path = tmp_path / "lesson.doc"
    path.write_bytes(OLE_MAGIC + b"\x00" * 504)
    with pytest.raises(UnsupportedFormat, match=r"legacy Word \.doc"):
        read(path)


def test_read_missing_path(tmp_path: Path) -> None:
    path = tmp_path / "nowhere.md"
    with pytest.raises(InputError, match="no such file") as caught:
        read(path)
    assert caught.value.path == str(path)


def test_read_directory(tmp_path: Path) -> None:
    with pytest.raises(InputError, match="directory"):
        read(tmp_path)


def test_read_empty_file_is_no_text(tmp_path: Path) -> None:
    path = tmp_path / "empty.md"
    path.write_bytes(b"")
    with pytest.raises(NoText, match="empty"):
        read(path)


def test_read_whitespace_only_markdown_is_no_text(tmp_path: Path) -> None:
    path = tmp_path / "blank.md"
    path.write_text("  \n\n\t\n", encoding="utf-8")
    with pytest.raises(NoText, match="no lesson text"):
        read(path)


def test_read_code_only_markdown_is_no_text(tmp_path: Path) -> None:
    path = tmp_path / "code.md"
    path.write_text("```\nping 192.168.1.1\n```\n", encoding="utf-8")
    with pytest.raises(NoText):
        read(path)


@pytest.mark.parametrize(
    ("name", "expected"),
    [("lesson.md", "markdown"), ("lesson.markdown", "markdown"), ("lesson.txt", "text"),
     ("lesson.rst", "text"), ("lesson", "text")],
)  # fmt: skip
def test_sniff_text_content_by_extension(tmp_path: Path, name: str, expected: str) -> None:
    path = tmp_path / name
    path.write_text("# Coffee\n\nGrind the beans.\n", encoding="utf-8")
    assert sniff_format(path.read_bytes(), path) == expected
    document = read(path)
    assert document.format == expected
    assert document.warnings == ()


def test_sniff_text_named_docx_read_as_text_with_warning(tmp_path: Path) -> None:
    path = tmp_path / "lesson.docx"
    path.write_text("Grind the beans.\n", encoding="utf-8")
    document = read(path)
    assert document.format == "text"
    assert document.warnings == (
        "the file is named .docx but its content is TEXT; read it as TEXT",
    )


@pytest.mark.parametrize(
    ("encoding", "bom"),
    [("utf-16", ""), ("utf-16-be", "\ufeff"), ("utf-32", "")],  # "utf-16"/"utf-32" add a BOM
)
def test_sniff_utf16_and_utf32_text_is_text(tmp_path: Path, encoding: str, bom: str) -> None:
    # Regression: every ASCII character brings zero bytes in UTF-16/32, which the binary
    # check counted as control characters. RFC 2781: FF FE / FE FF are the UTF-16 BOMs.
    # 400 lines are longer than the 8192-byte head, so the head ends mid-text.
    path = tmp_path / "lesson.txt"
    path.write_bytes((bom + "Pump the tyre to 4 bar.\n" * 400).encode(encoding))
    assert path.read_bytes()[:2] in (b"\xff\xfe", b"\xfe\xff")
    document = read(path)
    assert len(document.blocks) == 1
    assert document.blocks[0].text.startswith("Pump the tyre to 4 bar. Pump")


def test_sniff_control_characters_are_binary(tmp_path: Path) -> None:
    # More than 5 % control bytes (other than tab, newline, CR, form feed): common practice.
    head = b"abc\x01\x02\x03" * 100
    with pytest.raises(UnsupportedFormat):
        sniff_format(head, tmp_path / "lesson.txt")
    assert sniff_format(b"tab\tand\fform feed\r\n" * 100, tmp_path / "lesson.txt") == "text"


def test_binary_with_zero_bytes_is_still_binary(tmp_path: Path) -> None:
    # Random bytes (fixed seed) are neither UTF-16 nor UTF-32 ASCII text.
    path = tmp_path / "lesson.txt"
    path.write_bytes(random.Random(20).randbytes(4096) + b"\x00" * 16)
    with pytest.raises(UnsupportedFormat, match="the file is binary"):
        sniff_format(path.read_bytes()[:8192], path)
