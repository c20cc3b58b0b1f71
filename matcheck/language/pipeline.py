"""The spaCy pipeline, loaded once and lazily: tokens, sentences and lemmas, offline.

matcheck always uses a *blank* English pipeline (the tokenizer alone), marks on its tokens
the sentence starts found by :mod:`matcheck.language.segment` (:func:`mark_sentences`), and
takes lemmas from the English lookup table of ``spacy-lookups-data`` corrected by
:mod:`matcheck.language.lemmas`. A
trained pipeline would give slightly different sentences and lemmas on different machines
depending on what happens to be installed; the blank one makes every result reproducible
and needs no model download.
"""

from __future__ import annotations

from functools import cache
from pathlib import Path
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    from spacy.language import Language
    from spacy.tokens import Doc


def mark_sentences(doc: Doc, text: str) -> Doc:
    """Set the sentence starts of ``doc``, the tokens of ``text``, from the rules of
    :mod:`matcheck.language.segment`, so that ``doc.sents`` gives them.

    Boundaries fall after white space, where spaCy always starts a token; a boundary that
    should fall inside a token moves to the next token start, so no text is tokenised twice.
    ``text`` is passed in because rebuilding it from the tokens (``doc.text``) costs more than
    tokenising it; the flags are written as one array because setting
    ``Token.is_sent_start`` token by token cost ten times the tokenizer's own time.
    """
    import numpy
    from spacy.attrs import IDX, SENT_START

    from matcheck.language.segment import sentence_starts

    if not len(doc):
        return doc
    offsets = doc.to_array(IDX)
    first_tokens = numpy.searchsorted(offsets, sentence_starts(text), side="left")
    flags = numpy.full(len(doc), -1, dtype=numpy.int64)  # -1: not a sentence start
    flags[first_tokens[first_tokens < len(doc)]] = 1
    flags[0] = 1
    doc.from_array([SENT_START], flags.astype(numpy.uint64).reshape(-1, 1))  # type: ignore[arg-type]
    return doc


@cache
def nlp() -> Language:
    """The shared pipeline: spaCy's English tokenizer; :func:`mark_sentences` adds sentences."""
    import spacy

    pipeline = spacy.blank("en")
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
    try:  # the package spaCy's lookups registry names for "en"; importing spaCy takes ~0.4 s
        import spacy_lookups_data
    except ImportError:
        raise ValueError("spacy-lookups-data is not installed: no English lemma table") from None
    table = _json_data(Path(spacy_lookups_data.en["lemma_lookup"]))
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


def _json_data(path: Path) -> object:
    """A JSON data file, or its gzipped copy beside it, as ``spacy.util.load_language_data``
    reads them."""
    import gzip
    import json

    if path.exists():
        return json.loads(path.read_text(encoding="utf-8"))
    zipped = path.with_suffix(path.suffix + ".gz")
    if zipped.exists():
        return json.loads(gzip.decompress(zipped.read_bytes()).decode("utf-8"))
    raise ValueError(f"the English lemma table is missing: {path}")


@cache
def stop_words() -> frozenset[str]:
    """spaCy's English stop words, read from spaCy's own module file without importing spaCy
    (a comparison of cached profiles needs the list but not the ~0.4 s of spaCy's import)."""
    from importlib.util import find_spec, module_from_spec, spec_from_file_location

    found = find_spec("spacy")  # finds the package without importing it
    if found is None or found.origin is None:
        raise ValueError("spaCy is not installed")
    source = Path(found.origin).parent / "lang" / "en" / "stop_words.py"
    spec = spec_from_file_location("_matcheck_spacy_stop_words", source)
    if spec is None or spec.loader is None:
        raise ValueError(f"spaCy's English stop words are not at {source}")
    module = module_from_spec(spec)
    spec.loader.exec_module(module)
    return frozenset(module.STOP_WORDS)
