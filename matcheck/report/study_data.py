"""The learners' data in the reports: aggregates only (n, means, SDs, shares, coefficients).

One section per format, after the comparisons: the baseline table, attrition, and for each
post-test source (pilot, study) its reliability, ceiling and floor, and the item table where
each item's difficulty and discrimination stand beside what the lesson comparison found for
it. Pair findings (groups, outcome) are in the pair tables already; instrument findings have
no pair and are listed here. Also the methods-table additions: a baseline-equivalence table
and a sentence on reliability and attrition.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

from matcheck.data.summary import BaselineRow, Instrument, StudyData
from matcheck.findings import Finding, Report, Status

if TYPE_CHECKING:
    from rich.console import Console


def instrument_findings(report: Report) -> list[Finding]:
    return [f for f in report.findings if f.group == "instrument"]


def _effect(row: BaselineRow, condition: str) -> tuple[str, str]:
    for name, value, band in row.effects:
        if name == condition:
            return ("—" if value is None else f"{value:+.3f}"), band
    return "—", "reference"


def baseline_cells(data: StudyData) -> list[tuple[str, ...]]:
    """Measure, condition, n, M, SD, effect vs the reference, WWC band: one row each."""
    rows: list[tuple[str, ...]] = []
    for row in data.baseline:
        for group in row.groups:
            effect, band = _effect(row, group.condition)
            mean = f"{group.mean * 100:.1f}%" if row.statistic == "Cox" else f"{group.mean:.2f}"
            sd = "—" if row.statistic == "Cox" else f"{group.sd:.2f}"
            rows.append((row.measure, group.condition, str(group.n), mean, sd, effect, band))
    return rows


BASELINE_HEADER = ("Measure", "Condition", "n", "M", "SD", "vs ref.", "WWC band")
ITEM_HEADER = ("Item", "Difficulty", "Corrected r", "Lesson comparison")


def _item_cells(instrument: Instrument) -> list[tuple[str, str, str, str]]:
    coverage = dict(instrument.coverage)
    return [
        (
            s.item,
            f"{s.difficulty:.2f}",
            "—" if s.discrimination is None else f"{s.discrimination:.2f}",
            coverage.get(s.item, "—"),
        )
        for s in instrument.item_stats
    ]


def _instrument_line(instrument: Instrument) -> str:
    value = "—" if instrument.reliability is None else f"{instrument.reliability:.2f}"
    interval = (
        f" (95% CI {instrument.interval[0]:.2f} to {instrument.interval[1]:.2f})"
        if instrument.interval
        else ""
    )
    return (
        f"Post-test ({instrument.source}: {instrument.learners} learners, {instrument.items} "
        f"items): {instrument.coefficient} {value}{interval}; ceiling "
        f"{instrument.ceiling * 100:.1f}%, floor {instrument.floor * 100:.1f}%"
    )


def render_text(report: Report, console: Console) -> None:
    from rich import box
    from rich.table import Table

    from matcheck.report.escape import rich as esc
    from matcheck.report.escape import terminal

    data = report.data
    if data is None:
        return
    console.print("[bold]The study's data[/bold] (aggregates of the learners' data)")
    if data.baseline:
        table = Table(
            box=box.SIMPLE_HEAD,
            header_style="bold",
            padding=(0, 1, 0, 0),
            title=f"Baseline equivalence (reference {esc(data.reference)})",
            title_justify="left",
        )
        for index, column in enumerate(BASELINE_HEADER):
            table.add_column(
                column, justify="right" if 2 <= index <= 5 else "left", no_wrap=index < 6
            )
        for cells in baseline_cells(data):  # names from the data files: shown as written
            table.add_row(*map(esc, cells))
        console.print(table)
    if data.attrition_sentence:
        console.print(esc(data.attrition_sentence), highlight=False)
    for instrument in data.instruments:
        console.print(esc(_instrument_line(instrument)), highlight=False)
        table = Table(box=box.SIMPLE_HEAD, header_style="bold", padding=(0, 1, 0, 0))
        for index, column in enumerate(ITEM_HEADER):
            table.add_column(column, justify="right" if index in (1, 2) else "left")
        for cells in _item_cells(instrument):
            table.add_row(*map(esc, cells))
        console.print(table)
        for finding in instrument_findings(report):
            if finding.condition == instrument.source and finding.status is not Status.MATCHED:
                console.print(
                    terminal(f"  {finding.status.value} {finding.dimension}: {finding.reason}"),
                    highlight=False,
                    markup=False,
                )
                for item in finding.evidence:
                    console.print(f"    • {terminal(item.text)}", highlight=False, markup=False)
    console.print()


def _md(text: str) -> str:
    from matcheck.report.escape import markdown

    return markdown(text)


def render_markdown(report: Report) -> list[str]:
    from matcheck.report.escape import markdown_code

    data = report.data
    if data is None:
        return []
    lines = ["### The study's data", "", "_Aggregates of the learners' data._", ""]
    if data.baseline:
        lines += [f"Baseline equivalence (reference {markdown_code(data.reference)}):", ""]
        lines += ["| " + " | ".join(BASELINE_HEADER) + " |", "|---|---|--:|--:|--:|--:|---|"]
        lines += ["| " + " | ".join(_md(c) for c in cells) + " |" for cells in baseline_cells(data)]
        lines.append("")
    if data.attrition_sentence:
        lines += [_md(data.attrition_sentence), ""]
    for instrument in data.instruments:
        lines += [_md(_instrument_line(instrument)) + ".", ""]
        lines += ["| " + " | ".join(ITEM_HEADER) + " |", "|---|--:|--:|---|"]
        lines += [
            "| " + " | ".join(_md(c) for c in cells) + " |" for cells in _item_cells(instrument)
        ]
        lines.append("")
        for finding in instrument_findings(report):
            if finding.condition == instrument.source and finding.status is not Status.MATCHED:
                lines.append(
                    f"- **{finding.status.value}** `{finding.dimension}`: {_md(finding.reason)}"
                )
                lines += [f"  - {_md(item.text)}" for item in finding.evidence]
        lines.append("")
    return lines


def data_dict(data: StudyData) -> dict[str, Any]:
    return {
        "reference": data.reference,
        "baseline": [
            {
                "measure": row.measure,
                "statistic": row.statistic,
                "groups": [
                    {"condition": g.condition, "n": g.n, "mean": g.mean, "sd": g.sd}
                    for g in row.groups
                ],
                "effects": [
                    {"condition": name, "effect": value, "band": band}
                    for name, value, band in row.effects
                ],
            }
            for row in data.baseline
        ],
        "attrition": [
            {"condition": a.condition, "randomised": a.randomised, "analysed": a.analysed}
            for a in data.attrition
        ],
        "attrition_summary": data.attrition_sentence or None,
        "instruments": [
            {
                "source": i.source,
                "learners": i.learners,
                "items": i.items,
                "coefficient": i.coefficient,
                "reliability": i.reliability,
                "interval": list(i.interval) if i.interval else None,
                "ceiling": i.ceiling,
                "floor": i.floor,
                "maximum": i.maximum,
                "target_reliability": i.target,
                "items_for_target": i.needed,
                "item_statistics": [
                    {
                        "item": s.item,
                        "difficulty": s.difficulty,
                        "corrected_item_total_r": s.discrimination,
                        "lesson_comparison": dict(i.coverage).get(s.item),
                    }
                    for s in i.item_stats
                ],
            }
            for i in data.instruments
        ],
    }


# -- methods-section additions ------------------------------------------------------------


def methods_baseline_markdown(data: StudyData) -> list[str]:
    """The methods section's baseline-equivalence table (Markdown)."""
    if not data.baseline:
        return []
    lines = ["", "**Baseline equivalence**", ""]
    lines += ["| " + " | ".join(BASELINE_HEADER) + " |", "|---|---|--:|--:|--:|--:|---|"]
    lines += ["| " + " | ".join(_md(c) for c in cells) + " |" for cells in baseline_cells(data)]
    lines += [
        "",
        "_g: Hedges' g with the exact small-sample correction; Cox: the Cox index of a yes/no "
        "trait (shares in M). WWC bands: ≤ 0.05 equivalent, ≤ 0.25 with statistical "
        "adjustment, beyond 0.25 not equivalent._",
    ]
    return lines


def methods_sentence(data: StudyData) -> str:
    """One sentence on the post-test's reliability, one on attrition."""
    parts = []
    study = [i for i in data.instruments if i.reliability is not None]
    if study:
        i = study[-1]
        assert i.reliability is not None
        interval = f", 95% CI {i.interval[0]:.2f}–{i.interval[1]:.2f}" if i.interval else ""
        parts.append(
            f"The {i.items}-item post-test had {i.coefficient} = {i.reliability:.2f}{interval} "
            f"(Feldt) in the {i.source} sample of {i.learners} learners; "
            f"{i.ceiling * 100:.1f}% scored the maximum and {i.floor * 100:.1f}% the minimum."
        )
    if data.attrition_sentence:
        parts.append(data.attrition_sentence)
    return " ".join(parts)
