"""The PDF reader, checked against PDFs whose content is known by construction.

The PDFs are built here with fpdf2 (text placed line by line, so every line end, gap, font
and size is chosen by the test) or written byte by byte following PDF 32000-1:2008 (for form
XObjects and inline images, which fpdf2 does not write). Expected values come from that
construction; the layout thresholds they exercise are common practice. The PDF sections cited
beside the checks are listed in docs/references.md §13.
"""

from __future__ import annotations

import re
from collections.abc import Callable
from pathlib import Path
from typing import Any

import pytest

from matcheck.errors import CorruptFile, EncryptedFile, LimitExceeded, NoText
from matcheck.limits import DEFAULT_LIMITS, ReadLimits
from matcheck.model import BlockKind, Document, Emphasis
from matcheck.readers.builder import NO_EMPHASIS
from matcheck.readers.pdf import read_pdf
from matcheck.readers.pdf_fonts import base_font_name, emphasis_from_name
from matcheck.readers.pdf_text import is_page_number, join_lines, list_marker_length

BODY = 11
LINE_MM = 6.0
HEADER = "Bicycle Care Guide"
# fpdf2 places an image at the width and height asked for, in mm (1 cm = 10 mm).
IMAGE_PX = (300, 150)
IMAGE_MM = (60.0, 30.0)

P1 = [
    "A clean chain shifts smoothly and lasts for thousands of kilometres.",
    "Dirt mixed with old oil forms a paste that grinds the rollers down.",
]
LIST1 = ["A stiff brush", "Citrus degreaser", "A clean cotton rag"]
NESTED = "An old toothbrush"
HYPHEN_LINES = [
    "Check the chain for stretch with a wear indi-",
    "cator tool every few months.",
]
CAPTION = "Figure 1: A chain wear indicator on the rollers"
ALT = "A steel gauge resting on a bicycle chain with its tooth between two rollers."
BREAK_LINES = [
    "Wipe the chain after every ride in the rain and",
    "apply a thin coat of oil to each link.",
]
P4 = ["Store the bicycle indoors where it stays dry and out of direct sunlight."]
LIST2 = ["Hang it from a wall hook.", "Cover the saddle with a bag."]
P5 = ["A little care each week saves an expensive repair later."]


def _fpdf_class(footer: Callable[[int], str] | None = None) -> Any:
    """An FPDF subclass with a running header and a page-number footer."""
    from fpdf import FPDF

    class Lesson(FPDF):
        def header(self) -> None:
            self.set_font("Helvetica", "I", 9)
            self.cell(0, 8, HEADER, new_x="LMARGIN", new_y="NEXT")
            self.ln(4)

        def footer(self) -> None:
            self.set_y(-15)
            self.set_font("Helvetica", "", 9)
            text = footer(self.page_no()) if footer else f"Page {self.page_no()}"
            self.cell(0, 8, text, align="C")

    return Lesson


def _new_pdf(footer: Callable[[int], str] | None = None, *, running: bool = True) -> Any:
    from fpdf import FPDF

    pdf = (_fpdf_class(footer) if running else FPDF)(unit="mm", format="A4")
    # WinAnsi (cp1252) has the bullet; fpdf2's default core-font encoding is Latin-1.
    pdf.core_fonts_encoding = "windows-1252"
    pdf.set_auto_page_break(False)
    pdf.add_page()
    return pdf


def _lines(
    pdf: Any, lines: list[str], *, size: float = BODY, style: str = "", x: float = 0
) -> None:
    pdf.set_font("Helvetica", style, size)
    for text in lines:
        if x:
            pdf.set_x(pdf.l_margin + x)
        pdf.cell(0, LINE_MM, text, new_x="LMARGIN", new_y="NEXT")


def _heading(pdf: Any, text: str, size: float) -> None:
    pdf.ln(3)
    pdf.set_font("Helvetica", "B", size)
    pdf.cell(0, size * 0.5, text, new_x="LMARGIN", new_y="NEXT")
    pdf.ln(3)


def _png(tmp: Path, size: tuple[int, int], name: str = "photo.png") -> Path:
    from PIL import Image

    path = tmp / name
    Image.new("RGB", size, (40, 90, 160)).save(path)
    return path


def _lesson(tmp: Path) -> Path:
    pdf = _new_pdf()
    _heading(pdf, "Keeping a Bicycle Chain Clean", 20)
    _lines(pdf, P1)
    _heading(pdf, "Tools You Need", 15)
    _lines(pdf, ["\u2022 " + item for item in LIST1])
    _lines(pdf, ["\u2022 " + NESTED], x=8)
    pdf.ln(4)
    # One paragraph with a bold and an italic word, written piece by piece.
    pdf.set_font("Helvetica", "", BODY)
    pdf.write(LINE_MM, "You should ")
    pdf.set_font("Helvetica", "B", BODY)
    pdf.write(LINE_MM, "never")
    pdf.set_font("Helvetica", "", BODY)
    pdf.write(LINE_MM, " spray oil onto the ")
    pdf.set_font("Helvetica", "I", BODY)
    pdf.write(LINE_MM, "drivetrain")
    pdf.set_font("Helvetica", "", BODY)
    pdf.write(LINE_MM, " while it is dirty.")
    pdf.ln(LINE_MM)
    _heading(pdf, "Chain Wear", 13)
    _lines(pdf, HYPHEN_LINES)
    pdf.ln(4)
    # fpdf2 tags the image as a /Figure structure element with this /Alt.
    pdf.image(str(_png(tmp, IMAGE_PX)), x=pdf.l_margin, w=IMAGE_MM[0], h=IMAGE_MM[1], alt_text=ALT)
    pdf.ln(2)
    _lines(pdf, [CAPTION], size=9)
    pdf.ln(4)
    _lines(pdf, BREAK_LINES[:1])
    pdf.add_page()
    _lines(pdf, BREAK_LINES[1:])
    _heading(pdf, "Storing the Bicycle", 15)
    _lines(pdf, P4)
    pdf.ln(4)
    _lines(pdf, [f"{number}. {item}" for number, item in enumerate(LIST2, 1)])
    pdf.ln(4)
    _lines(pdf, P5)
    path = tmp / "lesson.pdf"
    pdf.output(str(path))
    return path


