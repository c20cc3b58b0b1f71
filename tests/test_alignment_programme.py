"""The vectorised alignment programme and the long-passage word diff, against references.

- The banded programme (matcheck.compare.alignment) is checked against the recurrence that
  docs/comparison.md states, written cell by cell over the full matrix below: five moves,
  free gaps, a pair gains cosine − 0.25, a one-to-two pair 2·(cosine − 0.25) − 0.05 and only
  when it beats either passage alone by 0.1; ties go to the first move in the order up,
  left, 1-1, 2-1, 1-2. With at most 60 passages the band covers the whole matrix, so both
  must give the same pairs and the same similarities, to the last bit.
- ``word_opcodes`` (matcheck.compare.wordiff) is checked against the reference library,
  Python's ``difflib.SequenceMatcher(autojunk=False)``, on short sequences, and on long ones
  against edits known by construction.
"""

from __future__ import annotations

import difflib
import math
import random

import numpy as np
import pytest

from matcheck.compare import alignment
from matcheck.compare.wordiff import DIRECT_DIFF_WORDS, word_opcodes
from matcheck.measures.sparse import SparseRows


def _reference_pairs(
    a: np.ndarray, b: np.ndarray, texts_a: list[str], texts_b: list[str]
) -> tuple[list[tuple[tuple[int, ...], tuple[int, ...], float]], list[int], list[int]]:
    """The documented recurrence, one cell at a time over the full (n+1) x (m+1) matrix."""
    n, m = len(a), len(b)

    def cosine(u: np.ndarray, v: np.ndarray, text_u: str, text_v: str) -> float:
        # Squared norms and the dot product as sums of products, as the module defines them.
        su, sv = float(u @ u), float(v @ v)
        if su <= 0 or sv <= 0:
            return 1.0 if text_u == text_v else 0.0
        return float(u @ v) / math.sqrt(su * sv)

    t, penalty, gain_needed = 0.25, 0.05, 0.1
    score = {(0, 0): 0.0}
    move: dict[tuple[int, int], tuple[int, int, float]] = {}
    for i in range(n + 1):
        for j in range(m + 1):
            if i == 0 and j == 0:
                continue
            options: list[tuple[float, tuple[int, int, float]]] = []
            if i > 0 and (i - 1, j) in score:
                options.append((score[(i - 1, j)], (1, 0, 0.0)))
            if j > 0 and (i, j - 1) in score:
                options.append((score[(i, j - 1)], (0, 1, 0.0)))
            if i > 0 and j > 0:
                sim = cosine(a[i - 1], b[j - 1], texts_a[i - 1], texts_b[j - 1])
                if sim > t:
                    options.append((score[(i - 1, j - 1)] + sim - t, (1, 1, sim)))
            if i > 1 and j > 0:
                joined = texts_a[i - 2] + " " + texts_a[i - 1]
                sim = cosine(a[i - 2] + a[i - 1], b[j - 1], joined, texts_b[j - 1])
                alone = max(
                    cosine(a[i - 2], b[j - 1], texts_a[i - 2], texts_b[j - 1]),
                    cosine(a[i - 1], b[j - 1], texts_a[i - 1], texts_b[j - 1]),
                )
                if sim > t and sim >= alone + gain_needed:
                    options.append((score[(i - 2, j - 1)] + 2 * (sim - t) - penalty, (2, 1, sim)))
            if i > 0 and j > 1:
                joined = texts_b[j - 2] + " " + texts_b[j - 1]
                sim = cosine(a[i - 1], b[j - 2] + b[j - 1], texts_a[i - 1], joined)
                alone = max(
                    cosine(a[i - 1], b[j - 2], texts_a[i - 1], texts_b[j - 2]),
                    cosine(a[i - 1], b[j - 1], texts_a[i - 1], texts_b[j - 1]),
                )
                if sim > t and sim >= alone + gain_needed:
                    options.append((score[(i - 1, j - 2)] + 2 * (sim - t) - penalty, (1, 2, sim)))
            best = max(value for value, _ in options)
            score[(i, j)] = best
            move[(i, j)] = next(how for value, how in options if value == best)
    pairs, removed, added = [], [], []
    i, j = n, m
    while i > 0 or j > 0:
        di, dj, sim = move[(i, j)]
        if di and dj:
            pairs.append((tuple(range(i - di, i)), tuple(range(j - dj, j)), sim))
        elif di:
            removed.append(i - 1)
        else:
            added.append(j - 1)
        i, j = i - di, j - dj
    return pairs[::-1], removed[::-1], added[::-1]


