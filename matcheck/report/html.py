"""The HTML report: one self-contained page that opens offline (docs/html-report.md).

No script, no font, no image file and no link leaves the page: the style sheet is inline and
the charts are inline SVG drawn by :mod:`matcheck.report.svg`. The page is built from the
:class:`~matcheck.findings.Report` alone and is generic over its content: every
:class:`~matcheck.findings.Group` present gets a section, every measure of it a chart, every
item-wise dimension a grid, and every piece of evidence (of any
:class:`~matcheck.findings.EvidenceKind`) an anchored entry the findings link to. Every piece
of the user's text goes through :func:`html.escape`.
"""

from __future__ import annotations

import math
import re
from collections.abc import Iterable, Sequence
from dataclasses import dataclass, field
from html import escape

from matcheck import __version__
from matcheck.findings import (
    NOT_PROOF,
    Evidence,
    EvidenceKind,
    Finding,
    Group,
    Pairing,
    Report,
    Status,
    StudyResult,
)
from matcheck.measures import registry
from matcheck.measures.comparisons import ITEM_COVERAGE
from matcheck.report.common import (
    STATUS_ORDER,
    counts_sentence,
    describe_evidence,
    describe_regression,
    format_difference,
    format_tolerance,
    format_value,
    summary_counts,
)
from matcheck.report.formatter import RenderOptions
from matcheck.report.html_study import baseline_chart, design_section, is_baseline, is_design
from matcheck.report.html_style import STYLE
from matcheck.report.svg import ChartRow, dot_chart, mark
from matcheck.report.table import ordered_with_echoes
from matcheck.report.worddiff import marked_pair, word_diff

# Evidence whose counterpart text is not a passage of the other version (a list of missing
# terms), so it is shown as a line, not as two passages side by side.
NOT_PASSAGES = frozenset(
    kind
    for kind in EvidenceKind
    if kind.value.startswith("item_")
    or kind.value in {"heading_level_changed", "possible_reason", "ruled_out", "weak_item"}
)
# Evidence about a term, not a passage: one line each.
ONE_LINE = frozenset(
    {EvidenceKind.EMPHASIS_ADDED, EvidenceKind.EMPHASIS_REMOVED, EvidenceKind.TERM_MISSING}
)


def render_html(report: Report, options: RenderOptions | None = None) -> str:
    """The whole page for one report."""
    title = report.title or "matcheck report"
    return _page(title, report_fragment(report, options))


def render_studies_html(
    results: Sequence[StudyResult], options: RenderOptions | None = None
) -> str:
    """One page for every study of a folder: an index, then each study's report."""
    parts = ['<div class="mc">', f"<style>{STYLE}</style>", "<header><h1>Studies</h1>"]
    parts.append(f'<p class="meta">matcheck {escape(__version__)} · {len(results)} studies</p>')
    parts.append("</header><section><h2>Index</h2><table><thead><tr>")
    parts.append("<th>Study</th><th>Verdict</th><th>Differ</th><th>Inconclusive</th></tr>")
    parts.append("</thead><tbody>")
    for index, result in enumerate(results, 1):
        link = f'<a href="#s{index}-top">{escape(result.path)}</a>'
        if result.report is None:
            parts.append(
                f"<tr><td>{link}</td><td>{mark(Status.INCONCLUSIVE, 'error')} "
                f"{escape(result.error or '')}</td><td>—</td><td>—</td></tr>"
            )
            continue
        status = Status.DIFFERS if result.report.differs else Status.MATCHED
        counts = summary_counts(result.report)
        parts.append(
            f"<tr><td>{link}</td><td>{mark(status)}</td><td>{counts['differs']}</td>"
            f"<td>{counts['inconclusive']}</td></tr>"
        )
    parts.append("</tbody></table></section>")
    for index, result in enumerate(results, 1):
        parts.append(f'<article class="study" id="s{index}-top">')
        if result.report is None:
            parts.append(
                f"<h2>{escape(result.path)}</h2><p>{mark(Status.INCONCLUSIVE, 'error')} "
                f"{escape(result.error or '')}</p>"
            )
        else:
            parts.append(
                _body(result.report, options, prefix=f"s{index}-", heading=result.path, level=2)
            )
        parts.append("</article>")
    parts.append(f'<footer><p class="note">{escape(NOT_PROOF)}</p></footer></div>')
    return _page("matcheck: studies", "".join(parts))


