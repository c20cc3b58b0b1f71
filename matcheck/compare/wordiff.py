"""Word-level diff of two passages in near-linear time: difflib, cut at unique anchors.

``SequenceMatcher`` (autojunk off) is quadratic in the words of a pair; a lesson read as one
huge block would take minutes. Longer pairs are first cut at anchors, as in patience diff
(docs/references.md §25): runs of :data:`ANCHOR_WORDS` words found exactly once on each side.
Used by the text runs of :mod:`matcheck.compare.content` and the edits of
:mod:`matcheck.compare.edits`.
"""

from __future__ import annotations

import difflib

# Judgment calls: the size difflib handles directly, and the length of an anchor.
DIRECT_DIFF_WORDS = 4000
ANCHOR_WORDS = 8
_ANCHOR_DEPTH = 4

Opcode = tuple[str, int, int, int, int]


def word_opcodes(a: list[str], b: list[str]) -> list[Opcode]:
    """difflib opcodes turning ``a`` into ``b``, in near-linear time for long sequences.

    Up to :data:`DIRECT_DIFF_WORDS` words in all this is ``SequenceMatcher(autojunk=False)``
    itself. Longer pairs are first cut at anchors, as in patience diff: runs of
    :data:`ANCHOR_WORDS` words that occur exactly once on each side, the longest chain of them
    in the same order on both. The stretches between anchors are diffed the same way (a few
    levels deep); a long stretch still without any anchor is reported as replaced whole.
    """
    out: list[Opcode] = []
    _diff_range(a, b, 0, len(a), 0, len(b), out, depth=0)
    merged: list[Opcode] = []
    for op in out:  # anchors and stretches leave adjacent "equal" runs: join them
        if merged and op[0] == "equal" and merged[-1][0] == "equal":
            last = merged[-1]
            merged[-1] = ("equal", last[1], op[2], last[3], op[4])
        else:
            merged.append(op)
    return merged


def _diff_range(
    a: list[str],
    b: list[str],
    a0: int,
    a1: int,
    b0: int,
    b1: int,
    out: list[Opcode],
    *,
    depth: int,
) -> None:
    if a1 - a0 + b1 - b0 <= DIRECT_DIFF_WORDS or a0 == a1 or b0 == b1:
        if a0 < a1 or b0 < b1:
            matcher = difflib.SequenceMatcher(None, a[a0:a1], b[b0:b1], autojunk=False)
            for tag, i1, i2, j1, j2 in matcher.get_opcodes():
                out.append((tag, a0 + i1, a0 + i2, b0 + j1, b0 + j2))
        return
    anchors = _anchors(a, b, a0, a1, b0, b1) if depth < _ANCHOR_DEPTH else []
    if not anchors:
        out.append(("replace", a0, a1, b0, b1))
        return
    i, j = a0, b0
    for ai, bj in anchors:
        _diff_range(a, b, i, ai, j, bj, out, depth=depth + 1)
        out.append(("equal", ai, ai + ANCHOR_WORDS, bj, bj + ANCHOR_WORDS))
        i, j = ai + ANCHOR_WORDS, bj + ANCHOR_WORDS
    _diff_range(a, b, i, a1, j, b1, out, depth=depth + 1)


def _anchors(
    a: list[str], b: list[str], a0: int, a1: int, b0: int, b1: int
) -> list[tuple[int, int]]:
    """Starts (in a, in b) of word runs unique on both sides, the longest chain in order."""
    from bisect import bisect_left
    from collections import Counter

    k = ANCHOR_WORDS
    grams_a = [tuple(a[i : i + k]) for i in range(a0, a1 - k + 1)]
    grams_b = [tuple(b[j : j + k]) for j in range(b0, b1 - k + 1)]
    count_a, count_b = Counter(grams_a), Counter(grams_b)
    where_b = {gram: b0 + j for j, gram in enumerate(grams_b) if count_b[gram] == 1}
    pairs = [
        (a0 + i, where_b[gram])
        for i, gram in enumerate(grams_a)
        if count_a[gram] == 1 and gram in where_b
    ]
    # Longest increasing chain of b-starts (patience sorting); pairs come in a-order.
    tails: list[int] = []
    tail_at: list[int] = []
    before = [-1] * len(pairs)
    for index, (_, j) in enumerate(pairs):
        slot = bisect_left(tails, j)
        before[index] = tail_at[slot - 1] if slot else -1
        if slot == len(tails):
            tails.append(j)
            tail_at.append(index)
        else:
            tails[slot] = j
            tail_at[slot] = index
    chain: list[tuple[int, int]] = []
    index = tail_at[-1] if tail_at else -1
    while index >= 0:
        chain.append(pairs[index])
        index = before[index]
    chain.reverse()
    kept: list[tuple[int, int]] = []
    for i, j in chain:  # anchors must not overlap
        if not kept or (i >= kept[-1][0] + k and j >= kept[-1][1] + k):
            kept.append((i, j))
    return kept
