"""The terminal report: a Rich table per compared pair, differences first, then where."""

from __future__ import annotations

from typing import TYPE_CHECKING

from matcheck.findings import Finding, Pairing, Report, Status
from matcheck.identity import finding_id
from matcheck.measures import registry
from matcheck.measures.base import Role
from matcheck.report.columns import column_layout, wrap_name
from matcheck.report.common import (
    counts_sentence,
    describe_acceptance,
    describe_cache,
    describe_evidence,
    describe_regression,
    format_difference,
    format_tolerance,
    format_value,
    review_split,
    sorted_findings,
)
from matcheck.report.escape import rich as esc
from matcheck.report.escape import terminal
from matcheck.report.formatter import RenderOptions

if TYPE_CHECKING:
    from rich.console import Console

STYLES = {
    Status.DIFFERS: "bold red",
    Status.INCONCLUSIVE: "yellow",
    Status.ACCEPTED: "blue",
    Status.INTENDED: "cyan",
    Status.MATCHED: "green",
}
MAX_EVIDENCE_LINES = 8


def ordered_with_echoes(findings: list[Finding]) -> list[tuple[Finding, bool]]:
    """Root findings in report order, each followed by its echoes (flagged True)."""
    roots = [f for f in sorted_findings(findings) if f.caused_by is None]
    echoes = [f for f in findings if f.caused_by is not None]
    ordered: list[tuple[Finding, bool]] = []
    placed: set[int] = set()
    for root in roots:
        ordered.append((root, False))
        for echo in echoes:
            if echo.caused_by == root.dimension and id(echo) not in placed:
                ordered.append((echo, True))
                placed.add(id(echo))
    ordered += [(echo, True) for echo in echoes if id(echo) not in placed]
    return ordered


def _pair_title(pairing: Pairing) -> str:
    title = f"{esc(pairing.reference)} (reference) vs {esc(pairing.condition)}"
    if pairing.factor:
        title += f" — contrast of {esc(pairing.factor)}"
    if pairing.manipulated:
        title += f"; manipulated: {esc(', '.join(pairing.manipulated))}"
    return title


def _is_count(finding: Finding) -> bool:
    """A count found between the two versions (passages removed...), not a measure of each."""
    spec = registry.spec(finding.dimension)
    return (
        spec is not None
        and spec.role is Role.PAIRWISE
        and finding.unit != "share"
        and finding.item is None
    )


def _cells(finding: Finding) -> tuple[str, str]:
    """The two value cells of a row. A count found between the versions reads as what it
    counts: none in the reference (by definition), the count in the other version."""
    if _is_count(finding):
        count = format_value(finding.difference, finding.unit, finding.dimension)
        return "0", count
    unit, dimension = finding.unit, finding.dimension
    return (
        format_value(finding.values.get(finding.reference), unit, dimension),
        format_value(finding.values.get(finding.condition), unit, dimension),
    )


def _count_note(findings: list[Finding], pairing: Pairing) -> str:
    """What the count rows count, in words, with the passages each version has."""
    parts = []
    for finding in findings:
        count = int(finding.difference or 0)
        what = finding.dimension.replace("_", " ")
        parts.append(f"{what}: 0 in {pairing.reference}, {count} in {pairing.condition}")
    first = next((f for f in findings if f.unit == "passages"), findings[0])
    sizes = ", ".join(
        f"{format_value(first.values.get(n), '', first.dimension)} in {n}"
        for n in (pairing.reference, pairing.condition)
        if first.values.get(n) is not None
    )
    total = f" (passages in all: {sizes})" if sizes and first.unit == "passages" else ""
    return "Counted between the two versions — " + "; ".join(parts) + total + "."


