"""The DOCX reader, against small documents built here with python-docx (plus raw XML where
python-docx has no API). Every expected count is known by construction; element semantics
are those of ECMA-376 Part 1 (WordprocessingML), cited beside the checks that rely on them
(docs/references.md §14).
"""

from __future__ import annotations

import io
import json
import re
import zipfile
from collections import Counter
from pathlib import Path
from typing import Any

import docx
import pytest
from docx.enum.style import WD_STYLE_TYPE
from docx.enum.text import WD_COLOR_INDEX
from docx.opc.constants import CONTENT_TYPE as CT
from docx.opc.constants import RELATIONSHIP_TYPE as RT
from docx.opc.packuri import PackURI
from docx.opc.part import Part
from docx.oxml import parse_xml
from docx.oxml.ns import nsdecls, qn
from docx.shared import Cm
from PIL import Image

from matcheck.errors import CorruptFile, EncryptedFile, LimitExceeded, UnsupportedFormat
from matcheck.limits import ReadLimits
from matcheck.model import BlockKind, Document, Emphasis
from matcheck.readers.docx import _parser_resolves_entities, read_docx

FIXTURES = Path(__file__).resolve().parent.parent / "fixtures" / "demo"
W_NS = nsdecls("w")
MC = "http://schemas.openxmlformats.org/markup-compatibility/2006"
WPS = "http://schemas.microsoft.com/office/word/2010/wordprocessingShape"
VML = "urn:schemas-microsoft-com:vml"
OFFICE = "urn:schemas-microsoft-com:office:office"


# -- helpers ------------------------------------------------------------------------------------


def _read(path: Path, limits: ReadLimits | None = None) -> Document:
    return read_docx(path, limits or ReadLimits())


def _save(document: Any, tmp_path: Path, name: str = "lesson.docx") -> Path:
    path = tmp_path / name
    document.save(str(path))
    return path


def _png(width: int, height: int) -> io.BytesIO:
    stream = io.BytesIO()
    Image.new("RGB", (width, height), (200, 120, 40)).save(stream, "PNG")
    stream.seek(0)
    return stream


def _add_xml(paragraph: Any, xml: str) -> None:
    """Append raw inline XML (runs, hyperlinks, revisions) to a python-docx paragraph."""
    paragraph._p.append(parse_xml(xml))


def _rewrite(path: Path, replace: dict[str, bytes]) -> None:
    """Replace members of a saved package (the bytes python-docx would refuse to write)."""
    with zipfile.ZipFile(path) as archive:
        members = [(info.filename, archive.read(info)) for info in archive.infolist()]
    with zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as archive:
        for name, data in members:
            archive.writestr(name, replace.get(name, data))


def _kinds(document: Document, kind: BlockKind) -> list[str]:
    return [block.text for block in document.blocks_of(kind)]


def _emphasised(document: Document, kind: Emphasis) -> list[str]:
    return [
        block.text[span.start : span.end]
        for block in document.blocks
        for span in block.emphasis
        if span.kind is kind
    ]


def _num_pr(num_id: int, ilvl: int) -> str:
    return (
        f'<w:pPr {W_NS}><w:numPr><w:ilvl w:val="{ilvl}"/>'
        f'<w:numId w:val="{num_id}"/></w:numPr></w:pPr>'
    )


def _numbered(document: Any, text: str, num_id: int, ilvl: int) -> None:
    paragraph = document.add_paragraph(text)
    paragraph._p.insert(0, parse_xml(_num_pr(num_id, ilvl)))


# -- headings and paragraphs --------------------------------------------------------------------


