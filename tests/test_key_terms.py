"""TF-IDF key terms and the cosine of passage alignment, checked against published examples.

Sources (docs/references.md §8):
- scikit-learn User Guide, "Tf–idf term weighting" (doc/modules/feature_extraction.rst): the
  worked example with counts [[3,0,1],[2,0,0],[3,0,0],[4,0,0],[3,2,0],[3,0,2]];
- scikit-learn ``TfidfTransformer`` docstring: smooth_idf gives idf = ln((1+n)/(1+df)) + 1;
- Manning, Raghavan & Schütze (2008), *Introduction to Information Retrieval*, §6.3: the
  Austen/Brontë cosine example (log-weighted tf, no idf, cosine normalisation; and the book's
  raw-tf variant).
"""

from __future__ import annotations

import math

import pytest

from matcheck.compare.alignment import align
from matcheck.language.analysis import Analysis, analyze
from matcheck.measures import measure
from matcheck.measures.key_terms import fit_tfidf, passage_terms, passages, term_weights
from matcheck.measures.sparse import SparseRows
from matcheck.model import BlockKind
from matcheck.readers.builder import DocumentBuilder
from matcheck.settings import Settings

# scikit-learn User Guide worked example (VERIFIED, docs/references.md §8).
SKLEARN_COUNTS = [[3, 0, 1], [2, 0, 0], [3, 0, 0], [4, 0, 0], [3, 2, 0], [3, 0, 2]]
SKLEARN_IDF = [1.0, 2.25276297, 1.84729786]
SKLEARN_ROW_1 = [0.85151335, 0.0, 0.52433293]
SKLEARN_ROW_5 = [0.55422893, 0.83236428, 0.0]
SKLEARN_TOL = 1e-8


def _term_lists(counts: list[list[int]], terms: tuple[str, str, str]) -> list[list[str]]:
    return [[term for term, n in zip(terms, row, strict=True) for _ in range(n)] for row in counts]


def _analysis(*paragraphs: str) -> Analysis:
    builder = DocumentBuilder("lesson.md", "markdown")
    for text in paragraphs:
        builder.add_block(BlockKind.PARAGRAPH, text)
    return analyze(builder.build())


# --- (a) scikit-learn's worked example ------------------------------------------------------


def test_fit_tfidf_reproduces_sklearn_user_guide_example() -> None:
    matrix, vocabulary = fit_tfidf(_term_lists(SKLEARN_COUNTS, ("a", "b", "c")))
    assert vocabulary == ["a", "b", "c"]
    dense = matrix.toarray()
    assert dense.shape == (6, 3)
    assert dense[0].tolist() == pytest.approx(SKLEARN_ROW_1, abs=SKLEARN_TOL)
    assert dense[4].tolist() == pytest.approx(SKLEARN_ROW_5, abs=SKLEARN_TOL)
    # Rows 2-4 hold only term a: l2-normalised, that is [1, 0, 0] (by construction).
    for row in (1, 2, 3):
        assert dense[row].tolist() == pytest.approx([1.0, 0.0, 0.0], abs=SKLEARN_TOL)


def test_raw_tfidf_is_tf_times_smoothed_idf() -> None:
    # normalized=False keeps tf·idf, so each non-zero cell divided by its count is the idf.
    raw, _ = fit_tfidf(_term_lists(SKLEARN_COUNTS, ("a", "b", "c")), normalized=False)
    dense = raw.toarray()
    n = len(SKLEARN_COUNTS)
    for column in range(3):
        df = sum(1 for row in SKLEARN_COUNTS if row[column])
        # sklearn docstring: smooth_idf=True gives idf = ln((1+n)/(1+df)) + 1.
        idf = math.log((1 + n) / (1 + df)) + 1
        assert idf == pytest.approx(SKLEARN_IDF[column], abs=SKLEARN_TOL)
        for r, row in enumerate(SKLEARN_COUNTS):
            assert dense[r, column] == pytest.approx(row[column] * idf, abs=SKLEARN_TOL)


