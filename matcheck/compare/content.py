"""Content: is the same thing taught, in the same places? Two mechanisms, both located.

1. *Key-term coverage.* One TF-IDF model is fitted over the passages of all versions
   together. For each pair, each version's key terms (its ``key_terms`` heaviest) are
   looked up in the other; the share of their weight found there is that version's coverage,
   and the missing terms are named, heaviest first, with the passage where they weigh most.
2. *Passage alignment* (:mod:`matcheck.compare.alignment`): every passage without a
   counterpart (removed or added), with a weak one (rewritten), or out of order (moved) is
   reported with its location and an excerpt. Inside paired passages, runs of words that one
   version adds or drops are kept as evidence for the length findings.
"""

from __future__ import annotations

import heapq
from collections.abc import Sequence
from dataclasses import dataclass
from typing import TYPE_CHECKING

from matcheck.compare import edits as word_edits
from matcheck.compare.alignment import Alignment, align
from matcheck.compare.wordiff import word_opcodes
from matcheck.findings import Evidence, EvidenceKind
from matcheck.language.analysis import Analysis
from matcheck.measures.key_terms import Passage, fit_tfidf, passages, term_weights
from matcheck.settings import DEFAULT_COMPARISON, ComparisonSettings

if TYPE_CHECKING:
    from matcheck.measures.sparse import SparseRows

# The thresholds of the content comparison (key terms, novelty of a cut run, run length) are
# ComparisonSettings (matcheck/settings.py), where each default has its reason.
MISSING_SHOWN = 10
EXCERPT_WORDS = 25


@dataclass(frozen=True, slots=True)
class VersionText:
    name: str
    passages: tuple[Passage, ...]
    rows: range


@dataclass(frozen=True, slots=True)
class ContentModel:
    """The shared TF-IDF model of all versions' passages."""

    versions: dict[str, VersionText]
    raw: SparseRows
    normalized: SparseRows
    vocabulary: list[str]

    def rows(self, name: str) -> SparseRows:
        return self.raw.rows(self.versions[name].rows.start, self.versions[name].rows.stop)


@dataclass(frozen=True, slots=True)
class Coverage:
    share: float
    missing: tuple[Evidence, ...]


@dataclass(frozen=True, slots=True)
class PairContent:
    """The content comparison of one version with the reference."""

    coverage_of_reference: Coverage  # share of the reference's key terms the version carries
    coverage_of_version: Coverage  # share of the version's key terms the reference carries
    alignment: Alignment
    removed: tuple[Evidence, ...]
    added: tuple[Evidence, ...]
    rewritten: tuple[Evidence, ...]
    moved: tuple[Evidence, ...]
    edits: tuple[Evidence, ...]
    novel_share: float = DEFAULT_COMPARISON.novel_share
    # The word-level comparison (matcheck.compare.edits): changed facts, reworded passages.
    facts: tuple[Evidence, ...] = ()
    reworded: tuple[Evidence, ...] = ()
    compared: tuple[word_edits.PairEdits, ...] = ()
    reference_words: int = 0

    @property
    def reworded_words(self) -> int:
        """Content words substituted, added or cut by reworded edits, in every passage."""
        return sum(found.reworded_words for found in self.compared if not found.rewritten)

    def describe_rewording(self) -> str:
        """The rewording as a share of the lesson's words (the reference's), and the cosmetic
        edits counted for information."""
        share = self.reworded_words / self.reference_words if self.reference_words else 0.0
        words = "word" if self.reworded_words == 1 else "words"
        edits = "edit" if self.cosmetic_edits == 1 else "edits"
        return (
            f"{self.reworded_words} content {words} reworded, {share:.1%} of the lesson's "
            f"words; {self.cosmetic_edits} cosmetic {edits} ignored"
        )

    @property
    def cosmetic_edits(self) -> int:
        """Edits that change nothing a learner reads differently (counted, never judged)."""
        return sum(found.cosmetic for found in self.compared)

    @property
    def text_lost(self) -> tuple[Evidence, ...]:
        """Runs dropped inside paired passages whose content the version lacks elsewhere."""
        return tuple(
            e
            for e in self.edits
            if e.kind is EvidenceKind.TEXT_REMOVED and (e.weight or 0) >= self.novel_share
        )

    @property
    def text_new(self) -> tuple[Evidence, ...]:
        """Runs added inside paired passages with content the reference lacks."""
        return tuple(
            e
            for e in self.edits
            if e.kind is EvidenceKind.TEXT_ADDED and (e.weight or 0) >= self.novel_share
        )


