"""Readability: the published formulas, computed once from one set of counts.

All formulas read the same counts of the running prose (paragraphs, list items, footnotes;
see :mod:`matcheck.language.analysis`), so they cannot disagree about what a word or a
sentence is. The formulas themselves are pure functions in :mod:`matcheck.measures.formulas`.
"""

from __future__ import annotations

from collections.abc import Iterator
from dataclasses import dataclass

from matcheck.findings import Tolerance
from matcheck.language.analysis import PROSE_KINDS, Analysis
from matcheck.measures import formulas
from matcheck.measures.base import JUDGMENT, Group, Measurement, MeasureSpec, causes
from matcheck.settings import Settings

R = Group.READABILITY
GRADE = Tolerance(absolute=1, reason="one school grade")
SENTENCE_AND_SYLLABLES = causes("words_per_sentence", "syllables_per_word")
FRE = MeasureSpec(
    "flesch_reading_ease",
    R,
    "points",
    "Flesch Reading Ease (Flesch 1948)",
    Tolerance(absolute=5, reason=f"half of one 10-point Flesch (1949) band; {JUDGMENT}"),
    follows=SENTENCE_AND_SYLLABLES,
    label="Flesch Reading Ease",
    phrase="Flesch Reading Ease",
)
FKGL = MeasureSpec(
    "flesch_kincaid_grade",
    R,
    "grade",
    "Flesch–Kincaid Grade Level (Kincaid et al. 1975)",
    GRADE,
    follows=SENTENCE_AND_SYLLABLES,
    label="Flesch–Kincaid grade",
    phrase="Flesch–Kincaid grade level",
)
FOG = MeasureSpec(
    "gunning_fog",
    R,
    "grade",
    "Gunning fog index (Gunning 1952)",
    GRADE,
    follows=SENTENCE_AND_SYLLABLES,
)
SMOG = MeasureSpec(
    "smog",
    R,
    "grade",
    "SMOG grade, regression form (McLaughlin 1969)",
    Tolerance(absolute=1, reason="one school grade (its standard error is 1.5)"),
    follows=SENTENCE_AND_SYLLABLES,
)
CLI = MeasureSpec(
    "coleman_liau",
    R,
    "grade",
    "Coleman–Liau index (Coleman & Liau 1975)",
    GRADE,
    follows=causes("words_per_sentence", "long_words_share"),
)
ARI = MeasureSpec(
    "automated_readability",
    R,
    "grade",
    "Automated Readability Index (Senter & Smith 1967)",
    GRADE,
    follows=causes("words_per_sentence", "long_words_share"),
)
DALE_CHALL = MeasureSpec(
    "dale_chall",
    R,
    "score",
    "Dale–Chall readability score, 1948 formula (Dale & Chall 1948)",
    Tolerance(absolute=0.5, reason="half a score point; one point spans about two grades"),
    follows=causes("words_per_sentence", "rare_words_share"),
)
WPS = MeasureSpec(
    "words_per_sentence",
    R,
    "words",
    "Mean words per sentence",
    Tolerance(
        absolute=2.5, reason="≈ one Flesch–Kincaid grade (0.39 grade per word of sentence length)"
    ),
    decimals=1,
    label="Words per sentence",
    phrase="words per sentence",
)
SPW = MeasureSpec(
    "syllables_per_word",
    R,
    "syllables",
    "Mean syllables per word",
    Tolerance(
        absolute=0.085, reason="≈ one Flesch–Kincaid grade (11.8 grades per syllable per word)"
    ),
    label="Syllables per word",
    phrase="syllables per word",
)
LONG = MeasureSpec(
    "long_words_share",
    R,
    "share",
    "Share of words longer than six letters (Björnsson 1968)",
    Tolerance(absolute=0.03, reason=f"3 percentage points; {JUDGMENT}"),
)
RARE = MeasureSpec(
    "rare_words_share",
    R,
    "share",
    "Share of words not on the Dale–Chall familiar-word list",
    Tolerance(absolute=0.03, reason=f"3 percentage points; {JUDGMENT}"),
    label="Words not on the Dale–Chall list",
    phrase="the share of words not on the Dale–Chall list",
)
MTLD = MeasureSpec(
    "mtld",
    R,
    "tokens",
    "Lexical diversity, MTLD (McCarthy & Jarvis 2010)",
    Tolerance(relative=0.15, reason=f"15% of the reference; {JUDGMENT}"),
)
SPECS = (FRE, FKGL, FOG, SMOG, CLI, ARI, DALE_CHALL, WPS, SPW, LONG, RARE, MTLD)


