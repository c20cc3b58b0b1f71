"""The methods table names the contrast of every number, never counts the manipulation as a
difference, and leaves out no difference the full report names (issue 20).

The reports here are built by hand, so every status and value is known by construction; the
equivalence test is checked against statsmodels' ``ttost_ind`` (Schuirmann 1987, Welch
variant; docs/references.md §5) on sentences whose lengths are set by construction.
"""

from __future__ import annotations

import csv
import dataclasses
import io
import re
from pathlib import Path

from matcheck.api import Version, compare_versions
from matcheck.findings import (
    Accepted,
    Condition,
    Evidence,
    EvidenceKind,
    Finding,
    Group,
    Pairing,
    Report,
    Status,
    Tolerance,
)
from matcheck.model import Location
from matcheck.report.methods import (
    methods_table,
    render_csv,
    render_docx,
    render_latex,
    render_markdown,
    render_text,
)


def md_unescape(text: str) -> str:
    """CommonMark 0.31 §2.4: a backslash before ASCII punctuation stands for the character."""
    return re.sub(r"\\([!-/:-@\[-`{-~])", r"\1", text)


PAIRS = (
    Pairing("plain", "figured", ("figures",), "figures"),
    Pairing("plain", "trimmed", (), None),
)
CUT = Location(block=7, section="Bleeding the Radiator", paragraph=4)


def _finding(
    dimension: str,
    group: Group,
    unit: str,
    pair: Pairing,
    status: Status,
    values: tuple[float, float],
    tolerance: Tolerance,
    **extra: object,
) -> Finding:
    return Finding(
        dimension=dimension,
        group=group,
        unit=unit,
        reference=pair.reference,
        condition=pair.condition,
        status=status,
        values={pair.reference: values[0], pair.condition: values[1]},
        difference=values[1] - values[0],
        tolerance=tolerance,
        reason=str(extra.pop("reason", "")),
        **extra,  # type: ignore[arg-type]
    )


def _report(*more: Finding) -> Report:
    figured, trimmed = PAIRS
    words = Tolerance(relative=0.05)
    findings = (
        _finding(
            "figures", Group.FIGURES, "figures", figured, Status.INTENDED, (0, 2), Tolerance()
        ),
        _finding("figures", Group.FIGURES, "figures", trimmed, Status.MATCHED, (0, 0), Tolerance()),
        _finding("words", Group.LENGTH, "words", figured, Status.MATCHED, (500, 510), words),
        _finding("words", Group.LENGTH, "words", trimmed, Status.DIFFERS, (500, 450), words),
        # A sentence cut from a matched passage (content compare), located in "plain".
        _finding(
            "text_removed",
            Group.CONTENT,
            "runs",
            trimmed,
            Status.DIFFERS,
            (0, 1),
            Tolerance(),
            evidence=(
                Evidence(
                    EvidenceKind.TEXT_REMOVED,
                    "plain",
                    "Close the valve before you open the bleed screw.",
                    CUT,
                ),
            ),
        ),
        *more,
    )
    conditions = tuple(
        Condition(name, (f"{name}.md",), "markdown", name == "plain")
        for name in ("plain", "figured", "trimmed")
    )
    return Report(conditions, "plain", (), findings, pairings=PAIRS, title="Heat pumps")


def test_each_contrast_has_a_column_and_the_manipulation_is_not_a_difference() -> None:
    table = methods_table(_report())
    assert table.header[-3:] == ("figured vs plain", "trimmed vs plain", "Within tolerance")
    rows = {row.measure: row for row in table.rows}
    # Manipulated in one contrast, equal in the other: the row is judged on the other only.
    assert rows["figures"].contrasts == ("+2†", "0")
    assert (rows["figures"].verdict, rows["figures"].difference) == ("yes", "0")
    # Words: 450 against 500 is −10.0% in the unmanipulated contrast, beyond ±5%.
    assert rows["words"].contrasts == ("+2.0%", "−10.0%*")
    assert (rows["words"].verdict, rows["words"].difference) == ("no", "−10.0%")
    note = table.note
    assert "figured vs plain (figures; manipulates figures)" in note
    assert "trimmed vs plain (no manipulation declared)" in note
    # "trimmed vs plain" is trimmed minus plain: 450 − 500 words is negative, as the cell says.
    assert "Each contrast column gives the first version named minus the second" in note
    assert "† the design manipulates the measure in this contrast (not a difference)" in note


def test_a_cut_sentence_without_a_row_is_named_with_its_place() -> None:
    table = methods_table(_report())
    assert "text_removed" not in {row.measure for row in table.rows}
    expected = (
        "Also beyond tolerance, with no row in this table: Text removed (trimmed vs plain 1, "
        "in plain at § Bleeding the Radiator, paragraph 4)."
    )
    assert expected in table.note
    assert expected.replace("this table", "Table 1") in render_text(table)


