"""Changes inside aligned passages: each edit a changed fact, rewording or cosmetic.

Every aligned pair of passages, matched ones included, is compared word by word: the words of
both sides are normalised (:func:`matcheck.compare.wordclasses.normalise`: case, quotes,
dashes, British spellings, negative contractions; a number glued to its unit is split) and
aligned with difflib's ``SequenceMatcher`` (autojunk off; long pairs are cut at unique anchors
first, :func:`matcheck.compare.wordiff.word_opcodes`, so the cost stays near-linear). Changed
runs closer than :data:`MERGE_GAP` words are one edit, and each edit is classified:

- a **changed fact** when the numbers (digits, number words, fractions, ordinals), the units,
  the count of negations, the comparatives or directions, or the named or technical terms
  (proper nouns, words with digits, the lesson's key terms) differ between its two sides;
- **cosmetic** when only spacing, hyphenation or an obvious typo differs (a one- or two-letter
  slip in a word that is neither a number nor a key term, whose misspelt form the lessons use
  once);
- **reworded** otherwise, counting its content words (spaCy's stop words left out).

Judgment calls (documented in docs/comparison.md, "Changes inside a passage"): the thresholds
below and the tables of :mod:`matcheck.compare.wordclasses`.
"""

from __future__ import annotations

import re
from collections import Counter
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from enum import StrEnum

from matcheck.compare.alignment import STRONG, Alignment, Pair
from matcheck.compare.wordclasses import (
    base_form,
    edit_distance,
    is_negation,
    normalise,
    number_value,
    quantity,
    split_glued,
    unit_name,
)
from matcheck.compare.wordiff import word_opcodes
from matcheck.findings import Evidence, EvidenceKind
from matcheck.language.words import Word
from matcheck.measures.key_terms import Passage
from matcheck.settings import DEFAULT_COMPARISON

# A run of at least this many words added or cut whole is text added or removed, not a
# changed statement: the comparison's min_run_words (matcheck.settings), 6 by default.
RUN_WORDS = DEFAULT_COMPARISON.min_run_words
# A replaced run of RUN_WORDS or more words states the same thing changed (and is searched
# for changed facts) when this share of its distinct words is on both sides (judgment call).
SAME_STATEMENT = 0.5
# Changed runs with at most this many equal words between them are one edit: "«three» to
# «four»" is one changed range (judgment call).
MERGE_GAP = 2
# A passage of at most this many words on each side (a list item, a heading, a caption, a
# short table) is judged by its words, not by its TF-IDF similarity (judgment call).
SHORT_WORDS = 12
# A short passage is rewritten when at least this share of its words changed (judgment call:
# most of it says something else).
SHORT_REWRITTEN_SHARE = 0.5
# A passage is reworded when its reworded edits change at least this many content words and
# this share of its words. Judgment call: a clause or a qualifier names three things or more
# (a verb, an object, a manner), one synonym does not; 3% lets such a clause count in a
# paragraph of up to 100 words and asks proportionally more of longer passages (a lesson
# read as one block), where a few scattered synonyms are light copy-editing.
REWORDED_MIN_WORDS = 3
REWORDED_SHARE = 0.03
# A key term counts as a term of the lesson when the two versions use it this often in all
# (judgment call: each version says it at least twice, or one version says it three times).
KEY_USES = 3
# Words of context shown on each side of a changed range: within its sentence for a changed
# fact (up to SENTENCE_WORDS), a few words around each change of a reworded passage.
CONTEXT_WORDS = 8
SENTENCE_WORDS = 20
# Changed ranges marked in one excerpt of a reworded or rewritten passage.
MARKED_RANGES = 4
# Typo: the longest edit distance allowed, by the length of the shorter word.
_TYPO_DISTANCE = ((8, 2), (4, 1))
_CONNECTORS = frozenset({"to", "and", "or", "-", "by", "x", "per", "of", "a", "an"})
_SENTENCE_END = re.compile(r"[.!?:;]\s*$")


class EditClass(StrEnum):
    FACT = "fact"
    REWORDED = "reworded"
    COSMETIC = "cosmetic"
    # A run of RUN_WORDS or more words added or cut whole: judged as text added or removed
    # (content.py) when its content is new, ignored here when the passage repeats it.
    RUN = "run"
    REPEATED = "repeated"


