"""Build the equivalence table from a report: a row per measure, a column per condition and
per contrast."""

from __future__ import annotations

from collections.abc import Sequence

from matcheck.findings import Finding, Report, Status
from matcheck.measures import registry
from matcheck.report.common import GROUP_ORDER, format_difference, format_tolerance, format_value
from matcheck.report.methods.contrasts import Contrast, cell, contrasts_of, row_verdict, worst
from matcheck.report.methods.mentions import covered_dimensions, equivalence_tests, mentions
from matcheck.report.methods.model import (
    COVERAGE,
    FACTS,
    PASSAGES,
    POSTTEST,
    TITLE,
    VERDICTS,
    AcceptedRow,
    MethodsRow,
    MethodsTable,
    TableMeasure,
    table_measures,
)
from matcheck.report.methods.notes import PostTestItems, table_notes

# One contrast's cell: the difference, the status (a Status value), and its size to rank.
_Cell = tuple[str, str, float]


def methods_table(
    report: Report, *, number: int = 1, coverage_threshold: float | None = None
) -> MethodsTable:
    """The equivalence table of ``report``; rows whose measure no finding has are left out.

    ``coverage_threshold`` is the coverage at which a version teaches a post-test item: pass
    the study's ``posttest.coverage_threshold``, since the report does not record it; the
    default is the one :mod:`matcheck.compare.assessment` uses.
    """
    columns = tuple(condition.name for condition in report.conditions)
    contrasts = contrasts_of(report.pairs())
    by_dimension: dict[str, list[Finding]] = {}
    for finding in report.findings:
        by_dimension.setdefault(finding.dimension, []).append(finding)
    items = [f for f in report.findings if f.item is not None]
    threshold = coverage_threshold
    if threshold is None and items:
        threshold = report.settings.coverage_threshold
    rows: list[MethodsRow] = []
    for measure in table_measures():
        row: MethodsRow | None
        if measure.key == COVERAGE:
            row = _coverage_row(
                measure, by_dimension.get(COVERAGE, []), columns, report.reference, contrasts
            )
        elif measure.key == PASSAGES:
            found = by_dimension.get("passages_removed", []) + by_dimension.get(
                "passages_added", []
            )
            row = _passages_row(measure, found, columns, contrasts)
        elif measure.key == FACTS:
            row = _passages_row(measure, by_dimension.get(FACTS, []), columns, contrasts)
        elif measure.key == POSTTEST:
            row = _posttest_row(measure, items, columns, contrasts, threshold)
        else:
            row = _measure_row(measure, by_dimension.get(measure.key, []), columns, contrasts)
        if row is not None:
            rows.append(row)
    rows.sort(key=lambda r: GROUP_ORDER.index(r.group))  # stable: catalogue order inside
    title = f"{TITLE}: {report.title}" if report.title else TITLE
    covered = covered_dimensions(row.measure for row in rows)
    mentioned = mentions(report, covered, contrasts)
    tests = equivalence_tests(report, covered, contrasts)
    notes = table_notes(
        rows,
        report.words_per_minute,
        _untaught(items, threshold or 1.0),
        contrasts=contrasts,
        mentioned=mentioned,
        tests=tests,
    )
    accepted = _accepted(report)
    if accepted:
        notes = (*notes[:-1], ACCEPTED_NOTE, notes[-1])
    return MethodsTable(
        number,
        title,
        columns,
        tuple(rows),
        notes,
        report.words_per_minute,
        data=report.data,
        sample_size=_sample_size(report),
        contrasts=contrasts,
        mentions=mentioned,
        equivalence=tests,
        accepted=accepted,
    )


def _sample_size(report: Report) -> str:
    """The sample-size paragraph (matcheck.report.design), shown after the table's note."""
    from matcheck.report.design import sample_size_paragraph

    return sample_size_paragraph(report)


ACCEPTED_NOTE = (
    "Accepted: beyond tolerance, reviewed and accepted by the authors; each accepted "
    "difference is listed below the table with its reason."
)


def _label(finding: Finding) -> str:
    if finding.item is not None:
        return f"Post-test item {finding.item}"
    spec = registry.spec(finding.dimension)
    return spec.shown_label if spec is not None else finding.dimension


def _accepted(report: Report) -> tuple[AcceptedRow, ...]:
    """Every accepted root difference with its reason, in report order."""
    rows = []
    for finding in report.findings:
        entry = finding.accepted
        if finding.status is not Status.ACCEPTED or finding.caused_by is not None or not entry:
            continue
        echoes = tuple(
            _label(echo) for echo in report.echoes_of(finding) if echo.status is Status.ACCEPTED
        )
        rows.append(
            AcceptedRow(
                f"{finding.condition} vs {finding.reference}",
                _label(finding),
                format_difference(finding),
                entry.reason,
                entry.by,
                entry.date,
                echoes,
            )
        )
    return tuple(rows)


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


def _status(findings: Sequence[Finding]) -> str:
    return worst([f.status.value for f in findings])