def test_every_renderer_shows_the_same_cells_and_note() -> None:
    import docx

    table = methods_table(_report())
    markdown = md_unescape(render_markdown(table))
    rows = list(csv.reader(io.StringIO(render_csv(table))))
    latex = render_latex(table)
    document = docx.Document(io.BytesIO(render_docx(table)))
    grid = document.tables[0]
    for row in table.rows:
        assert "| " + " | ".join((row.group_label, *row.cells)) + " |" in markdown
        assert [row.group_label, *row.cells] in rows
        assert [c.text for c in grid.rows[0].cells] == list(table.header)
        assert list(row.cells) in [[c.text for c in r.cells] for r in grid.rows]
    assert rows[-1][1] == table.note
    assert f"*Note.* {table.note}" in markdown
    assert document.paragraphs[-1].text == f"Note. {table.note}"
    assert r"trimmed vs plain 1, in plain at \S{}" not in latex  # § is plain UTF-8 text
    assert "Text removed (trimmed vs plain 1, in plain at § Bleeding the Radiator" in latex
    assert r"$-$10.0\%\textsuperscript{*}" in latex


def test_inconclusive_is_kept_apart_from_the_differences() -> None:
    figured = PAIRS[0]
    underline = _finding(
        "underline_words",
        Group.SIGNALING,
        "words",
        figured,
        Status.INCONCLUSIVE,
        (0, 0),
        Tolerance(),
        reason="not measurable in every version",
    )
    object.__setattr__(underline, "values", {"plain": 0.0, "figured": None})
    object.__setattr__(underline, "difference", None)
    table = methods_table(_report(underline))
    text = render_text(table)
    assert (
        "Not compared conclusively (not counted as differences): Underline words "
        "(figured vs plain: not measurable in every version)."
    ) in text
    assert "beyond tolerance in" in text and "underline" not in text.split("Also beyond")[0]


def test_an_accepted_difference_is_marked_and_listed_with_its_reason() -> None:
    trimmed = PAIRS[1]
    entry = Accepted(1, "paragraphs", -2, "two short paragraphs were merged", by="R. Okafor")
    paragraphs = _finding(
        "paragraphs",
        Group.LENGTH,
        "paragraphs",
        trimmed,
        Status.ACCEPTED,
        (16, 14),
        Tolerance(relative=0.1, absolute=1),
        accepted=entry,
    )
    table = methods_table(_report(paragraphs))
    row = next(r for r in table.rows if r.measure == "paragraphs")
    # 14 against 16 is −12.5% (relative tolerance); accepted, so not a "no".
    assert (row.contrasts, row.verdict) == (("—", "−12.5%‡"), "accepted")
    assert "‡ beyond tolerance, accepted after review" in table.note
    (listed,) = table.accepted
    assert listed.comparison == "trimmed vs plain"
    assert "Reason: two short paragraphs were merged (R. Okafor)" in listed.sentence
    text = render_text(table)
    assert "Accepted differences and their reasons: Paragraphs, trimmed vs plain" in text
    assert "paragraphs" not in text.split("differed beyond tolerance in")[1].split(".")[0]


# --- the equivalence test behind "matched" ----------------------------------------------------

WORDS = [
    "warm",
    "air",
    "moves",
    "through",
    "the",
    "duct",
    "and",
    "the",
    "fan",
    "keeps",
    "the",
    "room",
    "even",
    "all",
    "day",
    "long",
]


def _sentences(lengths: list[int]) -> str:
    return " ".join(" ".join(WORDS[:n]).capitalize() + "." for n in lengths) + "\n"


def test_the_tost_behind_a_matched_row_is_reported(tmp_path: Path) -> None:
    from statsmodels.stats.weightstats import ttost_ind

    # Sentence lengths by construction: b lengthens three sentences of a by one word.
    a = [6, 8, 9, 10, 11, 12, 13, 14, 9, 10, 11, 12]
    b = [7, 9, 10, 10, 11, 12, 13, 14, 9, 10, 11, 12]
    (tmp_path / "a.md").write_text(_sentences(a), encoding="utf-8")
    (tmp_path / "b.md").write_text(_sentences(b), encoding="utf-8")
    report = compare_versions(
        [Version("a", (tmp_path / "a.md",)), Version("b", (tmp_path / "b.md",))]
    )
    wps = next(f for f in report.findings if f.dimension == "words_per_sentence")
    assert wps.status is Status.MATCHED and wps.values == {"a": sum(a) / 12, "b": sum(b) / 12}
    bound = 2.5  # the default tolerance of words per sentence (absolute, words)
    reference_p = ttost_ind(b, a, -bound, bound, usevar="unequal")[0]
    table = methods_table(report)
    expected = (
        f"Words per sentence, b vs a: TOST (Welch), equivalence bounds ±2.50 words, "
        f"p {'< .001' if reference_p < 0.001 else f'= {reference_p:.3f}'.replace('0.', '.')} "
        "(equivalent at α = 0.05)"
    )
    assert table.equivalence == (expected,)
    assert f"Equivalence tests: {expected}." in table.note
    assert f"Equivalence tests: {expected}." in render_text(table)


