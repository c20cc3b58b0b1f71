"""The one model every report renders: conditions, findings, evidence, the report itself.

Findings are frozen. A finding compares one measure (``dimension``) between the reference
condition and one other condition; ``status`` is the verdict and ``reason`` says why.
``caused_by`` names the root-cause finding of an echo (reading time follows words), so reports
can show one confound once.
"""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import dataclass, field
from enum import StrEnum
from typing import TYPE_CHECKING

from matcheck.errors import EXIT_DIFFERS, EXIT_INPUT, EXIT_MATCHED
from matcheck.model import Location
from matcheck.settings import DEFAULT_COMPARISON, ComparisonSettings

if TYPE_CHECKING:
    from matcheck.data.summary import StudyData

SCHEMA_VERSION = "2.0"

NOT_PROOF = (
    "A clean report does not prove that the versions are equivalent: it covers only what "
    "matcheck measures. The researcher's judgment, and their ethics review, decide."
)


class Status(StrEnum):
    """Verdict on one measure for one pair of versions."""

    DIFFERS = "differs"
    INCONCLUSIVE = "inconclusive"
    ACCEPTED = "accepted"  # beyond tolerance, reviewed and accepted in the study file
    INTENDED = "intended"
    MATCHED = "matched"


class Group(StrEnum):
    """The groups findings belong to, in report order."""

    LENGTH = "length"
    READABILITY = "readability"
    CONTENT = "content"
    FIGURES = "figures"
    STRUCTURE = "structure"
    SIGNALING = "signaling"
    ASSESSMENT = "assessment"
    DESIGN = "design"  # the study's power for each contrast (matcheck.power)
    # The learners' data (matcheck/data): baseline, attrition and exposure; the post-test's
    # quality; the effect found.
    GROUPS = "groups"
    INSTRUMENT = "instrument"
    OUTCOME = "outcome"


class Basis(StrEnum):
    """Why a finding has its status: the reason code the decision step records."""

    DECLARED = "declared"  # the design manipulates this measure
    IMPLIED = "implied"  # follows from a manipulated measure (figure areas from figures)
    WITHIN_TOLERANCE = "within_tolerance"
    BEYOND_TOLERANCE = "beyond_tolerance"
    NOT_SHOWN = "not_shown"  # a format cannot show it, or it is undefined in one version
    TEST_INCONCLUSIVE = "test_inconclusive"  # beyond tolerance, but a test cannot show it
    ECHO = "echo"  # follows a root cause that is itself inconclusive
    POWER = "power"  # the planned sample's power for a contrast, against the target
    ACCEPTED = "accepted"  # beyond tolerance, within what a [[accepted]] entry allows


class EvidenceKind(StrEnum):
    """What a piece of evidence shows. Each kind carries its phrase: ``{here}`` is the
    version its location points into, ``{there}`` the other version of the pair."""

    phrase: str

    def __new__(cls, value: str, phrase: str) -> EvidenceKind:
        member = str.__new__(cls, value)
        member._value_ = value
        member.phrase = phrase
        return member

    PASSAGE_REMOVED = "passage_removed", "passage of {here} missing from {there}"
    PASSAGE_ADDED = "passage_added", "passage of {here} not in {there}"
    PASSAGE_REWRITTEN = "passage_rewritten", "passage of {here} rewritten in {there}"
    PASSAGE_MOVED = "passage_moved", "passage of {here} moved in {there}"
    TEXT_REMOVED = "text_removed", "text of {here} cut from the matching passage of {there}"
    TEXT_ADDED = "text_added", "text added in {here}, not in {there}"
    TERM_MISSING = "term_missing", "key term of {here} not found in {there}"
    NUMBER_CHANGED = "number_changed", "number of {here} stated differently in {there}"
    UNIT_CHANGED = "unit_changed", "unit of {here} stated differently in {there}"
    NEGATION_CHANGED = "negation_changed", "negation of {here} differs in {there}"
    COMPARISON_CHANGED = "comparison_changed", "comparison of {here} differs in {there}"
    TERM_SWAPPED = "term_swapped", "term of {here} swapped in {there}"
    TEXT_REWORDED = "text_reworded", "passage of {here} reworded in {there}"
    HEADING_REMOVED = "heading_removed", "heading of {here} missing from {there}"
    HEADING_ADDED = "heading_added", "heading of {here} not in {there}"
    HEADING_LEVEL_CHANGED = (
        "heading_level_changed",
        "heading of {here} at another outline level in {there}",
    )
    CODE_LINE_REMOVED = "code_line_removed", "code line of {here} missing from {there}"
    CODE_LINE_ADDED = "code_line_added", "code line of {here} not in {there}"
    LIST_ITEM_REMOVED = "list_item_removed", "list item of {here} missing from {there}"
    LIST_ITEM_ADDED = "list_item_added", "list item of {here} not in {there}"
    TABLE_CELL_REMOVED = "table_cell_removed", "table cell of {here} missing from {there}"
    TABLE_CELL_ADDED = "table_cell_added", "table cell of {here} not in {there}"
    CAPTION_REMOVED = "caption_removed", "caption of {here} missing from {there}"
    CAPTION_ADDED = "caption_added", "caption of {here} not in {there}"
    NO_ALT_TEXT = "no_alt_text", "figure of {here} without alt text"
    FIGURE_ADDED = "figure_added", "figure of {here} not in {there}"
    FIGURE_REMOVED = "figure_removed", "figure of {here} not in {there}"
    EMPHASIS_ADDED = "emphasis_added", "emphasis in {here}, none in {there}"
    EMPHASIS_REMOVED = "emphasis_removed", "emphasis in {here}, none in {there}"
    SENTENCE_LENGTH_CHANGED = "sentence_length_changed", "sentence length in {here}"
    ITEM_TAUGHT = "item_taught", "taught in {here}"
    ITEM_NOT_TAUGHT = "item_not_taught", "not taught in {here}"
    ITEM_COVERED_LESS = "item_covered_less", "covered less in {here}"
    POSSIBLE_REASON = "possible_reason", "possible reason for the null result"
    RULED_OUT = "ruled_out", "ruled out"
    WEAK_ITEM = "weak_item", "weak item ({here})"
    ITEM_TAUGHT_DIFFERENTLY = (
        "item_taught_differently",
        "item's fact as {here} states it, and as {there} does",
    )