def _row(
    measure: TableMeasure,
    values: Sequence[str],
    cells: Sequence[_Cell | None],
    tolerance: str,
) -> MethodsRow:
    """A row from its per-condition values and per-contrast cells; the largest difference
    and the verdict look only at the contrasts that do not manipulate the measure."""
    statuses = tuple(c[1] if c else "" for c in cells)
    differences = tuple(c[0] if c else "—" for c in cells)
    judged = [c for c in cells if c and c[1] != Status.INTENDED.value]
    largest = max(judged, key=lambda c: c[2])[0] if judged else "—"
    return MethodsRow(
        measure.group,
        measure.key,
        measure.label,
        tuple(values),
        largest,
        VERDICTS[row_verdict(statuses)],
        tolerance,
        contrasts=tuple(cell(d, s) for d, s in zip(differences, statuses, strict=True)),
        differences=differences,
        statuses=statuses,
    )


def _difference_text(finding: Finding) -> str:
    if finding.difference == 0:
        relative = finding.tolerance is not None and bool(finding.tolerance.relative)
        return "0.0%" if relative else format_value(0.0, finding.unit, finding.dimension)
    return format_difference(finding, short=True)


def _measure_row(
    measure: TableMeasure,
    findings: Sequence[Finding],
    columns: Sequence[str],
    contrasts: Sequence[Contrast],
) -> MethodsRow | None:
    if not findings:
        return None
    first = findings[0]
    values = []
    for name in columns:
        value = next((f.values[name] for f in findings if name in f.values), None)
        values.append(format_value(value, first.unit, first.dimension))
    cells: list[_Cell | None] = []
    for contrast in contrasts:
        own = [f for f in findings if contrast.owns(f)]
        largest = max(own, key=_size) if own else None
        cells.append((_difference_text(largest), _status(own), _size(largest)) if largest else None)
    return _row(measure, values, cells, _tolerance(findings))


def _coverage_row(
    measure: TableMeasure,
    findings: Sequence[Finding],
    columns: Sequence[str],
    reference: str,
    contrasts: Sequence[Contrast],
) -> MethodsRow | None:
    """Each version's coverage of its pair's reference (the reference covers itself fully).

    A contrast's difference is the shortfall the verdict judges: the lower coverage of the
    two directions of the pair.
    """
    if not findings:
        return None
    values = []
    for name in columns:
        own = [v for f in findings if f.condition == name and (v := f.values.get(name)) is not None]
        share = min(own) if own else 1.0 if name == reference else None
        values.append(format_value(share, "share"))
    cells: list[_Cell | None] = []
    for contrast in contrasts:
        mine = [f for f in findings if contrast.owns(f)]
        shortfall = max((f.difference or 0.0) for f in mine) if mine else 0.0
        text = _signed(-shortfall, f"{shortfall * 100:.1f}%")
        cells.append((text, _status(mine), shortfall) if mine else None)
    return _row(measure, values, cells, _tolerance(findings))


def _passages_row(
    measure: TableMeasure,
    findings: Sequence[Finding],
    columns: Sequence[str],
    contrasts: Sequence[Contrast],
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
    cells: list[_Cell | None] = []
    for contrast in contrasts:
        mine = [f for f in findings if contrast.owns(f)]
        count = per_pair.get((contrast.reference, contrast.condition), 0.0)
        cells.append((format_value(count, "passages"), _status(mine), count) if mine else None)
    tolerances = dict.fromkeys(t for f in findings if (t := _tolerance([f])))
    return _row(measure, values, cells, " / ".join(tolerances))


def _posttest_row(
    measure: TableMeasure,
    findings: Sequence[Finding],
    columns: Sequence[str],
    contrasts: Sequence[Contrast],
    threshold: float | None,
) -> MethodsRow | None:
    """How many post-test items each condition teaches: its coverage reaches the threshold.

    The threshold is the rule of :func:`matcheck.compare.assessment.assess_posttest`, so the
    counts agree with its verdicts. A contrast's difference is the change in that count; its
    verdict also counts an item whose coverage fell beyond tolerance though still taught.
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
    cells: list[_Cell | None] = []
    for contrast in contrasts:
        mine = [f for f in findings if contrast.owns(f)]
        if not mine or contrast.condition not in taught or contrast.reference not in taught:
            cells.append(None)
            continue
        gap = len(taught[contrast.condition]) - len(taught[contrast.reference])
        cells.append((_signed(gap, str(abs(gap))), _status(mine), float(abs(gap))))
    return _row(measure, values, cells, _tolerance(findings))


def _untaught(findings: Sequence[Finding], threshold: float) -> PostTestItems:
    best: dict[str, float] = {}
    for finding in findings:
        shares = [v for v in finding.values.values() if v is not None]
        best[finding.item or ""] = max([best.get(finding.item or "", 0.0), *shares])
    untaught = tuple(d for d, share in best.items() if share < threshold)
    return PostTestItems(len(best), threshold, untaught)
