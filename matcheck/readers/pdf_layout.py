"""From positioned fragments to lines and blocks, and running page furniture out of the way.

- A *line* is the run of consecutive fragments on one baseline (within ~half a font size, so
  super- and subscripts stay on their line).
- Running headers, footers and page numbers are short lines (15 words at most, not set
  larger than body text) in the top or bottom tenth of a page whose text, with digits as
  ``#``, comes back on at least half of the pages (and on two or more); bare page numbers in
  those bands go on any page. Images that repeat the same way (a logo in the header) go too.
- A *block* is a run of lines that a gap noticeably larger than the typical line spacing does
  not interrupt (more than 1.3 times the usual baseline-to-baseline distance for the size), nor
  a change of font size, a list marker, a first-line indent after a finished sentence, a short
  all-bold line above regular text, or a jump up the page (a new column).

The thresholds are common practice for PDF layout analysis, not published values.
"""

from __future__ import annotations

import math
import re
from collections import Counter
from collections.abc import Iterable
from dataclasses import dataclass
from itertools import pairwise

from matcheck.model import Emphasis
from matcheck.readers.builder import Run
from matcheck.readers.pdf_page import Fragment, PageContent, PlacedImage
from matcheck.readers.pdf_text import all_emphasised, ends_sentence, is_page_number
from matcheck.readers.pdf_text import list_marker_length as marker_length

# Two baselines closer than this share a line (a fraction of the larger font size).
_SAME_LINE = 0.6
# Top and bottom bands of a page where running headers and footers live.
_BAND = 0.10
# Running heads are a title and a page number, not a line of body text.
_RUNNING_WORDS = 15
_RUNNING_SIZE = 1.15
# A gap this many times the typical line spacing starts a new block.
_PARAGRAPH_GAP = 1.3
# Leading (baseline distance / font size) assumed when a document has no line pairs.
_DEFAULT_LEADING = 1.2
# Sizes closer than this ratio are one size (rounding in the PDF producer).
_SIZE_CHANGE = 1.08
# A line starting this many font sizes right of the block's left edge is a first-line indent.
_INDENT = 0.8
_BOLD_LINE_WORDS = 12
# Plausible line spacing (baseline distance / font size), and the share of line pairs a
# spacing needs to count as common.
_MIN_LEADING = 0.8
_MAX_LEADING = 3.0
_COMMON = 0.1
# Wider than this (1.5-line spacing and up) a spacing may be a paragraph gap; it is one when
# this share of its upper lines end a sentence (inside a paragraph few lines do).
_WIDE_LEADING = 1.6
_FINISHED = 0.8


def round_size(size: float) -> float:
    """Font sizes to the half point, so 11.0 and 10.98 count as one size."""
    return round(size * 2) / 2


@dataclass(slots=True)
class Line:
    page: int
    fragments: list[Fragment]
    x: float
    y: float
    size: float = 0.0

    @property
    def runs(self) -> list[Run]:
        return [(fragment.text, fragment.emphasis) for fragment in self.fragments]

    @property
    def text(self) -> str:
        return "".join(fragment.text for fragment in self.fragments)

    @property
    def monospace(self) -> bool:
        """Every visible character in a monospace font: a line of code."""
        shown = [fragment for fragment in self.fragments if fragment.text.strip()]
        return bool(shown) and all(fragment.monospace for fragment in shown)


@dataclass(slots=True)
class RawBlock:
    page: int
    lines: list[Line]
    # First block of its page or of a new column: a paragraph may go on from the block before.
    flow_start: bool
    # A table cell: the table's number in the document (see pdf_tables), else None.
    table: int | None = None

    @property
    def size(self) -> float:
        return dominant_size(self.lines)

    @property
    def top(self) -> float:
        first = self.lines[0]
        return first.y + first.size * 0.8

    @property
    def bottom(self) -> float:
        return self.lines[-1].y


def dominant_size(lines: Iterable[Line]) -> float:
    """The font size that carries the most characters (0 if none)."""
    weights: Counter[float] = Counter()
    for line in lines:
        for fragment in line.fragments:
            weights[round_size(fragment.size)] += len(fragment.text.strip())
    if not weights:
        return 0.0
    return max(weights.items(), key=lambda item: (item[1], item[0]))[0]


def build_lines(content: PageContent) -> list[Line]:
    lines: list[Line] = []
    current: Line | None = None
    for fragment in content.fragments:
        if not fragment.text.strip():
            # Spaces carry no reliable position; they only separate words on their line.
            if current is not None:
                current.fragments.append(fragment)
            continue
        if current is not None:
            limit = _SAME_LINE * max(fragment.size, current.size, 1.0)
            if abs(fragment.y - current.y) <= limit:
                current.fragments.append(fragment)
                current.size = max(current.size, fragment.size)
                continue
        current = Line(content.number, [fragment], fragment.x, fragment.y, fragment.size)
        lines.append(current)
    for line in lines:
        line.size = dominant_size([line])
    return lines


def _band(y: float, content: PageContent) -> str | None:
    height = content.top - content.bottom
    if height <= 0:
        return None
    if y >= content.top - _BAND * height:
        return "top"
    if y <= content.bottom + _BAND * height:
        return "bottom"
    return None


def _repeat_threshold(pages: int) -> int:
    return max(2, math.ceil(pages / 2))