def report_fragment(report: Report, options: RenderOptions | None = None) -> str:
    """The report as one ``<div>`` with its style scoped to it (a notebook shows this)."""
    title = report.title or "matcheck report"
    body = _body(report, options, prefix="", heading=title, level=1)
    return f'<div class="mc"><style>{STYLE}</style>{body}</div>'


def _page(title: str, content: str) -> str:
    return (
        "<!DOCTYPE html>\n"
        '<html lang="en"><head><meta charset="utf-8">'
        '<meta name="viewport" content="width=device-width, initial-scale=1">'
        f"<title>{escape(title)}</title></head><body>{content}</body></html>\n"
    )


@dataclass
class _Anchors:
    """Ids within one report (``prefix`` keeps them unique on a page of several studies)."""

    prefix: str
    evidence: dict[tuple[object, ...], str] = field(default_factory=dict)
    findings: dict[int, str] = field(default_factory=dict)
    charted: set[str] = field(default_factory=set)
    counted: set[str] = field(default_factory=set)
    named: dict[tuple[str, str], str] = field(default_factory=dict)

    def finding(self, finding: Finding) -> str:
        return self.findings.setdefault(id(finding), f"{self.prefix}f{len(self.findings) + 1}")

    def of_evidence(self, pairing: Pairing, item: Evidence) -> str:
        key = (
            pairing.reference,
            pairing.condition,
            item.kind,
            item.condition,
            item.text,
            item.location,
            item.counterpart,
            item.counterpart_text,
        )
        return self.evidence.setdefault(key, f"{self.prefix}e{len(self.evidence) + 1}")

    def chart(self, dimension: str) -> str:
        return self._unique("chart", dimension)

    def counts(self, group: str) -> str:
        return f"{self.prefix}counts-{_slug(group)}"

    def grid(self, dimension: str) -> str:
        return self._unique("grid", dimension)

    def _unique(self, kind: str, name: str) -> str:
        """An id for ``name``, the same each time; two names with one slug (measures named in
        the learners' data, "pre test" and "pre-test") get different ids."""
        key = (kind, name)
        if key not in self.named:
            base = f"{self.prefix}{kind}-{_slug(name)}"
            taken = set(self.named.values())
            candidate, number = base, 2
            while candidate in taken:
                candidate, number = f"{base}-{number}", number + 1
            self.named[key] = candidate
        return self.named[key]

    def section(self, name: str) -> str:
        return f"{self.prefix}{_slug(name)}"


def _slug(text: str) -> str:
    return re.sub(r"[^a-z0-9]+", "-", text.lower()).strip("-") or "x"


