"""The one place where a reviewed difference becomes *accepted*, after the decision step.

A study file's ``[[accepted]]`` entries (docs/study-file.md) name a comparison (a pair, or
every pair of a factor's contrast), a measure (and a post-test item), the extent accepted
(``up_to``) and, when written by ``matcheck accept``, the finding's id. For each entry:

- a finding that *differs*, whose id is the entry's (when it has one) and whose difference
  lies between zero and ``up_to`` (same sign), becomes *accepted*, with the entry's reason;
- one that grew beyond ``up_to``, or changed sign, stays *differs* and says so;
- one whose id changed (its evidence changed: a different passage removed) stays *differs*;
- an entry that accepts no difference is *stale*: a warning in every report format.

Echoes of an accepted root cause are accepted with it (they follow it, as in
:func:`matcheck.compare.decide.decide`). Nothing else changes: the exit status counts only
what differs (``findings.exit_status``).
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, replace

from matcheck.findings import Accepted, Basis, Finding, Spread, Status
from matcheck.identity import finding_id

# Differences are compared with up_to after rounding to the report's decimals; this margin
# only absorbs floating-point error.
_EPSILON = 1e-9


@dataclass(frozen=True, slots=True)
class ComparedPair:
    """A comparison of the study: ``condition`` against ``reference``, of ``factor``."""

    reference: str
    condition: str
    factor: str | None = None


def applies_to(entry: Accepted, pair: ComparedPair) -> bool:
    if entry.contrast is not None:
        return pair.factor == entry.contrast
    return (entry.reference, entry.condition) == (pair.reference, pair.condition)


def within(entry: Accepted, finding: Finding) -> bool:
    """Whether the finding's difference lies between zero and ``up_to``, sign included."""
    value = finding.relative_difference if entry.relative else finding.difference
    if value is None:
        return False
    low, high = sorted((0.0, entry.up_to))
    return low - _EPSILON <= value <= high + _EPSILON


def apply_accepted(
    findings: Sequence[Finding], pairs: Sequence[ComparedPair], entries: Sequence[Accepted]
) -> tuple[tuple[Finding, ...], tuple[str, ...]]:
    """The findings with the accepted differences marked, and a warning per stale entry."""
    decided = list(findings)
    factor = {(p.reference, p.condition): p for p in pairs}
    stale: list[str] = []
    outgrown: dict[int, tuple[Accepted, list[int]]] = {}  # entries a difference grew beyond
    for entry in entries:
        accepted_one = False
        changed: list[str] = []
        candidates = 0
        for position, finding in enumerate(decided):
            pair = factor.get((finding.reference, finding.condition))
            if pair is None or not applies_to(entry, pair):
                continue
            if finding.dimension != entry.measure or finding.item != entry.item:
                continue
            candidates += 1
            if finding.status is Status.ACCEPTED:  # by an earlier entry
                if within(entry, finding):
                    accepted_one = True
                else:
                    outgrown.setdefault(entry.number, (entry, []))[1].append(position)
                continue
            if finding.status is not Status.DIFFERS:
                continue
            identity = finding_id(finding)
            if entry.id is not None and entry.id != identity:
                changed.append(identity)
                decided[position] = replace(
                    finding,
                    reason=f"{finding.reason}; {entry.label()} no longer applies: its evidence "
                    f"changed (accepted {entry.id}, now {identity})",
                )
                continue
            if within(entry, finding):
                accepted_one = True
                decided[position] = replace(
                    finding,
                    status=Status.ACCEPTED,
                    basis=Basis.ACCEPTED,
                    reason=f"accepted: {entry.reason}",
                    accepted=entry,
                )
            else:
                outgrown.setdefault(entry.number, (entry, []))[1].append(position)
                decided[position] = replace(
                    finding,
                    reason=f"beyond the accepted {entry.extent()} ({entry.label()}): "
                    f"{finding.reason}",
                )
        if not accepted_one and entry.number not in outgrown:
            stale.append(_stale(entry, candidates, changed))
    for entry, positions in outgrown.values():
        # A difference that grew beyond this entry, and that a later entry accepts: this one
        # no longer does anything.
        later = [decided[p].accepted for p in positions if decided[p].status is Status.ACCEPTED]
        if later and len(later) == len(positions):
            numbers = ", ".join(sorted({f"#{e.number}" for e in later if e is not None}))
            stale.append(
                f"stale: {entry.label()} is superseded by accepted {numbers}, which accepts "
                "the larger difference: remove it"
            )
    return tuple(_echoes(decided)), tuple(stale)


def _stale(entry: Accepted, candidates: int, changed: Sequence[str]) -> str:
    if changed:
        why = (
            f"its evidence changed (now {', '.join(changed)}): review the difference, then "
            "accept it again or remove the entry"
        )
    elif candidates:
        why = "that difference is gone (within tolerance or intended now): remove the entry"
    else:
        why = "no comparison of the study reports that measure: remove or correct the entry"
    return f"stale: {entry.label()} matches no difference; {why}"


def _echoes(findings: list[Finding]) -> list[Finding]:
    """An echo that differs follows its accepted root cause: accepted with it."""
    roots = {
        (f.reference, f.condition, f.dimension): f
        for f in findings
        if f.item is None and f.status is Status.ACCEPTED
    }
    result = []
    for finding in findings:
        root = roots.get((finding.reference, finding.condition, finding.caused_by or ""))
        if root is not None and finding.status is Status.DIFFERS:
            finding = replace(
                finding,
                status=Status.ACCEPTED,
                basis=Basis.ACCEPTED,
                reason=f"follows the accepted {root.dimension}",
                accepted=root.accepted,
            )
        result.append(finding)
    return result


_WORST_FIRST = (
    Status.DIFFERS,
    Status.INCONCLUSIVE,
    Status.ACCEPTED,
    Status.INTENDED,
    Status.MATCHED,
)


def restate_spreads(spreads: Sequence[Spread], findings: Sequence[Finding]) -> tuple[Spread, ...]:
    """The spread's worst verdict per measure, once accepted differences are accepted."""
    worst: dict[str, Status] = {}
    for finding in findings:
        current = worst.get(finding.dimension, Status.MATCHED)
        if _WORST_FIRST.index(finding.status) < _WORST_FIRST.index(current):
            worst[finding.dimension] = finding.status
        else:
            worst.setdefault(finding.dimension, current)
    return tuple(replace(s, status=worst.get(s.dimension, s.status)) for s in spreads)