class Fact(StrEnum):
    """What kind of fact an edit changes, in the order a report names them."""

    NUMBER = "number"
    UNIT = "unit"
    NEGATION = "negation"
    COMPARISON = "comparison"
    TERM = "term"


EVIDENCE_KINDS = {
    Fact.NUMBER: EvidenceKind.NUMBER_CHANGED,
    Fact.UNIT: EvidenceKind.UNIT_CHANGED,
    Fact.NEGATION: EvidenceKind.NEGATION_CHANGED,
    Fact.COMPARISON: EvidenceKind.COMPARISON_CHANGED,
    Fact.TERM: EvidenceKind.TERM_SWAPPED,
}


@dataclass(frozen=True, slots=True)
class Side:
    """One side of an aligned pair: its passages, their words in order, and the normalised
    tokens the comparison sees (``source[k]`` is the word token ``k`` comes from)."""

    passages: tuple[Passage, ...]
    words: tuple[Word, ...]
    owner: tuple[int, ...]
    tokens: tuple[str, ...]
    source: tuple[int, ...]
    starts: tuple[int, ...] = ()  # the first word of each passage, then the end
    title_case: tuple[bool, ...] = ()  # each passage: half its words capitalised or more
    joined: str = ""  # " " + the tokens joined by spaces + " ", to find a run again

    def own(self, word: int) -> range:
        """The words of the passage that word ``word`` stands in."""
        passage = self.owner[word]
        return range(self.starts[passage], self.starts[passage + 1])

    def word_span(self, start: int, stop: int) -> tuple[int, int]:
        """Token range -> word range (end exclusive); an empty range stays empty."""
        if start >= stop:
            at = self.source[start] if start < len(self.source) else len(self.words)
            return at, at
        return self.source[start], self.source[stop - 1] + 1


@dataclass(frozen=True, slots=True)
class Edit:
    """One changed range: token ranges ``left``/``right`` (end exclusive) of each side."""

    kind: EditClass
    facts: tuple[Fact, ...]
    left: tuple[int, int]
    right: tuple[int, int]
    content_words: int
    changed_words: int


@dataclass(frozen=True, slots=True)
class PairEdits:
    pair: Pair
    left: Side
    right: Side
    edits: tuple[Edit, ...]
    strong: float = STRONG  # the alignment's threshold of a rewritten passage

    @property
    def words(self) -> int:
        return max(len(self.left.words), len(self.right.words))

    @property
    def short(self) -> bool:
        return max(len(self.left.words), len(self.right.words)) <= SHORT_WORDS

    @property
    def changed_words(self) -> int:
        return sum(e.changed_words for e in self.edits if e.kind is not EditClass.COSMETIC)

    @property
    def reworded_words(self) -> int:
        return sum(e.content_words for e in self.edits if e.kind is EditClass.REWORDED)

    @property
    def cosmetic(self) -> int:
        return sum(1 for e in self.edits if e.kind is EditClass.COSMETIC)

    @property
    def rewritten(self) -> bool:
        """A weak counterpart: by its words when short, by its similarity otherwise."""
        if self.short:
            return self.changed_words >= SHORT_REWRITTEN_SHARE * self.words
        return self.pair.similarity < self.strong

    @property
    def reworded(self) -> bool:
        if self.rewritten:
            return False
        changed = self.reworded_words
        return changed >= REWORDED_MIN_WORDS and changed >= REWORDED_SHARE * self.words

    @property
    def facts(self) -> tuple[Edit, ...]:
        return tuple(e for e in self.edits if e.kind is EditClass.FACT)


def side(passages: Sequence[Passage], *, tokens_needed: bool = True) -> Side:
    """One side of a pair; without ``tokens_needed`` (a pair whose words are identical, most
    of them) the normalised tokens are not built."""
    starts = [0]
    for passage in passages:
        starts.append(starts[-1] + len(passage.words))
    if not tokens_needed:
        every = tuple(w for p in passages for w in p.words)
        owners = tuple(i for i, p in enumerate(passages) for _ in p.words)
        return Side(tuple(passages), every, owners, (), (), tuple(starts))
    words: list[Word] = []
    owner: list[int] = []
    tokens: list[str] = []
    source: list[int] = []
    for index, passage in enumerate(passages):
        for word in passage.words:
            for token in _tokens(passage, word):
                tokens.append(token)
                source.append(len(words))
            words.append(word)
            owner.append(index)
    title_case = tuple(
        2 * sum(1 for w in p.words if w.text[:1].isupper()) >= len(p.words) for p in passages
    )
    return Side(
        tuple(passages),
        tuple(words),
        tuple(owner),
        tuple(tokens),
        tuple(source),
        tuple(starts),
        title_case,
        f" {' '.join(tokens)} ",
    )


