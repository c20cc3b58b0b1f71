"""Build the demo fixtures: one short lesson in five versions and three formats, and a post-test.

The lesson is written once, below, as structured data (a list of block records). Inline emphasis
is marked with ``**bold**`` and ``_italic_``; the marks must sit on word boundaries so that the
"a word is emphasised when all its characters are" rule gives the same answer in every format.
From that one source the script renders Markdown, DOCX (python-docx) and PDF (fpdf2) for each
version, draws the three diagrams with Pillow, and writes ``expected.json`` with the counts
known by construction, computed from the source data and never by reading the outputs back.
Four of the versions form a 2x2 design (diagrams none/with x signaling emphasised/plain). The
post-test (``POSTTEST``) is rendered as Markdown and CSV; which paragraph teaches each item is
checked against the lesson data here, and recorded in ``expected.json``.

Run from the repository root, with the test extra installed (``pip install -e '.[test]'``)::

    python scripts/build_fixtures.py

The build is deterministic: fixed metadata dates, fixed ZIP timestamps in the DOCX files and
no randomness, so a rebuild with the same library versions gives the same bytes.
"""

from __future__ import annotations

import csv
import io
import json
import re
import sys
import zipfile
from collections import Counter
from collections.abc import Callable, Iterable
from dataclasses import dataclass, replace
from datetime import UTC, datetime
from pathlib import Path
from typing import TYPE_CHECKING, Literal

if TYPE_CHECKING:
    from PIL import ImageDraw

ROOT = Path(__file__).resolve().parent.parent
OUT = ROOT / "fixtures" / "demo"
IMAGES = OUT / "images"

TITLE = "Fixing a Flat Bicycle Tyre"
DOCX_FOOTER = "Cycle maintenance handout"
PDF_FOOTER = "Page {n}"
# One fixed instant for every metadata date the libraries let us set.
FIXED_DATE = datetime(2024, 1, 15, 9, 0, 0, tzinfo=UTC)
ZIP_DATE = (2024, 1, 15, 9, 0, 0)
SIZE_BUDGET = 500 * 1024  # the fixtures folder is kept under 500 KB

Kind = Literal["heading", "paragraph", "bullets", "numbered", "table", "figure"]


@dataclass(frozen=True)
class Block:
    """One block of the lesson source.

    ``tag`` marks the paragraph the confounded version drops; ``split`` holds the same
    paragraph with its long sentences cut into short ones (used by the confounded version);
    ``changed_items`` holds a list whose facts the confounded version states differently.
    """

    kind: Kind
    text: str = ""
    level: int = 0
    items: tuple[str, ...] = ()
    rows: tuple[tuple[str, ...], ...] = ()
    figure: str = ""
    tag: str = ""
    split: str = ""
    changed_items: tuple[str, ...] = ()


@dataclass(frozen=True)
class FigureSpec:
    key: str
    filename: str
    width_px: int
    height_px: int
    display_width_cm: float
    caption: str
    alt_text: str

    @property
    def display_height_cm(self) -> float:
        return round(self.display_width_cm * self.height_px / self.width_px, 4)


FIGURES: dict[str, FigureSpec] = {
    spec.key: spec
    for spec in (
        FigureSpec(
            "valves",
            "valve-types.png",
            600,
            400,
            12.0,
            "Figure 1. The three common valve types: Schrader, Presta and Dunlop.",
            "Drawing of three valves standing on a rim. The Schrader valve is short and wide "
            "with a pin in the middle, the Presta valve is slim with a lock nut at the top, and "
            "the Dunlop valve has a collar below its cap.",
        ),
        FigureSpec(
            "levers",
            "tyre-levers.png",
            640,
            360,
            12.8,
            "Figure 2. Two tyre levers lifting the bead over the rim wall.",
            "Drawing of the top of a wheel. One tyre lever is hooked under the bead and pulled "
            "down to a spoke; a second lever is pushed in a hand's width away.",
        ),
        FigureSpec(
            "patch",
            "patch-placement.png",
            500,
            500,
            8.0,
            "Figure 3. Placing the patch centred over the marked hole.",
            "Drawing of a stretch of inner tube seen from above: a chalk cross marks the hole, "
            "a grey circle of rubber cement surrounds it and a round patch sits in the centre.",
        ),
    )
}

REMOVED_TAG = "removed-in-confounded"

