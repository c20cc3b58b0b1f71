"""Aggregates of the learners' data that reports show: never a learner's row, only n, means,
SDs, shares and coefficients per condition or per item."""

from __future__ import annotations

from dataclasses import dataclass

from matcheck.studystats.reliability import ItemStats


@dataclass(frozen=True, slots=True)
class GroupStats:
    condition: str
    n: int
    mean: float
    sd: float


@dataclass(frozen=True, slots=True)
class BaselineRow:
    """One baseline measure: per condition its n, mean (a share for yes/no traits) and SD,
    and its standardised difference from the reference (Hedges' g or Cox index) with band."""

    measure: str
    statistic: str  # "g" or "Cox"
    groups: tuple[GroupStats, ...]
    effects: tuple[tuple[str, float | None, str], ...]  # (condition, effect, band)


@dataclass(frozen=True, slots=True)
class Instrument:
    source: str  # "pilot" or "study"
    learners: int
    items: int
    coefficient: str  # "KR-20" or "Cronbach's alpha"
    reliability: float | None
    interval: tuple[float, float] | None
    floor: float
    ceiling: float
    maximum: float
    target: float
    needed: int | None
    item_stats: tuple[ItemStats, ...]
    coverage: tuple[tuple[str, str], ...] = ()  # (item, what the lesson comparison found)


@dataclass(frozen=True, slots=True)
class Attrition:
    condition: str
    randomised: int
    analysed: int


@dataclass(frozen=True, slots=True)
class StudyData:
    reference: str
    baseline: tuple[BaselineRow, ...]
    instruments: tuple[Instrument, ...]
    attrition: tuple[Attrition, ...]
    attrition_sentence: str