@dataclass(frozen=True, slots=True)
class ProseCounts:
    """The counts every formula draws on (prose blocks only)."""

    words: int
    sentences: int
    syllables: int
    polysyllables: int
    fog_hard_words: int
    letters: int
    strokes: int
    long_words: int
    unfamiliar_words: int
    tokens: tuple[str, ...]
    sentence_lengths: tuple[int, ...]


def count_prose(analysis: Analysis) -> ProseCounts:
    from matcheck.language.counting import is_dale_chall_familiar, opens_unit
    from matcheck.language.syllables import count_syllables, is_fog_hard_word
    from matcheck.language.words import letters, strokes

    # The per-word counts depend only on the word's text, whether it opens its unit and, for
    # an -es word, the word before it; a lesson repeats its words, so each is counted once.
    known: dict[tuple[str, bool, str], tuple[int, bool, int, int, bool]] = {}

    def word_counts(text: str, opening: bool, previous: str) -> tuple[int, bool, int, int, bool]:
        count = count_syllables(text)
        return (
            count,
            is_fog_hard_word(text, count, sentence_initial=opening, previous=previous),
            letters(text),
            strokes(text),
            not is_dale_chall_familiar(text, opening=opening),
        )

    syllables = polysyllables = hard = letter_count = stroke_count = long_words = rare = 0
    tokens: list[str] = []
    lengths: list[int] = []
    for item in analysis.of(PROSE_KINDS):
        for sentence in item.sentences:
            if not sentence.word_count:
                continue
            words = item.words[sentence.first_word : sentence.end_word]
            lengths.append(len(words))
            previous_end = sentence.start
            previous = ""
            for position, word in enumerate(words):
                opening = opens_unit(position, item.block.text[previous_end : word.start])
                lower = word.lower
                key = (word.text, opening, previous if lower.endswith("es") else "")
                counts = known.get(key)
                if counts is None:
                    counts = known[key] = word_counts(*key)
                count, is_hard, n_letters, n_strokes, unfamiliar = counts
                syllables += count
                polysyllables += count >= 3
                hard += is_hard
                letter_count += n_letters
                stroke_count += n_strokes
                long_words += n_letters > 6
                rare += unfamiliar
                tokens.append(lower)
                previous_end, previous = word.end, lower
    return ProseCounts(
        words=len(tokens),
        sentences=len(lengths),
        syllables=syllables,
        polysyllables=polysyllables,
        fog_hard_words=hard,
        letters=letter_count,
        strokes=stroke_count,
        long_words=long_words,
        unfamiliar_words=rare,
        tokens=tuple(tokens),
        sentence_lengths=tuple(lengths),
    )


def measure_readability(analysis: Analysis, settings: Settings) -> Iterator[Measurement]:
    counts = count_prose(analysis)
    words, sentences = counts.words, counts.sentences
    if not words or not sentences:
        for spec in SPECS:
            yield Measurement(spec, None, note="no running prose to measure")
        return
    yield Measurement(FRE, formulas.flesch_reading_ease(words, sentences, counts.syllables))
    yield Measurement(FKGL, formulas.flesch_kincaid_grade(words, sentences, counts.syllables))
    yield Measurement(FOG, formulas.gunning_fog(words, sentences, counts.fog_hard_words))
    smog_note = "" if sentences >= 30 else "SMOG was validated on samples of 30 sentences"
    yield Measurement(SMOG, formulas.smog(sentences, counts.polysyllables), note=smog_note)
    yield Measurement(CLI, formulas.coleman_liau(counts.letters, words, sentences))
    yield Measurement(ARI, formulas.automated_readability(counts.strokes, words, sentences))
    yield Measurement(
        DALE_CHALL,
        formulas.dale_chall(
            words, sentences, counts.unfamiliar_words, adjustment=settings.dale_chall_adjustment
        ),
    )
    sections = tuple(
        item.block.location.section or ""
        for item in analysis.of(PROSE_KINDS)
        for sentence in item.sentences
        if sentence.word_count
    )
    yield Measurement(
        WPS,
        words / sentences,
        sample=tuple(map(float, counts.sentence_lengths)),
        sample_sections=sections,
    )
    yield Measurement(SPW, counts.syllables / words)
    yield Measurement(LONG, counts.long_words / words)
    yield Measurement(RARE, counts.unfamiliar_words / words)
    mtld = formulas.mtld(counts.tokens)
    mtld_note = "" if words >= 100 else "MTLD is unstable below about 100 words"
    yield Measurement(MTLD, mtld, note=mtld_note)
