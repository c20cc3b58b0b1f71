"""The note below the table: how to read it, the tolerances, the reading rate, the post-test."""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

from matcheck.report.methods.contrasts import MARKS, Contrast
from matcheck.report.methods.model import (
    COVERAGE,
    FACTS,
    NOT_PROOF,
    PASSAGES,
    POSTTEST,
    VERDICTS,
    Mention,
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
    rows: Sequence[MethodsRow],
    words_per_minute: float,
    items: PostTestItems,
    *,
    contrasts: Sequence[Contrast] = (),
    mentioned: Sequence[Mention] = (),
    tests: Sequence[str] = (),
) -> tuple[str, ...]:
    """The sentences of the note, in order; each is there only if its rows are shown."""
    shown = {row.measure for row in rows}
    notes = []
    if contrasts:
        notes.append(
            f"Contrasts: {'; '.join(c.describe() for c in contrasts)}. Each contrast column "
            "gives the first version named minus the second (its reference), in percent of the "
            "reference for measures with a relative tolerance"
            + ("; differences of shares are in percentage points." if _has_shares(shown) else ".")
        )
    used = {s for row in rows for s in row.statuses}
    marks = [f"{MARKS[s]} {_MARK_WORDS[s]}" for s in _MARK_WORDS if s in used]
    if marks:
        notes.append(f"Marks: {'; '.join(marks)}.")
    notes.append(
        "Within tolerance, over the contrasts that do not manipulate the measure: yes, within "
        "the tolerance in every one; no, beyond it in at least one; accepted, beyond it but "
        "accepted after review; n/a, inconclusive; manipulated, the design varies the measure "
        "in every contrast."
    )
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
    notes += mention_sentences(mentioned)
    if tests:
        notes.append(f"Equivalence tests: {'; '.join(tests)}.")
    notes.append(NOT_PROOF)
    return tuple(notes)


# What each mark means, in the order the note lists them.
_MARK_WORDS = {
    "intended": "the design manipulates the measure in this contrast (not a difference)",
    "differs": "beyond tolerance",
    "accepted": "beyond tolerance, accepted after review",
    "inconclusive": "inconclusive",
}


def _instance(mention: Mention) -> str:
    parts = [mention.contrast + ("" if mention.difference == "—" else f" {mention.difference}")]
    if mention.where:
        parts.append(mention.where)
    text = ", ".join(parts)
    return f"{text}: {mention.reason}" if mention.reason else text


def _grouped(mentions: Sequence[Mention]) -> str:
    by_label: dict[str, list[str]] = {}
    for mention in mentions:
        follows = mention.follows
        if follows[1:2].islower():
            follows = follows[0].lower() + follows[1:]
        label = mention.label + (f", following {follows}" if follows else "")
        by_label.setdefault(label, []).append(_instance(mention))
    return "; ".join(f"{label} ({'; '.join(parts)})" for label, parts in by_label.items())


def mention_sentences(mentioned: Sequence[Mention], table: str = "this table") -> list[str]:
    """The sentences about differences without a row, post-test items taught differently and
    inconclusive comparisons (the note and the methods paragraph both use them); accepted
    differences are listed apart, with their entry (``MethodsTable.accepted``)."""
    sentences = []
    beyond = [m for m in mentioned if m.verdict == VERDICTS["differs"] and not m.in_table]
    if beyond:
        sentences.append(f"Also beyond tolerance, with no row in {table}: {_grouped(beyond)}.")
    rows = [m for m in mentioned if m.verdict == VERDICTS["differs"] and m.in_table]
    if located := [m for m in rows if not m.item]:
        sentences.append(f"Where the content differs: {_grouped(located)}.")
    if items := [m for m in rows if m.item]:
        sentences.append(f"Post-test items taught differently: {_grouped(items)}.")
    unsure = [m for m in mentioned if m.verdict == VERDICTS["inconclusive"]]
    if unsure:
        sentences.append(
            f"Not compared conclusively (not counted as differences): {_grouped(unsure)}."
        )
    return sentences


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
