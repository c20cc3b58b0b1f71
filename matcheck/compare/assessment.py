"""Post-test coverage: does each condition teach what each post-test item asks for?

An item needs its *terms*: the content lemmas of its question and answer, by the same rules
as the lesson text (:mod:`matcheck.language.analysis`: alphabetic words of two letters or more,
spaCy stop words left out). Each term is weighted by its smoothed inverse document frequency
over the passages of all conditions together, as scikit-learn's ``TfidfVectorizer`` computes it
by default (``smooth_idf=True``)::

    idf(t) = ln((1 + n) / (1 + df(t))) + 1

with ``n`` passages in all and ``df(t)`` of them holding ``t``, so that a word the whole lesson
uses (``tyre`` in a lesson on tyres) weighs less than the distinctive words an item needs.
Terms of the answer count double (whether or not the question has them too): the answer is
what the lesson must teach, while the question's words often only name the topic, which a
lesson can mention without teaching it. This is a judgment call.

A condition's coverage of an item is the best, over every window of one passage or two
adjacent passages, of the weight of the item's distinct terms the window holds over the
weight of all of them (two passages, because an explanation may run over a paragraph break).
The item is *taught* when its coverage reaches the threshold, :data:`DEFAULT_COVERAGE` unless
the study sets another: a judgment call (common practice for keyword matching, not a
published value), meaning most of what the item needs, weighted, is said in one place.

For every compared pair, an item taught in exactly one of the two conditions differs; the
evidence locates the covering passage in the one (``item_taught``) and, in the other, the
best partial window with the terms it lacks (``item_not_taught``). Evidence ``weight`` is the
window's coverage. An item taught in no condition is a warning: the test asks for what no
version teaches.
"""

from __future__ import annotations

import math
import re
from collections import Counter
from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass

from matcheck.compare import itemfacts
from matcheck.compare.content import EXCERPT_WORDS, content_terms, excerpt
from matcheck.compare.decide import Observation, decide
from matcheck.errors import ConfigError
from matcheck.findings import Evidence, EvidenceKind, Finding, Tolerance
from matcheck.language.analysis import Analysis
from matcheck.measures.comparisons import ITEM_COVERAGE
from matcheck.measures.key_terms import Passage, passages
from matcheck.model import Location, PostTestItem
from matcheck.settings import DEFAULT_COMPARISON

DEFAULT_COVERAGE = DEFAULT_COMPARISON.coverage_threshold
# Answer terms weigh this many times a question-only term (judgment call, see above).
ANSWER_FACTOR = DEFAULT_COMPARISON.answer_factor
# Words of the question shown in a warning.
QUESTION_EXCERPT_WORDS = 12


@dataclass(frozen=True, slots=True)
class ItemTerms:
    """The distinct terms one item needs and the factor each counts with."""

    item: PostTestItem
    factors: dict[str, float]


@dataclass(frozen=True, slots=True)
class Coverage:
    """One condition's best window for one item."""

    share: float
    present: frozenset[str]
    passage: Passage | None

    @property
    def location(self) -> Location | None:
        return None if self.passage is None else self.passage.location


def smoothed_idf(n_documents: int, document_frequency: int) -> float:
    """scikit-learn's default idf: ``ln((1 + n) / (1 + df)) + 1``."""
    return math.log((1 + n_documents) / (1 + document_frequency)) + 1.0


def item_terms(
    items: Sequence[PostTestItem],
    analysis: Analysis,
    slots: Sequence[tuple[int | None, int | None]],
    answer_factor: float = ANSWER_FACTOR,
) -> list[ItemTerms]:
    """Each item's content lemmas, from the analysis of the items' own document (its
    question and answer blocks at ``slots``), made by the same pipeline as the lessons'."""
    result = []
    for item, (question_at, answer_at) in zip(items, slots, strict=True):
        factors: dict[str, float] = {}
        if question_at is not None:
            factors.update(dict.fromkeys(analysis.blocks[question_at].terms, 1.0))
        factors.update(dict.fromkeys(itemfacts.text_facts(item.question), 1.0))
        if answer_at is not None:
            factors.update(dict.fromkeys(analysis.blocks[answer_at].terms, answer_factor))
        factors.update(dict.fromkeys(itemfacts.text_facts(item.answer), answer_factor))
        result.append(ItemTerms(item, factors))
    return result


def unigrams(passage: Passage) -> frozenset[str]:
    """A passage's content lemmas (its bigrams left out: an item needs words, not phrases) and
    its fact terms (numbers and units, :mod:`matcheck.compare.itemfacts`)."""
    lemmas = frozenset(term for term in passage.terms if " " not in term)
    return lemmas | itemfacts.passage_facts(passage)