def test_headings_by_style_name_inheritance_and_outline_level(tmp_path: Path) -> None:
    document = docx.Document()
    document.add_heading("Brewing coffee at home", 0)  # style "Title"
    document.add_heading("Beans", 1)
    document.add_paragraph("Fresh beans keep their aroma for a few weeks.")
    document.add_heading("Roast", 2)
    document.add_heading("Grind", 2)
    document.add_heading("Burr grinders", 3)
    step = document.styles.add_style("Step Heading", WD_STYLE_TYPE.PARAGRAPH)
    step.base_style = document.styles["Heading 2"]
    document.add_paragraph("Weigh the coffee", style="Step Heading")
    chapter = document.styles.add_style("Chapter", WD_STYLE_TYPE.PARAGRAPH)
    chapter.element.get_or_add_pPr().append(parse_xml(f'<w:outlineLvl {W_NS} w:val="0"/>'))
    document.add_paragraph("Water", style="Chapter")
    direct = document.add_paragraph("Water hardness")
    direct._p.get_or_add_pPr().append(parse_xml(f'<w:outlineLvl {W_NS} w:val="2"/>'))
    demoted = document.add_paragraph("Heading style, body outline", style="Heading 1")
    demoted._p.get_or_add_pPr().append(parse_xml(f'<w:outlineLvl {W_NS} w:val="9"/>'))
    document.add_paragraph("Soft water extracts more evenly.")
    document.add_paragraph("")  # empty: dropped
    document.add_paragraph("Rinse the filter first.")

    read = _read(_save(document, tmp_path))

    levels = Counter(block.level for block in read.blocks_of(BlockKind.HEADING))
    # Title sits above Heading 1; "Heading N" -> N; a style based on Heading 2 -> 2; outline
    # level v -> v + 1 (ECMA-376 17.3.1.20), where 9 is body text even on a heading style.
    # Levels are then ranks of the outline: Title 1, Heading 1 (and outline 0) 2, ...
    assert levels == {1: 1, 2: 2, 3: 3, 4: 2}
    assert read.blocks_of(BlockKind.HEADING)[0].text == "Brewing coffee at home"
    assert _kinds(read, BlockKind.PARAGRAPH) == [
        "Fresh beans keep their aroma for a few weeks.",
        "Heading style, body outline",
        "Soft water extracts more evenly.",
        "Rinse the filter first.",
    ]
    assert [b.location.paragraph for b in read.blocks_of(BlockKind.PARAGRAPH)] == [1, 2, 3, 4]
    assert read.format == "docx"


# -- lists --------------------------------------------------------------------------------------


def test_lists_levels_and_groups(tmp_path: Path) -> None:
    document = docx.Document()
    # List 1: direct numbering, nested (w:ilvl is 0-based, ECMA-376 17.9.3).
    _numbered(document, "Unplug the router", 1, 0)
    _numbered(document, "Wait ten seconds", 1, 1)
    _numbered(document, "Count them aloud", 1, 1)
    _numbered(document, "Plug it back in", 1, 0)
    document.add_paragraph("Then check the lights.")
    # List 2: numbering through the built-in list styles; "List Bullet 2" is a nested level.
    document.add_paragraph("Green means online", style="List Bullet")
    document.add_paragraph("Steady, not blinking", style="List Bullet 2")
    document.add_paragraph("Amber means no signal", style="List Bullet")
    document.add_paragraph("If it stays amber:")
    # Lists 3 and 4: same level, different numbering ids, so two lists.
    document.add_paragraph("Call the provider", style="List Number")
    document.add_paragraph("Give the account number", style="List Number")
    _numbered(document, "Ask for a line test", 3, 0)
    document.add_paragraph("Notes for later:")
    # List 5: a list style without numbering; a blank line inside does not split it.
    document.add_paragraph("Router model", style="List Paragraph")
    document.add_paragraph("")
    document.add_paragraph("Firmware version", style="List Paragraph")

    read = _read(_save(document, tmp_path))
    items = read.blocks_of(BlockKind.LIST_ITEM)

    assert [item.text for item in items][:4] == [
        "Unplug the router",
        "Wait ten seconds",
        "Count them aloud",
        "Plug it back in",
    ]
    assert [item.level for item in items] == [1, 2, 2, 1, 1, 2, 1, 1, 1, 1, 1, 1]
    groups = [item.group for item in items]
    assert len(set(groups)) == 5
    assert [len(list(run)) for run in _runs_of(groups)] == [4, 3, 2, 1, 2]
    assert len(read.blocks_of(BlockKind.PARAGRAPH)) == 3


