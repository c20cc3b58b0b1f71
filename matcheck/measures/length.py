"""Length: how much there is to read, and how long it takes."""

from __future__ import annotations

from collections.abc import Iterator

from matcheck.findings import Tolerance
from matcheck.language.analysis import Analysis
from matcheck.measures.base import JUDGMENT, Cause, Group, Measurement, MeasureSpec, causes
from matcheck.model import BlockKind
from matcheck.settings import Settings

WORDS = MeasureSpec(
    "words",
    Group.LENGTH,
    "words",
    "Words in the lesson text (headings to footnotes, no captions)",
    Tolerance(relative=0.05, reason=f"5% of the reference; {JUDGMENT}"),
    label="Words",
    phrase="length",
    prose_unit=" words",
)
SENTENCES = MeasureSpec(
    "sentences",
    Group.LENGTH,
    "sentences",
    "Sentences in the running prose",
    Tolerance(relative=0.10, absolute=1, reason=f"10% of the reference; {JUDGMENT}"),
    # Fewer, longer sentences or simply less text.
    follows=causes("words_per_sentence", "words"),
    label="Sentences",
    phrase="the number of sentences",
)
PARAGRAPHS = MeasureSpec(
    "paragraphs",
    Group.LENGTH,
    "paragraphs",
    "Body paragraphs",
    Tolerance(relative=0.10, absolute=1, reason=f"10% (at least one paragraph); {JUDGMENT}"),
    # A list turned into prose (or back) moves both the other way; else passages went or came.
    follows=(Cause("list_items", opposite=True), *causes("passages_removed", "passages_added")),
    label="Paragraphs",
    phrase="the number of paragraphs",
)
CHARACTERS = MeasureSpec(
    "characters",
    Group.LENGTH,
    "characters",
    "Characters of the lesson text, spaces excluded",
    Tolerance(relative=0.05, reason="follows words: the same 5%"),
    follows=causes("words"),
    implied_by="words",
)
READING_TIME = MeasureSpec(
    "reading_time",
    Group.LENGTH,
    "minutes",
    "Words divided by the reading rate (--wpm)",
    Tolerance(relative=0.05, reason="follows words: the same 5%"),
    follows=causes("words"),
    implied_by="words",
    label="Reading time (min)",
    phrase="estimated reading time",
    prose_unit=" min",
)
SPECS = (WORDS, SENTENCES, PARAGRAPHS, CHARACTERS, READING_TIME)


def user_perceived_characters(text: str) -> int:
    """Characters as a reader sees them, spaces excluded: block text is already NFKC
    (readers/builder.py), and a combining mark that has no precomposed form with its base
    (UAX #15) counts with that base, not on its own. This approximates grapheme clusters
    (UAX #29) for marks; joiners are already removed by the readers."""
    import unicodedata

    return sum(1 for char in text if char != " " and unicodedata.category(char) not in ("Mn", "Me"))


def measure_length(analysis: Analysis, settings: Settings) -> Iterator[Measurement]:
    words = analysis.words()
    yield Measurement(WORDS, float(len(words)))
    yield Measurement(SENTENCES, float(len(analysis.sentences())))
    paragraphs = analysis.document.blocks_of(BlockKind.PARAGRAPH)
    yield Measurement(PARAGRAPHS, float(len(paragraphs)))
    characters = sum(
        user_perceived_characters(item.block.text)
        for item in analysis.blocks
        if item.block.kind not in (BlockKind.CAPTION, BlockKind.CODE)
    )
    yield Measurement(CHARACTERS, float(characters))
    yield Measurement(
        READING_TIME,
        len(words) / settings.words_per_minute,
        note=f"at {settings.words_per_minute:g} words per minute",
    )
