"""What makes the same lesson read the same in every format, rule by rule.

Text folding, SVG and HTML sizes, code in DOCX and PDF, PDF list boundaries and alt text.
Sources are named beside each check (docs/references.md); files are built here with
python-docx and fpdf2, so their content is known by construction.
"""

from __future__ import annotations

from pathlib import Path
from typing import Any

import pytest

from matcheck.limits import DEFAULT_LIMITS
from matcheck.model import BlockKind, Capability
from matcheck.readers.markdown_meta import front_matter_title, html_display_size
from matcheck.readers.svg import css_px, svg_size
from matcheck.textnorm import fold

# --- text folding (docs/references.md §21) ------------------------------------------------


@pytest.mark.parametrize(
    ("raw", "folded"),
    [
        ("we\u2019ll", "we'll"),  # RIGHT SINGLE QUOTATION MARK as apostrophe
        ("\u201cmesh\u201d", '"mesh"'),  # LEFT/RIGHT DOUBLE QUOTATION MARK
        ("3\u20134 nodes", "3-4 nodes"),  # EN DASH
        ("nodes\u2014two", "nodes-two"),  # EM DASH
        ("\ufb01rmware", "firmware"),  # LATIN SMALL LIGATURE FI, NFKC
        ("5\u00a0GHz", "5 GHz"),  # NO-BREAK SPACE, NFKC to SPACE
        ("back\u00adhaul", "backhaul"),  # SOFT HYPHEN, invisible
        ("mesh\u200bnode", "meshnode"),  # ZERO WIDTH SPACE
        ("\uff2d\uff45\uff53\uff48", "Mesh"),  # FULLWIDTH LATIN letters, NFKC
    ],
)
def test_fold_makes_typographic_variants_one_text(raw: str, folded: str) -> None:
    assert fold(raw) == folded


# --- SVG and HTML sizes (docs/references.md §21) ---------------------------------------------


@pytest.mark.parametrize(
    ("svg", "size"),
    [
        ('<svg xmlns="http://www.w3.org/2000/svg" width="480" height="200">', (480, 200)),
        ('<svg width="2in" height="1in">', (192, 96)),  # 1in = 96px
        ('<svg width="2.54cm" height="72pt">', (96, 96)),  # 2.54cm = 72pt = 96px
        ('<svg viewBox="0 0 300 150">', (300, 150)),  # no size: the viewBox
        ('<svg width="100%" height="100%" viewBox="0 0 40 20">', (40, 20)),  # relative
        ('<svg width="400" viewBox="0 0 40 20">', (400, 200)),  # aspect ratio kept
        ("<svg>", None),  # nothing stated
    ],
)
def test_svg_size_is_read_from_the_root_element(svg: str, size: tuple[int, int] | None) -> None:
    document = f'<?xml version="1.0"?>\n{svg}<rect width="1" height="1"/></svg>'
    assert svg_size(document.encode()) == size


def test_css_lengths_refuse_relative_and_absurd_values() -> None:
    assert css_px("12em") is None and css_px("-3px") is None and css_px("1e9px") is None
    assert css_px("6pc") == pytest.approx(96.0)


def test_html_img_display_size_from_style_or_attributes() -> None:
    # pandoc writes the DOCX picture's size as a style in inches.
    width, height = html_display_size({"style": "width:5in;height:2.5in"})
    assert width == pytest.approx(12.7) and height == pytest.approx(6.35)
    width, height = html_display_size({"width": "96", "height": "48"})
    assert width == pytest.approx(2.54) and height == pytest.approx(1.27)
    assert html_display_size({"width": "50%"}) == (None, None)


def test_front_matter_title_forms() -> None:
    assert front_matter_title("title: Mesh basics\nauthor: x") == "Mesh basics"
    assert front_matter_title("title: 'Mesh: basics'") == "Mesh: basics"
    assert front_matter_title("title: |\n  long") == ""
    assert front_matter_title("subtitle: no") == ""


