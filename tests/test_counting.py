"""Counting rules beneath the readability formulas, checked by hand-counted texts.

Each text below is counted by hand in its comments; the measured values must be the published
formula of those counts (docs/references.md §20), so a change to the counting
(punctuation as ARI strokes, digits as Coleman–Liau letters, Gunning's raw three-syllable
count) fails here. The comparisons check that writing an abbreviation, a numbered step or a
list without full stops moves no readability verdict (issue "Sentences and counting rules").
"""

from __future__ import annotations

from pathlib import Path

import pytest

from matcheck.api import Version, compare_versions, profile_document
from matcheck.findings import Status
from matcheck.language.analysis import analyze
from matcheck.language.counting import is_dale_chall_familiar
from matcheck.language.pipeline import lemma
from matcheck.measures import formulas
from matcheck.measures.readability import count_prose
from matcheck.model import Block, BlockKind, Document, Location
from matcheck.settings import Settings

# Two sentences; words: The, router, created, 3, networks, at, 2.4, GHz | Then, Maria,
# connected, the, computer, to, Wi-Fi (15).
TEXT = "The router created 3 networks at 2.4 GHz. Then Maria connected the computer to Wi-Fi."
WORDS, SENTENCES = 15, 2
# Letters: 3+6+7+0+8+2+0+3 + 4+5+9+3+8+2+4 = 64 (digits and the "." and "-" are no letters).
LETTERS = 64
# Strokes (Senter & Smith 1967): letters and digits, 64 + "3" + "2", "4" = 67; no punctuation.
STROKES = 67
# Three syllables or more (CMU): created, Maria, connected, computer = 4. Gunning's hard words:
# computer only; "created"/"connected" are verbs made three syllables by -ed, "Maria" a name.
POLYSYLLABLES, HARD = 4, 1


def _profile(text: str) -> dict[str, float | None]:
    document = Document("x.md", "markdown", (Block(BlockKind.PARAGRAPH, text, Location(0)),))
    return {m.spec.id: m.value for m in profile_document(document, Settings()).measurements}


def test_hand_counts() -> None:
    document = Document("x.md", "markdown", (Block(BlockKind.PARAGRAPH, TEXT, Location(0)),))
    counts = count_prose(analyze(document))
    assert (counts.words, counts.sentences) == (WORDS, SENTENCES)
    assert (counts.letters, counts.strokes) == (LETTERS, STROKES)
    assert (counts.polysyllables, counts.fog_hard_words) == (POLYSYLLABLES, HARD)


def test_ari_counts_strokes_not_punctuation() -> None:
    # ARI = 4.71·strokes/W + 0.5·W/S − 21.43 (Senter & Smith 1967; docs/references.md §2.4).
    value = _profile(TEXT)["automated_readability"]
    assert value == pytest.approx(formulas.automated_readability(STROKES, WORDS, SENTENCES))
    with_punctuation = formulas.automated_readability(STROKES + 2, WORDS, SENTENCES)
    assert value != pytest.approx(with_punctuation)


def test_coleman_liau_counts_letters_not_digits() -> None:
    # CLI = 0.0588·L − 0.296·S − 15.8 per 100 words (Coleman & Liau 1975; docs/references.md §2.3).
    value = _profile(TEXT)["coleman_liau"]
    assert value == pytest.approx(formulas.coleman_liau(LETTERS, WORDS, SENTENCES))
    assert value != pytest.approx(formulas.coleman_liau(LETTERS + 3, WORDS, SENTENCES))


def test_fog_uses_hard_words_not_raw_polysyllables() -> None:
    # Fog = 0.4·(ASL + 100·hard/W) (Gunning 1952; docs/references.md §2.1), hard words as
    # counted above.
    value = _profile(TEXT)["gunning_fog"]
    assert value == pytest.approx(formulas.gunning_fog(WORDS, SENTENCES, HARD))
    assert value != pytest.approx(formulas.gunning_fog(WORDS, SENTENCES, POLYSYLLABLES))


@pytest.mark.parametrize(
    ("word", "opening", "familiar"),
    [
        # Dale & Chall: names and numbers are not unfamiliar (SECONDARY / FROM MEMORY, see
        # docs/references.md §20); abbreviations by their expansion (judgment).
        ("2024", False, True),
        ("3.5", False, True),
        ("Bristol", False, True),  # a name mid-sentence
        ("Bristol", True, False),  # opening its sentence, it is judged as a word
        ("USB", False, False),  # capitals only: an abbreviation, not a name; not on the list
        ("fig", False, True),  # "figure" is on the list
        ("approx", False, False),  # "approximately" is not
        ("wheels", False, True),  # inflection of a listed word
        ("thermostat", False, False),
    ],
)
def test_dale_chall_counting(word: str, opening: bool, familiar: bool) -> None:
    assert is_dale_chall_familiar(word, opening=opening) is familiar