def test_an_item_covered_less_though_still_taught_is_named() -> None:
    # The example: an item answered by a table, coverage 0.78 -> 0.60 when the table
    # was dropped; both reach the 0.60 threshold, but the 18-point drop is beyond the
    # 15-point tolerance (ITEM_COVERAGE), so the pair differs on that item.
    trimmed = PAIRS[1]
    item = _finding(
        "item_coverage",
        Group.ASSESSMENT,
        "share",
        trimmed,
        Status.DIFFERS,
        (0.78, 0.60),
        Tolerance(absolute=0.15),
        item="Q4",
        reason="Q4 is covered 78% in plain but 60% in trimmed: taught differently",
    )
    table = methods_table(_report(item))
    row = next(r for r in table.rows if r.measure == "posttest_items_taught")
    assert row.values == ("1", "—", "1")  # taught in both: the count does not move
    assert (row.contrasts, row.verdict) == (("—", "0*"), "no")
    assert (
        "Post-test items taught differently: Post-test item Q4 (trimmed vs plain −18.0%: "
        "Q4 is covered 78% in plain but 60% in trimmed: taught differently)."
    ) in table.note


def test_every_difference_check_reports_has_a_row_or_a_note() -> None:
    # The demo study (fixtures/README.md): a planted confound in diagrams-bold. Whatever
    # `check` reports as beyond tolerance in the materials or the learners' exposure must be
    # in a row (marked *) or named in the note with its contrast; the design's power and the
    # outcome have their own paragraphs.
    from matcheck.api import check_study
    from matcheck.report.methods.mentions import label_of
    from matcheck.study import load_study

    fixtures = Path(__file__).resolve().parent.parent / "fixtures" / "demo"
    study = load_study(fixtures / "study.toml")
    report = check_study(study)
    table = methods_table(report, coverage_threshold=study.coverage_threshold)
    rows = {row.measure: row for row in table.rows}
    headers = [c.header for c in table.contrasts]
    differences = [
        f
        for f in report.findings
        if f.status is Status.DIFFERS and f.group not in (Group.DESIGN, Group.OUTCOME)
    ]
    assert differences  # the planted confound
    for finding in differences:
        contrast = f"{finding.condition} vs {finding.reference}"
        row = rows.get(finding.dimension)
        if row is None and finding.dimension in ("passages_removed", "passages_added"):
            row = rows["passages_without_counterpart"]
        if row is not None and not finding.item:
            assert row.statuses[headers.index(contrast)] == "differs", finding.key
        else:
            label = label_of(finding)
            assert re.search(rf"{re.escape(label)}[^(]*\([^)]*{re.escape(contrast)}", table.note), (
                finding.key
            )


def test_a_wide_word_table_is_on_a_landscape_page() -> None:
    import docx
    from docx.enum.section import WD_ORIENT

    narrow = methods_table(_report())  # 3 conditions + 2 contrasts + 2 = 7 columns
    assert len(narrow.header) == 7
    section = docx.Document(io.BytesIO(render_docx(narrow))).sections[0]
    assert section.orientation == WD_ORIENT.PORTRAIT
    wide = dataclasses.replace(narrow, columns=(*narrow.columns, "x", "y"))
    wide = dataclasses.replace(
        wide, rows=tuple(dataclasses.replace(r, values=(*r.values, "—", "—")) for r in narrow.rows)
    )
    section = docx.Document(io.BytesIO(render_docx(wide))).sections[0]
    assert section.orientation == WD_ORIENT.LANDSCAPE
    assert section.page_width is not None and section.page_height is not None
    assert section.page_width > section.page_height


def test_a_content_row_that_differs_is_located_in_the_note() -> None:
    # A passage removed has a row (passages without counterpart); the note still says where.
    removed = _finding(
        "passages_removed",
        Group.CONTENT,
        "passages",
        PAIRS[1],
        Status.DIFFERS,
        (0, 1),
        Tolerance(),
        evidence=(Evidence(EvidenceKind.PASSAGE_REMOVED, "plain", "Open the bleed screw.", CUT),),
    )
    table = methods_table(_report(removed))
    row = next(r for r in table.rows if r.measure == "passages_without_counterpart")
    assert row.contrasts == ("—", "1*")
    assert (
        "Where the content differs: Passages removed (trimmed vs plain 1, in plain at "
        "§ Bleeding the Radiator, paragraph 4)."
    ) in table.note


def test_a_wide_latex_table_is_set_smaller_inside_its_float() -> None:
    narrow = methods_table(_report())  # 7 columns
    assert "\\small\n" not in render_latex(narrow)  # not \\smallskip
    wide = dataclasses.replace(narrow, columns=(*narrow.columns, "x", "y"))
    wide = dataclasses.replace(
        wide, rows=tuple(dataclasses.replace(r, values=(*r.values, "—", "—")) for r in wide.rows)
    )
    latex = render_latex(wide)
    # Inside the table float (a group in LaTeX), so the setting ends with \end{table}.
    head = latex.split(r"\begin{tabular}")[0]
    assert head.index(r"\begin{table}") < head.index(r"\small")
    assert r"\setlength{\tabcolsep}{3pt}" in head
