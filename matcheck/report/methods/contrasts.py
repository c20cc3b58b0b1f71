"""Which contrast each number of the table belongs to, and how a cell marks its verdict.

A table for a paper must say which comparison a difference comes from, and must not count
the manipulation as a difference: each contrast (a pair of versions the report compares) has
its own column, and a cell carries a mark for its verdict. The row's verdict looks only at
the contrasts that do not manipulate the measure.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

from matcheck.findings import Finding, Pairing, Status

# Beyond tolerance, manipulated, accepted, inconclusive. Printable in every sink (LaTeX
# escapes the daggers); a cell without a mark is within tolerance.
MARKS: dict[str, str] = {
    Status.DIFFERS.value: "*",
    Status.INTENDED.value: "†",
    "accepted": "‡",
    Status.INCONCLUSIVE.value: "°",
}
# Worst first: a row is "no" if any unmanipulated contrast differs.
WORST_FIRST = ("differs", "inconclusive", "accepted", "matched")


@dataclass(frozen=True, slots=True)
class Contrast:
    """One compared pair: ``condition`` against ``reference``, and what the design varies."""

    reference: str
    condition: str
    factor: str | None = None
    manipulated: tuple[str, ...] = ()

    @property
    def header(self) -> str:
        return f"{self.condition} vs {self.reference}"

    def describe(self) -> str:
        """``diagrams-bold vs text-bold (diagrams; manipulates figures)``."""
        parts = [self.factor] if self.factor else []
        if self.manipulated:
            parts.append(f"manipulates {', '.join(self.manipulated)}")
        else:
            parts.append("no manipulation declared")
        return f"{self.header} ({'; '.join(parts)})"

    def owns(self, finding: Finding) -> bool:
        return finding.reference == self.reference and finding.condition == self.condition


def contrasts_of(pairs: Sequence[Pairing]) -> tuple[Contrast, ...]:
    return tuple(Contrast(p.reference, p.condition, p.factor, p.manipulated) for p in pairs)


def worst(statuses: Sequence[str]) -> str:
    """The worst status of several findings in one contrast (``""`` for none)."""
    return next((s for s in (*WORST_FIRST, "intended") if s in statuses), "")


def cell(difference: str, status: str) -> str:
    """A contrast's cell: its difference and the mark of its verdict."""
    if not status:
        return "—"
    return f"{difference}{MARKS.get(status, '')}"


def row_verdict(statuses: Sequence[str]) -> str:
    """The row's verdict status over the contrasts that do not manipulate the measure;
    ``intended`` only when every contrast manipulates it."""
    judged = [s for s in statuses if s and s != Status.INTENDED.value]
    if not judged:
        return Status.INTENDED.value
    return worst(judged)
