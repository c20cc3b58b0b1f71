"""The note below the table: how to read it, the tolerances, the reading rate, the post-test."""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

from matcheck.report.methods.model import (
    COVERAGE,
    FACTS,
    NOT_PROOF,
    PASSAGES,
    POSTTEST,
    MethodsRow,
)
from matcheck.report.methods.wording import join_list
from matcheck.settings import DEFAULT_WPM


@dataclass(frozen=True, slots=True)
class PostTestItems:
    """What the note says about the post-test: how many items, and which no version teaches."""

    count: int
    threshold: float
    untaught: tuple[str, ...]


def table_notes(
    rows: Sequence[MethodsRow], words_per_minute: float, items: PostTestItems
) -> tuple[str, ...]:
    """The sentences of the note, in order; each is there only if its rows are shown."""
    shown = {row.measure for row in rows}
    notes = [
        "Largest difference: the largest over the compared pairs, in percent of the reference "
        "for measures with a relative tolerance"
        + ("; differences of shares are in percentage points." if _has_shares(shown) else "."),
        "Within tolerance: yes, within the tolerance in every comparison; no, beyond it in at "
        "least one; intended, a difference the design manipulates; n/a, inconclusive.",
    ]
    tolerances = [f"{row.label} {row.tolerance}" for row in rows if row.tolerance]
    if tolerances:
        notes.append(f"Tolerances: {'; '.join(tolerances)}.")
    if COVERAGE in shown:
        notes.append(
            "Key-term coverage: the share of the reference's key-term weight that a version "
            "contains; its difference is the shortfall in either direction."
        )
    if PASSAGES in shown:
        notes.append(
            "Passages without counterpart: passages removed or added against the condition a "
            "version is compared with."
        )
    if FACTS in shown:
        notes.append(
            "Changed facts: numbers, units, negations, comparisons or terms a version states "
            "differently from the condition it is compared with (expected: none)."
        )
    notes.append(_reading_rate(words_per_minute))
    if POSTTEST in shown:
        notes.append(
            f"Post-test items taught: of the {items.count} items, those of which a version "
            f"states at least {items.threshold * 100:g}% of the key terms (weighted) in one "
            "place; exact: each item is taught in both versions of a pair or in neither."
        )
        if items.untaught:
            which = join_list(items.untaught)
            notes.append(
                f"Taught in no version: item{'s' if len(items.untaught) > 1 else ''} {which}."
            )
    notes.append(NOT_PROOF)
    return tuple(notes)


def _has_shares(shown: set[str]) -> bool:
    return bool(shown & {"rare_words_share", COVERAGE})


def _reading_rate(words_per_minute: float) -> str:
    # The default rate and its source: docs/references.md §3.
    if words_per_minute == DEFAULT_WPM:
        return f"Reading time at {words_per_minute:g} words per minute (Brysbaert, 2019)."
    return (
        f"Reading time at {words_per_minute:g} words per minute, the rate set for this study "
        f"(the default, {DEFAULT_WPM:g}, follows Brysbaert, 2019)."
    )
