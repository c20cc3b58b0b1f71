"""The methods-section equivalence table, in every format, read back and checked cell by cell.

The report comes from ``compare_versions`` on the demo lesson's three Markdown versions with
the figures declared as the manipulation. What each cell must say is known outside the
renderers: the counts by construction in fixtures/demo/expected.json (built from the source
data, not read back from the files), the planted confounds of fixtures/README.md, and the
Report's own values for the measured ones (formulas and readers are tested elsewhere). The
style rules (APA 7, ECMA-376, RFC 4180) and the reading rate are those of docs/references.md
§11, §14, §16 and §3.
"""

from __future__ import annotations

import csv
import dataclasses
import io
import json
import re
from pathlib import Path

import pytest

from matcheck.api import Version, compare_versions
from matcheck.errors import UsageError
from matcheck.findings import Finding, Group, Report, Status, Tolerance
from matcheck.output import write_output
from matcheck.report.common import format_value
from matcheck.report.methods import (
    MethodsTable,
    escape_latex,
    methods_table,
    render_csv,
    render_docx,
    render_latex,
    render_markdown,
    render_text,
)

FIXTURES = Path(__file__).resolve().parent.parent / "fixtures" / "demo"
EXPECTED = json.loads((FIXTURES / "expected.json").read_text(encoding="utf-8"))["versions"]
# Underscores in the names make the LaTeX escaping visible in every header.
NAMES = {
    "text_only": "text-only",
    "diagrams": "diagrams",
    "diagrams_confounded": "diagrams-confounded",
}
# The labels the table promises (issue 4 / the task brief), by measure id.
LABELS = {
    "words": "Words",
    "sentences": "Sentences",
    "paragraphs": "Paragraphs",
    "reading_time": "Reading time (min)",
    "flesch_reading_ease": "Flesch Reading Ease",
    "flesch_kincaid_grade": "Flesch–Kincaid grade",
    "words_per_sentence": "Words per sentence",
    "syllables_per_word": "Syllables per word",
    "rare_words_share": "Words not on the Dale–Chall list",
    "figures": "Figures",
    "figure_display_area": "Figure area (cm²)",
    "captions": "Captions",
    "headings": "Headings",
    "list_items": "List items",
    "tables": "Tables",
    "emphasized_words": "Emphasized words",
}
# Every version against the reference (compare's default pairing), one column each.
CONTRASTS = ["diagrams vs text_only", "diagrams_confounded vs text_only"]
GROUPS = ["Length", "Readability", "Content", "Figures", "Structure", "Signaling"]


@pytest.fixture(scope="module")
def report() -> Report:
    versions = [Version(name, (FIXTURES / f"{stem}.md",)) for name, stem in NAMES.items()]
    return compare_versions(versions, manipulated=("figures",))


@pytest.fixture(scope="module")
def table(report: Report) -> MethodsTable:
    return methods_table(report)


def value_of(report: Report, dimension: str, name: str) -> float | None:
    return next(
        f.values[name] for f in report.findings if f.dimension == dimension and name in f.values
    )


def expected_rows(report: Report) -> list[list[str]]:
    """Label and per-condition cells, computed from the Report without the module under test."""
    rows = []
    for dimension, label in LABELS.items():
        finding = next(f for f in report.findings if f.dimension == dimension)
        cells = [
            format_value(
                next(
                    f.values[n]
                    for f in report.findings
                    if f.dimension == dimension and n in f.values
                ),
                finding.unit,
                dimension,
            )
            for n in NAMES
        ]
        rows.append([label, *cells])
    # Coverage of the reference per version (the reference covers itself: 100%).
    coverage = {
        f.condition: f.values[f.condition] or 0.0
        for f in report.findings
        if f.dimension == "key_term_coverage"
    }
    rows.append(
        ["Key-term coverage", "100.0%", *(f"{coverage[n] * 100:.1f}%" for n in list(NAMES)[1:])]
    )
    # Passages removed + added against the reference; none for the reference itself.
    passages = {n: 0.0 for n in list(NAMES)[1:]}
    for f in report.findings:
        if f.dimension in ("passages_removed", "passages_added"):
            passages[f.condition] += f.difference or 0.0
    rows.append(
        ["Passages without counterpart", "—", *(f"{passages[n]:.0f}" for n in list(NAMES)[1:])]
    )
    return rows


def data_rows(table: MethodsTable) -> dict[str, list[str]]:
    return {row.label: [row.label, *row.values] for row in table.rows}


