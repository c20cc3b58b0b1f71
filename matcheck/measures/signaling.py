"""Signaling: typographic emphasis that draws a reader to particular words.

Only body text counts (paragraphs, list items, table cells, footnotes): headings are often
bold by style, and captions belong to figures. A table cell emphasised from end to end (a
header row) does not count either. A word counts as emphasised with a kind when
every character of it lies inside a span of that kind.
"""

from __future__ import annotations

from collections import Counter
from collections.abc import Iterator

from matcheck.findings import Tolerance
from matcheck.language.analysis import Analysis
from matcheck.measures.base import JUDGMENT, Group, Measurement, MeasureSpec, causes
from matcheck.model import Block, BlockKind, Capability, Emphasis
from matcheck.settings import Settings

G = Group.SIGNALING
WORDS_TOLERANCE = Tolerance(relative=0.05, absolute=2, reason=f"5% (at least 2 words); {JUDGMENT}")
EMPHASIZED = MeasureSpec(
    "emphasized_words",
    G,
    "words",
    "Words with any emphasis (bold, italic, underline, highlight)",
    WORDS_TOLERANCE,
    needs=Capability.EMPHASIS,
    label="Emphasized words",
    phrase="the number of emphasized words",
)
# Underline and highlight need more than emphasis: a PDF shows bold and italic only.
KIND_NEEDS = {
    Emphasis.BOLD: Capability.EMPHASIS,
    Emphasis.ITALIC: Capability.EMPHASIS,
    Emphasis.UNDERLINE: Capability.UNDERLINE,
    Emphasis.HIGHLIGHT: Capability.HIGHLIGHT,
}
KIND_SPECS = {
    kind: MeasureSpec(
        f"{kind.value}_words",
        G,
        "words",
        f"Words in {kind.value}",
        WORDS_TOLERANCE,
        follows=causes("emphasized_words"),
        implied_by="emphasized_words",
        needs=KIND_NEEDS[kind],
    )
    for kind in Emphasis
}
TERMS = MeasureSpec(
    "emphasized_terms",
    G,
    "terms",
    "Distinct emphasised terms (a run of emphasised words)",
    Tolerance(relative=0.05, absolute=1, reason=f"5% (at least one term); {JUDGMENT}"),
    follows=causes("emphasized_words"),
    implied_by="emphasized_words",
    needs=Capability.EMPHASIS,
    listing="count",
)
SPECS = (EMPHASIZED, *KIND_SPECS.values(), TERMS)
BODY_KINDS = frozenset(
    {BlockKind.PARAGRAPH, BlockKind.LIST_ITEM, BlockKind.TABLE_CELL, BlockKind.FOOTNOTE}
)


def _kinds_at(block: Block, start: int, end: int) -> frozenset[Emphasis]:
    return frozenset(
        span.kind for span in block.emphasis if span.start <= start and end <= span.end
    )


def _wholly_emphasised(block: Block) -> bool:
    """A table cell in bold (or italic) from end to end: a header row's typography, which
    formats disagree about (a PDF shows a table style's bold header, DOCX and Markdown keep it
    in the style), not a term singled out in the text."""
    return any(span.start == 0 and span.end >= len(block.text) for span in block.emphasis)


def measure_signaling(analysis: Analysis, settings: Settings) -> Iterator[Measurement]:
    per_kind: Counter[Emphasis] = Counter()
    any_count = 0
    terms: Counter[str] = Counter()
    for item in analysis.of(BODY_KINDS):
        block = item.block
        if block.kind is BlockKind.TABLE_CELL and _wholly_emphasised(block):
            continue
        run: list[str] = []
        for word in item.words:
            kinds = _kinds_at(block, word.start, word.end) if block.emphasis else frozenset()
            per_kind.update(kinds)
            if kinds:
                any_count += 1
                run.append(word.lower)
            elif run:
                terms[" ".join(run)] += 1
                run = []
        if run:
            terms[" ".join(run)] += 1
    yield Measurement(EMPHASIZED, float(any_count))
    for kind, spec in KIND_SPECS.items():
        yield Measurement(spec, float(per_kind[kind]))
    items = tuple(
        sorted(((term, float(n)) for term, n in terms.items()), key=lambda t: (-t[1], t[0]))
    )
    yield Measurement(TERMS, float(len(terms)), items=items)