# --- SVG figures in Markdown ------------------------------------------------------------------


def test_markdown_svg_figure_is_readable_and_sized(tmp_path: Path) -> None:
    from matcheck.readers.markdown import read_markdown

    (tmp_path / "links.svg").write_text(
        '<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 480 200"></svg>', encoding="utf-8"
    )
    path = tmp_path / "lesson.md"
    path.write_text("Nodes.\n\n![Three nodes](links.svg)\n", encoding="utf-8")
    (figure,) = read_markdown(path, DEFAULT_LIMITS).figures
    assert figure.readable and (figure.width_px, figure.height_px) == (480, 200)


# --- code and outline in DOCX (ECMA-376; python-docx) ------------------------------------------


def _docx(tmp_path: Path) -> Any:
    import docx
    from docx.shared import Pt

    document = docx.Document()
    document.add_heading("Mesh basics", 0)  # Title
    document.add_heading("Planning", 1)
    paragraph = document.add_paragraph("Type ")
    inline = paragraph.add_run("ping 10.0.0.1")
    inline.font.name = "Courier New"
    paragraph.add_run(" to check the node.")
    for line in ("mesh status --nodes", "mesh status --backhaul"):
        run = document.add_paragraph().add_run(line)
        run.font.name = "Consolas"
        run.font.size = Pt(10)
        run.bold = line.endswith("nodes")  # highlighting inside code
    document.add_paragraph("Then walk through the house.")
    from docx.enum.style import WD_STYLE_TYPE

    document.styles.add_style("HTML Preformatted", WD_STYLE_TYPE.PARAGRAPH)
    styled = document.add_paragraph(style="HTML Preformatted")
    styled.add_run("first line")
    styled.add_run().add_break()
    styled.add_run("second line")
    path = tmp_path / "code.docx"
    document.save(str(path))
    return path


def test_docx_code_paragraphs_are_code_lines(tmp_path: Path) -> None:
    from matcheck.api import profile_document
    from matcheck.readers import read
    from matcheck.settings import Settings

    document = read(_docx(tmp_path))
    code = document.blocks_of(BlockKind.CODE)
    # All-monospace paragraphs (one block), and Word's "HTML Preformatted" style split at its
    # line break (w:br, ECMA-376 17.3.3.1) into lines.
    assert [line.text for line in code] == [
        "mesh status --nodes",
        "mesh status --backhaul",
        "first line",
        "second line",
    ]
    assert len({line.group for line in code}) == 2
    # A paragraph with inline code is prose; the Title is rank 1 above Heading 1.
    paragraphs = document.blocks_of(BlockKind.PARAGRAPH)
    assert paragraphs[0].text == "Type ping 10.0.0.1 to check the node."
    assert [h.level for h in document.blocks_of(BlockKind.HEADING)] == [1, 2]
    profile = profile_document(document, Settings())
    assert profile.value("code_blocks") == 2 and profile.value("code_lines") == 4
    # Code is not prose: not words, not emphasis (the bold keyword line).
    assert profile.value("bold_words") == 0
    assert profile.value("words") == sum(
        len(block.text.split()) for block in document.blocks if block.kind is not BlockKind.CODE
    )


# --- PDF: code, list boundaries, alt text (fpdf2) ---------------------------------------------


def _pdf() -> Any:
    from fpdf import FPDF

    pdf = FPDF(unit="mm", format="A4")
    pdf.core_fonts_encoding = "windows-1252"
    pdf.set_auto_page_break(False)
    pdf.add_page()
    return pdf


def _line(pdf: Any, text: str, font: str = "Helvetica", size: float = 11) -> None:
    pdf.set_font(font, "", size)
    pdf.cell(0, 6, text, new_x="LMARGIN", new_y="NEXT")


def _read_pdf(pdf: Any, tmp_path: Path) -> Any:
    from matcheck.readers import read

    path = tmp_path / "lesson.pdf"
    pdf.output(str(path))
    return read(path)


