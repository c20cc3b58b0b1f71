"""What a measure is: a stable id, a group, a unit; and what measuring one version yields."""

from __future__ import annotations

from collections.abc import Callable, Iterator
from dataclasses import dataclass, field
from enum import StrEnum

from matcheck.language.analysis import Analysis
from matcheck.model import Document
from matcheck.settings import Settings


class Group(StrEnum):
    """The dimensions on which lesson versions are measured and compared."""

    LENGTH = "length"
    READABILITY = "readability"
    CONTENT = "content"
    FIGURES = "figures"
    STRUCTURE = "structure"
    SIGNALING = "signaling"


@dataclass(frozen=True, slots=True)
class MeasureSpec:
    """A measure's identity. ``id`` is stable across releases: reports and study files use it."""

    id: str
    group: Group
    unit: str
    description: str


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
