"""TF-IDF over pre-tokenised passages, as scikit-learn's ``TfidfVectorizer`` computes it.

scikit-learn took ~0.8 s to import (``sklearn.preprocessing`` pulls in scipy.stats and
pandas) to do ~0.02 s of work here, and it was the largest cost of a re-check whose
profiles come from the cache (docs/performance.md, "Start-up"). This module builds the same
matrix with numpy (:class:`~matcheck.measures.sparse.SparseRows`, the arrays of a
``scipy.sparse.csr_matrix``): the same vocabulary order (sorted terms), the same
stored order of each row's entries (by the term's first appearance in all the passages,
then renumbered), the
smoothed idf ``ln((1 + n) / (1 + df)) + 1`` (docs/references.md has no section for it: it is
scikit-learn's documented formula), and the l2 norm summed entry by entry in stored
order, as scikit-learn's ``inplace_csr_row_normalize_l2`` does, so the result is bit for bit
the same. tests/test_tfidf.py checks that against scikit-learn, which stays the reference.
"""

from __future__ import annotations

import math
from collections import Counter
from collections.abc import Sequence
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    from matcheck.measures.sparse import SparseRows


def fit(
    term_lists: Sequence[Sequence[str]], *, normalized: bool = True
) -> tuple[SparseRows, list[str]]:
    """The tf-idf matrix (one row per passage) and the sorted vocabulary.

    Raises ``ValueError`` when no passage has a term, as scikit-learn does.
    """
    import numpy as np

    from matcheck.measures.sparse import SparseRows

    index: dict[str, int] = {}
    columns: list[int] = []
    counts: list[int] = []
    indptr = [0]
    for terms in term_lists:
        counter: Counter[int] = Counter()
        for term in terms:
            counter[index.setdefault(term, len(index))] += 1
        # Stored by first appearance in the whole corpus, then renumbered (scikit-learn
        # sorts a row's entries by the index before sorting the vocabulary).
        for column in sorted(counter):
            columns.append(column)
            counts.append(counter[column])
        indptr.append(len(columns))
    if not index:
        raise ValueError("empty vocabulary; perhaps the documents only contain stop words")
    vocabulary = sorted(index)
    renumber = np.empty(len(vocabulary), dtype=np.int64)
    for new, term in enumerate(vocabulary):
        renumber[index[term]] = new
    indices = renumber[np.asarray(columns, dtype=np.int64)] if columns else np.empty(0, np.int64)
    data = np.asarray(counts, dtype=np.float64)
    rows = len(term_lists)
    frequency = np.bincount(indices, minlength=len(vocabulary)) + 1
    idf = np.log((rows + 1) / frequency) + 1
    data *= idf[indices]
    matrix = SparseRows(
        data,
        indices.astype(np.int32),
        np.asarray(indptr, dtype=np.int32),
        (rows, len(vocabulary)),
    )
    return (l2_normalize(matrix, copy=False) if normalized else matrix), vocabulary


def l2_normalize(matrix: SparseRows, *, copy: bool = True) -> SparseRows:
    """Rows scaled to unit length (rows of zeros stay zero), like ``sklearn.preprocessing.
    normalize(matrix)``: each row's squares summed one by one in stored order."""
    import numpy as np

    result = matrix.with_data(np.array(matrix.data, dtype=np.float64, copy=copy))
    data = result.data
    bounds = result.indptr.tolist()
    squares = (data * data).tolist()
    for row in range(len(bounds) - 1):
        start, end = bounds[row], bounds[row + 1]
        total = 0.0
        for value in squares[start:end]:
            total += value
        if total != 0.0:
            data[start:end] /= math.sqrt(total)
    return result
