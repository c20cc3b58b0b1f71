"""Every measure group on lessons built in code, with counts known by construction.

Also: the demo fixtures' profiles against fixtures/demo/expected.json, whose counts come from
the source data of scripts/build_fixtures.py, not from reading the files.
"""

from __future__ import annotations

import json
from functools import cache
from pathlib import Path

import pytest

from matcheck.api import profile_files
from matcheck.language.analysis import Analysis, analyze
from matcheck.measures import catalogue, formulas, measure
from matcheck.measures.base import Profile
from matcheck.model import BlockKind, Emphasis
from matcheck.readers.builder import NO_EMPHASIS, DocumentBuilder, Run
from matcheck.settings import Settings

CATALOGUE = catalogue()
DEMO = Path(__file__).resolve().parent.parent / "fixtures" / "demo"
EXPECTED = json.loads((DEMO / "expected.json").read_text(encoding="utf-8"))

BOLD = frozenset({Emphasis.BOLD})
ITALIC = frozenset({Emphasis.ITALIC})
UNDERLINE = frozenset({Emphasis.UNDERLINE})
HIGHLIGHT = frozenset({Emphasis.HIGHLIGHT})


def _profile(builder: DocumentBuilder, settings: Settings | None = None) -> Profile:
    return measure(analyze(builder.build()), settings or Settings())


def _value(profile: Profile, measure_id: str) -> float | None:
    assert measure_id in CATALOGUE, measure_id
    measurement = profile.get(measure_id)
    assert measurement is not None, measure_id
    return measurement.value


def _paragraphs(*texts: str) -> DocumentBuilder:
    builder = DocumentBuilder("lesson.md", "markdown")
    for text in texts:
        builder.add_block(BlockKind.PARAGRAPH, text)
    return builder


def _words_of(text: str) -> list[str]:
    analysis: Analysis = analyze(_paragraphs(text).build())
    return [word.text for word in analysis.blocks[0].words]


# --- words ----------------------------------------------------------------------------------
# The word rule (matcheck.language.words, and expected.json "rules"): a maximal run of
# non-white-space characters with at least one letter or digit, surrounding punctuation
# stripped. This is the word-processor word count rule (common practice).


def test_word_rule_examples() -> None:
    assert _words_of("Don't pump a well-known tyre to 3.5 bar — ever!") == [
        "Don't", "pump", "a", "well-known", "tyre", "to", "3.5", "bar", "ever",
    ]  # fmt: skip
    # Punctuation around a word goes; a dash or a lone symbol is no word.
    assert _words_of("(tyre), “valve” ... - – — & 50%") == ["tyre", "valve", "50"]


def test_words_count_every_text_block_but_captions() -> None:
    builder = DocumentBuilder("lesson.md", "markdown")
    builder.add_block(BlockKind.HEADING, "Coffee Brewing Basics", level=1)  # 3
    builder.add_block(BlockKind.PARAGRAPH, "Grind the beans just before brewing.")  # 6
    group = builder.new_group()
    builder.add_block(BlockKind.LIST_ITEM, "Weigh 18 g", level=1, group=group)  # 3
    table = builder.new_group()
    builder.add_block(BlockKind.TABLE_CELL, "Water temperature", group=table)  # 2
    builder.add_block(BlockKind.CAPTION, "Figure 1. A burr grinder.")  # not counted
    builder.add_block(BlockKind.FOOTNOTE, "Scales cost little.")  # 3
    assert _value(_profile(builder), "words") == 17


# --- sentences, paragraphs, characters, structure -------------------------------------------


