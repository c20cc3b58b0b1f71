"""Broken and hostile lesson files, end to end through ``matcheck.cli.main``.

Every file is built here, small (the zip bomb is a few KB that declare or inflate to far
more). A refusal is exit 2 with exactly one stderr line that names the file and no traceback
(matcheck/errors.py, docs/limits.md); a documented fallback is exit 0 with a warning in the
report. Time bounds are generous and only where the point is that reading terminates; the
memory bound is checked in a subprocess with ``resource.getrusage`` (peak RSS).
"""

from __future__ import annotations

import io
import json
import os
import random
import resource
import signal
import socket
import struct
import subprocess
import sys
import textwrap
import threading
import time
import zipfile
import zlib
from collections.abc import Iterator
from contextlib import contextmanager
from pathlib import Path
from typing import Any

import pytest

from matcheck.cli import main
from matcheck.errors import CorruptFile, LimitExceeded
from matcheck.limits import ReadLimits
from matcheck.model import Document
from matcheck.readers.decode import CP1252_WARNING

# Generous bounds: a read that should take well under a second must not take this long.
SECONDS = 60.0  # "terminates", not "is fast": generous for a loaded 2-core machine
PEAK_RSS_BYTES = 1.5 * 2**30

LESSON = "Check the tyre pressure before every ride. A soft tyre wears out quickly."


