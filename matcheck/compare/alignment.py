"""Align the passages of two versions, in order, by TF-IDF cosine similarity.

The alignment is a dynamic programme over the two passage sequences (Needleman–Wunsch style,
gaps free) with five moves: skip a passage of either version, pair one with one, and pair one
with two adjacent passages of the other (so a paragraph that one format splits at a page
break, or that an editor split in two, still finds its counterpart). A pair gains its cosine
minus :data:`PAIR_THRESHOLD`, so two passages are paired only when they are more alike than
that. The programme runs inside a band around the diagonal, wide enough for large insertions
and removals; its width stops growing at :data:`MAX_SHARE_BAND` passages, so time and memory
grow linearly with the length of the lesson. Passages that leave the band are found again as
*moved* by comparing the leftovers directly. The programme works on one band row at a time
with numpy (see :func:`_programme`), doing the same float64 operations as a loop over cells.

Thresholds (judgment calls, documented in docs/comparison.md): a pair whose cosine is below
:data:`STRONG` is a *rewritten* passage; leftovers whose best counterpart elsewhere reaches
:data:`STRONG` are *moved*.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    import numpy as np

    from matcheck.measures.sparse import SparseRows

# Defaults of ComparisonSettings.pair_threshold and .rewritten_below (matcheck/settings.py).
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
# The share stops growing here (in passages, about 140k words at 20%), so very long lessons
# cost linear time and memory. Judgment call: a drift of 400 passages is a very large edit.
MAX_SHARE_BAND = 400
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
    strong: float = STRONG

    @property
    def rewritten(self) -> tuple[Pair, ...]:
        return tuple(pair for pair in self.pairs if pair.similarity < self.strong)


class _Banded:
    """Dot products ``A[i] · B[j]`` for ``j`` within the band of row ``i``."""

    def __init__(self, left: SparseRows, right: SparseRows, width: int) -> None:
        import numpy as np

        n, m = left.shape[0], right.shape[0]
        self.low = np.zeros(n + 2, dtype=np.int64)
        self.high = np.zeros(n + 2, dtype=np.int64)
        for i in range(n + 2):
            centre = i * m / max(n, 1)
            self.low[i] = max(0, math.floor(centre) - width)
            self.high[i] = min(m, math.ceil(centre) + width)
        self.rows: list[np.ndarray] = []
        for start in range(0, n, _CHUNK):
            stop = min(n, start + _CHUNK)
            lo, hi = int(self.low[start]), int(self.high[stop - 1]) + 1
            block = left.rows(start, stop).dot_rows(right.rows(lo, hi))
            for offset, i in enumerate(range(start, stop)):
                a, b = int(self.low[i]), int(self.high[i]) + 1
                self.rows.append(block[offset, a - lo : b - lo])

    def dots(self, i: int, columns: np.ndarray) -> np.ndarray:
        """``A[i] · B[j]`` for each ``j`` in ``columns`` (0 outside the band, as for no overlap)."""
        import numpy as np

        row = self.rows[i]
        if not row.shape[0]:
            return np.zeros(columns.shape[0])
        k = columns - int(self.low[i])
        inside = (k >= 0) & (k < row.shape[0])
        values: np.ndarray = np.where(inside, row[np.clip(k, 0, row.shape[0] - 1)], 0.0)
        return values

    def in_band(self, i: int, columns: np.ndarray) -> np.ndarray:
        inside: np.ndarray = (columns >= self.low[i]) & (columns <= self.high[i])
        return inside


def _band_width(n: int, m: int) -> int:
    share = min(math.ceil(BAND_SHARE * max(n, m)), MAX_SHARE_BAND)
    return max(MIN_BAND, share, abs(n - m) + MIN_BAND // 2)


class _Similarity:
    """Cosines of the three pairing moves, a whole band row at a time.

    Each is ``dot / sqrt(|a|² |b|²)`` in float64, the same operations in the same order as a
    cell-by-cell loop, so the programme's results do not depend on the vectorisation. Passages
    without content words (squared norm 0) are compared by their plain text instead.
    """

    def __init__(
        self,
        band: _Banded,
        left: SparseRows,
        right: SparseRows,
        plain_a: list[str],
        plain_b: list[str],
    ) -> None:

        self.band, self.plain_a, self.plain_b = band, plain_a, plain_b
        self.norm_a, self.norm_b = left.squared_norms(), right.squared_norms()
        self.next_a = left.adjacent_dots()
        next_b = right.adjacent_dots()
        # |b[j] + b[j+1]|² = |b[j]|² + |b[j+1]|² + 2 b[j]·b[j+1]
        self.pair_b = self.norm_b[:-1] + self.norm_b[1:] + 2 * next_b
        self.empty_b = self.norm_b <= 0
        self.empty_pair_b = self.pair_b <= 0
        self._one_one: dict[int, np.ndarray] = {}

    def _cosine(
        self,
        dot: np.ndarray,
        sq_a: float,
        sq_b: np.ndarray,
        empty_b: np.ndarray,
        text_a: str,
        columns: np.ndarray,
        text_b: Callable[[int], str],
    ) -> np.ndarray:
        import numpy as np

        with np.errstate(divide="ignore", invalid="ignore"):
            sim = dot / np.sqrt(sq_a * sq_b)
        # Texts are built only where needed: few passages lack content words.
        fallback = np.flatnonzero(empty_b) if sq_a > 0 else np.arange(sim.shape[0])
        for k in fallback.tolist():
            sim[k] = 1.0 if text_a == text_b(int(columns[k])) else 0.0
        return np.asarray(sim, dtype=np.float64)

    def one_one(self, i: int, columns: np.ndarray) -> np.ndarray:
        """cos(a[i], b[j]) for ``j`` in ``columns``, all inside row ``i``'s band."""
        import numpy as np

        cached = self._one_one.get(i)
        if cached is None:
            low, high = int(self.band.low[i]), int(self.band.high[i])
            every = np.arange(low, min(high, len(self.plain_b) - 1) + 1)
            cached = self._cosine(
                self.band.dots(i, every),
                float(self.norm_a[i]),
                self.norm_b[every],
                self.empty_b[every],
                self.plain_a[i],
                every,
                self.plain_b.__getitem__,
            )
            self._one_one[i] = cached
            self._one_one.pop(i - 3, None)  # the programme looks back two rows at most
        values: np.ndarray = cached[columns - int(self.band.low[i])]
        return values

    def two_one(self, i: int, columns: np.ndarray) -> np.ndarray:
        """cos(a[i] + a[i+1], b[j]) for ``j`` in ``columns``."""
        sq = self.norm_a[i] + self.norm_a[i + 1] + 2 * self.next_a[i]
        dot = self.band.dots(i, columns) + self.band.dots(i + 1, columns)
        text = self.plain_a[i] + " " + self.plain_a[i + 1]
        return self._cosine(
            dot,
            float(sq),
            self.norm_b[columns],
            self.empty_b[columns],
            text,
            columns,
            self.plain_b.__getitem__,
        )

    def one_two(self, i: int, columns: np.ndarray) -> np.ndarray:
        """cos(a[i], b[j] + b[j+1]) for ``j`` in ``columns``."""
        dot = self.band.dots(i, columns) + self.band.dots(i, columns + 1)
        return self._cosine(
            dot,
            float(self.norm_a[i]),
            self.pair_b[columns],
            self.empty_pair_b[columns],
            self.plain_a[i],
            columns,
            lambda j: self.plain_b[j] + " " + self.plain_b[j + 1],
        )