def _body(
    report: Report, options: RenderOptions | None, *, prefix: str, heading: str, level: int
) -> str:
    anchors = _Anchors(prefix)
    groups = _groups(report.findings)
    for dimension in dict.fromkeys(f.dimension for f in report.findings):
        if _chartable(dimension, report.findings):
            anchors.charted.add(dimension)
        elif _counted(dimension, report.findings):
            anchors.counted.add(dimension)
    h = f"h{level}"
    parts = [f"<header><{h}>{escape(heading)}</{h}>"]
    parts.append(
        f'<p class="meta">matcheck {escape(__version__)} · reference '
        f"<b>{escape(report.reference)}</b> · manipulated: "
        f"{escape(', '.join(report.manipulated) or 'nothing')} · reading rate "
        f"{report.words_per_minute:g} words/min</p>"
    )
    parts.append(_verdict(report))
    parts.append(_legend())
    parts.append("</header>")
    parts.append('<nav class="toc"><b>Contents:</b> ')
    links = [("summary", "Summary"), ("conditions", "Versions"), ("findings", "Findings")]
    links += [(f"group-{g.value}", g.value.capitalize()) for g in groups]
    links.append(("passages", "Passages"))
    parts.append(" · ".join(f'<a href="#{anchors.section(a)}">{escape(t)}</a>' for a, t in links))
    parts.append("</nav>")
    # Anchors for evidence are assigned in the passages section; build it first.
    passages = _passages(report, anchors)
    parts.append(_summary(report, groups, anchors))
    parts.append(_conditions(report, anchors))
    parts.append(_findings(report, anchors))
    for group in groups:
        parts.append(_group_section(report, group, anchors))
    parts.append(passages)
    parts.append(_notes(report))
    return "".join(parts)


def _groups(findings: Iterable[Finding]) -> list[Group]:
    present = {f.group for f in findings}
    return [g for g in Group if g in present]


def _worst(findings: Iterable[Finding]) -> Status | None:
    statuses = {f.status for f in findings}
    return next((s for s in STATUS_ORDER if s in statuses), None)


def _verdict(report: Report) -> str:
    status = Status.DIFFERS if report.differs else Status.MATCHED
    words = "Possible confounds found" if report.differs else "No differences beyond tolerance"
    counts = escape(counts_sentence(report))
    return f'<p class="verdict">{mark(status, words)} — {counts} (root findings).</p>'


def _legend() -> str:
    items = [
        mark(None, "reference value"),
        '<span class="band-key" aria-hidden="true"></span> tolerance band around the reference',
        *(mark(s) for s in STATUS_ORDER),
        '<del class="removed">removed</del>',
        '<ins class="added">added</ins>',
        '<del class="changed">changed</del>',
    ]
    return '<p class="legend"><b>Key:</b> ' + " · ".join(items) + "</p>"


def _contrasts(report: Report) -> tuple[Pairing, ...]:
    """The report's comparisons, then any other pair its findings name: the learners' data
    and the post-test's quality are judged on one sample (reference and condition the same),
    and later findings may name pairs of their own."""
    pairs = report.pairs()
    known = {(p.reference, p.condition) for p in pairs}
    extra = dict.fromkeys(
        (f.reference, f.condition)
        for f in report.findings
        if (f.reference, f.condition) not in known and not is_design(f)
    )
    return (*pairs, *(Pairing(reference, condition) for reference, condition in extra))


def _pair_title(pairing: Pairing) -> str:
    if pairing.reference == pairing.condition:
        return f"{escape(pairing.condition)} (on its own)"
    text = f"{escape(pairing.condition)} vs {escape(pairing.reference)} (reference)"
    if pairing.factor:
        text += f" — contrast of {escape(pairing.factor)}"
    if pairing.manipulated:
        text += f"; manipulated: {escape(', '.join(pairing.manipulated))}"
    return text


