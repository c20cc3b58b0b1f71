"""The equivalence table for a methods section: one row per measure, one column per condition.

:func:`methods_table` turns a :class:`~matcheck.findings.Report` into a :class:`MethodsTable`
of formatted strings; every renderer below only lays those strings out, so Markdown, CSV,
LaTeX, Word and the prose paragraph always show the same numbers. Reporting standards for
experiments ask authors to describe each condition's materials and how they were made
equivalent; the Word output follows the table style of APA 7 (number in bold, title in
italics, horizontal rules only, a note below).
"""

from __future__ import annotations

import csv
import io
from collections.abc import Sequence
from dataclasses import dataclass
from typing import TYPE_CHECKING

from matcheck.findings import Finding, Report, Status
from matcheck.report.common import GROUP_ORDER, format_difference, format_tolerance, format_value
from matcheck.report.formatter import RenderOptions
from matcheck.settings import DEFAULT_WPM

if TYPE_CHECKING:
    from docx.table import Table as DocxTable
    from docx.table import _Cell

TITLE = "Equivalence of the Lesson Versions"
NOT_PROOF = "Matched measures do not prove equivalence; see the full report."

VERDICTS = {
    Status.MATCHED: "yes",
    Status.DIFFERS: "no",
    Status.INTENDED: "intended",
    Status.INCONCLUSIVE: "n/a",
}
# One row's verdict is its worst finding's: any pair beyond tolerance makes the row "no".
_WORST_FIRST = (Status.DIFFERS, Status.INCONCLUSIVE, Status.INTENDED, Status.MATCHED)

COVERAGE = "key_term_coverage"
PASSAGES = "passages_without_counterpart"
POSTTEST = "posttest_items_taught"


@dataclass(frozen=True, slots=True)
class _Measure:
    """A row the table can show: its measure, label, and how the prose paragraph names it."""

    key: str
    group: str
    label: str
    phrase: str
    suffix: str = ""


MEASURES = (
    _Measure("words", "length", "Words", "length", " words"),
    _Measure("sentences", "length", "Sentences", "the number of sentences"),
    _Measure("paragraphs", "length", "Paragraphs", "the number of paragraphs"),
    _Measure("reading_time", "length", "Reading time (min)", "estimated reading time", " min"),
    _Measure("flesch_reading_ease", "readability", "Flesch Reading Ease", "Flesch Reading Ease"),
    _Measure(
        "flesch_kincaid_grade", "readability", "Flesch–Kincaid grade", "Flesch–Kincaid grade level"
    ),
    _Measure("words_per_sentence", "readability", "Words per sentence", "words per sentence"),
    _Measure("syllables_per_word", "readability", "Syllables per word", "syllables per word"),
    _Measure(
        "rare_words_share",
        "readability",
        "Words not on the Dale–Chall list",
        "the share of words not on the Dale–Chall list",
    ),
    _Measure(COVERAGE, "content", "Key-term coverage", "key-term coverage"),
    _Measure(PASSAGES, "content", "Passages without counterpart", "passages without a counterpart"),
    _Measure("figures", "figures", "Figures", "the number of figures"),
    _Measure("figure_display_area", "figures", "Figure area (cm²)", "figure area", " cm²"),
    _Measure("captions", "figures", "Captions", "the number of captions"),
    _Measure("headings", "structure", "Headings", "the number of headings"),
    _Measure("list_items", "structure", "List items", "the number of list items"),
    _Measure("tables", "structure", "Tables", "the number of tables"),
    _Measure("emphasized_words", "signaling", "Emphasized words", "the number of emphasized words"),
    _Measure(
        POSTTEST, "assessment", "Post-test items taught", "the number of post-test items taught"
    ),
)
_BY_KEY = {measure.key: measure for measure in MEASURES}


@dataclass(frozen=True, slots=True)
class MethodsRow:
    """One measure: its value in each condition, the largest difference and the verdict.

    ``measure`` is the measure id, or ``passages_without_counterpart`` /
    ``posttest_items_taught`` for the two rows made from several findings. ``verdict`` is
    ``yes`` (within tolerance), ``no`` (differs), ``intended`` or ``n/a`` (inconclusive).
    """

    group: str
    measure: str
    label: str
    values: tuple[str, ...]
    difference: str
    verdict: str
    tolerance: str = ""

    @property
    def group_label(self) -> str:
        return self.group.capitalize()


