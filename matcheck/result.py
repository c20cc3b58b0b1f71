"""What :func:`matcheck.compare` and :func:`matcheck.check` return: one comparison, computed
once, to read as typed findings, as the JSON schema, as pandas frames, or rendered in any
registered format (docs/api.md).

pandas is optional (``pip install 'matcheck[pandas]'``) and imported only by the frame
methods; nothing here recomputes the comparison.
"""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING, Any

from matcheck.errors import UsageError
from matcheck.findings import Finding, Report, Status, StudyResult, exit_status
from matcheck.report.formatter import RenderOptions, Subject

if TYPE_CHECKING:
    import pandas

    from matcheck.report.methods import MethodsTable

# The columns of Result.to_frame(), in order (documented in docs/api.md).
FINDING_COLUMNS = (
    "reference",
    "condition",
    "factor",
    "group",
    "dimension",
    "item",
    "unit",
    "status",
    "basis",
    "reference_value",
    "condition_value",
    "difference",
    "relative_difference",
    "tolerance",
    "tolerance_absolute",
    "tolerance_relative",
    "reason",
    "caused_by",
    "evidence",
    "test",
    "p_value",
)
# The columns of Result.measures_frame(): one row per measure and version.
MEASURE_COLUMNS = ("condition", "is_reference", "group", "dimension", "label", "unit", "value")


def _pandas() -> Any:
    try:
        import pandas
    except ImportError:
        raise ImportError(
            "this needs pandas, an optional extra of matcheck: pip install 'matcheck[pandas]'"
        ) from None
    return pandas


@dataclass(frozen=True)
class Result:
    """The result of one comparison or study check."""

    report: Report
    coverage_threshold: float | None = None

    @property
    def findings(self) -> tuple[Finding, ...]:
        """Every finding, typed (:class:`matcheck.findings.Finding`)."""
        return self.report.findings

    @property
    def differs(self) -> bool:
        """True when something differs beyond tolerance (the CLI exits with 1)."""
        return self.report.differs

    @property
    def exit_status(self) -> int:
        return exit_status([self.report])

    def of_status(self, status: Status | str) -> tuple[Finding, ...]:
        """The findings with this verdict (``"differs"``, ``Status.DIFFERS``...)."""
        wanted = Status(status)
        return tuple(f for f in self.report.findings if f.status is wanted)

    def to_dict(self) -> dict[str, Any]:
        """The report as the JSON schema of ``--format json`` (docs/report-schema.md)."""
        from matcheck.report.json_report import report_dict

        return report_dict(self.report)

    def render(
        self, format: str = "table", *, show_matched: bool = True, width: int = 140
    ) -> str | bytes:
        """The report in any format of ``compare``/``check`` (``table``, ``json``,
        ``markdown``, ``github``, ``html``...), from the result already computed."""
        return _render(Subject.REPORT, format, self.report, show_matched, width)

    def methods_table(self) -> MethodsTable:
        """The methods-section table of this result (what ``matcheck table`` writes)."""
        from matcheck.report.methods import methods_table

        return methods_table(self.report, coverage_threshold=self.coverage_threshold)

    def render_methods(self, format: str = "markdown") -> str | bytes:
        """The methods-section table in any format of ``matcheck table``."""
        return _render(Subject.METHODS, format, self.methods_table(), True, 140)

    def save(self, path: str | Path, format: str | None = None) -> Path:
        """Write the report to ``path``; the format defaults to the one its extension names."""
        target = Path(path)
        chosen = format or _format_of(Subject.REPORT, target)
        from matcheck.output import write_output

        write_output(target, self.render(chosen), _inputs(self.report))
        return target

    def to_frame(self) -> pandas.DataFrame:
        """One row per finding (columns: :data:`FINDING_COLUMNS`, docs/api.md)."""
        pandas = _pandas()
        rows = [_finding_row(f, self.report) for f in self.report.findings]
        return pandas.DataFrame(rows, columns=list(FINDING_COLUMNS))

    def measures_frame(self) -> pandas.DataFrame:
        """One row per measure and version, with its value (columns: :data:`MEASURE_COLUMNS`)."""
        pandas = _pandas()
        return pandas.DataFrame(_measure_rows(self.report), columns=list(MEASURE_COLUMNS))

    def _repr_html_(self) -> str:
        from matcheck.report.html import report_fragment

        return report_fragment(self.report)

    def __repr__(self) -> str:
        counts = {s.value: len(self.report.root_findings(s)) for s in Status}
        shown = ", ".join(f"{n} {s}" for s, n in counts.items())
        names = ", ".join(c.name for c in self.report.conditions)
        return f"<matcheck Result: {len(self.report.conditions)} versions ({names}); {shown}>"