def _runs_of(groups: list[int | None]) -> list[list[int | None]]:
    runs: list[list[int | None]] = []
    for group in groups:
        if runs and runs[-1][-1] == group:
            runs[-1].append(group)
        else:
            runs.append([group])
    return runs


# -- emphasis -----------------------------------------------------------------------------------


def test_direct_emphasis_spans(tmp_path: Path) -> None:
    document = docx.Document()
    paragraph = document.add_paragraph("Tighten the ")
    paragraph.add_run("axle nut").bold = True
    paragraph.add_run(" before you check the ")
    paragraph.add_run("brake pads").italic = True
    paragraph.add_run(", the ")
    paragraph.add_run("chain").underline = True
    paragraph.add_run(" and the ")
    paragraph.add_run("tyre pressure").font.highlight_color = WD_COLOR_INDEX.YELLOW
    paragraph.add_run(" at the ")
    # Run shading with a fill colour (ECMA-376 17.3.2.32) reads as a highlight too.
    _add_xml(
        paragraph,
        f'<w:r {W_NS}><w:rPr><w:shd w:val="clear" w:color="auto" w:fill="FFFF00"/></w:rPr>'
        "<w:t>valve</w:t></w:r>",
    )
    paragraph.add_run(".")

    read = _read(_save(document, tmp_path))

    assert read.blocks[0].text == (
        "Tighten the axle nut before you check the brake pads, the chain and the tyre "
        "pressure at the valve."
    )
    assert _emphasised(read, Emphasis.BOLD) == ["axle nut"]
    assert _emphasised(read, Emphasis.ITALIC) == ["brake pads"]
    assert _emphasised(read, Emphasis.UNDERLINE) == ["chain"]
    assert _emphasised(read, Emphasis.HIGHLIGHT) == ["tyre pressure", "valve"]


def test_emphasis_from_styles_and_switched_off(tmp_path: Path) -> None:
    document = docx.Document()
    warning = document.styles.add_style("Warning", WD_STYLE_TYPE.PARAGRAPH)
    warning.font.bold = True
    paragraph = document.add_paragraph(style="Warning")
    paragraph.add_run("Never ride ")
    paragraph.add_run("without").bold = False  # <w:b w:val="0"/> (ECMA-376 17.17.4)
    paragraph.add_run(" brakes")

    key_term = document.styles.add_style("Key Term", WD_STYLE_TYPE.CHARACTER)
    key_term.base_style = document.styles["Strong"]
    key_term.font.italic = True
    paragraph = document.add_paragraph("Use a ")
    paragraph.add_run("torque wrench").style = "Strong"  # built-in: bold
    paragraph.add_run(" on the ")
    paragraph.add_run("stem").style = "Emphasis"  # built-in: italic
    paragraph.add_run(" and the ")
    paragraph.add_run("seat post").style = "Key Term"  # italic + bold from Strong
    paragraph.add_run(" but not the ")
    paragraph.add_run("bell").underline = False  # <w:u w:val="none"/>
    _add_xml(
        paragraph,
        f'<w:r {W_NS}><w:rPr><w:highlight w:val="none"/><w:i w:val="false"/></w:rPr>'
        "<w:t> or lights</w:t></w:r>",
    )

    read = _read(_save(document, tmp_path))

    assert _emphasised(read, Emphasis.BOLD) == [
        "Never ride",
        "brakes",
        "torque wrench",
        "seat post",
    ]
    assert _emphasised(read, Emphasis.ITALIC) == ["stem", "seat post"]
    assert _emphasised(read, Emphasis.UNDERLINE) == []
    assert _emphasised(read, Emphasis.HIGHLIGHT) == []


# -- inline content: links, fields, revisions, text boxes ---------------------------------------


