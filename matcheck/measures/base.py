"""What a measure is (its spec: everything the code knows about it, declared once) and what
measuring one version yields."""

from __future__ import annotations

from collections.abc import Callable, Iterator
from dataclasses import dataclass, field
from enum import StrEnum

from matcheck.findings import Group as Group
from matcheck.findings import Tolerance
from matcheck.language.analysis import Analysis
from matcheck.model import Capability, Document
from matcheck.settings import Settings

EXACT = "counts of discrete elements a learner sees; any difference is visible"
JUDGMENT = "judgment call (common practice), not a published threshold"
# Decimals shown for a unit unless the spec says otherwise.
UNIT_DECIMALS = {
    "share": 3,
    "grade": 1,
    "points": 1,
    "score": 2,
    "minutes": 1,
    "syllables": 2,
    "tokens": 1,
    "megapixels": 2,
    "cm²": 1,
    "SD": 2,  # standardised differences of the learners' data
}


EXACT_BY_DEFAULT = Tolerance(reason="exact by default")


class Role(StrEnum):
    """How a dimension is obtained and judged."""

    MEASURED = "measured"  # one value per version, compared between versions
    LISTING = "listing"  # a list shown in profiles (key terms); not compared as a number
    # A value shown in profiles as information, never compared (pixel counts: exporters
    # downsample pictures, so the same figure has fewer pixels in its PDF).
    INFORMATION = "information"
    PAIRWISE = "pairwise"  # found by comparing two versions (passages removed): from zero
    ITEM = "item"  # one finding per subject (a post-test item), judged from zero


@dataclass(frozen=True, slots=True)
class Cause:
    """A measure whose difference can explain another's (an echo's root cause).

    ``opposite``: only when the two moved in opposite directions (a list turned into prose
    removes list items and adds paragraphs).
    """

    measure: str
    opposite: bool = False


def causes(*ids: str) -> tuple[Cause, ...]:
    return tuple(Cause(measure) for measure in ids)


@dataclass(frozen=True, slots=True)
class MeasureSpec:
    """Everything matcheck knows about one measure, declared once.

    ``id`` is stable across releases: reports and study files use it. ``tolerance`` is the
    default with its reason; ``follows`` the root causes of which this measure is an echo, the
    first that differs winning (reading time follows words; a grade formula its inputs);
    ``implied_by`` the measure whose manipulation makes this one intended too (figure areas by
    figures); ``needs`` what a format must show for the measure to be known; ``label`` and
    ``phrase`` how tables and prose name it; ``listing`` the name of an item's number where the
    measure is a list (``weight`` of a key term); ``prose_unit`` the unit written after a
    value in the methods paragraph. A measure with a ``phrase`` is a row of the methods table.
    """

    id: str
    group: Group
    unit: str
    description: str
    tolerance: Tolerance = EXACT_BY_DEFAULT
    role: Role = Role.MEASURED
    follows: tuple[Cause, ...] = ()
    implied_by: str | None = None
    needs: Capability | None = None
    label: str = ""
    phrase: str = ""
    decimals: int | None = None
    listing: str | None = None
    prose_unit: str = ""

    @property
    def shown_label(self) -> str:
        return self.label or self.id.replace("_", " ").capitalize()

    @property
    def shown_decimals(self) -> int:
        return self.decimals if self.decimals is not None else UNIT_DECIMALS.get(self.unit, 0)

    @property
    def compared(self) -> bool:
        return self.role not in (Role.LISTING, Role.INFORMATION)

    @property
    def from_zero(self) -> bool:
        """Judged as a count or shortfall from zero between two versions."""
        return self.role in (Role.PAIRWISE, Role.ITEM)


@dataclass(frozen=True, slots=True)
class Measurement:
    """One measure of one version.

    ``value`` is ``None`` where the measure is undefined for this text (for example a
    readability formula on a lesson with no sentences). ``items`` carries named parts of the
    value: key terms with their weights, emphasised terms with their counts. ``sample`` holds
    the per-unit values behind a mean (each sentence's length behind words per sentence) for
    the statistical tests of the comparison.
    """

    spec: MeasureSpec
    value: float | None
    items: tuple[tuple[str, float], ...] = field(default=())
    sample: tuple[float, ...] = field(default=())
    # The section heading of each unit of ``sample`` (same length), for local comparisons.
    sample_sections: tuple[str, ...] = field(default=())
    note: str = ""

    @property
    def id(self) -> str:
        return self.spec.id


MeasureFunction = Callable[[Analysis, Settings], Iterator[Measurement]]


@dataclass(frozen=True, slots=True)
class Profile:
    """Every measure of one version, in catalogue order."""

    analysis: Analysis
    measurements: tuple[Measurement, ...]

    @property
    def document(self) -> Document:
        return self.analysis.document

    def get(self, measure_id: str) -> Measurement | None:
        for measurement in self.measurements:
            if measurement.spec.id == measure_id:
                return measurement
        return None

    def value(self, measure_id: str) -> float | None:
        measurement = self.get(measure_id)
        return None if measurement is None else measurement.value