def test_lemma_corrections() -> None:
    # The lookup table's wrong readings (docs/measures.md, "Lemmas"); "wheels" is untouched.
    assert [lemma(w) for w in ("number", "ground", "better", "m", "stoves", "wheels")] == [
        "number",
        "ground",
        "good",
        "m",
        "stove",
        "wheel",
    ]


# --- no readability verdict from abbreviations, step numbers or list punctuation -------------

LESSON = """# Servicing a heat pump

A heat pump moves heat from the air outside into the house. It works like a fridge in reverse.
The wiring is shown in Figure 2 on the next page. Doctor Lee checked the design last spring.

Before you start, switch the unit off at the fuse box. The outdoor fan can start without
warning. Step 1: clean the filter with warm water. The filter holds approximately 5 kg of dust
in a bad year. Check valve number 4 for leaks. Equation 3 gives the flow in litres per minute.

Keep the coil free of leaves. A blocked coil makes the pump work harder and costs money. Ask
for help if the pressure gauge reads above the red mark.
"""

PAIRS = [
    ("Figure 2", "Fig. 2"),
    ("Doctor Lee", "Dr. Lee"),
    ("approximately 5 kg", "approx. 5 kg"),
    ("valve number 4", "valve no. 4"),
    ("Equation 3", "Eq. 3"),
    ("Step 1: clean", "Step 1. Clean"),
]


def _compare(tmp_path: Path, first: tuple[str, str], second: tuple[str, str]) -> set[str]:
    paths = []
    for name, text in (first, second):
        path = tmp_path / name
        path.write_text(text, encoding="utf-8")
        paths.append(Version(path.stem, (path,)))
    report = compare_versions(paths)
    return {f.dimension for f in report.root_findings(Status.DIFFERS) if f.group == "readability"}


@pytest.mark.parametrize(("full", "short"), PAIRS)
def test_abbreviation_moves_no_readability_verdict(tmp_path: Path, full: str, short: str) -> None:
    assert full in LESSON
    variant = LESSON.replace(full, short)
    sentences = [
        _profile_sentences(text) for text in (LESSON.split("\n", 2)[2], variant.split("\n", 2)[2])
    ]
    assert sentences[0] == sentences[1] == 13  # by construction: 4 + 6 + 3
    assert _compare(tmp_path, ("a.md", LESSON), ("b.md", variant)) == set()


def _profile_sentences(markdown_body: str) -> int:
    blocks = tuple(
        Block(BlockKind.PARAGRAPH, " ".join(paragraph.split()), Location(i))
        for i, paragraph in enumerate(markdown_body.split("\n\n"))
        if paragraph.strip()
    )
    return count_prose(analyze(Document("x.md", "markdown", blocks))).sentences


LIST_MD = """# Cleaning the filter

Take these steps:

1. Switch the unit off
2. Open the front panel
3. Pull the filter out gently
4. Rinse it under warm water
5. Let it dry in the shade

The pump runs better with a clean filter. Clean it once a month in the autumn.
"""

LIST_TXT = """Cleaning the filter

Take these steps:
1. Switch the unit off
2. Open the front panel
3. Pull the filter out gently
4. Rinse it under warm water
5. Let it dry in the shade

The pump runs better with a clean filter. Clean it once a month in the autumn.
"""


def test_plain_text_list_reads_like_markdown(tmp_path: Path) -> None:
    # A list without full stops is one sentence per item in both formats, and the title is
    # not a sentence: 1 + 5 + 2 = 8 sentences, the same readability.
    assert _compare(tmp_path, ("a.md", LIST_MD), ("b.txt", LIST_TXT)) == set()
    values = [
        {
            m.spec.id: m.value
            for m in profile_document(_read(tmp_path / name), Settings()).measurements
        }
        for name in ("a.md", "b.txt")
    ]
    assert values[0]["sentences"] == values[1]["sentences"] == 8
    assert values[0]["flesch_kincaid_grade"] == pytest.approx(values[1]["flesch_kincaid_grade"])


def _read(path: Path) -> Document:
    from matcheck.api import read_version

    return read_version(Version(path.stem, (path,)))


def test_numbers_do_not_make_arithmetic_unfamiliar() -> None:
    # Words: Add, 12, and, 30, to, get, 42 | Then, take, away, 7, from, 42 | You, get, 35
    # (16 words, 3 sentences). Every word is on the Dale–Chall list (checked below) and the 7
    # numbers are not unfamiliar (Dale & Chall's counting; docs/references.md
    # §20), so PDW = 0: score = 0.0496·16/3 + 3.6365 (1948 formula). Counting the numbers
    # as unfamiliar would give PDW = 43.75 and a score above 10 ("16 and above").
    from matcheck.language.wordlists import dale_chall_familiar

    text = "Add 12 and 30 to get 42. Then take away 7 from 42. You get 35."
    assert all(w.lower() in dale_chall_familiar() for w in text.split() if w[0].isalpha())
    value = _profile(text)["dale_chall"]
    assert value == pytest.approx(formulas.dale_chall(16, 3, 0))
    assert formulas.dale_chall_grade_band(value or 0) == "4 and below"