def _summary(report: Report, groups: list[Group], anchors: _Anchors) -> str:
    """A row per group, a column per contrast: the worst verdict of the group's root findings
    and how many findings have it. Contrasts are columns because groups grow with the study
    (its data, its power) while a design has few contrasts; a wide table scrolls on its own."""
    contrasts = _contrasts(report)
    parts = [f'<section id="{anchors.section("summary")}"><h2>Summary</h2>']
    parts.append('<div class="wide"><table class="summary"><thead><tr><th>Group</th>')
    parts += [f"<th>{_pair_head(p)}</th>" for p in contrasts]
    parts.append("</tr></thead><tbody>")
    for group in groups:
        parts.append(
            f'<tr><th scope=row><a href="#{anchors.section("group-" + group.value)}">'
            f"{escape(group.value)}</a></th>"
        )
        design = [f for f in report.findings if f.group is group and is_design(f)]
        if design:  # power belongs to the study, not to one contrast
            worst = _worst(design) or Status.MATCHED
            count = sum(1 for f in design if f.status is worst)
            parts.append(
                f'<td colspan="{len(contrasts)}">{mark(worst, f"{worst.value} ({count})")} '
                "power for each contrast</td></tr>"
            )
            continue
        for pairing in contrasts:
            in_group = [
                f for f in report.findings_of(pairing) if f.caused_by is None and f.group is group
            ]
            status = _worst(in_group)
            if status is None:
                parts.append("<td>—</td>")
                continue
            count = sum(1 for f in in_group if f.status is status)
            label = f"{status.value}" + (f" ({count})" if status is not Status.MATCHED else "")
            parts.append(f"<td>{mark(status, label)}</td>")
        parts.append("</tr>")
    parts.append("</tbody></table></div>")
    factors = [p for p in contrasts if p.factor or p.manipulated]
    if factors:
        parts.append("<ul class=contrasts>")
        parts += [f"<li>{_pair_title(p)}</li>" for p in factors]
        parts.append("</ul>")
    parts.append("</section>")
    return "".join(parts)


def _pair_head(pairing: Pairing) -> str:
    """A contrast as a column header: the version, then the reference in small type."""
    if pairing.reference == pairing.condition:
        return f"{escape(pairing.condition)}<br><small>on its own</small>"
    return f"{escape(pairing.condition)}<br><small>vs {escape(pairing.reference)}</small>"


def _conditions(report: Report, anchors: _Anchors) -> str:
    parts = [f'<section id="{anchors.section("conditions")}"><h2>Versions</h2><table>']
    parts.append("<thead><tr><th>Name</th><th>Format</th><th>Files</th><th>Notes</th></tr>")
    parts.append("</thead><tbody>")
    for condition in report.conditions:
        name = escape(condition.name)
        if condition.is_reference:
            name = f"{mark(None, condition.name)} <small>(reference)</small>"
        notes = [escape(w) for w in condition.warnings]
        if condition.excluded:
            notes.append("left out of the lesson text: " + escape("; ".join(condition.excluded)))
        parts.append(
            f"<tr><td>{name}</td><td>{escape(condition.format)}</td>"
            f"<td>{'<br>'.join(escape(p) for p in condition.paths)}</td>"
            f"<td>{'<br>'.join(notes)}</td></tr>"
        )
    parts.append("</tbody></table></section>")
    return "".join(parts)


def _finding_row(finding: Finding, is_echo: bool, pairing: Pairing, anchors: _Anchors) -> str:
    links = [
        f'<a href="#{anchors.of_evidence(pairing, item)}">passage {n}</a>'
        for n, item in enumerate(finding.evidence, 1)
    ]
    if finding.item is not None:
        links.append(f'<a href="#{anchors.grid(finding.dimension)}">grid</a>')
    elif finding.dimension in anchors.charted:
        links.append(f'<a href="#{anchors.chart(finding.dimension)}">chart</a>')
    elif finding.dimension in anchors.counted:
        links.append(f'<a href="#{anchors.counts(finding.group.value)}">counts</a>')
    name = ("↳ " if is_echo else "") + finding.name
    reference, condition = pairing.reference, pairing.condition
    return (
        f"{_row_start(finding, anchors)}"
        f"<td>{mark(finding.status)}</td><td>{escape(finding.group.value)}</td>"
        f'<td class="measure">{escape(name)}</td>'
        f'<td class="num">{escape(_value(finding, reference))}</td>'
        f'<td class="num">{escape(_value(finding, condition))}</td>'
        f'<td class="num">{escape(format_difference(finding))}</td>'
        f'<td class="num">{escape(format_tolerance(finding))}</td>'
        f"<td>{escape(finding.reason)}</td><td>{' '.join(links)}</td></tr>"
    )


