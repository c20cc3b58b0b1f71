"""Content: is the same thing taught, in the same places? Two mechanisms, both located.

1. *Key-term coverage.* One TF-IDF model is fitted over the passages of all versions
   together. For each pair, each version's key terms (its :data:`KEY_TERMS` heaviest) are
   looked up in the other; the share of their weight found there is that version's coverage,
   and the missing terms are named, heaviest first, with the passage where they weigh most.
2. *Passage alignment* (:mod:`matcheck.compare.alignment`): every passage without a
   counterpart (removed or added), with a weak one (rewritten), or out of order (moved) is
   reported with its location and an excerpt. Inside paired passages, runs of words that one
   version adds or drops are kept as evidence for the length findings.
"""

from __future__ import annotations

import difflib
import heapq
from collections.abc import Sequence
from dataclasses import dataclass
from typing import TYPE_CHECKING

from matcheck.compare.alignment import Alignment, align
from matcheck.findings import Evidence, EvidenceKind
from matcheck.language.analysis import Analysis
from matcheck.measures.key_terms import Passage, fit_tfidf, passages, term_weights
from matcheck.settings import DEFAULT_COMPARISON, ComparisonSettings

if TYPE_CHECKING:
    from scipy.sparse import csr_matrix

KEY_TERMS = DEFAULT_COMPARISON.key_terms
MISSING_SHOWN = 10
EXCERPT_WORDS = 25
# A run dropped or added inside paired passages is content when at least this share of its
# distinct content terms appears nowhere in the other version (judgment call): a sentence cut
# with what it taught, not a restatement or a reworded phrase.
NOVEL_SHARE = DEFAULT_COMPARISON.novel_share
# ... and when at least this many of its content terms are new (judgment call): a sentence
# that teaches something names several things; a reworded phrase changes one or two words.
MIN_NOVEL_TERMS = DEFAULT_COMPARISON.min_novel_terms
# Word runs shorter than this inside paired passages are edits, not content (judgment call).
MIN_RUN_WORDS = DEFAULT_COMPARISON.min_run_words
# difflib's matcher is quadratic in the words of a pair; longer pairs (a lesson read as one
# huge block) are first cut at runs of words found once in each (see word_opcodes). Judgment
# call, as is ANCHOR_WORDS.
DIRECT_DIFF_WORDS = 4000
ANCHOR_WORDS = 8
_ANCHOR_DEPTH = 4


@dataclass(frozen=True, slots=True)
class VersionText:
    name: str
    passages: tuple[Passage, ...]
    rows: range


@dataclass(frozen=True, slots=True)
class ContentModel:
    """The shared TF-IDF model of all versions' passages."""

    versions: dict[str, VersionText]
    raw: csr_matrix
    normalized: csr_matrix
    vocabulary: list[str]

    def rows(self, name: str) -> csr_matrix:
        return self.raw[self.versions[name].rows.start : self.versions[name].rows.stop]


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
    novel_share: float = NOVEL_SHARE

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
    from sklearn.preprocessing import normalize

    raw, vocabulary = fit_tfidf(term_lists, normalized=False)
    return ContentModel(versions, raw, normalize(raw).tocsr(), vocabulary)


def excerpt(text: str, words: int = EXCERPT_WORDS) -> str:
    parts = text.split()
    return " ".join(parts[:words]) + (" …" if len(parts) > words else "")