@dataclass(frozen=True, slots=True)
class MethodsTable:
    number: int
    title: str
    columns: tuple[str, ...]
    rows: tuple[MethodsRow, ...]
    notes: tuple[str, ...]
    words_per_minute: float = DEFAULT_WPM

    @property
    def note(self) -> str:
        return " ".join(self.notes)

    @property
    def header(self) -> tuple[str, ...]:
        return ("Measure", *self.columns, "Largest difference", "Within tolerance")

    def groups(self) -> list[tuple[str, tuple[MethodsRow, ...]]]:
        """The rows by group, in report order (group ids)."""
        seen = dict.fromkeys(row.group for row in self.rows)
        return [(group, tuple(r for r in self.rows if r.group == group)) for group in seen]


# --- building ------------------------------------------------------------------------------


def methods_table(
    report: Report, *, number: int = 1, coverage_threshold: float | None = None
) -> MethodsTable:
    """The equivalence table of ``report``; rows whose measure no finding has are left out.

    ``coverage_threshold`` is the coverage at which a version teaches a post-test item: pass
    the study's ``posttest.coverage_threshold``, since the report does not record it; the
    default is the one :mod:`matcheck.compare.assessment` uses.
    """
    columns = tuple(condition.name for condition in report.conditions)
    by_dimension: dict[str, list[Finding]] = {}
    for finding in report.findings:
        by_dimension.setdefault(finding.dimension, []).append(finding)
    items = [f for f in report.findings if f.item is not None]
    threshold = coverage_threshold
    if threshold is None and items:
        threshold = report.settings.coverage_threshold
    rows: list[MethodsRow] = []
    for measure in MEASURES:
        row: MethodsRow | None
        if measure.key == COVERAGE:
            row = _coverage_row(measure, by_dimension.get(COVERAGE, []), columns, report.reference)
        elif measure.key == PASSAGES:
            found = by_dimension.get("passages_removed", []) + by_dimension.get(
                "passages_added", []
            )
            row = _passages_row(measure, found, columns)
        elif measure.key == POSTTEST:
            row = _posttest_row(measure, items, columns, report, threshold)
        else:
            row = _measure_row(measure, by_dimension.get(measure.key, []), columns)
        if row is not None:
            rows.append(row)
    rows.sort(key=lambda r: GROUP_ORDER.index(r.group))  # stable: catalogue order inside
    title = f"{TITLE}: {report.title}" if report.title else TITLE
    notes = _notes(rows, report.words_per_minute, _untaught(items, threshold or 1.0))
    return MethodsTable(number, title, columns, tuple(rows), notes, report.words_per_minute)


def _verdict(findings: Sequence[Finding]) -> str:
    statuses = {finding.status for finding in findings}
    return VERDICTS[next(status for status in _WORST_FIRST if status in statuses)]


def _tolerance(findings: Sequence[Finding]) -> str:
    """The tolerance applied (not the one of a manipulated measure, which is not judged)."""
    judged = [f for f in findings if f.status is not Status.INTENDED and f.tolerance is not None]
    return format_tolerance(judged[0]) if judged else ""


def _signed(number: float, text: str) -> str:
    return f"+{text}" if number > 0 else f"−{text}" if number < 0 else text


def _size(finding: Finding) -> float:
    """How large a difference is: relative where the tolerance is relative (as it is judged)."""
    relative = finding.relative_difference
    if finding.tolerance is not None and finding.tolerance.relative and relative is not None:
        return abs(relative)
    return -1.0 if finding.difference is None else abs(finding.difference)


def _measure_row(
    measure: _Measure, findings: Sequence[Finding], columns: Sequence[str]
) -> MethodsRow | None:
    if not findings:
        return None
    first = findings[0]
    values = []
    for name in columns:
        value = next((f.values[name] for f in findings if name in f.values), None)
        values.append(format_value(value, first.unit, first.dimension))
    largest = max(findings, key=_size)
    if largest.difference == 0:
        relative = largest.tolerance is not None and bool(largest.tolerance.relative)
        difference = "0.0%" if relative else format_value(0.0, largest.unit, largest.dimension)
    else:
        difference = format_difference(largest, short=True)
    return MethodsRow(
        measure.group,
        measure.key,
        measure.label,
        tuple(values),
        difference,
        _verdict(findings),
        _tolerance(findings),
    )