def _composting_lesson() -> tuple[DocumentBuilder, list[str]]:
    """A lesson with known counts; returns it and the texts of its non-caption blocks."""
    builder = DocumentBuilder("lesson.md", "markdown")
    texts: list[str] = []

    def add(kind: BlockKind, text: str, **options: int) -> None:
        builder.add_block(kind, text, **options)
        if kind is not BlockKind.CAPTION:
            texts.append(text)

    add(BlockKind.HEADING, "Composting at Home", level=1)
    add(BlockKind.HEADING, "What to Add", level=2)
    add(BlockKind.PARAGRAPH, "Mix green and brown waste. Keep it damp.")
    first_list = builder.new_group()
    add(BlockKind.LIST_ITEM, "Vegetable peelings", level=1, group=first_list)
    add(BlockKind.LIST_ITEM, "Coffee grounds", level=1, group=first_list)
    add(BlockKind.LIST_ITEM, "Used filter papers", level=2, group=first_list)  # nested
    add(BlockKind.HEADING, "What to Avoid", level=2)
    add(BlockKind.PARAGRAPH, "Leave out meat and dairy.")
    second_list = builder.new_group()
    add(BlockKind.LIST_ITEM, "Cooked food", level=1, group=second_list)
    add(BlockKind.LIST_ITEM, "Pet waste", level=1, group=second_list)
    add(BlockKind.HEADING, "Why", level=3)
    first_table = builder.new_group()
    for cell in ("Item", "Reason", "Meat", "Attracts rats"):
        add(BlockKind.TABLE_CELL, cell, group=first_table)
    second_table = builder.new_group()
    for cell in ("Month", "Task"):
        add(BlockKind.TABLE_CELL, cell, group=second_table)
    add(BlockKind.CAPTION, "Figure 1. A compost bin.")
    add(BlockKind.FOOTNOTE, "Councils sell bins cheaply.")
    return builder, texts


def test_length_and_structure_counts_by_construction() -> None:
    builder, texts = _composting_lesson()
    profile = _profile(builder)
    # Headings 3+3+3+1, paragraphs 8+5, list items 2+2+3+2+2, cells 1+1+1+2+1+1, footnote 4.
    assert _value(profile, "words") == 45
    # Prose only: 2 + 1 sentences in paragraphs, one per list item (a block boundary ends a
    # sentence, with or without a full stop), 1 in the footnote; headings and cells are none.
    assert _value(profile, "sentences") == 9
    assert _value(profile, "paragraphs") == 2
    # Characters of the lesson text without spaces, captions left out.
    assert _value(profile, "characters") == sum(len(text.replace(" ", "")) for text in texts)
    assert _value(profile, "headings") == 4
    assert _value(profile, "headings_level_1") == 1
    assert _value(profile, "headings_level_2") == 2
    assert _value(profile, "headings_level_3") == 1
    assert _value(profile, "sections") == 2  # the two level-2 headings under the title
    assert _value(profile, "lists") == 2  # the nested item belongs to its list
    assert _value(profile, "list_items") == 5
    assert _value(profile, "tables") == 2


def test_block_boundary_ends_a_sentence() -> None:
    builder = DocumentBuilder("lesson.md", "markdown")
    # No full stop between the two paragraphs or the two items; still four sentences.
    builder.add_block(BlockKind.PARAGRAPH, "Unplug the router")
    builder.add_block(BlockKind.PARAGRAPH, "wait ten seconds")
    group = builder.new_group()
    builder.add_block(BlockKind.LIST_ITEM, "plug it in", level=1, group=group)
    builder.add_block(BlockKind.LIST_ITEM, "check the lights", level=1, group=group)
    assert _value(_profile(builder), "sentences") == 4


def test_heading_levels_below_three_are_reported_when_used() -> None:
    builder = DocumentBuilder("lesson.md", "markdown")
    for level in (1, 2, 3, 5):
        builder.add_block(BlockKind.HEADING, f"Level {level}", level=level)
    builder.add_block(BlockKind.HEADING, "Deep", level=6)
    profile = _profile(builder)
    # Outline ranks: the skipped level 4 closes up, so 5 is rank 4 and 6 rank 5.
    assert _value(profile, "headings_level_4") == 1
    assert _value(profile, "headings_level_5") == 1
    assert profile.get("headings_level_6") is None  # deeper than any heading used
    assert _value(profile, "sections") == 1  # a lone title is one section


def test_the_same_outline_has_the_same_levels_whatever_the_numbers() -> None:
    # Word: Title (level 0) over Heading 1 over Heading 2; Markdown: # over ## over ###.
    levels = []
    for numbers in ((0, 1, 2, 2), (1, 2, 3, 3), (2, 3, 4, 4)):
        builder = DocumentBuilder("lesson", "docx")
        for number in numbers:
            builder.add_block(BlockKind.HEADING, f"Heading {number}", level=number)
        levels.append([block.level for block in builder.build().blocks])
    assert levels == [[1, 2, 3, 3]] * 3


