"""Align the passages of two versions, in order, by TF-IDF cosine similarity.

The alignment is a dynamic programme over the two passage sequences (Needleman–Wunsch style,
gaps free) with five moves: skip a passage of either version, pair one with one, and pair one
with two adjacent passages of the other (so a paragraph that one format splits at a page
break, or that an editor split in two, still finds its counterpart). A pair gains its cosine
minus :data:`PAIR_THRESHOLD`, so two passages are paired only when they are more alike than
that. The programme runs inside a band around the diagonal, wide enough for large insertions
and removals, so time and memory grow linearly with the length of the lesson; passages that
leave the band are found again as *moved* by comparing the leftovers directly.

Thresholds (judgment calls, documented in docs/comparison.md): a pair whose cosine is below
:data:`STRONG` is a *rewritten* passage; leftovers whose best counterpart elsewhere reaches
:data:`STRONG` are *moved*.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    import numpy as np
    from scipy.sparse import csr_matrix

PAIR_THRESHOLD = 0.25
STRONG = 0.7
MERGE_PENALTY = 0.05
# Pairing one passage with two is allowed only when the two together resemble it clearly more
# than either alone does: a split paragraph, not a neighbour swallowed with its match.
MERGE_GAIN = 0.1
# A leftover passage next to a pair joins it when the pair's cosine rises at least this much.
ABSORB_GAIN = 0.02
MIN_BAND = 60
BAND_SHARE = 0.2
_CHUNK = 128


@dataclass(frozen=True, slots=True)
class Pair:
    """``left`` passages of version A correspond to ``right`` passages of version B."""

    left: tuple[int, ...]
    right: tuple[int, ...]
    similarity: float


@dataclass(frozen=True, slots=True)
class Alignment:
    pairs: tuple[Pair, ...]
    removed: tuple[int, ...]
    added: tuple[int, ...]
    moved: tuple[Pair, ...]

    @property
    def rewritten(self) -> tuple[Pair, ...]:
        return tuple(pair for pair in self.pairs if pair.similarity < STRONG)


class _Banded:
    """Dot products ``A[i] · B[j]`` for ``j`` within the band of row ``i``."""

    def __init__(self, left: csr_matrix, right: csr_matrix, width: int) -> None:
        import numpy as np

        n, m = left.shape[0], right.shape[0]
        self.low = np.zeros(n + 2, dtype=np.int64)
        self.high = np.zeros(n + 2, dtype=np.int64)
        for i in range(n + 2):
            centre = i * m / max(n, 1)
            self.low[i] = max(0, math.floor(centre) - width)
            self.high[i] = min(m, math.ceil(centre) + width)
        self.rows: list[np.ndarray] = []
        right_t = right.T.tocsc()
        for start in range(0, n, _CHUNK):
            stop = min(n, start + _CHUNK)
            lo, hi = int(self.low[start]), int(self.high[stop - 1]) + 1
            block = (left[start:stop] @ right_t[:, lo:hi]).toarray()
            for offset, i in enumerate(range(start, stop)):
                a, b = int(self.low[i]), int(self.high[i]) + 1
                self.rows.append(block[offset, a - lo : b - lo])

    def dot(self, i: int, j: int) -> float:
        low = int(self.low[i])
        row = self.rows[i]
        k = j - low
        if 0 <= k < row.shape[0]:
            return float(row[k])
        return 0.0

    def in_band(self, i: int, j: int) -> bool:
        return int(self.low[i]) <= j <= int(self.high[i])


def _squared_norms(matrix: csr_matrix) -> np.ndarray:
    import numpy as np

    return np.asarray(matrix.multiply(matrix).sum(axis=1)).ravel()


def _adjacent_dots(matrix: csr_matrix) -> np.ndarray:
    import numpy as np

    if matrix.shape[0] < 2:
        return np.zeros(0)
    return np.asarray(matrix[:-1].multiply(matrix[1:]).sum(axis=1)).ravel()


def align(
    left: csr_matrix,
    right: csr_matrix,
    left_texts: Sequence[str],
    right_texts: Sequence[str],
) -> Alignment:
    """Align passages of A (rows of ``left``) with passages of B (rows of ``right``).

    Rows are raw (not normalised) tf-idf vectors over one shared vocabulary. Passages with no
    content words at all are compared by their text.
    """
    n, m = left.shape[0], right.shape[0]
    width = max(MIN_BAND, math.ceil(BAND_SHARE * max(n, m)), abs(n - m) + MIN_BAND // 2)
    band = _Banded(left, right, width)
    norm_a, norm_b = _squared_norms(left), _squared_norms(right)
    next_a, next_b = _adjacent_dots(left), _adjacent_dots(right)
    plain_a = [" ".join(text.lower().split()) for text in left_texts]
    plain_b = [" ".join(text.lower().split()) for text in right_texts]

    def cosine(dot: float, sq_a: float, sq_b: float, text_a: str, text_b: str) -> float:
        if sq_a <= 0 or sq_b <= 0:
            return 1.0 if text_a == text_b else 0.0
        return dot / math.sqrt(sq_a * sq_b)

    def one_one(i: int, j: int) -> float:
        return cosine(band.dot(i, j), norm_a[i], norm_b[j], plain_a[i], plain_b[j])

    def two_one(i: int, j: int) -> float:  # a[i] + a[i+1] against b[j]
        sq = norm_a[i] + norm_a[i + 1] + 2 * next_a[i]
        dot = band.dot(i, j) + band.dot(i + 1, j)
        return cosine(dot, sq, norm_b[j], plain_a[i] + " " + plain_a[i + 1], plain_b[j])

    def one_two(i: int, j: int) -> float:  # a[i] against b[j] + b[j+1]
        sq = norm_b[j] + norm_b[j + 1] + 2 * next_b[j]
        dot = band.dot(i, j) + band.dot(i, j + 1)
        return cosine(dot, norm_a[i], sq, plain_a[i], plain_b[j] + " " + plain_b[j + 1])

    # score[(i, j)]: best score aligning a[:i] with b[:j]; move[(i, j)] how it was reached.
    score: dict[tuple[int, int], float] = {(0, 0): 0.0}
    move: dict[tuple[int, int], tuple[int, int, float]] = {}
    neg = -math.inf
    for i in range(n + 1):
        lo, hi = int(band.low[i]), int(band.high[i])
        for j in range(lo, hi + 1):
            if i == 0 and j == 0:
                continue
            best, how = neg, (0, 0, 0.0)
            if i > 0 and score.get((i - 1, j), neg) > best:
                best, how = score[(i - 1, j)], (1, 0, 0.0)
            if j > 0 and score.get((i, j - 1), neg) > best:
                best, how = score[(i, j - 1)], (0, 1, 0.0)
            if i > 0 and j > 0 and band.in_band(i - 1, j - 1):
                sim = one_one(i - 1, j - 1)
                gain = score.get((i - 1, j - 1), neg) + sim - PAIR_THRESHOLD
                if sim > PAIR_THRESHOLD and gain > best:
                    best, how = gain, (1, 1, sim)
            if i > 1 and j > 0 and band.in_band(i - 2, j - 1) and band.in_band(i - 1, j - 1):
                sim = two_one(i - 2, j - 1)
                alone = max(one_one(i - 2, j - 1), one_one(i - 1, j - 1))
                gain = score.get((i - 2, j - 1), neg) + 2 * (sim - PAIR_THRESHOLD) - MERGE_PENALTY
                if sim > PAIR_THRESHOLD and sim >= alone + MERGE_GAIN and gain > best:
                    best, how = gain, (2, 1, sim)
            if i > 0 and j > 1 and band.in_band(i - 1, j - 2) and band.in_band(i - 1, j - 1):
                sim = one_two(i - 1, j - 2)
                alone = max(one_one(i - 1, j - 2), one_one(i - 1, j - 1))
                gain = score.get((i - 1, j - 2), neg) + 2 * (sim - PAIR_THRESHOLD) - MERGE_PENALTY
                if sim > PAIR_THRESHOLD and sim >= alone + MERGE_GAIN and gain > best:
                    best, how = gain, (1, 2, sim)
            if best > neg:
                score[(i, j)] = best
                move[(i, j)] = how
    pairs: list[Pair] = []
    removed: list[int] = []
    added: list[int] = []
    i, j = n, m
    while i > 0 or j > 0:
        di, dj, sim = move[(i, j)]
        if di and dj:
            pairs.append(Pair(tuple(range(i - di, i)), tuple(range(j - dj, j)), sim))
        elif di:
            removed.append(i - 1)
        else:
            added.append(j - 1)
        i, j = i - di, j - dj
    pairs.reverse()
    removed.reverse()
    added.reverse()
    pairs = _absorb(left, right, pairs, removed, added)
    moved, removed, added = _find_moved(left, right, removed, added, plain_a, plain_b)
    return Alignment(tuple(pairs), tuple(removed), tuple(added), tuple(moved))


def _absorb(
    left: csr_matrix,
    right: csr_matrix,
    pairs: list[Pair],
    removed: list[int],
    added: list[int],
) -> list[Pair]:
    """Grow pairs with adjacent leftovers while that makes them more alike.

    The programme pairs at most two passages with one; a list of six steps turned into one
    paragraph leaves four steps over. Each leftover next to a pair joins it when the pair's
    cosine rises by at least :data:`ABSORB_GAIN`; a removed neighbour lowers the cosine and
    stays removed. Works on ``removed`` and ``added`` in place.
    """
    import numpy as np

    def vector(matrix: csr_matrix, rows: Sequence[int]) -> np.ndarray:
        return np.asarray(matrix[list(rows)].sum(axis=0)).ravel()

    def cosine(a: np.ndarray, b: np.ndarray) -> float:
        denominator = float(np.linalg.norm(a) * np.linalg.norm(b))
        return float(a @ b) / denominator if denominator else 0.0

    left_over, right_over = set(removed), set(added)
    grown: list[Pair] = []
    for pair in pairs:
        rows_a, rows_b = list(pair.left), list(pair.right)
        va, vb = vector(left, rows_a), vector(right, rows_b)
        similarity = pair.similarity
        changed = True
        while changed and (left_over or right_over):
            changed = False
            for side, rows, pool in (("a", rows_a, left_over), ("b", rows_b, right_over)):
                for candidate in (min(rows) - 1, max(rows) + 1):
                    if candidate not in pool:
                        continue
                    matrix = left if side == "a" else right
                    extended = (va if side == "a" else vb) + vector(matrix, [candidate])
                    trial = cosine(extended, vb) if side == "a" else cosine(va, extended)
                    if trial >= similarity + ABSORB_GAIN:
                        pool.discard(candidate)
                        rows.append(candidate)
                        rows.sort()
                        if side == "a":
                            va = extended
                        else:
                            vb = extended
                        similarity = trial
                        changed = True
        grown.append(Pair(tuple(rows_a), tuple(rows_b), similarity))
    removed[:] = [i for i in removed if i in left_over]
    added[:] = [j for j in added if j in right_over]
    return grown


def _find_moved(
    left: csr_matrix,
    right: csr_matrix,
    removed: list[int],
    added: list[int],
    plain_a: list[str],
    plain_b: list[str],
) -> tuple[list[Pair], list[int], list[int]]:
    """Pair leftovers of A and B that are strongly alike: the passage moved."""
    import numpy as np
    from sklearn.preprocessing import normalize

    if not removed or not added:
        return [], removed, added
    a = normalize(left[removed])
    b = normalize(right[added])
    sims = (a @ b.T).toarray()
    for r, i in enumerate(removed):
        for c, j in enumerate(added):
            if plain_a[i] == plain_b[j]:
                sims[r, c] = 1.0
    moved: list[Pair] = []
    used_r: set[int] = set()
    used_c: set[int] = set()
    order = np.dstack(np.unravel_index(np.argsort(-sims, axis=None), sims.shape))[0]
    for r, c in order:
        if sims[r, c] < STRONG:
            break
        if r in used_r or c in used_c:
            continue
        used_r.add(int(r))
        used_c.add(int(c))
        moved.append(Pair((removed[r],), (added[c],), float(sims[r, c])))
    moved.sort(key=lambda pair: pair.left)
    rest_removed = [i for r, i in enumerate(removed) if r not in used_r]
    rest_added = [j for c, j in enumerate(added) if c not in used_c]
    return moved, rest_removed, rest_added