def _coverage_row(
    measure: _Measure, findings: Sequence[Finding], columns: Sequence[str], reference: str
) -> MethodsRow | None:
    """Each version's coverage of its pair's reference (the reference covers itself fully).

    The largest difference is the shortfall the verdict judges: the lower coverage of the two
    directions of a pair.
    """
    if not findings:
        return None
    values = []
    for name in columns:
        own = [v for f in findings if f.condition == name and (v := f.values.get(name)) is not None]
        share = min(own) if own else 1.0 if name == reference else None
        values.append(format_value(share, "share"))
    shortfall = max((f.difference or 0.0) for f in findings)
    return MethodsRow(
        measure.group,
        measure.key,
        measure.label,
        tuple(values),
        _signed(-shortfall, f"{shortfall * 100:.1f}%"),
        _verdict(findings),
        _tolerance(findings),
    )


def _passages_row(
    measure: _Measure, findings: Sequence[Finding], columns: Sequence[str]
) -> MethodsRow | None:
    """Passages removed plus added, per condition against the condition it is paired with."""
    if not findings:
        return None
    per_pair: dict[tuple[str, str], float] = {}
    for finding in findings:
        key = (finding.reference, finding.condition)
        per_pair[key] = per_pair.get(key, 0.0) + (finding.difference or 0.0)
    values = []
    for name in columns:
        counts = [count for (_, condition), count in per_pair.items() if condition == name]
        values.append(format_value(max(counts), "passages") if counts else "—")
    tolerances = dict.fromkeys(t for f in findings if (t := _tolerance([f])))
    return MethodsRow(
        measure.group,
        measure.key,
        measure.label,
        tuple(values),
        format_value(max(per_pair.values()), "passages"),
        _verdict(findings),
        " / ".join(tolerances),
    )


def _posttest_row(
    measure: _Measure,
    findings: Sequence[Finding],
    columns: Sequence[str],
    report: Report,
    threshold: float | None,
) -> MethodsRow | None:
    """How many post-test items each condition teaches: its coverage reaches the threshold.

    The threshold is the rule of :func:`matcheck.compare.assessment.assess_posttest`, so the
    counts agree with its verdicts.
    """
    if not findings or threshold is None:
        return None
    taught: dict[str, set[str]] = {}
    for finding in findings:
        for name, value in finding.values.items():
            items = taught.setdefault(name, set())
            if value is not None and value >= threshold:
                items.add(finding.key)
    values = tuple(format_value(len(taught[n]), "items") if n in taught else "—" for n in columns)
    gaps = [
        len(taught[p.condition]) - len(taught[p.reference])
        for p in report.pairs()
        if p.condition in taught and p.reference in taught
    ]
    largest = max(gaps, key=abs, default=0)
    return MethodsRow(
        measure.group,
        measure.key,
        measure.label,
        values,
        _signed(largest, str(abs(largest))),
        _verdict(findings),
        _tolerance(findings),
    )


@dataclass(frozen=True, slots=True)
class _Items:
    """What the note says about the post-test: how many items, and which no version teaches."""

    count: int
    threshold: float
    untaught: tuple[str, ...]


def _untaught(findings: Sequence[Finding], threshold: float) -> _Items:
    best: dict[str, float] = {}
    for finding in findings:
        shares = [v for v in finding.values.values() if v is not None]
        best[finding.item or ""] = max([best.get(finding.item or "", 0.0), *shares])
    untaught = tuple(d for d, share in best.items() if share < threshold)
    return _Items(len(best), threshold, untaught)