def render_table(report: Report, console: Console, options: RenderOptions | None = None) -> None:
    show_matched = options is None or options.show_matched
    from rich import box
    from rich.table import Table

    for pairing in report.pairs():
        name, reference = pairing.condition, pairing.reference
        findings = list(report.findings_of(pairing))
        rows = [
            (finding, is_echo, *_cells(finding))
            for finding, is_echo in ordered_with_echoes(findings)
            if show_matched or finding.status is not Status.MATCHED
        ]
        layout = column_layout(
            console.width,
            [f" ↳ {f.name}" if echo else f.name for f, echo, *_ in rows],
            (reference, name),
            [(ref, value) for _, _, ref, value in rows],
        )
        table = Table(
            title=_pair_title(pairing),
            title_justify="left",
            header_style="bold",
            box=box.SIMPLE_HEAD,
            padding=(0, 1, 0, 0),
        )
        table.add_column("Verdict", no_wrap=True, width=12)
        # Numbers and ids keep their width on a narrow terminal; measure and version names
        # are shown whole, broken after "_" or "-" onto more lines where the column is
        # narrower (report/columns.py): "passages_…" would not tell removed from added.
        table.add_column("Measure", overflow="fold", width=layout.measure)
        for header, width in zip(layout.headers, layout.names, strict=True):
            table.add_column(esc(header), justify="right", no_wrap=True, width=width)
        table.add_column("Diff.", justify="right", no_wrap=True, width=8)
        table.add_column("Tolerance", justify="right", no_wrap=True, width=10)
        table.add_column("Id", no_wrap=True, min_width=10, max_width=10)
        for finding, is_echo, ref_cell, value_cell in rows:
            table.add_row(
                finding.status.value,
                esc(wrap_name(f" ↳ {finding.name}" if is_echo else finding.name, layout.measure)),
                ref_cell,
                value_cell,
                format_difference(finding, short=True),
                format_tolerance(finding, short=True),
                finding_id(finding),
                style=STYLES[finding.status] if finding.status is not Status.MATCHED else None,
            )
        console.print(table)
        counted = [f for f, *_ in rows if _is_count(f)]
        if counted:
            note = terminal(_count_note(counted, pairing))
            console.print(note, highlight=False, markup=False)
        if not show_matched:
            hidden = sum(1 for f in findings if f.status is Status.MATCHED)
            console.print(f"[dim]{hidden} matched measures not listed (--all lists them)[/dim]")
        located = [
            f
            for f in sorted_findings(findings)
            if f.status is not Status.MATCHED
            and (f.evidence or f.status in (Status.INCONCLUSIVE, Status.ACCEPTED))
        ]
        if located:
            console.print("[bold]Where[/bold]")
            for finding in located:
                console.print(
                    f"[{STYLES[finding.status]}]{finding.status.value}[/] {finding.group} · "
                    f"{finding.name}",
                    highlight=False,
                )
                if finding.status is Status.INCONCLUSIVE:
                    console.print(f"  {esc(finding.reason or '')}", highlight=False)
                elif finding.status is Status.ACCEPTED:
                    line = terminal(describe_acceptance(finding))
                    console.print(f"  {line}", highlight=False, markup=False)
                for item in finding.evidence[:MAX_EVIDENCE_LINES]:
                    line = describe_evidence(item, (finding.reference, finding.condition))
                    console.print(f"  • {terminal(line)}", highlight=False, markup=False)
                if len(finding.evidence) > MAX_EVIDENCE_LINES:
                    extra = len(finding.evidence) - MAX_EVIDENCE_LINES
                    console.print(f"  … and {extra} more (see --format json)", highlight=False)
        console.print()
    if report.data is not None:
        from matcheck.report.study_data import render_text

        render_text(report, console)
    for warning in report.warnings:
        console.print(f"[yellow]warning[/yellow] {esc(warning)}", highlight=False)
    for condition in report.conditions:
        name = esc(condition.name)
        for warning in condition.warnings:
            console.print(f"[yellow]warning[/yellow] {name}: {esc(warning)}", highlight=False)
        if condition.excluded:
            console.print(
                f"[dim]{name}: left out of the lesson text: "
                f"{esc('; '.join(condition.excluded))}[/dim]",
                highlight=False,
            )
    if report.spreads:
        _render_spread(report, console)
    _render_design(report, console)
    if report.revision:
        _render_changes(report, console)
    verdict = (
        "[bold red]possible confounds found[/]"
        if report.differs
        else "[bold green]no differences beyond tolerance[/]"
    )
    console.print(
        f"{verdict}: {counts_sentence(report)} "
        f"(root findings; reading rate {report.words_per_minute:g} words/min)."
    )
    for note in report.notes:
        console.print(f"[dim]{note}[/dim]")
    cached = describe_cache(report)
    if cached:
        console.print(f"[dim]{cached}[/dim]", highlight=False)


def _render_design(report: Report, console: Console) -> None:
    from rich.table import Table

    from matcheck.report.design import HEADER, NOTE, TITLE, design_rows, shortfalls

    rows = design_rows(report)
    if not rows:
        return
    table = Table(title=TITLE, title_justify="left", header_style="bold")
    for column in HEADER:
        table.add_column(column, justify="left" if column in HEADER[:2] else "right")
    for row in rows:
        table.add_row(*row, style=STYLES[Status(row[0])] if row[0] != "matched" else None)
    console.print(table)
    console.print(f"[dim]{NOTE}[/dim]")
    for line in shortfalls(report):
        console.print(f"  • {line}", highlight=False, markup=False)
    console.print()


def _render_spread(report: Report, console: Console) -> None:
    from rich.table import Table

    table = Table(title="Spread across all versions", title_justify="left", header_style="bold")
    for column in ("Group", "Measure", "Min", "Max", "Range", "Worst verdict"):
        table.add_column(column)
    for spread in report.spreads:
        if spread.status is Status.MATCHED:
            continue
        table.add_row(
            spread.group,
            spread.dimension,
            format_value(spread.minimum, spread.unit, spread.dimension),
            format_value(spread.maximum, spread.unit, spread.dimension),
            format_value(spread.maximum - spread.minimum, spread.unit, spread.dimension),
            spread.status.value,
            style=STYLES[spread.status],
        )
    if table.row_count:
        console.print(table)
        console.print()


def _render_changes(report: Report, console: Console) -> None:
    from rich import box
    from rich.table import Table

    revision = esc(report.revision or "")
    console.print(f"[bold]Since {revision}[/bold]")
    new, present = review_split(report)
    for label, findings in (("new", new), (f"already at {report.revision}", present)):
        for finding in findings:
            line = (
                f"{label}: {finding.condition} vs {finding.reference}: {finding.name} differs "
                f"({format_difference(finding)}) [{finding_id(finding)}]"
            )
            console.print(f"  • {terminal(line)}", highlight=False, markup=False)
    if not report.regressions:
        console.print(f"  nothing changed beyond tolerance since {revision}")
    for regression in report.regressions:
        line = terminal(describe_regression(regression))
        console.print(f"  • {line}", highlight=False, markup=False)
    changed = [f for f in report.changes if f.status is not Status.MATCHED and f.caused_by is None]
    if not changed:
        console.print()
        return
    table = Table(box=box.SIMPLE_HEAD, header_style="bold", padding=(0, 1, 0, 0))
    for column in ("Version", "Measure", "Then", "Now", "Diff."):
        table.add_column(column, no_wrap=True)
    for finding in changed:
        table.add_row(
            esc(finding.condition),
            finding.name,
            format_value(finding.values.get(finding.reference), finding.unit, finding.dimension),
            format_value(finding.values.get(finding.condition), finding.unit, finding.dimension),
            format_difference(finding, short=True),
        )
    console.print(table)