@dataclass(frozen=True)
class FolderResult:
    """The result of checking every study below a folder: each study's result or error."""

    results: tuple[StudyResult, ...]

    @property
    def studies(self) -> dict[str, Result]:
        return {r.path: Result(r.report) for r in self.results if r.report is not None}

    @property
    def errors(self) -> dict[str, str]:
        return {r.path: r.error or "" for r in self.results if r.report is None}

    @property
    def findings(self) -> tuple[Finding, ...]:
        return tuple(f for r in self.results if r.report is not None for f in r.report.findings)

    @property
    def exit_status(self) -> int:
        reports = [r.report for r in self.results if r.report is not None]
        return exit_status(reports, failed=len(self.errors))

    def to_dict(self) -> dict[str, Any]:
        import json

        from matcheck.report.studies import render_json

        loaded: dict[str, Any] = json.loads(render_json(self.results))
        return loaded

    def render(
        self, format: str = "table", *, show_matched: bool = True, width: int = 140
    ) -> str | bytes:
        return _render(Subject.STUDIES, format, list(self.results), show_matched, width)

    def to_frame(self) -> pandas.DataFrame:
        """One row per finding of every study, with a first column ``study``."""
        pandas = _pandas()
        rows = [
            {"study": r.path, **_finding_row(f, r.report)}
            for r in self.results
            if r.report is not None
            for f in r.report.findings
        ]
        return pandas.DataFrame(rows, columns=["study", *FINDING_COLUMNS])

    def _repr_html_(self) -> str:
        from matcheck.report.html import render_studies_html

        return render_studies_html(self.results)


def _render(subject: Subject, format: str, what: object, matched: bool, width: int) -> str | bytes:
    from matcheck.report.registry import get, render_text

    formatter = get(subject, format)
    return render_text(formatter, what, RenderOptions(show_matched=matched, width=width))


def _format_of(subject: Subject, path: Path) -> str:
    from matcheck.report.registry import FORMATTERS, names

    names(subject)  # loads the built-in formats
    for (each, name), formatter in FORMATTERS.items():
        if each is subject and formatter.extension != ".txt" and path.suffix == formatter.extension:
            return name
    raise UsageError(
        f"{path}: no format writes {path.suffix or 'files without an extension'}; pass format="
    )


def _inputs(report: Report) -> list[Path]:
    return [Path(p) for c in report.conditions for p in c.paths]


def _finding_row(finding: Finding, report: Report) -> dict[str, Any]:
    tolerance = finding.tolerance
    factor = next(
        (
            p.factor
            for p in report.pairs()
            if p.reference == finding.reference and p.condition == finding.condition
        ),
        None,
    )
    return {
        "reference": finding.reference,
        "condition": finding.condition,
        "factor": factor,
        "group": finding.group.value,
        "dimension": finding.dimension,
        "item": finding.item,
        "unit": finding.unit,
        "status": finding.status.value,
        "basis": finding.basis.value,
        "reference_value": finding.values.get(finding.reference),
        "condition_value": finding.values.get(finding.condition),
        "difference": finding.difference,
        "relative_difference": finding.relative_difference,
        "tolerance": tolerance.describe(finding.unit) if tolerance else None,
        "tolerance_absolute": tolerance.absolute if tolerance else None,
        "tolerance_relative": tolerance.relative if tolerance else None,
        "reason": finding.reason,
        "caused_by": finding.caused_by,
        "evidence": len(finding.evidence),
        "test": finding.test.name if finding.test else None,
        "p_value": finding.test.p_value if finding.test else None,
    }


def _measure_rows(report: Report) -> list[dict[str, Any]]:
    """Each version's value of each measure that has one value per version (not a count
    found between two versions, nor a post-test item's coverage, which depend on the pair)."""
    from matcheck.measures import registry

    reference = {c.name: c.is_reference for c in report.conditions}
    # Only the versions: findings on one sample (the pilot's post-test) have no version.
    seen: dict[tuple[str, str], dict[str, Any]] = {}
    for finding in report.findings:
        spec = registry.spec(finding.dimension)
        if finding.item is not None or (spec is not None and spec.from_zero):
            continue
        for name in (finding.reference, finding.condition):
            if name not in reference:
                continue
            seen.setdefault(
                (name, finding.dimension),
                {
                    "condition": name,
                    "is_reference": reference.get(name, False),
                    "group": finding.group.value,
                    "dimension": finding.dimension,
                    "label": spec.shown_label if spec else finding.dimension,
                    "unit": finding.unit,
                    "value": finding.values.get(name),
                },
            )
    order = {c.name: i for i, c in enumerate(report.conditions)}
    return sorted(seen.values(), key=lambda row: order.get(row["condition"], len(order)))