# The lesson. Body text is identical in every version except where the confounded version
# drops the tagged paragraph or uses the ``split`` text.
LESSON: tuple[Block, ...] = (
    Block("heading", TITLE, level=1),
    Block(
        "paragraph",
        "A flat tyre is the most common breakdown on a bicycle, and it is also one of the "
        "easiest to fix at home. With a few cheap tools and about twenty minutes you can find "
        "the leak, seal it with a patch and ride again. This lesson walks through the whole "
        "job, from taking the wheel off to pumping the tyre back up to the right pressure.",
    ),
    Block(
        "paragraph",
        "Most flats are caused by a small sharp object, such as a thorn or a shard of glass, "
        "that works its way through the tread and into the **inner tube** inside the tyre. "
        "Others come from a hard knock against a kerb that squeezes the tube against the rim "
        "and leaves two small cuts side by side, a kind of damage known as a "
        "_snakebite_ puncture.",
    ),
    Block("heading", "Tools and Materials", level=2),
    Block(
        "paragraph",
        "You do not need a workshop to repair a puncture. Everything on the list below fits "
        "into a small saddle bag, and most of it costs less than a cup of coffee. Check the "
        "kit before a long ride, because the glue in an opened tube dries out within a few "
        "months.",
    ),
    Block(
        "bullets",
        items=(
            "Two or three plastic **tyre levers** for lifting the tyre off the rim",
            "A puncture repair kit with patches, rubber cement and a small square of sandpaper",
            "A pump or a gas cartridge that fits your valve",
            "A piece of chalk or a pen to mark the hole",
            "A bowl of water for finding slow leaks",
        ),
    ),
    Block(
        "paragraph",
        "If you often ride on rough roads, a spare tube is worth carrying as well as the "
        "patches. A fresh tube can be fitted in five minutes at the roadside, and the "
        "punctured one can be patched later at home, where it is warm, dry and well lit.",
    ),
    Block("heading", "Know Your Valve", level=2),
    Block(
        "paragraph",
        "Before you pump or deflate anything, look at the **valve** that sticks out through "
        "the rim. Three types are in common use, and each needs a slightly different pump "
        "head. The table below compares them.",
    ),
    Block("figure", figure="valves"),
    Block(
        "table",
        rows=(
            ("Valve", "Where you find it", "How to inflate"),
            ("Schrader", "Mountain bikes, city bikes and cars", "Press the pump head on"),
            ("Presta", "Road bikes and many newer bikes", "Unscrew the lock nut first"),
            ("Dunlop", "Older city bikes in Europe and Asia", "Use a Presta pump head"),
        ),
    ),
    Block(
        "paragraph",
        "A Presta valve is thin and has a tiny nut at the top that must be opened before air "
        "can flow in either direction. A Schrader valve looks like the one on a car tyre and "
        "has a spring-loaded pin in the middle. Pressing the pin with a fingernail lets the air "
        "out quickly, which is handy when you want to empty the tube completely.",
    ),
    Block("heading", "Removing the Tyre", level=2),
    Block(
        "paragraph",
        "If the flat is at the back, shift to the smallest rear sprocket first. Then open the "
        "brake or release its cable so that the tyre can pass between the brake pads. Open "
        "the **quick release** lever or loosen the axle nuts, and lift the wheel out of the "
        "frame.",
    ),
    Block(
        "paragraph",
        "Let out any air that remains in the tube and push the valve up into the tyre. Then "
        "squeeze both edges of the tyre towards the centre of the rim all the way round. The "
        "centre is deeper than the sides, which gives you the slack to lift the tyre off.",
        tag=REMOVED_TAG,
    ),
    Block(
        "paragraph",
        "Hook the scooped end of a tyre lever under the _bead_ opposite the valve and pull "
        "it down so that the bead comes over the rim wall. Clip the lever to a spoke, push a "
        "second lever in a hand's width away and slide it around the rim until one side of the "
        "tyre is free. Pull the tube out, starting on the side away from the valve.",
    ),
    Block("figure", figure="levers"),
    Block("heading", "Finding and Patching the Hole", level=2),
    Block(
        "paragraph",
        "Pump a little air into the tube and listen for a hiss, or pass the tube close to your "
        "cheek, which feels moving air better than your fingers do. For a slow leak, hold the "
        "tube under water a short section at a time and watch for a thin line of bubbles. Mark "
        "the hole with chalk as soon as you find it.",
    ),
    Block(
        "paragraph",
        "Before you patch, run your fingers carefully around the inside of the tyre to find "
        "whatever caused the flat. A thorn or a sliver of glass left in the tread will puncture "
        "the new patch within minutes. Lay the tube next to the tyre with the valve at the "
        "valve hole to see where to look.",
    ),
    Block("heading", "Applying the Patch", level=3),
    Block(
        "paragraph",
        "A _vulcanising_ patch does not stick like tape. The rubber cement reacts with the tube "
        "and the patch so that the two bond into a single piece, which is why the steps below "
        "include a pause that many people skip.",
    ),
    Block(
        "numbered",
        items=(
            "Roughen an area a little larger than the patch with the sandpaper.",
            "Spread a thin, even layer of **rubber cement** over the roughened area.",
            "Wait until the cement turns from glossy to dull, which takes about five minutes.",
            "Peel the foil from the patch without touching its sticky side.",
            "Press the patch onto the tube, centred over the hole, and squeeze it for a minute.",
            "Leave the clear backing film in place and dust the area with chalk.",
        ),
        # The confounded version's changed fact: the waiting time, one word.
        changed_items=(
            "Roughen an area a little larger than the patch with the sandpaper.",
            "Spread a thin, even layer of **rubber cement** over the roughened area.",
            "Wait until the cement turns from glossy to dull, which takes about two minutes.",
            "Peel the foil from the patch without touching its sticky side.",
            "Press the patch onto the tube, centred over the hole, and squeeze it for a minute.",
            "Leave the clear backing film in place and dust the area with chalk.",
        ),
    ),
    Block("figure", figure="patch"),
    Block(
        "paragraph",
        "A patch that lifts at the edges after a day was usually pressed on while the cement "
        "was still wet. If that happens, peel it off, roughen the area again and start with "
        "fresh cement rather than adding more on top.",
    ),
    Block("heading", "Refitting and Inflating", level=2),
    Block(
        "paragraph",
        "Put just enough air into the tube to give it a round shape, because a limp tube twists "
        "easily and gets caught under the tyre. Push the valve through the valve hole first and "
        "then tuck the rest of the tube inside the tyre.",
        split="Put just enough air into the tube to give it a round shape. A limp tube twists "
        "easily. It gets caught under the tyre. Push the valve through the valve hole first. "
        "Then tuck the rest of the tube inside the tyre.",
    ),
    Block(
        "paragraph",
        "Start at the valve and press the second bead back over the rim with your thumbs, and "
        "then work both hands round until they meet opposite the valve. The last part is always "
        "the tightest, so avoid using a tyre lever for it, since a lever can trap the tube and "
        "cut a fresh hole.",
        split="Start at the valve. Press the second bead back over the rim with your thumbs. "
        "Then work both hands round until they meet opposite the valve. The last part is always "
        "the tightest. Avoid using a tyre lever for it. A lever can trap the tube and cut a "
        "fresh hole.",
    ),
    Block(
        "paragraph",
        "Check on both sides that no part of the tube pokes out under the bead and that the line "
        "moulded into the tyre sits evenly above the rim. Inflate to the **pressure** printed on "
        "the sidewall and refit the wheel. Close the brake again and spin the wheel to check "
        "that it runs straight.",
        split="Check on both sides that no part of the tube pokes out under the bead. Check that "
        "the line moulded into the tyre sits evenly above the rim. Inflate to the **pressure** "
        "printed on the sidewall. Refit the wheel. Close the brake again. Spin the wheel to "
        "check that it runs straight.",
    ),
)

# The first three came first; tests rely on their files and counts, so their order and
# content stay as they were. The "-plain" versions are their twins with every emphasis mark
# removed (the signaling factor of the 2x2 design).
VERSIONS = ("text-only", "diagrams", "diagrams-confounded", "text-plain", "diagrams-plain")
PLAIN_TWIN = {"text-plain": "text-only", "diagrams-plain": "diagrams"}
DESIGN_CELLS = {
    # version: (diagrams level, signaling level)
    "text-only": ("none", "bold key terms"),
    "diagrams": ("with", "bold key terms"),
    "text-plain": ("none", "plain"),
    "diagrams-plain": ("with", "plain"),
}

# --- inline emphasis --------------------------------------------------------------------

