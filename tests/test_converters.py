"""The same lesson exported by real converters reads the same in every format.

Outside reference: the files in fixtures/converters/ were made by pandoc 2.17 (Markdown to
DOCX and back), LibreOffice 7.4 (DOCX to tagged and untagged PDF) and python-docx from one
Markdown source (scripts/build_converter_fixtures.py; fixtures/converters/README.md). The
counts below are those of the source, by construction: what a reader of any format must find.
"""

from __future__ import annotations

from functools import cache
from itertools import combinations
from pathlib import Path

import pytest

from matcheck.compare.engine import compare_profiles
from matcheck.compare.tolerances import parse_tolerances
from matcheck.findings import Finding, Status
from matcheck.measures import Profile
from matcheck.model import BlockKind

FOLDER = Path(__file__).resolve().parent.parent / "fixtures" / "converters"
FORMATS = ("md", "pandoc.docx", "python-docx.docx", "tagged.pdf", "untagged.pdf", "roundtrip.md")
# What each format cannot show, so those measures are "not shown" (inconclusive), never a
# difference: PDF draws underline and highlight as shapes; an untagged PDF has no alt text;
# plain Markdown states no display size for a picture.
NOT_SHOWN = {
    "md": {"figure_display_area"},
    "tagged.pdf": {"underline_words", "highlight_words"},
    "untagged.pdf": {"underline_words", "highlight_words", "figures_without_alt_text"},
}


def _path(stem: str, fmt: str) -> Path:
    return FOLDER / (f"{stem}.md" if fmt == "md" else f"{stem}-{fmt}")


@cache
def _profile(stem: str, fmt: str) -> Profile:
    from matcheck.api import profile_document
    from matcheck.readers import read
    from matcheck.settings import Settings

    return profile_document(read(_path(stem, fmt)), Settings())


def _findings(a: Profile, b: Profile) -> tuple[Finding, ...]:
    findings, _ = compare_profiles({"a": a, "b": b}, "a", (), parse_tolerances([]))
    return findings


@pytest.mark.parametrize("fmt", FORMATS)
def test_every_format_reads_the_source_outline(fmt: str) -> None:
    document = _profile("lesson", fmt).document
    headings = document.blocks_of(BlockKind.HEADING)
    # Source: one "#" title, two "##" sections, four "###" subsections (lesson.md).
    assert [h.level for h in headings] == [1, 2, 3, 3, 2, 3, 3]
    assert headings[0].text == "Setting Up a Home Wi-Fi Mesh"
    items = document.blocks_of(BlockKind.LIST_ITEM)
    # A bulleted list of 4 followed directly by a numbered list of 4: two lists.
    assert len(items) == 8 and len({item.group for item in items}) == 2
    cells = document.blocks_of(BlockKind.TABLE_CELL)
    # One table of 36 rows x 3 columns (header included) that crosses a page in the PDFs.
    assert len(cells) == 108 and len({cell.group for cell in cells}) == 1
    code = document.blocks_of(BlockKind.CODE)
    # Two code blocks of 3 and 4 lines; never prose.
    assert len(code) == 7 and len({line.group for line in code}) == 2
    assert code[0].text == "ssh admin@192.168.68.1"
    # The PNG and the SVG, with the alt text the source gives (an untagged PDF has none).
    assert len(document.figures) == 2
    if fmt != "untagged.pdf":
        assert document.figures[1].alt_text.startswith("Diagram of three mesh nodes")
    # A real hyphen at a line end stays ("single-purpose"); curly apostrophes are folded.
    text = " ".join(block.text for block in document.blocks)
    assert "single-purpose" in text and "We'll" in text


@pytest.mark.parametrize(("a", "b"), list(combinations(FORMATS, 2)))
def test_every_pair_of_formats_is_matched(a: str, b: str) -> None:
    findings = _findings(_profile("lesson", a), _profile("lesson", b))
    differs = [f.dimension for f in findings if f.status is Status.DIFFERS]
    assert differs == []
    unknown = {f.dimension for f in findings if f.status is Status.INCONCLUSIVE}
    # Unknown in one version only: inconclusive; unknown in both: nothing to compare.
    assert unknown == NOT_SHOWN.get(a, set()) ^ NOT_SHOWN.get(b, set())


@pytest.mark.parametrize("a", FORMATS)
@pytest.mark.parametrize("b", FORMATS)
def test_planted_differences_are_caught_in_every_pair(a: str, b: str) -> None:
    # lesson-changed.md: one paragraph removed ("Place each satellite node ..."), one passage
    # rewritten ("Once the main node is running ..."), one figure added (router-ports.png).
    findings = _findings(_profile("lesson", a), _profile("lesson-changed", b))
    differs = {f.dimension: f for f in findings if f.status is Status.DIFFERS}
    assert "figures" in differs
    removed = differs["passages_removed"].evidence
    assert any("Place each satellite node" in str(item) for item in removed)
    assert any("add the satellites one at a time" in str(item) for item in removed)
    added = differs["passages_added"].evidence
    assert any("reset every satellite" in str(item) for item in added)


@pytest.mark.parametrize(
    ("a", "b"),
    [("diagrams.md", "diagrams.docx"), ("diagrams.md", "pdf"), ("diagrams.docx", "pdf")],
)
def test_demo_docx_exported_by_libreoffice_matches_its_sources(a: str, b: str) -> None:
    from matcheck.api import profile_document
    from matcheck.readers import read
    from matcheck.settings import Settings

    demo = FOLDER.parent / "demo"
    paths = {
        "diagrams.md": demo / "diagrams.md",
        "diagrams.docx": demo / "diagrams.docx",
        "pdf": FOLDER / "demo-diagrams-libreoffice.pdf",  # LibreOffice 7.4, tagged
    }
    first, second = (profile_document(read(paths[x]), Settings()) for x in (a, b))
    findings = _findings(first, second)
    assert [f.dimension for f in findings if f.status is Status.DIFFERS] == []
    # Alt text comes through LibreOffice's tags: the PDF's three figures all have theirs.
    if b == "pdf":
        assert all(figure.alt_text for figure in second.document.figures)
        assert len(second.document.figures) == 3
