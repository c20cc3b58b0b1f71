"""The Markdown report, fit for a pull-request comment: long evidence goes in <details>."""

from __future__ import annotations

from collections.abc import Sequence

from matcheck.findings import Finding, Report, Status
from matcheck.identity import finding_id
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
)
from matcheck.report.escape import markdown, markdown_code
from matcheck.report.formatter import RenderOptions
from matcheck.report.table import ordered_with_echoes

ICONS = {
    Status.DIFFERS: "❌ differs",
    Status.INCONCLUSIVE: "⚠️ inconclusive",
    Status.ACCEPTED: "☑️ accepted",
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


def _review(report: Report) -> list[str]:
    """With --against: the differences new since the revision first, then those already
    there (a pull request's reviewer reads the first list)."""
    new, present = review_split(report)
    revision = report.revision
    lines = [f"### New since `{revision}`", ""]
    lines += [_problem(f) for f in new] or [f"No difference is new since `{revision}`."]
    lines.append("")
    if present:
        lines += [f"### Already at `{revision}`", ""]
        lines += [_problem(f) for f in present]
        lines.append("")
    return lines


def _problem(finding: Finding) -> str:
    line = (
        f"- ❌ `{_cell(finding.condition)}` vs `{_cell(finding.reference)}`: "
        f"`{finding.name}` {_cell(format_difference(finding))} (`{finding_id(finding)}`)"
    )
    if finding.evidence:
        pair = (finding.reference, finding.condition)
        line += f" — {_cell(describe_evidence(finding.evidence[0], pair))}"
    return line


def review_digest(reports: Sequence[Report]) -> str:
    """With --against over several studies: every study's new differences first, before the
    studies' reports (the step summary of a folder), so none hides below another study."""
    revision = next((r.revision for r in reports if r.revision), "")
    lines = [f"## New since `{revision}` in {len(reports)} studies", ""]
    for report in reports:
        new, present = review_split(report)
        title = _cell(report.title or report.reference)
        lines += [f"**{title}**: {len(new)} new, {len(present)} already there", ""]
        lines += [_problem(f) for f in new]
        if new:
            lines.append("")
    return "\n".join(lines) + "\n"


def render_markdown(report: Report, options: RenderOptions | None = None) -> str:
    lines = ["## matcheck report", ""]
    verdict = (
        "**Possible confounds found.**"
        if report.differs
        else "**No differences beyond tolerance.**"
    )
    lines.append(
        f"{verdict} {counts_sentence(report)} (root findings). "
        f"Reference: {_code(report.reference)}"
        + (
            f"; manipulated: {', '.join(f'`{m}`' for m in report.manipulated)}."
            if report.manipulated
            else "."
        )
    )
    lines.append("")
    if report.revision:
        lines += _review(report)
    for pairing in report.pairs():
        name, reference = pairing.condition, pairing.reference
        findings = list(report.findings_of(pairing))
        heading = f"### {_code(reference)} vs {_code(name)}"
        if pairing.factor:
            heading += f" (contrast of {_cell(pairing.factor)})"
        lines += [heading, ""]
        header = [
            f"| Group | Measure | {_cell(reference)} | {_cell(name)} "
            "| Difference | Tolerance | Verdict | Id |",
            "|---|---|--:|--:|--:|--:|---|---|",
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
                f"| {verdict} | `{finding_id(finding)}` |"
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
        accepted = [f for f in findings if f.status is Status.ACCEPTED and f.caused_by is None]
        for finding in accepted:
            lines.append(
                f"> ☑️ `{finding.name}` (`{finding_id(finding)}`): "
                f"{_cell(describe_acceptance(finding))}"
            )
        if accepted:
            lines.append("")
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
    cached = describe_cache(report)
    if cached:
        lines += ["", f"_{cached}_"]
    return "\n".join(lines).rstrip() + "\n"