def _notes(rows: Sequence[MethodsRow], words_per_minute: float, items: _Items) -> tuple[str, ...]:
    shown = {row.measure for row in rows}
    notes = [
        "Largest difference: the largest over the compared pairs, in percent of the reference "
        "for measures with a relative tolerance"
        + ("; differences of shares are in percentage points." if _has_shares(shown) else "."),
        "Within tolerance: yes, within the tolerance in every comparison; no, beyond it in at "
        "least one; intended, a difference the design manipulates; n/a, inconclusive.",
    ]
    tolerances = [f"{row.label} {row.tolerance}" for row in rows if row.tolerance]
    if tolerances:
        notes.append(f"Tolerances: {'; '.join(tolerances)}.")
    if COVERAGE in shown:
        notes.append(
            "Key-term coverage: the share of the reference's key-term weight that a version "
            "contains; its difference is the shortfall in either direction."
        )
    if PASSAGES in shown:
        notes.append(
            "Passages without counterpart: passages removed or added against the condition a "
            "version is compared with."
        )
    notes.append(_reading_rate(words_per_minute))
    if POSTTEST in shown:
        notes.append(
            f"Post-test items taught: of the {items.count} items, those of which a version "
            f"states at least {items.threshold * 100:g}% of the key terms (weighted) in one "
            "place; exact: each item is taught in both versions of a pair or in neither."
        )
        if items.untaught:
            which = join_list(items.untaught)
            notes.append(
                f"Taught in no version: item{'s' if len(items.untaught) > 1 else ''} {which}."
            )
    notes.append(NOT_PROOF)
    return tuple(notes)


def _has_shares(shown: set[str]) -> bool:
    return bool(shown & {"rare_words_share", COVERAGE})


def _reading_rate(words_per_minute: float) -> str:
    if words_per_minute == DEFAULT_WPM:
        return f"Reading time at {words_per_minute:g} words per minute (Brysbaert, 2019)."
    return (
        f"Reading time at {words_per_minute:g} words per minute, the rate set for this study "
        f"(the default, {DEFAULT_WPM:g}, follows Brysbaert, 2019)."
    )


# --- Markdown, CSV, LaTeX -----------------------------------------------------------------


def _md(text: str) -> str:
    return text.replace("|", "\\|").replace("\n", " ")


def render_markdown(table: MethodsTable, options: RenderOptions | None = None) -> str:
    """A pipe table (one line per row, the group in its own column), number, title and note."""
    header = ("Group", *table.header)
    lines = [
        f"**Table {table.number}**",
        "",
        f"*{_md(table.title)}*",
        "",
        "| " + " | ".join(_md(cell) for cell in header) + " |",
        "|---|---|" + "--:|" * (len(table.columns) + 1) + "---|",
    ]
    for row in table.rows:
        cells = (row.group_label, row.label, *row.values, row.difference, row.verdict)
        lines.append("| " + " | ".join(_md(cell) for cell in cells) + " |")
    lines += ["", f"*Note.* {_md(table.note)}"]
    return "\n".join(lines) + "\n"


def render_csv(table: MethodsTable, options: RenderOptions | None = None) -> str:
    """RFC 4180 CSV; the note is the last row, ``Note.`` in the Group column, padded to width.

    Every row has the same number of fields, so spreadsheets and ``csv.reader`` read it as is;
    a reader that wants only the data drops the row whose first field is ``Note.``.
    """
    buffer = io.StringIO()
    writer = csv.writer(buffer)
    width = len(table.header) + 1
    writer.writerow(("Group", *table.header))
    for row in table.rows:
        writer.writerow((row.group_label, row.label, *row.values, row.difference, row.verdict))
    writer.writerow(("Note.", table.note, *([""] * (width - 2))))
    return buffer.getvalue()


# The ten characters LaTeX treats specially, and the non-ASCII signs pdfLaTeX's utf8 input
# does not define (U+2212, U+2265, U+2264) or defines only in text companion fonts.
_LATEX = str.maketrans(
    {
        "\\": r"\textbackslash{}",
        "&": r"\&",
        "%": r"\%",
        "$": r"\$",
        "#": r"\#",
        "_": r"\_",
        "{": r"\{",
        "}": r"\}",
        "~": r"\textasciitilde{}",
        "^": r"\textasciicircum{}",
        "−": "$-$",
        "±": r"$\pm$",
        "≥": r"$\geq$",
        "≤": r"$\leq$",
        "²": r"\textsuperscript{2}",
    }
)


def escape_latex(text: str) -> str:
    return text.translate(_LATEX)