def test_sklearn_example_through_real_passages() -> None:
    # One word per sentence gives no bigrams (bigrams stay within a sentence), so these
    # passages have exactly the example's counts with lever/patch/valve for a/b/c.
    words = ("Lever.", "Patch.", "Valve.")
    texts = [
        " ".join(word for word, n in zip(words, row, strict=True) for _ in range(n))
        for row in SKLEARN_COUNTS
    ]
    analysis = _analysis(*texts)
    term_lists = [list(unit.terms) for unit in passages(analysis)]
    assert term_lists == _term_lists(SKLEARN_COUNTS, ("lever", "patch", "valve"))
    matrix, vocabulary = fit_tfidf(term_lists)
    assert vocabulary == ["lever", "patch", "valve"]
    assert matrix.toarray()[0].tolist() == pytest.approx(SKLEARN_ROW_1, abs=SKLEARN_TOL)
    assert matrix.toarray()[4].tolist() == pytest.approx(SKLEARN_ROW_5, abs=SKLEARN_TOL)


# --- (b) Manning, Raghavan & Schütze §6.3: cosine similarity --------------------------------

# Term counts affection, jealous, gossip, wuthering (docs/references.md §8; partly FROM MEMORY).
MRS_COUNTS = {
    "SaS": [115, 10, 2, 0],
    "PaP": [58, 7, 0, 0],
    "WH": [20, 11, 6, 38],
}


def _log_weights(counts: list[int]) -> list[float]:
    # Log-frequency weight 1 + log10(tf), 0 for tf = 0 (MRS §6.2; the slides' example).
    return [1 + math.log10(tf) if tf else 0.0 for tf in counts]


def _aligned_similarity(left: list[list[float]], right: list[list[float]]) -> list[float]:
    result = align(
        SparseRows.from_dense(left),
        SparseRows.from_dense(right),
        [f"left {i}" for i in range(len(left))],
        [f"right {j}" for j in range(len(right))],
    )
    return [pair.similarity for pair in result.pairs]


@pytest.mark.parametrize(
    ("a", "b", "expected"),
    [("SaS", "PaP", 0.9421), ("SaS", "WH", 0.7887), ("PaP", "WH", 0.6940)],
)
def test_alignment_cosine_log_tf(a: str, b: str, expected: float) -> None:
    # align() takes raw (unnormalised) rows and normalises by cosine itself.
    sims = _aligned_similarity([_log_weights(MRS_COUNTS[a])], [_log_weights(MRS_COUNTS[b])])
    assert sims == [pytest.approx(expected, abs=5e-4)]


@pytest.mark.parametrize(("b", "expected"), [("PaP", 0.9993), ("WH", 0.8889)])
def test_alignment_cosine_raw_tf_book_variant(b: str, expected: float) -> None:
    # The book's Figs 6.12-6.13 use raw tf of affection, jealous and gossip only.
    raw = {name: [float(tf) for tf in counts[:3]] for name, counts in MRS_COUNTS.items()}
    sims = _aligned_similarity([raw["SaS"]], [raw[b]])
    assert sims == [pytest.approx(expected, abs=5e-4)]


def test_alignment_two_to_one_cosine_uses_the_summed_vector() -> None:
    # SaS split into two passages whose rows sum to SaS: the merged pair's cosine must be
    # cos(SaS, PaP) = 0.9421 (MRS §6.3), which needs |a+b|² = |a|² + |b|² + 2·a·b.
    sas = _log_weights(MRS_COUNTS["SaS"])
    first = [sas[0], 0.0, 0.0, 0.0]
    second = [0.0, sas[1], sas[2], 0.0]
    result = align(
        SparseRows.from_dense([first, second]),
        SparseRows.from_dense([_log_weights(MRS_COUNTS["PaP"])]),
        ["first half", "second half"],
        ["whole"],
    )
    assert len(result.pairs) == 1
    assert result.pairs[0].left == (0, 1)
    assert result.pairs[0].right == (0,)
    assert result.pairs[0].similarity == pytest.approx(0.9421, abs=5e-4)


# --- (c) the terms of a passage -------------------------------------------------------------


def test_passage_terms_lemmatised_unigrams_and_bigrams() -> None:
    # "The" and "were" are spaCy English stop words; the lemmas are those of spaCy's English
    # lookup table (spacy-lookups-data, lemma_lookup): riders->rider, pumping->pump,
    # tyres->tyre. Bigrams pair adjacent content lemmas.
    (item,) = _analysis("The riders were pumping tyres.").blocks
    assert passage_terms(item) == ["rider", "pump", "tyre", "rider pump", "pump tyre"]


def test_passage_terms_bigrams_stay_within_a_sentence() -> None:
    (item,) = _analysis("Riders pump tyres. Valves leak air.").blocks
    terms = passage_terms(item)
    assert terms == [
        "rider", "pump", "tyre", "rider pump", "pump tyre",
        "valve", "leak", "air", "valve leak", "leak air",
    ]  # fmt: skip
    assert "tyre valve" not in terms


