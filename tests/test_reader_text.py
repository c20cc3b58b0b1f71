"""Tests for matcheck.readers.text and the shared decoding in matcheck.readers.decode.

Paragraph counts are known by construction. Byte values of encodings are those of the
published tables: RFC 3629 (UTF-8), RFC 2781 (UTF-16 and its byte-order mark), Unicode's
CP1252.TXT mapping (Windows-1252) and ISO/IEC 8859-1 (Latin-1); docs/references.md §16.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from matcheck.errors import CorruptFile
from matcheck.limits import ReadLimits
from matcheck.model import BlockKind
from matcheck.readers.decode import CP1252_WARNING, LATIN1_WARNING, decode_lesson_text
from matcheck.readers.text import read_text

LIMITS = ReadLimits()
HERE = Path("lesson.txt")


def test_text_paragraphs_split_on_blank_lines(tmp_path: Path) -> None:
    path = tmp_path / "lesson.txt"
    path.write_text(
        "Setting up a home router\n"
        "\n"
        "Plug the router into the modem\n"
        "and switch it on.\n"
        "   \n"
        "\n"
        "Open the admin page.\n",
        encoding="utf-8",
    )
    document = read_text(path, LIMITS)
    # Three paragraphs by construction; a whitespace-only line is blank too. No heading is
    # guessed from a short first line.
    assert [block.kind for block in document.blocks] == [BlockKind.PARAGRAPH] * 3
    assert [block.text for block in document.blocks] == [
        "Setting up a home router",
        "Plug the router into the modem and switch it on.",
        "Open the admin page.",
    ]
    assert [block.location.line for block in document.blocks] == [1, 3, 7]
    assert [block.location.paragraph for block in document.blocks] == [1, 2, 3]
    assert document.format == "text"
    assert document.warnings == ()


def test_text_form_feed_ends_a_paragraph(tmp_path: Path) -> None:
    path = tmp_path / "pages.txt"
    path.write_text(
        "End of page one.\fStart of page two\ncontinues.\n\f\nLast.\n", encoding="utf-8"
    )
    document = read_text(path, LIMITS)
    assert [(block.text, block.location.line) for block in document.blocks] == [
        ("End of page one.", 1),
        ("Start of page two continues.", 1),
        ("Last.", 4),
    ]


def test_text_crlf_and_cr_line_endings(tmp_path: Path) -> None:
    path = tmp_path / "windows.txt"
    path.write_bytes(b"One\r\ntwo.\r\n\r\nThree.\rFour.\r\rFive.")
    document = read_text(path, LIMITS)
    assert [(block.text, block.location.line) for block in document.blocks] == [
        ("One two.", 1),
        ("Three. Four.", 4),
        ("Five.", 7),
    ]


def test_text_cp1252_file_read_with_warning(tmp_path: Path) -> None:
    path = tmp_path / "legacy.txt"
    # CP1252.TXT: 0x93/0x94 are the curly double quotes, 0xE9 is "é".
    path.write_bytes(b"The \x93caf\xe9\x94 grind.\n")
    document = read_text(path, LIMITS)
    assert [block.text for block in document.blocks] == ["The \u201ccafé\u201d grind."]
    assert document.warnings == (CP1252_WARNING,)


def test_text_utf8_bom_is_dropped(tmp_path: Path) -> None:
    path = tmp_path / "bom.txt"
    path.write_bytes(b"\xef\xbb\xbfCompost needs air.\n")
    document = read_text(path, LIMITS)
    assert [block.text for block in document.blocks] == ["Compost needs air."]
    assert document.warnings == ()


def test_text_empty_content_gives_no_blocks(tmp_path: Path) -> None:
    path = tmp_path / "blank.txt"
    path.write_text("\n \n\f\n", encoding="utf-8")
    assert read_text(path, LIMITS).blocks == ()


@pytest.mark.parametrize(
    ("data", "expected"),
    [
        # RFC 3629: "é" is C3 A9 in UTF-8.
        (b"caf\xc3\xa9", "café"),
        # UTF-8 BOM EF BB BF is stripped.
        (b"\xef\xbb\xbfcaf\xc3\xa9", "café"),
        # RFC 2781 section 3.2: FF FE marks little-endian UTF-16, FE FF big-endian.
        (b"\xff\xfec\x00a\x00f\x00\xe9\x00", "café"),
        (b"\xfe\xff\x00c\x00a\x00f\x00\xe9", "café"),
        # Line endings become "\n".
        (b"a\r\nb\rc\n", "a\nb\nc\n"),
    ],
)
def test_decode_without_warning(data: bytes, expected: str) -> None:
    assert decode_lesson_text(data, HERE) == (expected, [])


def test_decode_cp1252_fallback() -> None:
    # CP1252.TXT: 0x80 is the euro sign, 0x96 the en dash; both are invalid UTF-8 lead bytes.
    assert decode_lesson_text(b"\x80 5 \x96 6", HERE) == ("€ 5 – 6", [CP1252_WARNING])


def test_decode_latin1_when_cp1252_fails() -> None:
    # CP1252.TXT leaves 0x81 undefined; ISO 8859-1 maps it to U+0081 and 0xE9 to "é".
    assert decode_lesson_text(b"caf\xe9 \x81", HERE) == ("café \x81", [LATIN1_WARNING])


def test_decode_broken_utf16_is_corrupt() -> None:
    # RFC 2781: D800 is a high surrogate that must be followed by a low one; here it is not.
    with pytest.raises(CorruptFile, match="UTF-16") as caught:
        decode_lesson_text(b"\xff\xfe\x00\xd8a\x00", HERE)
    assert caught.value.path == "lesson.txt"