@dataclass(frozen=True, slots=True)
class Tolerance:
    """How far two versions may differ and still match: ``max(absolute, relative * |ref|)``."""

    absolute: float = 0.0
    relative: float = 0.0
    reason: str = ""

    def allowed(self, reference: float) -> float:
        return max(self.absolute, self.relative * abs(reference))

    def describe(self, unit: str = "") -> str:
        if self.absolute == 0 and self.relative == 0:
            return "exact"
        amount = f"{self.absolute:g}{' ' + unit if unit else ''}"
        if self.relative and self.absolute:
            return f"±{self.relative * 100:g}% (≥{amount})"
        if self.relative:
            return f"±{self.relative * 100:g}%"
        return f"±{amount}"


@dataclass(frozen=True, slots=True)
class Evidence:
    """Something located in the text that shows a difference.

    ``kind`` says what it shows (see docs/report-schema.md); ``condition`` names the version
    where ``location`` points; ``text`` is an excerpt or a term.
    """

    kind: EvidenceKind
    condition: str
    text: str
    location: Location | None = None
    weight: float | None = None
    similarity: float | None = None
    counterpart: Location | None = None
    counterpart_text: str = ""


@dataclass(frozen=True, slots=True)
class StatTest:
    """A statistical test behind a verdict (e.g. TOST on sentence lengths)."""

    name: str
    p_value: float
    detail: str = ""


@dataclass(frozen=True, slots=True)
class Accepted:
    """A difference the team reviewed and accepted: one ``[[accepted]]`` table of the study
    file (docs/study-file.md). ``number`` is its position among them, from 1.

    ``up_to`` is the largest difference accepted, with its sign, in the measure's unit, or a
    share of the reference value when ``relative`` (written ``"-6%"``). ``id`` pins the
    finding, evidence included (:mod:`matcheck.identity`).
    """

    number: int
    measure: str
    up_to: float
    reason: str
    relative: bool = False
    reference: str | None = None
    condition: str | None = None
    contrast: str | None = None
    item: str | None = None
    id: str | None = None
    by: str = ""
    date: str = ""

    def extent(self) -> str:
        return f"{self.up_to * 100:+g}%" if self.relative else f"{self.up_to:+g}"

    def label(self) -> str:
        where = (
            f"contrast {self.contrast}"
            if self.contrast
            else f"{self.condition} vs {self.reference}"
        )
        what = f"item {self.item}" if self.item else self.measure
        return f"accepted #{self.number} ({what}, {where})"


@dataclass(frozen=True, slots=True)
class Finding:
    """One measure (``dimension``) compared between ``reference`` and ``condition``.

    ``basis`` is the reason code behind ``status`` and ``reason`` its words; ``item`` names
    the subject within the dimension where there is one (a post-test item's id).
    """

    dimension: str
    group: Group
    unit: str
    reference: str
    condition: str
    status: Status
    values: dict[str, float | None]
    difference: float | None
    tolerance: Tolerance | None
    reason: str
    caused_by: str | None = None
    evidence: tuple[Evidence, ...] = ()
    test: StatTest | None = None
    basis: Basis = Basis.WITHIN_TOLERANCE
    item: str | None = None
    accepted: Accepted | None = None  # the study file's entry that accepts it

    @property
    def key(self) -> str:
        """Unique within one pair: the dimension, with the item where there is one."""
        return f"{self.dimension}:{self.item}" if self.item else self.dimension

    @property
    def name(self) -> str:
        """How reports name it: the dimension, or the item (``item Q6``)."""
        return f"item {self.item}" if self.item else self.dimension

    @property
    def relative_difference(self) -> float | None:
        reference = self.values.get(self.reference)
        if self.difference is None or not reference:
            return None
        return self.difference / abs(reference)