def test_links_fields_revisions_and_hidden_text(tmp_path: Path) -> None:
    document = docx.Document()
    paragraph = document.add_paragraph("Read ")
    rid = document.part.relate_to("https://example.org/manual", RT.HYPERLINK, is_external=True)
    _add_xml(
        paragraph,
        f'<w:hyperlink {nsdecls("w", "r")} r:id="{rid}"><w:r><w:t>the manual</w:t></w:r>'
        "</w:hyperlink>",
    )
    _add_xml(paragraph, f"<w:r {W_NS}><w:tab/><w:t>on page</w:t><w:br/></w:r>")
    # A complex field: instructions are not shown, the result after "separate" is
    # (ECMA-376 17.16.18); a simple field shows its child runs.
    for xml in (
        '<w:fldChar w:fldCharType="begin"/>',
        '<w:instrText xml:space="preserve"> PAGEREF manual \\h </w:instrText>',
        '<w:fldChar w:fldCharType="separate"/>',
        "<w:t>7</w:t>",
        '<w:fldChar w:fldCharType="end"/>',
    ):
        _add_xml(paragraph, f"<w:r {W_NS}>{xml}</w:r>")
    _add_xml(
        paragraph,
        f'<w:fldSimple {W_NS} w:instr=" NUMPAGES "><w:r><w:t xml:space="preserve"> of 9</w:t>'
        "</w:r></w:fldSimple>",
    )
    # Tracked changes read as accepted: deleted runs go (here with w:t, so the check depends
    # on skipping w:del, not on Word's w:delText), inserted runs stay (ECMA-376 17.13.5).
    _add_xml(
        paragraph,
        f'<w:del {W_NS} w:id="1" w:author="x"><w:r><w:t> old wording</w:t></w:r></w:del>',
    )
    _add_xml(
        paragraph,
        f'<w:ins {W_NS} w:id="2" w:author="x"><w:r><w:t xml:space="preserve"> today</w:t>'
        "</w:r></w:ins>",
    )
    paragraph.add_run(" secret").font.hidden = True  # w:vanish: not shown to learners

    read = _read(_save(document, tmp_path))

    assert [block.text for block in read.blocks] == ["Read the manual on page 7 of 9 today"]


def test_text_box_read_once_after_its_anchor(tmp_path: Path) -> None:
    document = docx.Document()
    anchor = document.add_paragraph("Turn the compost heap weekly.")
    box = "<w:txbxContent><w:p><w:r><w:t>Keep the heap moist.</w:t></w:r></w:p></w:txbxContent>"
    # Word writes a DrawingML text box with a VML fallback of the same text.
    _add_xml(
        anchor,
        f'<w:r {nsdecls("w", "wp", "a")} xmlns:mc="{MC}" xmlns:wps="{WPS}" xmlns:v="{VML}">'
        '<mc:AlternateContent><mc:Choice Requires="wps"><w:drawing><wp:anchor>'
        '<wp:extent cx="914400" cy="457200"/><wp:docPr id="9" name="Text Box 1"/>'
        f'<a:graphic><a:graphicData uri="{WPS}"><wps:wsp><wps:txbx>{box}</wps:txbx>'
        "</wps:wsp></a:graphicData></a:graphic></wp:anchor></w:drawing></mc:Choice>"
        f"<mc:Fallback><w:pict><v:shape><v:textbox>{box}</v:textbox></v:shape></w:pict>"
        "</mc:Fallback></mc:AlternateContent></w:r>",
    )
    document.add_paragraph("Add brown leaves.")

    read = _read(_save(document, tmp_path))

    assert [block.text for block in read.blocks] == [
        "Turn the compost heap weekly.",
        "Keep the heap moist.",
        "Add brown leaves.",
    ]
    assert read.figures == ()  # a text box is not a picture


# -- tables -------------------------------------------------------------------------------------


