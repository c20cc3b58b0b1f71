"""The located evidence each finding carries: what in the text shows a difference.

Evidence goes to root findings that differ, are intended or are inconclusive; an echo (a
finding with ``caused_by``) is shown under its cause and needs none of its own. Which
passages, headings, list items, figures or emphasised terms differ is found here, by looking
at the two documents; the status was already decided (:mod:`matcheck.compare.decide`).
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import replace

from matcheck.compare.content import PairContent
from matcheck.compare.decide import ACTIVE
from matcheck.compare.outline import heading_levels
from matcheck.findings import Evidence, EvidenceKind, Finding
from matcheck.measures import registry
from matcheck.measures.base import Profile
from matcheck.model import BlockKind, Figure, Location

MAX_EVIDENCE = 12


def locate(
    findings: Sequence[Finding], ref: Profile, other: Profile, content: PairContent
) -> list[Finding]:
    """``findings`` with evidence attached where the documents show it."""
    located: list[Finding] = []
    for finding in findings:
        known = all(value is not None for value in finding.values.values())
        if finding.status in ACTIVE and known and not finding.evidence:
            evidence = _evidence(finding, ref, other, content)
            if evidence:
                finding = replace(finding, evidence=tuple(evidence[:MAX_EVIDENCE]))
        located.append(finding)
    return located


def _evidence(
    finding: Finding, ref: Profile, other: Profile, content: PairContent
) -> list[Evidence]:
    dimension = finding.dimension
    if finding.caused_by:
        return []
    if dimension in ("words", "paragraphs", "sentences", "characters", "reading_time"):
        return [*content.removed, *content.added, *content.edits]
    names = (finding.reference, finding.condition)
    if dimension == "words_per_sentence":
        return _sentence_lengths_by_section(ref, other, names)
    if dimension == "headings" or _follows(dimension, "headings"):
        found = _blocks_only_in_one(ref, other, names, BlockKind.HEADING, _HEADING)
        return found or heading_levels(ref.document, other.document, names)
    if dimension in ("code_blocks", "code_lines"):
        return _blocks_only_in_one(ref, other, names, BlockKind.CODE, _CODE_LINE)
    if dimension in ("list_items", "lists"):
        return _blocks_only_in_one(ref, other, names, BlockKind.LIST_ITEM, _LIST_ITEM)
    if dimension == "tables":
        return _blocks_only_in_one(ref, other, names, BlockKind.TABLE_CELL, _TABLE_CELL)
    if dimension == "figures":
        return _figures(ref, other, names)
    if dimension in ("captions", "caption_words"):
        return _blocks_only_in_one(ref, other, names, BlockKind.CAPTION, _CAPTION)
    if dimension == "figures_without_alt_text":
        return [
            Evidence(EvidenceKind.NO_ALT_TEXT, name, f.caption or f.source, f.location)
            for name, profile in zip(names, (ref, other), strict=True)
            for f in profile.document.figures
            if not f.alt_text
        ]
    if dimension == "emphasized_words" or _follows(dimension, "emphasized_words"):
        return _emphasis(ref, other, names)
    return []


def _follows(dimension: str, cause: str) -> bool:
    spec = registry.spec(dimension)
    return spec is not None and any(c.measure == cause for c in spec.follows)


_HEADING = (EvidenceKind.HEADING_REMOVED, EvidenceKind.HEADING_ADDED)
_LIST_ITEM = (EvidenceKind.LIST_ITEM_REMOVED, EvidenceKind.LIST_ITEM_ADDED)
_TABLE_CELL = (EvidenceKind.TABLE_CELL_REMOVED, EvidenceKind.TABLE_CELL_ADDED)
_CAPTION = (EvidenceKind.CAPTION_REMOVED, EvidenceKind.CAPTION_ADDED)
_CODE_LINE = (EvidenceKind.CODE_LINE_REMOVED, EvidenceKind.CODE_LINE_ADDED)


def _blocks_only_in_one(
    ref: Profile,
    other: Profile,
    names: tuple[str, str],
    kind: BlockKind,
    kinds: tuple[EvidenceKind, EvidenceKind],
) -> list[Evidence]:
    removed, added = kinds
    evidence: list[Evidence] = []
    ref_texts = {b.text.lower() for b in ref.document.blocks_of(kind)}
    other_texts = {b.text.lower() for b in other.document.blocks_of(kind)}
    for block in ref.document.blocks_of(kind):
        if block.text.lower() not in other_texts:
            evidence.append(Evidence(removed, names[0], block.text, block.location))
    for block in other.document.blocks_of(kind):
        if block.text.lower() not in ref_texts:
            evidence.append(Evidence(added, names[1], block.text, block.location))
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
        Evidence(EvidenceKind.FIGURE_ADDED, names[1], label(f), f.location)
        for f in other_figures
        if label(f).lower() not in ref_labels
    ]
    evidence += [
        Evidence(EvidenceKind.FIGURE_REMOVED, names[0], label(f), f.location)
        for f in ref_figures
        if label(f).lower() not in other_labels
    ]
    if not evidence and len(ref_figures) != len(other_figures):
        larger, name, kind = (
            (other_figures, names[1], EvidenceKind.FIGURE_ADDED)
            if len(other_figures) > len(ref_figures)
            else (ref_figures, names[0], EvidenceKind.FIGURE_REMOVED)
        )
        evidence = [Evidence(kind, name, label(f), f.location) for f in larger]
    return evidence


def _emphasis(ref: Profile, other: Profile, names: tuple[str, str]) -> list[Evidence]:
    def terms(profile: Profile) -> dict[str, float]:
        measurement = profile.get("emphasized_terms")
        return dict(measurement.items) if measurement else {}

    a, b = terms(ref), terms(other)
    evidence = [
        Evidence(EvidenceKind.EMPHASIS_ADDED, names[1], term, weight=count)
        for term, count in b.items()
        if term not in a
    ]
    evidence += [
        Evidence(EvidenceKind.EMPHASIS_REMOVED, names[0], term, weight=count)
        for term, count in a.items()
        if term not in b
    ]
    return evidence


def _sentence_lengths_by_section(
    ref: Profile, other: Profile, names: tuple[str, str]
) -> list[Evidence]:
    """Sections whose mean sentence length moved most, by heading text."""

    def by_section(profile: Profile) -> dict[str, tuple[float, int, Location]]:
        sums: dict[str, list[int]] = {}
        first: dict[str, Location] = {}
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
                EvidenceKind.SENTENCE_LENGTH_CHANGED,
                names[1],
                f"{section or '(before the first heading)'}: {mean_a:.1f} → {mean_b:.1f} words "
                f"per sentence ({n_a} → {n_b} sentences)",
                location=location,
            )
        )
    return evidence