# --- the table ------------------------------------------------------------------------------


def test_rows_carry_the_reports_values(report: Report, table: MethodsTable) -> None:
    assert table.number == 1
    assert table.columns == tuple(NAMES)
    rows = data_rows(table)
    for expected in expected_rows(report):
        assert rows[expected[0]] == expected
    # Counts by construction (expected.json), independent of any reader or measure.
    for key, label in (
        ("words", "Words"),
        ("paragraphs", "Paragraphs"),
        ("figures", "Figures"),
        ("captions", "Captions"),
        ("list_items", "List items"),
        ("tables", "Tables"),
    ):
        assert rows[label][1:] == [f"{EXPECTED[stem][key]:,}" for stem in NAMES.values()], key
    assert rows["Headings"][1:] == [
        str(sum(EXPECTED[s]["headings"].values())) for s in NAMES.values()
    ]
    # Bold and italic never overlap in the demo, so emphasised words are their sum.
    assert rows["Emphasized words"][1:] == [
        str(EXPECTED[s]["bold_words"] + EXPECTED[s]["italic_words"]) for s in NAMES.values()
    ]
    # fixtures/README.md: the confounded version lost one paragraph (no counterpart in it).
    assert rows["Passages without counterpart"][1:] == ["—", "0", "1"]


def test_rows_are_grouped_in_report_order(table: MethodsTable) -> None:
    groups = [row.group_label for row in table.rows]
    assert list(dict.fromkeys(groups)) == GROUPS
    assert groups == sorted(groups, key=GROUPS.index)  # each group in one block
    assert [r.label for r in table.rows if r.group == "length"] == [
        "Words",
        "Sentences",
        "Paragraphs",
        "Reading time (min)",
    ]
    assert not any(r.group == "assessment" for r in table.rows)  # no post-test, no row


def test_verdicts_and_largest_differences(report: Report, table: MethodsTable) -> None:
    rows = {row.measure: row for row in table.rows}
    # The declared manipulation and what follows from it.
    # Manipulated in every contrast: never counted as a difference, each cell marked.
    assert rows["figures"].verdict == "manipulated"
    assert rows["captions"].verdict == "manipulated"
    assert rows["figures"].difference == "—"  # no unmanipulated contrast to take it from
    # fixtures/README.md: the planted confounds (shorter sentences, a removed paragraph).
    assert rows["words_per_sentence"].verdict == "no"
    assert rows["passages_without_counterpart"].verdict == "no"
    # The same by construction in all three versions.
    for measure in ("headings", "list_items", "tables"):
        assert rows[measure].verdict == "yes"
        assert rows[measure].difference == "0"
    assert rows["figures"].contrasts == ("+3†", "+3†")  # 0 -> 3 figures by construction
    # Words are judged relatively: 1,000 against 1,059 is −5.6%.
    assert rows["words"].difference == f"−{(1059 - 1000) / 1059 * 100:.1f}%"
    wps = [value_of(report, "words_per_sentence", n) for n in ("text_only", "diagrams_confounded")]
    assert wps[0] is not None and wps[1] is not None
    assert rows["words_per_sentence"].difference == f"−{wps[0] - wps[1]:.1f}"


def test_rows_without_findings_are_left_out(report: Report) -> None:
    only = tuple(f for f in report.findings if f.dimension in ("words", "figures"))
    table = methods_table(dataclasses.replace(report, findings=only))
    assert [row.label for row in table.rows] == ["Words", "Figures"]


def test_note_names_tolerances_rate_and_limits(report: Report, table: MethodsTable) -> None:
    note = table.note
    assert "Words ±5%" in note  # the default tolerance of words (compare/tolerances.py)
    assert "Flesch Reading Ease ±5 points" in note
    assert "Figures exact" not in note  # manipulated: no tolerance was applied
    # Brysbaert (2019): 238 words per minute, the default rate.
    assert "Reading time at 238 words per minute (Brysbaert, 2019)." in note
    assert note.endswith("Matched measures do not prove equivalence; see the full report.")
    slower = methods_table(dataclasses.replace(report, words_per_minute=200.0)).note
    assert "Reading time at 200 words per minute, the rate set for this study" in slower
    assert "238" in slower


def test_title_includes_the_study_title(report: Report, table: MethodsTable) -> None:
    assert table.title == "Equivalence of the Lesson Versions"
    titled = methods_table(dataclasses.replace(report, title="Patching tubes"))
    assert titled.title == "Equivalence of the Lesson Versions: Patching tubes"