@pytest.fixture(scope="module")
def lesson(tmp_path_factory: pytest.TempPathFactory) -> Document:
    return read_pdf(_lesson(tmp_path_factory.mktemp("pdf")), DEFAULT_LIMITS)


def _kinds(document: Document, kind: BlockKind) -> list[str]:
    return [block.text for block in document.blocks_of(kind)]


def test_headings_and_levels_follow_font_sizes(lesson: Document) -> None:
    # By construction: 20, 15 and 13 pt over 11 pt body text (all >= 1.15x), largest first.
    headings = [(block.text, block.level) for block in lesson.blocks_of(BlockKind.HEADING)]
    assert headings == [
        ("Keeping a Bicycle Chain Clean", 1),
        ("Tools You Need", 2),
        ("Chain Wear", 3),
        ("Storing the Bicycle", 2),
    ]
    # Helvetica-Bold is the headings' style, not emphasis within them.
    assert not any(block.emphasis for block in lesson.blocks_of(BlockKind.HEADING))


def test_paragraphs_and_words_match_the_source(lesson: Document) -> None:
    # By construction: P1, the emphasis line, the hyphenated pair, the page-break pair, P4, P5.
    assert len(lesson.blocks_of(BlockKind.PARAGRAPH)) == 6
    source = [
        "Keeping a Bicycle Chain Clean",
        *P1,
        "Tools You Need",
        *LIST1,
        NESTED,
        "You should never spray oil onto the drivetrain while it is dirty.",
        "Chain Wear",
        "Check the chain for stretch with a wear indicator tool every few months.",
        CAPTION,
        *BREAK_LINES,
        "Storing the Bicycle",
        *P4,
        *LIST2,
        *P5,
    ]
    words = " ".join(block.text for block in lesson.blocks).split()
    assert words == " ".join(source).split()
    assert lesson.pages == 2


def test_bold_and_italic_spans(lesson: Document) -> None:
    # Helvetica-Bold and -Oblique are the bold and italic standard fonts (PDF 32000-1, 9.6.2.2).
    block = next(b for b in lesson.blocks if b.text.startswith("You should"))
    spans = {(block.text[span.start : span.end], span.kind) for span in block.emphasis}
    assert spans == {("never", Emphasis.BOLD), ("drivetrain", Emphasis.ITALIC)}
    assert not any(b.emphasis for b in lesson.blocks_of(BlockKind.PARAGRAPH) if b is not block)


def test_running_header_footer_and_page_numbers_are_left_out(lesson: Document) -> None:
    text = " ".join(block.text for block in lesson.blocks)
    assert HEADER not in text
    assert re.search(r"Page \d", text) is None
    assert "running headers, footers and page numbers" in lesson.excluded


def test_hyphenated_word_is_rejoined(lesson: Document) -> None:
    block = next(b for b in lesson.blocks if b.text.startswith("Check the chain"))
    assert "wear indicator tool" in block.text
    assert "indi-" not in block.text


def test_paragraph_across_page_break_is_joined(lesson: Document) -> None:
    joined = " ".join(BREAK_LINES)
    block = next(b for b in lesson.blocks if b.text.startswith("Wipe the chain"))
    assert block.text == joined
    assert block.kind is BlockKind.PARAGRAPH
    assert block.location.page == 1


def test_list_items_groups_and_levels(lesson: Document) -> None:
    items = lesson.blocks_of(BlockKind.LIST_ITEM)
    assert [item.text for item in items] == [*LIST1, NESTED, *LIST2]
    # The nested bullet is indented 8 mm right of the others: one level deeper.
    assert [item.level for item in items] == [1, 1, 1, 2, 1, 1]
    groups = [item.group for item in items]
    assert groups[0] is not None and groups[4] is not None
    assert groups[:4] == [groups[0]] * 4 and groups[4:] == [groups[4]] * 2
    assert groups[0] != groups[4]


def test_figure_size_display_size_and_caption(lesson: Document) -> None:
    assert len(lesson.figures) == 1
    figure = lesson.figures[0]
    assert (figure.width_px, figure.height_px) == IMAGE_PX
    # Placed at 60 x 30 mm = 6.0 x 3.0 cm.
    assert figure.display_width_cm == pytest.approx(IMAGE_MM[0] / 10, abs=0.05)
    assert figure.display_height_cm == pytest.approx(IMAGE_MM[1] / 10, abs=0.05)
    assert figure.caption == CAPTION
    assert figure.alt_text == ALT
    assert _kinds(lesson, BlockKind.CAPTION) == [CAPTION]
    # In reading order the figure follows the paragraph above it.
    assert lesson.blocks[figure.location.block].text.startswith("Check the chain")
    assert figure.location.page == 1