# --- reading time ---------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("wpm", "minutes"),
    # Brysbaert (2019): 238 wpm adult silent non-fiction, most adults 175-300; docs/references.md §3
    # COMPUTED: 1,190 words -> 5.00 min at 238, 6.80 at 175, 3.97 at 300.
    [(238.0, 5.00), (175.0, 6.80), (300.0, 3.97)],
)
def test_reading_time_is_words_over_rate(wpm: float, minutes: float) -> None:
    sentence = "Check the tyre pressure before every ride on the road."  # 10 words
    builder = _paragraphs(*([" ".join([sentence] * 7)] * 17))  # 17 × 7 × 10 = 1,190 words
    profile = _profile(builder, Settings(words_per_minute=wpm))
    assert _value(profile, "words") == 1190
    assert _value(profile, "reading_time") == 1190 / wpm
    assert round(_value(profile, "reading_time") or 0.0, 2) == minutes


def test_default_rate_is_brysbaert_238() -> None:
    assert Settings().words_per_minute == 238.0  # Brysbaert (2019), docs/references.md §3


# --- readability ----------------------------------------------------------------------------


def test_readability_values_are_the_formulas_of_the_counts() -> None:
    builder = DocumentBuilder("lesson.md", "markdown")
    # Heading and table cell are not running prose, so their long words must not count.
    builder.add_block(BlockKind.HEADING, "Understanding Electricity", level=1)
    builder.add_block(BlockKind.PARAGRAPH, "The cat sat on the mat. My computer is on the desk.")
    group = builder.new_group()
    builder.add_block(BlockKind.LIST_ITEM, "Open the window", level=1, group=group)
    table = builder.new_group()
    builder.add_block(BlockKind.TABLE_CELL, "Photosynthesis everywhere", group=table)
    profile = _profile(builder)

    # Counts by construction. Syllables as in the CMU Pronouncing Dictionary: every word has
    # one but com-pu-ter (3), o-pen (2), win-dow (2).
    words, sentences = 15, 3
    syllables = 6 + (5 + 3) + (2 + 1 + 2)
    # Word classes by their sources' rules (docs/references.md §2.1, §2.2, §2.6).
    polysyllables = 1  # computer (McLaughlin 1969: three or more syllables)
    fog_hard = 1  # computer: not a name, not a compound, no -ed/-es (Gunning 1952)
    letters = (3 + 3 + 3 + 2 + 3 + 3) + (2 + 8 + 2 + 2 + 3 + 4) + (4 + 3 + 6)
    long_words = 1  # more than six letters: computer (Björnsson 1968)
    unfamiliar = 1  # computer is not on the Dale–Chall list shipped with textstat
    tokens = ["the", "cat", "sat", "on", "the", "mat"]
    tokens += ["my", "computer", "is", "on", "the", "desk", "open", "the", "window"]

    expected = {
        "flesch_reading_ease": formulas.flesch_reading_ease(words, sentences, syllables),
        "flesch_kincaid_grade": formulas.flesch_kincaid_grade(words, sentences, syllables),
        "gunning_fog": formulas.gunning_fog(words, sentences, fog_hard),
        "smog": formulas.smog(sentences, polysyllables),
        "coleman_liau": formulas.coleman_liau(letters, words, sentences),
        # No digits here, so the ARI's strokes are the letters.
        "automated_readability": formulas.automated_readability(letters, words, sentences),
        "dale_chall": formulas.dale_chall(words, sentences, unfamiliar),
        "words_per_sentence": words / sentences,
        "syllables_per_word": syllables / words,
        "long_words_share": long_words / words,
        "rare_words_share": unfamiliar / words,
        "mtld": formulas.mtld(tokens),
    }
    for measure_id, value in expected.items():
        assert _value(profile, measure_id) == pytest.approx(value, rel=1e-12), measure_id
    wps = profile.get("words_per_sentence")
    assert wps is not None
    assert wps.sample == (6.0, 6.0, 3.0)  # per-sentence lengths behind the mean


