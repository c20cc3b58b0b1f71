"""Pull-request review (``check --against REV``): which differences are new since REV.

A difference that differs now was already there at REV when REV had a finding with the same
id (same pair, measure, item and, for content, the same evidence: matcheck.identity) that
differed or was accepted, and it has not grown since by more than the measure's tolerance
(nor changed sign). Everything else that differs now is new: the pull request introduced it,
and the reviewer sees it first, as an error; what was already there is a notice.
"""

from __future__ import annotations

from collections.abc import Sequence

from matcheck.findings import Finding, Status
from matcheck.identity import finding_id

_THEN = (Status.DIFFERS, Status.ACCEPTED)


def grew(then: Finding, now: Finding) -> bool:
    """Whether the difference grew beyond the tolerance, or changed sign, since ``then``."""
    if then.difference is None or now.difference is None:
        return False
    if then.difference * now.difference < 0:
        return True
    base = then.values.get(then.reference) or 0.0
    allowed = now.tolerance.allowed(base) if now.tolerance is not None else 0.0
    return abs(now.difference) > abs(then.difference) + allowed + 1e-12


def preexisting(before: Sequence[Finding], now: Sequence[Finding]) -> frozenset[str]:
    """The ids of the findings that differ now and already differed at the revision."""
    earlier = {finding_id(f): f for f in before if f.status in _THEN}
    found = set()
    for finding in now:
        if finding.status is not Status.DIFFERS:
            continue
        identity = finding_id(finding)
        then = earlier.get(identity)
        if then is not None and not grew(then, finding):
            found.add(identity)
    return frozenset(found)
