"""Every finding about a caption, figure, heading or list item points to its place in each
format and in the GitHub annotation (issue 20, deliverable 2).

The lessons are built here, so where each added block stands is known by construction: the
line of a Markdown file, and in a DOCX (no pages, no lines) the number of body paragraphs
before it. GitHub's workflow commands take ``file`` and ``line`` properties (GitHub docs,
"Workflow commands for GitHub Actions", setting an error message).
"""

from __future__ import annotations

import json
import re
from pathlib import Path

from matcheck.api import Version, compare_versions
from matcheck.findings import Report
from matcheck.report.github import render_github
from matcheck.report.json_report import render_json
from matcheck.report.markdown import render_markdown

FIXTURES = Path(__file__).resolve().parent.parent / "fixtures" / "demo"
LESSON = """# Radiators

Turn the heating off and let the radiator cool down before you start.

![A radiator bleed key](images/valve-types.png)

{caption}Hold a cloth under the bleed screw while you turn the key.

Close the screw when water appears.
"""
CAPTION = "Figure 1. A bleed key that fits the square screw."


def _images(folder: Path) -> None:
    (folder / "images").mkdir(exist_ok=True)
    source = FIXTURES / "images" / "valve-types.png"
    (folder / "images" / "valve-types.png").write_bytes(source.read_bytes())


def _compare(a: Path, b: Path) -> Report:
    return compare_versions([Version("a", (a,)), Version("b", (b,))])


def _evidence(report: Report, dimension: str) -> list[tuple[str, str]]:
    finding = next(f for f in report.findings if f.dimension == dimension)
    return [(e.kind.value, e.location.describe() if e.location else "") for e in finding.evidence]


def test_an_added_caption_is_located_in_every_format(tmp_path: Path) -> None:
    _images(tmp_path)
    (tmp_path / "a.md").write_text(LESSON.format(caption=""), encoding="utf-8")
    (tmp_path / "b.md").write_text(LESSON.format(caption=CAPTION + "\n\n"), encoding="utf-8")
    report = _compare(tmp_path / "a.md", tmp_path / "b.md")
    # By construction the caption is line 7 of b.md, under the heading "Radiators".
    assert _evidence(report, "captions") == [("caption_added", "§ Radiators, line 7")]
    github = [line for line in render_github(report).splitlines() if "captions differs" in line]
    assert len(github) == 1
    assert re.match(r"::error file=[^,]*b\.md,line=7,", github[0]), github[0]
    assert "§ Radiators, line 7" in github[0]
    assert f"§ Radiators, line 7: “{CAPTION}”" in render_markdown(report)
    located = [
        e["location"]["description"]
        for f in json.loads(render_json(report))["findings"]
        if f["dimension"] == "captions"
        for e in f["evidence"]
    ]
    assert located == ["§ Radiators, line 7"]


def _docx(path: Path, *, added: bool) -> None:
    import docx
    from docx.shared import Cm

    document = docx.Document()
    document.add_heading("Radiators", 1)
    document.add_paragraph("Turn the heating off and let the radiator cool down first.")
    document.add_picture(str(FIXTURES / "images" / "valve-types.png"), width=Cm(5))
    if added:
        document.add_paragraph(CAPTION, style="Caption")
    document.add_paragraph("Hold a cloth under the bleed screw while you turn the key.")
    if added:
        document.add_heading("Safety", 2)
    document.add_paragraph("Close the screw when water appears.")
    document.add_paragraph("a cloth", style="List Bullet")
    if added:
        document.add_paragraph("a bleed key", style="List Bullet")
    document.save(str(path))


def test_docx_blocks_are_located_by_the_paragraphs_before_them(tmp_path: Path) -> None:
    _docx(tmp_path / "a.docx", added=False)
    _docx(tmp_path / "b.docx", added=True)
    report = _compare(tmp_path / "a.docx", tmp_path / "b.docx")
    # Body paragraphs of b, by construction: 1 "Turn ...", 2 "Hold ...", 3 "Close ...".
    assert _evidence(report, "captions") == [("caption_added", "§ Radiators, after paragraph 1")]
    assert _evidence(report, "headings") == [("heading_added", "§ Safety, after paragraph 2")]
    assert _evidence(report, "list_items") == [("list_item_added", "§ Safety, after paragraph 3")]
    data = json.loads(render_json(report))
    heading = next(f for f in data["findings"] if f["dimension"] == "headings")
    assert heading["evidence"][0]["location"]["after_paragraph"] == 2
    assert heading["evidence"][0]["location"]["paragraph"] is None
    # A DOCX has no lines: the annotation names the file, the message the place.
    github = next(line for line in render_github(report).splitlines() if "headings" in line)
    assert re.match(r"::error file=[^,]*b\.docx,title=", github), github
    assert "§ Safety, after paragraph 2" in github


def test_parts_count_paragraphs_through_the_whole_lesson(tmp_path: Path) -> None:
    # docs/report-schema.md: paragraph numbers run through all parts; so does the count
    # before a block of a later part.
    _docx(tmp_path / "one.docx", added=False)
    _docx(tmp_path / "two.docx", added=True)
    report = compare_versions(
        [
            Version("a", (tmp_path / "one.docx",)),
            Version("b", (tmp_path / "one.docx", tmp_path / "two.docx")),
        ]
    )
    places = dict(_evidence(report, "headings"))
    # one.docx has 3 body paragraphs; "Safety" follows the 2nd paragraph of two.docx.
    assert "§ Safety, after paragraph 5" in places.values()


def test_the_annotation_takes_the_first_located_evidence() -> None:
    # An unlocated piece of evidence first (an emphasised term has no place) must not cost
    # the annotation its line when a later piece has one.
    from matcheck.findings import (
        Condition,
        Evidence,
        EvidenceKind,
        Finding,
        Group,
        Status,
        Tolerance,
    )
    from matcheck.model import Location

    finding = Finding(
        "headings",
        Group.STRUCTURE,
        "headings",
        "a",
        "b",
        Status.DIFFERS,
        {"a": 1.0, "b": 2.0},
        1.0,
        Tolerance(),
        "beyond tolerance",
        evidence=(
            Evidence(EvidenceKind.EMPHASIS_ADDED, "b", "valve"),
            Evidence(EvidenceKind.HEADING_ADDED, "b", "Safety", Location(4, line=9)),
        ),
    )
    conditions = (
        Condition("a", ("a.md",), "markdown", True),
        Condition("b", ("b.md",), "markdown"),
    )
    report = Report(conditions, "a", (), (finding,))
    (line,) = render_github(report).splitlines()
    assert line.startswith("::error file=b.md,line=9,"), line