def _tokens(passage: Passage, word: Word) -> tuple[str, ...]:
    """The normalised tokens of one word, with a "°" before it or a "%" after it kept."""
    text = passage.text
    inside = text[word.start : word.end] == word.text
    before = text[word.start - 1] if inside and word.start > 0 else ""
    after = text[word.end] if inside and word.end < len(text) else ""
    raw = ("°" if before == "°" else "") + word.text + ("%" if after == "%" else "")
    out: list[str] = []
    for token in normalise(raw):
        glued = split_glued(token)
        out.extend(glued if glued else (token,))
    return tuple(out)


class Classifier:
    """Classifies the edits of every pair of one comparison (shared vocabulary, key terms)."""

    def __init__(
        self,
        key_terms: frozenset[str],
        vocabulary: Counter[str],
        reported: Callable[[list[str], bool], bool],
        run_words: int = RUN_WORDS,
        strong: float = STRONG,
    ) -> None:
        from matcheck.language.pipeline import lemma, stop_words

        self.key_terms = key_terms
        self.vocabulary = vocabulary
        self.reported = reported
        self.run_words = run_words
        self.strong = strong
        self.stops = stop_words()
        self.lemma: Callable[[str], str] = lemma

    def compare(self, pair: Pair, left: Side, right: Side) -> PairEdits:
        a, b = list(left.tokens), list(right.tokens)
        edits: list[Edit] = []
        if a != b:
            for group in _groups(word_opcodes(a, b)):
                edits.append(self._classify(left, right, group))
        return PairEdits(pair, left, right, tuple(edits), self.strong)

    def _classify(self, left: Side, right: Side, group: list[Span4]) -> Edit:
        removed = [k for i1, i2, _, _ in group for k in range(i1, i2)]
        added = [k for _, _, j1, j2 in group for k in range(j1, j2)]
        span_a = (group[0][0], group[-1][1])
        span_b = (group[0][2], group[-1][3])
        changed = max(len(removed), len(added))
        a = [left.tokens[k] for k in removed]
        b = [right.tokens[k] for k in added]
        if _joined(a) == _joined(b) or self._typo(a, b):
            return Edit(EditClass.COSMETIC, (), span_a, span_b, 0, changed)
        if not (a and b) and changed >= self.run_words:
            run, here, there = (a, left, right) if a else (b, right, left)
            if _repeats(run, here, there):
                return Edit(EditClass.REPEATED, (), span_a, span_b, 0, changed)
            if self.reported(run, bool(a)):
                return Edit(EditClass.RUN, (), span_a, span_b, 0, changed)
            content = self._content(run)
            return Edit(EditClass.REWORDED, (), span_a, span_b, content, changed)
        # A long replacement with little in common is another sentence, not the same one
        # with a fact changed: its numbers or negations cannot be paired (reworded text).
        similar = (
            changed < self.run_words
            or _overlap(left.tokens[span_a[0] : span_a[1]], right.tokens[span_b[0] : span_b[1]])
            >= SAME_STATEMENT
        )
        facts = self._facts(left, removed, right, added) if similar else ()
        if facts:
            return Edit(EditClass.FACT, facts, span_a, span_b, 0, changed)
        content = max(self._content(a), self._content(b))
        return Edit(EditClass.REWORDED, (), span_a, span_b, content, changed)

    def _facts(
        self, left: Side, removed: list[int], right: Side, added: list[int]
    ) -> tuple[Fact, ...]:
        facts: list[Fact] = []
        a = [left.tokens[k] for k in removed]
        b = [right.tokens[k] for k in added]
        numbers_a = [v for v in map(number_value, a) if v is not None]
        numbers_b = [v for v in map(number_value, b) if v is not None]
        units_a, units_b = _units(left, removed), _units(right, added)
        same = _same_quantity(numbers_a, units_a, numbers_b, units_b)
        if Counter(numbers_a) != Counter(numbers_b) and not same:
            facts.append(Fact.NUMBER)
        if units_a != units_b and not same:
            facts.append(Fact.UNIT)
        if sum(map(is_negation, a)) != sum(map(is_negation, b)):
            facts.append(Fact.NEGATION)
        if Counter(filter(None, map(base_form, a))) != Counter(filter(None, map(base_form, b))):
            facts.append(Fact.COMPARISON)
        terms_a, terms_b = self._terms(left, removed), self._terms(right, added)
        if terms_a and terms_b and terms_a != terms_b:
            facts.append(Fact.TERM)
        return tuple(facts)

    def _terms(self, part: Side, indices: list[int]) -> frozenset[str]:
        """Named or technical terms: key terms, proper nouns, words mixing letters and digits."""
        found = set()
        for k in indices:
            token = part.tokens[k]
            if number_value(token) is not None or unit_name(token) is not None:
                continue
            word_index = part.source[k]
            if (
                self._key(token)
                or (_has_digit(token) and any(c.isalpha() for c in token))
                or _proper(part, word_index)
            ):
                found.add(self.lemma(token))
        return frozenset(found)

    def _key(self, token: str) -> bool:
        """One of the lesson's key terms that the lesson uses more than once: a word said
        once is no term of the lesson, and in a short lesson every word is heavy."""
        return self.lemma(token) in self.key_terms and self.vocabulary[token] >= KEY_USES

    def _typo(self, a: list[str], b: list[str]) -> bool:
        """One word for one, a slip of a letter or two, the misspelt form used once."""
        if len(a) != 1 or len(b) != 1:
            return False
        x, y = a[0], b[0]
        if not (x.isalpha() and y.isalpha()):
            return False
        if any(
            number_value(w) is not None
            or unit_name(w) is not None
            or base_form(w) is not None
            or is_negation(w)
            for w in (x, y)
        ):
            return False
        shorter = min(len(x), len(y))
        limit = next((d for length, d in _TYPO_DISTANCE if shorter >= length), 0)
        if not limit or edit_distance(x, y, limit) > limit:
            return False
        if self._key(x) and self._key(y):
            return False  # two key terms a letter apart are two terms
        return min(self.vocabulary[x], self.vocabulary[y]) <= 1

    def _content(self, tokens: list[str]) -> int:
        stops = self.stops
        return sum(
            1 for t in tokens if t.isalpha() and len(t) > 1 and stops.isdisjoint((t, self.lemma(t)))
        )


