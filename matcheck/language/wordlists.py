"""Word lists used by the measures: the Dale–Chall familiar (easy) words."""

from __future__ import annotations

from functools import cache
from importlib import resources


@cache
def dale_chall_familiar() -> frozenset[str]:
    """The Dale–Chall familiar words, lower-case, as shipped with textstat 0.7.8.

    Read from ``textstat/resources/en/easy_words.txt`` with :mod:`importlib.resources`. This
    is textstat's rendition of the Dale–Chall list of words known to most fourth-graders: the
    file has 2,940 line breaks and 2,941 words (the last line has none), a few of them with
    apostrophes or hyphens ("don't", "cross-eyed"). It is not the 1995 revised list.
    """
    path = resources.files("textstat").joinpath("resources/en/easy_words.txt")
    text = path.read_text(encoding="utf-8")
    return frozenset(line.strip().lower() for line in text.splitlines() if line.strip())


def is_familiar(word: str, lemma: str) -> bool:
    """Whether a word counts as familiar for Dale–Chall: its form or its lemma is on the list.

    Dale and Chall's counting rules accept regular inflections of listed words ("bikes",
    "wheeled"), which the lemma covers (rule FROM MEMORY; textstat 0.7.8's docstring names it
    as a deviation: it checks the word form only; docs/references.md §2.5). Typographic
    apostrophes are read as ASCII ones, as the list spells them.
    """
    familiar = dale_chall_familiar()
    return any(candidate.lower().replace("\u2019", "'") in familiar for candidate in (word, lemma))
