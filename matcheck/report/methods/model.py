"""The equivalence table as data: rows of formatted strings, and the measures it can show.

Every renderer in this package only lays these strings out, so Markdown, CSV, LaTeX, Word and
the prose paragraph always show the same numbers.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING

from matcheck.findings import Status
from matcheck.report.methods.contrasts import Contrast
from matcheck.settings import DEFAULT_WPM

if TYPE_CHECKING:
    from matcheck.data.summary import StudyData

TITLE = "Equivalence of the Lesson Versions"
NOT_PROOF = "Matched measures do not prove equivalence; see the full report."

# A row's verdict, by the status of its worst unmanipulated contrast. ``accepted`` is a
# difference the study file accepts with a reason ([[accepted]]).
VERDICTS: dict[str, str] = {
    Status.MATCHED: "yes",
    Status.DIFFERS: "no",
    Status.INTENDED: "manipulated",
    Status.INCONCLUSIVE: "n/a",
    Status.ACCEPTED: "accepted",
}

# The three rows made from several findings rather than from one measure's.
COVERAGE = "key_term_coverage"
PASSAGES = "passages_without_counterpart"
POSTTEST = "posttest_items_taught"
# Counted per contrast like the passages row (expected: none), though one spec describes it.
FACTS = "facts_changed"


@dataclass(frozen=True, slots=True)
class TableMeasure:
    """A row the table can show: its measure, label, and how the prose paragraph names it."""

    key: str
    group: str
    label: str
    phrase: str
    suffix: str = ""


# Rows made from several findings, which no single measure spec describes.
COMBINED = (
    TableMeasure(
        PASSAGES, "content", "Passages without counterpart", "passages without a counterpart"
    ),
    TableMeasure(
        POSTTEST, "assessment", "Post-test items taught", "the number of post-test items taught"
    ),
)


def table_measures() -> tuple[TableMeasure, ...]:
    """The rows the table can show: every measure whose spec says how prose names it (its
    ``phrase``), then the combined rows; the table orders them by group."""
    from matcheck.measures import registry

    from_specs = tuple(
        TableMeasure(spec.id, spec.group.value, spec.shown_label, spec.phrase, spec.prose_unit)
        for spec in registry.specs()
        if spec.phrase
    )
    return from_specs + COMBINED


def measure_of(key: str) -> TableMeasure:
    return next(measure for measure in table_measures() if measure.key == key)


@dataclass(frozen=True, slots=True)
class MethodsRow:
    """One measure: its value in each condition, its difference in each contrast, the verdict.

    ``measure`` is the measure id, or ``passages_without_counterpart`` /
    ``posttest_items_taught`` for the two rows made from several findings. ``contrasts``
    are the cells of the contrast columns (difference and mark, ``contrasts.MARKS``);
    ``differences`` and ``statuses`` the same unmarked, and each contrast's status
    (``""`` where the contrast has no finding). ``difference`` is the largest difference
    over the contrasts that do not manipulate the measure (``—`` if every one does).
    ``verdict`` is ``yes`` (within tolerance in every unmanipulated contrast), ``no``,
    ``accepted``, ``n/a`` (inconclusive) or ``manipulated`` (in every contrast).
    """

    group: str
    measure: str
    label: str
    values: tuple[str, ...]
    difference: str
    verdict: str
    tolerance: str = ""
    contrasts: tuple[str, ...] = ()
    differences: tuple[str, ...] = ()
    statuses: tuple[str, ...] = ()

    @property
    def cells(self) -> tuple[str, ...]:
        """What every renderer shows, in column order after the group."""
        return (self.label, *self.values, *self.contrasts, self.verdict)

    @property
    def group_label(self) -> str:
        return self.group.capitalize()


@dataclass(frozen=True, slots=True)
class AcceptedRow:
    """A difference beyond tolerance that the team reviewed and accepted ([[accepted]] in
    the study file), listed apart from the matched measures with its reason."""

    comparison: str  # "diagrams vs text"
    label: str
    difference: str
    reason: str
    by: str = ""
    date: str = ""
    echoes: tuple[str, ...] = ()  # measures that follow it and are accepted with it

    @property
    def sentence(self) -> str:
        """One line for a note or a list: what, where, how large, why, by whom."""
        follows = f", with {', '.join(self.echoes)}, which follow from it" if self.echoes else ""
        credit = ", ".join(part for part in (self.by, self.date) if part)
        credit = f" ({credit})" if credit else ""
        return (
            f"{self.label}, {self.comparison}: {self.difference}{follows}. "
            f"Reason: {self.reason}{credit}"
        )


@dataclass(frozen=True, slots=True)
class Mention:
    """A finding the reader must know of beyond the rows: a difference with no row, an
    accepted difference and its reason, an inconclusive comparison and why.

    ``verdict`` is a ``VERDICTS`` word; ``contrast`` the header of its contrast; ``where``
    the place of its first evidence; ``follows`` the measure it echoes, if any.
    """

    verdict: str
    label: str
    contrast: str
    difference: str
    where: str = ""
    reason: str = ""
    follows: str = ""
    in_table: bool = False
    item: bool = False  # a post-test item (the row counts items; the note names them)


@dataclass(frozen=True, slots=True)
class MethodsTable:
    number: int
    title: str
    columns: tuple[str, ...]
    rows: tuple[MethodsRow, ...]
    notes: tuple[str, ...]
    words_per_minute: float = DEFAULT_WPM
    # The learners' data, for a baseline-equivalence table and a sentence (study_data.py).
    data: StudyData | None = None
    # The power of the planned sample, for the methods section ("" without [sample]).
    sample_size: str = ""
    accepted: tuple[AcceptedRow, ...] = ()
    # The compared pairs, one column each; what the table has no row for, and the
    # equivalence tests behind "yes" (sentences shared by the note and the paragraph).
    contrasts: tuple[Contrast, ...] = ()
    mentions: tuple[Mention, ...] = ()
    equivalence: tuple[str, ...] = ()

    @property
    def note(self) -> str:
        return " ".join(self.notes)

    @property
    def header(self) -> tuple[str, ...]:
        return (
            "Measure",
            *self.columns,
            *(contrast.header for contrast in self.contrasts),
            "Within tolerance",
        )

    def groups(self) -> list[tuple[str, tuple[MethodsRow, ...]]]:
        """The rows by group, in report order (group ids)."""
        seen = dict.fromkeys(row.group for row in self.rows)
        return [(group, tuple(r for r in self.rows if r.group == group)) for group in seen]