def _row_start(finding: Finding, anchors: _Anchors) -> str:
    """A finding's table row opens with its anchor and what identifies it (for the tests)."""
    return (
        f'<tr id="{anchors.finding(finding)}" class="finding status-{finding.status.value}" '
        f'data-reference="{escape(finding.reference)}" '
        f'data-condition="{escape(finding.condition)}" '
        f'data-key="{escape(finding.key)}" data-status="{finding.status.value}">'
    )


def _value(finding: Finding, name: str) -> str:
    return format_value(finding.values.get(name), finding.unit, finding.dimension)


def _findings_table(rows: list[str], pairing: Pairing) -> str:
    head = (
        "<table class=findings><thead><tr><th>Verdict</th><th>Group</th><th>Measure</th>"
        f'<th class="num">{escape(pairing.reference)}</th>'
        f'<th class="num">{escape(pairing.condition)}</th>'
        '<th class="num">Difference</th><th class="num">Tolerance</th><th>Why</th><th>See</th>'
        "</tr></thead><tbody>"
    )
    return head + "".join(rows) + "</tbody></table>"


def _findings(report: Report, anchors: _Anchors) -> str:
    parts = [f'<section id="{anchors.section("findings")}"><h2>Findings</h2>']
    for pairing in _contrasts(report):
        parts.append(f"<h3>{_pair_title(pairing)}</h3>")
        ordered = ordered_with_echoes(list(report.findings_of(pairing)))
        shown = [
            _finding_row(f, echo, pairing, anchors)
            for f, echo in ordered
            if f.status is not Status.MATCHED
        ]
        matched = [
            _finding_row(f, echo, pairing, anchors)
            for f, echo in ordered
            if f.status is Status.MATCHED
        ]
        if shown:
            parts.append(_findings_table(shown, pairing))
        else:
            parts.append("<p>Every measure matched.</p>")
        if matched:
            parts.append(
                f"<details><summary>{len(matched)} matched measures</summary>"
                f"{_findings_table(matched, pairing)}</details>"
            )
    parts.append("</section>")
    return "".join(parts)


def _group_section(report: Report, group: Group, anchors: _Anchors) -> str:
    findings = [f for f in report.findings if f.group is group]
    if findings and all(is_design(f) for f in findings):
        section = anchors.section("group-" + group.value)
        return design_section(report, section, lambda f: _row_start(f, anchors))
    parts = [f'<section id="{anchors.section("group-" + group.value)}">']
    parts.append(f"<h2>{escape(group.value.capitalize())}</h2>")
    dimensions = list(dict.fromkeys(f.dimension for f in findings))
    charted = [d for d in dimensions if d in anchors.charted]
    counted = [d for d in dimensions if d in anchors.counted]
    gridded = [
        d for d in dimensions if any(f.item is not None for f in findings if f.dimension == d)
    ]
    lively = [
        d for d in charted if _worst(f for f in findings if f.dimension == d) is not Status.MATCHED
    ]
    quiet = [d for d in charted if d not in lively]
    if charted:
        parts.append(
            '<p class="hint">Each chart: one row per contrast; the shaded band is the '
            "tolerance around the reference (ring); the mark is the other version, shaped by "
            "its verdict.</p>"
        )
    if counted:
        parts.append(_counts(report, group, counted, anchors))
    parts.append('<div class="charts">')
    parts += [_chart(report, d, findings, anchors) for d in lively]
    parts.append("</div>")
    if quiet:
        parts.append(
            f"<details><summary>{len(quiet)} measure{'s' if len(quiet) != 1 else ''} "
            "matched in every contrast</summary>"
            f'<div class="charts">{"".join(_chart(report, d, findings, anchors) for d in quiet)}'
            "</div></details>"
        )
    for dimension in gridded:
        parts.append(_grid(report, dimension, findings, anchors))
    parts.append("</section>")
    return "".join(parts)


