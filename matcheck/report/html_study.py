"""Charts of the HTML report for what the study's data and design add: the baseline's
standardised difference against the What Works Clearinghouse bands, and the planned sample of
each contrast against the sample its power needs.

The generic chart (a measure's value per version) would mislead for both: a baseline is judged
on Hedges' g, not on the means, and a power finding compares no two versions.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from html import escape

from matcheck.findings import Finding, Group, Report
from matcheck.report.svg import ChartRow, Curve, Zone, curve_chart, dot_chart, mark

BASELINE_PREFIX = "baseline:"
ADJUST_FILL = "#efefef"
EQUIVALENT_FILL = "#d0d0d0"


def is_baseline(finding: Finding) -> bool:
    return finding.dimension.startswith(BASELINE_PREFIX) and finding.unit == "SD"


def is_design(finding: Finding) -> bool:
    """A power finding of the study's design (matcheck/power/study_plan.py): it compares no
    two versions, and its values are the power, the target and the samples."""
    return finding.group is Group.DESIGN and "power" in finding.values


def baseline_chart(dimension: str, findings: Sequence[Finding], chart_id: str) -> str:
    """One row per contrast: g (condition minus reference, in SD) as the mark of its verdict,
    over the WWC bands: within ±0.05 equivalent, within ±0.25 with adjustment (docs/references.md
    §5)."""
    from matcheck.studystats.effects import ADJUSTMENT_MAX, EQUIVALENT_MAX

    rows = [
        ChartRow(
            f.condition,
            f.reference,
            None,
            f.difference,
            None,
            None,
            f.status,
            f"g = {f.difference:+.2f} · {f.status.value}" if f.difference is not None else "—",
        )
        for f in findings
        if f.dimension == dimension
    ]
    zones = (
        Zone(-ADJUSTMENT_MAX, ADJUSTMENT_MAX, f"±{ADJUSTMENT_MAX:g}: with adjustment", ADJUST_FILL),
        Zone(-EQUIVALENT_MAX, EQUIVALENT_MAX, "", EQUIVALENT_FILL),
    )
    measure = dimension.removeprefix(BASELINE_PREFIX)
    title = f"Baseline {measure}: Hedges' g against the WWC bands (±{EQUIVALENT_MAX:g} equivalent)"
    return f'<figure class="chart-box">{dot_chart(title, rows, chart_id, zones)}</figure>'


def design_section(report: Report, section_id: str, row_start: Callable[[Finding], str]) -> str:
    """The power of each contrast: a table, and the planned sample (the mark of the verdict)
    against the sample the target power needs (the ring) on one axis."""
    from matcheck.report.design import HEADER, NOTE, design_findings, design_rows

    findings = design_findings(report)
    parts = [f'<section id="{section_id}"><h2>Design</h2><table><thead><tr>']
    parts += [f"<th>{escape(h)}</th>" for h in (*HEADER, "See")]
    parts.append("</tr></thead><tbody>")
    for finding, row in zip(findings, design_rows(report), strict=True):
        # The verdict as its mark (shape and label), the rest as the other formats show it.
        cells = f"<td>{mark(finding.status)}</td>"
        cells += "".join(f"<td>{escape(cell)}</td>" for cell in row[1:])
        link = f'<td><a href="#{section_id}-chart">chart</a></td>'
        parts.append(f"{row_start(finding)}{cells}{link}</tr>")
    parts.append(f'</tbody></table><p class="hint">{escape(NOTE)}</p>')
    rows = []
    for finding in findings:
        planned, needed = _sample(finding, "planned"), _sample(finding, "needed")
        power, target = finding.values.get("power"), finding.values.get("target_power")
        text = f"power {power or 0:.2f} (target {target or 0:g}) · {finding.status.value}"
        contrast = finding.dimension.removeprefix("power:")
        rows.append(ChartRow(contrast, "", needed, planned, None, None, finding.status, text))
    unit = "classes" if any("planned_classes" in f.values for f in findings) else "learners"
    title = f"Planned {unit} per condition (mark) and needed for the target power (ring)"
    parts.append(
        f'<figure class="chart-box">{dot_chart(title, rows, section_id + "-chart")}</figure>'
    )
    curves = [
        Curve(
            finding.dimension.removeprefix("power:"),
            finding.status,
            _curve(finding),
            _sample(finding, "planned"),
        )
        for finding in findings
    ]
    if any(curve.points for curve in curves):
        target = next((f.values.get("target_power") for f in findings), None) or 0.8
        chart = curve_chart(
            "Power by sample (mark: the planned sample)",
            curves,
            section_id + "-curve",
            target=target,
            x_label=f"{unit} per condition",
        )
        parts.append(f'<figure class="chart-box">{chart}</figure>')
    parts.append("</section>")
    return "".join(parts)


def _curve(finding: Finding) -> tuple[tuple[float, float], ...]:
    """The power curve the design finding carries (``power_at_<units>`` values)."""
    prefix = "power_at_"
    points = [
        (float(key.removeprefix(prefix)), value)
        for key, value in finding.values.items()
        if key.startswith(prefix) and value is not None
    ]
    return tuple(sorted(points))


def _sample(finding: Finding, which: str) -> float | None:
    for unit in ("classes", "learners"):
        value = finding.values.get(f"{which}_{unit}")
        if value is not None:
            return value
    return None
