"""Evidence for outline differences: headings present in both versions at other ranks."""

from __future__ import annotations

from difflib import SequenceMatcher

from matcheck.findings import Evidence, EvidenceKind
from matcheck.model import BlockKind, Document


def heading_levels(ref: Document, other: Document, names: tuple[str, str]) -> list[Evidence]:
    """Each heading whose text both versions have, in order, at a different outline rank.

    Headings are paired by text (case folded) with :class:`difflib.SequenceMatcher`, so a
    heading moved or renamed elsewhere does not shift the pairs after it.
    """
    a = ref.blocks_of(BlockKind.HEADING)
    b = other.blocks_of(BlockKind.HEADING)
    matcher = SequenceMatcher(
        a=[h.text.lower() for h in a], b=[h.text.lower() for h in b], autojunk=False
    )
    evidence = []
    for block in matcher.get_matching_blocks():
        for offset in range(block.size):
            first, second = a[block.a + offset], b[block.b + offset]
            if first.level != second.level:
                evidence.append(
                    Evidence(
                        EvidenceKind.HEADING_LEVEL_CHANGED,
                        names[1],
                        f"{second.text}: level {first.level} in {names[0]}, "
                        f"{second.level} in {names[1]}",
                        second.location,
                        counterpart=first.location,
                        counterpart_text=first.text,
                    )
                )
    return evidence