Span4 = tuple[int, int, int, int]


def _groups(opcodes: Sequence[tuple[str, int, int, int, int]]) -> list[list[Span4]]:
    """Non-equal opcodes, those closer than :data:`MERGE_GAP` equal tokens joined."""
    groups: list[list[Span4]] = []
    gap_ok = False
    for tag, i1, i2, j1, j2 in opcodes:
        if tag == "equal":
            gap_ok = bool(groups) and (i2 - i1) <= MERGE_GAP
            continue
        if groups and gap_ok:
            groups[-1].append((i1, i2, j1, j2))
        else:
            groups.append([(i1, i2, j1, j2)])
        gap_ok = True
    return groups


def _overlap(a: Sequence[str], b: Sequence[str]) -> float:
    """Jaccard overlap of two runs' distinct words."""
    union = set(a) | set(b)
    return len(set(a) & set(b)) / len(union) if union else 1.0


def _repeats(run: list[str], here: Side, there: Side) -> bool:
    """The run says again what its passage already says: padding, not content."""
    text = f" {' '.join(run)} "
    if text in there.joined:
        return True
    first = here.joined.find(text)
    return first >= 0 and here.joined.find(text, first + 1) >= 0


def _joined(tokens: list[str]) -> str:
    return "".join(tokens).replace("-", "").replace("'", "")


def _has_digit(token: str) -> bool:
    return any(c.isdigit() for c in token)


def _units(part: Side, indices: list[int]) -> Counter[str]:
    units: Counter[str] = Counter()
    for k in indices:
        previous = part.tokens[k - 1] if k > 0 else ""
        name = unit_name(part.tokens[k], after_number=number_value(previous) is not None)
        if name is not None:
            units[name] += 1
    return units


