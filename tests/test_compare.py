"""`compare` on pairs built by construction: each planted change is caught in its group only.

The reference is the demo lesson's text-only Markdown version; each test derives a second
version from it by one edit whose effect is known by construction, and checks the groups of
the *root* findings that differ (echoes such as reading time following words are the same
confound and are counted once). Defaults are not tuned to these pairs: the lengths test
below runs the same checks on synthetic lessons from 300 to 20,000 words.
"""

from __future__ import annotations

import re
from pathlib import Path

import pytest

from matcheck.api import Version, compare_versions
from matcheck.findings import Report, Status

FIXTURES = Path(__file__).resolve().parent.parent / "fixtures" / "demo"
BASE = (FIXTURES / "text-only.md").read_text(encoding="utf-8")


def _report(
    tmp_path: Path, text: str, *, manipulated: tuple[str, ...] = (), base: str = BASE
) -> Report:
    (tmp_path / "images").mkdir(exist_ok=True)
    for image in (FIXTURES / "images").iterdir():
        (tmp_path / "images" / image.name).write_bytes(image.read_bytes())
    reference = tmp_path / "reference.md"
    variant = tmp_path / "variant.md"
    reference.write_text(base, encoding="utf-8")
    variant.write_text(text, encoding="utf-8")
    return compare_versions(
        [Version("reference", (reference,)), Version("variant", (variant,))],
        manipulated=manipulated,
    )


def differing_groups(report: Report) -> set[str]:
    return {f.group for f in report.root_findings(Status.DIFFERS)}


def differing(report: Report) -> set[str]:
    return {f.dimension for f in report.root_findings(Status.DIFFERS)}


def _paragraphs(text: str) -> list[str]:
    return text.split("\n\n")


def test_rewording_a_phrase_is_not_a_content_change(tmp_path: Path) -> None:
    # A phrase reworded with the same meaning, once in each of three paragraphs.
    text = (
        BASE.replace("about twenty minutes", "roughly a third of an hour")
        .replace("within a few months", "inside a few months")
        .replace("takes about five minutes", "takes roughly five minutes")
    )
    assert text != BASE
    report = _report(tmp_path, text)
    assert differing_groups(report) == set()


def test_identical_copy_is_matched(tmp_path: Path) -> None:
    report = _report(tmp_path, BASE)
    assert not report.differs
    assert all(f.status is Status.MATCHED for f in report.findings)


def test_paragraph_removed_is_content_and_located(tmp_path: Path) -> None:
    # By construction: the second paragraph of "Removing the Tyre" (51 words) is dropped.
    parts = _paragraphs(BASE)
    target = next(i for i, p in enumerate(parts) if p.startswith("Let out any air"))
    removed = parts.pop(target)
    report = _report(tmp_path, "\n\n".join(parts))
    assert "content" in differing_groups(report)
    assert differing_groups(report) <= {"content", "length"}
    finding = next(f for f in report.findings if f.dimension == "passages_removed")
    assert finding.status is Status.DIFFERS
    [evidence] = finding.evidence
    assert evidence.location is not None
    assert evidence.location.section == "Removing the Tyre"
    assert removed.startswith(evidence.text.split(" …")[0][:40])


def test_paragraph_replaced_by_another_subpoint_is_content_only(tmp_path: Path) -> None:
    # An equal-length paragraph on another sub-point (brakes instead of the bead).
    parts = _paragraphs(BASE)
    target = next(i for i, p in enumerate(parts) if p.startswith("Hook the scooped end"))
    old_words = len(parts[target].split())
    replacement = (
        "While the wheel is out, look at the brake blocks as well. Worn blocks have lost the "
        "grooves moulded into their faces, and grit pressed into the rubber scratches the rim "
        "every time you stop. Pick out any metal flakes with a small screwdriver, and fit new "
        "blocks when the grooves are nearly gone, then adjust the brake cable so that the new "
        "blocks meet the rim squarely."
    )
    assert abs(len(replacement.split()) - old_words) <= 3
    parts[target] = replacement
    report = _report(tmp_path, "\n\n".join(parts))
    assert differing_groups(report) == {"content"}
    # The replaced paragraph is located: its excerpt is shown in a passage finding.
    excerpts = [
        e.text
        for f in report.root_findings(Status.DIFFERS)
        if f.dimension.startswith("passages_")
        for e in f.evidence
    ]
    assert any(text.startswith("Hook the scooped end") for text in excerpts)


