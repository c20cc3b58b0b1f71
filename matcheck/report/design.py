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


def _apa(value: float) -> str:
    """APA style for a statistic that cannot exceed 1: no leading zero, 2–3 decimals."""
    text = f"{value:.3f}".rstrip("0")
    whole, _, decimals = text.partition(".")
    return f"{'' if whole == '0' else whole}.{decimals.ljust(2, '0')}"


def _contrast_phrase(name: str, factorial: bool) -> str:
    if "×" in name:
        return f"the {name.replace('×', ' × ')} interaction"
    if name == "conditions":
        return "the difference between conditions"
    return f"the main effect of {name}" if factorial else f"the effect of {name}"


def sample_size_paragraph(report: Report) -> str:
    """A sentence or two for the methods section from the ``design`` findings ("" if none).

    "With n = … per condition, the study had …% power to detect d = … at α = .05,
    two-sided", for every contrast, and the smallest effects it could detect.
    """
    findings = design_findings(report)
    if not findings:
        return ""
    first = findings[0].values
    factorial = any("×" in contrast(f) for f in findings)
    symbol = findings[0].unit
    classes = "planned_classes" in first
    planned = first["planned_classes" if classes else "planned_learners"] or 0
    conditions = len(report.conditions)
    if classes:
        size = first["class_size"] or 0
        sample = (
            f"{planned:.0f} classes of {size:.0f} learners per condition "
            f"({planned * size * conditions:,.0f} learners in all)"
        )
    else:
        sample = f"n = {planned:.0f} learners per condition ({planned * conditions:,.0f} in all)"
    effects = {f.values["smallest_effect"] for f in findings}
    parts = []
    for index, finding in enumerate(findings):
        power = f"{(finding.values['power'] or 0) * 100:.0f}%"
        effect = f"{symbol} = {finding.values['smallest_effect'] or 0:.2f} "
        detail = effect if len(effects) > 1 or index == 0 else ""
        lead = "power to detect " if index == 0 else ""
        phrase = _contrast_phrase(contrast(finding), factorial)
        parts.append(f"{power} {lead}{detail}for {phrase}")
    sided = "one-sided" if first["one_sided"] else "two-sided"
    conditions_text = [f"α = {_apa(first['alpha'] or 0.05)}, {sided}"]
    if first["pretest_correlation"] is not None:
        conditions_text.append(
            f"with the pre-test as covariate (assumed r = {_apa(first['pretest_correlation'])})"
        )
    if first["icc"] is not None:
        conditions_text.append(f"with whole classes assigned (assumed ICC = {_apa(first['icc'])})")
    target = f"{(first['target_power'] or 0) * 100:.0f}%"
    detectable = [f"{f.values['detectable_effect'] or 0:.2f}" for f in findings]
    sentences = [
        f"With {sample}, the study had {_join(parts)}, at {', '.join(conditions_text)}.",
        f"The smallest effect{'s' if len(findings) > 1 else ''} it could detect with {target} "
        f"power {'were' if len(findings) > 1 else 'was'} {symbol} = {_join(detectable)}"
        + (" respectively." if len(findings) > 1 else "."),
    ]
    return " ".join(sentences)


def _join(items: list[str]) -> str:
    if len(items) <= 2:
        return " and ".join(items)
    return ", ".join(items[:-1]) + ", and " + items[-1]