def coverage(terms: ItemTerms, units: Sequence[Passage], weights: Mapping[str, float]) -> Coverage:
    """The best window of one or two adjacent passages for ``terms`` (first best wins)."""
    needed = {term: weights[term] * factor for term, factor in terms.factors.items()}
    # fsum: a sum that does not depend on the (hash-seeded) order of a set's terms.
    total = math.fsum(needed.values())
    best = Coverage(0.0, frozenset(), None)
    sets = [unigrams(unit) & needed.keys() for unit in units]
    windows = [(i,) for i in range(len(units))] + [(i, i + 1) for i in range(len(units) - 1)]
    # Reading order, single passages before pairs at the same start, for a stable choice.
    windows.sort()
    for window in windows:
        present = frozenset().union(*(sets[i] for i in window))
        share = math.fsum(needed[term] for term in present) / total if total else 0.0
        if share > best.share:
            # Point at the passage of the window that holds most of the weight.
            main = max(window, key=lambda i: (math.fsum(needed[t] for t in sets[i]), -i))
            best = Coverage(share, present, units[main])
    return best


@dataclass(frozen=True, slots=True)
class PostTest:
    """The study's post-test items, with the analysis of their text (made by the caller with
    :func:`matcheck.readers.posttest.items_document` and the language pass) and where each
    item's question and answer are in it."""

    items: tuple[PostTestItem, ...]
    analysis: Analysis
    slots: tuple[tuple[int | None, int | None], ...]


def assess_posttest(
    posttest: PostTest,
    analyses: Mapping[str, Analysis],
    pairs: Sequence[tuple[str, str]],
    *,
    threshold: float | None = None,
    answer_factor: float = ANSWER_FACTOR,
    tolerances: Mapping[str, Tolerance] | None = None,
) -> tuple[tuple[Finding, ...], tuple[str, ...]]:
    """Findings (group ``assessment``) for every item and pair, and the study's warnings."""
    limit = DEFAULT_COVERAGE if threshold is None else threshold
    if not 0 < limit <= 1:
        raise ConfigError(f"the post-test coverage threshold must be in (0, 1], not {limit:g}")
    units = {name: passages(analysis) for name, analysis in analyses.items()}
    every = [unigrams(unit) for name in units for unit in units[name]]
    frequency = Counter(term for terms in every for term in terms)
    items = posttest.items
    tolerances = tolerances or {}
    needed = item_terms(items, posttest.analysis, posttest.slots, answer_factor)
    warnings: list[str] = []
    covered: dict[tuple[str, str], Coverage] = {}
    assessed: list[ItemTerms] = []
    weighted: dict[str, dict[str, float]] = {}
    raw: dict[str, dict[str, float]] = {}
    _check_ids(items)
    for terms in needed:
        item = terms.item
        if not terms.factors:
            warnings.append(
                f"post-test item {item.id} ({excerpt(item.question, QUESTION_EXCERPT_WORDS)}) "
                "has no content words to look for in the lessons"
            )
            continue
        weights = {t: smoothed_idf(len(every), frequency[t]) for t in terms.factors}
        weighted[item.id] = {t: weights[t] * f for t, f in terms.factors.items()}
        raw[item.id] = weights
        for name in units:
            covered[item.id, name] = coverage(terms, units[name], weights)
        assessed.append(terms)
        if not any(covered[item.id, name].share >= limit for name in units):
            warnings.append(
                f"post-test item {item.id} ({excerpt(item.question, QUESTION_EXCERPT_WORDS)}) "
                "is taught in no condition: the test asks for what no version teaches"
            )

    def near(terms: ItemTerms, name: str, section: str | None) -> Location | None:
        """Where ``name`` would teach the item: its best window in the section (same heading)
        that teaches it in the other version, or that section's start; ``None`` if it has no
        such section. A version that lost the teaching passage is then pointed at the gap,
        not at whichever early passage happens to share a few of the item's words."""
        inside = [unit for unit in units[name] if unit.location.section == section]
        if section is None or not inside:
            return None
        return coverage(terms, inside, raw[terms.item.id]).location or inside[0].location

    observed = [
        _observe(
            terms, reference, condition, covered, weighted[terms.item.id], limit, tolerances, near
        )
        for reference, condition in pairs
        for terms in assessed
    ]
    return tuple(decide(observed, {})), tuple(warnings)


def _check_ids(items: Sequence[PostTestItem]) -> None:
    """Item ids name findings, so two files of one study must not share one."""
    sources: dict[str, str] = {}
    for item in items:
        if item.id in sources:
            raise ConfigError(
                f"post-test item id {item.id!r} is used twice ({sources[item.id]} and "
                f"{item.source}); give each item of the study its own id"
            )
        sources[item.id] = item.source