def test_passage_terms_skip_numbers_and_single_letters() -> None:
    # Only alphabetic tokens longer than one letter are terms (key_terms docstring).
    (item,) = _analysis("Fit 3 new x tubes.").blocks
    assert passage_terms(item) == ["fit", "new", "tube", "fit new", "new tube"]


# --- (d) key terms of a profile -------------------------------------------------------------


def _expected_weights(term_lists: list[list[str]]) -> dict[str, float]:
    """Sum over passages of l2-normalised tf·idf, idf smoothed (sklearn docstring)."""
    n = len(term_lists)
    vocabulary = sorted({term for terms in term_lists for term in terms})
    df = {t: sum(1 for terms in term_lists if t in terms) for t in vocabulary}
    idf = {t: math.log((1 + n) / (1 + df[t])) + 1 for t in vocabulary}
    totals = dict.fromkeys(vocabulary, 0.0)
    for terms in term_lists:
        row = {t: terms.count(t) * idf[t] for t in set(terms)}
        norm = math.sqrt(sum(v * v for v in row.values()))
        for t, v in row.items():
            totals[t] += v / norm
    return totals


def test_profile_key_terms_weights_and_ranking() -> None:
    # "compost" recurs in every passage; every other word occurs once.
    analysis = _analysis(
        "Compost heaps. Turn compost weekly.", "Compost needs air.", "Compost worms."
    )
    profile = measure(analysis, Settings(key_terms=100))
    key_terms = profile.get("key_terms")
    assert key_terms is not None
    term_lists = [list(unit.terms) for unit in passages(analysis)]
    expected = _expected_weights(term_lists)
    total = sum(expected.values())
    assert key_terms.value == len(expected)  # the value is the vocabulary size
    assert key_terms.items[0][0] == "compost"
    # With every term listed the shares sum to 1 and equal weight / total weight.
    assert sum(weight for _, weight in key_terms.items) == pytest.approx(1.0, abs=1e-12)
    assert dict(key_terms.items) == pytest.approx(
        {t: w / total for t, w in expected.items()}, abs=1e-12
    )
    # Ranked heaviest first, ties alphabetically.
    ranked = sorted(expected.items(), key=lambda item: (-round(item[1], 12), item[0]))
    assert [t for t, _ in key_terms.items] == [t for t, _ in ranked]


def test_profile_key_terms_count_limits_the_listing() -> None:
    analysis = _analysis("Compost heaps. Turn compost weekly.", "Compost needs air.")
    top = measure(analysis, Settings(key_terms=2)).get("key_terms")
    assert top is not None
    assert len(top.items) == 2
    assert top.items[0][0] == "compost"
    # Shares are of the whole vocabulary's weight, so two terms sum to less than 1.
    assert sum(weight for _, weight in top.items) < 1.0


def test_term_weights_sum_rows() -> None:
    matrix, vocabulary = fit_tfidf([["tube", "tube"], ["tube", "patch"]])
    weights = term_weights(matrix, [0, 1], vocabulary)
    # Row 0 is [1, 0] after l2 normalisation (only tube); row 1 holds patch and tube with
    # idf ln(3/2)+1 and 1 (n = 2): tube's share of its norm is 1/sqrt(1 + idf_patch²).
    idf_patch = math.log(3 / 2) + 1
    norm = math.sqrt(1 + idf_patch**2)
    assert weights["tube"] == pytest.approx(1 + 1 / norm, abs=1e-12)
    assert weights["patch"] == pytest.approx(idf_patch / norm, abs=1e-12)
    assert term_weights(matrix, [], vocabulary) == {}


def test_a_whole_table_is_one_passage() -> None:
    # key_terms docstring: a prose block, or a whole table (its cells in order), is a passage.
    builder = DocumentBuilder("lesson.md", "markdown")
    builder.add_block(BlockKind.PARAGRAPH, "Check the valve.")
    table = builder.new_group()
    for cell in ("Valve", "Pressure", "Presta", "Seven bar"):
        builder.add_block(BlockKind.TABLE_CELL, cell, group=table)
    units = passages(analyze(builder.build()))
    assert [unit.text for unit in units] == ["Check the valve.", "Valve Pressure Presta Seven bar"]
    # Cells are separate blocks, so a bigram never joins two cells ("presta seven" is absent).
    assert units[1].terms == ("valve", "pressure", "presta", "seven", "bar", "seven bar")