def _counted(dimension: str, findings: Sequence[Finding]) -> bool:
    """A count found by comparing two versions (passages removed): one per contrast."""
    spec = registry.spec(dimension)
    return (
        spec is not None
        and spec.from_zero
        and all(f.item is None for f in findings if f.dimension == dimension)
    )


def _chartable(dimension: str, findings: Sequence[Finding]) -> bool:
    """A measure has one value per version (not a pair's count or an item's coverage)."""
    spec = registry.spec(dimension)
    if spec is not None and spec.from_zero:
        return False
    mine = [f for f in findings if f.dimension == dimension]
    if any(is_design(f) for f in mine):
        return False  # the design section charts power
    return all(f.item is None for f in mine) and any(
        v is not None for f in mine for v in f.values.values()
    )


def _chart(report: Report, dimension: str, findings: list[Finding], anchors: _Anchors) -> str:
    mine = [f for f in findings if f.dimension == dimension]
    if mine and all(is_baseline(f) for f in mine):
        return baseline_chart(dimension, mine, anchors.chart(dimension))
    rows = []
    unit = ""
    for pairing in _contrasts(report):
        finding = next(
            (f for f in report.findings_of(pairing) if f.dimension == dimension and f.item is None),
            None,
        )
        if finding is None:
            continue
        unit = finding.unit
        value = finding.values.get(pairing.condition)
        alone = pairing.reference == pairing.condition
        reference = None if alone else finding.values.get(pairing.reference)
        low = high = None
        # The band is drawn only where the tolerance is on the values' own scale: a baseline
        # judged in standard deviations shows its means, and its difference in words.
        on_scale = (
            reference is not None
            and value is not None
            and finding.difference is not None
            and math.isclose(finding.difference, value - reference, rel_tol=1e-6, abs_tol=1e-9)
        )
        if on_scale and reference is not None and finding.tolerance is not None:
            allowed = finding.tolerance.allowed(reference)
            low, high = reference - allowed, reference + allowed
        shown = format_value(value, finding.unit, dimension)
        before = "" if alone else f"{format_value(reference, finding.unit, dimension)} → "
        text = f"{before}{shown} · {finding.status.value}"
        if not on_scale and not alone and finding.difference is not None:
            text += f" (difference {format_difference(finding)} {finding.unit})"
        rows.append(
            ChartRow(
                pairing.condition,
                "" if alone else pairing.reference,
                reference,
                value,
                low,
                high,
                finding.status,
                text,
            )
        )
    spec = registry.spec(dimension)
    label = spec.shown_label if spec else dimension
    title = f"{label} ({unit})" if unit and unit not in label.lower() else label
    if label.lower().replace(" ", "_") != dimension:
        title += f" · {dimension}"
    return f'<figure class="chart-box">{dot_chart(title, rows, anchors.chart(dimension))}</figure>'


def _counts(report: Report, group: Group, dimensions: list[str], anchors: _Anchors) -> str:
    """Counts found by comparing a pair (passages removed, added...): a row per count, a
    column per contrast, each cell the count with its verdict's mark."""
    pairs = _contrasts(report)
    parts = [f'<table class="counts" id="{anchors.counts(group.value)}"><thead><tr><th>Count</th>']
    parts += [f"<th>{_pair_head(p)}</th>" for p in pairs]
    parts.append("</tr></thead><tbody>")
    for dimension in dimensions:
        spec = registry.spec(dimension)
        parts.append(f"<tr><th scope=row>{escape(spec.shown_label if spec else dimension)}</th>")
        for pairing in pairs:
            finding = next(
                (f for f in report.findings_of(pairing) if f.dimension == dimension), None
            )
            if finding is None:
                parts.append("<td>—</td>")
                continue
            count = format_difference(finding)
            parts.append(
                f'<td><a href="#{anchors.finding(finding)}">{mark(finding.status, count)}</a></td>'
            )
        parts.append("</tr>")
    parts.append("</tbody></table>")
    return "".join(parts)