def remove_running_lines(pages: list[PageContent], lines: list[list[Line]]) -> bool:
    """Drop running headers, footers and page numbers in place; True if any went."""
    keys: list[list[tuple[str, str] | None]] = []
    counts: Counter[tuple[str, str]] = Counter()
    # Running heads are set at body size or smaller; a heading that recurs ("Part 1" on one
    # page, "Part 2" on the next) is lesson text.
    largest = dominant_size(line for page_lines in lines for line in page_lines) * _RUNNING_SIZE
    for content, page_lines in zip(pages, lines, strict=True):
        page_keys: list[tuple[str, str] | None] = []
        for line in page_lines:
            band = _band(line.y, content)
            key = None
            if (
                band is not None
                and len(line.text.split()) <= _RUNNING_WORDS
                and (largest <= 0 or line.size < largest)
            ):
                key = (band, re.sub(r"\d+", "#", " ".join(line.text.split())))
            page_keys.append(key)
        counts.update(set(key for key in page_keys if key is not None))
        keys.append(page_keys)
    threshold = _repeat_threshold(len(pages))
    removed = False
    for page_lines, page_keys in zip(lines, keys, strict=True):
        kept = [
            line
            for line, key in zip(page_lines, page_keys, strict=True)
            if key is None or (counts[key] < threshold and not is_page_number(line.text))
        ]
        removed = removed or len(kept) < len(page_lines)
        page_lines[:] = kept
    return removed


def remove_running_images(pages: list[PageContent]) -> bool:
    """Drop images that repeat in the same band at the same size (logos); True if any went."""

    def key(image: PlacedImage, content: PageContent) -> tuple[object, ...] | None:
        band = _band(image.center, content)
        if band is None:
            return None
        width = round(image.width_cm, 1) if image.width_cm is not None else None
        height = round(image.height_cm, 1) if image.height_cm is not None else None
        return (band, image.width_px, image.height_px, width, height)

    counts: Counter[tuple[object, ...]] = Counter()
    for content in pages:
        counts.update(set(k for k in (key(i, content) for i in content.images) if k))
    threshold = _repeat_threshold(len(pages))
    removed = False
    for content in pages:
        kept = [
            image
            for image in content.images
            if (k := key(image, content)) is None or counts[k] < threshold
        ]
        removed = removed or len(kept) < len(content.images)
        content.images[:] = kept
    return removed


def typical_leading(lines: list[list[Line]]) -> float:
    """The usual baseline distance / font size between successive lines of one paragraph.

    Paragraph gaps are wider than line spacing, and a lesson of short paragraphs has more of
    them than line pairs inside paragraphs, so this is the tightest spacing that is common
    (at least twice and on a tenth of the line pairs), not the most common one. When even
    that spacing is wider than single spacing and nearly always follows a finished sentence,
    it is the gap between one-line paragraphs, and single spacing is assumed instead.
    """
    ratios: Counter[float] = Counter()
    finished: Counter[float] = Counter()
    for page_lines in lines:
        for above, below in pairwise(page_lines):
            ratio = _ratio(above, below)
            if ratio is not None:
                key = round(ratio * 20) / 20
                ratios[key] += 1
                finished[key] += ends_sentence(above.text)
    if not ratios:
        return _DEFAULT_LEADING
    total = sum(ratios.values())
    common = [ratio for ratio, count in ratios.items() if count >= max(2, total * _COMMON)]
    leading = min(common) if common else min(ratios)
    if leading > _WIDE_LEADING and finished[leading] >= _FINISHED * ratios[leading]:
        return _DEFAULT_LEADING
    return leading


def _ratio(above: Line, below: Line) -> float | None:
    """Baseline distance / font size of two same-size lines, None if not plausible spacing."""
    size = below.size
    if size <= 0 or round_size(above.size) != round_size(size):
        return None
    ratio = (above.y - below.y) / size
    return ratio if _MIN_LEADING <= ratio <= _MAX_LEADING else None


def _is_short_bold_line(line: Line) -> bool:
    text = line.text.strip()
    return (
        all_emphasised(line.runs, Emphasis.BOLD)
        and len(text.split()) <= _BOLD_LINE_WORDS
        and not ends_sentence(text)
        and not text.endswith(",")
    )


def _breaks(block: RawBlock, line: Line, leading: float) -> bool:
    above = block.lines[-1]
    if above.monospace != line.monospace:
        return True  # code starts or ends
    sizes = sorted((max(above.size, 0.1), max(line.size, 0.1)))
    if sizes[1] / sizes[0] > _SIZE_CHANGE:
        return True
    if marker_length(line.text) and not line.monospace:
        return True
    if line.monospace:
        # Lines of code keep together however they are indented; a blank line still splits.
        return above.y - line.y > _PARAGRAPH_GAP * leading * line.size + 0.5
    if len(block.lines) >= 2:
        # The block's own spacing, if tighter, tells its lines better than the document's.
        own = _ratio(block.lines[0], block.lines[1])
        if own is not None:
            leading = min(leading, own)
    gap = above.y - line.y
    if gap > _PARAGRAPH_GAP * leading * line.size + 0.5:
        return True
    left = min(item.x for item in block.lines)
    if (
        not marker_length(block.lines[0].text)
        and line.x > left + _INDENT * line.size
        and ends_sentence(above.text)
    ):
        return True
    bold_label = len(block.lines) == 1 and _is_short_bold_line(above)
    return bold_label and not all_emphasised(line.runs, Emphasis.BOLD)


def split_blocks(page_lines: list[Line], leading: float) -> list[RawBlock]:
    blocks: list[RawBlock] = []
    for line in page_lines:
        if not blocks:
            blocks.append(RawBlock(line.page, [line], flow_start=True))
            continue
        block = blocks[-1]
        above = block.lines[-1]
        if line.y > above.y + _SAME_LINE * max(line.size, above.size):
            # Up the page: a new column, or text drawn out of order.
            blocks.append(RawBlock(line.page, [line], flow_start=True))
        elif _breaks(block, line, leading):
            blocks.append(RawBlock(line.page, [line], flow_start=False))
        else:
            block.lines.append(line)
    return blocks