def test_tables_merged_and_nested_cells(tmp_path: Path) -> None:
    document = docx.Document()
    tools = document.add_table(rows=3, cols=3)
    for column, text in enumerate(("Tool", "Use", "Size")):
        tools.cell(0, column).text = text
    tools.cell(1, 0).merge(tools.cell(2, 0)).text = "Spoke key"  # w:vMerge
    tools.cell(1, 1).merge(tools.cell(1, 2)).text = "Truing wheels"  # w:gridSpan
    tools.cell(2, 1).text = "Small"  # (2, 2) stays empty
    document.add_paragraph("Between the tables.")
    outer = document.add_table(rows=1, cols=2)
    outer.cell(0, 0).text = "Outer left"
    right = outer.cell(0, 1)
    right.paragraphs[0].text = "Outer right"
    inner = right.add_table(rows=1, cols=2)
    inner.cell(0, 0).text = "Inner A"
    inner.cell(0, 1).text = "Inner B"

    read = _read(_save(document, tmp_path))
    cells = read.blocks_of(BlockKind.TABLE_CELL)

    # Merged cells once each, empty cells dropped, row-major order, nested tables after the
    # cell that holds them.
    assert [cell.text for cell in cells] == [
        "Tool",
        "Use",
        "Size",
        "Spoke key",
        "Truing wheels",
        "Small",
        "Outer left",
        "Outer right",
        "Inner A",
        "Inner B",
    ]
    groups = [cell.group for cell in cells]
    assert len(set(groups)) == 3
    assert Counter(groups).most_common(1)[0][1] == 6
    assert groups[6] == groups[7] != groups[8] == groups[9]
    assert _kinds(read, BlockKind.PARAGRAPH) == ["Between the tables."]


# -- figures and captions -----------------------------------------------------------------------


def test_figures_sizes_alt_text_and_captions(tmp_path: Path) -> None:
    document = docx.Document()
    document.add_paragraph("The router sits on a shelf.")
    inline = document.add_picture(_png(40, 30), width=Cm(4), height=Cm(3))._inline
    inline.docPr.set("title", "Router front")  # no description: the title is the alt text
    document.add_paragraph("Figure 1: The router front panel.", style="Caption")

    floating = document.add_picture(_png(64, 48), width=Cm(6.5))._inline
    floating.tag = qn("wp:anchor")  # a floating picture (ECMA-376 20.4.2.3)
    floating.docPr.set("descr", "Cables behind the router")
    document.add_paragraph("Figure 2. Cables at the back.")
    document.add_paragraph("Figure 3 is described in the next part.")  # not after a picture

    vml_rid, _ = document.part.get_or_add_image(_png(20, 10))
    adapter = document.add_paragraph()
    _add_xml(
        adapter,
        f'<w:r {nsdecls("w", "r")} xmlns:v="{VML}" xmlns:o="{OFFICE}"><w:pict>'
        '<v:shape style="width:72pt;height:36pt" alt="Power adapter">'
        f'<v:imagedata r:id="{vml_rid}" o:title=""/></v:shape></w:pict></w:r>',
    )
    document.add_paragraph("The adapter plugs in at the wall.")

    linked = document.add_picture(_png(12, 12), width=Cm(2))._inline
    blip = next(linked.iter(qn("a:blip")))
    blip.attrib.pop(qn("r:embed"))
    url = "https://example.org/socket.png"
    blip.set(qn("r:link"), document.part.relate_to(url, RT.IMAGE, is_external=True))
    document.add_paragraph("A linked picture of the socket.")

    broken = document.add_picture(_png(11, 11), width=Cm(1))._inline
    broken_rid = next(broken.iter(qn("a:blip"))).get(qn("r:embed"))
    broken_name = str(document.part.related_parts[broken_rid].partname)
    path = _save(document, tmp_path)
    _rewrite(path, {broken_name.lstrip("/"): b"not an image at all"})

    read = _read(path)
    figures = read.figures

    assert len(figures) == 5
    assert [(f.width_px, f.height_px) for f in figures] == [
        (40, 30),
        (64, 48),
        (20, 10),
        (None, None),
        (None, None),
    ]
    # wp:extent is in EMU, 360000 per centimetre (ECMA-376 20.1.2.1); VML lengths in points,
    # 72 per inch (CSS 2.1 4.3.2).
    assert figures[0].display_width_cm == pytest.approx(4.0)
    assert figures[0].display_height_cm == pytest.approx(3.0)
    assert figures[1].display_width_cm == pytest.approx(6.5)
    assert figures[1].display_height_cm == pytest.approx(6.5 * 48 / 64)
    assert figures[2].display_width_cm == pytest.approx(2.54)
    assert figures[2].display_height_cm == pytest.approx(1.27)
    assert [f.alt_text for f in figures[:3]] == [
        "Router front",
        "Cables behind the router",
        "Power adapter",
    ]
    assert [f.caption for f in figures] == [
        "Figure 1: The router front panel.",
        "Figure 2. Cables at the back.",
        "",
        "",
        "",
    ]
    assert _kinds(read, BlockKind.CAPTION) == [
        "Figure 1: The router front panel.",
        "Figure 2. Cables at the back.",
    ]
    assert "Figure 3 is described in the next part." in _kinds(read, BlockKind.PARAGRAPH)
    assert figures[0].source.startswith("/word/media/")
    assert (figures[3].remote, figures[3].source) == (True, url)
    assert (figures[4].readable, figures[4].source) == (False, broken_name)
    assert [f.readable for f in figures[:4]] == [True, True, True, True]
    assert any(broken_name in warning for warning in read.warnings)
    # A figure stands after the block before it: figure 1 follows the first paragraph.
    assert read.blocks[figures[0].location.block].text == "The router sits on a shelf."