def build_model(analyses: dict[str, Analysis]) -> ContentModel:
    versions: dict[str, VersionText] = {}
    term_lists: list[list[str]] = []
    for name, analysis in analyses.items():
        units = passages(analysis)
        start = len(term_lists)
        term_lists.extend(list(unit.terms) for unit in units)
        versions[name] = VersionText(name, units, range(start, len(term_lists)))
    if not any(term_lists):
        term_lists = [["\u2400"]] * max(1, len(term_lists))  # an empty vocabulary breaks TF-IDF
    from matcheck.measures.tfidf import l2_normalize as normalize

    raw, vocabulary = fit_tfidf(term_lists, normalized=False)
    return ContentModel(versions, raw, normalize(raw), vocabulary)


def excerpt(text: str, words: int = EXCERPT_WORDS) -> str:
    parts = text.split()
    return " ".join(parts[:words]) + (" …" if len(parts) > words else "")


def _key_terms(model: ContentModel, name: str, count: int) -> list[tuple[str, float]]:
    """A version's ``count`` heaviest single terms and their weights."""
    weights = term_weights(model.normalized, model.versions[name].rows, model.vocabulary)
    unigrams = ((term, weight) for term, weight in weights.items() if " " not in term)
    # The same as sorted(...)[:count] (heapq documents it), without sorting every term.
    return heapq.nsmallest(count, unigrams, key=lambda item: (-item[1], item[0]))


def _coverage(model: ContentModel, source: str, target: str, key_terms: int) -> Coverage:
    import numpy as np

    src = model.versions[source]
    # Coverage counts single terms: a bigram disappears whenever either neighbour changes
    # ("wait thirty seconds" -> "wait half a minute" loses three), which is rewording, not
    # content; the bigrams still weigh in the TF-IDF model and the passage alignment.
    key = _key_terms(model, source, key_terms)
    total = sum(weight for _, weight in key)
    if not total:
        return Coverage(1.0, ())
    target_rows = model.versions[target].rows
    present_columns = set(
        np.flatnonzero(
            model.raw.rows(target_rows.start, target_rows.stop).column_totals()
        ).tolist()
    )
    index = {term: i for i, term in enumerate(model.vocabulary)}
    missing = [(term, weight) for term, weight in key if index[term] not in present_columns]
    share = 1.0 - sum(weight for _, weight in missing) / total
    evidence = []
    block = model.normalized.rows(src.rows.start, src.rows.stop)
    for term, weight in missing[:MISSING_SHOWN]:
        column = block.column(index[term])
        where = src.passages[int(column.argmax())]
        evidence.append(
            Evidence(
                kind=EvidenceKind.TERM_MISSING,
                condition=source,
                text=term,
                location=where.location,
                weight=weight / total,
                counterpart_text=f"not found in {target}",
            )
        )
    return Coverage(share, tuple(evidence))