def _item(name: str, reference: str, condition: str, shares: tuple[float, float]) -> Finding:
    taught = [share >= 0.6 for share in shares]
    return Finding(
        dimension="item_coverage",
        item=name,
        group=Group.ASSESSMENT,
        unit="share",
        reference=reference,
        condition=condition,
        status=Status.DIFFERS if taught[0] != taught[1] else Status.MATCHED,
        values={reference: shares[0], condition: shares[1]},
        difference=shares[1] - shares[0],
        tolerance=Tolerance(),
        reason="",
    )


def test_posttest_row_counts_items_taught(report: Report) -> None:
    # By construction: Q1 taught in both, Q2 exactly at the threshold in a (taught: the
    # assessment rule is share >= threshold), missing in b, Q3 taught in neither.
    items = (
        _item("Q1", "text_only", "diagrams", (0.9, 0.95)),
        _item("Q2", "text_only", "diagrams", (0.6, 0.2)),
        _item("Q3", "text_only", "diagrams", (0.3, 0.1)),
    )
    table = methods_table(dataclasses.replace(report, findings=(*report.findings, *items)))
    row = table.rows[-1]
    assert (row.group_label, row.label) == ("Assessment", "Post-test items taught")
    assert row.values == ("2", "1", "—")  # diagrams_confounded has no item finding
    assert (row.difference, row.verdict) == ("−1", "no")
    assert "of the 3 items" in table.note and "at least 60%" in table.note
    assert "Taught in no version: item Q3." in table.note
    stricter = methods_table(
        dataclasses.replace(report, findings=(*report.findings, *items)), coverage_threshold=0.95
    )
    assert stricter.rows[-1].values == ("0", "1", "—")


# --- DOCX -----------------------------------------------------------------------------------

W = "{http://schemas.openxmlformats.org/wordprocessingml/2006/main}"


def test_docx_is_an_apa_table(tmp_path: Path, report: Report, table: MethodsTable) -> None:
    import docx
    from docx.enum.text import WD_ALIGN_PARAGRAPH

    path = tmp_path / "table.docx"
    path.write_bytes(render_docx(table))
    document = docx.Document(str(path))
    first, second = document.paragraphs[0], document.paragraphs[1]
    # APA 7 (Publication Manual §7.10): number in bold, title in italics on the next line.
    assert first.text == "Table 1" and all(run.bold for run in first.runs)
    assert second.text == table.title and all(run.italic for run in second.runs)
    assert len(document.tables) == 1
    grid = document.tables[0]
    width = len(NAMES) + len(CONTRASTS) + 2
    header = [cell.text for cell in grid.rows[0].cells]
    assert header == ["Measure", *NAMES, *CONTRASTS, "Within tolerance"]
    cells = [[cell.text for cell in row.cells] for row in grid.rows[1:]]
    # Group spanners: one merged cell across the whole width, in italics.
    spanners = [row for row in cells if len(set(row)) == 1]
    assert [row[0] for row in spanners] == GROUPS
    body = {row[0]: row for row in cells if len(set(row)) > 1}
    assert len(body) == len(table.rows)
    for expected in expected_rows(report):
        assert body[expected[0]][: len(expected)] == expected
    for row in table.rows:
        assert body[row.label] == list(row.cells)
    # Numbers right-aligned, labels and verdicts left.
    words = next(r for r in grid.rows if r.cells[0].text == "Words")
    aligns = [cell.paragraphs[0].alignment for cell in words.cells]
    assert aligns[1:-1] == [WD_ALIGN_PARAGRAPH.RIGHT] * (width - 2)
    assert aligns[0] == aligns[-1] == WD_ALIGN_PARAGRAPH.LEFT
    # The note directly below: "Note." in italics, then the note.
    note = document.paragraphs[-1]
    assert note.text == f"Note. {table.note}"
    assert note.runs[0].text == "Note." and note.runs[0].italic
    assert not any(p.text.startswith("Note.") for p in document.paragraphs[:-1])


