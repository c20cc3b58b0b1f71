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
    # Three blocks by construction; a whitespace-only line is blank too. The short first line
    # without final punctuation, alone in its paragraph, is a title (readers/text.py rule).
    assert [block.kind for block in document.blocks] == [
        BlockKind.HEADING,
        BlockKind.PARAGRAPH,
        BlockKind.PARAGRAPH,
    ]
    assert [block.text for block in document.blocks] == [
        "Setting up a home router",
        "Plug the router into the modem and switch it on.",
        "Open the admin page.",
    ]
    assert [block.location.line for block in document.blocks] == [1, 3, 7]
    assert [block.location.paragraph for block in document.blocks] == [None, 1, 2]
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
    # Curly quotes are folded to straight ones (matcheck.textnorm), as in every format.
    assert [block.text for block in document.blocks] == ['The "café" grind.']
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


def test_text_list_items_and_titles(tmp_path: Path) -> None:
    # The rule of readers/text.py (docs/formats.md, "Plain text"): marker lines are list items
    # without their marker, unmarked lines continue the item, a short unpunctuated line alone
    # (or above a list) is a title. Expected blocks by construction.
    path = tmp_path / "tyre.txt"
    path.write_text(
        "Fixing a flat tyre\n\nYou need a few tools:\n- tyre levers\n* a pump\n\nSteps\n"
        "1. Remove the wheel\n2) Take out the tube\n   and find the hole\n  a. Patch it\n\n"
        "The tyre should now hold air. Check it after a day\n",
        encoding="utf-8",
    )
    blocks = read_text(path, LIMITS).blocks
    assert [(b.kind, b.text, b.level, b.location.line) for b in blocks] == [
        (BlockKind.HEADING, "Fixing a flat tyre", 1, 1),
        (BlockKind.PARAGRAPH, "You need a few tools:", 0, 3),
        (BlockKind.LIST_ITEM, "tyre levers", 1, 4),
        (BlockKind.LIST_ITEM, "a pump", 1, 5),
        (BlockKind.HEADING, "Steps", 1, 7),
        (BlockKind.LIST_ITEM, "Remove the wheel", 1, 8),
        (BlockKind.LIST_ITEM, "Take out the tube and find the hole", 1, 9),
        (BlockKind.LIST_ITEM, "Patch it", 2, 11),
        # two lines that do not start with a marker stay one paragraph, however they end
        (BlockKind.PARAGRAPH, "The tyre should now hold air. Check it after a day", 0, 13),
    ]
    assert blocks[2].group == blocks[3].group != blocks[5].group
    assert blocks[5].group == blocks[6].group == blocks[7].group


def test_text_long_or_punctuated_line_is_no_title(tmp_path: Path) -> None:
    path = tmp_path / "lines.txt"
    path.write_text(
        "Check the pressure.\n\nThis line has eleven words in it and no full stop at all\n",
        encoding="utf-8",
    )
    kinds = [block.kind for block in read_text(path, LIMITS).blocks]
    assert kinds == [BlockKind.PARAGRAPH, BlockKind.PARAGRAPH]