def _grid(report: Report, dimension: str, findings: list[Finding], anchors: _Anchors) -> str:
    """Items × conditions: each cell the item's value in that version and the worst verdict
    of the contrasts it takes part in (the post-test coverage grid)."""
    mine = [f for f in findings if f.dimension == dimension and f.item is not None]
    items = list(dict.fromkeys(f.item for f in mine if f.item is not None))
    names = [c.name for c in report.conditions]
    spec = registry.spec(dimension)
    label = spec.shown_label if spec else dimension
    parts = [
        f'<div class="grid-box" id="{anchors.grid(dimension)}"><h3>{escape(label)}: '
        f"items × versions</h3><table class=grid><thead><tr><th>Item</th>"
    ]
    parts += [f"<th>{escape(n)}</th>" for n in names]
    parts.append("</tr></thead><tbody>")
    for item in items:
        of_item = [f for f in mine if f.item == item]
        first = of_item[0]
        parts.append(f"<tr><th scope=row>{escape(item)}</th>")
        for name in names:
            involved = [f for f in of_item if name in (f.reference, f.condition)]
            value = next(
                (f.values.get(name) for f in involved if f.values.get(name) is not None), None
            )
            status = _worst(involved)
            text = format_value(value, first.unit, dimension)
            if dimension == ITEM_COVERAGE.id and value is not None:
                threshold = report.settings.coverage_threshold
                text += " taught" if value >= threshold else " not taught"
            cell = mark(status, text) if status is not None else escape(text)
            link = "".join(
                f' <a href="#{anchors.finding(f)}" title="finding">›</a>'
                for f in involved
                if f.status is not Status.MATCHED and f.condition == name
            )
            parts.append(f"<td>{cell}{link}</td>")
        parts.append("</tr>")
    parts.append("</tbody></table>")
    if dimension == ITEM_COVERAGE.id:
        parts.append(
            f'<p class="hint">Each cell: the share of the item\'s weighted terms the version '
            f"covers; taught from {report.settings.coverage_threshold * 100:g}% (the study's "
            "coverage threshold). The mark is the worst verdict of the contrasts the version "
            "takes part in; › leads to a finding that is not matched.</p>"
        )
    else:
        parts.append(
            '<p class="hint">The mark is the worst verdict of the contrasts the version takes '
            "part in; › leads to a finding that is not matched.</p>"
        )
    parts.append("</div>")
    return "".join(parts)


def _passages(report: Report, anchors: _Anchors) -> str:
    parts = [f'<section id="{anchors.section("passages")}"><h2>Passages</h2>']
    parts.append(
        '<p class="hint">Every located piece of evidence, the reference on the left. Words '
        "marked in a pair of passages are for reading only; the verdicts come from the "
        "measures.</p>"
    )
    any_shown = False
    for pairing in _contrasts(report):
        entries: dict[str, tuple[Evidence, list[Finding]]] = {}
        for finding in report.findings_of(pairing):
            for item in finding.evidence:
                anchor = anchors.of_evidence(pairing, item)
                entries.setdefault(anchor, (item, []))[1].append(finding)
        if not entries:
            continue
        any_shown = True
        parts.append(f"<h3>{_pair_title(pairing)}</h3>")
        for anchor, (item, owners) in entries.items():
            parts.append(_passage(anchor, item, owners, pairing, anchors))
    if not any_shown:
        parts.append("<p>No located evidence.</p>")
    parts.append("</section>")
    return "".join(parts)


