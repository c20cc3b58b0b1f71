"""Tests for matcheck.readers.markdown: structure, emphasis, figures and decoding.

Every expected count is known by construction of the little lesson each test writes. The
syntax rules relied on are cited beside the checks: "CommonMark" is the CommonMark Spec 0.31.2
(spec.commonmark.org), "GFM" the GitHub Flavored Markdown Spec 0.29-gfm (tables extension);
see docs/references.md §15 (and §16 for encodings).
"""

from __future__ import annotations

import os
import socket
from collections import Counter
from pathlib import Path

import pytest

from matcheck.limits import ReadLimits
from matcheck.model import BlockKind, Document, Emphasis
from matcheck.readers.decode import CP1252_WARNING
from matcheck.readers.markdown import read_markdown

LIMITS = ReadLimits()


def _write(folder: Path, text: str, name: str = "lesson.md") -> Path:
    path = folder / name
    path.write_text(text, encoding="utf-8")
    return path


def _read(folder: Path, text: str, limits: ReadLimits = LIMITS) -> Document:
    return read_markdown(_write(folder, text), limits)


def _png(path: Path, width: int, height: int) -> Path:
    from PIL import Image

    Image.new("RGB", (width, height), (200, 120, 40)).save(path)
    return path


def _kinds(document: Document) -> list[BlockKind]:
    return [block.kind for block in document.blocks]


def _texts(document: Document, kind: BlockKind) -> list[str]:
    return [block.text for block in document.blocks_of(kind)]


def test_markdown_headings_atx_and_setext_per_level(tmp_path: Path) -> None:
    source = (
        "# Home network\n\n"
        "## Router\n\n"
        "### Cables\n\n"
        "#### Category 6\n\n"
        "##### Shielding\n\n"
        "###### Connectors\n\n"
        "Wireless setup\n==============\n\n"
        "Channels\n--------\n\n"
        "####### seven hashes is a paragraph\n"
    )
    document = _read(tmp_path, source)
    levels = Counter(block.level for block in document.blocks_of(BlockKind.HEADING))
    # CommonMark 4.2: ATX headings have 1-6 "#"; seven "#" is not a heading (example 63).
    # CommonMark 4.3: a "=" underline makes a level-1, a "-" underline a level-2 setext heading.
    assert levels == {1: 2, 2: 2, 3: 1, 4: 1, 5: 1, 6: 1}
    assert _texts(document, BlockKind.HEADING)[6:] == ["Wireless setup", "Channels"]
    assert _texts(document, BlockKind.PARAGRAPH) == ["####### seven hashes is a paragraph"]
    # Each block's section is the nearest heading above it.
    assert document.blocks_of(BlockKind.PARAGRAPH)[0].location.section == "Channels"


def test_markdown_paragraphs_blockquote_and_line_breaks(tmp_path: Path) -> None:
    source = (
        "Grind the beans just\nbefore brewing.\n\n"
        "> Water just off the boil\n> extracts best.\n\n"
        "A hard break  \nbecomes a space, and so\\\ndoes a backslash break.\n"
    )
    document = _read(tmp_path, source)
    # CommonMark 5.1: block quote content is paragraphs; 6.7/6.8: soft and hard line breaks
    # are both line breaks inside one paragraph, which reads as a space.
    assert _texts(document, BlockKind.PARAGRAPH) == [
        "Grind the beans just before brewing.",
        "Water just off the boil extracts best.",
        "A hard break becomes a space, and so does a backslash break.",
    ]
    assert [block.location.paragraph for block in document.blocks] == [1, 2, 3]
    assert [block.location.line for block in document.blocks] == [1, 4, 7]


