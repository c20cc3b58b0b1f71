"""Settings that change what the measures compute; frozen and validated once."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Literal

from matcheck.errors import UsageError

# Brysbaert (2019), J. Memory and Language 109:104047: adults reading English non-fiction
# silently average 238 words per minute (most adults 175-300).
DEFAULT_WPM = 238.0
WPM_SOURCE = "Brysbaert (2019): adult silent reading of English non-fiction, 238 words/min"


@dataclass(frozen=True, slots=True)
class Settings:
    """What the measures need to know beyond the text.

    ``words_per_minute`` sets the reading-time estimate; ``dale_chall_adjustment`` chooses how
    the 1948 Dale–Chall constant is applied (see docs/measures.md); ``key_terms`` is how many
    TF-IDF terms a profile lists.
    """

    words_per_minute: float = DEFAULT_WPM
    dale_chall_adjustment: Literal["always", "above_5_percent"] = "always"
    key_terms: int = 20

    def __post_init__(self) -> None:
        if not 20 <= self.words_per_minute <= 2000:
            raise UsageError(
                f"--wpm must be between 20 and 2000 words per minute, got {self.words_per_minute:g}"
            )
        if self.key_terms < 1:
            raise UsageError(f"key_terms must be at least 1, got {self.key_terms}")


@dataclass(frozen=True, slots=True)
class ComparisonSettings:
    """Every threshold that decides a comparison's verdicts, in one validated object.

    A study file can set them in ``[comparison]`` (docs/study-file.md); the JSON report records
    them, so a report can be reproduced. The defaults and their reasons are in
    :data:`COMPARISON_REASONS` and docs/comparison.md; all but ``alpha`` are judgment calls.
    """

    # Passage alignment: two passages pair when their TF-IDF cosine exceeds this ...
    pair_threshold: float = 0.25
    # ... and a pair below this similarity is a rewritten passage (at or above: the same).
    rewritten_below: float = 0.70
    # Key terms of each version checked for coverage in the other.
    key_terms: int = 30
    # A run of text cut from (or added to) a paired passage is content when at least this
    # share of its distinct content terms, and at least min_novel_terms of them, are new ...
    novel_share: float = 0.5
    min_novel_terms: int = 3
    # ... and it has at least this many words.
    min_run_words: int = 6
    # A post-test item is taught where this share of its weighted terms is covered.
    coverage_threshold: float = 0.6
    # Terms of an item's answer weigh this many times a question-only term.
    answer_factor: float = 2.0
    # Significance level of the Welch, TOST and per-section tests.
    alpha: float = 0.05
    # A section is tested on its own with at least this many sentences in each version.
    min_section_sentences: int = 3

    def __post_init__(self) -> None:
        shares = ("pair_threshold", "rewritten_below", "novel_share", "coverage_threshold")
        for name in shares:
            value = getattr(self, name)
            if not 0 < value <= 1:
                raise UsageError(f"comparison.{name} must be a share in (0, 1], got {value!r}")
        if not 0 < self.alpha <= 0.5:
            raise UsageError(f"comparison.alpha must be in (0, 0.5], got {self.alpha!r}")
        if self.pair_threshold >= self.rewritten_below:
            raise UsageError(
                "comparison.pair_threshold must be below comparison.rewritten_below "
                f"({self.pair_threshold:g} ≥ {self.rewritten_below:g})"
            )
        for name in ("key_terms", "min_novel_terms", "min_run_words", "min_section_sentences"):
            value = getattr(self, name)
            if isinstance(value, bool) or not isinstance(value, int) or value < 1:
                raise UsageError(f"comparison.{name} must be a whole number ≥ 1, got {value!r}")
        if not 1 <= self.answer_factor <= 10:
            raise UsageError(
                f"comparison.answer_factor must be between 1 and 10, got {self.answer_factor!r}"
            )

    def as_dict(self) -> dict[str, float]:
        from dataclasses import asdict

        return asdict(self)


DEFAULT_COMPARISON = ComparisonSettings()

COMPARISON_REASONS = {
    "pair_threshold": "judgment call: paired only when more alike than unrelated passages",
    "rewritten_below": "judgment call: below this cosine a counterpart is a rewrite",
    "key_terms": "judgment call: enough terms to cover a lesson's topics",
    "novel_share": "judgment call: a sentence cut with what it taught, not a restatement",
    "min_novel_terms": "judgment call: a sentence that teaches names several things",
    "min_run_words": "judgment call: shorter runs are edits, not content",
    "coverage_threshold": "judgment call (common practice for keyword matching)",
    "answer_factor": "judgment call: the answer is what the lesson must teach",
    "alpha": "conventional significance level (common practice)",
    "min_section_sentences": "judgment call: fewer sentences cannot show a shift",
}