def test_dale_chall_list_guard() -> None:
    # Guards the construction above: read the list file itself, not through matcheck.
    from importlib import resources

    path = resources.files("textstat").joinpath("resources/en/easy_words.txt")
    easy = {line.strip().lower() for line in path.read_text(encoding="utf-8").splitlines()}
    assert "computer" not in easy
    assert {"the", "cat", "sat", "on", "mat", "my", "is", "desk", "open", "window"} <= easy


def test_dale_chall_adjustment_setting() -> None:
    # Dale & Chall (1948) via DuBay (2004): 3.6365 always; textstat/Wikipedia: only when the
    # share of difficult words exceeds 5% (common practice). Here it is 0%. docs/references.md
    # §2.5.
    builder = _paragraphs("The cat sat on the mat.")
    always = _value(_profile(builder), "dale_chall")
    above_5 = Settings(dale_chall_adjustment="above_5_percent")
    above = _value(_profile(builder, above_5), "dale_chall")
    assert always == pytest.approx(0.0496 * 6 + 3.6365, abs=1e-12)
    assert above == pytest.approx(0.0496 * 6, abs=1e-12)


def test_readability_undefined_without_prose() -> None:
    builder = DocumentBuilder("lesson.md", "markdown")
    builder.add_block(BlockKind.HEADING, "Only a Heading", level=1)
    profile = _profile(builder)
    assert _value(profile, "flesch_reading_ease") is None
    assert _value(profile, "words") == 3


# --- figures --------------------------------------------------------------------------------


def test_figures_areas_captions_and_alt_text() -> None:
    builder = _paragraphs("See the valves below.")
    builder.add_block(BlockKind.CAPTION, "Figure 1. Three valves.")
    builder.add_figure(
        "valves.png",
        width_px=600,
        height_px=400,
        display_width_cm=12.0,
        display_height_cm=8.0,
        alt_text="Three valves on a rim.",
        caption="Figure 1. Three valves.",
    )
    # A caption attached to the figure but not emitted as a block still counts once.
    builder.add_figure(
        "lever.png",
        width_px=500,
        height_px=500,
        display_width_cm=8.0,
        display_height_cm=8.0,
        caption="Figure 2. A tyre lever.",
    )
    profile = _profile(builder)
    assert _value(profile, "figures") == 2
    assert _value(profile, "figure_pixel_area") == pytest.approx((600 * 400 + 500 * 500) / 1e6)
    assert _value(profile, "figure_display_area") == pytest.approx(12 * 8 + 8 * 8)
    assert _value(profile, "captions") == 2
    assert _value(profile, "caption_words") == 4 + 5  # "Figure 1." counts as two words
    assert _value(profile, "figures_without_alt_text") == 1
    assert _value(profile, "figures_unreadable") == 0
    assert _value(profile, "words") == 4  # caption words are not lesson words


def test_figure_areas_unknown_when_not_stated() -> None:
    builder = _paragraphs("A picture.")
    builder.add_figure("a.png", width_px=10, height_px=10, display_width_cm=1, display_height_cm=1)
    builder.add_figure("b.png", readable=False)  # neither size known
    profile = _profile(builder)
    assert _value(profile, "figure_pixel_area") == pytest.approx(100 / 1e6)  # the measured one
    assert _value(profile, "figure_display_area") is None  # not every display size is stated
    assert _value(profile, "figures_unreadable") == 1
    assert _value(profile, "figures_without_alt_text") == 2


def test_no_figures_is_zero_area() -> None:
    profile = _profile(_paragraphs("No pictures here."))
    assert _value(profile, "figures") == 0
    assert _value(profile, "figure_pixel_area") == 0
    assert _value(profile, "figure_display_area") == 0


# --- signaling ------------------------------------------------------------------------------


