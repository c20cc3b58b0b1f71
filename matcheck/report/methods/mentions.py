"""What the reader of the table must also know: every difference `check` reports that has no
row, each post-test item taught differently, every inconclusive comparison and why, and the
equivalence tests behind a "yes" (accepted differences are listed by ``build._accepted``).

A paper built on the table must not hide a confound the full report names (a sentence cut
from one version, a changed fact, the learners' time on task), nor state as a difference
what was accepted or could not be measured. Each mention names its contrast.
"""

from __future__ import annotations

from collections.abc import Iterable, Sequence

from matcheck.findings import Finding, Group, Report, Status
from matcheck.measures import registry
from matcheck.report.common import format_difference
from matcheck.report.methods.contrasts import Contrast
from matcheck.report.methods.model import (
    COVERAGE,
    PASSAGES,
    POSTTEST,
    VERDICTS,
    Mention,
    measure_of,
)

# Findings about the sample or the result, not the materials: the sample-size paragraph and
# the data section report them.
_NOT_MATERIALS = (Group.DESIGN, Group.OUTCOME)
# Differences the table cannot leave out; inconclusive ones are named only for the materials.
# Accepted differences are listed apart with their entry (build._accepted).
_REPORTED = (Status.DIFFERS.value,)
_MATERIALS = frozenset(Group) - {Group.DESIGN, Group.GROUPS, Group.INSTRUMENT, Group.OUTCOME}


def covered_dimensions(measures: Iterable[str]) -> frozenset[str]:
    """The finding dimensions the rows show (the combined rows stand for several)."""
    covered: set[str] = set()
    for measure in measures:
        if measure == PASSAGES:
            covered |= {"passages_removed", "passages_added"}
        elif measure == POSTTEST:
            covered.add("item_coverage")
        else:
            covered.add(measure)
    return frozenset(covered)


def label_of(finding: Finding) -> str:
    if finding.item:
        return f"Post-test item {finding.item}"
    return _label(finding.dimension)


def _label(dimension: str) -> str:
    if dimension == COVERAGE:
        return measure_of(COVERAGE).label
    spec = registry.spec(dimension)
    return spec.shown_label if spec else dimension.replace("_", " ").capitalize()


def reason_of(finding: Finding) -> str:
    """Why: the study file's reason for an accepted difference, else the verdict's reason."""
    return finding.accepted.reason if finding.accepted else finding.reason


def _where(finding: Finding) -> str:
    located = [e for e in finding.evidence if e.location is not None]
    if not located or located[0].location is None:
        return ""
    first = located[0]
    assert first.location is not None
    # An item's second piece of evidence is the other version's side of the same gap.
    more = f" and {len(located) - 1} more" if len(located) > 1 and not finding.item else ""
    return f"in {first.condition} at {first.location.describe()}{more}"


# Units a bare number needs to be read ("−2.4 minutes"); shares and relative differences
# carry their %, counts are named by the label.
_UNITS = frozenset({"minutes", "words", "grade", "points", "syllables", "characters"})


def _difference(finding: Finding) -> str:
    text = format_difference(finding, short=True)
    if "%" in text or text == "—" or finding.unit not in _UNITS:
        return text
    return f"{text} {finding.unit}"


def _contrast(finding: Finding, contrasts: Sequence[Contrast]) -> str:
    own = next((c for c in contrasts if c.owns(finding)), None)
    return own.header if own else f"{finding.condition} vs {finding.reference}"


def mentions(
    report: Report, covered: frozenset[str], contrasts: Sequence[Contrast]
) -> tuple[Mention, ...]:
    """Differences without a row, items taught differently, inconclusive comparisons and why.

    Echoes are named with the measure they follow, as `check` shows them under it.
    """
    found: list[Mention] = []
    for finding in report.findings:
        status = finding.status.value
        if finding.group in _NOT_MATERIALS:
            continue
        in_table = finding.dimension in covered
        if status not in _REPORTED and not (
            status == Status.INCONCLUSIVE.value and finding.group in _MATERIALS
        ):
            continue
        where = _where(finding)
        if (
            in_table
            and status == Status.DIFFERS.value
            and not finding.item
            and not (finding.group is Group.CONTENT and where)
        ):
            continue  # its row marks it; an item or a located content change is also named
        found.append(
            Mention(
                VERDICTS[status],
                label_of(finding),
                _contrast(finding, contrasts),
                _difference(finding),
                where,
                reason_of(finding) if status != Status.DIFFERS.value or finding.item else "",
                _label(finding.caused_by) if finding.caused_by else "",
                in_table,
                bool(finding.item),
            )
        )
    return tuple(found)


def _p(p_value: float) -> str:
    """APA 7 style: no leading zero, three decimals, ``< .001`` below (docs/references.md §11)."""
    return "p < .001" if p_value < 0.001 else f"p = {p_value:.3f}".replace("0.", ".", 1)


def equivalence_tests(
    report: Report, covered: frozenset[str], contrasts: Sequence[Contrast]
) -> tuple[str, ...]:
    """One sentence per equivalence test behind a matched row: test, bounds and p."""
    alpha = report.settings.alpha
    sentences = []
    for finding in report.findings:
        test = finding.test
        if (
            test is None
            or finding.status is not Status.MATCHED
            or finding.dimension not in covered
            or not test.name.startswith("TOST")
        ):
            continue
        shown = "equivalent" if test.p_value < alpha else "equivalence not shown"
        detail = f", {test.detail}" if test.detail else ""
        sentences.append(
            f"{label_of(finding)}, "
            f"{_contrast(finding, contrasts)}: {test.name}{detail}, {_p(test.p_value)} "
            f"({shown} at α = {alpha:g})"
        )
    return tuple(sentences)