# A run is (text, bold, italic).
Run = tuple[str, bool, bool]
_MARK = re.compile(r"\*\*(?P<bold>[^*]+?)\*\*|(?<![\w])_(?P<italic>[^_]+?)_(?![\w])")
_WORD = re.compile(r"\S+")


def parse_inline(source: str) -> list[Run]:
    """Split marked-up text into runs; reject marks that are not on word boundaries."""
    runs: list[Run] = []
    position = 0
    for match in _MARK.finditer(source):
        before = source[match.start() - 1] if match.start() else " "
        after = source[match.end()] if match.end() < len(source) else " "
        if not (before.isspace() and after.isspace()):
            raise ValueError(f"emphasis must sit on word boundaries: {match.group(0)!r}")
        if match.start() > position:
            runs.append((source[position : match.start()], False, False))
        if match.group("bold") is not None:
            runs.append((match.group("bold"), True, False))
        else:
            runs.append((match.group("italic"), False, True))
        position = match.end()
    if position < len(source):
        runs.append((source[position:], False, False))
    plain = "".join(text for text, _, _ in runs)
    if "*" in plain or "_" in plain:
        raise ValueError(f"stray emphasis mark in {source!r}")
    return runs


def plain(source: str) -> str:
    return "".join(text for text, _, _ in parse_inline(source))


def is_word(token: str) -> bool:
    """The fixture word rule: a run of non-space characters with a letter or a digit."""
    return any(char.isalnum() for char in token)


def words(source: str) -> list[str]:
    return [token for token in _WORD.findall(plain(source)) if is_word(token)]


def emphasised_words(source: str) -> tuple[list[str], list[str]]:
    """Words whose every character is bold, and those whose every character is italic."""
    bold_flags: list[bool] = []
    italic_flags: list[bool] = []
    text = ""
    for piece, bold, italic in parse_inline(source):
        text += piece
        bold_flags += [bold] * len(piece)
        italic_flags += [italic] * len(piece)
    bold_words: list[str] = []
    italic_words: list[str] = []
    for match in _WORD.finditer(text):
        if not is_word(match.group()):
            continue
        span = range(match.start(), match.end())
        if all(bold_flags[i] for i in span):
            bold_words.append(match.group())
        if all(italic_flags[i] for i in span):
            italic_words.append(match.group())
    return bold_words, italic_words


def sentences(source: str) -> list[str]:
    # The split section is written without abbreviations, so end punctuation ends a sentence.
    return [part for part in re.split(r"(?<=[.!?])\s+", plain(source).strip()) if part]


# --- versions -------------------------------------------------------------------------


def strip_emphasis(block: Block) -> Block:
    """The same block with every bold and italic mark removed: same words, no emphasis."""
    return replace(
        block,
        text=plain(block.text),
        items=tuple(plain(item) for item in block.items),
        rows=tuple(tuple(plain(cell) for cell in row) for row in block.rows),
        split=plain(block.split),
    )


def version_blocks(version: str) -> list[Block]:
    """The block sequence of one version, derived from the single lesson source."""
    if version in PLAIN_TWIN:
        return [strip_emphasis(block) for block in version_blocks(PLAIN_TWIN[version])]
    blocks = list(LESSON)
    if version == "text-only":
        return [block for block in blocks if block.kind != "figure"]
    if version == "diagrams":
        return blocks
    if version == "diagrams-confounded":
        return [
            replace(block, text=block.split, split="")
            if block.split
            else replace(block, items=block.changed_items, changed_items=())
            if block.changed_items
            else block
            for block in blocks
            if block.tag != REMOVED_TAG
        ]
    raise ValueError(version)


def text_sources(blocks: Iterable[Block]) -> list[tuple[str, str]]:
    """(kind, marked-up text) for every text block that counts as lesson text."""
    out: list[tuple[str, str]] = []
    for block in blocks:
        if block.kind in ("heading", "paragraph"):
            out.append((block.kind, block.text))
        elif block.kind in ("bullets", "numbered"):
            out.extend(("list_item", item) for item in block.items)
        elif block.kind == "table":
            out.extend(("table_cell", cell) for row in block.rows for cell in row if cell)
    return out


def section_of(blocks: list[Block], target: Block) -> str:
    heading = ""
    for block in blocks:
        if block.kind == "heading":
            heading = plain(block.text)
        if block is target:
            return heading
    raise ValueError("block not in lesson")


def expected_counts(version: str) -> dict[str, object]:
    blocks = version_blocks(version)
    sources = text_sources(blocks)
    figures = [FIGURES[block.figure] for block in blocks if block.kind == "figure"]
    bold: list[str] = []
    italic: list[str] = []
    for _, source in sources:
        b, i = emphasised_words(source)
        bold += b
        italic += i
    headings = Counter(str(block.level) for block in blocks if block.kind == "heading")
    section_words: dict[str, int] = {}
    current = ""
    for block in blocks:
        if block.kind == "heading":
            current = plain(block.text)
            section_words.setdefault(current, 0)
        section_words[current] = section_words.get(current, 0) + sum(
            len(words(text)) for _, text in text_sources([block])
        )
    lists = [block for block in blocks if block.kind in ("bullets", "numbered")]
    return {
        "files": {fmt: f"{version}.{fmt}" for fmt in ("md", "docx", "pdf")},
        "words": sum(len(words(text)) for _, text in sources),
        "caption_words": sum(len(words(spec.caption)) for spec in figures),
        "headings": {level: headings[level] for level in sorted(headings)},
        "paragraphs": sum(1 for kind, _ in sources if kind == "paragraph"),
        "lists": len(lists),
        "list_items": sum(len(block.items) for block in lists),
        "tables": sum(1 for block in blocks if block.kind == "table"),
        "table_cells": sum(1 for kind, _ in sources if kind == "table_cell"),
        "figures": len(figures),
        "figures_without_alt_text": sum(1 for spec in figures if not spec.alt_text),
        "captions": sum(1 for spec in figures if spec.caption),
        "bold_words": len(bold),
        "italic_words": len(italic),
        # Emphasis spans as marked in the source, and the words they cover.
        "bold_terms": [text for _, src in sources for text, b, _ in parse_inline(src) if b],
        "italic_terms": [text for _, src in sources for text, _, i in parse_inline(src) if i],
        "bold_word_list": bold,
        "italic_word_list": italic,
        "heading_list": [[b.level, plain(b.text)] for b in blocks if b.kind == "heading"],
        "section_words": section_words,
        "figure_files": [f"images/{spec.filename}" for spec in figures],
    }


