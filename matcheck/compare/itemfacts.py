"""The facts of a post-test item: numbers and units, as terms a lesson must state.

An item that asks for a number ("How many units of heat...?" — "Three to four") turns on that
number, which is no content word. Each number and each unit of measurement in an item's
question or answer is a *fact term* (``#3``, ``#minute``), read by the same tables as the
word-level comparison (:mod:`matcheck.compare.wordclasses`), and counts towards coverage like
a content lemma. A passage's fact terms are read the same way.

Two conditions that both teach an item may still state its fact differently: one says "three
to four units", the other "two to three". :func:`stated_differently` compares the item's fact
terms found in each condition's teaching window; when they differ, the item is taught
differently and :func:`fact_excerpt` shows where each condition states its numbers.
"""

from __future__ import annotations

from collections.abc import Iterable, Sequence

from matcheck.compare.wordclasses import normalise, number_value, split_glued, unit_name
from matcheck.language.words import Word, iter_words
from matcheck.measures.key_terms import Passage

PREFIX = "#"
# Words shown before and after the first stated fact of a window.
CONTEXT_WORDS = 8
_CONNECTORS = frozenset({"to", "and", "or"})


def _word_facts(text: str, previous_number: bool) -> tuple[list[str], bool]:
    facts: list[str] = []
    for token in normalise(text):
        parts = split_glued(token) or (token,)
        for part in parts:
            number = number_value(part)
            if number is not None:
                facts.append(PREFIX + number)
                previous_number = True
                continue
            unit = unit_name(part, after_number=previous_number)
            if unit is not None:
                facts.append(PREFIX + unit)
            previous_number = False
    return facts, previous_number


def word_facts(words: Iterable[Word], text: str = "") -> list[list[str]]:
    """The fact terms of each word, in order (most words have none). With the ``text`` the
    words stand in, a "%" after a word or a "°" before it is kept (the word rule strips them).
    """
    out = []
    previous = False
    for word in words:
        exact = text[word.start : word.end] == word.text
        sign = "%" if exact and text[word.end : word.end + 1] == "%" else ""
        degree = "°" if exact and word.start and text[word.start - 1] == "°" else ""
        facts, previous = _word_facts(degree + word.text + sign, previous)
        out.append(facts)
    return out


def text_facts(text: str) -> frozenset[str]:
    """The fact terms of a question or an answer."""
    return frozenset(f for facts in word_facts(iter_words(text), text) for f in facts)


def passage_facts(passage: Passage) -> frozenset[str]:
    return frozenset(f for facts in word_facts(passage.words, passage.text) for f in facts)


def label(fact: str) -> str:
    """A fact term as a reader writes it (``#3`` -> ``3``)."""
    return fact.removeprefix(PREFIX)


def stated_differently(
    facts: frozenset[str], present_a: frozenset[str], present_b: frozenset[str]
) -> bool:
    """The item's facts found in one condition's window are not those found in the other's."""
    return bool(facts) and (facts & present_a) != (facts & present_b)


def fact_excerpt(windows: Sequence[Passage], facts: frozenset[str]) -> tuple[str, Passage | None]:
    """The first place in ``windows`` that states a number or unit, with it marked: one of the
    item's facts when the window has one, else any number (what the condition says instead)."""
    for wanted in (facts, None):
        for passage in windows:
            per_word = word_facts(passage.words, passage.text)
            hits = [
                k
                for k, found in enumerate(per_word)
                if found and (wanted is None or wanted & set(found))
            ]
            if not hits:
                continue
            start = stop = hits[0]
            while stop + 1 < len(per_word):  # the whole quantity: "three to four minutes"
                step = _step(passage, per_word, stop, +1)
                if not step:
                    break
                stop += step
            while start > 0:
                step = _step(passage, per_word, start, -1)
                if not step:
                    break
                start -= step
            return _marked(passage, start, stop), passage
    return "", None


def _step(passage: Passage, per_word: list[list[str]], at: int, direction: int) -> int:
    """How far a quantity goes on from word ``at``: 1 to a fact, 2 over a connector, or 0."""
    one, two = at + direction, at + 2 * direction
    if 0 <= one < len(per_word) and per_word[one]:
        return 1
    if 0 <= two < len(per_word) and passage.words[one].lower in _CONNECTORS and per_word[two]:
        return 2
    return 0


def _marked(passage: Passage, start: int, stop: int) -> str:
    """Words ``start``..``stop`` marked «», with context, from the passage's own text."""
    words = passage.words
    lo, hi = max(0, start - CONTEXT_WORDS), min(len(words) - 1, stop + CONTEXT_WORDS)
    text = passage.text
    if all(text[w.start : w.end] == w.text for w in words[lo : hi + 1]):
        shown = (
            text[words[lo].start : words[start].start]
            + "«"
            + text[words[start].start : words[stop].end]
            + "»"
            + text[words[stop].end : words[hi].end]
        )
    else:  # a table passage: words from several cells
        texts = [w.text for w in words[lo : hi + 1]]
        texts[start - lo] = "«" + texts[start - lo]
        texts[stop - lo] += "»"
        shown = " ".join(texts)
    return ("… " if lo else "") + shown + (" …" if hi < len(words) - 1 else "")