# Moves of the programme, as stored per cell: how many passages of A and B each consumes.
_NONE, _UP, _LEFT, _ONE_ONE, _TWO_ONE, _ONE_TWO = range(6)
_STEPS = {_UP: (1, 0), _LEFT: (0, 1), _ONE_ONE: (1, 1), _TWO_ONE: (2, 1), _ONE_TWO: (1, 2)}


@dataclass(frozen=True, slots=True)
class _Row:
    low: int
    score: np.ndarray
    move: np.ndarray
    similarity: np.ndarray

    def at(self, columns: np.ndarray) -> np.ndarray:
        """Scores at ``columns``; -inf outside the row, where no cell was computed."""
        import numpy as np

        k = columns - self.low
        inside = (k >= 0) & (k < self.score.shape[0])
        clipped = np.clip(k, 0, max(self.score.shape[0] - 1, 0))
        return np.where(inside, self.score[clipped], -np.inf)


def _programme(
    band: _Banded, sims: _Similarity, n: int, threshold: float = PAIR_THRESHOLD
) -> list[_Row]:
    """The banded dynamic programme, one row of cells at a time.

    Cell ``(i, j)`` holds the best score aligning ``a[:i]`` with ``b[:j]``. Skipping a passage
    of B gains nothing, so along a row the score is a running maximum of what the other moves
    reach; ties go to the first move in the order up, left, 1-1, 2-1, 1-2.
    """
    import numpy as np

    neg = -np.inf
    rows: list[_Row] = []
    for i in range(n + 1):
        lo, hi = int(band.low[i]), int(band.high[i])
        j = np.arange(lo, hi + 1)
        size = j.shape[0]
        up = rows[i - 1].at(j) if i > 0 else np.full(size, neg)
        if i == 0:
            up = np.where(j == 0, 0.0, neg)  # the empty alignment
        one_one = np.full(size, neg)
        two_one = np.full(size, neg)
        one_two = np.full(size, neg)
        sim11 = np.zeros(size)
        sim21 = np.zeros(size)
        sim12 = np.zeros(size)
        if i > 0:
            ok = (j > 0) & band.in_band(i - 1, j - 1)
            if ok.any():
                cols = j[ok] - 1
                sim = sims.one_one(i - 1, cols)
                sim11[ok] = sim
                gain = rows[i - 1].at(cols) + sim - threshold
                one_one[ok] = np.where(sim > threshold, gain, neg)
        if i > 1:
            ok = (j > 0) & band.in_band(i - 2, j - 1) & band.in_band(i - 1, j - 1)
            if ok.any():
                cols = j[ok] - 1
                sim = sims.two_one(i - 2, cols)
                sim21[ok] = sim
                alone = np.maximum(sims.one_one(i - 2, cols), sims.one_one(i - 1, cols))
                gain = rows[i - 2].at(cols) + 2 * (sim - threshold) - MERGE_PENALTY
                allowed = (sim > threshold) & (sim >= alone + MERGE_GAIN)
                two_one[ok] = np.where(allowed, gain, neg)
        if i > 0:
            ok = (j > 1) & band.in_band(i - 1, j - 2) & band.in_band(i - 1, j - 1)
            if ok.any():
                cols = j[ok] - 2
                sim = sims.one_two(i - 1, cols)
                sim12[ok] = sim
                alone = np.maximum(sims.one_one(i - 1, cols), sims.one_one(i - 1, cols + 1))
                gain = rows[i - 1].at(cols) + 2 * (sim - threshold) - MERGE_PENALTY
                allowed = (sim > threshold) & (sim >= alone + MERGE_GAIN)
                one_two[ok] = np.where(allowed, gain, neg)
        best = np.maximum.accumulate(
            np.maximum(np.maximum(up, one_one), np.maximum(two_one, one_two))
        )
        left = np.concatenate(([neg], best[:-1]))
        move = np.select(
            [best == neg, up == best, left == best, one_one == best, two_one == best],
            [_NONE, _UP, _LEFT, _ONE_ONE, _TWO_ONE],
            _ONE_TWO,
        ).astype(np.int8)
        if i == 0:
            move[j == 0] = _NONE
        similarity = np.select(
            [move == _ONE_ONE, move == _TWO_ONE, move == _ONE_TWO], [sim11, sim21, sim12], 0.0
        )
        rows.append(_Row(lo, best, move, similarity))
    return rows