def test_markdown_lists_nesting_groups_and_loose_items(tmp_path: Path) -> None:
    source = (
        "- Remove the wheel\n"
        "- Find the puncture\n"
        "  - Pump the tube\n"
        "  - Listen for air\n"
        "- Patch it\n"
        "\n"
        "Between the lists.\n"
        "\n"
        "1. Loose first step.\n"
        "\n"
        "   A second paragraph of the first step.\n"
        "\n"
        "2. Loose second step.\n"
    )
    document = _read(tmp_path, source)
    items = document.blocks_of(BlockKind.LIST_ITEM)
    # By construction: 3 top items + 2 nested in list 1; 2 items, one with 2 paragraphs, in
    # the ordered list (CommonMark 5.2: a list item may hold several paragraphs; 5.3: a
    # blank line between items makes the list loose, which changes no item count).
    assert [item.text for item in items] == [
        "Remove the wheel",
        "Find the puncture",
        "Pump the tube",
        "Listen for air",
        "Patch it",
        "Loose first step.",
        "A second paragraph of the first step.",
        "Loose second step.",
    ]
    assert [item.level for item in items] == [1, 1, 2, 2, 1, 1, 1, 1]
    groups = [item.group for item in items]
    # Two lists: the outer bullet list with its nested items (a nested list belongs to its
    # outer list, as DOCX numbering keeps it), and the ordered list.
    assert len(set(groups)) == 2
    assert groups[0] == groups[1] == groups[2] == groups[3] == groups[4]
    assert groups[5] == groups[6] == groups[7] not in groups[:5]
    assert _texts(document, BlockKind.PARAGRAPH) == ["Between the lists."]
    assert [item.location.line for item in items] == [1, 2, 3, 4, 5, 9, 11, 13]


def test_markdown_tables_cells_row_major_and_groups(tmp_path: Path) -> None:
    source = (
        "| Brew | Grind | Minutes |\n"
        "|------|-------|---------|\n"
        "| Press | coarse | 4 |\n"
        "| Drip |  | 5 |\n"
        "\n"
        "Text between.\n"
        "\n"
        "| Tool | Use |\n"
        "|---|---|\n"
        "| Lever | tyres |\n"
    )
    document = _read(tmp_path, source)
    cells = document.blocks_of(BlockKind.TABLE_CELL)
    # GFM 4.10 tables: the header row is a row of cells; one empty cell is not a block.
    # Table 1: 3 + 3 + 2 non-empty cells; table 2: 2 + 2.
    assert [cell.text for cell in cells] == [
        "Brew", "Grind", "Minutes", "Press", "coarse", "4", "Drip", "5",
        "Tool", "Use", "Lever", "tyres",
    ]  # fmt: skip
    assert len({cell.group for cell in cells[:8]}) == 1
    assert len({cell.group for cell in cells}) == 2
    assert [cell.location.line for cell in cells[:4]] == [1, 1, 1, 3]


def test_markdown_emphasis_spans_by_kind(tmp_path: Path) -> None:
    source = (
        "Use **fresh beans** and *filtered* water; ==never boil== it, "
        "<u>weigh</u> the dose, <mark>stir once</mark>, <b>wait</b>, <i>pour</i>, "
        "`press` then ***serve***.\n"
    )
    document = _read(tmp_path, source)
    (block,) = document.blocks
    spans = [(block.text[span.start : span.end], span.kind) for span in block.emphasis]
    # CommonMark 6.2: ** is strong (bold), * is emphasis (italic), *** both. "==x==" is the
    # highlight convention of markdown-it-mark (common practice). HTML b/i/u/mark elements
    # (HTML Living Standard 4.5) carry bold, italic, underline and highlight.
    assert sorted(spans) == sorted(
        [
            ("fresh beans", Emphasis.BOLD),
            ("filtered", Emphasis.ITALIC),
            ("never boil", Emphasis.HIGHLIGHT),
            ("weigh", Emphasis.UNDERLINE),
            ("stir once", Emphasis.HIGHLIGHT),
            ("wait", Emphasis.BOLD),
            ("pour", Emphasis.ITALIC),
            ("serve", Emphasis.BOLD),
            ("serve", Emphasis.ITALIC),
        ]
    )
    # Markers and tags are not text; inline code keeps its text.
    assert block.text == (
        "Use fresh beans and filtered water; never boil it, weigh the dose, stir once, "
        "wait, pour, press then serve."
    )


def test_markdown_unmatched_equals_stay_text(tmp_path: Path) -> None:
    document = _read(tmp_path, "Ratio 1 == 1 and a === b and ==open.\n")
    (block,) = document.blocks
    # Delimiters surrounded by spaces cannot open or close (CommonMark 6.2 flanking rules,
    # which the == rule follows); a run of three is literal.
    assert block.text == "Ratio 1 == 1 and a === b and ==open."
    assert block.emphasis == ()


