"""Dimensions found by comparing two versions rather than by measuring one.

The content comparison (:mod:`matcheck.compare.content`) and the post-test coverage
(:mod:`matcheck.compare.assessment`) compute these; their specs live here with the others so
that tolerances, labels and reports derive from one place. Each is judged from zero: a count
of passages without a counterpart, or a shortfall of coverage.
"""

from __future__ import annotations

from matcheck.findings import Group, Tolerance
from matcheck.measures.base import JUDGMENT, MeasureSpec, Role

C = Group.CONTENT

KEY_TERM_COVERAGE = MeasureSpec(
    "key_term_coverage",
    C,
    "share",
    "Shortfall of the weaker direction's coverage of the other version's key terms",
    Tolerance(
        absolute=0.10,
        reason=f"each version carries at least 90% of the other's key-term weight; {JUDGMENT}",
    ),
    role=Role.PAIRWISE,
    label="Key-term coverage",
    phrase="key-term coverage",
)
PASSAGES_REMOVED = MeasureSpec(
    "passages_removed",
    C,
    "passages",
    "Passages of the reference with no counterpart in the version",
    Tolerance(reason="every passage of the reference has a counterpart"),
    role=Role.PAIRWISE,
)
PASSAGES_ADDED = MeasureSpec(
    "passages_added",
    C,
    "passages",
    "Passages of the version with no counterpart in the reference",
    Tolerance(reason="every passage has a counterpart in the reference"),
    role=Role.PAIRWISE,
)
PASSAGES_REWRITTEN = MeasureSpec(
    "passages_rewritten",
    C,
    "passages",
    "Passages whose counterpart is weak (rewritten)",
    Tolerance(reason="a weak counterpart is a content change"),
    role=Role.PAIRWISE,
)
PASSAGES_MOVED = MeasureSpec(
    "passages_moved",
    C,
    "passages",
    "Passages whose counterpart stands elsewhere in the order",
    Tolerance(reason="order is part of instruction"),
    role=Role.PAIRWISE,
)
TEXT_REMOVED = MeasureSpec(
    "text_removed",
    C,
    "runs",
    "Runs of sentences cut from a matched passage, their content found nowhere else",
    Tolerance(
        reason="a sentence cut from a passage, with content found nowhere else in the version"
    ),
    role=Role.PAIRWISE,
)
TEXT_ADDED = MeasureSpec(
    "text_added",
    C,
    "runs",
    "Runs of sentences added to a matched passage, their content nowhere in the reference",
    Tolerance(reason="a sentence added to a passage, with content the reference has nowhere"),
    role=Role.PAIRWISE,
)
FACTS_CHANGED = MeasureSpec(
    "facts_changed",
    C,
    "edits",
    "Numbers, units, negations, comparisons or terms stated differently in a matched passage",
    Tolerance(
        reason="a number, unit, negation, comparison or term stated differently is a confound"
    ),
    role=Role.PAIRWISE,
    label="Changed facts",
    phrase="facts stated differently",
)
PASSAGES_REWORDED = MeasureSpec(
    "passages_reworded",
    C,
    "passages",
    "Matched passages with content words substituted, added or cut (an added clause)",
    Tolerance(
        reason="a passage with an added clause or a dropped qualifier says something else "
        f"(its threshold in content words: {JUDGMENT})"
    ),
    role=Role.PAIRWISE,
)
ITEM_COVERAGE = MeasureSpec(
    "item_coverage",
    Group.ASSESSMENT,
    "share",
    "Coverage of each post-test item's terms; taught at the study's threshold",
    Tolerance(
        absolute=0.10,
        reason="an item taught in one condition must be taught in the other, and its coverage "
        f"may not fall by more than 10 points (removing an item's teaching passage moved it "
        f"14 points in a trial lesson); {JUDGMENT}",
    ),
    role=Role.ITEM,
    label="Post-test item",
)

SPECS = (
    FACTS_CHANGED,
    KEY_TERM_COVERAGE,
    PASSAGES_REMOVED,
    PASSAGES_ADDED,
    PASSAGES_REWRITTEN,
    PASSAGES_MOVED,
    TEXT_REMOVED,
    TEXT_ADDED,
    PASSAGES_REWORDED,
    ITEM_COVERAGE,
)