def render_latex(table: MethodsTable, options: RenderOptions | None = None) -> str:
    """A complete ``table`` float with booktabs rules; LaTeX numbers it (Table 1 here).

    Needs ``\\usepackage{booktabs}`` in the preamble.
    """
    width = len(table.header)
    spec = "@{}l" + "r" * (len(table.columns) + 1) + "l@{}"
    lines = [
        r"\begin{table}[htbp]",
        r"\centering",
        f"% Table {table.number} of the matcheck report; LaTeX numbers floats in document order.",
        rf"\caption{{{escape_latex(table.title)}}}",
        rf"\label{{tab:equivalence-{table.number}}}",
        rf"\begin{{tabular}}{{{spec}}}",
        r"\toprule",
        " & ".join(escape_latex(cell) for cell in table.header) + r" \\",
        r"\midrule",
    ]
    for index, (_, rows) in enumerate(table.groups()):
        if index:
            lines.append(r"\addlinespace")
        label = escape_latex(rows[0].group_label)
        lines.append(rf"\multicolumn{{{width}}}{{@{{}}l}}{{\textit{{{label}}}}} \\")
        for row in rows:
            cells = (row.label, *row.values, row.difference, row.verdict)
            lines.append(" & ".join(escape_latex(cell) for cell in cells) + r" \\")
    lines += [
        r"\bottomrule",
        r"\end{tabular}",
        r"\par\smallskip",
        r"\begin{minipage}{\linewidth}",
        rf"\footnotesize\textit{{Note.}} {escape_latex(table.note)}\par",
        r"\end{minipage}",
        r"\end{table}",
    ]
    return "\n".join(lines) + "\n"


# --- Word ----------------------------------------------------------------------------------

_RULE = {"val": "single", "sz": "4", "space": "0", "color": "auto"}  # 1/2 pt, Word's default
# The elements that may follow w:tblBorders in w:tblPr and w:tcBorders in w:tcPr (ECMA-376).
_AFTER_TBL_BORDERS = (
    "w:shd",
    "w:tblLayout",
    "w:tblCellMar",
    "w:tblLook",
    "w:tblCaption",
    "w:tblDescription",
    "w:tblPrChange",
)
_AFTER_TC_BORDERS = (
    "w:shd",
    "w:noWrap",
    "w:tcMar",
    "w:textDirection",
    "w:tcFitText",
    "w:vAlign",
    "w:hideMark",
    "w:headers",
    "w:cellIns",
    "w:cellDel",
    "w:cellMerge",
    "w:tcPrChange",
)


def render_docx(table: MethodsTable, options: RenderOptions | None = None) -> bytes:
    """The table as a Word document (its bytes) in APA 7 table style."""
    from docx import Document
    from docx.enum.text import WD_ALIGN_PARAGRAPH

    document = Document()
    document.core_properties.title = table.title
    document.add_paragraph().add_run(f"Table {table.number}").bold = True
    document.add_paragraph().add_run(table.title).italic = True
    width = len(table.header)
    right = range(1, width - 1)  # condition values and the difference are numbers
    grid = document.add_table(rows=1, cols=width)
    _set_rules(grid)
    _mark_header(grid)
    for index, (cell, text) in enumerate(zip(grid.rows[0].cells, table.header, strict=True)):
        _fill(cell, text, right=index in right)
        _rule_below(cell)
    for _, rows in table.groups():
        cells = grid.add_row().cells
        spanner = cells[0].merge(cells[-1])
        spanner.paragraphs[0].add_run(rows[0].group_label).italic = True
        for row in rows:
            texts = (row.label, *row.values, row.difference, row.verdict)
            for index, (cell, text) in enumerate(zip(grid.add_row().cells, texts, strict=True)):
                _fill(cell, text, right=index in right)
    note = document.add_paragraph()
    note.add_run("Note.").italic = True
    note.add_run(f" {table.note}")
    note.alignment = WD_ALIGN_PARAGRAPH.LEFT
    buffer = io.BytesIO()
    document.save(buffer)
    return buffer.getvalue()


def _fill(cell: _Cell, text: str, *, right: bool) -> None:
    from docx.enum.text import WD_ALIGN_PARAGRAPH

    paragraph = cell.paragraphs[0]
    paragraph.add_run(text)
    paragraph.alignment = WD_ALIGN_PARAGRAPH.RIGHT if right else WD_ALIGN_PARAGRAPH.LEFT


