"""Length: how much there is to read, and how long it takes."""

from __future__ import annotations

from collections.abc import Iterator

from matcheck.language.analysis import Analysis
from matcheck.measures.base import Group, Measurement, MeasureSpec
from matcheck.model import BlockKind
from matcheck.settings import Settings

WORDS = MeasureSpec(
    "words", Group.LENGTH, "words", "Words in the lesson text (headings to footnotes, no captions)"
)
SENTENCES = MeasureSpec("sentences", Group.LENGTH, "sentences", "Sentences in the running prose")
PARAGRAPHS = MeasureSpec("paragraphs", Group.LENGTH, "paragraphs", "Body paragraphs")
CHARACTERS = MeasureSpec(
    "characters", Group.LENGTH, "characters", "Characters of the lesson text, spaces excluded"
)
READING_TIME = MeasureSpec(
    "reading_time", Group.LENGTH, "minutes", "Words divided by the reading rate (--wpm)"
)
SPECS = (WORDS, SENTENCES, PARAGRAPHS, CHARACTERS, READING_TIME)


def measure_length(analysis: Analysis, settings: Settings) -> Iterator[Measurement]:
    words = analysis.words()
    yield Measurement(WORDS, float(len(words)))
    yield Measurement(SENTENCES, float(len(analysis.sentences())))
    paragraphs = analysis.document.blocks_of(BlockKind.PARAGRAPH)
    yield Measurement(PARAGRAPHS, float(len(paragraphs)))
    characters = sum(
        len(item.block.text) - item.block.text.count(" ")
        for item in analysis.blocks
        if item.block.kind is not BlockKind.CAPTION
    )
    yield Measurement(CHARACTERS, float(characters))
    yield Measurement(
        READING_TIME,
        len(words) / settings.words_per_minute,
        note=f"at {settings.words_per_minute:g} words per minute",
    )