def confound_details() -> dict[str, object]:
    """What the confounded version changed besides the figures, from the source data."""
    removed = next(block for block in LESSON if block.tag == REMOVED_TAG)
    split_blocks = [block for block in LESSON if block.split]
    split_sections = {section_of(list(LESSON), block) for block in split_blocks}
    if len(split_sections) != 1:
        raise ValueError("split paragraphs must all be in one section")
    before_sentences = [s for block in split_blocks for s in sentences(block.text)]
    after_sentences = [s for block in split_blocks for s in sentences(block.split)]

    def bag(texts: Iterable[str]) -> Counter[str]:
        # Case-folded, edge punctuation stripped: "Then" and "then," are one word.
        return Counter(w.lower().strip(",.;:") for text in texts for w in words(text))

    before_words = bag(b.text for b in split_blocks)
    after_words = bag(b.split for b in split_blocks)
    removed_words = len(words(removed.text))
    if not 40 <= removed_words <= 60:
        raise ValueError(f"removed paragraph has {removed_words} words, want 40-60")

    def mean(items: list[str]) -> float:
        return round(sum(len(words(s)) for s in items) / len(items), 2)

    return {
        "removed_paragraph": {
            "section": section_of(list(LESSON), removed),
            "text": plain(removed.text),
            "words": removed_words,
            # 1-based among the body paragraphs of the diagrams version.
            "paragraph_ordinal_in_diagrams": [
                block for block in LESSON if block.kind == "paragraph"
            ].index(removed)
            + 1,
        },
        "split_section": {
            "section": split_sections.pop(),
            "paragraphs": len(split_blocks),
            "sentences_before": len(before_sentences),
            "sentences_after": len(after_sentences),
            "words_before": sum(len(words(b.text)) for b in split_blocks),
            "words_after": sum(len(words(b.split)) for b in split_blocks),
            "mean_words_per_sentence_before": mean(before_sentences),
            "mean_words_per_sentence_after": mean(after_sentences),
            # The joining words that changed (case-folded, edge punctuation stripped).
            "joining_words_removed": sorted((before_words - after_words).elements()),
            "joining_words_added": sorted((after_words - before_words).elements()),
        },
        "changed_fact": changed_fact(),
    }


def changed_fact() -> dict[str, object]:
    """The one item whose fact the confounded version states differently, word for word."""
    [block] = [block for block in LESSON if block.changed_items]
    pairs = [(a, b) for a, b in zip(block.items, block.changed_items, strict=True) if a != b]
    if len(pairs) != 1:
        raise ValueError("the confounded version changes exactly one list item")
    before, after = (plain(text) for text in pairs[0])
    changed = [(a, b) for a, b in zip(words(before), words(after), strict=True) if a != b]
    if len(changed) != 1:
        raise ValueError("the changed fact is one word")
    return {
        "section": section_of(list(LESSON), block),
        "item": block.items.index(pairs[0][0]) + 1,
        "before": before,
        "after": after,
        "word_before": changed[0][0],
        "word_after": changed[0][1],
    }


# --- post-test ------------------------------------------------------------------------


@dataclass(frozen=True)
class Item:
    """One post-test item.

    ``section`` and ``opening`` name the body paragraph that teaches the item (its heading and
    its first words); both empty for an item no version teaches. ``key_words`` are the content
    words the item turns on: each must occur in the question or answer, and in the teaching
    paragraph. For the item taught only by the removed paragraph, ``unique_words`` must occur
    nowhere else in any version; for the untaught item, ``key_words`` must occur nowhere.
    """

    id: str
    question: str
    answer: str
    key_words: tuple[str, ...]
    section: str = ""
    opening: str = ""
    unique_words: tuple[str, ...] = ()


POSTTEST: tuple[Item, ...] = (
    Item(
        "Q1",
        "What is a snakebite puncture, and what causes it?",
        "Two small cuts side by side in the tube, left when a hard knock against a kerb "
        "squeezes the tube against the rim.",
        ("snakebite", "cuts", "kerb", "knock"),
        section=TITLE,
        opening="Most flats are caused by",
    ),
    Item(
        "Q2",
        "Why should you check your repair kit before a long ride?",
        "Because the glue in an opened tube dries out within a few months.",
        ("kit", "glue", "opened", "dries", "months"),
        section="Tools and Materials",
        opening="You do not need a",
    ),
    Item(
        "Q3",
        "How can you let the air out of a Schrader valve quickly?",
        "Press the spring-loaded pin in the middle of the valve with a fingernail.",
        ("schrader", "spring-loaded", "pin", "fingernail"),
        section="Know Your Valve",
        opening="A Presta valve is thin",
    ),
    Item(
        "Q4",
        "How do you find a slow leak that you cannot hear?",
        "Hold the tube under water a short section at a time and watch for a thin line of bubbles.",
        ("slow", "leak", "water", "bubbles"),
        section="Finding and Patching the Hole",
        opening="Pump a little air into",
    ),
    Item(
        "Q5",
        "How does a vulcanising patch hold onto the tube?",
        "The rubber cement reacts with the tube and the patch, so the two bond into a single "
        "piece.",
        ("vulcanising", "cement", "reacts", "bond", "single", "piece"),
        section="Applying the Patch",
        opening="A vulcanising patch does not",
    ),
    Item(
        "Q6",
        "Before you lever the tyre off, what do you do with its edges, and why does that help?",
        "Squeeze both edges of the tyre towards the centre of the rim: the centre is deeper "
        "than the sides, which gives you the slack to lift the tyre off.",
        ("squeeze", "edges", "centre", "deeper", "slack"),
        section="Removing the Tyre",
        opening="Let out any air that",
        unique_words=("deeper", "slack"),
    ),
    Item(
        "Q7",
        "What does the liquid sealant inside a tubeless tyre do when a thorn goes through it?",
        "It flows into the hole and plugs it, so a small puncture stops leaking without a patch.",
        ("liquid", "sealant", "tubeless", "plugs"),
    ),
)


def folded(text: str) -> list[str]:
    """Words case-folded with edge punctuation stripped: "Centre," and "centre" are one."""
    return [w.lower().strip(",.;:!?()'\"") for w in words(text)]


