"""The ``max_words`` limit, shared by every reader so each refuses in the same words.

Markdown and plain text are counted on the raw text before parsing (:func:`raw_word_count`),
so an enormous file is refused without the cost of a parse; DOCX and PDF are counted as their
text comes out (:class:`WordBudget`).
"""

from __future__ import annotations

import re
from collections.abc import Iterable

from matcheck.errors import LimitExceeded
from matcheck.limits import ReadLimits

# A run of letters and digits, or one punctuation mark. Counting each mark bounds what a parse
# can make of the text: every token markdown-it makes (a table cell, an emphasis tag, an
# image) needs a word or a mark of its own, so "|a|a|a" or "*-**-*" cannot hide a million
# blocks in a few "words". Prose has ~0.15 marks per word, so it over-counts a little.
_WORD = re.compile(r"[^\W_]+|[^\w\s]|_")
_RUN = re.compile(r"\S+")


def raw_word_count(text: str) -> int:
    """Words and punctuation marks in raw text, markup included (an over-estimate of words)."""
    return sum(1 for _ in _WORD.finditer(text))


def refuse_words(count: int, limits: ReadLimits, path: str, what: str, unit: str = "words") -> None:
    """Raise :class:`LimitExceeded` naming ``max_words`` if ``count`` is above it."""
    if count > limits.max_words:
        raise LimitExceeded(
            f"the {what} has more than {limits.max_words:,} {unit}, above max_words",
            path=path,
            hint="raise it with --limit max_words=N if this is really a lesson",
        )


def refuse_long_tokens(texts: Iterable[str], limits: ReadLimits, path: str) -> None:
    """Raise :class:`LimitExceeded` naming ``max_token_chars`` if any text holds a run of more
    than that many characters without white space (a linear scan, before any analysis)."""
    # \S+ runs are found left to right without backtracking into a run, so this is linear;
    # a search for \S{N+1} would retry at every character of every run (quadratic).
    limit = limits.max_token_chars
    if any(m.end() - m.start() > limit for text in texts for m in _RUN.finditer(text)):
        raise LimitExceeded(
            f"the text holds a 'word' of more than {limits.max_token_chars:,} characters "
            "without a space, above max_token_chars",
            path=path,
            hint="raise it with --limit max_token_chars=N if this is really a lesson",
        )


class WordBudget:
    """Count words as a reader produces text; refuse as soon as the count passes the limit."""

    def __init__(self, limits: ReadLimits, path: str, what: str) -> None:
        self._limits = limits
        self._path = path
        self._what = what
        self.words = 0

    def add(self, text: str) -> None:
        self.words += len(text.split())
        refuse_words(self.words, self._limits, self._path, self._what)