def _same_quantity(
    numbers_a: list[str], units_a: Counter[str], numbers_b: list[str], units_b: Counter[str]
) -> bool:
    """The same amount in other words: "twenty minutes" and "a third of an hour"."""
    import math

    a = quantity(numbers_a, list(units_a.elements()))
    b = quantity(numbers_b, list(units_b.elements()))
    return a is not None and b is not None and a[0] == b[0] and math.isclose(a[1], b[1])


def _proper(part: Side, index: int) -> bool:
    """A capitalised word inside a sentence, in a passage that is not in title case."""
    word = part.words[index]
    if not word.text[:1].isupper():
        return False
    owner = part.owner[index]
    if index == part.starts[owner] or part.title_case[owner]:
        return False  # the first word, or a heading or label in title case
    text = part.passages[owner].text
    if text[word.start : word.end] != word.text:
        return False
    before = text[max(0, word.start - 12) : word.start].rstrip("\"'“‘([ ")
    return _SENTENCE_END.search(before) is None


# --- evidence ------------------------------------------------------------------------------


def _extend(left: Side, right: Side, edit: Edit) -> tuple[tuple[int, int], tuple[int, int]]:
    """The token ranges to mark: a number's whole phrase ("three to four units"), and one
    unchanged neighbour (the word before, if any) when a side is empty, so an insertion
    shows where it stands."""
    (i1, i2), (j1, j2) = edit.left, edit.right
    a, b = left.tokens, right.tokens

    def numeric(token: str) -> bool:
        return number_value(token) is not None or unit_name(token) is not None

    if Fact.NUMBER in edit.facts or Fact.UNIT in edit.facts:
        while i1 > 0 and j1 > 0 and a[i1 - 1] == b[j1 - 1]:
            token = a[i1 - 1]
            joined = i1 > 1 and token in _CONNECTORS and number_value(a[i1 - 2]) is not None
            if not (numeric(token) or joined):
                break
            i1, j1 = i1 - 1, j1 - 1
        while i2 < len(a) and j2 < len(b) and a[i2] == b[j2]:
            token = a[i2]
            joined = i2 + 1 < len(a) and token in _CONNECTORS and numeric(a[i2 + 1])
            if not (numeric(token) or joined):
                break
            i2, j2 = i2 + 1, j2 + 1
    if i1 == i2 or j1 == j2:  # the word before an insertion ("unit «gently with...»")
        if i1 > 0 and j1 > 0:
            i1, j1 = i1 - 1, j1 - 1
        elif i2 < len(a) and j2 < len(b):
            i2, j2 = i2 + 1, j2 + 1
    return (i1, i2), (j1, j2)


def marked(part: Side, spans: Sequence[tuple[int, int]], *, sentence: bool = False) -> str:
    """The text around token ranges ``spans`` with each changed range in «»."""
    ranges = [part.word_span(s, e) for s, e in spans if s < e]
    if not ranges or not part.words:
        return ""
    first_word, last_word = ranges[0][0], ranges[-1][1] - 1
    owner = part.owner[first_word]
    own = part.own(first_word)
    context = SENTENCE_WORDS if sentence else CONTEXT_WORDS
    lo = max(own[0], first_word - context)
    hi = min(own[-1], last_word + context)
    passage = part.passages[owner]
    text = passage.text
    window = range(max(own[0], lo - 1), min(own[-1], hi + 1) + 1)
    exact = all(text[part.words[k].start : part.words[k].end] == part.words[k].text for k in window)
    if sentence and exact:
        lo = next((k + 1 for k in range(first_word - 1, lo - 1, -1) if _ends(part, k)), lo)
        hi = next((k for k in range(last_word, hi) if _ends(part, k)), hi)
    ranges = [(s, min(e, hi + 1)) for s, e in ranges if s <= hi and part.owner[s] == owner]
    cut_before = lo > own[0] and not (sentence and exact and _ends(part, lo - 1))
    out: list[str] = ["…"] if cut_before else []
    if exact:
        cursor = part.words[lo].start
        pieces = []
        for s, e in ranges:
            start, end = part.words[s].start, part.words[e - 1].end
            # The signs the word rule strips belong to the number: "20 °C", "30%".
            start -= start > cursor and text[start - 1] == "°"
            end += end < len(text) and text[end] == "%"
            pieces.append(text[cursor:start])
            pieces.append("«" + text[start:end] + "»")
            cursor = end
        end = part.words[hi].end
        tail = text[end:].split(" ", 1)[0] if end < len(text) else ""
        pieces.append(text[cursor:end] + (tail if not any(c.isalnum() for c in tail) else ""))
        out.append("".join(pieces).strip())
    else:  # a table read as one passage: its words, joined by spaces
        words = [w.text for w in part.words[lo : hi + 1]]
        for s, e in reversed(ranges):
            words[e - 1 - lo] += "»"
            words[s - lo] = "«" + words[s - lo]
        out.append(" ".join(words))
    if hi < own[-1] and not (sentence and exact and _ends(part, hi)):
        out.append("…")
    return " ".join(out)