def test_pdf_monospace_lines_are_code_not_prose_or_table(tmp_path: Path) -> None:
    pdf = _pdf()
    _line(pdf, "Ask the main node for its list of nodes:")
    for text in ("mesh status   --nodes", "mesh status   --backhaul", "ssh   admin@10.0.0.1"):
        _line(pdf, text, "Courier", 10)  # Courier: a standard 14 monospace font
    _line(pdf, "Each line names a node and its signal strength.")
    document = _read_pdf(pdf, tmp_path)
    code = document.blocks_of(BlockKind.CODE)
    assert [line.text for line in code] == [
        "mesh status --nodes",
        "mesh status --backhaul",
        "ssh admin@10.0.0.1",
    ]
    assert not document.blocks_of(BlockKind.TABLE_CELL)
    assert [b.text for b in document.blocks_of(BlockKind.PARAGRAPH)] == [
        "Ask the main node for its list of nodes:",
        "Each line names a node and its signal strength.",
    ]


@pytest.mark.parametrize(
    ("markers", "lists"),
    [
        (["\u2022", "\u2022", "1.", "2."], 2),  # a bulleted list, then a numbered one
        (["1.", "2.", "1.", "2."], 2),  # numbering restarts: a new list
        (["1.", "2.", "3.", "4."], 1),  # one numbered list
        (["a)", "b)", "\u2022", "\u2022"], 2),  # letters, then bullets
    ],
)
def test_pdf_list_kind_change_or_restart_separates_lists(
    tmp_path: Path, markers: list[str], lists: int
) -> None:
    pdf = _pdf()
    _line(pdf, "What you need:")
    for number, marker in enumerate(markers):
        _line(pdf, f"{marker} item number {number + 1}")
    _line(pdf, "Then start.")
    items = _read_pdf(pdf, tmp_path).blocks_of(BlockKind.LIST_ITEM)
    assert len(items) == len(markers)
    assert len({item.group for item in items}) == lists


def test_untagged_pdf_alt_text_is_not_shown_rather_than_missing(tmp_path: Path) -> None:
    from PIL import Image

    from matcheck.api import profile_document
    from matcheck.settings import Settings

    picture = tmp_path / "node.png"
    Image.new("RGB", (40, 20), "white").save(picture)
    pdf = _pdf()
    _line(pdf, "The node sits on the landing, a metre above the floor.")
    pdf.image(str(picture), w=40, h=20)
    document = _read_pdf(pdf, tmp_path)
    # fpdf2 writes no structure tree without alt text: an untagged PDF (ISO 32000-1 14.8).
    assert Capability.ALT_TEXT in document.cannot_show
    measurement = profile_document(document, Settings()).get("figures_without_alt_text")
    assert measurement is not None and measurement.value is None
    assert "cannot show" in measurement.note


# --- structure findings name the headings -----------------------------------------------------


def test_outline_findings_name_the_heading_and_where(tmp_path: Path) -> None:
    from matcheck.api import Version, compare_versions
    from matcheck.findings import EvidenceKind, Status

    a, b = tmp_path / "a.md", tmp_path / "b.md"
    body = "# Mesh\n\n## Planning\n\nWalk the house.\n\n{} Placing\n\nPut nodes high.\n"
    a.write_text(body.format("##"), encoding="utf-8")
    b.write_text(body.format("###"), encoding="utf-8")
    report = compare_versions(
        [
            Version("a", (a,)),
            Version("b", (b,)),
        ]
    )
    finding = next(f for f in report.findings if f.dimension == "headings_level_3")
    assert finding.status is Status.DIFFERS
    (evidence,) = finding.evidence
    assert evidence.kind is EvidenceKind.HEADING_LEVEL_CHANGED
    assert evidence.counterpart_text == "Placing"
    assert evidence.location is not None and evidence.location.line == 7


