"""The ``design`` findings (power for each contrast) as every report format shows them.

They belong to no pair of conditions, so the per-pair tables leave them out; each format
adds one section built from :func:`design_rows`.
"""

from __future__ import annotations

from matcheck.findings import Finding, Group, Report, Status

GROUP = Group.DESIGN
TITLE = "Design: power for each contrast"
HEADER = ("Verdict", "Contrast", "Power", "Target", "Planned", "Needed", "Detects")


def design_findings(report: Report) -> tuple[Finding, ...]:
    return tuple(f for f in report.findings if f.group == GROUP)


def contrast(finding: Finding) -> str:
    return finding.dimension.removeprefix("power:")


def _whole(value: float | None) -> str:
    return "—" if value is None else f"{value:,.0f}"


def design_rows(report: Report) -> list[tuple[str, ...]]:
    """One row per contrast: verdict, contrast, power, target, planned, needed, detectable."""
    rows: list[tuple[str, ...]] = []
    for finding in design_findings(report):
        values = finding.values
        rows.append(
            (
                finding.status.value,
                contrast(finding),
                f"{values['power'] or 0:.2f}",
                f"{values['target_power'] or 0:g}",
                _sample(values, "planned"),
                _sample(values, "needed"),
                f"{finding.unit} ≥ {values['detectable_effect'] or 0:.2f}",
            )
        )
    return rows


def _sample(values: dict[str, float | None], which: str) -> str:
    # Learners per condition, the usual case, go bare; classes say so.
    if f"{which}_classes" in values:
        return f"{_whole(values[f'{which}_classes'])} classes"
    return _whole(values.get(f"{which}_learners"))


NOTE = "Planned and needed: learners per condition (unless classes)."


def shortfalls(report: Report) -> list[str]:
    """One line for each contrast the planned sample is short for: the finding's reason."""
    return [
        f"{contrast(f)}: {f.reason}"
        for f in design_findings(report)
        if f.status is not Status.MATCHED
    ]
