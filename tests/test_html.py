"""The HTML report without a browser: self-contained, escaped, generic over groups and
evidence kinds, with words marked the way difflib aligns them.

tests/test_browser.py opens the page in Chromium; these checks need no browser.
"""

from __future__ import annotations

import re
from html.parser import HTMLParser
from pathlib import Path

import pytest

from matcheck.cli import main
from matcheck.findings import (
    Condition,
    Evidence,
    EvidenceKind,
    Finding,
    Group,
    Report,
    Status,
    StudyResult,
    Tolerance,
)
from matcheck.model import Location
from matcheck.report.html import render_html, render_studies_html
from matcheck.report.svg import SHAPE_NAMES, dot_chart
from matcheck.report.worddiff import counts, word_diff

ROOT = Path(__file__).resolve().parent.parent
STUDY = ROOT / "fixtures" / "demo" / "study.toml"
HOSTILE = "<script>alert(\"x\")</script> & 'quotes'"


class _Tags(HTMLParser):
    """Every start tag with its attributes, and whether the document nests correctly."""

    def __init__(self) -> None:
        super().__init__()
        self.tags: list[tuple[str, dict[str, str | None]]] = []

    def handle_starttag(self, tag: str, attrs: list[tuple[str, str | None]]) -> None:
        self.tags.append((tag, dict(attrs)))


def _tags(page: str) -> list[tuple[str, dict[str, str | None]]]:
    parser = _Tags()
    parser.feed(page)
    return parser.tags


def assert_self_contained(page: str) -> None:
    """Nothing in the page can make a request: no URL, no src, no external style or font."""
    assert not re.search(r"https?://", page), "a URL in the page"
    assert not re.search(r"\bsrc\s*=", page, re.I)
    assert all(m.startswith("data:") for m in re.findall(r"url\(\s*['\"]?([^)'\"]*)", page))
    assert "@import" not in page
    for tag, attrs in _tags(page):
        assert tag not in ("script", "link", "iframe", "img", "object", "embed"), tag
        href = attrs.get("href")
        assert href is None or href.startswith("#"), href


def _report(*, kinds: tuple[EvidenceKind, ...] = tuple(EvidenceKind)) -> Report:
    """A report with a finding in every group and a piece of evidence of every kind, the
    names and texts hostile to HTML."""
    a, b = f"A {HOSTILE}", "B-version"
    findings = []
    for index, group in enumerate(Group):
        findings.append(
            Finding(
                dimension=f"toy_{group.value}",
                group=group,
                unit="words",
                reference=a,
                condition=b,
                status=Status.DIFFERS if index % 2 else Status.MATCHED,
                values={a: 10.0, b: 20.0 + index},
                difference=10.0 + index,
                tolerance=Tolerance(absolute=2),
                reason=f"reason {HOSTILE}",
            )
        )
    evidence = tuple(
        Evidence(
            kind=kind,
            condition=a if n % 2 else b,
            text=f"passage {n} of {kind.value} {HOSTILE}",
            location=Location(block=n, section=f"Section {HOSTILE}", paragraph=n),
            counterpart=Location(block=n + 1) if n % 3 == 0 else None,
            counterpart_text=f"other passage {n} {HOSTILE}" if n % 3 == 0 else "",
        )
        for n, kind in enumerate(kinds)
    )
    findings.append(
        Finding(
            dimension="toy_evidence",
            group=Group.CONTENT,
            unit="passages",
            reference=a,
            condition=b,
            status=Status.DIFFERS,
            values={a: 3.0, b: 4.0},
            difference=1.0,
            tolerance=None,
            reason="evidence of every kind",
            evidence=evidence,
        )
    )
    conditions = (Condition(a, ("a.md",), "markdown", True), Condition(b, ("b.md",), "markdown"))
    return Report(conditions, a, (), tuple(findings), title=f"Study {HOSTILE}")


def test_every_group_and_every_evidence_kind_reach_the_page() -> None:
    page = render_html(_report())
    for group in Group:
        assert f'id="group-{group.value}"' in page, group
        assert f"toy_{group.value}" in page
    text = " ".join(re.sub(r"<[^>]+>", " ", page).split())
    for n, kind in enumerate(EvidenceKind):
        assert f"passage {n} of {kind.value}" in text, kind
    assert_self_contained(page)


