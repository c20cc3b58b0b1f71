"""Sentence boundaries against a published test set and the cases docs/measures.md lists.

The published set is the English "Golden Rules" for sentence boundary disambiguation (Dias,
Pragmatic Segmenter, MIT licence; docs/references.md §19), stored as
tests/data/golden_rules_en.json. The lesson cases (tests/data/lesson_sentences_en.json) are
our own, one per rule of matcheck/language/segment.py.
"""

from __future__ import annotations

import itertools
import json
from pathlib import Path

import pytest

from matcheck.language.analysis import analyze
from matcheck.language.segment import sentence_starts
from matcheck.language.tokenizer import english, sentence_spans
from matcheck.model import Block, BlockKind, Document, Location

DATA = Path(__file__).parent / "data"
GOLDEN = json.loads((DATA / "golden_rules_en.json").read_text(encoding="utf-8"))["cases"]
LESSON = json.loads((DATA / "lesson_sentences_en.json").read_text(encoding="utf-8"))["cases"]
# The pass rate recorded in docs/measures.md; the issue asks for at least 95 %.
GOLDEN_PASS_RATE = 47 / 48


def _split(text: str) -> list[str]:
    starts = [*sentence_starts(text), len(text)]
    return [text[a:b].strip() for a, b in itertools.pairwise(starts)]


def _token_split(text: str) -> list[str]:
    """Sentences as the analysis takes them: boundaries moved onto spaCy's token starts."""
    tokens = english().tokens(text)
    spans = sentence_spans(tokens, sentence_starts(text))
    return [
        text[tokens[a].idx : tokens[b - 1].idx + len(tokens[b - 1].text)].strip() for a, b in spans
    ]


def test_golden_rules_pass_rate() -> None:
    assert len(GOLDEN) == 48
    passed = sum(_split(case["text"]) == case["sentences"] for case in GOLDEN)
    assert passed / len(GOLDEN) >= 0.95
    assert passed / len(GOLDEN) == GOLDEN_PASS_RATE  # keep docs/measures.md true


def test_golden_rules_known_failure() -> None:
    # The one case missed: "6 P.M. Mr. Smith" ends a sentence but "5 a.m. Mr. Smith" does not;
    # no local rule can tell them apart (pySBD marks it as an expected failure too).
    failed = [case["text"] for case in GOLDEN if _split(case["text"]) != case["sentences"]]
    assert len(failed) == 1 and "6 P.M. Mr. Smith" in failed[0]


@pytest.mark.parametrize("case", LESSON, ids=lambda case: case["text"][:30])
def test_lesson_cases(case: dict[str, object]) -> None:
    assert _split(str(case["text"])) == case["sentences"]


@pytest.mark.parametrize("case", GOLDEN[:17] + LESSON[:12], ids=lambda case: case["text"][:30])
def test_token_starts_keep_the_same_sentences(case: dict[str, object]) -> None:
    # The boundaries become sentence starts on the one tokenisation of the text.
    assert _token_split(str(case["text"])) == case["sentences"]


def test_empty_and_wordless_text() -> None:
    assert sentence_starts("") == [0]
    assert sentence_starts("   ") == [0]
    assert _split("Done. . . .") == ["Done. . . ."]


def _document(*blocks: tuple[BlockKind, str]) -> Document:
    return Document(
        "x.md",
        "markdown",
        tuple(Block(kind, text, Location(i)) for i, (kind, text) in enumerate(blocks)),
    )


def test_units_are_never_glued_to_the_next_sentence() -> None:
    # docs/measures.md: list items, table cells, headings and captions are units of their own.
    analysis = analyze(
        _document(
            (BlockKind.HEADING, "Tools"),
            (BlockKind.LIST_ITEM, "A tyre lever"),
            (BlockKind.LIST_ITEM, "A pump"),
            (BlockKind.PARAGRAPH, "Use Fig. 2 as a guide. Step 1. Remove the wheel."),
        )
    )
    assert [len(item.sentences) for item in analysis.blocks] == [1, 1, 1, 2]
    assert [s.word_count for s in analysis.sentences()] == [3, 2, 6, 5]
