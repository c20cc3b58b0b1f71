"""Line breaks, normalisation, BOM-less UTF-16/32, ligatures, and a DOCX that lost an image.

Sources: Unicode Standard 5.8 "Newline Guidelines" and UAX #15 (normalization); the
compatibility decompositions of U+FB00–U+FB06 in UnicodeData.txt, read here through Python's
``unicodedata`` (an implementation outside the project); RFC 2781 (UTF-16) for the byte
layouts; docs/references.md §16 and §22.
"""

from __future__ import annotations

import unicodedata
import zipfile
from pathlib import Path

import pytest

from matcheck.cli import main
from matcheck.model import BlockKind
from matcheck.readers import read
from matcheck.readers.builder import normalize_text
from matcheck.readers.wide import bomless_wide_codec

DEMO = Path(__file__).resolve().parent.parent / "fixtures" / "demo"
LESSON = (
    "# Bleeding a radiator\n\nTurn the heating off and let the radiator cool. Hold a cloth "
    "under the valve.\n\nOpen the valve a quarter turn with the key. Close it when water "
    "comes out.\n"
)


def _blocks(path: Path) -> list[tuple[BlockKind, str]]:
    return [(block.kind, block.text) for block in read(path).blocks]


@pytest.mark.parametrize(
    ("separator", "paragraph_break"),
    [
        ("\u2028", False),  # LINE SEPARATOR
        ("\u0085", False),  # NEXT LINE (NEL)
        ("\r", False),  # a lone CR (classic Mac OS)
        ("\r\r\n", False),  # CR CR LF: a CRLF file converted twice, still one line end
        ("\u2029", True),  # PARAGRAPH SEPARATOR
    ],
)
def test_every_unicode_line_break_is_a_line_break(
    tmp_path: Path, separator: str, paragraph_break: bool
) -> None:
    expected = _blocks(_write(tmp_path / "lf.md", LESSON))
    text = LESSON.replace("\n\n", "\u2029" if paragraph_break else separator * 2)
    text = text.replace("\n", separator)
    assert _blocks(_write(tmp_path / "other.md", text)) == expected
    assert expected[0] == (BlockKind.HEADING, "Bleeding a radiator")


def _write(path: Path, text: str) -> Path:
    path.write_bytes(text.encode("utf-8"))
    return path


@pytest.mark.parametrize("codec", ["utf-16-le", "utf-16-be", "utf-32-le", "utf-32-be"])
def test_utf16_and_utf32_without_a_bom(tmp_path: Path, codec: str) -> None:
    path = tmp_path / "lesson.md"
    path.write_bytes(LESSON.replace("cool", "cool (café)").encode(codec))
    document = read(path)
    assert document.blocks[0].text == "Bleeding a radiator"
    assert "café" in document.blocks[1].text
    assert any(codec.upper() in warning for warning in document.warnings)


def test_binary_with_zero_bytes_is_still_binary(tmp_path: Path) -> None:
    assert bomless_wide_codec(bytes(range(256)) * 4) is None
    assert bomless_wide_codec(b"\x00" * 64) is None  # no characters at all
    assert bomless_wide_codec(b"Plain text without zeros") is None
    # Each layout is told apart from the others (RFC 2781 byte orders; UTF-32 first).
    assert bomless_wide_codec("Radiator key".encode("utf-32-le")) == "utf-32-le"
    assert bomless_wide_codec("Radiator key".encode("utf-16-be")) == "utf-16-be"


def test_characters_are_counted_once_per_letter(tmp_path: Path) -> None:
    from matcheck.api import profile_files
    from matcheck.settings import Settings

    composed = LESSON.replace("radiator cool", "radiator cool: café, naïve, q\u0307")
    decomposed = unicodedata.normalize("NFD", composed)
    assert len(decomposed) > len(composed)
    # q + U+0307 has no precomposed form (UAX #15): one letter as a reader sees it, as "q".
    plain = composed.replace("q\u0307", "q")
    paths = [_write(tmp_path / f"{i}.md", t) for i, t in enumerate((composed, decomposed, plain))]
    counts = {p.get("characters").value for p in profile_files(paths, Settings())}  # type: ignore[union-attr]
    assert len(counts) == 1


@pytest.mark.parametrize("ligature", ["\ufb00", "\ufb01", "\ufb02", "\ufb03", "\ufb04", "\ufb06"])
def test_ligatures_become_letters_without_crashing(ligature: str) -> None:
    # The reference: the character's compatibility decomposition (NFKC), per UnicodeData.txt.
    letters = unicodedata.normalize("NFKC", ligature)
    assert normalize_text(f"e{ligature}ort  {ligature}") == f"e{letters}ort {letters}"


def test_docx_that_lost_an_image_is_read(
    tmp_path: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    damaged = tmp_path / "lost-image.docx"
    with zipfile.ZipFile(DEMO / "diagrams.docx") as source:
        media = sorted(n for n in source.namelist() if n.startswith("word/media/"))
        with zipfile.ZipFile(damaged, "w") as copy:
            for info in source.infolist():
                if info.filename != media[0]:
                    copy.writestr(info, source.read(info))
    intact = read(DEMO / "diagrams.docx")
    document = read(damaged)
    assert [b.text for b in document.blocks] == [b.text for b in intact.blocks]
    assert len(document.figures) == len(intact.figures)
    assert sum(1 for f in document.figures if not f.readable) == 1
    assert any(media[0] in warning and "missing" in warning for warning in document.warnings)
    # A lost main document part is still a damaged file.
    broken = tmp_path / "no-body.docx"
    with zipfile.ZipFile(DEMO / "diagrams.docx") as source, zipfile.ZipFile(broken, "w") as copy:
        for info in source.infolist():
            if info.filename != "word/document.xml":
                copy.writestr(info, source.read(info))
    assert main(["profile", str(broken)]) == 2
    assert capsys.readouterr().err.count("\n") == 1


_FONT = Path("/usr/share/fonts/truetype/dejavu/DejaVuSans.ttf")


@pytest.mark.skipif(not _FONT.exists(), reason="needs the DejaVu Sans font (fonts-dejavu-core)")
def test_pdf_with_ligature_glyphs_is_read(tmp_path: Path) -> None:
    # fpdf2 embeds the font with a ToUnicode map that sends each ligature glyph to its
    # presentation form (U+FB01 ...), as the real-world PDFs that crashed the reader did.
    from fpdf import FPDF

    pdf = FPDF()
    pdf.add_page()
    pdf.add_font("DejaVu", "", str(_FONT))
    pdf.set_font("DejaVu", size=12)
    text = "The \ufb01rst step is to \ufb01nd the puncture, then ba\ufb04e the o\ufb00set \ufb02ap."
    pdf.multi_cell(0, 8, f"Fixing a flat tyre\n\n{text}")
    path = tmp_path / "ligatures.pdf"
    pdf.output(str(path))
    body = " ".join(block.text for block in read(path).blocks)
    assert unicodedata.normalize("NFKC", text) in body
