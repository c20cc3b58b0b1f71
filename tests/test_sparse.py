"""matcheck's sparse rows against scipy.sparse, the reference (matcheck/measures/sparse.py).

The products and the sums of rows must be scipy's to the bit (the same additions in the same
order); row norms and neighbour products, which scipy computes through an element-wise
product whose entry order depends on its internal format, to within rounding.
"""

from __future__ import annotations

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.sparse import csr_matrix

from matcheck.measures.sparse import SparseRows
from matcheck.measures.tfidf import fit

TERMS = st.sampled_from([f"t{i}" for i in range(25)] + ["valve", "pump", "pump valve"])
PASSAGES = st.lists(st.lists(TERMS, max_size=30), min_size=1, max_size=14).filter(any)


def _scipy(rows: SparseRows) -> csr_matrix:
    return csr_matrix((rows.data, rows.indices, rows.indptr), shape=rows.shape)


@settings(max_examples=120, deadline=None)
@given(PASSAGES, PASSAGES)
def test_dot_rows_is_scipys_product_to_the_bit(
    first: list[list[str]], second: list[list[str]]
) -> None:
    # One vocabulary for both, as the content model has: fit the two together, then split.
    matrix, _ = fit(first + second, normalized=False)
    a, b = matrix.rows(0, len(first)), matrix.rows(len(first), len(first) + len(second))
    expected = (_scipy(a) @ _scipy(b).T).toarray()
    assert np.array_equal(a.dot_rows(b), expected)


@settings(max_examples=120, deadline=None)
@given(PASSAGES, st.data())
def test_row_selections_and_sums_are_scipys(passages: list[list[str]], data: st.DataObject) -> None:
    matrix, _ = fit(passages, normalized=False)
    n = matrix.shape[0]
    picked = data.draw(st.lists(st.integers(0, n - 1), max_size=2 * n))
    start = data.draw(st.integers(0, n))
    stop = data.draw(st.integers(start, n))
    reference = _scipy(matrix)
    assert np.array_equal(matrix.toarray(), reference.toarray())
    assert np.array_equal(matrix.rows(start, stop).toarray(), reference[start:stop].toarray())
    if picked:
        taken = matrix.take(picked)
        assert np.array_equal(taken.toarray(), reference[picked].toarray())
        expected = np.asarray(reference[picked].sum(axis=0)).ravel()
        assert np.array_equal(taken.column_totals(), expected)
    column = data.draw(st.integers(0, matrix.shape[1] - 1))
    assert np.array_equal(matrix.column(column), reference[:, column].toarray().ravel())


@settings(max_examples=120, deadline=None)
@given(PASSAGES)
def test_norms_and_neighbour_products_match_scipy(passages: list[list[str]]) -> None:
    matrix, _ = fit(passages, normalized=False)
    reference = _scipy(matrix)
    norms = np.asarray(reference.multiply(reference).sum(axis=1)).ravel()
    np.testing.assert_allclose(matrix.squared_norms(), norms, rtol=1e-12, atol=0)
    if matrix.shape[0] > 1:
        products = np.asarray(reference[:-1].multiply(reference[1:]).sum(axis=1)).ravel()
        np.testing.assert_allclose(matrix.adjacent_dots(), products, rtol=1e-12, atol=1e-300)
    else:
        assert matrix.adjacent_dots().shape == (0,)


def test_from_dense_keeps_the_non_zero_entries() -> None:
    rows = SparseRows.from_dense([[0.0, 2.0, 0.0], [0.0, 0.0, 0.0], [1.5, 0.0, 3.0]])
    assert rows.shape == (3, 3)
    assert rows.indptr.tolist() == [0, 1, 1, 3]
    assert rows.indices.tolist() == [1, 0, 2]
    assert rows.data.tolist() == [2.0, 1.5, 3.0]
    assert rows.dot_rows(rows).tolist() == [[4.0, 0.0, 0.0], [0.0, 0.0, 0.0], [0.0, 0.0, 11.25]]


def test_empty_selections() -> None:
    rows = SparseRows.from_dense([[1.0, 0.0], [0.0, 2.0]])
    assert rows.rows(1, 1).shape == (0, 2)
    assert rows.take([]).shape == (0, 2)
    assert rows.rows(0, 0).dot_rows(rows).shape == (0, 2)
    assert rows.squared_norms().tolist() == [1.0, 4.0]
    assert rows.adjacent_dots().tolist() == [0.0]
    # No entry at all still gives float64 (numpy's bincount would give int64).
    assert rows.take([]).column_totals().dtype == np.float64
    assert rows.adjacent_dots().dtype == np.float64
