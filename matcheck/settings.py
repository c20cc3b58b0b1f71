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