@dataclass(frozen=True, slots=True)
class Condition:
    """One version of the lesson as the report names it."""

    name: str
    paths: tuple[str, ...]
    format: str
    is_reference: bool = False
    warnings: tuple[str, ...] = ()
    excluded: tuple[str, ...] = ()


@dataclass(frozen=True, slots=True)
class Spread:
    """The range of one measure across all versions (reported for three or more)."""

    dimension: str
    group: Group
    unit: str
    minimum: float
    maximum: float
    status: Status


@dataclass(frozen=True, slots=True)
class Pairing:
    """One comparison the report makes: ``condition`` against ``reference``."""

    reference: str
    condition: str
    manipulated: tuple[str, ...] = ()
    factor: str | None = None


class RegressionKind(StrEnum):
    NEW = "new"  # a condition that did not exist at the revision
    CHANGED = "changed"  # a condition whose materials changed since the revision
    BROKEN = "broken"  # a pair that now differs where it matched (or was intended) then


@dataclass(frozen=True, slots=True)
class Regression:
    """What a pull request changed or broke, against ``revision`` (``check --against``).

    ``changes`` are the findings of the condition compared with itself at the revision
    (CHANGED); ``dimensions`` the measures of the pair that no longer hold (BROKEN).
    """

    kind: RegressionKind
    condition: str
    revision: str
    reference: str = ""
    changes: tuple[Finding, ...] = ()
    dimensions: tuple[str, ...] = ()


@dataclass(frozen=True, slots=True)
class CacheUse:
    """The lesson files a report measured, and how many of them came from the cache."""

    files: int
    from_cache: int


@dataclass(frozen=True, slots=True)
class Report:
    conditions: tuple[Condition, ...]
    reference: str
    manipulated: tuple[str, ...]
    findings: tuple[Finding, ...]
    spreads: tuple[Spread, ...] = ()
    words_per_minute: float = 238.0
    notes: tuple[str, ...] = field(default=(NOT_PROOF,))
    pairings: tuple[Pairing, ...] = ()
    title: str = ""
    warnings: tuple[str, ...] = ()
    # With --against REV: each condition compared with itself at REV (not counted in
    # ``differs``), and the equivalences that held at REV and no longer do.
    revision: str = ""
    changes: tuple[Finding, ...] = ()
    regressions: tuple[Regression, ...] = ()
    # With --against REV: the ids of the differences that were already there at REV (the
    # others are new, and a reviewer sees them first).
    preexisting: frozenset[str] = frozenset()
    # The thresholds the comparison used, recorded so that the report can be reproduced.
    settings: ComparisonSettings = DEFAULT_COMPARISON
    # Aggregates of the learners' data ([data] in the study file), for the reports.
    data: StudyData | None = None
    # Lesson files read and how many came from the cache; None when the cache is off.
    cache: CacheUse | None = None

    def pairs(self) -> tuple[Pairing, ...]:
        """The comparisons in order (every condition against the reference by default)."""
        if self.pairings:
            return self.pairings
        return tuple(
            Pairing(self.reference, c.name, self.manipulated)
            for c in self.conditions
            if c.name != self.reference
        )

    def findings_of(self, pairing: Pairing) -> tuple[Finding, ...]:
        return tuple(
            f
            for f in self.findings
            if f.reference == pairing.reference and f.condition == pairing.condition
        )

    @property
    def differs(self) -> bool:
        return any(finding.status is Status.DIFFERS for finding in self.findings)

    def root_findings(self, status: Status) -> tuple[Finding, ...]:
        return tuple(f for f in self.findings if f.status is status and f.caused_by is None)

    def echoes_of(self, finding: Finding) -> tuple[Finding, ...]:
        return tuple(
            f
            for f in self.findings
            if f.caused_by == finding.dimension
            and f.condition == finding.condition
            and f.reference == finding.reference
        )


@dataclass(frozen=True, slots=True)
class StudyResult:
    """One study of a folder: its report, or the one-line error that stopped it.

    ``rendered`` holds output already rendered for this study alone, by format name, where
    the worker that checked it did that work (``check DIR``: matcheck.batch's ``finish``).
    """

    path: str
    report: Report | None
    error: str | None
    rendered: tuple[tuple[str, str], ...] = ()


def exit_status(reports: Iterable[Report], *, failed: int = 0) -> int:
    """The one rule for the exit status: 1 when anything differs, else 2 when a study could
    not be checked (``failed``), else 0."""
    if any(report.differs for report in reports):
        return EXIT_DIFFERS
    return EXIT_INPUT if failed else EXIT_MATCHED