def test_docx_has_horizontal_rules_only(tmp_path: Path, table: MethodsTable) -> None:
    import docx

    path = tmp_path / "table.docx"
    path.write_bytes(render_docx(table))
    tbl = docx.Document(str(path)).tables[0]._tbl
    borders = tbl.find(f"{W}tblPr/{W}tblBorders")
    assert borders is not None
    rules = {child.tag.removeprefix(W): child.get(f"{W}val") for child in borders}
    # APA 7 §7.21: rules above and below the table and below the header; no vertical lines.
    assert rules["top"] == rules["bottom"] == "single"
    assert all(rules[side] in ("nil", "none") for side in ("left", "right", "insideV", "insideH"))
    for cell in tbl.iter(f"{W}tc"):
        for border in cell.iter(f"{W}tcBorders"):
            sides = {child.tag.removeprefix(W) for child in border}
            assert sides == {"bottom"}  # no cell adds a vertical line
    header = tbl.findall(f"{W}tr")[0]
    for cell in header.findall(f"{W}tc"):
        bottom = cell.find(f"{W}tcPr/{W}tcBorders/{W}bottom")
        assert bottom is not None and bottom.get(f"{W}val") == "single"
    assert tbl.findall(f".//{W}tcBorders") and len(tbl.findall(f".//{W}tcBorders")) == len(
        header.findall(f"{W}tc")
    )
    assert not list(tbl.iter(f"{W}shd"))  # no shading
    assert tbl.find(f"{W}tblPr/{W}tblStyle") is None  # no style that could add a grid
    # ECMA-376 Part 1 §17.4.60: w:tblBorders comes before w:tblLook in w:tblPr.
    order = [child.tag.removeprefix(W) for child in tbl.find(f"{W}tblPr")]
    assert order.index("tblBorders") < order.index("tblLook")


def test_docx_refuses_an_input_and_writes_atomically(tmp_path: Path, table: MethodsTable) -> None:
    lesson = tmp_path / "lesson.docx"
    lesson.write_bytes(b"the lesson")
    with pytest.raises(UsageError, match="one of the input files"):
        write_output(lesson, render_docx(table), inputs=[lesson])
    assert lesson.read_bytes() == b"the lesson"
    with pytest.raises(UsageError, match="does not exist"):
        write_output(tmp_path / "missing" / "t.docx", render_docx(table), inputs=[])
    target = tmp_path / "out.docx"
    target.write_bytes(b"old")
    write_output(target, render_docx(table), inputs=[lesson])
    assert target.read_bytes()[:2] == b"PK"  # a zip package (ECMA-376 Part 2) replaced it
    assert sorted(p.name for p in tmp_path.iterdir()) == ["lesson.docx", "out.docx"]


# --- CSV, LaTeX, Markdown, text --------------------------------------------------------------


def test_csv_parses_back_to_the_table(table: MethodsTable) -> None:
    rows = list(csv.reader(io.StringIO(render_csv(table))))
    assert rows[0] == ["Group", "Measure", *NAMES, *CONTRASTS, "Within tolerance"]
    assert rows[1:-1] == [[r.group_label, *r.cells] for r in table.rows]
    assert rows[-1][:2] == ["Note.", table.note]
    assert {len(row) for row in rows} == {len(rows[0])}  # rectangular, as RFC 4180 asks


# The LaTeX special characters (Lamport, "LaTeX: A Document Preparation System", 2nd ed.,
# §2.2.1: # $ % & ~ _ ^ \ { }) and the signs pdfLaTeX's utf8 input does not define.
UNESCAPE = [
    (r"\textbackslash{}", "\\"),
    (r"\textasciitilde{}", "~"),
    (r"\textasciicircum{}", "^"),
    (r"\textsuperscript{2}", "²"),
    # The cells' marks, as superscripts (\dag, \ddag: LaTeX kernel; \textdegree: textcomp,
    # part of the kernel since 2020, from memory).
    (r"\textsuperscript{*}", "*"),
    (r"\textsuperscript{\dag}", "†"),
    (r"\textsuperscript{\ddag}", "‡"),
    (r"\textsuperscript{\textdegree}", "°"),
    (r"$\alpha$", "α"),
    (r"$-$", "−"),
    (r"$\pm$", "±"),
    (r"$\geq$", "≥"),
    (r"$\leq$", "≤"),
    *((f"\\{c}", c) for c in "&%$#_{}"),
]


def unescape(text: str) -> str:
    pattern = "|".join(re.escape(escaped) for escaped, _ in UNESCAPE)
    return re.sub(pattern, lambda m: dict(UNESCAPE)[m.group(0)], text)