def word_counts_outside(version: str, paragraph: str = "") -> Counter[str]:
    """Folded words of everything a reader of the version sees (body, captions, alt text),
    leaving out the body paragraph whose plain text is ``paragraph``."""
    counts: Counter[str] = Counter()
    for block in version_blocks(version):
        if block.kind == "paragraph" and paragraph and plain(block.text) == paragraph:
            continue
        texts = [text for _, text in text_sources([block])]
        if block.kind == "figure":
            texts += [FIGURES[block.figure].caption, FIGURES[block.figure].alt_text]
        counts.update(w for text in texts for w in folded(text))
    return counts


def most_outside(key_words: Iterable[str], paragraph: str = "") -> dict[str, int]:
    """For each word, the most times any one version shows it outside ``paragraph``."""
    per_version = [word_counts_outside(v, paragraph) for v in VERSIONS]
    return {w: max(counts[w] for counts in per_version) for w in key_words}


def teaching_paragraph(item: Item) -> Block:
    """The one body paragraph of the lesson that ``item`` names by section and opening."""
    found = [
        block
        for block in LESSON
        if block.kind == "paragraph"
        and section_of(list(LESSON), block) == item.section
        and plain(block.text).startswith(item.opening)
    ]
    if len(found) != 1:
        raise ValueError(f"{item.id}: {len(found)} paragraphs match {item.opening!r}")
    return found[0]


def posttest_details() -> dict[str, object]:
    """The post-test items with what teaches each, checked against the lesson data."""
    ids = [item.id for item in POSTTEST]
    if ids != [f"Q{n}" for n in range(1, len(POSTTEST) + 1)]:
        raise ValueError(f"post-test ids must run Q1, Q2, ...: {ids}")
    items: list[dict[str, object]] = []
    for item in POSTTEST:
        asked = set(folded(item.question)) | set(folded(item.answer))
        for text in (item.question, item.answer):
            text.encode("latin-1")  # same character set as the lesson
        missing = [w for w in item.key_words if w not in asked]
        if missing:
            raise ValueError(f"{item.id}: key words not in question or answer: {missing}")
        record: dict[str, object] = {
            "id": item.id,
            "question": item.question,
            "answer": item.answer,
            "key_words": list(item.key_words),
        }
        if not item.section:
            # Untaught: none of its key words occurs in any version, captions included.
            present = {w: n for w, n in most_outside(item.key_words).items() if n}
            if present:
                raise ValueError(f"{item.id} is meant to be untaught but the lesson has {present}")
            record.update(taught=False, taught_by=None, taught_in_versions=[])
            items.append(record)
            continue
        source = teaching_paragraph(item)
        taught = Counter(folded(source.text))
        absent = [w for w in item.key_words if not taught[w]]
        if absent:
            raise ValueError(f"{item.id}: key words not in its teaching paragraph: {absent}")
        # A version teaches the item when its blocks hold the paragraph word for word (emphasis
        # aside); the confounded version's split sentences would not count, so none is used.
        versions = [
            v
            for v in VERSIONS
            if any(
                b.kind == "paragraph" and plain(b.text) == plain(source.text)
                for b in version_blocks(v)
            )
        ]
        elsewhere = most_outside(item.key_words, plain(source.text))
        if source.tag == REMOVED_TAG:
            if versions != [v for v in VERSIONS if v != "diagrams-confounded"]:
                raise ValueError(f"{item.id}: the removed paragraph is in {versions}")
            common = [w for w in item.unique_words if elsewhere[w]]
            if not item.unique_words or common:
                raise ValueError(f"{item.id}: unique words found elsewhere: {common}")
        elif versions != list(VERSIONS):
            raise ValueError(f"{item.id}: its paragraph is missing from some version")
        record.update(
            taught=True,
            taught_by={
                "section": item.section,
                "first_words": item.opening,
                "text": plain(source.text),
                "paragraph_ordinal_in_diagrams": [
                    block for block in LESSON if block.kind == "paragraph"
                ].index(source)
                + 1,
            },
            taught_in_versions=versions,
            # Occurrences of each key word in the teaching paragraph, and the most in any one
            # version outside it (body text, captions and alt text).
            key_words_in_teaching_paragraph={w: taught[w] for w in item.key_words},
            key_words_elsewhere=elsewhere,
        )
        if item.unique_words:
            record["unique_words"] = list(item.unique_words)
        items.append(record)
    return {
        "files": {"md": "posttest.md", "csv": "posttest.csv"},
        "rules": {
            "key_words": "case-folded, edge punctuation stripped, exact word forms "
            '("squeeze" and "squeezes" are different words)',
            "taught_in_versions": "versions that hold the teaching paragraph word for word, "
            "emphasis aside",
            "key_words_elsewhere": "the most times any one version shows the word outside the "
            "teaching paragraph, counting body text, captions and alt text",
        },
        "items": items,
        "untaught": [item.id for item in POSTTEST if not item.section],
        "taught_only_by_removed_paragraph": [
            item.id
            for item in POSTTEST
            if item.section and teaching_paragraph(item).tag == REMOVED_TAG
        ],
    }


def render_posttest_markdown(items: Iterable[Item]) -> str:
    # The answer is a second paragraph inside its list item (indented), so the list stays one.
    chunks = ["# Post-test"]
    for number, item in enumerate(items, 1):
        indent = " " * len(f"{number}. ")
        chunks.append(f"{number}. {item.question}\n\n{indent}Answer: {item.answer}")
    return "\n\n".join(chunks) + "\n"


def render_posttest_csv(items: Iterable[Item]) -> str:
    buffer = io.StringIO()
    writer = csv.writer(buffer)  # RFC 4180 style: CRLF line ends, quotes only where needed
    writer.writerow(("id", "question", "answer"))
    writer.writerows((item.id, item.question, item.answer) for item in items)
    return buffer.getvalue()


# --- diagrams -------------------------------------------------------------------------

INK = (40, 40, 40)
GREY = (150, 150, 150)
LIGHT = (215, 215, 215)
BLUE = (40, 90, 170)
ORANGE = (225, 120, 30)
RUBBER = (70, 70, 75)


def _label(draw: ImageDraw.ImageDraw, xy: tuple[float, float], text: str, size: int = 18) -> None:
    """Centred label on a white box so it stays legible over spokes and shapes."""
    from PIL import ImageFont

    font = ImageFont.load_default(size=size)
    left, top, right, bottom = draw.textbbox(xy, text, font=font, anchor="mm")
    draw.rectangle([left - 4, top - 3, right + 4, bottom + 3], fill=(255, 255, 255))
    draw.text(xy, text, fill=INK, font=font, anchor="mm")


