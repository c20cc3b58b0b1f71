"""Formatting shared by every output format: values, differences, ordering, labels."""

from __future__ import annotations

from matcheck.findings import (
    Evidence,
    EvidenceKind,
    Finding,
    Group,
    Regression,
    RegressionKind,
    Report,
    Status,
)
from matcheck.identity import finding_id
from matcheck.measures import registry
from matcheck.measures.base import UNIT_DECIMALS, Role
from matcheck.measures.comparisons import KEY_TERM_COVERAGE

STATUS_ORDER = (
    Status.DIFFERS,
    Status.INCONCLUSIVE,
    Status.ACCEPTED,
    Status.INTENDED,
    Status.MATCHED,
)
GROUP_ORDER = tuple(Group)


def format_value(value: float | None, unit: str, dimension: str = "") -> str:
    if value is None:
        return "—"
    spec = registry.spec(dimension)
    decimals = spec.shown_decimals if spec else UNIT_DECIMALS.get(unit, 0)
    if unit == "share":
        return f"{value * 100:.1f}%"
    if decimals == 0 and float(value).is_integer():
        return f"{int(value):,}"
    return f"{value:,.{decimals}f}"


def format_difference(finding: Finding, *, short: bool = False) -> str:
    """The difference; ``short`` gives only the percentage for relatively judged measures."""
    if finding.difference is None:
        return "—"
    spec = registry.spec(finding.dimension)
    if spec is not None and spec.role is Role.PAIRWISE:
        if finding.dimension == KEY_TERM_COVERAGE.id:
            if short:
                return f"−{finding.difference * 100:.1f}%" if finding.difference else "±0.0%"
            return f"{finding.difference * 100:.1f}% missing"
        return f"{int(finding.difference)}"
    sign = "+" if finding.difference > 0 else "−" if finding.difference < 0 else "±"
    relative = finding.relative_difference
    tolerance = finding.tolerance
    if short and relative is not None and tolerance is not None and tolerance.relative:
        return f"{sign}{abs(relative) * 100:.1f}%"
    text = format_value(abs(finding.difference), finding.unit, finding.dimension)
    if (
        not short
        and relative is not None
        and finding.difference
        and finding.unit not in ("share", "grade", "points", "score", "SD")
    ):
        return f"{sign}{text} ({sign}{abs(relative) * 100:.1f}%)"
    return f"{sign}{text}"


def format_tolerance(finding: Finding, *, short: bool = False) -> str:
    if finding.tolerance is None:
        return "—"
    if finding.dimension == KEY_TERM_COVERAGE.id:
        covered = f"≥{(1 - finding.tolerance.absolute) * 100:g}%"
        return covered if short else f"{covered} covered"
    unit = "" if finding.unit == "share" or short else finding.unit
    if finding.unit == "share" and finding.tolerance.absolute:
        return f"±{finding.tolerance.absolute * 100:g} points"
    return finding.tolerance.describe(unit)


def sorted_findings(findings: tuple[Finding, ...] | list[Finding]) -> list[Finding]:
    """Differences first, then by group and in catalogue order (stable)."""

    def key(finding: Finding) -> tuple[int, int]:
        group = GROUP_ORDER.index(finding.group) if finding.group in GROUP_ORDER else 99
        return STATUS_ORDER.index(finding.status), group

    return sorted(findings, key=key)


def describe_evidence(item: Evidence, pair: tuple[str, str]) -> str:
    """One line for a piece of evidence of the comparison ``pair`` (reference, condition),
    saying which version has what the other lacks."""
    here = item.condition
    there = pair[1] if here == pair[0] else pair[0]
    label = item.kind.phrase.format(here=here, there=there)
    where = f" — {item.location.describe()}" if item.location else ""
    extra = ""
    if item.similarity is not None:
        extra += f" (similarity {item.similarity:.2f})"
    if item.kind is EvidenceKind.TERM_MISSING and item.weight is not None:
        extra += f" (weight {item.weight * 100:.1f}%)"
    line = f"{label}{where}: “{item.text}”{extra}"
    if item.counterpart is not None:
        counterpart = f"; in {there} at {item.counterpart.describe()}"
        if item.counterpart_text:
            counterpart += f": “{item.counterpart_text}”"
        line += counterpart
    elif item.counterpart_text and item.kind is not EvidenceKind.TERM_MISSING:
        line += f" ({item.counterpart_text})"
    return line


def summary_counts(report: Report) -> dict[str, int]:
    return {status.value: len(report.root_findings(status)) for status in STATUS_ORDER}


def counts_sentence(report: Report) -> str:
    """``2 differ, 1 inconclusive, 3 intended, 40 matched`` (accepted only when there are)."""
    counts = summary_counts(report)
    accepted = f"{counts['accepted']} accepted, " if counts["accepted"] else ""
    return (
        f"{counts['differs']} differ, {counts['inconclusive']} inconclusive, {accepted}"
        f"{counts['intended']} intended, {counts['matched']} matched"
    )


def describe_acceptance(finding: Finding) -> str:
    """The reason a finding is accepted, and by whom and when, as one line."""
    entry = finding.accepted
    if entry is None:
        return finding.reason
    extra = ", ".join(part for part in (entry.by, entry.date) if part)
    shown = f" ({extra})" if extra else ""
    if finding.caused_by is not None and finding.reason.startswith("follows"):
        return f"{finding.reason}: {entry.reason}{shown}"
    return f"accepted up to {entry.extent()}: {entry.reason}{shown}"


def is_new(report: Report, finding: Finding) -> bool:
    """With --against: whether a difference is new since the revision (not there before)."""
    return finding.status is Status.DIFFERS and finding_id(finding) not in report.preexisting


def review_split(report: Report) -> tuple[list[Finding], list[Finding]]:
    """With --against: the root differences new since the revision, and those already there."""
    # Findings of the study as a whole (its power, its post-test) belong to no pair of versions.
    roots = [f for f in report.root_findings(Status.DIFFERS) if f.reference and f.condition]
    new = [f for f in roots if is_new(report, f)]
    return new, [f for f in roots if not is_new(report, f)]


def describe_cache(report: Report) -> str | None:
    """How many lesson files came from the cache (``None`` when the cache was off)."""
    if report.cache is None:
        return None
    files, cached = report.cache.files, report.cache.from_cache
    return (
        f"{cached} of {files} lesson file{'s' if files != 1 else ''} from the cache "
        "(unchanged since an earlier run; --no-cache reads every file again)."
    )


def describe_regression(regression: Regression) -> str:
    """One sentence for what a pull request changed or broke since its base revision."""
    name, revision = regression.condition, regression.revision
    if regression.kind is RegressionKind.NEW:
        return f"{name} is new since {revision}"
    if regression.kind is RegressionKind.CHANGED:
        changes = ", ".join(_change_phrase(f) for f in regression.changes)
        return f"{name} changed since {revision}: {changes}"
    shown = []
    for key in regression.dimensions:
        spec = registry.spec(key.partition(":")[0])
        shown.append(f"{spec.group.value} ({key})" if spec else key)
    return (
        f"{name} now differs from {regression.reference} in {', '.join(shown)}, "
        f"which matched at {revision}"
    )


def _change_phrase(finding: Finding) -> str:
    if finding.unit == "passages" and finding.difference:
        what = finding.dimension.removeprefix("passages_")
        count = int(finding.difference)
        return f"{count} passage{'s' if count != 1 else ''} {what}"
    if finding.difference is not None:
        relative = finding.relative_difference
        change = f"{finding.dimension} {finding.difference:+.4g}"
        return f"{change} ({relative * 100:+.1f}%)" if relative is not None else change
    return finding.dimension
