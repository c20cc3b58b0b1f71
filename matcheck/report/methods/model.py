"""The equivalence table as data: rows of formatted strings, and the measures it can show.

Every renderer in this package only lays these strings out, so Markdown, CSV, LaTeX, Word and
the prose paragraph always show the same numbers.
"""

from __future__ import annotations

from dataclasses import dataclass

from matcheck.findings import Status
from matcheck.settings import DEFAULT_WPM

TITLE = "Equivalence of the Lesson Versions"
NOT_PROOF = "Matched measures do not prove equivalence; see the full report."

VERDICTS = {
    Status.MATCHED: "yes",
    Status.DIFFERS: "no",
    Status.INTENDED: "intended",
    Status.INCONCLUSIVE: "n/a",
}

# The three rows made from several findings rather than from one measure's.
COVERAGE = "key_term_coverage"
PASSAGES = "passages_without_counterpart"
POSTTEST = "posttest_items_taught"


@dataclass(frozen=True, slots=True)
class TableMeasure:
    """A row the table can show: its measure, label, and how the prose paragraph names it."""

    key: str
    group: str
    label: str
    phrase: str
    suffix: str = ""


MEASURES = (
    TableMeasure("words", "length", "Words", "length", " words"),
    TableMeasure("sentences", "length", "Sentences", "the number of sentences"),
    TableMeasure("paragraphs", "length", "Paragraphs", "the number of paragraphs"),
    TableMeasure("reading_time", "length", "Reading time (min)", "estimated reading time", " min"),
    TableMeasure(
        "flesch_reading_ease", "readability", "Flesch Reading Ease", "Flesch Reading Ease"
    ),
    TableMeasure(
        "flesch_kincaid_grade", "readability", "Flesch–Kincaid grade", "Flesch–Kincaid grade level"
    ),
    TableMeasure("words_per_sentence", "readability", "Words per sentence", "words per sentence"),
    TableMeasure("syllables_per_word", "readability", "Syllables per word", "syllables per word"),
    TableMeasure(
        "rare_words_share",
        "readability",
        "Words not on the Dale–Chall list",
        "the share of words not on the Dale–Chall list",
    ),
    TableMeasure(COVERAGE, "content", "Key-term coverage", "key-term coverage"),
    TableMeasure(
        PASSAGES, "content", "Passages without counterpart", "passages without a counterpart"
    ),
    TableMeasure("figures", "figures", "Figures", "the number of figures"),
    TableMeasure("figure_display_area", "figures", "Figure area (cm²)", "figure area", " cm²"),
    TableMeasure("captions", "figures", "Captions", "the number of captions"),
    TableMeasure("headings", "structure", "Headings", "the number of headings"),
    TableMeasure("list_items", "structure", "List items", "the number of list items"),
    TableMeasure("tables", "structure", "Tables", "the number of tables"),
    TableMeasure(
        "emphasized_words", "signaling", "Emphasized words", "the number of emphasized words"
    ),
    TableMeasure(
        POSTTEST, "assessment", "Post-test items taught", "the number of post-test items taught"
    ),
)
BY_KEY = {measure.key: measure for measure in MEASURES}


@dataclass(frozen=True, slots=True)
class MethodsRow:
    """One measure: its value in each condition, the largest difference and the verdict.

    ``measure`` is the measure id, or ``passages_without_counterpart`` /
    ``posttest_items_taught`` for the two rows made from several findings. ``verdict`` is
    ``yes`` (within tolerance), ``no`` (differs), ``intended`` or ``n/a`` (inconclusive).
    """

    group: str
    measure: str
    label: str
    values: tuple[str, ...]
    difference: str
    verdict: str
    tolerance: str = ""

    @property
    def group_label(self) -> str:
        return self.group.capitalize()


@dataclass(frozen=True, slots=True)
class MethodsTable:
    number: int
    title: str
    columns: tuple[str, ...]
    rows: tuple[MethodsRow, ...]
    notes: tuple[str, ...]
    words_per_minute: float = DEFAULT_WPM

    @property
    def note(self) -> str:
        return " ".join(self.notes)

    @property
    def header(self) -> tuple[str, ...]:
        return ("Measure", *self.columns, "Largest difference", "Within tolerance")

    def groups(self) -> list[tuple[str, tuple[MethodsRow, ...]]]:
        """The rows by group, in report order (group ids)."""
        seen = dict.fromkeys(row.group for row in self.rows)
        return [(group, tuple(r for r in self.rows if r.group == group)) for group in seen]
