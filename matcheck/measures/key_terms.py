"""Key terms: what a lesson is about, by TF-IDF over its passages.

Terms are lemmatised content words (spaCy stop words removed) and the bigrams of adjacent
content words within a sentence. Each passage (a prose block, or a whole table) is one document of
the TF-IDF model (computed as scikit-learn's ``TfidfVectorizer`` does, by
:mod:`matcheck.measures.tfidf`: smoothed idf, l2-normalised rows); a
term's weight in a version is the sum of its tf-idf over the version's passages, so a term
that recurs across passages weighs more than one mentioned once.
"""

from __future__ import annotations

from collections.abc import Iterator, Sequence
from dataclasses import dataclass
from itertools import pairwise
from typing import TYPE_CHECKING

from matcheck.language.analysis import PASSAGE_KINDS, Analysis, BlockAnalysis
from matcheck.language.words import Word
from matcheck.measures.base import Group, Measurement, MeasureSpec, Role
from matcheck.model import BlockKind, Location
from matcheck.settings import Settings

if TYPE_CHECKING:
    from matcheck.measures.sparse import SparseRows

KEY_TERMS = MeasureSpec(
    "key_terms",
    Group.CONTENT,
    "terms",
    "Key terms by TF-IDF over the lesson's passages",
    role=Role.LISTING,
    listing="weight",
)
SPECS = (KEY_TERMS,)


@dataclass(frozen=True, slots=True)
class Passage:
    """A unit of content: one prose block, or one whole table (its cells in order).

    A table is one passage because formats disagree about its cells: a PDF gives a table's
    text back as lines, not cells, and a cell of two words says little on its own.
    """

    text: str
    location: Location
    words: tuple[Word, ...]
    terms: tuple[str, ...]


def passage_terms(item: BlockAnalysis) -> list[str]:
    """Unigrams and within-sentence bigrams of one block's content lemmas."""
    terms: list[str] = []
    for sentence in item.sentences:
        lemmas = sentence.terms
        terms.extend(lemmas)
        terms.extend(f"{a} {b}" for a, b in pairwise(lemmas))
    return terms


def passages(analysis: Analysis, *, code: bool = True) -> tuple[Passage, ...]:
    """The passages of a version in reading order (prose blocks, whole tables, code blocks).

    A code block is one passage, like a table; ``code=False`` leaves code out (key terms are
    what the prose is about).
    """
    kinds = PASSAGE_KINDS | {BlockKind.CODE} if code else PASSAGE_KINDS
    units: list[Passage] = []
    table: list[BlockAnalysis] = []

    def close_table() -> None:
        if table:
            units.append(
                Passage(
                    " ".join(item.block.text for item in table),
                    table[0].block.location,
                    tuple(word for item in table for word in item.words),
                    tuple(term for item in table for term in passage_terms(item)),
                )
            )
            table.clear()

    for item in analysis.of(kinds):
        kind = item.block.kind
        if kind in (BlockKind.TABLE_CELL, BlockKind.CODE):
            first = table[0].block if table else None
            if first is not None and (first.group, first.kind) != (item.block.group, kind):
                close_table()
            table.append(item)
            continue
        close_table()
        if item.words:
            units.append(
                Passage(
                    item.block.text, item.block.location, item.words, tuple(passage_terms(item))
                )
            )
    close_table()
    return tuple(units)


def fit_tfidf(
    term_lists: Sequence[list[str]], *, normalized: bool = True
) -> tuple[SparseRows, list[str]]:
    """Fit TF-IDF over pre-tokenised passages; returns the matrix and the vocabulary.

    ``normalized=False`` keeps raw tf-idf rows, so that the vector of two passages together
    is the sum of their rows (the passage alignment needs that).
    """
    from matcheck.measures.tfidf import fit

    return fit(term_lists, normalized=normalized)


def term_weights(
    matrix: SparseRows, rows: Sequence[int], vocabulary: list[str]
) -> dict[str, float]:
    """Sum of tf-idf per term over the given passage rows."""
    import numpy as np

    if not rows:
        return {}
    totals = matrix.take(rows).column_totals()
    return {vocabulary[i]: float(totals[i]) for i in np.flatnonzero(totals)}


def top_terms(weights: dict[str, float], count: int) -> list[tuple[str, float]]:
    """The ``count`` heaviest terms, weights scaled to sum to 1 over the whole vocabulary."""
    total = sum(weights.values()) or 1.0
    ranked = sorted(weights.items(), key=lambda item: (-item[1], item[0]))[:count]
    return [(term, weight / total) for term, weight in ranked]


def measure_key_terms(analysis: Analysis, settings: Settings) -> Iterator[Measurement]:
    units = passages(analysis, code=False)
    term_lists = [list(unit.terms) for unit in units]
    if not any(term_lists):
        yield Measurement(KEY_TERMS, 0.0, note="no content words")
        return
    matrix, vocabulary = fit_tfidf(term_lists)
    weights = term_weights(matrix, range(len(units)), vocabulary)
    top = top_terms(weights, settings.key_terms)
    yield Measurement(KEY_TERMS, float(len(vocabulary)), items=tuple(top))
