"""Lemmas and stop words from spaCy's English data, without importing spaCy.

matcheck tokenises with the rules of spaCy's *blank* English pipeline
(:mod:`matcheck.language.tokenizer`), marks sentences by the rules of
:mod:`matcheck.language.segment`, and takes lemmas from the English lookup table of
``spacy-lookups-data`` corrected by :mod:`matcheck.language.lemmas`. A trained pipeline would
give slightly different sentences and lemmas on different machines depending on what happens
to be installed; the blank one makes every result reproducible and needs no model download.
"""

from __future__ import annotations

from functools import cache
from pathlib import Path


@cache
def _lemma_table() -> dict[str, str]:
    """Lower-case word -> lemma (:func:`_read_lemma_table`), kept between runs as a table."""
    from matcheck.language.tables import is_mapping, table

    def check(value: object) -> bool:
        return is_mapping(value, str)

    return table("en-lemma-lookup", "spacy-lookups-data", _read_lemma_table, check)


def _read_lemma_table() -> dict[str, str]:
    """Lower-case word -> lemma, from spaCy's English lookup lemmatizer data.

    The same file ``spacy.lookups.load_lookups("en", ["lemma_lookup"])`` reads, found through
    the same registry, kept as a plain dict: building spaCy's hashed ``Table`` from it took
    three quarters of the load time (about 0.07 s of 0.09 s) and looks words up no better.
    """
    table = lookups_data("lemma_lookup")
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


def lookups_data(name: str) -> object:
    """One of spacy-lookups-data's English tables, found as spaCy's lookups registry finds it
    (the package's ``en`` mapping) but without importing spaCy (~0.6 s)."""
    try:
        import spacy_lookups_data
    except ImportError:
        raise ValueError(f"spacy-lookups-data is not installed: no English {name}") from None
    return _json_data(Path(spacy_lookups_data.en[name]))


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