def _ends(part: Side, k: int) -> bool:
    """A sentence ends between word ``k`` and word ``k + 1`` (of one passage's text)."""
    text = part.passages[part.owner[k]].text
    gap = text[part.words[k].end : part.words[k + 1].start]
    return _SENTENCE_END.search(gap) is not None


def location_of(part: Side, token: int) -> int:
    """The passage (index into ``part.passages``) that token range starting here stands in."""
    if not part.words:
        return 0
    word = part.source[token] if token < len(part.source) else len(part.words) - 1
    return part.owner[min(word, len(part.words) - 1)]


def fact_evidence(found: PairEdits, reference: str) -> list[Evidence]:
    evidence = []
    for edit in found.facts:
        span_a, span_b = _extend(found.left, found.right, edit)
        at_a = found.left.passages[location_of(found.left, span_a[0])]
        at_b = found.right.passages[location_of(found.right, span_b[0])]
        evidence.append(
            Evidence(
                kind=EVIDENCE_KINDS[edit.facts[0]],
                condition=reference,
                text=marked(found.left, [span_a], sentence=True),
                location=at_a.location,
                counterpart=at_b.location,
                counterpart_text=marked(found.right, [span_b], sentence=True),
            )
        )
    return evidence


def changes_evidence(
    found: PairEdits, kind: EvidenceKind, reference: str, *, only: EditClass | None = None
) -> Evidence:
    """One passage's changed words marked in both versions (reworded or rewritten)."""
    chosen = [
        e
        for e in found.edits
        if e.kind is not EditClass.COSMETIC and (only is None or e.kind is only)
    ][:MARKED_RANGES]
    spans = [_extend(found.left, found.right, e) for e in chosen]
    left = [a for a, _ in spans]
    right = [b for _, b in spans]
    first_a = location_of(found.left, left[0][0]) if left else 0
    first_b = location_of(found.right, right[0][0]) if right else 0
    return Evidence(
        kind=kind,
        condition=reference,
        text=marked(found.left, left) or _start(found.left),
        location=found.left.passages[first_a].location,
        weight=found.reworded_words / found.words if found.words else 0.0,
        similarity=found.pair.similarity,
        counterpart=found.right.passages[first_b].location,
        counterpart_text=marked(found.right, right) or _start(found.right),
    )


def _start(part: Side) -> str:
    words = [w.text for w in part.words[: CONTEXT_WORDS * 2]]
    return " ".join(words) + (" …" if len(part.words) > len(words) else "")


def compare_pairs(
    alignment: Alignment,
    left: Sequence[Passage],
    right: Sequence[Passage],
    key_terms: frozenset[str],
    reported: Callable[[list[str], bool], bool],
    run_words: int = RUN_WORDS,
) -> list[PairEdits]:
    """The word-level comparison of every aligned pair. ``reported(run, removed)`` says whether
    a run added (or, when ``removed``, cut) whole is reported as text added or removed."""
    vocabulary: Counter[str] = Counter(
        t for passage in (*left, *right) for w in passage.words for t in normalise(w.text)
    )
    classifier = Classifier(key_terms, vocabulary, reported, run_words, alignment.strong)
    compared = []
    for pair in alignment.pairs:
        a, b = [left[i] for i in pair.left], [right[j] for j in pair.right]
        differ = [w.text for p in a for w in p.words] != [w.text for p in b for w in p.words]
        compared.append(
            classifier.compare(pair, side(a, tokens_needed=differ), side(b, tokens_needed=differ))
        )
    return compared
