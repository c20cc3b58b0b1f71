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
from dataclasses import dataclass
from typing import TYPE_CHECKING

from matcheck.compare.alignment import Alignment, align
from matcheck.findings import Evidence
from matcheck.language.analysis import Analysis
from matcheck.measures.key_terms import Passage, fit_tfidf, passages, term_weights

if TYPE_CHECKING:
    from scipy.sparse import csr_matrix

KEY_TERMS = 30
MISSING_SHOWN = 10
EXCERPT_WORDS = 25
# Word runs shorter than this inside paired passages are edits, not content (judgment call).
MIN_RUN_WORDS = 6


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


def _coverage(model: ContentModel, source: str, target: str) -> Coverage:
    import numpy as np

    src = model.versions[source]
    weights = term_weights(model.normalized, src.rows, model.vocabulary)
    key = sorted(weights.items(), key=lambda item: (-item[1], item[0]))[:KEY_TERMS]
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
                kind="term_missing",
                condition=source,
                text=term,
                location=where.location,
                weight=weight / total,
                counterpart_text=f"not found in {target}",
            )
        )
    return Coverage(share, tuple(evidence))


def compare_content(model: ContentModel, reference: str, version: str) -> PairContent:
    ref, other = model.versions[reference], model.versions[version]
    alignment = align(
        model.rows(reference),
        model.rows(version),
        [item.text for item in ref.passages],
        [item.text for item in other.passages],
    )

    def passage_evidence(kind: str, name: str, item: Passage, **extra: object) -> Evidence:
        return Evidence(
            kind=kind,
            condition=name,
            text=excerpt(item.text),
            location=item.location,
            **extra,  # type: ignore[arg-type]
        )

    removed = tuple(
        passage_evidence("passage_removed", reference, ref.passages[i]) for i in alignment.removed
    )
    added = tuple(
        passage_evidence("passage_added", version, other.passages[j]) for j in alignment.added
    )
    rewritten = tuple(
        passage_evidence(
            "passage_rewritten",
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
            "passage_moved",
            reference,
            ref.passages[pair.left[0]],
            similarity=pair.similarity,
            counterpart=other.passages[pair.right[0]].location,
            counterpart_text=excerpt(other.passages[pair.right[0]].text),
        )
        for pair in alignment.moved
    )
    edits = tuple(_edits(alignment, ref, other))
    return PairContent(
        coverage_of_reference=_coverage(model, reference, version),
        coverage_of_version=_coverage(model, version, reference),
        alignment=alignment,
        removed=removed,
        added=added,
        rewritten=rewritten,
        moved=moved,
        edits=edits,
    )


def _edits(alignment: Alignment, ref: VersionText, other: VersionText) -> list[Evidence]:
    """Runs of words added or dropped inside passages that otherwise correspond."""
    evidence: list[Evidence] = []
    for pair in alignment.pairs:
        left = [w for i in pair.left for w in ref.passages[i].words]
        right = [w for j in pair.right for w in other.passages[j].words]
        a = [w.lower for w in left]
        b = [w.lower for w in right]
        if a == b:
            continue
        matcher = difflib.SequenceMatcher(None, a, b, autojunk=False)
        for tag, i1, i2, j1, j2 in matcher.get_opcodes():
            if tag in ("delete", "replace") and i2 - i1 >= MIN_RUN_WORDS:
                evidence.append(
                    Evidence(
                        kind="text_removed",
                        condition=ref.name,
                        text=excerpt(" ".join(w.text for w in left[i1:i2])),
                        location=ref.passages[pair.left[0]].location,
                        counterpart=other.passages[pair.right[0]].location,
                    )
                )
            if tag in ("insert", "replace") and j2 - j1 >= MIN_RUN_WORDS:
                evidence.append(
                    Evidence(
                        kind="text_added",
                        condition=other.name,
                        text=excerpt(" ".join(w.text for w in right[j1:j2])),
                        location=other.passages[pair.right[0]].location,
                        counterpart=ref.passages[pair.left[0]].location,
                    )
                )
    return evidence
