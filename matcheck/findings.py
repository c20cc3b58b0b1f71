"""The one model every report renders: conditions, findings, evidence, the report itself.

Findings are frozen. A finding compares one measure (``dimension``) between the reference
condition and one other condition; ``status`` is the verdict and ``reason`` says why.
``caused_by`` names the root-cause finding of an echo (reading time follows words), so reports
can show one confound once.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from enum import StrEnum

from matcheck.model import Location

SCHEMA_VERSION = "1.0"

NOT_PROOF = (
    "A clean report does not prove that the versions are equivalent: it covers only what "
    "matcheck measures. The researcher's judgment, and their ethics review, decide."
)


class Status(StrEnum):
    """Verdict on one measure for one pair of versions."""

    DIFFERS = "differs"
    INCONCLUSIVE = "inconclusive"
    INTENDED = "intended"
    MATCHED = "matched"


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

    ``kind`` is one of the documented evidence kinds (``passage_removed``, ``term_missing``,
    ...; see docs/report-schema.md); ``condition`` names the version where ``location``
    points; ``text`` is an excerpt or a term.
    """

    kind: str
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
class Finding:
    dimension: str
    group: str
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
    group: str
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
    regressions: tuple[str, ...] = ()

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
