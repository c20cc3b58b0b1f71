"""Corrections to the English lemma lookup table (docs/measures.md, "Lemmas").

spaCy's lookup table (``spacy-lookups-data``) maps each word form to one lemma, whatever its
part of speech. Where a form is also a common word in its own right, the table can pick the
wrong reading: "number" as the comparative of "numb", "ground" as the past of "grind",
"stove" as the past of "stave", "second" as the number 2. Lemmas feed the key terms and the
familiar-word check of Dale–Chall, so such a word would be merged with an unrelated one.

Two corrections, applied before the table is read:

- a single letter is its own lemma ("m" for metres is not "be", "s" for seconds is not "s");
- :data:`OVERRIDES` gives the lemma of words whose noun (or adjective) reading is the common
  one in lessons, and of the irregular comparisons the table gives as adverbs. The list was
  drawn up by reading every entry of the table whose lemma differs from the word although the
  word has a regular plural in the same table (129 entries); it keeps the table's lemma where
  the verb reading is at least as common ("found", "left", "saw", "felt", "spoke"), which is
  judgment.
"""

from __future__ import annotations

from types import MappingProxyType

_SELF = (
    # nouns read as comparatives of adjectives (number = numb + -er)
    "number", "matter", "buffer", "cleaner", "cooler", "damper", "dryer", "dimmer", "lighter",
    "planer", "trimmer", "chiller", "fitter", "broker", "liver", "stranger", "tanner",
    "thinner", "warmer",
    # nouns read as past forms of verbs
    "ground", "stove", "crew", "bit", "span", "bound",
    # nouns read as other words
    "dive", "second", "third", "well",
)  # fmt: skip

OVERRIDES: MappingProxyType[str, str] = MappingProxyType(
    {
        **{word: word for word in _SELF},
        **{word + "s": word for word in _SELF if word not in ("well",)},
        # comparison of the adjectives; the table gives the adverbs "well" and "wrong"
        "better": "good",
        "best": "good",
        "worse": "bad",
        "worst": "bad",
    }
)


def corrected(lower: str) -> str | None:
    """The corrected lemma of a lower-case word, or None when the table is to be used."""
    if len(lower) == 1:
        return lower
    return OVERRIDES.get(lower)