@pytest.fixture(autouse=True)
def _quiet_console(monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setenv("COLUMNS", "200")
    monkeypatch.setenv("NO_COLOR", "1")


# -- running the CLI ------------------------------------------------------------------------------


def _run(capsys: pytest.CaptureFixture[str], *args: str | Path) -> tuple[int, str, str]:
    status = main([str(arg) for arg in args])
    captured = capsys.readouterr()
    return status, captured.out, captured.err


def _refused(capsys: pytest.CaptureFixture[str], path: Path, *needles: str) -> str:
    """Profile ``path``; assert the one-line refusal naming it and each needle; return it."""
    status, out, err = _run(capsys, "profile", path, "-f", "json")
    assert status == 2, (status, err)
    assert "Traceback" not in out + err
    lines = err.splitlines()
    assert len(lines) == 1, err
    line = lines[0]
    assert line.startswith("matcheck: error: ")
    assert path.name in line
    for needle in needles:
        assert needle in line, line
    return line


def _profiled(capsys: pytest.CaptureFixture[str], path: Path) -> tuple[dict[str, Any], list[str]]:
    """Profile ``path``; assert exit 0 and a silent stderr; return measures and warnings."""
    status, out, err = _run(capsys, "profile", path, "-f", "json")
    assert status == 0, err
    assert err == ""
    (document,) = json.loads(out)["documents"]
    measures = {m["dimension"]: m["value"] for m in document["measures"]}
    return measures, document["warnings"]


@contextmanager
def _terminates(seconds: float = SECONDS) -> Iterator[None]:
    start = time.monotonic()
    yield
    elapsed = time.monotonic() - start
    assert elapsed < seconds, f"took {elapsed:.1f} s"


# -- building files --------------------------------------------------------------------------------


def _png(width: int, height: int) -> bytes:
    from PIL import Image

    stream = io.BytesIO()
    Image.new("RGB", (width, height), (30, 120, 60)).save(stream, "PNG")
    return stream.getvalue()


def _png_header_only(width: int, height: int) -> bytes:
    """A PNG that declares ``width`` x ``height`` with a valid IHDR and CRCs but one row.

    PNG (ISO/IEC 15948, W3C PNG 2nd ed. §5.3, §11.2.2): the signature, then chunks of length,
    type, data and a CRC-32 of type and data; IHDR is width, height, bit depth, colour type
    (2 = RGB), compression, filter, interlace.
    """

    def chunk(kind: bytes, data: bytes) -> bytes:
        crc = struct.pack(">I", zlib.crc32(kind + data))
        return struct.pack(">I", len(data)) + kind + data + crc

    ihdr = struct.pack(">IIBBBBB", width, height, 8, 2, 0, 0, 0)
    return (
        b"\x89PNG\r\n\x1a\n"
        + chunk(b"IHDR", ihdr)
        + chunk(b"IDAT", zlib.compress(b"\x00" * 64))
        + chunk(b"IEND", b"")
    )


def _docx(tmp_path: Path, name: str = "lesson.docx", *, picture: bool = False) -> Path:
    import docx
    from docx.shared import Cm

    document = docx.Document()
    document.add_heading("Tyres", level=1)
    document.add_paragraph(LESSON)
    if picture:
        document.add_picture(io.BytesIO(_png(40, 30)), width=Cm(4))
    path = tmp_path / name
    document.save(str(path))
    return path


def _members(path: Path) -> dict[str, bytes]:
    with zipfile.ZipFile(path) as archive:
        return {info.filename: archive.read(info) for info in archive.infolist()}


def _rezip(path: Path, members: dict[str, bytes]) -> None:
    with zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as archive:
        for name, data in members.items():
            archive.writestr(name, data)


def _media(members: dict[str, bytes]) -> str:
    (name,) = [name for name in members if name.startswith("word/media/")]
    return name


def _pdf(tmp_path: Path, name: str = "lesson.pdf", pages: int = 1) -> Path:
    from fpdf import FPDF

    pdf = FPDF()
    pdf.set_font("Helvetica", size=12)
    for _ in range(pages):
        pdf.add_page()
        pdf.multi_cell(0, 6, LESSON)
    path = tmp_path / name
    pdf.output(str(path))
    return path


def _cfb(streams: dict[str, bytes]) -> bytes:
    """A Compound File Binary (OLE2) file holding ``streams`` in its root storage.

    Layout per [MS-CFB] v3 (512-byte sectors): header (2.2), one FAT sector (2.3), one
    directory sector of 128-byte entries (2.6), then each stream in whole sectors. Streams
    are padded with NULs to at least 4096 bytes, the mini-stream cutoff, so that none
    belongs in the mini stream.
    """
    sector = 512
    end, free, fat_sector, no_stream = 0xFFFFFFFE, 0xFFFFFFFF, 0xFFFFFFFD, 0xFFFFFFFF
    assert len(streams) <= 3
    fat = [fat_sector, end]
    starts, sizes, body = [], [], b""
    for data in streams.values():
        padded = data.ljust(max(4096, -(-len(data) // sector) * sector), b"\x00")
        sizes.append(len(padded))
        count = len(padded) // sector
        first = len(fat)
        starts.append(first)
        fat += [first + i + 1 for i in range(count - 1)] + [end]
        body += padded
    fat += [free] * (sector // 4 - len(fat))

    def entry(name: str, kind: int, child: int, right: int, start: int, size: int) -> bytes:
        encoded = (name + "\x00").encode("utf-16-le") if name else b""
        return (
            encoded.ljust(64, b"\x00")
            + struct.pack("<HBB", len(encoded), kind, 1)  # name length, type, colour black
            + struct.pack("<III", no_stream, right, child)  # left sibling, right, child
            + bytes(16 + 4 + 8 + 8)  # CLSID, state bits, creation and modified times
            + struct.pack("<IQ", start, size)
        )

    names = list(streams)
    entries = entry("Root Entry", 5, 1, no_stream, end, 0)
    for index, name in enumerate(names):
        right = index + 2 if index + 1 < len(names) else no_stream
        entries += entry(name, 2, no_stream, right, starts[index], sizes[index])
    entries = entries.ljust(sector, b"\x00")
    header = (
        b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1"
        + bytes(16)
        + struct.pack("<HHHHH", 0x3E, 3, 0xFFFE, 9, 6)  # versions, byte order, shifts
        + bytes(6)
        + struct.pack("<IIIIIIIII", 0, 1, 1, 0, 4096, end, 0, end, 0)
        + struct.pack("<I", 0)  # DIFAT[0]: the FAT is sector 0
        + struct.pack("<I", free) * 108
    )
    assert len(header) == sector
    return header + struct.pack(f"<{len(fat)}I", *fat) + entries + body


# -- refusals: item 2 of the issue -----------------------------------------------------------------


def test_truncated_docx(capsys: pytest.CaptureFixture[str], tmp_path: Path) -> None:
    path = _docx(tmp_path)
    path.write_bytes(path.read_bytes()[: path.stat().st_size // 2])
    _refused(capsys, path, "damaged or truncated")


def test_truncated_pdf(capsys: pytest.CaptureFixture[str], tmp_path: Path) -> None:
    path = _pdf(tmp_path, pages=3)
    path.write_bytes(path.read_bytes()[: path.stat().st_size // 2])
    _refused(capsys, path, "damaged or truncated")


def test_password_protected_docx(capsys: pytest.CaptureFixture[str], tmp_path: Path) -> None:
    # [MS-OFFCRYPTO] 2.3.4 / 2.3.4.10: an encrypted OOXML file is a compound file with an
    # "EncryptionInfo" stream (version 4.4 = agile encryption) and an "EncryptedPackage"
    # stream (an 8-byte size, then the encrypted ZIP).
    info = struct.pack("<HHI", 4, 4, 0x40) + b'<?xml version="1.0"?><encryption/>'
    package = struct.pack("<Q", 5000) + random.Random(5).randbytes(5000)
    path = tmp_path / "locked.docx"
    path.write_bytes(_cfb({"EncryptionInfo": info, "EncryptedPackage": package}))
    _refused(capsys, path, "password-protected", "unprotected copy")


def test_pdf_with_a_user_password(capsys: pytest.CaptureFixture[str], tmp_path: Path) -> None:
    from pypdf import PdfReader, PdfWriter

    plain = _pdf(tmp_path, "plain.pdf")
    writer = PdfWriter(clone_from=str(plain))
    writer.encrypt(user_password="espresso", owner_password="barista-only")
    path = tmp_path / "locked.pdf"
    with path.open("wb") as stream:
        writer.write(stream)
    assert PdfReader(str(path)).is_encrypted  # pypdf's own view: the file really is encrypted
    _refused(capsys, path, "protected by a password")


def test_pdf_without_a_text_layer_looks_scanned(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    from fpdf import FPDF

    scan = tmp_path / "scan.png"
    scan.write_bytes(_png(300, 420))
    pdf = FPDF()
    pdf.add_page()
    pdf.image(str(scan), x=10, y=10, w=190)
    path = tmp_path / "scanned.pdf"
    pdf.output(str(path))
    _refused(capsys, path, "looks scanned", "OCR")


def test_docx_with_no_text(capsys: pytest.CaptureFixture[str], tmp_path: Path) -> None:
    import docx

    path = tmp_path / "blank.docx"
    docx.Document().save(str(path))
    _refused(capsys, path, "no lesson text")


def test_markdown_in_cp1252_is_read_with_a_warning(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    # Documented (docs/limits.md): not UTF-8 -> decoded as Windows-1252, with a warning.
    # 0x93/0x94 are cp1252's curly quotes, 0xE9 is é (the cp1252 code chart).
    path = tmp_path / "cafe.md"
    path.write_bytes(b"# Caf\xe9 brewing\n\nA \x93pour-over\x94 needs water just off the boil.\n")
    with pytest.raises(UnicodeDecodeError):
        path.read_bytes().decode("utf-8")
    measures, warnings = _profiled(capsys, path)
    assert warnings == [CP1252_WARNING]
    assert measures["headings"] == 1
    from matcheck.readers import read

    texts = [block.text for block in read(path).blocks]
    # Curly quotes folded to straight ones (matcheck.textnorm).
    assert texts == ["Café brewing", 'A "pour-over" needs water just off the boil.']


def test_binary_file_named_md(capsys: pytest.CaptureFixture[str], tmp_path: Path) -> None:
    path = tmp_path / "notes.md"
    path.write_bytes(random.Random(7).randbytes(2048))
    _refused(capsys, path, "binary")


def test_pdf_named_docx_is_read_as_pdf_with_a_warning(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    path = _pdf(tmp_path, "lesson.docx")
    measures, warnings = _profiled(capsys, path)
    assert warnings == ["the file is named .docx but its content is PDF; read it as PDF"]
    assert measures["words"] == len(LESSON.split())


@pytest.mark.parametrize(
    ("name", "content", "needle"),
    [
        ("story.docx", b"{\\rtf1\\ansi Chain care}", "RTF"),
        ("old.docx", _cfb({"WordDocument": b"legacy"}), "password-protected"),
        ("old.doc.md", _cfb({"WordDocument": b"legacy"}), "legacy Word"),
        ("photo.md", b"\xff\xd8\xff\xe0" + bytes(64), "JPEG"),
    ],
)
def test_foreign_formats(
    capsys: pytest.CaptureFixture[str], tmp_path: Path, name: str, content: bytes, needle: str
) -> None:
    path = tmp_path / name
    path.write_bytes(content)
    _refused(capsys, path, needle)


def test_not_a_regular_file(capsys: pytest.CaptureFixture[str], tmp_path: Path) -> None:
    fifo = tmp_path / "pipe.md"
    os.mkfifo(fifo)  # opening it would block until a writer comes: it must not be opened
    with _terminates():
        _refused(capsys, fifo, "not a regular file")
    loop = tmp_path / "loop.md"
    loop.symlink_to(loop)
    _refused(capsys, loop)


def test_undecodable_image_in_docx_is_counted(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    path = _docx(tmp_path, picture=True)
    members = _members(path)
    members[_media(members)] = b"these bytes are not a picture at all"
    _rezip(path, members)
    measures, warnings = _profiled(capsys, path)
    assert measures["figures"] == 1
    assert measures["figures_unreadable"] == 1
    assert any("cannot be read as an image" in warning for warning in warnings)


def test_undecodable_image_in_markdown_is_counted(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    (tmp_path / "pump.png").write_bytes(_png(20, 20)[:40])  # a PNG cut inside its IHDR
    path = tmp_path / "lesson.md"
    path.write_text(f"# Pumps\n\n{LESSON}\n\n![A floor pump](pump.png)\n", encoding="utf-8")
    measures, warnings = _profiled(capsys, path)
    assert measures["figures"] == 1
    assert measures["figures_unreadable"] == 1
    assert warnings == ["image pump.png cannot be decoded; its size is unknown"]


def test_many_broken_images_give_a_bounded_list_of_warnings(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    from matcheck.readers.builder import MAX_WARNINGS

    path = tmp_path / "lesson.md"
    links = "".join(f"![Spoke {n}](spoke-{n}.png)\n\n" for n in range(200))
    path.write_text(f"{LESSON}\n\n{links}", encoding="utf-8")
    measures, warnings = _profiled(capsys, path)
    assert (measures["figures"], measures["figures_unreadable"]) == (200, 200)
    assert len(warnings) == MAX_WARNINGS + 1
    assert warnings[0] == "image spoke-0.png not found"
    assert warnings[-1] == f"and {200 - MAX_WARNINGS} more warnings not shown"


def test_junk_before_the_pdf_header(capsys: pytest.CaptureFixture[str], tmp_path: Path) -> None:
    # PDF 32000-1:2008 §7.5.2 puts the header first, but Adobe's PDF Reference 1.7 (Appendix
    # H, the implementation notes on §3.4.1 "File Header") accepts it anywhere in the first
    # 1024 bytes; a PDF after a line of text (a saved e-mail or HTTP header) is still a PDF.
    path = tmp_path / "saved.pdf"
    path.write_bytes(b"Content-Type: application/pdf\r\n\r\n" + _pdf(tmp_path).read_bytes())
    measures, _ = _profiled(capsys, path)
    assert measures["words"] == len(LESSON.split())


# -- resource limits: item 3 -----------------------------------------------------------------------


def test_zip_bomb_by_ratio_is_refused_before_extraction(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    path = _docx(tmp_path, "bomb.docx")
    with zipfile.ZipFile(path, "a", zipfile.ZIP_DEFLATED) as archive:
        archive.writestr("word/media/filler.bin", bytes(8 * 2**20))  # deflate: ~1000:1
    assert path.stat().st_size < 100_000
    with _terminates():
        _refused(capsys, path, "max_zip_ratio", "zip bomb")


def _declare_size(data: bytes, member: str, size: int) -> bytes:
    """Rewrite the uncompressed size the local and central headers declare for ``member``.

    PKWARE APPNOTE.TXT 4.3.7 (local header: size at offset 22, name length at 26, name at
    30) and 4.3.12 (central directory header: 24, 28 and 46).
    """
    out = bytearray(data)
    encoded = member.encode()
    layouts = ((b"PK\x03\x04", 22, 26, 30), (b"PK\x01\x02", 24, 28, 46))
    for signature, size_at, length_at, name_at in layouts:
        start = 0
        while (start := out.find(signature, start)) != -1:
            (length,) = struct.unpack_from("<H", out, start + length_at)
            if bytes(out[start + name_at : start + name_at + length]) == encoded:
                struct.pack_into("<I", out, start + size_at, size)
            start += 4
    return bytes(out)


def test_zip_bomb_by_declared_size_is_refused(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    path = _docx(tmp_path, "declared.docx")
    path.write_bytes(_declare_size(path.read_bytes(), "word/document.xml", 0xFFFF0000))
    with zipfile.ZipFile(path) as archive:  # the standard library reads the declared size
        assert archive.getinfo("word/document.xml").file_size == 0xFFFF0000
    _refused(capsys, path, "max_zip_uncompressed_bytes")


def test_too_much_xml_is_refused_before_parsing(tmp_path: Path) -> None:
    from matcheck.readers import read

    path = _docx(tmp_path, "wordy.docx")
    members = _members(path)
    size = len(members["word/document.xml"])
    # The part is found by its declared content type too, not only by an .xml name.
    types = members["[Content_Types].xml"].replace(b"/word/document.xml", b"/word/document.bin")
    rels = members["word/_rels/document.xml.rels"]
    members = {
        ("word/document.bin" if name == "word/document.xml" else name): data
        for name, data in members.items()
    }
    members["[Content_Types].xml"] = types
    members["_rels/.rels"] = members["_rels/.rels"].replace(b"document.xml", b"document.bin")
    members["word/_rels/document.bin.rels"] = rels
    del members["word/_rels/document.xml.rels"]
    _rezip(path, members)
    assert read(path).blocks  # still a Word document python-docx reads
    named = sum(len(data) for name, data in members.items() if name.endswith((".xml", ".rels")))
    # Over the limit only if the .bin part is counted as the XML it is declared to be.
    with pytest.raises(LimitExceeded, match="max_xml_bytes"):
        read(path, ReadLimits(max_xml_bytes=named + size - 1))
    assert read(path, ReadLimits(max_xml_bytes=named + size)).blocks


# The classic "billion laughs" (OWASP XML Security Cheat Sheet; Wikipedia "Billion laughs
# attack"): nine levels of ten references expand to 10^9 copies of "lol", about 3 GB.
LAUGHS = '<!ENTITY lol "lol">' + "".join(
    f'<!ENTITY lol{level} "{("&lol" + (str(level - 1) if level > 1 else "") + ";") * 10}">'
    for level in range(1, 10)
)


def _with_doctype(xml: bytes, root: str) -> bytes:
    start = xml.index(b"<" + root.encode())
    return xml[:start] + f"<!DOCTYPE {root} [{LAUGHS}]>".encode() + xml[start:]


def test_billion_laughs_in_docx_parts_never_expands(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    from docx.oxml.parser import oxml_parser
    from lxml import etree

    from matcheck.readers.docx import _parser_resolves_entities

    # python-docx parses every part with XMLParser(resolve_entities=False) (docx/oxml/
    # parser.py); the run-time probe confirms entities stay unexpanded in this install.
    assert _parser_resolves_entities() is False
    # The same parser object that python-docx's own loading uses leaves a reference alone.
    probe = etree.fromstring(b'<!DOCTYPE t [<!ENTITY e "expanded">]><t>&e;</t>', oxml_parser)
    assert "expanded" not in "".join(probe.itertext())

    declared = _docx(tmp_path, "declared.docx")
    members = _members(declared)
    members["word/styles.xml"] = _with_doctype(members["word/styles.xml"], "w:styles")
    members["[Content_Types].xml"] = _with_doctype(members["[Content_Types].xml"], "Types")
    # Declared and referenced at a level libxml2 lets through unexpanded: read, not expanded.
    members["word/document.xml"] = _with_doctype(
        members["word/document.xml"], "w:document"
    ).replace(LESSON.encode(), LESSON.encode() + b" &lol3;")
    _rezip(declared, members)
    with _terminates():
        measures, _ = _profiled(capsys, declared)
    assert measures["words"] == len(LESSON.split()) + 1  # "Tyres" heading; no "lol" words

    referenced = _docx(tmp_path, "laughs.docx")
    members = _members(referenced)
    members["word/document.xml"] = _with_doctype(
        members["word/document.xml"], "w:document"
    ).replace(LESSON.encode(), b"&lol9;")
    _rezip(referenced, members)
    with _terminates():
        status, out, err = _run(capsys, "profile", referenced, "-f", "json")
    assert "Traceback" not in err
    if status == 2:
        # libxml2 2.11+ measures the would-be expansion and stops; the refusal says why.
        assert len(err.splitlines()) == 1
        assert "laughs.docx" in err and "entity-expansion" in err
    else:
        # An older libxml2 keeps the reference unexpanded: only the heading is text.
        assert status == 0
        (document,) = json.loads(out)["documents"]
        assert {m["dimension"]: m["value"] for m in document["measures"]}["words"] == 1


def test_xml_payloads_in_images_and_markdown_are_inert(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    svg = (
        f'<?xml version="1.0"?><!DOCTYPE svg [{LAUGHS}]>'
        '<svg xmlns="http://www.w3.org/2000/svg"><text>&lol9;</text></svg>'
    ).encode()
    # An SVG bomb as a DOCX picture: Pillow reads no SVG, so it is an unreadable figure.
    path = _docx(tmp_path, picture=True)
    members = _members(path)
    members[_media(members)] = svg
    _rezip(path, members)
    with _terminates():
        measures, _ = _profiled(capsys, path)
    assert (measures["figures"], measures["figures_unreadable"]) == (1, 1)

    # The same file linked from Markdown, and a DTD in raw HTML: html.parser expands only
    # the HTML named character references (HTML5 §13.5), never a declared entity.
    (tmp_path / "diagram.svg").write_bytes(svg)
    lesson = tmp_path / "lesson.md"
    lesson.write_text(
        f"{LESSON}\n\n![Valve diagram](diagram.svg)\n\n<!DOCTYPE p [{LAUGHS}]>\n\n"
        "<div><p>Seat the valve &lol9; firmly.</p></div>\n",
        encoding="utf-8",
    )
    with _terminates():
        measures, warnings = _profiled(capsys, lesson)
    assert (measures["figures"], measures["figures_unreadable"]) == (1, 1)
    assert measures["words"] < 30
    assert warnings == ["image diagram.svg cannot be decoded; its size is unknown"]


HUGE = 100_000  # 10^10 pixels: 30 GB as RGB, were it ever decoded


@pytest.fixture
def _no_pixel_decoding(monkeypatch: pytest.MonkeyPatch) -> None:
    from PIL import ImageFile

    def refuse(self: object) -> None:
        raise AssertionError("an image was decoded")

    monkeypatch.setattr(ImageFile.ImageFile, "load", refuse)


@pytest.mark.usefixtures("_no_pixel_decoding")
def test_huge_image_header_is_measured_never_decoded(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    from matcheck.readers.images import image_size

    header = _png_header_only(HUGE, HUGE)
    assert len(header) < 200
    assert image_size(header) == (HUGE, HUGE)
    (tmp_path / "tyre.png").write_bytes(header)
    lesson = tmp_path / "lesson.md"
    lesson.write_text(f"{LESSON}\n\n![A tyre](tyre.png)\n", encoding="utf-8")
    docx_path = _docx(tmp_path, picture=True)
    members = _members(docx_path)
    members[_media(members)] = header
    _rezip(docx_path, members)
    for path in (lesson, docx_path):
        with _terminates():
            measures, warnings = _profiled(capsys, path)
        assert (measures["figures"], measures["figures_unreadable"]) == (1, 0)
        assert measures["figure_pixel_area"] == pytest.approx(HUGE * HUGE / 1e6)  # megapixels
        (warning,) = [w for w in warnings if "max_image_pixels" in w]
        assert f"declares {HUGE}x{HUGE} pixels" in warning
        assert "never decoded" in warning


def test_pdf_of_thousands_of_pages(capsys: pytest.CaptureFixture[str], tmp_path: Path) -> None:
    from fpdf import FPDF
    from pypdf import PdfWriter

    pdf = FPDF(format=(60, 40))
    pdf.set_font("Helvetica", size=8)
    pdf.set_auto_page_break(False)
    for number in range(3000):
        pdf.add_page()
        pdf.cell(0, 5, f"Step {number}: rinse the filter.")
    pages = tmp_path / "pages.pdf"
    pdf.output(str(pages))
    with _terminates():
        measures, _ = _profiled(capsys, pages)
    assert measures["words"] == 3000 * 5

    writer = PdfWriter()
    for _ in range(5001):  # one above the default max_pages (docs/limits.md)
        writer.add_blank_page(width=72, height=72)
    many = tmp_path / "many.pdf"
    with many.open("wb") as stream:
        writer.write(stream)
    with _terminates():
        _refused(capsys, many, "5001 pages", "max_pages")


def _million_words(path: Path) -> Path:
    words = ("grind", "brew", "pour", "steep", "filter", "kettle", "beans", "crema")
    sentence = " ".join(words) + ".\n"
    with path.open("w", encoding="utf-8") as stream:
        for _ in range(1_000_000 // len(words) // 25):
            stream.write(sentence * 25 + "\n")
    return path


@pytest.mark.parametrize("name", ["million.md", "million.txt"])
def test_a_million_words_are_refused_by_max_words(
    capsys: pytest.CaptureFixture[str], tmp_path: Path, name: str
) -> None:
    path = _million_words(tmp_path / name)
    assert path.stat().st_size > 5 * 2**20
    with _terminates(10):
        _refused(capsys, path, "max_words", "500,000")


def test_markup_cannot_hide_words_from_max_words(tmp_path: Path) -> None:
    from matcheck.readers import read

    # 600 rows of 1000 one-character cells: few whitespace-separated "words", but each cell
    # is a block. Counting each punctuation mark refuses it before markdown-it parses it.
    row = "|-" * 1000 + "|\n"
    path = tmp_path / "cells.md"
    path.write_text(row + "|" + "---|" * 1000 + "\n" + row * 600, encoding="utf-8")
    assert len(path.read_text(encoding="utf-8").split()) < 700
    with _terminates(5), pytest.raises(LimitExceeded, match="max_words"):
        read(path)


def test_max_words_in_docx(tmp_path: Path) -> None:
    from matcheck.readers import read

    path = _docx(tmp_path)
    words = len(LESSON.split()) + 1  # and the heading
    assert len(read(path, ReadLimits(max_words=words)).blocks) == 2
    with pytest.raises(LimitExceeded, match="max_words"):
        read(path, ReadLimits(max_words=words - 1))


# -- the time limit --------------------------------------------------------------------------------


def _spin(path: Path, limits: ReadLimits) -> Document:
    """A reader stuck in pure Python, catching what readers catch to call a file corrupt.

    It gives up after a few seconds, so a broken time limit fails the test, not hangs it.
    """
    give_up = time.monotonic() + 3
    try:
        while time.monotonic() < give_up:
            pass
    except Exception as error:
        raise CorruptFile("swallowed", path=str(path)) from error
    raise AssertionError("the time limit did not stop the reader")


@pytest.fixture
def _stuck_markdown(monkeypatch: pytest.MonkeyPatch) -> None:
    from matcheck import readers

    monkeypatch.setitem(readers.READERS, "markdown", readers.ReaderSpec("markdown", _spin))


@pytest.mark.usefixtures("_stuck_markdown")
def test_read_time_limit(tmp_path: Path) -> None:
    from matcheck.readers import read

    path = tmp_path / "stuck.md"
    path.write_text(LESSON, encoding="utf-8")
    before = signal.getsignal(signal.SIGALRM)
    with _terminates(5), pytest.raises(LimitExceeded, match=r"max_read_seconds \(0.2 s\)"):
        read(path, ReadLimits(max_read_seconds=0.2))
    # The timer and the handler are put back as they were.
    assert signal.getitimer(signal.ITIMER_REAL) == (0.0, 0.0)
    assert signal.getsignal(signal.SIGALRM) == before


@pytest.mark.usefixtures("_stuck_markdown")
def test_read_time_limit_end_to_end(capsys: pytest.CaptureFixture[str], tmp_path: Path) -> None:
    path = tmp_path / "stuck.md"
    path.write_text(LESSON, encoding="utf-8")
    with _terminates():
        status = main(["profile", str(path), "--limit", "max_read_seconds=0.2"])
    assert status == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "max_read_seconds" in err[0] and "Traceback" not in err[0]


def test_no_time_limit_outside_the_main_thread(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    from matcheck import readers

    def slow(path: Path, limits: ReadLimits) -> Document:
        time.sleep(0.3)
        return readers._text(path, limits)

    monkeypatch.setitem(readers.READERS, "text", readers.ReaderSpec("text", slow))
    path = tmp_path / "slow.txt"
    path.write_text(LESSON, encoding="utf-8")
    results: list[object] = []

    def work() -> None:
        try:
            results.append(readers.read(path, ReadLimits(max_read_seconds=0.05)))
        except Exception as error:
            results.append(error)

    thread = threading.Thread(target=work)
    thread.start()
    thread.join(10)
    # Documented: SIGALRM reaches the main thread only, so a worker thread reads unlimited.
    (result,) = results
    assert isinstance(result, Document)


# -- files outside the lesson: item 4 --------------------------------------------------------------

_OPENED: list[str] = []
_WATCHED: set[str] = set()


def _audit(event: str, args: tuple[Any, ...]) -> None:
    # PEP 578 audit hooks see every open() of the process, whatever library makes it.
    if event == "open" and args and isinstance(args[0], str | Path):
        name = os.path.realpath(os.fspath(args[0]))
        if name in _WATCHED:
            _OPENED.append(name)


sys.addaudithook(_audit)


def test_images_outside_the_folder_are_never_opened(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    secret = tmp_path / "secret.png"
    secret.write_bytes(_png(11, 13))
    lesson_dir = tmp_path / "course" / "week1"
    lesson_dir.mkdir(parents=True)
    (lesson_dir / "alias.png").symlink_to(secret)
    lesson = lesson_dir / "lesson.md"
    lesson.write_text(
        f"{LESSON}\n\n![Up](../../secret.png)\n\n![Absolute]({secret})\n\n![Link](alias.png)\n",
        encoding="utf-8",
    )
    _WATCHED.add(os.path.realpath(secret))
    _OPENED.clear()
    try:
        measures, warnings = _profiled(capsys, lesson)
    finally:
        _WATCHED.clear()
    assert _OPENED == []
    assert (measures["figures"], measures["figures_unreadable"]) == (3, 3)
    assert len(warnings) == 3
    assert all("outside the lesson folder; not read" in warning for warning in warnings)
    # The hook does see an open of the file: allowed, the same links are read.
    from matcheck.readers import read

    _WATCHED.add(os.path.realpath(secret))
    try:
        allowed = read(lesson, ReadLimits(allow_outside_files=True))
    finally:
        _WATCHED.clear()
    assert [(f.width_px, f.height_px) for f in allowed.figures] == [(11, 13)] * 3
    assert len(_OPENED) == 3


@pytest.fixture
def _no_network(monkeypatch: pytest.MonkeyPatch) -> None:
    def refuse(*args: object, **kwargs: object) -> None:
        raise AssertionError("matcheck tried to use the network")

    monkeypatch.setattr(socket.socket, "connect", refuse)
    monkeypatch.setattr(socket.socket, "connect_ex", refuse)
    monkeypatch.setattr(socket, "create_connection", refuse)
    monkeypatch.setattr(socket, "getaddrinfo", refuse)


@pytest.mark.usefixtures("_no_network")
def test_remote_images_are_never_fetched(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    from docx.opc.constants import RELATIONSHIP_TYPE as RT
    from docx.oxml.ns import qn

    lesson = tmp_path / "lesson.md"
    lesson.write_text(
        f"{LESSON}\n\n![Router](https://example.org/router.png)\n\n"
        "![Switch](http://192.0.2.1/switch.png)\n\n![Modem](//cdn.example.org/modem.png)\n\n"
        '![Cable](ftp://example.org/cable.png)\n\n<img src="https://example.org/wifi.png">\n',
        encoding="utf-8",
    )
    measures, _ = _profiled(capsys, lesson)
    assert measures["figures"] == 5

    import docx
    from docx.shared import Cm

    document = docx.Document()
    document.add_paragraph(LESSON)
    inline = document.add_picture(io.BytesIO(_png(12, 12)), width=Cm(2))._inline
    blip = next(inline.iter(qn("a:blip")))
    del blip.attrib[qn("r:embed")]
    url = "https://example.org/pump.png"
    blip.set(qn("r:link"), document.part.relate_to(url, RT.IMAGE, is_external=True))
    path = tmp_path / "linked.docx"
    document.save(str(path))
    measures, _ = _profiled(capsys, path)
    assert measures["figures"] == 1


# -- outputs: item 5 -------------------------------------------------------------------------------


def _snapshot(folder: Path) -> dict[str, tuple[bytes, int]]:
    return {
        str(path.relative_to(folder)): (path.read_bytes(), path.stat().st_mtime_ns)
        for path in sorted(folder.rglob("*"))
        if path.is_file()
    }


def test_inputs_and_their_folder_are_never_written(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    folder = tmp_path / "lessons"
    folder.mkdir()
    (folder / "pump.png").write_bytes(_png(20, 10))
    markdown = folder / "a.md"
    markdown.write_text(f"{LESSON}\n\n![Pump](pump.png)\n", encoding="utf-8")
    word = _docx(folder, "b.docx", picture=True)
    pdf = _pdf(folder, "c.pdf")
    before = _snapshot(folder)
    report = tmp_path / "out" / "report.json"
    report.parent.mkdir()
    assert main(["profile", str(markdown), str(word), str(pdf)]) == 0
    assert main(["profile", str(markdown), str(word), "-f", "json", "-o", str(report)]) == 0
    compare = ["compare", str(markdown), str(word), "-f", "json", "-o", str(report)]
    assert main(compare) in (0, 1)
    capsys.readouterr()
    assert _snapshot(folder) == before
    assert sorted(path.name for path in report.parent.iterdir()) == ["report.json"]


def test_output_refuses_links_to_an_input(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    lesson = tmp_path / "lesson.md"
    lesson.write_text(LESSON + "\n", encoding="utf-8")
    before = lesson.read_bytes()
    symbolic = tmp_path / "report-link.json"
    symbolic.symlink_to(lesson)
    hard = tmp_path / "report-hard.json"
    os.link(lesson, hard)
    for target in (symbolic, hard):
        status, _, err = _run(capsys, "profile", lesson, "-f", "json", "-o", target)
        assert status == 2
        assert len(err.splitlines()) == 1
        assert "one of the input files" in err
        assert lesson.read_bytes() == before
    fifo = tmp_path / "pipe.json"
    os.mkfifo(fifo)
    with _terminates():
        status, _, err = _run(capsys, "profile", lesson, "-f", "json", "-o", fifo)
    assert status == 2
    assert "not a regular file" in err


def test_output_is_atomic(
    capsys: pytest.CaptureFixture[str], tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    import errno

    from matcheck import output

    lesson = tmp_path / "lesson.md"
    lesson.write_text(LESSON + "\n", encoding="utf-8")
    report = tmp_path / "report.json"
    report.write_text("the previous report\n", encoding="utf-8")
    report.chmod(0o640)
    real_fdopen = os.fdopen

    class DiskFull(io.BufferedWriter):
        def write(self, data: Any) -> int:
            super().write(bytes(data)[: len(data) // 2])
            self.flush()  # half the report really reaches the temporary file
            raise OSError(errno.ENOSPC, os.strerror(errno.ENOSPC))

    def failing_fdopen(fd: int, *args: Any, **kwargs: Any) -> io.BufferedWriter:
        return DiskFull(io.FileIO(fd, "wb"))

    monkeypatch.setattr(output.os, "fdopen", failing_fdopen)
    status, _, err = _run(capsys, "profile", lesson, "-f", "json", "-o", report)
    assert status == 2
    assert len(err.splitlines()) == 1
    assert "No space left on device" in err
    assert report.read_text(encoding="utf-8") == "the previous report\n"
    assert sorted(path.name for path in tmp_path.iterdir()) == ["lesson.md", "report.json"]

    monkeypatch.setattr(output.os, "fdopen", real_fdopen)
    assert main(["profile", str(lesson), "-f", "json", "-o", str(report)]) == 0
    assert json.loads(report.read_text(encoding="utf-8"))["documents"]
    assert report.stat().st_mode & 0o777 == 0o640  # a replaced report keeps its permissions
    assert sorted(path.name for path in tmp_path.iterdir()) == ["lesson.md", "report.json"]


# -- memory: peak RSS of the CLI on the heaviest cases, in a fresh process ----------------------


def test_peak_memory_stays_bounded(tmp_path: Path) -> None:
    bomb = _docx(tmp_path, "bomb.docx")
    with zipfile.ZipFile(bomb, "a", zipfile.ZIP_DEFLATED) as archive:
        archive.writestr("word/media/filler.bin", bytes(8 * 2**20))
    laughs = _docx(tmp_path, "laughs.docx")
    members = _members(laughs)
    members["word/document.xml"] = _with_doctype(
        members["word/document.xml"], "w:document"
    ).replace(LESSON.encode(), b"&lol9;")
    _rezip(laughs, members)
    (tmp_path / "tyre.png").write_bytes(_png_header_only(HUGE, HUGE))
    huge = tmp_path / "huge.md"
    huge.write_text(f"{LESSON}\n\n![A tyre](tyre.png)\n", encoding="utf-8")
    million = _million_words(tmp_path / "million.md")
    cases = [(bomb, 2), (laughs, 2), (huge, 0), (million, 2)]
    script = textwrap.dedent(
        """
        import contextlib, io, json, resource, sys
        from matcheck.cli import main
        statuses = []
        for path in sys.argv[1:]:
            with contextlib.redirect_stdout(io.StringIO()), \\
                    contextlib.redirect_stderr(io.StringIO()):
                statuses.append(main(["profile", path, "-f", "json"]))
        # Linux reports ru_maxrss in KiB (getrusage(2)).
        peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss * 1024
        print(json.dumps({"statuses": statuses, "peak": peak}))
        """
    )
    start = time.monotonic()
    result = subprocess.run(
        [sys.executable, "-c", script, *(str(path) for path, _ in cases)],
        capture_output=True,
        text=True,
        timeout=120,
        check=False,
    )
    assert result.returncode == 0, result.stderr
    outcome = json.loads(result.stdout)
    assert outcome["statuses"] == [status for _, status in cases]
    assert outcome["peak"] < PEAK_RSS_BYTES, outcome["peak"] / 2**20
    assert time.monotonic() - start < 60
    assert resource.getrusage(resource.RUSAGE_SELF).ru_maxrss > 0  # the measure is available