def align(
    left: SparseRows,
    right: SparseRows,
    left_texts: Sequence[str],
    right_texts: Sequence[str],
    *,
    threshold: float = PAIR_THRESHOLD,
    strong: float = STRONG,
) -> Alignment:
    """Align passages of A (rows of ``left``) with passages of B (rows of ``right``).

    Rows are raw (not normalised) tf-idf vectors over one shared vocabulary. Passages with no
    content words at all are compared by their text.
    """
    n, m = left.shape[0], right.shape[0]
    band = _Banded(left, right, _band_width(n, m))
    plain_a = [" ".join(text.lower().split()) for text in left_texts]
    plain_b = [" ".join(text.lower().split()) for text in right_texts]
    rows = _programme(band, _Similarity(band, left, right, plain_a, plain_b), n, threshold)
    pairs: list[Pair] = []
    removed: list[int] = []
    added: list[int] = []
    i, j = n, m
    while i > 0 or j > 0:
        row = rows[i]
        code = int(row.move[j - row.low])
        di, dj = _STEPS[code]
        if di and dj:
            sim = float(row.similarity[j - row.low])
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
    moved, removed, added = _find_moved(left, right, removed, added, plain_a, plain_b, strong)
    return Alignment(tuple(pairs), tuple(removed), tuple(added), tuple(moved), strong)


def _absorb(
    left: SparseRows,
    right: SparseRows,
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

    def vector(matrix: SparseRows, rows: Sequence[int]) -> np.ndarray:
        return matrix.take(rows).column_totals()

    def cosine(a: np.ndarray, b: np.ndarray) -> float:
        denominator = float(np.linalg.norm(a) * np.linalg.norm(b))
        return float(a @ b) / denominator if denominator else 0.0

    left_over, right_over = set(removed), set(added)
    grown: list[Pair] = []
    for pair in pairs:
        rows_a, rows_b = list(pair.left), list(pair.right)
        if not (
            {min(rows_a) - 1, max(rows_a) + 1} & left_over
            or {min(rows_b) - 1, max(rows_b) + 1} & right_over
        ):
            grown.append(pair)  # no leftover beside it: nothing to absorb
            continue
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
    left: SparseRows,
    right: SparseRows,
    removed: list[int],
    added: list[int],
    plain_a: list[str],
    plain_b: list[str],
    strong: float = STRONG,
) -> tuple[list[Pair], list[int], list[int]]:
    """Pair leftovers of A and B that are strongly alike: the passage moved."""
    import numpy as np

    from matcheck.measures.tfidf import l2_normalize as normalize

    if not removed or not added:
        return [], removed, added
    a = normalize(left.take(removed))
    b = normalize(right.take(added))
    sims = a.dot_rows(b)
    for r, i in enumerate(removed):
        for c, j in enumerate(added):
            if plain_a[i] == plain_b[j]:
                sims[r, c] = 1.0
    moved: list[Pair] = []
    used_r: set[int] = set()
    used_c: set[int] = set()
    order = np.dstack(np.unravel_index(np.argsort(-sims, axis=None), sims.shape))[0]
    for r, c in order:
        if sims[r, c] < strong:
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
