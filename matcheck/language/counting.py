"""Word classes that the counting rules of the readability formulas name.

- **Names** (Gunning 1952; Dale & Chall 1948): a capitalised word that does not open its
  sentence or unit. A word opens its unit when it is the first of its sentence, or when the
  text just before it holds a colon, full stop, bracket, quotation mark or bullet: "Step 1.
  Remove", "Warning: Disconnect", "1) Resources". A capital there says nothing about a name.
  A word in capitals only ("USB") is an abbreviation, not a name.
- **Verb forms in -ed/-es** (Gunning's exclusion names verbs): an -ed word is a verb form when
  the lemma table maps it to another word ("created" -> "create"; "hundred" stays). An -es word
  is one when its lemma is a verb and not a noun in spaCy's English lemma index ("reduces"), or
  is both and follows a subject pronoun, a relative or an adverb ("it balances", "which
  damages", "also replaces"); otherwise it is a plural noun ("damages", "expenses",
  "resources"). The reading from the previous word is judgment: without a tagger, a noun
  after a noun ("the router balances load") is taken for a noun.
- **Numbers**: a word with digits and no letter.
- **Abbreviations**: :data:`EXPANSIONS` gives the words that common abbreviations stand for;
  Dale–Chall judges an abbreviation by its expansion (judgment, docs/measures.md).
"""

from __future__ import annotations

from functools import cache
from types import MappingProxyType

# Characters that, between two words, mean the second opens a unit of its own.
_OPENING = frozenset(':.!?;"“‘([{•–—')
_SUBJECTS = frozenset(
    {"it", "he", "she", "this", "that", "which", "who", "what", "one", "each", "everyone",
     "everything", "something", "nothing", "someone", "nobody", "anyone", "anything"}
)  # fmt: skip
_ADVERBS = frozenset(
    {"also", "often", "always", "never", "only", "still", "usually", "then", "just", "now",
     "sometimes", "rarely", "seldom", "even", "already", "soon", "first", "simply"}
)  # fmt: skip

# Judgment: the word each common abbreviation stands for (lower case, without its period).
EXPANSIONS: MappingProxyType[str, str] = MappingProxyType(
    {
        "fig": "figure", "figs": "figure", "eq": "equation", "eqs": "equation",
        "no": "number", "nos": "number", "vol": "volume", "vols": "volume", "p": "page",
        "pp": "page", "ch": "chapter", "chap": "chapter", "sec": "second", "min": "minute",
        "max": "maximum", "approx": "approximately", "ca": "about", "cf": "compare",
        "dr": "doctor", "mr": "mister", "st": "street", "mt": "mount", "co": "company",
        "dept": "department", "vs": "against", "etc": "and so on",
    }
)  # fmt: skip


def opens_unit(position: int, gap: str) -> bool:
    """Whether a word opens its unit: ``gap`` is the text between it and the word before."""
    return position == 0 or any(char in _OPENING for char in gap)


def is_name(word: str, *, opening: bool) -> bool:
    """A capitalised word that does not open its unit and is not written in capitals only."""
    if opening or not word[:1].isupper():
        return False
    letters = [char for char in word if char.isalpha()]
    return not (len(letters) > 1 and all(char.isupper() for char in letters))


def is_number(word: str) -> bool:
    return any(char.isdigit() for char in word) and not any(char.isalpha() for char in word)


@cache
def _index() -> dict[str, frozenset[str]]:
    """spaCy's English lemma index: part of speech -> base forms (spacy-lookups-data), read
    as spaCy's ``load_language_data(registry.lookups.get("en")["lemma_index"])`` reads it,
    without importing spaCy."""
    from matcheck.language.pipeline import lookups_data

    data = lookups_data("lemma_index")
    if not isinstance(data, dict):
        raise ValueError("the English lemma index of spacy-lookups-data is not a mapping")
    return {str(pos): frozenset(map(str, words)) for pos, words in data.items()}


def is_verb_form(lower: str, previous: str) -> bool:
    """Whether an -ed/-es word is a verb form (see the module docstring); ``previous`` is the
    lower-cased word before it in the sentence, or "" when there is none."""
    from matcheck.language.pipeline import lemma

    base = lemma(lower)
    if lower.endswith("ed"):
        return base != lower
    if not lower.endswith("es") or base == lower:
        return False
    index = _index()
    verb, noun = base in index["verb"], base in index["noun"]
    if verb and not noun:
        return True
    if noun and not verb:
        return False
    return previous in _SUBJECTS or previous in _ADVERBS or previous.endswith("ly")


def is_dale_chall_familiar(word: str, *, opening: bool) -> bool:
    """Whether Dale–Chall counts ``word`` as familiar (docs/measures.md, "Dale–Chall").

    Familiar are: words on the list, and their regular inflections (through the lemma); names
    and numbers, which Dale and Chall do not count as unfamiliar (SECONDARY and FROM MEMORY,
    docs/references.md §20); and abbreviations whose expansion is on the list
    (judgment).
    """
    from matcheck.language.pipeline import lemma
    from matcheck.language.wordlists import is_familiar

    lower = word.lower()
    if is_number(word) or is_name(word, opening=opening):
        return True
    if is_familiar(lower, lemma(lower)):
        return True
    expansion = EXPANSIONS.get(lower)
    return expansion is not None and all(
        is_familiar(part, lemma(part)) for part in expansion.split()
    )