def test_latex_parses_back_to_the_table(table: MethodsTable) -> None:
    latex = render_latex(table)
    for command in (r"\toprule", r"\midrule", r"\bottomrule", r"\begin{table}", r"\end{table}"):
        assert command in latex
    assert r"text\_only & diagrams & diagrams\_confounded" in latex
    assert latex.count(r"\toprule") == latex.count(r"\bottomrule") == 1
    body = latex.split(r"\end{tabular}")[0].split(r"\begin{tabular}")[1]
    body = body.split("\n", 1)[1]  # drop the column spec
    for rule in (r"\toprule", r"\midrule", r"\bottomrule", r"\addlinespace"):
        body = body.replace(rule, "")
    lines = [line.strip() for line in body.split(r"\\") if line.strip()]
    parsed = [[unescape(c.strip()) for c in re.split(r"(?<!\\)&", line)] for line in lines]
    assert parsed[0] == ["Measure", *NAMES, *CONTRASTS, "Within tolerance"]
    groups = [row[0] for row in parsed if row[0].startswith(r"\multicolumn")]
    width = len(NAMES) + len(CONTRASTS) + 2
    assert groups == [rf"\multicolumn{{{width}}}{{@{{}}l}}{{\textit{{{g}}}}}" for g in GROUPS]
    data = [row for row in parsed[1:] if not row[0].startswith(r"\multicolumn")]
    assert data == [list(r.cells) for r in table.rows]
    # The caption; LaTeX itself numbers the float ("Table 1" as the first table).
    assert rf"\caption{{{table.title}}}" in latex
    assert r"\textit{Note.} " in latex and r"\footnotesize" in latex
    assert "\\par\n\\end{minipage}\n\\end{table}" in latex


def test_latex_escapes_every_special_character(report: Report) -> None:
    title = "Tubes & tyres: 100% #1 {fix}_a~b^c\\d $5"
    latex = render_latex(methods_table(dataclasses.replace(report, title=title)))
    expected = (
        r"Tubes \& tyres: 100\% \#1 \{fix\}\_a\textasciitilde{}b\textasciicircum{}c"
        r"\textbackslash{}d \$5"
    )
    assert rf"\caption{{Equivalence of the Lesson Versions: {expected}}}" in latex
    assert escape_latex("−5.6% ±1 ≥2 cm²") == r"$-$5.6\% $\pm$1 $\geq$2 cm\textsuperscript{2}"


def test_markdown_has_one_line_per_row(table: MethodsTable) -> None:
    markdown = render_markdown(table)
    lines = [line for line in markdown.splitlines() if line.startswith("|")]
    assert len(lines) == len(table.rows) + 2  # header and alignment row
    cells = [
        [md_unescape(c.strip()) for c in re.split(r"(?<!\\)\|", line.strip("|"))]
        for line in lines[2:]
    ]
    assert cells == [[r.group_label, *r.cells] for r in table.rows]
    assert markdown.startswith("**Table 1**\n\n*Equivalence of the Lesson Versions*\n")
    assert f"*Note.* {table.note}" in md_unescape(markdown)


def md_unescape(text: str) -> str:
    """CommonMark 0.31 §2.4: a backslash before ASCII punctuation stands for the character."""
    return re.sub(r"\\([!-/:-@\[-`{-~])", r"\1", text)


def test_text_names_what_matched_what_was_intended_and_what_differed(
    report: Report, table: MethodsTable
) -> None:
    text = render_text(table)
    assert text.startswith("The three versions (text_only, diagrams, and diagrams_confounded)")
    found = re.match(
        r"The three versions \(.*?\) were matched on (.*); they differed as the design intends "
        r"in (.*); "
        r"they differed beyond tolerance in (.*?)\. ",
        text,
    )
    assert found is not None, text
    matched, intended, differs = found.groups()
    figures = [EXPECTED[s]["figures"] for s in NAMES.values()]  # 0, 3, 3 by construction
    # Each difference names its contrast (compare pairs every version with the reference).
    assert (
        f"the number of figures ({figures[0]}, {figures[1]}, and {figures[2]}; "
        "diagrams vs text_only +3 and diagrams_confounded vs text_only +3)"
    ) in intended
    wps = [value_of(report, "words_per_sentence", n) for n in NAMES]
    assert wps[0] is not None and wps[2] is not None
    assert (
        f"words per sentence ({wps[0]:.1f}, {wps[1]:.1f}, and {wps[2]:.1f}; "
        f"diagrams_confounded vs text_only −{wps[0] - wps[2]:.1f})"
    ) in differs
    assert "the number of headings (7, 7, and 7)" in matched  # 1 + 5 + 1 by construction
    assert "words per sentence" not in matched and "figures" not in matched
    assert "(Brysbaert, 2019)" in text
