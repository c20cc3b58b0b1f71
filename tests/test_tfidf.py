"""matcheck's TF-IDF against scikit-learn's ``TfidfVectorizer`` and ``normalize``, the
reference implementation (smoothed idf ``ln((1+n)/(1+df)) + 1`` and l2 rows, as its user
guide documents them; the worked example is in tests/test_key_terms.py). The result must be
the same to the bit, so that reports do not move when scikit-learn is not imported.
Also: spaCy's stop words and lemma table, read without importing spaCy, equal spaCy's own.
"""

from __future__ import annotations

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st

from matcheck.measures.tfidf import fit, l2_normalize

TERMS = st.sampled_from([f"t{i}" for i in range(30)] + ["valve", "pump", "pump valve", "é"])
PASSAGES = st.lists(st.lists(TERMS, max_size=40), min_size=1, max_size=15).filter(any)


def _reference(passages: list[list[str]], normalized: bool) -> tuple[object, list[str]]:
    from sklearn.feature_extraction.text import TfidfVectorizer

    vectorizer = TfidfVectorizer(
        analyzer=lambda terms: terms, lowercase=False, norm="l2" if normalized else None
    )
    matrix = vectorizer.fit_transform(passages).tocsr()
    return matrix, [str(term) for term in vectorizer.get_feature_names_out()]


@settings(max_examples=150, deadline=None)
@given(PASSAGES, st.booleans())
def test_tfidf_is_scikit_learns_to_the_bit(passages: list[list[str]], normalized: bool) -> None:
    expected, vocabulary = _reference(passages, normalized)
    matrix, terms = fit(passages, normalized=normalized)
    assert terms == vocabulary
    assert matrix.shape == expected.shape  # type: ignore[attr-defined]
    assert np.array_equal(matrix.indptr, expected.indptr)  # type: ignore[attr-defined]
    assert np.array_equal(matrix.indices, expected.indices)  # type: ignore[attr-defined]
    assert np.array_equal(matrix.data, expected.data)  # type: ignore[attr-defined]


@settings(max_examples=100, deadline=None)
@given(PASSAGES)
def test_l2_rows_are_scikit_learns_to_the_bit(passages: list[list[str]]) -> None:
    from scipy.sparse import csr_matrix
    from sklearn.preprocessing import normalize

    raw, _ = fit(passages, normalized=False)
    rows = list(range(raw.shape[0]))[::-1]  # a row subset in another order, as alignment does
    for matrix in (raw, raw.take(rows)):
        expected = normalize(csr_matrix((matrix.data, matrix.indices, matrix.indptr), matrix.shape))
        ours = l2_normalize(matrix)
        assert np.array_equal(ours.indices, expected.indices)
        assert np.array_equal(ours.data, expected.data)
    assert np.array_equal(l2_normalize(raw).data, fit(passages)[0].data)


def test_no_term_at_all_is_an_error_as_in_scikit_learn() -> None:
    import pytest

    with pytest.raises(ValueError, match="empty vocabulary"):
        fit([[], []])


def test_stop_words_and_lemmas_are_spacys_own() -> None:
    from spacy.lang.en.stop_words import STOP_WORDS
    from spacy.util import load_language_data, registry

    from matcheck.language.pipeline import _lemma_table, stop_words

    assert stop_words() == frozenset(STOP_WORDS)
    table = load_language_data(registry.lookups.get("en")["lemma_lookup"])
    assert _lemma_table() == {str(word): str(base) for word, base in table.items()}
