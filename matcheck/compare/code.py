"""Code compared line by line: a code line changed between versions is a located difference.

Code is not prose, so the passage alignment (TF-IDF of content words) would see a changed
command ("mesh status --nodes" → "mesh reboot --all") as the same passage. Learners copy code
as it stands, so every code line of one version that the other lacks, in order
(:class:`difflib.SequenceMatcher` over the lines), is counted and located.
"""

from __future__ import annotations

from collections.abc import Iterable, Mapping
from difflib import SequenceMatcher

from matcheck.compare.decide import Observation
from matcheck.findings import Evidence, EvidenceKind, Tolerance
from matcheck.measures.base import Profile
from matcheck.measures.code import CODE_CHANGED
from matcheck.model import BlockKind, Capability


def code_observations(
    ref: Profile,
    other: Profile,
    ref_name: str,
    name: str,
    tolerances: Mapping[str, Tolerance],
) -> Iterable[Observation]:
    """One observation: code lines in one version only (none when a format cannot show code)."""
    if any(Capability.CODE in p.document.cannot_show for p in (ref, other)):
        return
    a = ref.document.blocks_of(BlockKind.CODE)
    b = other.document.blocks_of(BlockKind.CODE)
    if not a and not b:
        return
    matcher = SequenceMatcher(a=[x.text for x in a], b=[x.text for x in b], autojunk=False)
    evidence: list[Evidence] = []
    for tag, i1, i2, j1, j2 in matcher.get_opcodes():
        if tag == "equal":
            continue
        evidence += [
            Evidence(EvidenceKind.CODE_LINE_REMOVED, ref_name, line.text, line.location)
            for line in a[i1:i2]
        ]
        evidence += [
            Evidence(EvidenceKind.CODE_LINE_ADDED, name, line.text, line.location)
            for line in b[j1:j2]
        ]
    yield Observation(
        spec=CODE_CHANGED,
        reference=ref_name,
        condition=name,
        values={ref_name: float(len(a)), name: float(len(b))},
        difference=float(len(evidence)),
        amount=float(len(evidence)),
        tolerance=tolerances.get(CODE_CHANGED.id, CODE_CHANGED.tolerance),
        evidence=tuple(evidence),
    )