# -- excluded parts and notes -------------------------------------------------------------------


def test_headers_footers_and_comments_are_excluded(tmp_path: Path) -> None:
    document = docx.Document()
    section = document.sections[0]
    section.header.paragraphs[0].text = "Workshop handout"
    section.footer.paragraphs[0].text = "Printed for the repair cafe"
    paragraph = document.add_paragraph("Patch the inner tube.")
    document.add_comment(paragraph.runs, text="Say which patch kit", author="Editor")
    other = document.add_paragraph("Pump to the pressure on the tyre wall.")
    document.add_comment(other.runs, text="Add the unit", author="Editor")

    read = _read(_save(document, tmp_path))
    text = " ".join(block.text for block in read.blocks)

    assert read.excluded == ("page headers and footers", "2 comments")
    for hidden in ("Workshop", "repair cafe", "patch kit", "unit"):
        assert hidden not in text
    assert len(read.blocks) == 2


def test_nothing_excluded_without_headers_or_comments(tmp_path: Path) -> None:
    document = docx.Document()
    document.add_paragraph("Descale the kettle monthly.")
    assert _read(_save(document, tmp_path)).excluded == ()


def _notes_part(document: Any, kind: str, notes: list[tuple[str | None, str, str]]) -> None:
    """Add a footnotes or endnotes part (python-docx has no API for notes)."""
    body = ""
    for note_type, note_id, text in notes:
        typed = f' w:type="{note_type}"' if note_type else ""
        body += (
            f'<w:{kind} w:id="{note_id}"{typed}><w:p><w:r><w:{kind}Ref/></w:r>'
            f'<w:r><w:t xml:space="preserve">{text}</w:t></w:r></w:p></w:{kind}>'
        )
    blob = f'<?xml version="1.0"?><w:{kind}s {W_NS}>{body}</w:{kind}s>'.encode()
    content_type = CT.WML_FOOTNOTES if kind == "footnote" else CT.WML_ENDNOTES
    reltype = RT.FOOTNOTES if kind == "footnote" else RT.ENDNOTES
    part = Part(PackURI(f"/word/{kind}s.xml"), content_type, blob, document.part.package)
    document.part.relate_to(part, reltype)


def test_footnotes_and_endnotes_follow_the_body(tmp_path: Path) -> None:
    document = docx.Document()
    paragraph = document.add_paragraph("Grind just before brewing.")
    _add_xml(paragraph, f'<w:r {W_NS}><w:footnoteReference w:id="1"/></w:r>')
    document.add_paragraph("Use water just off the boil.")
    _notes_part(
        document,
        "footnote",
        [
            ("separator", "-1", ""),
            ("continuationSeparator", "0", ""),
            ("continuationNotice", "5", "continued on the next page"),
            (None, "1", "Ground coffee goes stale within minutes."),
            (None, "2", "About 94 degrees Celsius."),
        ],
    )
    _notes_part(document, "endnote", [(None, "1", "Tasting notes are in the appendix.")])

    read = _read(_save(document, tmp_path))

    assert [(block.kind, block.text) for block in read.blocks] == [
        (BlockKind.PARAGRAPH, "Grind just before brewing."),
        (BlockKind.PARAGRAPH, "Use water just off the boil."),
        (BlockKind.FOOTNOTE, "Ground coffee goes stale within minutes."),
        (BlockKind.FOOTNOTE, "About 94 degrees Celsius."),
        (BlockKind.FOOTNOTE, "Tasting notes are in the appendix."),
    ]


