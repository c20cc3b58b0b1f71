"""The Markdown report, fit for a pull-request comment: long evidence goes in <details>."""

from __future__ import annotations

from matcheck.findings import Report, Status
from matcheck.report.common import (
    describe_evidence,
    describe_regression,
    format_difference,
    format_tolerance,
    format_value,
    summary_counts,
)
from matcheck.report.escape import markdown, markdown_code
from matcheck.report.formatter import RenderOptions
from matcheck.report.table import ordered_with_echoes

ICONS = {
    Status.DIFFERS: "❌ differs",
    Status.INCONCLUSIVE: "⚠️ inconclusive",
    Status.INTENDED: "🎯 intended",
    Status.MATCHED: "✅ matched",
}


# User text (names, warnings, quoted lesson text) is escaped (report/escape.py), so raw HTML
# and Markdown syntax in it is shown, never rendered.
_cell = markdown
_code = markdown_code


def _design(report: Report) -> list[str]:
    from matcheck.report.design import HEADER, NOTE, TITLE, design_rows, shortfalls

    rows = design_rows(report)
    if not rows:
        return []
    lines = [f"### {TITLE}", "", "| " + " | ".join(HEADER) + " |", "|---|---|--:|--:|--:|--:|--:|"]
    for verdict, *cells in rows:
        lines.append(f"| {ICONS[Status(verdict)]} | " + " | ".join(_cell(c) for c in cells) + " |")
    lines += ["", NOTE, ""]
    return [*lines, *(f"- {_cell(line)}" for line in shortfalls(report)), ""]


def render_markdown(report: Report, options: RenderOptions | None = None) -> str:
    counts = summary_counts(report)
    lines = ["## matcheck report", ""]
    verdict = (
        "**Possible confounds found.**"
        if report.differs
        else "**No differences beyond tolerance.**"
    )
    lines.append(
        f"{verdict} {counts['differs']} differ, {counts['inconclusive']} inconclusive, "
        f"{counts['intended']} intended, {counts['matched']} matched (root findings). "
        f"Reference: {_code(report.reference)}"
        + (
            f"; manipulated: {', '.join(f'`{m}`' for m in report.manipulated)}."
            if report.manipulated
            else "."
        )
    )
    lines.append("")
    for pairing in report.pairs():
        name, reference = pairing.condition, pairing.reference
        findings = list(report.findings_of(pairing))
        heading = f"### {_code(reference)} vs {_code(name)}"
        if pairing.factor:
            heading += f" (contrast of {_cell(pairing.factor)})"
        lines += [heading, ""]
        header = [
            f"| Group | Measure | {_cell(reference)} | {_cell(name)} "
            "| Difference | Tolerance | Verdict |",
            "|---|---|--:|--:|--:|--:|---|",
        ]
        lines += header
        matched = []
        for finding, is_echo in ordered_with_echoes(findings):
            label = f"↳ {finding.name}" if is_echo else finding.name
            verdict = ICONS[finding.status]
            if is_echo and finding.caused_by:
                verdict += f" (follows `{finding.caused_by}`)"
            ref_value = format_value(finding.values.get(reference), finding.unit, finding.dimension)
            value = format_value(finding.values.get(name), finding.unit, finding.dimension)
            row = (
                f"| {finding.group} | `{label}` | {ref_value} | {value} | "
                f"{_cell(format_difference(finding))} | {_cell(format_tolerance(finding))} "
                f"| {verdict} |"
            )
            if finding.status is Status.MATCHED:
                matched.append(row)
            else:
                lines.append(row)
        lines.append("")
        if matched:
            lines += [f"<details><summary>{len(matched)} matched measures</summary>", ""]
            lines += header
            lines += matched
            lines += ["", "</details>", ""]
        located = [f for f in findings if f.evidence and f.status is not Status.MATCHED]
        for finding in located:
            lines.append(
                f"<details><summary>{ICONS[finding.status]}: <code>{finding.name}</code> — "
                f"{len(finding.evidence)} located</summary>"
            )
            lines.append("")
            pair = (finding.reference, finding.condition)
            lines += [f"- {_cell(describe_evidence(item, pair))}" for item in finding.evidence]
            lines += ["", "</details>", ""]
    lines += _design(report)
    if report.data is not None:
        from matcheck.report.study_data import render_markdown as data_markdown

        lines += data_markdown(report)
    if report.revision:
        lines += [f"### Since {_code(report.revision)}", ""]
        lines += [f"- {_cell(describe_regression(r))}" for r in report.regressions] or [
            f"Nothing changed beyond tolerance since {_code(report.revision)}."
        ]
        lines.append("")
    for warning in report.warnings:
        lines.append(f"> ⚠️ {_cell(warning)}")
    for condition in report.conditions:
        for warning in condition.warnings:
            lines.append(f"> ⚠️ {_code(condition.name)}: {_cell(warning)}")
    lines += ["", f"_{report.notes[0]}_" if report.notes else ""]
    return "\n".join(lines).rstrip() + "\n"
