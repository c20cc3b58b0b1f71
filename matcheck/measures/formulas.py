"""Readability formulas and MTLD as pure functions of counts (no text processing here).

Constants and sources are those of docs/references.md §1, §2 and §9; each docstring names
them. Callers guarantee at least one word and one sentence; anything else is a bug in the
caller and raises ValueError rather than producing a division by zero or a NaN.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from typing import Literal

DaleChallAdjustment = Literal["always", "above_5_percent"]


def _require_positive(**counts: int) -> None:
    for name, value in counts.items():
        if value <= 0:
            raise ValueError(f"{name} must be positive, got {value}")


def _require_non_negative(**counts: int) -> None:
    for name, value in counts.items():
        if value < 0:
            raise ValueError(f"{name} must not be negative, got {value}")


def _require_at_most_words(words: int, **counts: int) -> None:
    for name, value in counts.items():
        if value > words:
            raise ValueError(f"{name} ({value}) cannot exceed words ({words})")


def flesch_reading_ease(words: int, sentences: int, syllables: int) -> float:
    """Flesch (1948): 206.835 − 1.015·(words/sentences) − 84.6·(syllables/words)."""
    _require_positive(words=words, sentences=sentences)
    _require_non_negative(syllables=syllables)
    return 206.835 - 1.015 * (words / sentences) - 84.6 * (syllables / words)


def flesch_kincaid_grade(words: int, sentences: int, syllables: int) -> float:
    """Kincaid, Fishburne, Rogers & Chissom (1975): 0.39·ASL + 11.8·ASW − 15.59.

    ASL = words/sentences, ASW = syllables/words (the Navy report's constants, as given by
    DuBay 2004, not the simplified 0.4/12/15 variant).
    """
    _require_positive(words=words, sentences=sentences)
    _require_non_negative(syllables=syllables)
    return 0.39 * (words / sentences) + 11.8 * (syllables / words) - 15.59


def gunning_fog(words: int, sentences: int, hard_words: int) -> float:
    """Gunning (1952): 0.4·(ASL + 100·hard_words/words).

    Which words are hard is the caller's business (see
    ``matcheck.language.syllables.is_fog_hard_word`` for Gunning's rule).
    """
    _require_positive(words=words, sentences=sentences)
    _require_non_negative(hard_words=hard_words)
    _require_at_most_words(words, hard_words=hard_words)
    return 0.4 * (words / sentences + 100 * hard_words / words)


def smog(sentences: int, polysyllables: int) -> float:
    """McLaughlin (1969), regression form: 1.0430·√(polysyllables·30/sentences) + 3.1291.

    Scaling to 30 sentences lets any sample length be used; the hand procedure (√ of the
    nearest perfect square + 3) is not implemented.
    """
    _require_positive(sentences=sentences)
    _require_non_negative(polysyllables=polysyllables)
    return 1.0430 * math.sqrt(polysyllables * 30 / sentences) + 3.1291


def coleman_liau(letters: int, words: int, sentences: int) -> float:
    """Coleman & Liau (1975): 0.0588·L − 0.296·S − 15.8, L and S per 100 words.

    L = letters per 100 words, S = sentences per 100 words. textstat 0.7.8 uses 0.058 for the
    first constant; 0.0588 is the published one (docs/references.md §2.3).
    """
    _require_positive(words=words, sentences=sentences)
    _require_non_negative(letters=letters)
    per_100_letters = 100 * letters / words
    per_100_sentences = 100 * sentences / words
    return 0.0588 * per_100_letters - 0.296 * per_100_sentences - 15.8


def automated_readability(characters: int, words: int, sentences: int) -> float:
    """Senter & Smith (1967): 4.71·(characters/words) + 0.5·(words/sentences) − 21.43.

    ``characters`` are the typed strokes of the words, letters and digits, not punctuation
    (textstat 0.7.8 counts every non-space character instead).
    """
    _require_positive(words=words, sentences=sentences)
    _require_non_negative(characters=characters)
    return 4.71 * (characters / words) + 0.5 * (words / sentences) - 21.43


def dale_chall(
    words: int,
    sentences: int,
    difficult_words: int,
    *,
    adjustment: DaleChallAdjustment = "always",
) -> float:
    """Dale & Chall (1948): 0.1579·PDW + 0.0496·ASL + 3.6365.

    PDW = percentage of words not on the familiar-word list, ASL = words/sentences.

    ``adjustment`` decides when the 3.6365 is added:

    - ``"always"``: as the plain intercept DuBay (2004) gives (VERIFIED);
    - ``"above_5_percent"``: only when PDW > 5, the rule of Wikipedia and textstat 0.7.8
      (common practice, no primary source found).

    The result is the raw score; :func:`dale_chall_grade_band` converts it to grades.
    """
    _require_positive(words=words, sentences=sentences)
    _require_non_negative(difficult_words=difficult_words)
    _require_at_most_words(words, difficult_words=difficult_words)
    if adjustment not in ("always", "above_5_percent"):
        raise ValueError(f"unknown Dale–Chall adjustment {adjustment!r}")
    percent_difficult = 100 * difficult_words / words
    score = 0.1579 * percent_difficult + 0.0496 * (words / sentences)
    if adjustment == "always" or percent_difficult > 5:
        score += 3.6365
    return score


# DuBay (2004) correction chart for the 1948 score: (upper bound, exclusive; grade band).
_DALE_CHALL_BANDS: tuple[tuple[float, str], ...] = (
    (5.0, "4 and below"),
    (6.0, "5-6"),
    (7.0, "7-8"),
    (8.0, "9-10"),
    (9.0, "11-12"),
    (10.0, "13-15"),
)


def dale_chall_grade_band(score: float) -> str:
    """School grades for a Dale–Chall score, from DuBay's (2004) correction chart.

    The chart's rows are ≤4.9, 5.0–5.9, ..., 9.0–9.9, ≥10; a score between two printed rows
    (4.95) goes to the lower one, i.e. the bands are half-open [5.0, 6.0) and so on.
    """
    for upper, band in _DALE_CHALL_BANDS:
        if score < upper:
            return band
    return "16 and above"


# Flesch (1949), p. 149, as tabulated by DuBay (2004): (lower bound, inclusive; description).
_FLESCH_BANDS: tuple[tuple[float, str], ...] = (
    (90.0, "very easy"),  # 5th grade
    (80.0, "easy"),  # 6th grade
    (70.0, "fairly easy"),  # 7th grade
    (60.0, "standard"),  # 8th-9th grade
    (50.0, "fairly difficult"),  # 10th-12th grade
    (30.0, "difficult"),  # 13th-16th grade (DuBay's other table misprints 30-40)
)


def flesch_band(score: float) -> str:
    """Flesch's (1949) description of a reading-ease score.

    Flesch publishes no rule for the shared boundaries (90 is both "80–90" and "90–100"), so
    the bands are half-open with the lower bound included: [90, ∞) very easy, [80, 90) easy,
    [70, 80) fairly easy, [60, 70) standard, [50, 60) fairly difficult, [30, 50) difficult,
    below 30 very difficult. Scores above 100 or below 0, which the formula allows, fall into
    the end bands.
    """
    for lower, band in _FLESCH_BANDS:
        if score >= lower:
            return band
    return "very difficult"


def _mtld_pass(tokens: Sequence[str], threshold: float) -> float | None:
    factors = 0.0
    types: set[str] = set()
    seen = 0
    for token in tokens:
        types.add(token)
        seen += 1
        if len(types) / seen <= threshold:
            factors += 1
            types.clear()
            seen = 0
    if seen:
        factors += (1 - len(types) / seen) / (1 - threshold)
    return len(tokens) / factors if factors else None


def mtld(tokens: Sequence[str], threshold: float = 0.72) -> float | None:
    """Measure of Textual Lexical Diversity (McCarthy & Jarvis 2010).

    A pass reads the tokens keeping the type–token ratio (TTR) of the current segment; when
    the TTR falls to the threshold or below (``<=``, our choice, FROM MEMORY of the paper's
    "reaches"), a factor is counted and the segment restarts. What is left at the end adds the
    partial factor (1 − TTR)/(1 − threshold). The pass score is tokens/factors; MTLD is the
    mean of the forward and the backward pass. The 0.72 threshold and the averaging of both
    directions are SECONDARY (docs/references.md §9).

    ``tokens`` are compared as given: the caller lower-cases them and drops punctuation.
    Returns None when no factor is counted at all (empty input, or every token distinct), as
    the score is then undefined. The paper advises about 100 tokens or more for a stable value.
    """
    if not 0 < threshold < 1:
        raise ValueError(f"MTLD threshold must be between 0 and 1, got {threshold}")
    forward = _mtld_pass(tokens, threshold)
    backward = _mtld_pass(tokens[::-1], threshold)
    if forward is None or backward is None:
        return None
    return (forward + backward) / 2