def test_user_text_is_escaped() -> None:
    page = render_html(_report())
    assert "<script" not in page
    assert "&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; &amp; &#x27;quotes&#x27;" in page
    # Escaped user text never opens a tag: the only tags are the renderer's own.
    allowed = {
        "html", "head", "meta", "title", "body", "div", "style", "header", "h1", "h2", "h3",
        "p", "b", "span", "svg", "circle", "polygon", "rect", "line", "text", "nav", "a",
        "section", "table", "thead", "tbody", "tr", "th", "td", "small", "br", "details",
        "summary", "figure", "del", "ins", "footer", "ul", "li",
    }  # fmt: skip
    assert {tag for tag, _ in _tags(page)} <= allowed


def test_every_finding_links_to_an_anchor_on_the_page() -> None:
    report = _report()
    page = render_html(report)
    ids = {attrs["id"] for _, attrs in _tags(page) if attrs.get("id")}
    rows = re.findall(r'<tr id="(f\d+)" class="finding.*?</tr>', page, re.S)
    assert len(rows) == len(report.findings)
    for row in re.findall(r'<tr id="f\d+" class="finding.*?</tr>', page, re.S):
        targets = re.findall(r'href="#([^"]+)"', row)
        assert targets and set(targets) <= ids


def test_rewritten_passage_side_by_side_with_words_marked() -> None:
    a, b = "ref", "other"
    evidence = Evidence(
        kind=EvidenceKind.PASSAGE_REWRITTEN,
        condition=a,
        text="Pump the tyre to the pressure printed on its wall.",
        location=Location(block=3, section="Inflating", paragraph=2),
        counterpart=Location(block=4, section="Inflating", paragraph=2),
        counterpart_text="Pump the tyre hard to the pressure on its wall, then check it.",
        similarity=0.6,
    )
    finding = Finding(
        "passages_rewritten", Group.CONTENT, "passages", a, b, Status.DIFFERS,
        {a: 5.0, b: 5.0}, 1.0, Tolerance(), "beyond tolerance", evidence=(evidence,),
    )  # fmt: skip
    report = Report((Condition(a, (), "text", True), Condition(b, (), "text")), a, (), (finding,))
    page = render_html(report)
    left, right = re.findall(r'<div class="side">(.*?)</div>', page, re.S)
    assert "<b>ref</b> · § Inflating, paragraph 2" in left
    assert '<del class="removed" title="removed">printed</del>' in left
    assert '<ins class="added" title="added">hard</ins>' in right
    assert '<del class="changed" title="changed">wall.</del>' in left
    assert '<ins class="changed" title="changed">wall, then check it.</ins>' in right
    assert 'href="#e1"' in page and 'id="e1"' in page


def test_word_diff_follows_difflib_opcodes() -> None:
    # Source: Python standard library, difflib.SequenceMatcher.get_opcodes (equal, delete,
    # insert, replace) on word lists; the marks are those of docs/html-report.md.
    left, right = word_diff("the quick brown fox", "the slow brown fox jumps")
    assert left == 'the <del class="changed" title="changed">quick</del> brown fox'
    assert right == (
        'the <ins class="changed" title="changed">slow</ins> brown fox '
        '<ins class="added" title="added">jumps</ins>'
    )
    assert counts("a b c d", "a c d e f") == {"removed": 1, "added": 2, "changed": 0}
    assert word_diff("x < y", "x > y")[0] == 'x <del class="changed" title="changed">&lt;</del> y'


def _luminance(colour: str) -> float:
    # Source: WCAG 2.1, definition of relative luminance; docs/references.md §27.
    def linear(c: float) -> float:
        return c / 12.92 if c <= 0.03928 else ((c + 0.055) / 1.055) ** 2.4

    r, g, b = (linear(int(colour[i : i + 2], 16) / 255) for i in (1, 3, 5))
    return 0.2126 * r + 0.7152 * g + 0.0722 * b


def _contrast(one: str, other: str) -> float:
    # Source: WCAG 2.1, definition of contrast ratio; docs/references.md §27.
    high, low = sorted((_luminance(one), _luminance(other)), reverse=True)
    return (high + 0.05) / (low + 0.05)