def _observe(
    terms: ItemTerms,
    reference: str,
    condition: str,
    covered: Mapping[tuple[str, str], Coverage],
    weights: Mapping[str, float],
    limit: float,
    tolerances: Mapping[str, Tolerance],
    near: Callable[[ItemTerms, str, str | None], Location | None] | None = None,
) -> Observation:
    item = terms.item
    ref, cond = covered[item.id, reference], covered[item.id, condition]
    taught = {reference: ref.share >= limit, condition: cond.share >= limit}
    spec = ITEM_COVERAGE
    tolerance = tolerances.get(spec.id, spec.tolerance)
    change = cond.share - ref.share
    evidence: tuple[Evidence, ...] = ()
    beyond = ""
    mismatch = taught[reference] != taught[condition]
    facts = frozenset(t for t in terms.factors if t.startswith(itemfacts.PREFIX))
    restated = (
        taught[reference]
        and taught[condition]
        and itemfacts.stated_differently(facts, ref.present, cond.present)
    )
    if restated and not mismatch:  # the more specific reason: which facts each states
        beyond, evidence = _taught_differently(item.id, facts, reference, ref, condition, cond)
    elif mismatch or abs(change) > tolerance.allowed(0.0):
        more, less = (reference, condition) if ref.share >= cond.share else (condition, reference)
        good, weak = covered[item.id, more], covered[item.id, less]
        if mismatch:
            beyond = f"{item.id} is taught in {more} but not in {less}"
        else:
            beyond = (
                f"{item.id} is covered {good.share:.0%} in {more} but {weak.share:.0%} in "
                f"{less}: taught differently"
            )
        # Heaviest first: the distinctive words the weaker condition lacks.
        missing = sorted(terms.factors.keys() - weak.present, key=lambda t: (-weights[t], t))
        missing = [itemfacts.label(term) for term in missing]
        assert good.passage is not None  # the better window holds some of the terms
        section = good.passage.location.section
        place = (near(terms, less, section) if near else None) or weak.location
        evidence = (
            Evidence(
                kind=EvidenceKind.ITEM_TAUGHT,
                condition=more,
                text=teaching_sentences(good.passage.text, weights),
                location=good.location,
                weight=good.share,
                counterpart=place,
            ),
            Evidence(
                kind=EvidenceKind.ITEM_NOT_TAUGHT if mismatch else EvidenceKind.ITEM_COVERED_LESS,
                condition=less,
                text=item.question,
                location=place,
                weight=weak.share,
                counterpart=good.location,
                counterpart_text=f"missing: {', '.join(missing)}",
            ),
        )
    return Observation(
        spec=spec,
        reference=reference,
        condition=condition,
        values={reference: ref.share, condition: cond.share},
        difference=change,
        # Taught in one condition only, or its facts stated differently, is beyond any
        # tolerance; else the change of coverage.
        amount=math.inf if mismatch or restated else change,
        tolerance=tolerance,
        evidence=evidence,
        item=item.id,
        beyond=beyond,
        within="taught in both" if taught[reference] else "taught in neither",
    )


_WORD = re.compile(r"[a-z]+")
_SENTENCE_END = re.compile(r"(?<=[.!?])\s+(?=[A-Z0-9“\"(])")


def teaching_sentences(text: str, weights: Mapping[str, float], most: int = 2) -> str:
    """The sentences of ``text`` that carry most of an item's weighted terms, in reading
    order (at most ``most``): what a reader checks, rather than the passage's first words.

    Sentences are split at a full stop, question or exclamation mark followed by a capital or
    a digit; the split only chooses the excerpt, it is not counted anywhere.
    """
    sentences = _SENTENCE_END.split(text.strip())
    scored = [
        (sum(weights.get(term, 0.0) for term in content_terms(_WORD.findall(s.lower()))), index)
        for index, s in enumerate(sentences)
    ]
    ranked = sorted(scored, key=lambda pair: (-pair[0], pair[1]))[:most]
    best = sorted(index for score, index in ranked if score > 0)
    chosen = " … ".join(sentences[i] for i in best) if best else text
    return excerpt(chosen, 2 * EXCERPT_WORDS)


def _taught_differently(
    item_id: str,
    facts: frozenset[str],
    reference: str,
    ref: Coverage,
    condition: str,
    cond: Coverage,
) -> tuple[str, tuple[Evidence, ...]]:
    """Both conditions teach the item, but state its numbers or units differently."""

    def stated(coverage: Coverage) -> str:
        found = sorted(itemfacts.label(t) for t in facts & coverage.present)
        return ", ".join(found) or "none of them"

    wanted = ", ".join(sorted(itemfacts.label(t) for t in facts))
    reason = (
        f"{item_id} is taught differently: of its facts ({wanted}) {reference} states "
        f"{stated(ref)}, {condition} {stated(cond)}"
    )
    text_ref, _ = itemfacts.fact_excerpt([ref.passage] if ref.passage else [], facts)
    text_cond, _ = itemfacts.fact_excerpt([cond.passage] if cond.passage else [], facts)
    evidence = Evidence(
        kind=EvidenceKind.ITEM_TAUGHT_DIFFERENTLY,
        condition=reference,
        text=text_ref or (excerpt(ref.passage.text) if ref.passage else ""),
        location=ref.location,
        weight=ref.share,
        counterpart=cond.location,
        counterpart_text=text_cond or (excerpt(cond.passage.text) if cond.passage else ""),
    )
    return reason, (evidence,)