def test_bold_line_at_body_size_before_body_text_is_a_heading(tmp_path: Path) -> None:
    pdf = _new_pdf(running=False)
    _heading(pdf, "Brewing Coffee", 18)
    _lines(pdf, ["Before You Start"], style="B")
    _lines(pdf, ["Weigh the beans and heat the water to just below boiling."])
    pdf.ln(4)
    _lines(pdf, ["Always rinse the paper filter first."], style="B")
    _lines(pdf, ["Rinsing removes the papery taste."])
    pdf.ln(4)
    _lines(pdf, ["Grind Size"], style="B", size=BODY + 1)
    _lines(pdf, ["A finer grind brews faster and tastes stronger."])
    path = tmp_path / "coffee.pdf"
    pdf.output(str(path))
    document = read_pdf(path, DEFAULT_LIMITS)
    headings = [(block.text, block.level) for block in document.blocks_of(BlockKind.HEADING)]
    # One size above body (level 1), so a bold body-size heading is level 2, and so is a bold
    # one 1 pt larger (below the 1.15x size threshold); a bold sentence ending in a period is
    # not a heading but the bold start of its paragraph.
    assert headings == [("Brewing Coffee", 1), ("Before You Start", 2), ("Grind Size", 2)]
    paragraphs = document.blocks_of(BlockKind.PARAGRAPH)
    assert [block.text for block in paragraphs] == [
        "Weigh the beans and heat the water to just below boiling.",
        "Always rinse the paper filter first. Rinsing removes the papery taste.",
        "A finer grind brews faster and tastes stronger.",
    ]
    bold = [paragraphs[1].text[span.start : span.end] for span in paragraphs[1].emphasis]
    assert bold == ["Always rinse the paper filter first."]


def test_caption_rules(tmp_path: Path) -> None:
    pdf = _new_pdf(running=False)
    _lines(pdf, ["A worm bin turns kitchen scraps into compost within a few months."])
    pdf.ln(3)
    pdf.image(str(_png(tmp_path, (200, 100), "a.png")), x=pdf.l_margin, w=50, h=25)
    pdf.ln(1)
    _lines(pdf, ["Table 2 lists the scraps the worms eat"], size=9)
    pdf.ln(4)
    _lines(pdf, ["Figure 5 shows the same bin after a month of feeding."])
    pdf.ln(4)
    pdf.image(str(_png(tmp_path, (120, 120), "b.png")), x=pdf.l_margin, w=30, h=30)
    pdf.ln(4)
    _lines(pdf, ["Keep the bedding as damp as a wrung-out sponge."])
    pdf.ln(4)
    _lines(pdf, ["Figure 3. Bedding made of shredded cardboard"], size=9)
    path = tmp_path / "compost.pdf"
    pdf.output(str(path))
    document = read_pdf(path, DEFAULT_LIMITS)
    # "Table N" right below an image is its caption; "Figure N." anywhere is a caption of the
    # nearest figure; "Figure N shows" away from an image is body text.
    assert _kinds(document, BlockKind.CAPTION) == [
        "Table 2 lists the scraps the worms eat",
        "Figure 3. Bedding made of shredded cardboard",
    ]
    assert "Figure 5 shows the same bin after a month of feeding." in _kinds(
        document, BlockKind.PARAGRAPH
    )
    assert [(f.width_px, f.caption) for f in document.figures] == [
        (200, "Table 2 lists the scraps the worms eat"),
        (120, "Figure 3. Bedding made of shredded cardboard"),
    ]


def _raw_pdf(objects: list[bytes]) -> bytes:
    """A PDF with the given objects (1-based, object 1 the catalog) and a correct xref table
    (PDF 32000-1:2008, 7.5)."""
    out = bytearray(b"%PDF-1.4\n")
    offsets = []
    for number, body in enumerate(objects, 1):
        offsets.append(len(out))
        out += b"%d 0 obj\n" % number + body + b"\nendobj\n"
    xref = len(out)
    out += b"xref\n0 %d\n0000000000 65535 f \n" % (len(objects) + 1)
    out += b"".join(b"%010d 00000 n \n" % offset for offset in offsets)
    out += b"trailer\n<< /Size %d /Root 1 0 R >>\nstartxref\n%d\n%%%%EOF\n" % (
        len(objects) + 1,
        xref,
    )
    return bytes(out)


def _stream(dictionary: bytes, data: bytes) -> bytes:
    return b"<< " + dictionary + b" /Length %d >>\nstream\n" % len(data) + data + b"\nendstream"