def _border(tag: str, rule: dict[str, str] | None) -> object:
    from docx.oxml import OxmlElement
    from docx.oxml.ns import qn

    element = OxmlElement(f"w:{tag}")
    for key, value in (rule or {"val": "nil"}).items():
        element.set(qn(f"w:{key}"), value)
    return element


def _set_rules(grid: DocxTable) -> None:
    """Top and bottom rules only: APA 7 tables have no vertical lines and no inner grid."""
    from docx.oxml import OxmlElement
    from docx.oxml.ns import qn

    properties = grid._tbl.tblPr
    for old in properties.findall(qn("w:tblBorders")):
        properties.remove(old)
    borders = OxmlElement("w:tblBorders")
    # Child order is fixed by the schema (ECMA-376 Part 1, 17.4.39 and 17.4.60); Word
    # rejects a file whose elements are out of order.
    for tag in ("top", "left", "bottom", "right", "insideH", "insideV"):
        borders.append(_border(tag, _RULE if tag in ("top", "bottom") else None))
    properties.insert_element_before(borders, *_AFTER_TBL_BORDERS)


def _rule_below(cell: _Cell) -> None:
    from docx.oxml import OxmlElement

    borders = OxmlElement("w:tcBorders")
    borders.append(_border("bottom", _RULE))
    cell._tc.get_or_add_tcPr().insert_element_before(borders, *_AFTER_TC_BORDERS)


def _mark_header(grid: DocxTable) -> None:
    """Repeat the header row on every page the table spans."""
    from docx.oxml import OxmlElement

    grid.rows[0]._tr.get_or_add_trPr().append(OxmlElement("w:tblHeader"))


# --- prose ---------------------------------------------------------------------------------

_NUMBERS = {2: "two", 3: "three", 4: "four", 5: "five", 6: "six", 7: "seven", 8: "eight"}
_CLAUSES = (
    ("yes", "were matched on"),
    ("intended", "differed as intended in"),
    ("no", "differed beyond tolerance in"),
    ("n/a", "could not be compared conclusively on"),
)


def join_list(items: Sequence[str]) -> str:
    """``a``, ``a and b``, ``a, b, and c`` (APA 7 uses the serial comma)."""
    if len(items) <= 2:
        return " and ".join(items)
    return ", ".join(items[:-1]) + ", and " + items[-1]


def _phrase(row: MethodsRow, columns: Sequence[str]) -> str:
    measure = _BY_KEY[row.measure]
    known = [(v, n) for v, n in zip(row.values, columns, strict=True) if v != "—"]
    if row.measure == PASSAGES:  # counted against a counterpart: name whose count it is
        return f"{measure.phrase} ({join_list([f'{v} for {n}' for v, n in known])})"
    if len(known) < len(columns):  # say whose value is which, and where it is unknown
        missing = [n for v, n in zip(row.values, columns, strict=True) if v == "—"]
        parts = join_list([f"{v}{measure.suffix} for {n}" for v, n in known])
        return f"{measure.phrase} ({parts}; not measurable for {join_list(missing)})"
    return f"{measure.phrase} ({join_list(row.values)}{measure.suffix})"


def render_text(table: MethodsTable, options: RenderOptions | None = None) -> str:
    """A paragraph for the methods section, to adapt: what matched, what differed and how."""
    count = len(table.columns)
    versions = f"The {_NUMBERS.get(count, str(count))} versions ({join_list(table.columns)})"
    clauses: list[str] = []
    for verdict, verb in _CLAUSES:
        phrases = [_phrase(row, table.columns) for row in table.rows if row.verdict == verdict]
        if phrases:
            clauses.append(f"{'they ' if clauses else ''}{verb} {join_list(phrases)}")
    if not clauses:
        return f"{versions} were not compared on any measure the table shows.\n"
    sentences = [f"{versions} {'; '.join(clauses)}."]
    if any(row.measure == "reading_time" for row in table.rows):
        sentences.append(
            f"Reading time was estimated at {table.words_per_minute:g} words per minute"
            + (" (Brysbaert, 2019)." if table.words_per_minute == DEFAULT_WPM else ".")
        )
    sentences.append(f"Table {table.number} gives every measure with its tolerance.")
    return " ".join(sentences) + "\n"