def test_emphasis_by_kind_and_terms() -> None:
    builder = DocumentBuilder("lesson.md", "markdown")
    # Heading bold is style, not signaling (expected.json "rules").
    builder.add_block(BlockKind.HEADING, [("Bold Heading Words", BOLD)], level=1)
    runs: list[Run] = [
        ("Fit the ", NO_EMPHASIS),
        ("inner", BOLD),
        (" ", NO_EMPHASIS),  # a space between two bold pieces keeps the term whole
        ("tube", BOLD),
        (" and the ", NO_EMPHASIS),
        ("tyre", ITALIC),
        ("s", NO_EMPHASIS),  # "tyres" is not wholly italic, so not an italic word
        (" with ", NO_EMPHASIS),
        ("great care", UNDERLINE),
        (", then ", NO_EMPHASIS),
        ("check", HIGHLIGHT | BOLD),
        (" it.", NO_EMPHASIS),
    ]
    builder.add_block(BlockKind.PARAGRAPH, runs)
    group = builder.new_group()
    item: list[Run] = [("Inner tube", BOLD), (" first", NO_EMPHASIS)]
    builder.add_block(BlockKind.LIST_ITEM, item, level=1, group=group)
    table = builder.new_group()
    builder.add_block(BlockKind.TABLE_CELL, [("the ", NO_EMPHASIS), ("bead", ITALIC)], group=table)
    # A cell emphasised end to end is a header row's typography, not signaling.
    builder.add_block(BlockKind.TABLE_CELL, [("Header Cell", BOLD)], group=table)
    # Captions belong to figures: their emphasis is not counted either.
    builder.add_block(BlockKind.CAPTION, [("Figure 1. ", NO_EMPHASIS), ("Valve", BOLD)])
    profile = _profile(builder)
    assert _value(profile, "bold_words") == 2 + 1 + 2  # inner tube, check, Inner tube
    assert _value(profile, "italic_words") == 1  # bead
    assert _value(profile, "underline_words") == 2
    assert _value(profile, "highlight_words") == 1
    assert _value(profile, "emphasized_words") == 2 + 2 + 1 + 2 + 1
    terms = profile.get("emphasized_terms")
    assert terms is not None
    assert terms.value == 4
    assert dict(terms.items) == {"inner tube": 2, "great care": 1, "check": 1, "bead": 1}
    assert terms.items[0] == ("inner tube", 2.0)  # most frequent first


def test_no_emphasis_is_zero() -> None:
    profile = _profile(_paragraphs("Plain text only."))
    for kind in Emphasis:
        assert _value(profile, f"{kind.value}_words") == 0
    assert _value(profile, "emphasized_terms") == 0


# --- the demo fixtures ----------------------------------------------------------------------

VERSIONS = sorted(EXPECTED["versions"])
EXACT_KEYS = (
    "words",
    "caption_words",
    "paragraphs",
    "lists",
    "list_items",
    "tables",
    "figures",
    "figures_without_alt_text",
    "captions",
    "bold_words",
    "italic_words",
)


@cache
def _fixture_profile(version: str, fmt: str) -> Profile:
    name = EXPECTED["versions"][version]["files"][fmt]
    (profile,) = profile_files([DEMO / name], Settings())
    return profile


@pytest.mark.parametrize("fmt", ["md", "docx"])
@pytest.mark.parametrize("version", VERSIONS)
def test_fixture_profile_matches_expected(version: str, fmt: str) -> None:
    expected = EXPECTED["versions"][version]
    profile = _fixture_profile(version, fmt)
    got = {key: _value(profile, key) for key in EXACT_KEYS}
    assert got == {key: float(expected[key]) for key in EXACT_KEYS}
    # Levels deeper than any heading used are not listed: zero (as the comparison reads them).
    levels = {str(level): profile.value(f"headings_level_{level}") or 0.0 for level in range(1, 7)}
    want = {str(level): float(expected["headings"].get(str(level), 0)) for level in range(1, 7)}
    assert levels == want
    assert _value(profile, "headings") == sum(expected["headings"].values())


@pytest.mark.parametrize("version", VERSIONS)
def test_fixture_pdf_within_one_percent(version: str) -> None:
    # The acceptance rule: a DOCX and its PDF export of the same text agree on words
    # within 1%; figures and captions are discrete and must agree exactly.
    expected = EXPECTED["versions"][version]
    pdf = _fixture_profile(version, "pdf")
    docx = _fixture_profile(version, "docx")
    pdf_words = _value(pdf, "words") or 0.0
    assert abs(pdf_words - expected["words"]) <= 0.01 * expected["words"]
    assert abs(pdf_words - (_value(docx, "words") or 0.0)) <= 0.01 * (_value(docx, "words") or 0.0)
    assert _value(pdf, "figures") == expected["figures"]
    assert _value(pdf, "captions") == expected["captions"]