def test_images_in_form_xobjects_and_inline_images(tmp_path: Path) -> None:
    text = b"BT /F1 12 Tf 72 760 Td (A router has four network ports on the back.) Tj ET\n"
    # The form draws the image at 100 x 50 units; its /Matrix halves that and the page's cm
    # doubles it again: 100 x 50 pt. The inline image is the unit square under 72 x 36 pt.
    content = (
        text
        + b"q 2 0 0 2 100 400 cm /Fm1 Do Q\n"
        + b"q 72 0 0 36 300 200 cm BI /W 4 /H 2 /CS /G /BPC 8 ID "
        + bytes(range(8))
        + b"\nEI Q\n"
    )
    objects = [
        b"<< /Type /Catalog /Pages 2 0 R >>",
        b"<< /Type /Pages /Kids [3 0 R] /Count 1 >>",
        b"<< /Type /Page /Parent 2 0 R /MediaBox [0 0 595 842] /Contents 4 0 R"
        b" /Resources << /Font << /F1 5 0 R >> /XObject << /Fm1 6 0 R >> >> >>",
        _stream(b"", content),
        b"<< /Type /Font /Subtype /Type1 /BaseFont /Helvetica >>",
        _stream(
            b"/Type /XObject /Subtype /Form /BBox [0 0 100 50] /Matrix [0.5 0 0 0.5 0 0]"
            b" /Resources << /XObject << /Im1 7 0 R >> >>",
            b"q 100 0 0 50 0 0 cm /Im1 Do Q",
        ),
        _stream(
            b"/Type /XObject /Subtype /Image /Width 40 /Height 20 /ColorSpace /DeviceGray"
            b" /BitsPerComponent 8",
            bytes(800),
        ),
    ]
    path = tmp_path / "forms.pdf"
    path.write_bytes(_raw_pdf(objects))
    document = read_pdf(path, DEFAULT_LIMITS)
    assert [block.text for block in document.blocks] == [
        "A router has four network ports on the back."
    ]
    cm = 2.54 / 72  # 1 pt = 1/72 in (PDF 32000-1, 8.3.2.3), 1 in = 2.54 cm
    assert [(f.width_px, f.height_px) for f in document.figures] == [(40, 20), (4, 2)]
    shown = [(f.display_width_cm, f.display_height_cm) for f in document.figures]
    expected = [(100 * cm, 50 * cm), (72 * cm, 36 * cm)]
    for (width, height), (want_width, want_height) in zip(shown, expected, strict=True):
        assert width == pytest.approx(want_width, abs=0.05)
        assert height == pytest.approx(want_height, abs=0.05)


