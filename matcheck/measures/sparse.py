"""Sparse rows (compressed sparse row layout) with the few operations TF-IDF needs, in numpy.

The TF-IDF model and the passage alignment need: row slices, sums of rows, dot products of
rows with rows, and row norms. scipy.sparse does all that, but importing it takes ~0.15 s
(it loads scipy's array-API layer, which walks all of numpy), more than the work itself on
an ordinary lesson, and a re-check after one edited file should take under a second
(docs/performance.md). So this module keeps the CSR arrays (``data``, ``indices``,
``indptr``, exactly as ``scipy.sparse.csr_matrix`` holds them) and does those operations with
numpy, summing in the same order scipy does where the order is documented by its code:

- :meth:`SparseRows.dot_rows` sums ``A[i, k] * B[j, k]`` over ``k`` in the stored order of
  ``A``'s row ``i``, as scipy's ``csr_matmat`` does for ``A @ B.T``;
- :meth:`SparseRows.column_totals` adds rows in order, each in stored order, as
  ``A[rows].sum(axis=0)`` does;
- :meth:`SparseRows.squared_norms` sums each row's squares in stored order with
  ``np.add.reduceat``, as scipy's ``sum(axis=1)`` sums a row.

tests/test_sparse.py checks each against scipy.sparse, which stays the test reference.
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    import numpy as np


class SparseRows:
    """A matrix of ``shape`` stored by rows: row ``i`` holds ``data[indptr[i]:indptr[i+1]]``
    at columns ``indices[indptr[i]:indptr[i+1]]`` (no column twice in a row)."""

    __slots__ = ("data", "indices", "indptr", "shape")

    def __init__(
        self, data: np.ndarray, indices: np.ndarray, indptr: np.ndarray, shape: tuple[int, int]
    ) -> None:
        self.data = data
        self.indices = indices
        self.indptr = indptr
        self.shape = shape

    @classmethod
    def from_dense(cls, rows: object) -> SparseRows:
        """The non-zero entries of a dense matrix (a list of rows or a 2-D array)."""
        import numpy as np

        dense = np.atleast_2d(np.asarray(rows, dtype=np.float64))
        row_ids, columns = np.nonzero(dense)
        indptr = np.concatenate(([0], np.cumsum(np.bincount(row_ids, minlength=dense.shape[0]))))
        return cls(
            dense[row_ids, columns],
            columns.astype(np.int32),
            indptr.astype(np.int32),
            (dense.shape[0], dense.shape[1]),
        )

    def row_ids(self) -> np.ndarray:
        """The row of each stored entry."""
        import numpy as np

        return np.repeat(np.arange(self.shape[0]), np.diff(self.indptr))

    def rows(self, start: int, stop: int) -> SparseRows:
        """Rows ``start`` to ``stop`` (end exclusive), sharing the arrays."""
        start, stop = max(0, start), min(self.shape[0], stop)
        stop = max(start, stop)
        first, last = int(self.indptr[start]), int(self.indptr[stop])
        return SparseRows(
            self.data[first:last],
            self.indices[first:last],
            self.indptr[start : stop + 1] - first,
            (stop - start, self.shape[1]),
        )

    def take(self, rows: Sequence[int]) -> SparseRows:
        """The rows at ``rows``, in that order."""
        import numpy as np

        picked = np.asarray(rows, dtype=np.int64)
        starts, ends = self.indptr[picked], self.indptr[picked + 1]
        lengths = ends - starts
        indptr = np.concatenate(([0], np.cumsum(lengths))).astype(np.int64)
        positions = np.repeat(starts - indptr[:-1], lengths) + np.arange(int(indptr[-1]))
        return SparseRows(
            self.data[positions], self.indices[positions], indptr, (len(picked), self.shape[1])
        )

    def with_data(self, data: np.ndarray) -> SparseRows:
        return SparseRows(data, self.indices, self.indptr, self.shape)

    def toarray(self) -> np.ndarray:
        import numpy as np

        dense = np.zeros(self.shape, dtype=np.float64)
        dense[self.row_ids(), self.indices] = self.data
        return dense

    def column(self, column: int) -> np.ndarray:
        """Column ``column`` as a dense vector."""
        import numpy as np

        values = np.zeros(self.shape[0], dtype=np.float64)
        hit = self.indices == column
        values[self.row_ids()[hit]] = self.data[hit]
        return values

    def column_totals(self) -> np.ndarray:
        """The sum of all rows (a dense vector over the columns)."""
        import numpy as np

        # bincount gives int64 when there is no entry at all: keep float64 throughout.
        totals = np.bincount(self.indices, weights=self.data, minlength=self.shape[1])
        result: np.ndarray = totals.astype(np.float64, copy=False)
        return result

    def squared_norms(self) -> np.ndarray:
        """Each row's sum of squares."""
        import numpy as np

        result = np.zeros(self.shape[0], dtype=np.float64)
        filled = np.flatnonzero(np.diff(self.indptr))
        if filled.shape[0]:
            result[filled] = np.add.reduceat(self.data * self.data, self.indptr[filled])
        return result

    def dot_rows(self, other: SparseRows) -> np.ndarray:
        """``self @ other.T`` as a dense array: the dot product of every pair of rows."""
        import numpy as np

        n, m = self.shape[0], other.shape[0]
        if not n or not m:
            return np.zeros((n, m), dtype=np.float64)
        # Each column of ``other``: its entries in row order.
        order = np.argsort(other.indices, kind="stable")
        by_column = other.indices[order]
        rows_of_other = other.row_ids()[order]
        values_of_other = other.data[order]
        first = np.searchsorted(by_column, self.indices, side="left")
        counts = np.searchsorted(by_column, self.indices, side="right") - first
        total = int(counts.sum())
        if not total:
            return np.zeros((n, m), dtype=np.float64)
        # Every (entry of self, entry of other in the same column), self's entries in stored
        # order: bincount then adds each output's products in that order.
        source = np.repeat(np.arange(self.indices.shape[0]), counts)
        offsets = np.cumsum(counts) - counts
        target = first[source] + np.arange(total) - offsets[source]
        products = self.data[source] * values_of_other[target]
        cells = self.row_ids()[source] * m + rows_of_other[target]
        result: np.ndarray = np.bincount(cells, weights=products, minlength=n * m).reshape(n, m)
        return result

    def adjacent_dots(self) -> np.ndarray:
        """``row[i] · row[i + 1]`` for each ``i`` (one fewer than the rows)."""
        import numpy as np

        n = self.shape[0]
        if n < 2:
            return np.zeros(0, dtype=np.float64)
        width = self.shape[1]
        rows = self.row_ids()
        keys = rows * width + self.indices
        # The entries of row i + 1, renumbered as row i, meet row i's on the same key.
        lower, upper = rows < n - 1, rows > 0
        _, here, there = np.intersect1d(
            keys[lower], keys[upper] - width, assume_unique=True, return_indices=True
        )
        products = self.data[lower][here] * self.data[upper][there]
        sums = np.bincount(rows[lower][here], weights=products, minlength=n - 1)
        result: np.ndarray = sums.astype(np.float64, copy=False)  # int64 when nothing meets
        return result