# -- the demo lesson, against the counts its build script recorded ----------------------------

# fixtures/demo/expected.json "rules": a word is a run of non-space characters with a letter
# or digit; words count over headings, paragraphs, list items and table cells.
_WORD = re.compile(r"\S+")
_COUNTED = (BlockKind.HEADING, BlockKind.PARAGRAPH, BlockKind.LIST_ITEM, BlockKind.TABLE_CELL)


def _words(text: str) -> list[re.Match[str]]:
    return [m for m in _WORD.finditer(text) if any(char.isalnum() for char in m.group())]


def _emphasised_words(document: Document, kind: Emphasis) -> list[str]:
    # expected.json: a word is emphasised when all its characters are inside the emphasis.
    return [
        word.group()
        for block in document.blocks_of(*_COUNTED[1:])
        for word in _words(block.text)
        if any(
            s.kind is kind and s.start <= word.start() and word.end() <= s.end
            for s in block.emphasis
        )
    ]


@pytest.mark.parametrize("version", ["text-only", "diagrams", "diagrams-confounded"])
def test_demo_lesson_matches_its_construction(version: str) -> None:
    expected = json.loads((FIXTURES / "expected.json").read_text(encoding="utf-8"))
    counts = expected["versions"][version]
    read = _read(FIXTURES / counts["files"]["docx"])

    headings = read.blocks_of(BlockKind.HEADING)
    assert [[block.level, block.text] for block in headings] == counts["heading_list"]
    assert len(read.blocks_of(BlockKind.PARAGRAPH)) == counts["paragraphs"]
    items = read.blocks_of(BlockKind.LIST_ITEM)
    assert (len(items), len({item.group for item in items})) == (
        counts["list_items"],
        counts["lists"],
    )
    cells = read.blocks_of(BlockKind.TABLE_CELL)
    assert (len(cells), len({cell.group for cell in cells})) == (
        counts["table_cells"],
        counts["tables"],
    )
    assert sum(len(_words(block.text)) for block in read.blocks_of(*_COUNTED)) == counts["words"]
    assert len(read.blocks_of(BlockKind.CAPTION)) == counts["captions"]
    assert _emphasised_words(read, Emphasis.BOLD) == counts["bold_word_list"]
    assert _emphasised_words(read, Emphasis.ITALIC) == counts["italic_word_list"]
    furniture = expected["excluded_furniture"]["docx"]
    assert read.excluded == ("page headers and footers",)
    # The header repeats the lesson title (also its first heading), so only the footer can be
    # looked for in the text.
    assert not any(furniture["footer"] in block.text for block in read.blocks)
    figures = {figure["file"]: figure for figure in expected["figures"]}
    wanted = [figures[name] for name in counts["figure_files"]]
    assert [
        (f.width_px, f.height_px, f.alt_text, f.caption, f.display_width_cm, f.display_height_cm)
        for f in read.figures
    ] == [(w["width_px"], w["height_px"], w["alt_text"], w["caption"], *_cm(w)) for w in wanted]


def _cm(figure: dict[str, Any]) -> tuple[Any, Any]:
    return pytest.approx(figure["display_width_cm"]), pytest.approx(figure["display_height_cm"])


# -- bad input ----------------------------------------------------------------------------------


def _minimal(tmp_path: Path) -> Path:
    document = docx.Document()
    document.add_paragraph("Check the tyre pressure.")
    return _save(document, tmp_path)