def _edited_copy(rng: random.Random, a: np.ndarray) -> np.ndarray:
    """Version B of passages A: some removed, inserted, split in two and joined."""
    rows: list[np.ndarray] = []
    i = 0
    while i < len(a):
        roll = rng.random()
        if roll < 0.1:
            i += 1
        elif roll < 0.2:
            rows.append(np.array([rng.choice([0.0, 1.0, 2.0]) for _ in range(a.shape[1])]))
        elif roll < 0.3:
            half = np.array([rng.random() < 0.5 for _ in range(a.shape[1])])
            rows += [a[i] * half, a[i] * ~half]
            i += 1
        elif roll < 0.35 and i + 1 < len(a):
            rows.append(a[i] + a[i + 1])
            i += 2
        elif roll < 0.7:  # rewritten: cosines spread over the thresholds
            keep = np.array([rng.random() < 0.5 for _ in range(a.shape[1])])
            noise = np.array([rng.choice([0.0, 0.0, 1.0, 3.0]) for _ in range(a.shape[1])])
            rows.append(a[i] * keep + noise)
            i += 1
        else:
            rows.append(a[i].copy())
            i += 1
    return np.array(rows).reshape(-1, a.shape[1])


@pytest.mark.parametrize("seed", range(40))
def test_banded_programme_matches_the_documented_recurrence(seed: int) -> None:
    rng = random.Random(seed)
    n, vocabulary = rng.randint(0, 25), rng.choice([4, 12, 40])
    a = np.array(
        [[rng.choice([0.0, 0.0, 1.0, 1.5, 2.5]) for _ in range(vocabulary)] for _ in range(n)]
    ).reshape(n, vocabulary)
    a[: n // 6] = 0.0  # passages without content words are compared by their text
    b = _edited_copy(rng, a)
    texts_a = [rng.choice(["step one", "step two", "note"]) for _ in range(len(a))]
    texts_b = [rng.choice(["step one", "step two", "note"]) for _ in range(len(b))]
    expected_pairs, expected_removed, expected_added = _reference_pairs(a, b, texts_a, texts_b)
    # align() also absorbs neighbours and finds moves afterwards; compare the programme alone.
    left, right = SparseRows.from_dense(a), SparseRows.from_dense(b)
    band = alignment._Banded(left, right, 60)
    sims = alignment._Similarity(band, left, right, texts_a, texts_b)
    rows = alignment._programme(band, sims, len(a))
    pairs, removed, added = [], [], []
    i, j = len(a), len(b)
    while i > 0 or j > 0:
        row = rows[i]
        di, dj = alignment._STEPS[int(row.move[j - row.low])]
        if di and dj:
            sim = float(row.similarity[j - row.low])
            pairs.append((tuple(range(i - di, i)), tuple(range(j - dj, j)), sim))
        elif di:
            removed.append(i - 1)
        else:
            added.append(j - 1)
        i, j = i - di, j - dj
    assert pairs[::-1] == expected_pairs
    assert removed[::-1] == expected_removed
    assert added[::-1] == expected_added


def _is_edit_script(a: list[str], b: list[str], ops: list[tuple[str, int, int, int, int]]) -> bool:
    i = j = 0
    for tag, i1, i2, j1, j2 in ops:
        if (i1, j1) != (i, j) or (tag == "equal" and a[i1:i2] != b[j1:j2]):
            return False
        i, j = i2, j2
    return (i, j) == (len(a), len(b))


@pytest.mark.parametrize("seed", range(20))
def test_word_opcodes_are_difflibs_on_short_passages(seed: int) -> None:
    rng = random.Random(seed)
    vocabulary = [f"w{k}" for k in range(rng.choice([3, 30, 300]))]
    a = [rng.choice(vocabulary) for _ in range(rng.randint(0, DIRECT_DIFF_WORDS // 3))]
    b = list(a)
    for _ in range(rng.randint(0, 6)):
        at = rng.randrange(len(b) + 1)
        b[at : at + rng.randint(0, 9)] = [rng.choice(vocabulary) for _ in range(rng.randint(0, 9))]
    expected = difflib.SequenceMatcher(None, a, b, autojunk=False).get_opcodes()
    assert word_opcodes(a, b) == expected


def test_word_opcodes_find_known_edits_in_a_long_passage() -> None:
    # 12,000 distinct words (by construction); B drops words 3,000-3,019 and inserts 15 new
    # words before word 9,000. Those are the only differences an edit script can show.
    a = [f"w{k}" for k in range(12_000)]
    b = a[:3_000] + a[3_020:9_000] + [f"new{k}" for k in range(15)] + a[9_000:]
    ops = word_opcodes(a, b)
    assert _is_edit_script(a, b, ops)
    changes = [op for op in ops if op[0] != "equal"]
    assert changes == [
        ("delete", 3_000, 3_020, 3_000, 3_000),
        ("insert", 9_000, 9_000, 8_980, 8_995),
    ]