def compare_content(
    model: ContentModel,
    reference: str,
    version: str,
    settings: ComparisonSettings = DEFAULT_COMPARISON,
) -> PairContent:
    ref, other = model.versions[reference], model.versions[version]
    alignment = align(
        model.rows(reference),
        model.rows(version),
        [item.text for item in ref.passages],
        [item.text for item in other.passages],
        threshold=settings.pair_threshold,
        strong=settings.rewritten_below,
    )

    def passage_evidence(kind: EvidenceKind, name: str, item: Passage, **extra: object) -> Evidence:
        return Evidence(
            kind=kind,
            condition=name,
            text=excerpt(item.text),
            location=item.location,
            **extra,  # type: ignore[arg-type]
        )

    removed = tuple(
        passage_evidence(EvidenceKind.PASSAGE_REMOVED, reference, ref.passages[i])
        for i in alignment.removed
    )
    added = tuple(
        passage_evidence(EvidenceKind.PASSAGE_ADDED, version, other.passages[j])
        for j in alignment.added
    )
    key_terms = frozenset(
        term
        for name in (reference, version)
        for term, _ in _key_terms(model, name, settings.key_terms)
    )
    ref_vocabulary, other_vocabulary = _vocabulary(ref), _vocabulary(other)

    def reported(run: list[str], removed: bool) -> bool:  # as text_removed or text_added
        vocabulary = other_vocabulary if removed else ref_vocabulary
        return novelty(run, vocabulary, settings.min_novel_terms) >= settings.novel_share

    compared = word_edits.compare_pairs(
        alignment, ref.passages, other.passages, key_terms, reported, settings.min_run_words
    )
    rewritten = tuple(
        word_edits.changes_evidence(found, EvidenceKind.PASSAGE_REWRITTEN, reference)
        for found in compared
        if found.rewritten
    )
    reworded = tuple(
        word_edits.changes_evidence(
            found, EvidenceKind.TEXT_REWORDED, reference, only=word_edits.EditClass.REWORDED
        )
        for found in compared
        if found.reworded
    )
    facts = tuple(e for found in compared for e in word_edits.fact_evidence(found, reference))
    moved = tuple(
        passage_evidence(
            EvidenceKind.PASSAGE_MOVED,
            reference,
            ref.passages[pair.left[0]],
            similarity=pair.similarity,
            counterpart=other.passages[pair.right[0]].location,
            counterpart_text=excerpt(other.passages[pair.right[0]].text),
        )
        for pair in alignment.moved
    )
    edits = tuple(_edits(alignment, ref, other, settings))
    return PairContent(
        coverage_of_reference=_coverage(model, reference, version, settings.key_terms),
        coverage_of_version=_coverage(model, version, reference, settings.key_terms),
        alignment=alignment,
        removed=removed,
        added=added,
        rewritten=rewritten,
        moved=moved,
        edits=edits,
        novel_share=settings.novel_share,
        facts=facts,
        reworded=reworded,
        compared=tuple(compared),
        reference_words=sum(len(item.words) for item in ref.passages),
    )


def content_terms(words: Sequence[str]) -> set[str]:
    from matcheck.language.pipeline import lemma, stop_words

    stops = stop_words()
    terms = set()
    for word in words:
        if word.isalpha() and len(word) > 1 and word not in stops:
            term = lemma(word)
            if term not in stops:
                terms.add(term)
    return terms


def _vocabulary(version: VersionText) -> set[str]:
    return {term for passage in version.passages for term in passage.terms if " " not in term}


def novelty(
    run: Sequence[str],
    other_vocabulary: set[str],
    min_novel_terms: int = DEFAULT_COMPARISON.min_novel_terms,
) -> float:
    """Share of a run's distinct content terms that the other version never uses: how much of
    what the run says is lost, or new. 0 when fewer than ``min_novel_terms`` terms are new
    (a reworded phrase, "about twenty minutes" -> "roughly a third of an hour", is not content).
    """
    terms = content_terms(run)
    novel = terms - other_vocabulary
    if len(novel) < min_novel_terms:
        return 0.0
    return len(novel) / len(terms)


def _edits(
    alignment: Alignment, ref: VersionText, other: VersionText, settings: ComparisonSettings
) -> list[Evidence]:
    """Runs of words added or dropped inside passages that otherwise correspond.

    ``weight`` is the run's :func:`novelty` against the other version: a restated sentence
    scores near 0, a sentence with content found nowhere else in the other version near 1.
    """
    evidence: list[Evidence] = []
    ref_vocabulary, other_vocabulary = _vocabulary(ref), _vocabulary(other)
    for pair in alignment.pairs:
        left = [w for i in pair.left for w in ref.passages[i].words]
        right = [w for j in pair.right for w in other.passages[j].words]
        a = [w.lower for w in left]
        b = [w.lower for w in right]
        if a == b:
            continue
        for tag, i1, i2, j1, j2 in word_opcodes(a, b):
            if tag in ("delete", "replace") and i2 - i1 >= settings.min_run_words:
                evidence.append(
                    Evidence(
                        kind=EvidenceKind.TEXT_REMOVED,
                        condition=ref.name,
                        text=excerpt(" ".join(w.text for w in left[i1:i2])),
                        location=ref.passages[pair.left[0]].location,
                        weight=novelty(a[i1:i2], other_vocabulary, settings.min_novel_terms),
                        counterpart=other.passages[pair.right[0]].location,
                    )
                )
            if tag in ("insert", "replace") and j2 - j1 >= settings.min_run_words:
                evidence.append(
                    Evidence(
                        kind=EvidenceKind.TEXT_ADDED,
                        condition=other.name,
                        text=excerpt(" ".join(w.text for w in right[j1:j2])),
                        location=other.passages[pair.right[0]].location,
                        weight=novelty(b[j1:j2], ref_vocabulary, settings.min_novel_terms),
                        counterpart=ref.passages[pair.left[0]].location,
                    )
                )
    return evidence