def _leader(
    draw: ImageDraw.ImageDraw, start: tuple[float, float], end: tuple[float, float]
) -> None:
    draw.line([start, end], fill=INK, width=2)
    x, y = end
    draw.ellipse([x - 3, y - 3, x + 3, y + 3], fill=INK)


def draw_valves(draw: ImageDraw.ImageDraw) -> None:
    draw.rectangle([20, 300, 580, 330], fill=GREY)  # rim section
    _label(draw, (540, 352), "rim")
    # Schrader: short and wide, with a pin in the middle of the opening.
    draw.rectangle([95, 150, 145, 300], fill=RUBBER)
    draw.rectangle([90, 130, 150, 160], fill=INK)
    draw.rectangle([116, 120, 124, 140], fill=ORANGE)
    _leader(draw, (60, 95), (118, 124))
    _label(draw, (50, 80), "pin")
    _label(draw, (120, 370), "Schrader")
    # Presta: slim stem, lock nut at the top and a knurled nut against the rim.
    draw.rectangle([292, 70, 308, 300], fill=RUBBER)
    draw.rectangle([286, 60, 314, 78], fill=ORANGE)
    draw.rectangle([278, 275, 322, 298], fill=INK)
    _leader(draw, (370, 50), (312, 68))
    _label(draw, (410, 40), "lock nut")
    _label(draw, (300, 370), "Presta")
    # Dunlop: medium stem with a collar and a round cap.
    draw.rectangle([462, 150, 498, 300], fill=RUBBER)
    draw.rectangle([450, 200, 510, 216], fill=BLUE)
    draw.rounded_rectangle([456, 120, 504, 152], radius=10, fill=INK)
    _leader(draw, (545, 175), (508, 208))
    _label(draw, (555, 160), "collar")
    _label(draw, (480, 370), "Dunlop")


def draw_levers(draw: ImageDraw.ImageDraw) -> None:
    import math

    cx, cy = 320, 800  # wheel centre far below the picture: only the top of the wheel shows
    for radius, colour in ((700, RUBBER), (660, GREY), (635, (255, 255, 255))):
        draw.ellipse([cx - radius, cy - radius, cx + radius, cy + radius], fill=colour)
    for step in range(13):  # spokes, one of them at -105 degrees under lever 1
        angle = math.radians(-135 + 7.5 * step)
        outer = (cx + 635 * math.cos(angle), cy + 635 * math.sin(angle))
        inner = (cx + 380 * math.cos(angle), cy + 380 * math.sin(angle))
        draw.line([outer, inner], fill=GREY, width=3)
    # Lever 1: scoop under the bead, handle pulled down and clipped to a spoke.
    draw.line([(255, 135), (197, 330)], fill=BLUE, width=14)
    draw.ellipse([245, 125, 269, 149], fill=BLUE)
    # Lever 2: pushed in a hand's width away, handle still pointing up.
    draw.line([(395, 142), (445, 15)], fill=BLUE, width=14)
    draw.ellipse([385, 132, 409, 156], fill=BLUE)
    _leader(draw, (320, 60), (320, 140))
    _label(draw, (320, 55), "bead")
    _leader(draw, (80, 95), (120, 150))
    _label(draw, (80, 90), "tyre")
    _leader(draw, (540, 40), (444, 28))
    _label(draw, (560, 40), "second lever")
    _leader(draw, (100, 300), (198, 322))
    _label(draw, (90, 300), "lever on spoke")
    _leader(draw, (570, 290), (560, 200))
    _label(draw, (575, 295), "rim")


def draw_patch(draw: ImageDraw.ImageDraw) -> None:
    draw.rounded_rectangle([30, 170, 470, 330], radius=60, fill=RUBBER)  # tube from above
    draw.ellipse([160, 160, 340, 340], fill=LIGHT)  # roughened area with cement
    draw.ellipse([190, 190, 310, 310], outline=ORANGE, width=6)  # patch
    draw.line([(235, 235), (265, 265)], fill=(255, 255, 255), width=5)  # chalk cross
    draw.line([(235, 265), (265, 235)], fill=(255, 255, 255), width=5)
    _leader(draw, (250, 80), (250, 247))
    _label(draw, (250, 60), "hole marked with chalk")
    _leader(draw, (120, 420), (205, 290))
    _label(draw, (120, 440), "patch")
    _leader(draw, (380, 420), (330, 300))
    _label(draw, (380, 440), "cement area")


DRAWERS: dict[str, Callable[[ImageDraw.ImageDraw], None]] = {
    "valves": draw_valves,
    "levers": draw_levers,
    "patch": draw_patch,
}


def build_images() -> None:
    from PIL import Image, ImageDraw

    IMAGES.mkdir(parents=True, exist_ok=True)
    for spec in FIGURES.values():
        image = Image.new("RGB", (spec.width_px, spec.height_px), (255, 255, 255))
        DRAWERS[spec.key](ImageDraw.Draw(image))
        # A 16-colour palette keeps each PNG to a few kilobytes.
        small = image.quantize(colors=16, dither=Image.Dither.NONE)
        small.save(IMAGES / spec.filename, optimize=True)


# --- Markdown -------------------------------------------------------------------------


def md_inline(source: str) -> str:
    parts = []
    for text, bold, italic in parse_inline(source):
        parts.append(f"**{text}**" if bold else f"_{text}_" if italic else text)
    return "".join(parts)


def render_markdown(blocks: list[Block]) -> str:
    chunks: list[str] = []
    for block in blocks:
        if block.kind == "heading":
            chunks.append("#" * block.level + " " + md_inline(block.text))
        elif block.kind == "paragraph":
            chunks.append(md_inline(block.text))
        elif block.kind == "bullets":
            chunks.append("\n".join(f"- {md_inline(item)}" for item in block.items))
        elif block.kind == "numbered":
            chunks.append(
                "\n".join(f"{n}. {md_inline(item)}" for n, item in enumerate(block.items, 1))
            )
        elif block.kind == "table":
            header, *body = block.rows
            lines = ["| " + " | ".join(md_inline(cell) for cell in header) + " |"]
            lines.append("|" + "|".join(" --- " for _ in header) + "|")
            lines += ["| " + " | ".join(md_inline(cell) for cell in row) + " |" for row in body]
            chunks.append("\n".join(lines))
        elif block.kind == "figure":
            spec = FIGURES[block.figure]
            chunks.append(f"![{spec.alt_text}](images/{spec.filename})")
            chunks.append(spec.caption)
    return "\n\n".join(chunks) + "\n"


# --- DOCX -----------------------------------------------------------------------------


