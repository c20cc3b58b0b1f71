"""What counts as a word: the rule every length and readability measure shares.

A word is a maximal run of non-white-space characters that contains at least one letter or
digit, with the punctuation around it stripped ("(tyre)," -> "tyre"). This is the rule word
processors use for their word counts, and the one textstat's ``lexicon_count`` approximates;
it does not depend on the tokenizer, so it counts the same text the same way in every format.
"""

from __future__ import annotations

import re
from collections.abc import Iterator
from dataclasses import dataclass

# From the first to the last word character of a run of non-white-space: the run with the
# punctuation around it stripped. \S* is greedy, so one match spans its whole run.
_STRIPPED_RUN = re.compile(r"\w(?:\S*\w)?")
# A letter or digit: \w less the underscore (the same test as str.isalnum).
_ALNUM = re.compile(r"[^\W_]")


@dataclass(frozen=True, slots=True)
class Word:
    """One word of a block: ``text`` stands at ``block.text[start:end]`` (end exclusive)."""

    text: str
    start: int
    end: int

    @property
    def lower(self) -> str:
        return self.text.lower()


def iter_words(text: str) -> Iterator[Word]:
    for match in _STRIPPED_RUN.finditer(text):
        stripped = match.group()
        if _ALNUM.search(stripped) is not None:  # "___" is no word
            yield Word(stripped, match.start(), match.end())


def letters(word: str) -> int:
    """Letters in a word (Coleman–Liau's L)."""
    return sum(1 for char in word if char.isalpha())


def strokes(word: str) -> int:
    """Letters and digits: the typed strokes the ARI counts (Senter & Smith 1967; §2.4).

    Section numbers refer to docs/references.md.
    """
    return sum(1 for char in word if char.isalnum())
