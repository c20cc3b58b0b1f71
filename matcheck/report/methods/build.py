"""Build the equivalence table from a report: one row per measure, one column per condition."""

from __future__ import annotations

from collections.abc import Sequence

from matcheck.findings import Finding, Report, Status
from matcheck.measures import registry
from matcheck.report.common import GROUP_ORDER, format_difference, format_tolerance, format_value
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

# One row's verdict is its worst finding's: any pair beyond tolerance makes the row "no".
_WORST_FIRST = (
    Status.DIFFERS,
    Status.INCONCLUSIVE,
    Status.ACCEPTED,
    Status.INTENDED,
    Status.MATCHED,
)


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
    for measure in table_measures():
        row: MethodsRow | None
        if measure.key == COVERAGE:
            row = _coverage_row(measure, by_dimension.get(COVERAGE, []), columns, report.reference)
        elif measure.key == PASSAGES:
            found = by_dimension.get("passages_removed", []) + by_dimension.get(
                "passages_added", []
            )
            row = _passages_row(measure, found, columns)
        elif measure.key == FACTS:
            row = _passages_row(measure, by_dimension.get(FACTS, []), columns)
        elif measure.key == POSTTEST:
            row = _posttest_row(measure, items, columns, report, threshold)
        else:
            row = _measure_row(measure, by_dimension.get(measure.key, []), columns)
        if row is not None:
            rows.append(row)
    rows.sort(key=lambda r: GROUP_ORDER.index(r.group))  # stable: catalogue order inside
    title = f"{TITLE}: {report.title}" if report.title else TITLE
    notes = table_notes(rows, report.words_per_minute, _untaught(items, threshold or 1.0))
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
    measure: TableMeasure, findings: Sequence[Finding], columns: Sequence[str]
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
    measure: TableMeasure, findings: Sequence[Finding], columns: Sequence[str], reference: str
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
    measure: TableMeasure, findings: Sequence[Finding], columns: Sequence[str]
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
    measure: TableMeasure,
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


def _untaught(findings: Sequence[Finding], threshold: float) -> PostTestItems:
    best: dict[str, float] = {}
    for finding in findings:
        shares = [v for v in finding.values.values() if v is not None]
        best[finding.item or ""] = max([best.get(finding.item or "", 0.0), *shares])
    untaught = tuple(d for d, share in best.items() if share < threshold)
    return PostTestItems(len(best), threshold, untaught)