def render_docx(blocks: list[Block], path: Path) -> None:
    from docx import Document
    from docx.enum.text import WD_ALIGN_PARAGRAPH
    from docx.shared import Cm, Mm

    document = Document()
    props = document.core_properties
    props.title = TITLE
    props.author = "matcheck demo fixtures"
    props.last_modified_by = "matcheck demo fixtures"
    props.created = FIXED_DATE.replace(tzinfo=None)
    props.modified = FIXED_DATE.replace(tzinfo=None)
    props.revision = 1
    section = document.sections[0]
    section.page_width, section.page_height = Mm(210), Mm(297)
    # Running header and footer: not lesson text, a reader must leave them out.
    section.header.paragraphs[0].text = TITLE
    section.footer.paragraphs[0].text = DOCX_FOOTER

    def add_runs(paragraph: object, source: str) -> None:
        for text, bold, italic in parse_inline(source):
            run = paragraph.add_run(text)  # type: ignore[attr-defined]
            if bold:
                run.bold = True
            if italic:
                run.italic = True

    for block in blocks:
        if block.kind == "heading":
            add_runs(document.add_heading("", level=block.level), block.text)
        elif block.kind == "paragraph":
            add_runs(document.add_paragraph(), block.text)
        elif block.kind in ("bullets", "numbered"):
            style = "List Bullet" if block.kind == "bullets" else "List Number"
            for item in block.items:
                add_runs(document.add_paragraph(style=style), item)
        elif block.kind == "table":
            table = document.add_table(rows=len(block.rows), cols=len(block.rows[0]))
            table.style = "Table Grid"
            for row, cells in zip(table.rows, block.rows, strict=True):
                for cell, source in zip(row.cells, cells, strict=True):
                    add_runs(cell.paragraphs[0], source)
        elif block.kind == "figure":
            spec = FIGURES[block.figure]
            holder = document.add_paragraph()
            holder.alignment = WD_ALIGN_PARAGRAPH.CENTER
            shape = holder.add_run().add_picture(
                str(IMAGES / spec.filename), width=Cm(spec.display_width_cm)
            )
            shape._inline.docPr.set("descr", spec.alt_text)
            document.add_paragraph(spec.caption, style="Caption")
    buffer = io.BytesIO()
    document.save(buffer)
    path.write_bytes(_fixed_zip(buffer.getvalue()))


def _fixed_zip(data: bytes) -> bytes:
    """Rewrite a ZIP with fixed member timestamps (python-docx stamps the current time)."""
    out = io.BytesIO()
    with (
        zipfile.ZipFile(io.BytesIO(data)) as source,
        zipfile.ZipFile(out, "w", zipfile.ZIP_DEFLATED) as target,
    ):
        for info in source.infolist():
            member = zipfile.ZipInfo(info.filename, date_time=ZIP_DATE)
            member.compress_type = zipfile.ZIP_DEFLATED
            member.external_attr = 0o644 << 16
            target.writestr(member, source.read(info.filename), compresslevel=9)
    return out.getvalue()


# --- PDF ------------------------------------------------------------------------------

BODY_PT = 11.0
HEADING_PT = {1: 18.0, 2: 14.0, 3: 12.0}
LINE_MM = 5.5
BULLET = chr(149)  # WinAnsi bullet in the core fonts' encoding


def pdf_inline(source: str) -> str:
    """fpdf2's markdown mode: **bold** and __italic__."""
    parts = []
    for text, bold, italic in parse_inline(source):
        parts.append(f"**{text}**" if bold else f"__{text}__" if italic else text)
    return "".join(parts)


def render_pdf(blocks: list[Block], path: Path) -> int:
    """Write the PDF; returns its page count (known to the generator)."""
    from fpdf import FPDF
    from fpdf.fonts import FontFace

    class LessonPDF(FPDF):
        def header(self) -> None:
            self.set_font("helvetica", "", 9)
            self.set_text_color(110)
            self.set_y(10)
            self.cell(0, 5, TITLE, align="C")
            self.set_text_color(0)
            self.set_y(20)

        def footer(self) -> None:
            self.set_y(-15)
            self.set_font("helvetica", "", 9)
            self.set_text_color(110)
            self.cell(0, 5, PDF_FOOTER.format(n=self.page_no()), align="C")
            self.set_text_color(0)

    pdf = LessonPDF(orientation="portrait", unit="mm", format="A4")
    pdf.set_creation_date(FIXED_DATE)
    pdf.set_title(TITLE)
    pdf.set_author("matcheck demo fixtures")
    pdf.set_creator("scripts/build_fixtures.py")
    pdf.set_margins(20, 20, 20)
    pdf.set_auto_page_break(True, margin=20)
    pdf.add_page()
    width = pdf.w - pdf.l_margin - pdf.r_margin

    def body_font() -> None:
        pdf.set_font("helvetica", "", BODY_PT)

    def need(height: float) -> None:
        if pdf.get_y() + height > pdf.page_break_trigger:
            pdf.add_page()

    def item(marker: str, source: str) -> None:
        body_font()
        need(LINE_MM)
        pdf.set_x(pdf.l_margin + 4)
        pdf.cell(7, LINE_MM, marker)
        pdf.multi_cell(
            width - 11, LINE_MM, pdf_inline(source), markdown=True, new_x="LMARGIN", new_y="NEXT"
        )
        pdf.ln(1)

    for block in blocks:
        if block.kind == "heading":
            size = HEADING_PT[block.level]
            need(30)  # keep a heading with the start of its section
            pdf.ln(3 if block.level > 1 else 0)
            pdf.set_font("helvetica", "B", size)
            pdf.multi_cell(0, size * 0.5, plain(block.text), new_x="LMARGIN", new_y="NEXT")
            pdf.ln(2)
        elif block.kind == "paragraph":
            body_font()
            pdf.multi_cell(
                0, LINE_MM, pdf_inline(block.text), markdown=True, new_x="LMARGIN", new_y="NEXT"
            )
            pdf.ln(3)
        elif block.kind == "bullets":
            for source in block.items:
                item(BULLET, source)
            pdf.ln(2)
        elif block.kind == "numbered":
            for number, source in enumerate(block.items, 1):
                item(f"{number}.", source)
            pdf.ln(2)
        elif block.kind == "table":
            body_font()
            need(30)
            heading_style = FontFace(emphasis="", fill_color=(225, 225, 225))
            with pdf.table(
                col_widths=(25, 50, 45),
                text_align="LEFT",
                line_height=LINE_MM,
                headings_style=heading_style,
                markdown=True,
            ) as table:
                for cells in block.rows:
                    row = table.row()
                    for source in cells:
                        row.cell(pdf_inline(source))
            pdf.ln(4)
        elif block.kind == "figure":
            spec = FIGURES[block.figure]
            w_mm, h_mm = spec.display_width_cm * 10, spec.display_height_cm * 10
            need(h_mm + 12)
            top = pdf.get_y()
            pdf.image(
                str(IMAGES / spec.filename),
                x=(pdf.w - w_mm) / 2,
                y=top,
                w=w_mm,
                h=h_mm,
                alt_text=spec.alt_text,
            )
            pdf.set_y(top + h_mm + 2)
            pdf.set_font("helvetica", "", 9)
            pdf.multi_cell(0, 4.5, spec.caption, align="C", new_x="LMARGIN", new_y="NEXT")
            pdf.ln(4)
    pdf.output(str(path))
    return int(pdf.page_no())


