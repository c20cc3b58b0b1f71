"""The spaCy pipeline, loaded once and lazily: tokens, sentences and lemmas, offline.

matcheck always uses a *blank* English pipeline whose only component marks the sentence
starts found by :mod:`matcheck.language.segment` on its tokens, and lemmas from the English
lookup table of ``spacy-lookups-data`` corrected by :mod:`matcheck.language.lemmas`. A
trained pipeline would give slightly different sentences and lemmas on different machines
depending on what happens to be installed; the blank one makes every result reproducible
and needs no model download.
"""

from __future__ import annotations

from functools import cache
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    from spacy.language import Language
    from spacy.tokens import Doc


SENTENCES = "matcheck_sentences"


def _mark_sentences(doc: Doc) -> Doc:
    """Set ``is_sent_start`` on every token from the rule-based boundaries of the text.

    Boundaries fall after white space, where spaCy always starts a token; a boundary that
    should fall inside a token moves to the next token start, so no text is tokenised twice.
    """
    from matcheck.language.segment import sentence_starts

    starts = sentence_starts(doc.text)
    index = 0
    for token in doc:
        is_start = token.i == 0
        while index < len(starts) and starts[index] <= token.idx:
            is_start = True
            index += 1
        token.is_sent_start = is_start
    return doc


@cache
def nlp() -> Language:
    """The shared pipeline: spaCy's English tokenizer and the rule-based sentence starts."""
    import spacy
    from spacy.language import Language

    if SENTENCES not in Language.factories:
        Language.component(SENTENCES, func=_mark_sentences)
    pipeline = spacy.blank("en")
    pipeline.add_pipe(SENTENCES)
    # Blocks are processed one at a time; a PDF can still yield one very long block.
    pipeline.max_length = 50_000_000
    return pipeline


@cache
def _lemma_table() -> dict[str, str]:
    """Lower-case word -> lemma, from spaCy's English lookup lemmatizer data.

    The same file ``spacy.lookups.load_lookups("en", ["lemma_lookup"])`` reads, found through
    the same registry, kept as a plain dict: building spaCy's hashed ``Table`` from it took
    three quarters of the load time (about 0.07 s of 0.09 s) and looks words up no better.
    """
    from spacy.util import load_language_data, registry

    if "en" not in registry.lookups:
        raise ValueError("spacy-lookups-data is not installed: no English lemma table")
    table = load_language_data(registry.lookups.get("en")["lemma_lookup"])
    if not isinstance(table, dict):
        raise ValueError("the English lemma table of spacy-lookups-data is not a mapping")
    return {str(word): str(base) for word, base in table.items()}


@cache
def lemma(lower: str) -> str:
    """The lemma of a lower-case word (the word itself when the table does not know it).

    :func:`matcheck.language.lemmas.corrected` comes first (docs/measures.md, "Lemmas").
    """
    from matcheck.language.lemmas import corrected

    fixed = corrected(lower)
    if fixed is not None:
        return fixed
    return _lemma_table().get(lower, lower)


@cache
def stop_words() -> frozenset[str]:
    from spacy.lang.en.stop_words import STOP_WORDS

    return frozenset(STOP_WORDS)