def _coverage(model: ContentModel, source: str, target: str, key_terms: int) -> Coverage:
    import numpy as np

    src = model.versions[source]
    weights = term_weights(model.normalized, src.rows, model.vocabulary)
    # Coverage counts single terms: a bigram disappears whenever either neighbour changes
    # ("wait thirty seconds" -> "wait half a minute" loses three), which is rewording, not
    # content; the bigrams still weigh in the TF-IDF model and the passage alignment.
    unigrams = ((term, weight) for term, weight in weights.items() if " " not in term)
    # The same as sorted(...)[:KEY_TERMS] (heapq documents it), without sorting every term.
    key = heapq.nsmallest(key_terms, unigrams, key=lambda item: (-item[1], item[0]))
    total = sum(weight for _, weight in key)
    if not total:
        return Coverage(1.0, ())
    target_rows = model.versions[target].rows
    present_columns = set(
        np.flatnonzero(
            np.asarray(model.raw[target_rows.start : target_rows.stop].sum(axis=0)).ravel()
        ).tolist()
    )
    index = {term: i for i, term in enumerate(model.vocabulary)}
    missing = [(term, weight) for term, weight in key if index[term] not in present_columns]
    share = 1.0 - sum(weight for _, weight in missing) / total
    evidence = []
    block = model.normalized[src.rows.start : src.rows.stop]
    for term, weight in missing[:MISSING_SHOWN]:
        column = block[:, index[term]].toarray().ravel()
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
    rewritten = tuple(
        passage_evidence(
            EvidenceKind.PASSAGE_REWRITTEN,
            reference,
            ref.passages[pair.left[0]],
            similarity=pair.similarity,
            counterpart=other.passages[pair.right[0]].location,
            counterpart_text=excerpt(" ".join(other.passages[j].text for j in pair.right)),
        )
        for pair in alignment.rewritten
    )
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
    run: Sequence[str], other_vocabulary: set[str], min_novel_terms: int = MIN_NOVEL_TERMS
) -> float:
    """Share of a run's distinct content terms that the other version never uses: how much of
    what the run says is lost, or new. 0 when fewer than :data:`MIN_NOVEL_TERMS` terms are new
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


Opcode = tuple[str, int, int, int, int]


def word_opcodes(a: list[str], b: list[str]) -> list[Opcode]:
    """difflib opcodes turning ``a`` into ``b``, in near-linear time for long sequences.

    Up to :data:`DIRECT_DIFF_WORDS` words in all this is ``SequenceMatcher(autojunk=False)``
    itself. Longer pairs are first cut at anchors, as in patience diff: runs of
    :data:`ANCHOR_WORDS` words that occur exactly once on each side, the longest chain of them
    in the same order on both. The stretches between anchors are diffed the same way (a few
    levels deep); a long stretch still without any anchor is reported as replaced whole.
    """
    out: list[Opcode] = []
    _diff_range(a, b, 0, len(a), 0, len(b), out, depth=0)
    merged: list[Opcode] = []
    for op in out:  # anchors and stretches leave adjacent "equal" runs: join them
        if merged and op[0] == "equal" and merged[-1][0] == "equal":
            last = merged[-1]
            merged[-1] = ("equal", last[1], op[2], last[3], op[4])
        else:
            merged.append(op)
    return merged


def _diff_range(
    a: list[str],
    b: list[str],
    a0: int,
    a1: int,
    b0: int,
    b1: int,
    out: list[Opcode],
    *,
    depth: int,
) -> None:
    if a1 - a0 + b1 - b0 <= DIRECT_DIFF_WORDS or a0 == a1 or b0 == b1:
        if a0 < a1 or b0 < b1:
            matcher = difflib.SequenceMatcher(None, a[a0:a1], b[b0:b1], autojunk=False)
            for tag, i1, i2, j1, j2 in matcher.get_opcodes():
                out.append((tag, a0 + i1, a0 + i2, b0 + j1, b0 + j2))
        return
    anchors = _anchors(a, b, a0, a1, b0, b1) if depth < _ANCHOR_DEPTH else []
    if not anchors:
        out.append(("replace", a0, a1, b0, b1))
        return
    i, j = a0, b0
    for ai, bj in anchors:
        _diff_range(a, b, i, ai, j, bj, out, depth=depth + 1)
        out.append(("equal", ai, ai + ANCHOR_WORDS, bj, bj + ANCHOR_WORDS))
        i, j = ai + ANCHOR_WORDS, bj + ANCHOR_WORDS
    _diff_range(a, b, i, a1, j, b1, out, depth=depth + 1)


def _anchors(
    a: list[str], b: list[str], a0: int, a1: int, b0: int, b1: int
) -> list[tuple[int, int]]:
    """Starts (in a, in b) of word runs unique on both sides, the longest chain in order."""
    from bisect import bisect_left
    from collections import Counter

    k = ANCHOR_WORDS
    grams_a = [tuple(a[i : i + k]) for i in range(a0, a1 - k + 1)]
    grams_b = [tuple(b[j : j + k]) for j in range(b0, b1 - k + 1)]
    count_a, count_b = Counter(grams_a), Counter(grams_b)
    where_b = {gram: b0 + j for j, gram in enumerate(grams_b) if count_b[gram] == 1}
    pairs = [
        (a0 + i, where_b[gram])
        for i, gram in enumerate(grams_a)
        if count_a[gram] == 1 and gram in where_b
    ]
    # Longest increasing chain of b-starts (patience sorting); pairs come in a-order.
    tails: list[int] = []
    tail_at: list[int] = []
    before = [-1] * len(pairs)
    for index, (_, j) in enumerate(pairs):
        slot = bisect_left(tails, j)
        before[index] = tail_at[slot - 1] if slot else -1
        if slot == len(tails):
            tails.append(j)
            tail_at.append(index)
        else:
            tails[slot] = j
            tail_at[slot] = index
    chain: list[tuple[int, int]] = []
    index = tail_at[-1] if tail_at else -1
    while index >= 0:
        chain.append(pairs[index])
        index = before[index]
    chain.reverse()
    kept: list[tuple[int, int]] = []
    for i, j in chain:  # anchors must not overlap
        if not kept or (i >= kept[-1][0] + k and j >= kept[-1][1] + k):
            kept.append((i, j))
    return kept
