"""A finding's stable id: the name a report gives it and an ``[[accepted]]`` entry pins.

The id is the first 10 hexadecimal digits of SHA-256 over, separated by U+001F:

1. the reference and the compared condition (their names in the study file),
2. the dimension (measure id) and the post-test item's id, if any,
3. for a content finding (group ``content``), the evidence fingerprint: SHA-256 over the
   sorted lines ``kind<TAB>text`` of its evidence, each text normalised (Unicode NFKC,
   case-folded, runs of white space made one space), so a different passage removed, or a
   second one, gives a different id; locations are left out, so an edit elsewhere that only
   renumbers paragraphs does not.

Values are left out too: a measure keeps its id when its difference changes, and the
``up_to`` of an entry judges the extent (docs/study-file.md). Ten hex digits make a clash
between two findings of one report negligible (about 1 in 10^8 for 200 findings), and the
``accept`` command refuses an id that names two findings.
"""

from __future__ import annotations

import hashlib
import unicodedata

from matcheck.findings import Finding, Group

ID_LENGTH = 10
_SEPARATOR = "\x1f"


def normalise(text: str) -> str:
    return " ".join(unicodedata.normalize("NFKC", text).casefold().split())


def evidence_fingerprint(finding: Finding) -> str:
    """The hash of a content finding's evidence; ``""`` for other findings."""
    if finding.group is not Group.CONTENT or not finding.evidence:
        return ""
    lines = sorted({f"{item.kind.value}\t{normalise(item.text)}" for item in finding.evidence})
    return hashlib.sha256("\n".join(lines).encode("utf-8")).hexdigest()[:ID_LENGTH]


def finding_id(finding: Finding) -> str:
    parts = (
        finding.reference,
        finding.condition,
        finding.dimension,
        finding.item or "",
        evidence_fingerprint(finding),
    )
    return hashlib.sha256(_SEPARATOR.join(parts).encode("utf-8")).hexdigest()[:ID_LENGTH]