def test_truncated_zip_is_corrupt(tmp_path: Path) -> None:
    path = _minimal(tmp_path)
    path.write_bytes(path.read_bytes()[: path.stat().st_size // 2])
    with pytest.raises(CorruptFile, match="damaged or truncated"):
        _read(path)


def test_zip_that_is_not_a_word_document(tmp_path: Path) -> None:
    path = tmp_path / "photos.docx"
    with zipfile.ZipFile(path, "w") as archive:
        archive.writestr("notes.txt", "shopping list")
    with pytest.raises(UnsupportedFormat, match="not a Word document"):
        _read(path)


def test_zip_bomb_member_is_refused(tmp_path: Path) -> None:
    path = _minimal(tmp_path)
    with zipfile.ZipFile(path, "a", zipfile.ZIP_DEFLATED) as archive:
        archive.writestr("word/media/filler.bin", bytes(5 * 1024 * 1024))  # deflates ~1000:1
    with pytest.raises(LimitExceeded, match="max_zip_ratio"):
        _read(path, ReadLimits(max_zip_ratio=50))


def test_small_compressible_parts_pass_the_ratio_guard(tmp_path: Path) -> None:
    document = docx.Document()
    for _ in range(2000):  # ~400 KB of repetitive XML: far above 50:1, but under 1 MiB
        document.add_paragraph("Rinse the grinder.")
    path = _save(document, tmp_path)
    with zipfile.ZipFile(path) as archive:
        info = archive.getinfo("word/document.xml")
    assert info.file_size / info.compress_size > 50  # the guard really had something to judge
    assert len(_read(path, ReadLimits(max_zip_ratio=50)).blocks) == 2000


def test_member_count_and_total_size_limits(tmp_path: Path) -> None:
    path = _minimal(tmp_path)
    with pytest.raises(LimitExceeded, match="max_zip_members"):
        _read(path, ReadLimits(max_zip_members=3))
    with pytest.raises(LimitExceeded, match="max_zip_uncompressed_bytes"):
        _read(path, ReadLimits(max_zip_uncompressed_bytes=1000))


def test_encrypted_member_is_refused(tmp_path: Path) -> None:
    data = bytearray(_minimal(tmp_path).read_bytes())
    central = data.find(b"PK\x01\x02")
    data[central + 8] |= 0x1  # general purpose bit 0: encrypted (PKWARE APPNOTE 4.4.4)
    path = tmp_path / "locked.docx"
    path.write_bytes(bytes(data))
    with pytest.raises(EncryptedFile):
        _read(path)


def test_garbage_xml_is_corrupt(tmp_path: Path) -> None:
    path = _minimal(tmp_path)
    _rewrite(path, {"word/document.xml": b"<w:document><w:body><w:p>unclosed"})
    with pytest.raises(CorruptFile):
        _read(path)


def test_garbage_in_a_part_python_docx_does_not_parse(tmp_path: Path) -> None:
    document = docx.Document()
    document.add_paragraph("Bleed the brakes.")
    _notes_part(document, "footnote", [(None, "1", "A note.")])
    path = _save(document, tmp_path)
    _rewrite(path, {"word/footnotes.xml": b"\x00\x01 not xml"})
    with pytest.raises(CorruptFile, match="footnotes"):
        _read(path)


def test_entities_are_not_expanded(tmp_path: Path) -> None:
    # python-docx parses with resolve_entities=False (docx/oxml/parser.py); an internal entity
    # must stay unexpanded, the defence against entity-expansion ("billion laughs") attacks.
    assert _parser_resolves_entities() is False
    path = _minimal(tmp_path)
    with zipfile.ZipFile(path) as archive:
        xml = archive.read("word/document.xml").decode()
    start = xml.index("<w:document")
    xml = (
        xml[:start]
        + '<!DOCTYPE w:document [<!ENTITY boom "EXPANDED">]>'
        + xml[start:].replace("Check the tyre pressure.", "Check &boom; now.")
    )
    _rewrite(path, {"word/document.xml": xml.encode()})
    read = _read(path)
    assert "EXPANDED" not in " ".join(block.text for block in read.blocks)