def test_truncated_pdf_is_corrupt(tmp_path: Path) -> None:
    data = _lesson(tmp_path).read_bytes()
    path = tmp_path / "half.pdf"
    path.write_bytes(data[: len(data) // 2])
    with pytest.raises(CorruptFile, match="damaged or truncated") as error:
        read_pdf(path, DEFAULT_LIMITS)
    assert error.value.path == str(path)


def test_garbage_after_header_is_corrupt(tmp_path: Path) -> None:
    path = tmp_path / "garbage.pdf"
    path.write_bytes(b"%PDF-1.7\n" + bytes(range(256)) * 8)
    with pytest.raises(CorruptFile, match="damaged or truncated"):
        read_pdf(path, DEFAULT_LIMITS)


def _encrypted(tmp_path: Path, user_password: str) -> Path:
    from fpdf import FPDF

    pdf = FPDF()
    pdf.set_font("Helvetica", size=12)
    pdf.add_page()
    pdf.multi_cell(0, 6, "Grind the coffee just before brewing it.")
    # RC4 is fpdf2's default and needs no extra package in either library.
    pdf.set_encryption(owner_password="owner-secret", user_password=user_password)
    path = tmp_path / "locked.pdf"
    pdf.output(str(path))
    return path


def test_password_protected_pdf(tmp_path: Path) -> None:
    path = _encrypted(tmp_path, "brew")
    assert b"/Encrypt" in path.read_bytes()
    with pytest.raises(EncryptedFile, match="protected by a password") as error:
        read_pdf(path, DEFAULT_LIMITS)
    assert error.value.hint == "save an unprotected copy"


def test_aes_without_crypto_package_is_reported_as_encryption(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    from pypdf import PdfReader
    from pypdf.errors import DependencyError

    def no_aes(self: object, password: str) -> None:
        # What pypdf raises for AES when neither 'cryptography' nor 'pycryptodome' is there.
        raise DependencyError("cryptography>=3.1 is required for AES algorithm")

    monkeypatch.setattr(PdfReader, "decrypt", no_aes)
    with pytest.raises(EncryptedFile, match="AES"):
        read_pdf(_encrypted(tmp_path, "brew"), DEFAULT_LIMITS)


def test_encrypted_pdf_with_empty_user_password_opens(tmp_path: Path) -> None:
    path = _encrypted(tmp_path, "")
    assert b"/Encrypt" in path.read_bytes()
    document = read_pdf(path, DEFAULT_LIMITS)
    assert [block.text for block in document.blocks] == ["Grind the coffee just before brewing it."]


def test_image_only_pdf_is_a_scan(tmp_path: Path) -> None:
    from fpdf import FPDF

    pdf = FPDF()
    pdf.add_page()
    pdf.image(str(_png(tmp_path, (400, 560))), x=10, y=10, w=190)
    path = tmp_path / "scan.pdf"
    pdf.output(str(path))
    with pytest.raises(NoText, match="looks scanned") as error:
        read_pdf(path, DEFAULT_LIMITS)
    assert error.value.hint == "run OCR on it first"


def test_blank_pdf_holds_no_text(tmp_path: Path) -> None:
    from fpdf import FPDF

    pdf = FPDF()
    pdf.add_page()
    path = tmp_path / "blank.pdf"
    pdf.output(str(path))
    with pytest.raises(NoText, match="holds no text"):
        read_pdf(path, DEFAULT_LIMITS)


TEA = [
    "the kettle boils water for tea.",
    "green tea wants water well below boiling.",
    "black tea steeps for four minutes.",
    "a warm pot keeps the brew hot for longer.",
    "loose leaves need room to unfold.",
]


def _pages(tmp_path: Path, count: int, paragraphs: int = 1) -> Path:
    pdf = _new_pdf(footer=lambda number: f"- {number} -")
    for page in range(count):
        if page:
            pdf.add_page()
        for index in range(paragraphs):
            _lines(pdf, [f"Section {page}.{index}: {TEA[(page + index) % len(TEA)]}"])
            pdf.ln(4)
    path = tmp_path / f"pages{count}.pdf"
    pdf.output(str(path))
    return path


def test_page_limit(tmp_path: Path) -> None:
    path = _pages(tmp_path, 3)
    with pytest.raises(LimitExceeded, match="3 pages") as error:
        read_pdf(path, ReadLimits(max_pages=2))
    assert "max_pages" in str(error.value)
    assert read_pdf(path, ReadLimits(max_pages=3)).pages == 3


def test_hundred_pages_read_whole(tmp_path: Path) -> None:
    # Speed is measured in benchmarks/run.py, not asserted here.
    path = _pages(tmp_path, 100, paragraphs=10)
    document = read_pdf(path, DEFAULT_LIMITS)
    assert document.pages == 100
    texts = [block.text for block in document.blocks]
    assert len(texts) == 1000
    assert texts[-1] == f"Section 99.9: {TEA[(99 + 9) % len(TEA)]}"
    # "- N -" footers and the running header are gone from every page.
    assert not any(HEADER in text or re.fullmatch(r"- \d+ -", text) for text in texts)


def test_logo_repeated_in_the_header_is_not_a_figure(tmp_path: Path) -> None:
    from fpdf import FPDF

    logo = str(_png(tmp_path, (64, 32), "logo.png"))
    photo = str(_png(tmp_path, (300, 200), "photo.png"))

    class WithLogo(FPDF):
        def header(self) -> None:
            self.image(logo, x=170, y=8, w=20, h=10)

    pdf = WithLogo(unit="mm", format="A4")
    for page, text in enumerate(TEA[:3]):
        pdf.add_page()
        pdf.set_y(40)
        _lines(pdf, [text.capitalize()])
        if page == 1:
            pdf.image(photo, x=pdf.l_margin, w=60, h=40)
    path = tmp_path / "logo.pdf"
    pdf.output(str(path))
    document = read_pdf(path, DEFAULT_LIMITS)
    # By construction: the logo is on all 3 pages in the top band, the photo once mid-page.
    assert [(figure.width_px, figure.location.page) for figure in document.figures] == [(300, 2)]
    assert any("logos" in what for what in document.excluded)


def test_repaired_pdf_warns_instead_of_printing(
    tmp_path: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    data = _lesson(tmp_path).read_bytes()
    # A wrong startxref offset: pypdf rebuilds the cross-reference table and logs it.
    head, _, tail = data.rpartition(b"startxref\n")
    broken = head + b"startxref\n" + b"12" + tail[tail.index(b"\n") :]
    path = tmp_path / "repaired.pdf"
    path.write_bytes(broken)
    document = read_pdf(path, DEFAULT_LIMITS)
    assert document.blocks[0].text == "Keeping a Bicycle Chain Clean"
    assert any("worked around" in warning for warning in document.warnings)
    assert capsys.readouterr().err == ""


@pytest.mark.parametrize(
    ("text", "expected"),
    [
        ("3", True),
        ("Page 3", True),
        ("page 12 of 40", True),
        ("3 of 10", True),
        ("- 3 -", True),
        ("3/10", True),
        ("3 cups", False),
        ("Page three", False),
    ],
)
def test_page_number_forms(text: str, expected: bool) -> None:
    # The forms the brief lists (common practice of page-number styles).
    assert is_page_number(text) is expected


@pytest.mark.parametrize(
    ("text", "length"),
    [
        ("\u2022 Brush", 2),
        ("- Rag", 2),
        ("1. Hang", 3),
        ("2) Cover", 3),
        ("a) Oil", 3),
        ("12 spokes", 0),
        ("-5 degrees", 0),
        ("e.g. oil", 0),
    ],
)
def test_list_markers(text: str, length: int) -> None:
    # Bullets and enumerators followed by a space (common practice of list markup).
    assert list_marker_length(text) == length


def test_line_joining_rules() -> None:
    def join(*lines: str) -> str:
        return "".join(text for text, _ in join_lines([[(line, NO_EMPHASIS)] for line in lines]))

    # Common practice: a letter, a hyphen at the line end and a lowercase letter next.
    assert join("inter-", "ference") == "interference"
    # A real hyphen at a line end stays when the joined word is no word (CMU Pronouncing
    # Dictionary): "singlepurpose" is none, so "single-purpose" is kept whole, no space.
    assert join("a single-", "purpose sketch") == "a single-purpose sketch"
    assert join("a two-", "storey house") == "a two-storey house"
    assert join("Wi-", "Fi routers") == "Wi- Fi routers"
    assert join("a 3-", "day trip") == "a 3- day trip"
    assert join("two lines", "of text") == "two lines of text"
    # A soft hyphen (U+00AD) marks a break inside a word (Unicode Standard, 6.2).
    assert join("com\u00ad", "post") == "compost"


@pytest.mark.parametrize(
    ("name", "expected"),
    [
        ("/Helvetica", set()),
        ("/Helvetica-Bold", {Emphasis.BOLD}),
        ("/Helvetica-Oblique", {Emphasis.ITALIC}),
        ("/ABCDEF+Calibri-BoldItalic", {Emphasis.BOLD, Emphasis.ITALIC}),
        ("/QWERTY+MinionPro-It", {Emphasis.ITALIC}),
        ("/MinionPro-SemiboldIt", {Emphasis.BOLD, Emphasis.ITALIC}),
        ("/Arial,Black", {Emphasis.BOLD}),
        ("/SourceSans-Split", set()),
    ],
)
def test_emphasis_from_font_names(name: str, expected: set[Emphasis]) -> None:
    # Style words in PostScript font names (Adobe's naming convention, common practice);
    # the six-capital subset prefix is PDF 32000-1:2008, 9.6.4.
    font = {"/BaseFont": name}
    assert emphasis_from_name(base_font_name(font)) == expected
    assert "+" not in base_font_name(font)


FIXTURES = Path(__file__).resolve().parent.parent / "fixtures" / "demo"


@pytest.mark.parametrize("version", ["text-only", "diagrams", "diagrams-confounded"])
def test_demo_fixture_matches_its_construction(version: str) -> None:
    import json

    # fixtures/demo/expected.json holds the counts of each version from its source data.
    expected = json.loads((FIXTURES / "expected.json").read_text(encoding="utf-8"))
    counts = expected["versions"][version]
    document = read_pdf(FIXTURES / f"{version}.pdf", DEFAULT_LIMITS)
    assert document.pages == counts["pdf_pages"]
    headings = [[block.level, block.text] for block in document.blocks_of(BlockKind.HEADING)]
    assert headings == counts["heading_list"]
    items = document.blocks_of(BlockKind.LIST_ITEM)
    assert len(items) == counts["list_items"]
    assert len({item.group for item in items}) == counts["lists"]
    # The fixture's word rule: runs of non-space with a letter or digit, captions left out.
    # Table cells count as words too (see test_demo_table_matches_the_docx_version).
    words = [
        word
        for block in document.blocks
        if block.kind is not BlockKind.CAPTION
        for word in block.text.split()
        if any(char.isalnum() for char in word)
    ]
    assert len(words) == counts["words"]

    def terms(kind: Emphasis) -> list[str]:
        return [
            b.text[s.start : s.end] for b in document.blocks for s in b.emphasis if s.kind is kind
        ]

    assert terms(Emphasis.BOLD) == counts["bold_terms"]
    assert terms(Emphasis.ITALIC) == counts["italic_terms"]
    furniture = expected["excluded_furniture"]["pdf"]["header"]
    assert [b.text for b in document.blocks].count(furniture) == 1  # the H1 only
    assert not any(re.fullmatch(r"Page \d+", block.text) for block in document.blocks)
    figures = {figure["file"]: figure for figure in expected["figures"]}
    wanted = [figures[name] for name in counts["figure_files"]]
    assert len(document.figures) == len(wanted) == counts["figures"]
    for figure, want in zip(document.figures, wanted, strict=True):
        assert (figure.width_px, figure.height_px) == (want["width_px"], want["height_px"])
        assert figure.display_width_cm == pytest.approx(want["display_width_cm"], abs=0.05)
        assert figure.display_height_cm == pytest.approx(want["display_height_cm"], abs=0.05)
        assert figure.caption == want["caption"]
        assert figure.alt_text == want["alt_text"]
        assert figure.location.section == want["section"]
    assert len(document.blocks_of(BlockKind.CAPTION)) == counts["captions"]


# -- tables -------------------------------------------------------------------------------------
# The tables are drawn cell by cell with fpdf2, so every cell's text and place is known by
# construction; the detection rules they exercise (column alignment, gaps wider than 1 em)
# are common practice for PDF layout analysis.

TEA_TABLE = [
    ("Tea", "Water", "Steep"),
    ("Green", "80 \u00b0C", "2 minutes"),
    ("Black", "95 \u00b0C", "4 minutes"),
]
NETWORK_TABLE = [
    ("Device", "Cable", "Top speed"),
    ("Laptop", "Cat 6 patch cord", "1 Gbit/s"),
    ("Printer", "Cat 5e patch cord", "100 Mbit/s"),
    ("Games console", "Cat 6 patch cord", "1 Gbit/s"),
]
JUSTIFIED = [
    "A home router joins the devices of a household into one network and passes their "
    "traffic to the internet through the modem. Most routers also run a wireless access "
    "point, a small firewall and a service that hands out addresses to every new device.",
    "Place the router high up and near the middle of the home, away from thick walls, "
    "metal shelves and microwave ovens, because all of these weaken the radio signal "
    "long before it reaches the rooms at the far end of the house.",
]


def _cell_table(
    pdf: Any,
    rows: list[tuple[str, ...]],
    widths: tuple[float, ...],
    *,
    border: bool,
    header: str = "",
    shaded: bool = False,
) -> None:
    """Draw ``rows`` with one fpdf2 cell() per cell, the first row in ``header`` style."""
    pdf.set_fill_color(220, 220, 220)
    for index, row in enumerate(rows):
        pdf.set_font("Helvetica", header if index == 0 else "", BODY)
        for text, width in zip(row, widths, strict=True):
            pdf.cell(width, 7, text, border=1 if border else 0, fill=shaded and index == 0)
        pdf.ln(7)


def _cells(document: Document) -> list[list[str]]:
    """The texts of each table's cells, tables in order of their group."""
    tables: dict[int | None, list[str]] = {}
    for block in document.blocks_of(BlockKind.TABLE_CELL):
        tables.setdefault(block.group, []).append(block.text)
    return list(tables.values())


def _flat(rows: list[tuple[str, ...]]) -> list[str]:
    return [cell for row in rows for cell in row if cell]


def _read_built(pdf: Any, tmp_path: Path, name: str = "tables.pdf") -> Document:
    path = tmp_path / name
    pdf.output(str(path))
    return read_pdf(path, DEFAULT_LIMITS)


@pytest.mark.parametrize(
    ("rows", "widths", "border", "header", "shaded"),
    [
        (TEA_TABLE, (40.0, 30.0, 40.0), True, "B", False),
        (TEA_TABLE, (40.0, 30.0, 40.0), False, "", True),
        (NETWORK_TABLE, (45.0, 50.0, 35.0), True, "", True),
        (NETWORK_TABLE, (45.0, 50.0, 35.0), False, "B", False),
    ],
)
def test_table_drawn_with_cells_gives_table_cells(
    tmp_path: Path,
    rows: list[tuple[str, ...]],
    widths: tuple[float, ...],
    border: bool,
    header: str,
    shaded: bool,
) -> None:
    pdf = _new_pdf(running=False)
    _lines(pdf, ["Each kind of tea wants its own water temperature and time."])
    pdf.ln(4)
    _cell_table(pdf, rows, widths, border=border, header=header, shaded=shaded)
    pdf.ln(4)
    _lines(pdf, ["Taste the tea after the shortest time and steep longer if needed."])
    document = _read_built(pdf, tmp_path)
    # By construction: one table, its cells row by row, left to right.
    assert _cells(document) == [_flat(rows)]
    assert _kinds(document, BlockKind.PARAGRAPH) == [
        "Each kind of tea wants its own water temperature and time.",
        "Taste the tea after the shortest time and steep longer if needed.",
    ]
    if header == "B":
        header_cells = document.blocks_of(BlockKind.TABLE_CELL)[: len(rows[0])]
        assert all(
            [(s.start, s.end, s.kind) for s in b.emphasis] == [(0, len(b.text), Emphasis.BOLD)]
            for b in header_cells
        )


def test_empty_cell_is_left_out_and_the_row_still_counts(tmp_path: Path) -> None:
    rows = [*NETWORK_TABLE[:2], ("Printer", "", "100 Mbit/s"), NETWORK_TABLE[3]]
    pdf = _new_pdf(running=False)
    _cell_table(pdf, rows, (45.0, 50.0, 35.0), border=True, header="B")
    document = _read_built(pdf, tmp_path)
    # The brief's convention: one block per non-empty cell.
    assert _cells(document) == [_flat(rows)]
    assert len(_flat(rows)) == 11


@pytest.mark.parametrize("v_align", ["TOP", "MIDDLE"])
def test_cell_text_wrapped_over_two_lines_is_one_cell(tmp_path: Path, v_align: str) -> None:
    long = "Loosen the axle nuts with a fifteen millimetre spanner and lift the wheel out"
    rows = [
        ("Step", "Tool", "What to do"),
        ("Remove the rear wheel", "Spanner", long),
        ("Check", "Fingers", "Feel inside the tyre"),
    ]
    pdf = _new_pdf(running=False)
    pdf.set_font("Helvetica", "", BODY)
    # Column widths in mm: the second row's first and last cells need two lines each.
    with pdf.table(
        col_widths=(30, 30, 80), width=140, align="LEFT", line_height=LINE_MM, v_align=v_align
    ) as table:
        for cells in rows:
            row = table.row()
            for text in cells:
                row.cell(text)
    document = _read_built(pdf, tmp_path)
    assert pdf.get_string_width(long) > 80 and pdf.get_string_width(rows[1][0]) > 30
    assert _cells(document) == [_flat(rows)]


def test_two_tables_on_one_page_are_two_groups(tmp_path: Path) -> None:
    pdf = _new_pdf(running=False)
    _cell_table(pdf, TEA_TABLE, (40.0, 30.0, 40.0), border=True, header="B")
    pdf.ln(4)
    _lines(pdf, ["Wired devices get a faster and steadier connection than wireless ones."])
    pdf.ln(4)
    _cell_table(pdf, NETWORK_TABLE, (45.0, 50.0, 35.0), border=False, shaded=True)
    document = _read_built(pdf, tmp_path)
    assert _cells(document) == [_flat(TEA_TABLE), _flat(NETWORK_TABLE)]
    groups = [block.group for block in document.blocks_of(BlockKind.TABLE_CELL)]
    assert len(set(groups)) == 2 and None not in groups
    assert document.pages == 1


def test_table_split_by_a_page_break_is_one_table(tmp_path: Path) -> None:
    pdf = _new_pdf()
    _lines(pdf, ["Wired devices get a faster and steadier connection than wireless ones."])
    pdf.ln(4)
    _cell_table(pdf, NETWORK_TABLE[:3], (45.0, 50.0, 35.0), border=True, header="B")
    pdf.add_page()
    _cell_table(pdf, NETWORK_TABLE[3:], (45.0, 50.0, 35.0), border=True)
    _cell_table(pdf, [("Tablet", "none (wireless)", "300 Mbit/s")], (45.0, 50.0, 35.0), border=True)
    pdf.ln(4)
    _lines(pdf, P5)
    document = _read_built(pdf, tmp_path)
    # By construction one table, continued at the top of page 2 in the same columns; the
    # running header and footer of each page are left out around it.
    assert _cells(document) == [[*_flat(NETWORK_TABLE), "Tablet", "none (wireless)", "300 Mbit/s"]]
    assert document.pages == 2
    assert _kinds(document, BlockKind.PARAGRAPH) == [
        "Wired devices get a faster and steadier connection than wireless ones.",
        *P5,
    ]


def test_justified_paragraphs_and_lists_are_not_tables(tmp_path: Path) -> None:
    pdf = _new_pdf(running=False)
    pdf.set_font("Helvetica", "", BODY)
    for text in JUSTIFIED:
        pdf.multi_cell(120, LINE_MM, text, align="J", new_x="LMARGIN", new_y="NEXT")
        pdf.ln(4)
    # The worst case for the gap rule: every word its own text object, spread to the width
    # of a narrow column, so that word gaps grow past 1 em.
    lines = pdf.multi_cell(60, LINE_MM, JUSTIFIED[0], dry_run=True, output="LINES")
    stretch = 0.0
    for number, line in enumerate(lines):
        words = line.split()
        widths = [pdf.get_string_width(word) for word in words]
        last = number == len(lines) - 1
        gap = pdf.get_string_width(" ") if last else (60 - sum(widths)) / (len(words) - 1)
        stretch = max(stretch, gap / pdf.get_string_width(" "))
        x = pdf.l_margin
        for word, width in zip(words, widths, strict=True):
            pdf.text(x, pdf.get_y() + 4, word)
            x += width + gap
        pdf.ln(LINE_MM)
    pdf.ln(4)
    # Bullets and numbers in a cell of their own 10 mm wide (a hanging indent as word
    # processors set it, so the gap after "1." is over 1 em), and bullets typed before the text.
    items = [("\u2022", LIST1[0]), ("\u2022", LIST1[1]), ("1.", LIST2[0]), ("2.", LIST2[1])]
    for marker, text in items:
        pdf.set_x(pdf.l_margin + 4)
        pdf.cell(10, LINE_MM, marker)
        pdf.cell(0, LINE_MM, text, new_x="LMARGIN", new_y="NEXT")
    pdf.ln(4)
    _lines(pdf, ["\u2022 " + LIST1[2], "\u2022 " + NESTED])
    document = _read_built(pdf, tmp_path)
    # By construction the widest word gap is over 1 em (Helvetica's space is 0.278 em, AFM).
    assert stretch * 0.278 > 1.0, stretch
    assert 10 - pdf.get_string_width("1.") > BODY * 25.4 / 72  # the gap after "1.": over 1 em
    assert document.blocks_of(BlockKind.TABLE_CELL) == ()
    assert _kinds(document, BlockKind.PARAGRAPH) == [*JUSTIFIED, JUSTIFIED[0]]
    assert _kinds(document, BlockKind.LIST_ITEM) == [*(text for _, text in items), LIST1[2], NESTED]


def test_text_width_uses_helvetica_metrics() -> None:
    from fpdf import FPDF

    from matcheck.readers.pdf_tables import text_width

    # fpdf2 measures its core Helvetica with the same Adobe Core 14 AFM widths.
    pdf = FPDF(unit="pt")
    pdf.set_font("Helvetica", "", 11)
    for text in ["Valve", "Mountain bikes, city bikes and cars", "1 Gbit/s"]:
        assert text_width(text, 11, NO_EMPHASIS) == pytest.approx(pdf.get_string_width(text))


@pytest.mark.parametrize(
    "version", ["text-only", "diagrams", "diagrams-confounded", "text-plain", "diagrams-plain"]
)
def test_demo_table_matches_the_docx_version(version: str) -> None:
    import json

    from matcheck.readers import read

    # fixtures/demo/expected.json: one 4x3 table of 12 cells, and the body paragraphs, which
    # do not include the table; the DOCX version has the same table as a real Word table.
    counts = json.loads((FIXTURES / "expected.json").read_text(encoding="utf-8"))["versions"]
    pdf = read(FIXTURES / f"{version}.pdf")
    docx = read(FIXTURES / f"{version}.docx")
    cells = _cells(pdf)
    assert cells == _cells(docx)
    assert len(cells) == counts[version]["tables"]
    assert sum(map(len, cells)) == counts[version]["table_cells"]
    assert len(pdf.blocks_of(BlockKind.PARAGRAPH)) == counts[version]["paragraphs"]