def test_a_changed_code_line_is_a_located_content_difference(tmp_path: Path) -> None:
    from matcheck.api import Version, compare_versions
    from matcheck.findings import EvidenceKind, Status

    lesson = (
        "# Mesh\n\nAsk the main node for its nodes and check each signal.\n\n"
        "```\nssh admin@192.168.68.1\nmesh status --nodes\nmesh status --backhaul\n```\n\n"
        "Each line names a node.\n"
    )
    a, b = tmp_path / "a.md", tmp_path / "b.md"
    a.write_text(lesson, encoding="utf-8")
    b.write_text(lesson.replace("status --nodes", "reboot --all"), encoding="utf-8")
    report = compare_versions([Version("a", (a,)), Version("b", (b,))])
    finding = next(f for f in report.findings if f.dimension == "code_lines_changed")
    assert finding.status is Status.DIFFERS and finding.difference == 2
    kinds = {(e.kind, e.text, e.location.line if e.location else None) for e in finding.evidence}
    assert kinds == {
        (EvidenceKind.CODE_LINE_REMOVED, "mesh status --nodes", 7),
        (EvidenceKind.CODE_LINE_ADDED, "mesh reboot --all", 7),
    }
    # The same lesson twice: no finding on code at all beyond matched.
    same = compare_versions([Version("a", (a,)), Version("a2", (a,))])
    assert all(f.status is Status.MATCHED for f in same.findings if "code" in f.dimension)


def test_pdf_inline_code_at_a_line_start_does_not_start_a_paragraph(tmp_path: Path) -> None:
    pdf = _pdf()
    _line(pdf, "Most kits can print their status from a command line; the main node answers")
    # The second line starts with inline code set smaller, in Courier, then body text.
    pdf.set_font("Courier", "", 9)
    pdf.cell(pdf.get_string_width("ping 10.0.0.1"), 6, "ping 10.0.0.1")
    pdf.set_font("Helvetica", "", 11)
    pdf.cell(0, 6, " on its own address when the app shows it under Advanced.", new_x="LMARGIN")
    pdf.ln(6)
    document = _read_pdf(pdf, tmp_path)
    assert [b.text for b in document.blocks_of(BlockKind.PARAGRAPH)] == [
        "Most kits can print their status from a command line; the main node answers "
        "ping 10.0.0.1 on its own address when the app shows it under Advanced."
    ]
    assert not document.blocks_of(BlockKind.CODE)


def test_a_pdf_set_in_a_monospace_face_is_prose_not_code(tmp_path: Path) -> None:
    pdf = _pdf()
    for text in (
        "A typewriter look sets the whole lesson in one monospace face.",
        "Every line of it is then prose, as the reader sees it.",
    ):
        _line(pdf, text, "Courier", 11)
    pdf.ln(8)
    _line(pdf, "Only this line is in another face.", "Courier", 11)
    document = _read_pdf(pdf, tmp_path)
    assert not document.blocks_of(BlockKind.CODE)
    assert len(document.blocks_of(BlockKind.PARAGRAPH)) == 2


def test_a_docx_whose_body_font_is_monospace_marks_code_by_style_only(tmp_path: Path) -> None:
    import docx
    from docx.enum.style import WD_STYLE_TYPE

    from matcheck.readers import read

    document = docx.Document()
    document.styles["Normal"].font.name = "Courier New"
    document.add_paragraph("A typewriter look sets the whole lesson in one monospace face.")
    document.styles.add_style("Source Code", WD_STYLE_TYPE.PARAGRAPH)
    document.add_paragraph("mesh status --nodes", style="Source Code")
    path = tmp_path / "typewriter.docx"
    document.save(str(path))
    read_back = read(path)
    assert [b.text for b in read_back.blocks_of(BlockKind.CODE)] == ["mesh status --nodes"]
    assert len(read_back.blocks_of(BlockKind.PARAGRAPH)) == 1