def test_markdown_front_matter_title_is_the_title_and_the_rest_is_not_text(
    tmp_path: Path,
) -> None:
    source = (
        '---\ntitle: "Composting basics"\nauthor: someone\n---\n\n# Composting\n\n'
        "Greens and browns.\n"
    )
    document = _read(tmp_path, source)
    # pandoc's title block (pandoc manual, "Metadata blocks"): the title sits above every
    # "#" heading, so it is rank 1 of the outline and "#" rank 2.
    assert _kinds(document) == [BlockKind.HEADING, BlockKind.HEADING, BlockKind.PARAGRAPH]
    assert [(b.text, b.level) for b in document.blocks_of(BlockKind.HEADING)] == [
        ("Composting basics", 1),
        ("Composting", 2),
    ]
    assert not any("author" in block.text for block in document.blocks)
    assert document.blocks[1].location.line == 6


def test_markdown_front_matter_without_title_adds_no_heading(tmp_path: Path) -> None:
    document = _read(tmp_path, "---\nauthor: someone\n---\n\n# Composting\n\nGreens.\n")
    assert [(b.text, b.level) for b in document.blocks_of(BlockKind.HEADING)] == [("Composting", 1)]


def test_markdown_code_blocks_are_code_lines(tmp_path: Path) -> None:
    source = (
        "Check the router:\n\n"
        "```sh\nping 192.168.1.1\n```\n\n"
        "    ip addr show\n\n"
        "~~~\nsecond fence\n~~~\n\n"
        "Then reboot it.\n"
    )
    document = _read(tmp_path, source)
    # CommonMark 4.4 (indented) and 4.5 (fenced with ``` or ~~~): three code blocks, each
    # line a CODE block of its own group, never prose.
    assert _texts(document, BlockKind.PARAGRAPH) == ["Check the router:", "Then reboot it."]
    code = document.blocks_of(BlockKind.CODE)
    assert [block.text for block in code] == ["ping 192.168.1.1", "ip addr show", "second fence"]
    assert len({block.group for block in code}) == 3
    assert [block.location.line for block in code] == [4, 7, 10]
    assert document.excluded == ()


def test_markdown_footnotes_are_footnote_blocks_at_the_end(tmp_path: Path) -> None:
    source = (
        "Brown material[^browns] balances green.\n\n"
        "[^browns]: Dry leaves, **cardboard** and straw.\n\n"
        "    A second paragraph of the note.\n\n"
        "Turn the heap weekly.\n"
    )
    document = _read(tmp_path, source)
    # Footnote syntax of PHP Markdown Extra as implemented by mdit-py-plugins' footnote
    # plugin: the reference mark is not text, the definition is moved after the body.
    assert _kinds(document) == [BlockKind.PARAGRAPH, BlockKind.PARAGRAPH, BlockKind.FOOTNOTE]
    assert document.blocks[0].text == "Brown material balances green."
    footnote = document.blocks[-1]
    assert footnote.text == "Dry leaves, cardboard and straw. A second paragraph of the note."
    assert [footnote.text[s.start : s.end] for s in footnote.emphasis] == ["cardboard"]
    assert footnote.location.line == 3


def test_markdown_figures_alt_text_sizes_and_lines(tmp_path: Path) -> None:
    _png(tmp_path / "wheel.png", 64, 48)
    (tmp_path / "pics").mkdir()
    _png(tmp_path / "pics" / "chain tool.png", 20, 30)
    source = (
        "# Bicycle repair\n\n"
        "![A *rear* wheel on a stand](wheel.png)\n\n"
        "The chain tool ![Chain tool](pics/chain%20tool.png?v=2#top) pushes the pin\n"
        'out. <img src="wheel.png" alt="Wheel again" width="300">\n'
    )
    document = _read(tmp_path, source)
    # Sizes are what Pillow wrote above; alt text is the image description (CommonMark 6.4).
    assert [(f.alt_text, f.width_px, f.height_px) for f in document.figures] == [
        ("A rear wheel on a stand", 64, 48),
        ("Chain tool", 20, 30),
        ("Wheel again", 64, 48),
    ]
    assert [f.location.line for f in document.figures] == [3, 5, 6]
    assert [f.source for f in document.figures] == [
        "wheel.png", "pics/chain tool.png?v=2#top", "wheel.png",
    ]  # fmt: skip
    assert all(f.readable and not f.remote for f in document.figures)
    # Markdown states no display size; HTML px would need a DPI to become cm.
    assert all(f.display_area_cm2 is None for f in document.figures)
    # The image-only paragraph adds no text; alt text is not body text.
    assert _kinds(document) == [BlockKind.HEADING, BlockKind.PARAGRAPH]
    assert document.blocks[1].text == "The chain tool pushes the pin out."
    assert document.figures[0].location.block == 0  # after the heading
    assert document.figures[1].location.block == 1  # after its paragraph
    assert document.warnings == ()