def _passage(
    anchor: str, item: Evidence, owners: list[Finding], pairing: Pairing, anchors: _Anchors
) -> str:
    pair = (pairing.reference, pairing.condition)
    back = ", ".join(
        f'<a href="#{anchors.finding(f)}">{escape(f.group.value)} · {escape(f.name)}</a>'
        for f in owners
    )
    head = (
        f'<div class="evidence" id="{anchor}"><p class="evidence-head">'
        f"<b>{escape(item.kind.value.replace('_', ' '))}</b> — for {back}</p>"
    )
    here = item.condition
    there = pair[1] if here == pair[0] else pair[0]
    place = item.location.describe() if item.location else "place unknown"
    if (
        item.counterpart is not None
        and item.counterpart_text
        and item.kind not in NOT_PASSAGES | ONE_LINE
    ):
        # The comparison's own marks where it made them (changed facts, rewording), else a
        # word diff of the two excerpts for display.
        mine, theirs = marked_pair(item.text, item.counterpart_text) or word_diff(
            item.text, item.counterpart_text
        )
        if here != pair[0]:
            mine, theirs = theirs, mine
        left_place, right_place = place, item.counterpart.describe()
        if here != pair[0]:
            left_place, right_place = right_place, left_place
        similarity = f" (similarity {item.similarity:.2f})" if item.similarity is not None else ""
        return (
            f"{head}<div class=side-by-side>"
            f"{_side(pair[0], left_place, mine)}{_side(pair[1], right_place, theirs)}</div>"
            f'<p class="small">{escape(item.kind.phrase.format(here=here, there=there))}'
            f"{escape(similarity)}</p></div>"
        )
    if _one_sided(item):
        text = f'<span class="only">{escape(item.text)}</span>'
        absent = f'<span class="absent">not in {escape(there)}</span>'
        left, right = (text, absent) if here == pair[0] else (absent, text)
        left_place = place if here == pair[0] else "—"
        right_place = place if here != pair[0] else "—"
        return (
            f"{head}<div class=side-by-side>{_side(pair[0], left_place, left)}"
            f"{_side(pair[1], right_place, right)}</div>"
            f'<p class="small">{escape(item.kind.phrase.format(here=here, there=there))}</p></div>'
        )
    return (
        f'<div class="evidence brief" id="{anchor}"><p class="line">'
        f"{escape(describe_evidence(item, pair))} — for {back}</p></div>"
    )


def _one_sided(item: Evidence) -> bool:
    """Text of one version with nothing matching in the other (a passage, heading, list item,
    table cell or figure removed or added; kinds added later follow the same naming)."""
    return item.kind not in ONE_LINE and item.kind.value.endswith(("_removed", "_added"))


def _side(name: str, place: str, html_text: str) -> str:
    return (
        f'<div class="side"><p class="side-head"><b>{escape(name)}</b> · {escape(place)}</p>'
        f'<p class="passage">{html_text}</p></div>'
    )


def _notes(report: Report) -> str:
    parts = ["<footer>"]
    if report.warnings:
        parts.append("<h2>Warnings</h2><ul>")
        parts += [f"<li>{escape(w)}</li>" for w in report.warnings]
        parts.append("</ul>")
    if report.revision:
        parts.append(f"<h2>Since {escape(report.revision)}</h2><ul>")
        parts += [f"<li>{escape(describe_regression(r))}</li>" for r in report.regressions]
        if not report.regressions:
            parts.append(
                f"<li>nothing changed beyond tolerance since {escape(report.revision)}</li>"
            )
        parts.append("</ul>")
        changed = [f for f in report.changes if f.status is not Status.MATCHED and not f.caused_by]
        if changed:
            parts.append(
                '<table><thead><tr><th>Version</th><th>Measure</th><th class="num">Then</th>'
                '<th class="num">Now</th><th class="num">Difference</th></tr></thead><tbody>'
            )
            parts += [
                f"<tr><td>{escape(f.condition)}</td><td>{escape(f.name)}</td>"
                f'<td class="num">{escape(_value(f, f.reference))}</td>'
                f'<td class="num">{escape(_value(f, f.condition))}</td>'
                f'<td class="num">{escape(format_difference(f))}</td></tr>'
                for f in changed
            ]
            parts.append("</tbody></table>")
    parts += [f'<p class="note">{escape(note)}</p>' for note in report.notes]
    parts.append("</footer>")
    return "".join(parts)