# --- main -----------------------------------------------------------------------------


def check_source() -> None:
    """Guard the properties the expected counts rely on."""
    for kind, source in text_sources(LESSON):
        plain(source).encode("latin-1")  # the PDF core fonts are Latin-1 only
        if kind == "heading" and plain(source) != source:
            raise ValueError("headings carry no inline emphasis")
    for block in LESSON:
        if block.split:
            plain(block.split).encode("latin-1")
    for spec in FIGURES.values():
        spec.caption.encode("latin-1")
        if not re.match(r"Figure \d+\. ", spec.caption):
            raise ValueError(f"caption must start 'Figure N. ': {spec.caption!r}")
    diagrams, text_only = version_blocks("diagrams"), version_blocks("text-only")
    if text_sources(diagrams) != text_sources(text_only):
        raise ValueError("text-only and diagrams must have the same text")
    for version, twin in PLAIN_TWIN.items():
        mine, theirs = text_sources(version_blocks(version)), text_sources(version_blocks(twin))
        if [(k, plain(t)) for k, t in theirs] != mine or any(
            emphasised_words(t) != ([], []) for _, t in mine
        ):
            raise ValueError(f"{version} must be {twin}'s text with no emphasis")


def main() -> int:
    check_source()
    OUT.mkdir(parents=True, exist_ok=True)
    build_images()
    expected: dict[str, object] = {
        "lesson": TITLE,
        "generated_by": "scripts/build_fixtures.py (counts from the source data, not the files)",
        "rules": {
            "words": "a word is a maximal run of non-whitespace characters containing at least "
            "one letter or digit, counted over headings, body paragraphs, list items and "
            "table cells; not captions, not alt text, not list markers, not running "
            "headers or footers",
            "emphasis": "a word is bold (italic) when all its characters are inside bold "
            "(italic) inline emphasis; heading styles and the table header row are not "
            "emphasis (PDF headings are set in Helvetica-Bold, DOCX headings use the "
            "Heading styles, and neither counts)",
            "paragraphs": "body paragraphs only: not headings, list items, table cells, "
            "captions or figure holders",
            "table_cells": "non-empty cells, header row included",
        },
        "excluded_furniture": {
            "docx": {"header": TITLE, "footer": DOCX_FOOTER},
            "pdf": {"header": TITLE, "footer": PDF_FOOTER.replace("{n}", "N") + " (every page)"},
            "md": {},
        },
        "figures": [
            {
                "file": f"images/{spec.filename}",
                "width_px": spec.width_px,
                "height_px": spec.height_px,
                "display_width_cm": spec.display_width_cm,
                "display_height_cm": spec.display_height_cm,
                "display_size_in": ["docx", "pdf"],
                "caption": spec.caption,
                "alt_text": spec.alt_text,
                "caption_words": len(words(spec.caption)),
                "alt_text_words": len(words(spec.alt_text)),
                "section": section_of(
                    list(LESSON), next(b for b in LESSON if b.figure == spec.key)
                ),
            }
            for spec in FIGURES.values()
        ],
        "versions": {},
    }
    versions: dict[str, dict[str, object]] = {}
    for version in VERSIONS:
        blocks = version_blocks(version)
        counts = expected_counts(version)
        (OUT / f"{version}.md").write_text(render_markdown(blocks), encoding="utf-8")
        render_docx(blocks, OUT / f"{version}.docx")
        # Page count as laid out by the generator (not read back from the file).
        counts["pdf_pages"] = render_pdf(blocks, OUT / f"{version}.pdf")
        versions[version] = counts
    versions["diagrams-confounded"].update(confound_details())
    versions["diagrams"]["differs_from_text_only"] = "figures and their captions only"
    versions["diagrams-confounded"]["differs_from_diagrams"] = (
        "one paragraph removed and one section's sentences split"
    )
    for version, twin in PLAIN_TWIN.items():
        versions[version][f"differs_from_{twin.replace('-', '_')}"] = (
            "every bold and italic mark removed, nothing else"
        )
    expected["versions"] = versions
    expected["design"] = {
        "factors": {
            "diagrams": {
                "none": "no figures, no captions",
                "with": "the 3 figures with captions and alt text",
            },
            "signaling": {
                "bold key terms": "key terms emphasised as in the source: "
                f"{versions['text-only']['bold_words']} bold and "
                f"{versions['text-only']['italic_words']} italic words",
                "plain": "the same words with no bold or italic",
            },
        },
        "cells": [
            {"version": version, "diagrams": diagrams, "signaling": signaling}
            for version, (diagrams, signaling) in DESIGN_CELLS.items()
        ],
        "not_in_design": [v for v in VERSIONS if v not in DESIGN_CELLS],
    }
    expected["posttest"] = posttest_details()
    (OUT / "posttest.md").write_text(render_posttest_markdown(POSTTEST), encoding="utf-8")
    with (OUT / "posttest.csv").open("w", encoding="utf-8", newline="") as handle:
        handle.write(render_posttest_csv(POSTTEST))
    (OUT / "expected.json").write_text(
        json.dumps(expected, indent=2, ensure_ascii=False) + "\n", encoding="utf-8"
    )
    total = sum(p.stat().st_size for p in OUT.rglob("*") if p.is_file())
    print(f"wrote {OUT.relative_to(ROOT)} ({total / 1024:.0f} KB)")
    if total > SIZE_BUDGET:
        print(f"fixtures exceed the {SIZE_BUDGET // 1024} KB budget", file=sys.stderr)
        return 1
    return 0


if __name__ == "__main__":
    sys.exit(main())
