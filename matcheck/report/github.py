"""GitHub Actions output: workflow-command annotations, and a Markdown step summary.

Each root finding that differs becomes an ``::error`` annotation on the condition's file
(with the line where the evidence is located, for Markdown and text); inconclusive findings
and warnings (stale ``[[accepted]]`` entries among them) become ``::warning``; accepted
differences, with their reason, become ``::notice``. With ``--against REV``, only the
differences new since REV are errors: those already there at REV are notices, and the lines
on what changed since REV are notices too. Every message ends with the finding's id. The
format of workflow
commands, and the escaping of ``%``, CR, LF (and, in properties, ``:`` and ``,``), follow
GitHub's documentation of workflow commands (docs/references.md §22).
"""

from __future__ import annotations

from pathlib import Path

from matcheck.findings import Evidence, Finding, Report, Status
from matcheck.identity import finding_id
from matcheck.report.common import (
    describe_acceptance,
    describe_evidence,
    describe_regression,
    format_difference,
    format_tolerance,
    is_new,
)
from matcheck.report.escape import terminal, workflow_data, workflow_property
from matcheck.report.formatter import RenderOptions


def _data(text: str) -> str:
    return workflow_data(terminal(text))


def _property(text: str) -> str:
    return workflow_property(terminal(text))


def _relative(path: str) -> str:
    try:
        return Path(path).resolve().relative_to(Path.cwd().resolve()).as_posix()
    except ValueError:
        return path


def _files(report: Report) -> dict[str, tuple[str, ...]]:
    return {c.name: c.paths for c in report.conditions if c.paths}


def _place(
    finding: Finding, files: dict[str, tuple[str, ...]]
) -> tuple[str | None, int | None, Evidence | None]:
    """The file (the right part of a lesson in parts) and line of the first located evidence
    (an unlocated one, such as an emphasised term, only when none is located)."""
    for item in sorted(finding.evidence, key=lambda e: e.location is None):
        paths = files.get(item.condition)
        if paths:
            part = item.location.part if item.location and item.location.part else 0
            line = item.location.line if item.location else None
            return paths[min(part, len(paths) - 1)], line, item
    paths = files.get(finding.condition)
    return (paths[0] if paths else None), None, None


def _command(kind: str, message: str, path: str | None, line: int | None, title: str) -> str:
    props = []
    if path:
        props.append(f"file={_property(_relative(path))}")
    if line:
        props.append(f"line={line}")
    props.append(f"title={_property(title)}")
    return f"::{kind} {','.join(props)}::{_data(message)}"


def _kind(report: Report, finding: Finding) -> tuple[str, str]:
    """The annotation's kind, and what the message says before the finding."""
    if finding.status is Status.INCONCLUSIVE:
        return "warning", ""
    if finding.status is Status.ACCEPTED:
        return "notice", ""
    if not report.revision:
        return "error", ""
    if is_new(report, finding):
        return "error", f"new since {report.revision}: "
    return "notice", f"already at {report.revision}: "


def render_github(report: Report, options: RenderOptions | None = None) -> str:
    files = _files(report)
    lines = []
    shown = (Status.DIFFERS, Status.INCONCLUSIVE, Status.ACCEPTED)
    for finding in report.findings:
        if finding.caused_by is not None or finding.status not in shown:
            continue
        path, line, evidence = _place(finding, files)
        kind, prefix = _kind(report, finding)
        message = (
            f"{prefix}{finding.condition} vs {finding.reference}: {finding.name} "
            f"{finding.status.value} ({format_difference(finding)}; tolerance "
            f"{format_tolerance(finding)}) [{finding_id(finding)}]"
        )
        if finding.group == "design":  # a contrast of the study, not a pair of versions
            message = f"{finding.dimension}: {finding.reason} [{finding_id(finding)}]"
        elif finding.reference == finding.condition:  # the post-test itself, no pair
            message = (
                f"post-test ({finding.condition}): {finding.dimension}: {finding.reason} "
                f"[{finding_id(finding)}]"
            )
        if finding.status is Status.ACCEPTED:
            message += f"\n{describe_acceptance(finding)}"
        if evidence is not None:
            pair = (finding.reference, finding.condition)
            message += f"\n{describe_evidence(evidence, pair)}"
        lines.append(_command(kind, message, path, line, f"matcheck: {finding.group}"))
    for text in report.warnings:
        lines.append(_command("warning", text, None, None, "matcheck"))
    for text in map(describe_regression, report.regressions):
        lines.append(_command("notice", text, None, None, "matcheck"))
    return "\n".join(lines) + ("\n" if lines else "")


def error_command(path: str, message: str) -> str:
    """An ``::error`` annotation on a file that could not be checked."""
    return _command("error", message, path, None, "matcheck") + "\n"