def _join_sentences(paragraph: str) -> str:
    """Join every two sentences of a prose paragraph with ', and' (same words, longer sentences)."""
    if paragraph.startswith(("#", "-", "|", "1.", "!")):
        return paragraph
    sentences = re.split(r"(?<=\.) ", paragraph)
    joined = []
    for i in range(0, len(sentences), 2):
        pair = sentences[i : i + 2]
        if len(pair) == 2:
            first = pair[0].rstrip(".")
            second = pair[1][0].lower() + pair[1][1:]
            joined.append(f"{first}, and {second}")
        else:
            joined.append(pair[0])
    return " ".join(joined)


def test_longer_sentences_are_readability_only(tmp_path: Path) -> None:
    text = "\n\n".join(_join_sentences(p) for p in _paragraphs(BASE))
    report = _report(tmp_path, text)
    assert differing_groups(report) == {"readability"}
    assert "words_per_sentence" in differing(report)
    sentences = next(f for f in report.findings if f.dimension == "sentences")
    assert sentences.caused_by == "words_per_sentence"


def test_padding_by_a_quarter_is_length_only(tmp_path: Path) -> None:
    # Padding by redundancy: prose paragraphs restate their first sentences (without the
    # emphasis marks, so no new signals) until the lesson is ~25% longer. New vocabulary
    # would change the content and lexical diversity too, which is then not padding alone.
    parts = _paragraphs(BASE)
    base_words = len(BASE.split())
    added = 0
    for i, part in enumerate(parts):
        if part[0].isalpha() and added < 0.25 * base_words:
            sentences = re.split(r"(?<=\.) ", part)
            restated = " ".join(sentences[: max(1, len(sentences) // 2)]).replace("**", "")
            restated = restated.replace("_", "")
            parts[i] = f"{part} {restated}"
            added += len(restated.split())
    assert 0.23 < added / base_words < 0.28
    report = _report(tmp_path, "\n\n".join(parts))
    assert differing_groups(report) == {"length"}
    words = next(f for f in report.findings if f.dimension == "words")
    assert words.status is Status.DIFFERS
    assert words.relative_difference == pytest.approx(0.25, abs=0.03)
    assert any(e.kind == "text_added" for e in words.evidence)


def test_extra_figure_is_figures_only(tmp_path: Path) -> None:
    parts = _paragraphs(BASE)
    target = next(i for i, p in enumerate(parts) if p.startswith("## Know Your Valve"))
    parts.insert(target + 1, "![Three valve types side by side](images/valve-types.png)")
    report = _report(tmp_path, "\n\n".join(parts))
    assert differing_groups(report) == {"figures"}
    figures = next(f for f in report.findings if f.dimension == "figures")
    assert figures.values == {"reference": 0.0, "variant": 1.0}
    assert figures.evidence and figures.evidence[0].location is not None


def test_extra_figure_is_intended_when_figures_are_manipulated(tmp_path: Path) -> None:
    text = BASE.replace(
        "## Know Your Valve\n",
        "## Know Your Valve\n\n![Valve types](images/valve-types.png)\n\n"
        "Figure 1. The three valve types.\n",
    )
    report = _report(tmp_path, text, manipulated=("figures",))
    assert not report.differs
    statuses = {f.dimension: f.status for f in report.findings if f.group == "figures"}
    assert statuses["figures"] is Status.INTENDED
    assert statuses["captions"] is Status.INTENDED


def test_eight_extra_bold_terms_are_signaling_only(tmp_path: Path) -> None:
    terms = ["thorn", "kerb", "saddle", "sandpaper", "chalk", "sprocket", "spoke", "sidewall"]
    text = BASE
    for term in terms:
        text = re.sub(rf"(?<![\w*]){term}(?![\w*])", f"**{term}**", text, count=1)
    assert text.count("**") == BASE.count("**") + 16
    report = _report(tmp_path, text)
    assert differing_groups(report) == {"signaling"}
    emphasized = next(f for f in report.findings if f.dimension == "emphasized_words")
    assert emphasized.difference == 8
    added = {e.text for e in emphasized.evidence if e.kind == "emphasis_added"}
    assert added == set(terms)


def test_headings_removed_are_structure_only(tmp_path: Path) -> None:
    lines = [
        line
        for line in BASE.splitlines()
        if line not in ("## Tools and Materials", "## Know Your Valve", "### Applying the Patch")
    ]
    report = _report(tmp_path, "\n".join(lines))
    assert differing_groups(report) == {"structure"}
    headings = next(f for f in report.findings if f.dimension == "headings")
    assert headings.difference == -3
    assert {e.text for e in headings.evidence} == {
        "Tools and Materials",
        "Know Your Valve",
        "Applying the Patch",
    }


def test_list_turned_into_prose_is_structure_only(tmp_path: Path) -> None:
    # The six numbered steps (full sentences) become one paragraph with the same sentences.
    steps = re.findall(r"^\d\. (.+)$", BASE, flags=re.MULTILINE)
    assert len(steps) == 6
    block = "\n".join(f"{n}. {s}" for n, s in enumerate(steps, 1))
    assert block in BASE
    report = _report(tmp_path, BASE.replace(block, " ".join(steps)))
    assert differing_groups(report) == {"structure"}
    paragraphs = next(f for f in report.findings if f.dimension == "paragraphs")
    assert paragraphs.status is Status.MATCHED or paragraphs.caused_by == "list_items"


def test_clean_demo_pair_exits_zero_and_confounded_pair_is_located() -> None:
    clean = compare_versions(
        [
            Version("text-only", (FIXTURES / "text-only.md",)),
            Version("diagrams", (FIXTURES / "diagrams.md",)),
        ],
        manipulated=("figures",),
    )
    assert not clean.differs
    confounded = compare_versions(
        [
            Version("text-only", (FIXTURES / "text-only.md",)),
            Version("confounded", (FIXTURES / "diagrams-confounded.md",)),
        ],
        manipulated=("figures",),
    )
    assert {"passages_removed", "words_per_sentence"} <= differing(confounded)
    removed = next(f for f in confounded.findings if f.dimension == "passages_removed")
    assert removed.evidence[0].location is not None
    assert removed.evidence[0].location.section == "Removing the Tyre"
    wps = next(f for f in confounded.findings if f.dimension == "words_per_sentence")
    assert any("Refitting and Inflating" in e.text for e in wps.evidence)


def test_three_versions_give_a_spread() -> None:
    report = compare_versions(
        [
            Version("text-only", (FIXTURES / "text-only.md",)),
            Version("diagrams", (FIXTURES / "diagrams.md",)),
            Version("confounded", (FIXTURES / "diagrams-confounded.md",)),
        ],
        manipulated=("figures",),
    )
    assert {f.condition for f in report.findings} == {"diagrams", "confounded"}
    spread = {s.dimension: s for s in report.spreads}
    assert spread["words"].minimum == 1000 and spread["words"].maximum == 1059
    assert spread["words"].status is Status.DIFFERS


def test_tolerance_override_changes_the_verdict(tmp_path: Path) -> None:
    text = "\n\n".join(_join_sentences(p) for p in _paragraphs(BASE))
    (tmp_path / "a.md").write_text(BASE, encoding="utf-8")
    (tmp_path / "b.md").write_text(text, encoding="utf-8")
    versions = [Version("a", (tmp_path / "a.md",)), Version("b", (tmp_path / "b.md",))]
    strict = compare_versions(versions)
    loose = compare_versions(
        versions,
        tolerance_overrides=[
            "words_per_sentence=100",
            "sentences=90%",
            "flesch_reading_ease=100",
            "gunning_fog=20",
            "flesch_kincaid_grade=20",
            "automated_readability=20",
            "coleman_liau=20",
            "smog=20",
            "dale_chall=20",
        ],
    )
    assert strict.differs
    assert "words_per_sentence" not in differing(loose)


@pytest.mark.parametrize("version", ["text-only", "diagrams", "diagrams-confounded"])
def test_same_lesson_in_docx_pdf_and_markdown_is_matched(version: str) -> None:
    # The three formats are rendered from one source (scripts/build_fixtures.py): page
    # numbers, running headers, line breaks and the PDF's lack of table markup are not content.
    report = compare_versions(
        [
            Version("docx", (FIXTURES / f"{version}.docx",)),
            Version("pdf", (FIXTURES / f"{version}.pdf",)),
            Version("markdown", (FIXTURES / f"{version}.md",)),
        ]
    )
    assert not report.differs, differing(report)
    unknown = {f.dimension for f in report.findings if f.status is Status.INCONCLUSIVE}
    # Only what a format cannot show: PDF underline and highlight, Markdown display sizes.
    assert unknown <= {"underline_words", "highlight_words", "figure_display_area"}


def test_plain_text_copy_is_not_a_structure_or_signaling_difference(tmp_path: Path) -> None:
    # Plain text has no markup: its headings, lists and emphasis are unknown, not zero.
    plain = "\n\n".join(
        p.lstrip("#").strip().replace("**", "").replace("_", "")
        for p in BASE.split("\n\n")
        if not p.startswith(("|", "- ", "1."))
    )
    (tmp_path / "lesson.txt").write_text(plain, encoding="utf-8")
    (tmp_path / "lesson.md").write_text(BASE, encoding="utf-8")
    report = compare_versions(
        [Version("md", (tmp_path / "lesson.md",)), Version("txt", (tmp_path / "lesson.txt",))]
    )
    statuses = {f.dimension: f.status for f in report.findings}
    for dimension in ("headings", "lists", "list_items", "tables", "emphasized_words"):
        assert statuses[dimension] is Status.INCONCLUSIVE
