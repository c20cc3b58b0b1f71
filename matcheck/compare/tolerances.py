"""Default tolerances, one per measure, each with its reason; and ``--tolerance`` parsing.

Most defaults are judgment calls of common practice, and say so: no published standard says
how many words two lesson versions may differ by. Where a default is derived (words per
sentence from one Flesch–Kincaid grade) the derivation is the reason. docs/tolerances.md
renders this table.
"""

from __future__ import annotations

import re
from collections.abc import Iterable, Mapping

from matcheck.errors import UsageError
from matcheck.findings import Tolerance

EXACT = "counts of discrete elements a learner sees; any difference is visible"
JUDGMENT = "judgment call (common practice), not a published threshold"

DEFAULT_TOLERANCES: dict[str, Tolerance] = {
    # length
    "words": Tolerance(relative=0.05, reason=f"5% of the reference; {JUDGMENT}"),
    "sentences": Tolerance(relative=0.10, absolute=1, reason=f"10% of the reference; {JUDGMENT}"),
    "paragraphs": Tolerance(
        relative=0.10, absolute=1, reason=f"10% (at least one paragraph); {JUDGMENT}"
    ),
    "characters": Tolerance(relative=0.05, reason="follows words: the same 5%"),
    "reading_time": Tolerance(relative=0.05, reason="follows words: the same 5%"),
    # readability
    "flesch_reading_ease": Tolerance(
        absolute=5, reason=f"half of one 10-point Flesch (1949) band; {JUDGMENT}"
    ),
    "flesch_kincaid_grade": Tolerance(absolute=1, reason="one school grade"),
    "gunning_fog": Tolerance(absolute=1, reason="one school grade"),
    "smog": Tolerance(absolute=1, reason="one school grade (its standard error is 1.5)"),
    "coleman_liau": Tolerance(absolute=1, reason="one school grade"),
    "automated_readability": Tolerance(absolute=1, reason="one school grade"),
    "dale_chall": Tolerance(
        absolute=0.5, reason="half a score point; one point spans about two grades"
    ),
    "words_per_sentence": Tolerance(
        absolute=2.5,
        reason="≈ one Flesch–Kincaid grade (0.39 grade per word of sentence length)",
    ),
    "syllables_per_word": Tolerance(
        absolute=0.085,
        reason="≈ one Flesch–Kincaid grade (11.8 grades per syllable per word)",
    ),
    "long_words_share": Tolerance(absolute=0.03, reason=f"3 percentage points; {JUDGMENT}"),
    "rare_words_share": Tolerance(absolute=0.03, reason=f"3 percentage points; {JUDGMENT}"),
    "mtld": Tolerance(relative=0.15, reason=f"15% of the reference; {JUDGMENT}"),
    # content
    "key_term_coverage": Tolerance(
        absolute=0.10,
        reason=f"each version carries at least 90% of the other's key-term weight; {JUDGMENT}",
    ),
    "passages_removed": Tolerance(reason="every passage of the reference has a counterpart"),
    "passages_added": Tolerance(reason="every passage has a counterpart in the reference"),
    "passages_rewritten": Tolerance(reason="a weak counterpart is a content change"),
    "passages_moved": Tolerance(reason="order is part of instruction"),
    "text_removed": Tolerance(
        reason="a sentence cut from a passage, with content found nowhere else in the version"
    ),
    "text_added": Tolerance(
        reason="a sentence added to a passage, with content the reference has nowhere"
    ),
    # figures
    "figures": Tolerance(reason=EXACT),
    "figure_pixel_area": Tolerance(relative=0.10, reason=f"10%; {JUDGMENT}"),
    "figure_display_area": Tolerance(relative=0.10, reason=f"10%; {JUDGMENT}"),
    "captions": Tolerance(reason=EXACT),
    "caption_words": Tolerance(relative=0.10, absolute=2, reason=f"10% (at least 2); {JUDGMENT}"),
    "figures_without_alt_text": Tolerance(reason=EXACT),
    "figures_unreadable": Tolerance(reason="an unreadable picture cannot be compared"),
    # structure
    "headings": Tolerance(reason=EXACT),
    "sections": Tolerance(reason=EXACT),
    "lists": Tolerance(reason=EXACT),
    "list_items": Tolerance(reason=EXACT),
    "tables": Tolerance(reason=EXACT),
    # signaling
    "emphasized_words": Tolerance(
        relative=0.05, absolute=2, reason=f"5% (at least 2 words); {JUDGMENT}"
    ),
    "emphasized_terms": Tolerance(
        relative=0.05, absolute=1, reason=f"5% (at least one term); {JUDGMENT}"
    ),
}
for _level in range(1, 7):
    DEFAULT_TOLERANCES[f"headings_level_{_level}"] = Tolerance(reason=EXACT)
for _kind in ("bold", "italic", "underline", "highlight"):
    DEFAULT_TOLERANCES[f"{_kind}_words"] = Tolerance(
        relative=0.05, absolute=2, reason=f"5% (at least 2 words); {JUDGMENT}"
    )

# Content findings count differences (or a shortfall) from zero: a share of zero is nothing.
COUNTED_FROM_ZERO = frozenset(
    {
        "key_term_coverage",
        "passages_removed",
        "passages_added",
        "passages_rewritten",
        "passages_moved",
        "text_removed",
        "text_added",
    }
)

_OVERRIDE = re.compile(r"^\s*([a-z0-9_]+)\s*=\s*([0-9]*\.?[0-9]+)\s*(%?)\s*$")


def parse_tolerances(
    overrides: Iterable[str], known: Iterable[str], base: Mapping[str, Tolerance] | None = None
) -> dict[str, Tolerance]:
    """Apply ``MEASURE=VALUE`` overrides (``VALUE%`` for relative) to the defaults."""
    tolerances = dict(DEFAULT_TOLERANCES if base is None else base)
    names = set(known) | set(tolerances)
    for text in overrides:
        match = _OVERRIDE.match(text)
        if not match:
            raise UsageError(
                f"--tolerance {text!r}: expected MEASURE=VALUE or MEASURE=VALUE% "
                "(e.g. words=3% or flesch_kincaid_grade=0.5)"
            )
        name, number, percent = match.groups()
        if name not in names:
            raise UsageError(
                f"--tolerance {text!r}: unknown measure {name!r} (see `matcheck measures`)"
            )
        value = float(number)
        if percent and name in COUNTED_FROM_ZERO:
            raise UsageError(
                f"--tolerance {text!r}: {name} is judged from zero, so give a number "
                f"(e.g. {name}={'0.2' if name == 'key_term_coverage' else '1'}), not a percentage"
            )
        tolerances[name] = (
            Tolerance(relative=value / 100, reason="set by the user")
            if percent
            else Tolerance(absolute=value, reason="set by the user")
        )
    return tolerances