def test_colours_meet_the_contrast_the_docs_promise() -> None:
    from matcheck.report.svg import BAND_EDGE, COLOURS, REFERENCE_COLOUR

    assert _contrast("#000000", "#ffffff") == pytest.approx(21.0)  # the scale's top
    # Text contrast (WCAG 1.4.3: 4.5:1); docs/html-report.md promises 6:1.
    for colour in (*COLOURS.values(), REFERENCE_COLOUR):
        assert _contrast(colour, "#ffffff") >= 6.0, colour
    # Non-text contrast (WCAG 1.4.11: 3:1) for the band's edge.
    assert _contrast(BAND_EDGE, "#ffffff") >= 3.0


def test_chart_marks_each_verdict_by_shape() -> None:
    from matcheck.report.svg import ChartRow

    rows = [
        ChartRow(f"v{n}", "ref", 10.0, 10.0 + n, 9.0, 11.0, status, status.value)
        for n, status in enumerate(Status)
    ]
    chart = dot_chart("Words", rows, "c1")
    assert chart.startswith('<svg class="chart" id="c1"')
    # One band and one hollow reference ring per row, and the verdicts' own shapes.
    assert chart.count('class="band"') == len(rows)
    assert chart.count('fill="none"') == len(rows)
    assert chart.count("<polygon") == 2  # differs (triangle), inconclusive (diamond)
    assert len(set(SHAPE_NAMES.values())) == len(Status)


def test_demo_pages_are_self_contained(tmp_path: Path) -> None:
    target = tmp_path / "report.html"
    assert main(["check", str(STUDY), "--format", "html", "-o", str(target)]) == 1
    page = target.read_text(encoding="utf-8")
    assert page.startswith("<!DOCTYPE html>")
    assert_self_contained(page)
    assert page.count('<svg class="chart"') >= 10
    assert 'id="grid-item-coverage"' in page  # the post-test coverage grid


def test_studies_page_keeps_ids_apart() -> None:
    report = _report()
    page = render_studies_html(
        [
            StudyResult("one/study.toml", report, None),
            StudyResult("two/study.toml", report, None),
            StudyResult("bad/study.toml", None, f"bad/study.toml: broken {HOSTILE}"),
        ]
    )
    ids = [attrs["id"] for _, attrs in _tags(page) if attrs.get("id")]
    assert len(ids) == len(set(ids))
    assert 'id="s1-f1"' in page and 'id="s2-f1"' in page
    assert "broken &lt;script&gt;" in page
    assert_self_contained(page)


@pytest.mark.parametrize("kind", [EvidenceKind.ITEM_TAUGHT, EvidenceKind.TERM_MISSING])
def test_evidence_that_is_not_a_passage_is_one_line(kind: EvidenceKind) -> None:
    page = render_html(_report(kinds=(kind,)))
    assert 'class="evidence brief"' in page
    assert 'class="side-by-side"' not in page


def test_measures_with_the_same_slug_get_different_ids() -> None:
    a, b = "A", "B"
    findings = tuple(
        Finding(name, Group.GROUPS, "points", a, b, Status.MATCHED, {a: 1.0, b: 1.0}, 0.0,
                Tolerance(absolute=1), "within tolerance")
        for name in ("pre test", "pre-test")
    )  # fmt: skip
    conditions = (Condition(a, (), "text", True), Condition(b, (), "text"))
    page = render_html(Report(conditions, a, (), findings))
    ids = [attrs["id"] for _, attrs in _tags(page) if attrs.get("id")]
    assert len(ids) == len(set(ids))
    assert 'id="chart-pre-test"' in page and 'id="chart-pre-test-2"' in page


def test_the_comparisons_own_marks_are_shown_as_changed_words() -> None:
    from matcheck.report.worddiff import marked_pair

    left, right = marked_pair("Pump to «4» bar < max", "Pump to «5» bar < max") or ("", "")
    assert left == 'Pump to <del class="changed" title="changed">4</del> bar &lt; max'
    assert right == 'Pump to <ins class="changed" title="changed">5</ins> bar &lt; max'
    assert marked_pair("no marks", "here either") is None
