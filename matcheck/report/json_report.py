"""The JSON report: a documented, versioned schema (docs/report-schema.md)."""

from __future__ import annotations

import json
from typing import Any

from matcheck import __version__
from matcheck.findings import SCHEMA_VERSION, Accepted, Evidence, Finding, Report
from matcheck.identity import finding_id
from matcheck.model import Location
from matcheck.report.common import describe_regression, is_new, sorted_findings, summary_counts
from matcheck.report.formatter import RenderOptions


def location_dict(location: Location | None) -> dict[str, Any] | None:
    if location is None:
        return None
    return {
        "block": location.block,
        "page": location.page,
        "line": location.line,
        "section": location.section,
        "paragraph": location.paragraph,
        "part": location.part,
        "after_paragraph": location.after_paragraph,
        "description": location.describe(),
    }


def _evidence(item: Evidence) -> dict[str, Any]:
    return {
        "kind": item.kind.value,
        "condition": item.condition,
        "text": item.text,
        "location": location_dict(item.location),
        "weight": item.weight,
        "similarity": item.similarity,
        "counterpart": location_dict(item.counterpart),
        "counterpart_text": item.counterpart_text or None,
    }


def _accepted(entry: Accepted | None) -> dict[str, Any] | None:
    if entry is None:
        return None
    return {
        "entry": entry.number,
        "up_to": entry.extent(),
        "reason": entry.reason,
        "by": entry.by or None,
        "date": entry.date or None,
    }


def finding_dict(finding: Finding, new: bool | None = None) -> dict[str, Any]:
    tolerance = finding.tolerance
    return {
        "id": finding_id(finding),
        "dimension": finding.dimension,
        "item": finding.item,
        "group": finding.group.value,
        "unit": finding.unit,
        "reference": finding.reference,
        "condition": finding.condition,
        "status": finding.status.value,
        "values": finding.values,
        "difference": finding.difference,
        "relative_difference": finding.relative_difference,
        "tolerance": None
        if tolerance is None
        else {
            "absolute": tolerance.absolute,
            "relative": tolerance.relative,
            "description": tolerance.describe(finding.unit),
            "reason": tolerance.reason,
        },
        "basis": finding.basis.value,
        "reason": finding.reason,
        "caused_by": finding.caused_by,
        "test": None
        if finding.test is None
        else {
            "name": finding.test.name,
            "p_value": finding.test.p_value,
            "detail": finding.test.detail,
        },
        "evidence": [_evidence(item) for item in finding.evidence],
        "accepted": _accepted(finding.accepted),
        "new": new,
    }


def report_dict(report: Report) -> dict[str, Any]:
    counts = summary_counts(report)
    return {
        "schema_version": SCHEMA_VERSION,
        "tool": {"name": "matcheck", "version": __version__},
        "title": report.title or None,
        "reference": report.reference,
        "manipulated": list(report.manipulated),
        "comparisons": [
            {
                "reference": p.reference,
                "condition": p.condition,
                "manipulated": list(p.manipulated),
                "factor": p.factor,
            }
            for p in report.pairs()
        ],
        "words_per_minute": report.words_per_minute,
        "settings": report.settings.as_dict(),
        "conditions": [
            {
                "name": c.name,
                "paths": list(c.paths),
                "format": c.format,
                "reference": c.is_reference,
                "warnings": list(c.warnings),
                "excluded": list(c.excluded),
            }
            for c in report.conditions
        ],
        "summary": {
            "verdict": "differs" if report.differs else "matched",
            "root_findings": counts,
        },
        "findings": [
            finding_dict(f, is_new(report, f) if report.revision else None)
            for f in sorted_findings(report.findings)
        ],
        "spread": [
            {
                "dimension": s.dimension,
                "group": s.group.value,
                "unit": s.unit,
                "min": s.minimum,
                "max": s.maximum,
                "range": s.maximum - s.minimum,
                "status": s.status.value,
            }
            for s in report.spreads
        ],
        "warnings": list(report.warnings),
        "revision": report.revision or None,
        "changes": [finding_dict(f) for f in sorted_findings(report.changes)],
        "regressions": [describe_regression(r) for r in report.regressions],
        "notes": list(report.notes),
        **({"study_data": _study_data(report)} if report.data is not None else {}),
        **(
            {"cache": {"files": report.cache.files, "from_cache": report.cache.from_cache}}
            if report.cache is not None
            else {}
        ),
    }


def _study_data(report: Report) -> dict[str, Any]:
    from matcheck.report.study_data import data_dict

    assert report.data is not None
    return data_dict(report.data)


def render_json(report: Report, options: RenderOptions | None = None) -> str:
    from matcheck.report.escape import json_text

    return json_text(json.dumps(report_dict(report), indent=2, ensure_ascii=False)) + "\n"
