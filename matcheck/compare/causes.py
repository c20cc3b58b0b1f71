"""Root causes, not echoes; and the located evidence each finding carries.

One change to a lesson moves several measures: more words take longer to read, longer
sentences raise every grade formula, a list turned into prose leaves a paragraph behind.
:func:`explain` names the root cause of each such echo (``caused_by``) so reports show one
confound once, and an echo of an intended difference is intended too.

The rules are explicit and few (documented in docs/comparison.md):

- reading time and characters follow words;
- the sentence count follows words per sentence when that differs, else words;
- the paragraph count follows list items when a list became prose (or back), else the
  passages added or removed;
- each grade formula follows words per sentence, syllables per word or the rare-word share
  (the first that differs), since those are its inputs;
- heading levels and sections follow headings; lists follow list items; each kind of
  emphasis and the emphasised terms follow emphasised words; figure sizes, captions and
  alt text follow the number of figures.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import replace

from matcheck.compare.content import PairContent
from matcheck.findings import Evidence, Finding, Status
from matcheck.measures.base import Profile
from matcheck.model import BlockKind, Figure

# Each grade formula and the comparable means that stand for its inputs.
FORMULA_INPUTS: dict[str, tuple[str, ...]] = {
    "flesch_reading_ease": ("words_per_sentence", "syllables_per_word"),
    "flesch_kincaid_grade": ("words_per_sentence", "syllables_per_word"),
    "gunning_fog": ("words_per_sentence", "syllables_per_word"),
    "smog": ("words_per_sentence", "syllables_per_word"),
    "coleman_liau": ("words_per_sentence", "long_words_share"),
    "automated_readability": ("words_per_sentence", "long_words_share"),
    "dale_chall": ("words_per_sentence", "rare_words_share"),
}
# Measures that follow from another: an echo of the first, and intended when it is manipulated.
IMPLIED: dict[str, tuple[str, ...]] = {
    "figures": (
        "figure_pixel_area",
        "figure_display_area",
        "captions",
        "caption_words",
        "figures_without_alt_text",
        "figures_unreadable",
    ),
    "words": ("reading_time", "characters"),
    "headings": (*(f"headings_level_{n}" for n in range(1, 7)), "sections"),
    "list_items": ("lists",),
    "emphasized_words": (
        "bold_words",
        "italic_words",
        "underline_words",
        "highlight_words",
        "emphasized_terms",
    ),
}
FIGURE_ECHOES = IMPLIED["figures"]
EMPHASIS_ECHOES = IMPLIED["emphasized_words"]
MAX_EVIDENCE = 12
_ACTIVE = (Status.DIFFERS, Status.INTENDED, Status.INCONCLUSIVE)


def explain(
    findings: Sequence[Finding], ref: Profile, other: Profile, content: PairContent
) -> list[Finding]:
    by_id = {finding.dimension: finding for finding in findings}

    def active(dimension: str) -> bool:
        finding = by_id.get(dimension)
        return finding is not None and finding.status in _ACTIVE

    causes: dict[str, str] = {}
    for echo in ("reading_time", "characters"):
        causes[echo] = "words"
    causes["sentences"] = "words_per_sentence" if active("words_per_sentence") else "words"
    if active("list_items") and _opposite(by_id.get("paragraphs"), by_id.get("list_items")):
        causes["paragraphs"] = "list_items"
    elif active("passages_removed") or active("passages_added"):
        causes["paragraphs"] = (
            "passages_removed" if active("passages_removed") else "passages_added"
        )
    for formula, inputs in FORMULA_INPUTS.items():
        for source in inputs:
            if active(source):
                causes[formula] = source
                break
    for level in range(1, 7):
        causes[f"headings_level_{level}"] = "headings"
    causes["sections"] = "headings"
    causes["lists"] = "list_items"
    for echo in EMPHASIS_ECHOES:
        causes[echo] = "emphasized_words"
    for echo in FIGURE_ECHOES:
        causes[echo] = "figures"

    explained: list[Finding] = []
    for finding in findings:
        cause = causes.get(finding.dimension)
        if cause and finding.status in _ACTIVE and active(cause):
            root = by_id[cause]
            finding = replace(finding, caused_by=cause)
            if root.status is Status.INTENDED and finding.status is not Status.INTENDED:
                finding = replace(
                    finding, status=Status.INTENDED, reason=f"follows from the manipulated {cause}"
                )
            elif root.status is Status.INCONCLUSIVE and finding.status is Status.DIFFERS:
                # An echo cannot be surer than its cause.
                finding = replace(
                    finding, status=Status.INCONCLUSIVE, reason=f"follows {cause}, inconclusive"
                )
        known = all(value is not None for value in finding.values.values())
        if finding.status in _ACTIVE and known and not finding.evidence:
            evidence = _evidence(finding, ref, other, content)
            if evidence:
                finding = replace(finding, evidence=tuple(evidence[:MAX_EVIDENCE]))
        explained.append(finding)
    return explained


def _opposite(a: Finding | None, b: Finding | None) -> bool:
    if a is None or b is None or a.difference is None or b.difference is None:
        return False
    return a.difference * b.difference < 0


def _evidence(
    finding: Finding, ref: Profile, other: Profile, content: PairContent
) -> list[Evidence]:
    dimension = finding.dimension
    if finding.caused_by:
        return []
    if dimension in ("words", "paragraphs", "sentences"):
        return [*content.removed, *content.added, *content.edits]
    names = (finding.reference, finding.condition)
    if dimension == "words_per_sentence":
        return _sentence_lengths_by_section(ref, other, names)
    if dimension == "headings" or dimension.startswith("headings_level"):
        return _blocks_only_in_one(ref, other, names, BlockKind.HEADING, "heading")
    if dimension in ("list_items", "lists"):
        return _blocks_only_in_one(ref, other, names, BlockKind.LIST_ITEM, "list_item")
    if dimension == "tables":
        return _blocks_only_in_one(ref, other, names, BlockKind.TABLE_CELL, "table_cell")
    if dimension == "figures":
        return _figures(ref, other, names)
    if dimension in ("emphasized_words", *EMPHASIS_ECHOES):
        return _emphasis(ref, other, names)
    return []


def _blocks_only_in_one(
    ref: Profile, other: Profile, names: tuple[str, str], kind: BlockKind, label: str
) -> list[Evidence]:
    evidence: list[Evidence] = []
    ref_texts = {b.text.lower() for b in ref.document.blocks_of(kind)}
    other_texts = {b.text.lower() for b in other.document.blocks_of(kind)}
    for block in ref.document.blocks_of(kind):
        if block.text.lower() not in other_texts:
            evidence.append(Evidence(f"{label}_removed", names[0], block.text, block.location))
    for block in other.document.blocks_of(kind):
        if block.text.lower() not in ref_texts:
            evidence.append(Evidence(f"{label}_added", names[1], block.text, block.location))
    return evidence


def _figures(ref: Profile, other: Profile, names: tuple[str, str]) -> list[Evidence]:
    """Figures whose label (caption, alt text or source) the other version lacks; when the
    labels do not tell them apart, every figure of the version with more."""

    def label(figure: Figure) -> str:
        return figure.caption or figure.alt_text or figure.source

    ref_figures, other_figures = ref.document.figures, other.document.figures
    ref_labels = {label(f).lower() for f in ref_figures}
    other_labels = {label(f).lower() for f in other_figures}
    evidence = [
        Evidence("figure_added", names[1], label(f), f.location)
        for f in other_figures
        if label(f).lower() not in ref_labels
    ]
    evidence += [
        Evidence("figure_removed", names[0], label(f), f.location)
        for f in ref_figures
        if label(f).lower() not in other_labels
    ]
    if not evidence and len(ref_figures) != len(other_figures):
        larger, name, kind = (
            (other_figures, names[1], "figure_added")
            if len(other_figures) > len(ref_figures)
            else (ref_figures, names[0], "figure_removed")
        )
        evidence = [Evidence(kind, name, label(f), f.location) for f in larger]
    return evidence


def _emphasis(ref: Profile, other: Profile, names: tuple[str, str]) -> list[Evidence]:
    def terms(profile: Profile) -> dict[str, float]:
        measurement = profile.get("emphasized_terms")
        return dict(measurement.items) if measurement else {}

    a, b = terms(ref), terms(other)
    evidence = [
        Evidence("emphasis_added", names[1], term, weight=count)
        for term, count in b.items()
        if term not in a
    ]
    evidence += [
        Evidence("emphasis_removed", names[0], term, weight=count)
        for term, count in a.items()
        if term not in b
    ]
    return evidence


def _sentence_lengths_by_section(
    ref: Profile, other: Profile, names: tuple[str, str]
) -> list[Evidence]:
    """Sections whose mean sentence length moved most, by heading text."""

    def by_section(profile: Profile) -> dict[str, tuple[float, int, object]]:
        sums: dict[str, list[int]] = {}
        first: dict[str, object] = {}
        for item in profile.analysis.blocks:
            if item.block.kind not in (
                BlockKind.PARAGRAPH,
                BlockKind.LIST_ITEM,
                BlockKind.FOOTNOTE,
            ):
                continue
            section = item.block.location.section or ""
            for sentence in item.sentences:
                sums.setdefault(section, []).append(sentence.word_count)
                first.setdefault(section, item.block.location)
        return {s: (sum(v) / len(v), len(v), first[s]) for s, v in sums.items() if v}

    a, b = by_section(ref), by_section(other)
    rows = []
    for section, (mean_a, n_a, _) in a.items():
        if section in b:
            mean_b, n_b, location = b[section]
            rows.append((abs(mean_b - mean_a), section, mean_a, mean_b, n_a, n_b, location))
    rows.sort(key=lambda row: -row[0])
    evidence = []
    for delta, section, mean_a, mean_b, n_a, n_b, location in rows[:5]:
        if delta < 1.0:
            break
        evidence.append(
            Evidence(
                "sentence_length_changed",
                names[1],
                f"{section or '(before the first heading)'}: {mean_a:.1f} → {mean_b:.1f} words "
                f"per sentence ({n_a} → {n_b} sentences)",
                location=location,  # type: ignore[arg-type]
            )
        )
    return evidence
