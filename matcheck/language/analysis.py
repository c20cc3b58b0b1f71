"""One language pass over a document: words, sentences and content terms per block.

Every measure and the comparison read this analysis rather than re-tokenising the text, so
each block is tokenised exactly once (:mod:`matcheck.language.tokenizer`).

Which blocks count for what (documented in docs/measures.md):

- *text* blocks (everything but captions and code) count towards length; caption text belongs
  to the figures it describes and is measured in the ``figures`` group; code lines are
  measured on their own (``code_blocks``, ``code_lines``) so that a listing does not move
  words, sentences or any readability formula;
- *prose* blocks (paragraphs, list items, footnotes) are the running text that readability
  formulas were made for; headings and table cells are not sentences;
- *passage* blocks (prose blocks and table cells) are what the content comparison reads;
  :func:`matcheck.measures.key_terms.passages` makes each whole table one passage. Code blocks
  are passages of the content comparison too (a changed code line is a content difference),
  but not of the key terms.

A block boundary always ends a sentence: a list item without a full stop is one sentence.
"""

from __future__ import annotations

from dataclasses import dataclass

from matcheck.language.words import Word, iter_words
from matcheck.model import Block, BlockKind, Document

TEXT_KINDS = frozenset(BlockKind) - {BlockKind.CAPTION, BlockKind.CODE}
PROSE_KINDS = frozenset({BlockKind.PARAGRAPH, BlockKind.LIST_ITEM, BlockKind.FOOTNOTE})
PASSAGE_KINDS = PROSE_KINDS | {BlockKind.TABLE_CELL}


@dataclass(frozen=True, slots=True)
class Sentence:
    """A sentence of one block: ``words`` indexes into ``BlockAnalysis.words`` (end exclusive)."""

    start: int
    end: int
    first_word: int
    end_word: int
    terms: tuple[str, ...]

    @property
    def word_count(self) -> int:
        return self.end_word - self.first_word


@dataclass(frozen=True, slots=True)
class BlockAnalysis:
    block: Block
    words: tuple[Word, ...]
    sentences: tuple[Sentence, ...]

    @property
    def terms(self) -> tuple[str, ...]:
        """Content lemmas of the block in order (stop words and non-words left out)."""
        return tuple(term for sentence in self.sentences for term in sentence.terms)


@dataclass(frozen=True, slots=True)
class Analysis:
    """A document with its language analysis; ``blocks`` parallels ``document.blocks``."""

    document: Document
    blocks: tuple[BlockAnalysis, ...]

    def of(self, kinds: frozenset[BlockKind]) -> tuple[BlockAnalysis, ...]:
        return tuple(item for item in self.blocks if item.block.kind in kinds)

    def words(self, kinds: frozenset[BlockKind] = TEXT_KINDS) -> list[Word]:
        return [word for item in self.of(kinds) for word in item.words]

    def sentences(self, kinds: frozenset[BlockKind] = PROSE_KINDS) -> list[Sentence]:
        return [sentence for item in self.of(kinds) for sentence in item.sentences]

    def sentence_words(self, kinds: frozenset[BlockKind] = PROSE_KINDS) -> list[list[Word]]:
        """The words of each sentence, in reading order."""
        return [
            list(item.words[sentence.first_word : sentence.end_word])
            for item in self.of(kinds)
            for sentence in item.sentences
            if sentence.word_count
        ]


def analyze(document: Document) -> Analysis:
    """Run the language pass over every block of ``document``."""
    from matcheck.language.pipeline import lemma, stop_words
    from matcheck.language.segment import sentence_starts
    from matcheck.language.tokenizer import english, sentence_spans

    stops = stop_words()
    tokenizer = english()
    results: list[BlockAnalysis] = []
    for block in document.blocks:
        text = block.text
        tokens = tokenizer.tokens(text)
        words = tuple(iter_words(text))
        starts = [word.start for word in words]
        sentences = []
        cursor = 0
        for first_token, end_token in sentence_spans(tokens, sentence_starts(text)):
            last = tokens[end_token - 1]
            begin, finish = tokens[first_token].idx, last.idx + len(last.text)
            first = cursor
            while cursor < len(words) and starts[cursor] < finish:
                cursor += 1
            terms = tuple(
                term
                for token in tokens[first_token:end_token]
                if token.text.isalpha() and len(token.text) > 1
                for lower in (token.text.lower(),)
                if lower not in stops
                for term in (lemma(lower),)
                if term not in stops
            )
            sentences.append(Sentence(begin, finish, first, cursor, terms))
        if sentences and cursor < len(words):
            last_sentence = sentences[-1]
            sentences[-1] = Sentence(
                last_sentence.start,
                last_sentence.end,
                last_sentence.first_word,
                len(words),
                last_sentence.terms,
            )
        results.append(BlockAnalysis(block, words, tuple(s for s in sentences if s.word_count)))
    return Analysis(document, tuple(results))