def test_markdown_remote_images_are_counted_never_fetched(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    def no_network(*args: object, **kwargs: object) -> None:
        raise AssertionError("the reader tried to open a network connection")

    monkeypatch.setattr(socket.socket, "connect", no_network)
    source = (
        "![Router](https://example.org/router.png)\n"
        "![Switch](http://example.org/switch.png)\n"
        "![Modem](//cdn.example.org/modem.png)\n"
    )
    document = _read(tmp_path, source)
    assert len(document.figures) == 3
    assert all(f.remote and f.width_px is None and f.height_px is None for f in document.figures)
    assert [f.alt_text for f in document.figures] == ["Router", "Switch", "Modem"]


def test_markdown_inline_data_image_is_measured(tmp_path: Path) -> None:
    import base64

    payload = base64.b64encode(_png(tmp_path / "dot.png", 7, 5).read_bytes()).decode()
    document = _read(tmp_path, f"![Dot](data:image/png;base64,{payload})\n")
    (figure,) = document.figures
    assert (figure.width_px, figure.height_px, figure.remote) == (7, 5, False)
    assert figure.source == "data:image/png;base64,…"


def test_markdown_outside_images_not_read_unless_allowed(tmp_path: Path) -> None:
    lesson = tmp_path / "lesson"
    lesson.mkdir()
    outside = _png(tmp_path / "secret.png", 11, 13)
    (lesson / "link.png").symlink_to(outside)
    source = f"![up](../secret.png)\n![absolute]({outside})\n![link](link.png)\n"
    path = _write(lesson, source)

    document = read_markdown(path, LIMITS)
    assert [f.readable for f in document.figures] == [False, False, False]
    assert all(f.width_px is None for f in document.figures)
    assert document.warnings == (
        "image ../secret.png is outside the lesson folder; not read (allow it with "
        "--allow-outside)",
        f"image {outside} is outside the lesson folder; not read (allow it with --allow-outside)",
        "image link.png is outside the lesson folder; not read (allow it with --allow-outside)",
    )

    allowed = read_markdown(path, ReadLimits(allow_outside_files=True))
    assert [(f.width_px, f.height_px) for f in allowed.figures] == [(11, 13)] * 3
    assert allowed.warnings == ()


def test_markdown_outside_image_is_never_opened(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    lesson = tmp_path / "lesson"
    lesson.mkdir()
    _png(tmp_path / "secret.png", 3, 3)
    opened: list[object] = []
    monkeypatch.setattr("matcheck.readers.image_paths.image_size", opened.append)
    read_markdown(_write(lesson, "![up](../secret.png)\n"), LIMITS)
    assert opened == []


def test_markdown_missing_and_undecodable_images_unreadable(tmp_path: Path) -> None:
    (tmp_path / "notes.png").write_text("not an image", encoding="utf-8")
    document = _read(tmp_path, "![Gone](gone.png)\n\n![Fake](notes.png)\n")
    assert [(f.alt_text, f.readable) for f in document.figures] == [
        ("Gone", False),
        ("Fake", False),
    ]
    assert document.warnings == (
        "image gone.png not found",
        "image notes.png cannot be decoded; its size is unknown",
    )


def test_markdown_captions_from_title_and_figure_paragraph(tmp_path: Path) -> None:
    _png(tmp_path / "bin.png", 10, 10)
    source = (
        '![Compost bin](bin.png "A three-bay compost bin")\n\n'
        "![Layers](bin.png)\n\n"
        "Figure 2. Greens and browns in layers.\n\n"
        "![Thermometer](bin.png)\n\n"
        "*The heap at 60 degrees.*\n\n"
        "![Fork](bin.png)\n\n"
        "Turn the heap with a fork.\n"
    )
    document = _read(tmp_path, source)
    # A title is the image's caption (CommonMark 6.4 image titles); a "Figure N" line or a
    # wholly emphasised line right below a picture reads as its caption (common practice).
    assert [f.caption for f in document.figures] == [
        "A three-bay compost bin",
        "Figure 2. Greens and browns in layers.",
        "The heap at 60 degrees.",
        "",
    ]
    assert _texts(document, BlockKind.CAPTION) == [
        "A three-bay compost bin",
        "Figure 2. Greens and browns in layers.",
        "The heap at 60 degrees.",
    ]
    assert _texts(document, BlockKind.PARAGRAPH) == ["Turn the heap with a fork."]
    assert [b.location.line for b in document.blocks_of(BlockKind.CAPTION)] == [1, 5, 9]


def test_markdown_raw_html_block_text_and_images(tmp_path: Path) -> None:
    _png(tmp_path / "kettle.png", 30, 40)
    source = (
        "Intro.\n\n"
        '<div class="note">\n'
        "<p>Heat water to <b>94 degrees</b>.</p>\n"
        '<figure><img src="kettle.png" alt="A kettle">'
        "<figcaption>A gooseneck kettle</figcaption></figure>\n"
        "<script>var hidden = 1;</script>\n"
        "</div>\n"
    )
    document = _read(tmp_path, source)
    # CommonMark 4.6: the <div> block is raw HTML; its text is taken with tags stripped.
    assert _kinds(document) == [BlockKind.PARAGRAPH, BlockKind.PARAGRAPH, BlockKind.CAPTION]
    paragraph = document.blocks[1]
    assert paragraph.text == "Heat water to 94 degrees."
    assert [paragraph.text[s.start : s.end] for s in paragraph.emphasis] == ["94 degrees"]
    assert paragraph.location.line == 4
    (figure,) = document.figures
    assert (figure.alt_text, figure.width_px, figure.caption) == (
        "A kettle",
        30,
        "A gooseneck kettle",
    )
    assert figure.location.line == 5
    assert not any("hidden" in block.text for block in document.blocks)


def test_markdown_decodes_cp1252_with_warning(tmp_path: Path) -> None:
    path = tmp_path / "legacy.md"
    # "é" is 0xE9 and the en dash 0x96 in Windows-1252 (Unicode's CP1252.TXT mapping); 0x96
    # alone is not valid UTF-8 (RFC 3629: a continuation byte cannot start a character).
    path.write_bytes("# Café\n\nBrew 3–4 minutes.\n".encode("cp1252"))
    document = read_markdown(path, LIMITS)
    # The en dash is folded to a hyphen like every dash (matcheck.textnorm).
    assert [block.text for block in document.blocks] == ["Café", "Brew 3-4 minutes."]
    assert document.warnings == (CP1252_WARNING,)


def test_markdown_utf8_bom_and_crlf(tmp_path: Path) -> None:
    path = tmp_path / "bom.md"
    path.write_bytes(b"\xef\xbb\xbf# Title\r\n\r\nLine one\r\nline two.\r\n")
    document = read_markdown(path, LIMITS)
    # The BOM (U+FEFF) is not text, so the first line is still an ATX heading.
    assert [(block.kind, block.text) for block in document.blocks] == [
        (BlockKind.HEADING, "Title"),
        (BlockKind.PARAGRAPH, "Line one line two."),
    ]
    assert document.warnings == ()
    assert document.blocks[1].location.line == 3


def test_markdown_whitespace_only_gives_no_blocks(tmp_path: Path) -> None:
    document = _read(tmp_path, "   \n\n\t\n")
    assert document.blocks == ()
    assert document.format == "markdown"


@pytest.mark.skipif(os.name == "nt", reason="symlink rights on Windows")
def test_markdown_symlink_inside_folder_is_read(tmp_path: Path) -> None:
    _png(tmp_path / "real.png", 5, 6)
    (tmp_path / "alias.png").symlink_to(tmp_path / "real.png")
    document = _read(tmp_path, "![Alias](alias.png)\n")
    assert [(f.width_px, f.height_px) for f in document.figures] == [(5, 6)]
