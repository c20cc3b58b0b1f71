"""Compare measured versions: one finding per measure and pair, root causes named.

Detecting (the measures, the content model) is kept apart from deciding
(:mod:`matcheck.compare.decide`, the one place where a status is chosen) and from locating
(:mod:`matcheck.compare.evidence`, which attaches what in the text shows a difference).
"""

from __future__ import annotations

from collections.abc import Iterable, Mapping, Sequence
from dataclasses import replace

from matcheck.compare.code import code_observations
from matcheck.compare.content import PairContent, build_model, compare_content
from matcheck.compare.decide import Observation, decide, decide_mean, decide_sections
from matcheck.compare.evidence import locate
from matcheck.findings import Basis, Evidence, Finding, Group, Spread, Status, Tolerance
from matcheck.intent import expand_manipulated
from matcheck.measures import comparisons, registry
from matcheck.measures.base import MeasureSpec, Profile, Role
from matcheck.settings import DEFAULT_COMPARISON, ComparisonSettings


def compare_profiles(
    profiles: Mapping[str, Profile],
    reference: str,
    manipulated: Sequence[str],
    tolerances: Mapping[str, Tolerance],
    settings: ComparisonSettings = DEFAULT_COMPARISON,
) -> tuple[tuple[Finding, ...], tuple[Spread, ...]]:
    """All findings of every version against ``reference``, and the spread over all."""
    pairs = [(reference, name, tuple(manipulated)) for name in profiles if name != reference]
    return compare_pairs(profiles, pairs, tolerances, settings)


def compare_pairs(
    profiles: Mapping[str, Profile],
    pairs: Sequence[tuple[str, str, tuple[str, ...]]],
    tolerances: Mapping[str, Tolerance],
    settings: ComparisonSettings = DEFAULT_COMPARISON,
) -> tuple[tuple[Finding, ...], tuple[Spread, ...]]:
    """Findings for each ``(reference, condition, manipulated)`` pair, and the spread.

    One content model (TF-IDF over the passages of every version) serves all pairs.
    """
    model = build_model({name: profile.analysis for name, profile in profiles.items()})
    findings: list[Finding] = []
    for reference, name, manipulated in pairs:
        intended = expand_manipulated(manipulated)
        ref, profile = profiles[reference], profiles[name]
        content = compare_content(model, reference, name, settings)
        observed = list(_measured(ref, profile, reference, name, tolerances, settings))
        observed.extend(_content(content, reference, name, tolerances))
        observed.extend(code_observations(ref, profile, reference, name, tolerances))
        findings.extend(locate(decide(observed, intended), ref, profile, content))
    spreads = _spreads(profiles, findings) if len(profiles) > 2 else ()
    return tuple(findings), spreads


def _specs(*profiles: Profile) -> list[MeasureSpec]:
    """The compared specs the profiles hold, in the order they were measured."""
    seen: dict[str, MeasureSpec] = {}
    for profile in profiles:
        for measurement in profile.measurements:
            if measurement.spec.role is Role.MEASURED:
                seen.setdefault(measurement.id, measurement.spec)
    return list(seen.values())


def _measured(
    ref: Profile,
    other: Profile,
    ref_name: str,
    name: str,
    tolerances: Mapping[str, Tolerance],
    settings: ComparisonSettings,
) -> Iterable[Observation]:
    for spec in _specs(ref, other):
        ref_m, other_m = ref.get(spec.id), other.get(spec.id)
        # A heading level absent from one version is zero there, not unknown.
        a = ref_m.value if ref_m else 0.0
        b = other_m.value if other_m else 0.0
        if a is None and b is None:
            continue
        tolerance = tolerances.get(spec.id, spec.tolerance)
        difference = None if a is None or b is None else b - a
        judged = None
        if ref_m and other_m and ref_m.sample and other_m.sample:
            judged = decide_mean(ref_m.sample, other_m.sample, tolerance, settings.alpha)
            if judged[0] is not Basis.BEYOND_TOLERANCE:
                local = decide_sections(
                    ref_m, other_m, tolerance, settings.alpha, settings.min_section_sentences
                )
                judged = local or judged
        notes = [
            f"{label}: {m.note}"
            for label, m in ((ref_name, ref_m), (name, other_m))
            if m is not None and m.value is None and m.note
        ]
        yield Observation(
            spec=spec,
            reference=ref_name,
            condition=name,
            values={ref_name: a, name: b},
            difference=difference,
            amount=difference,
            tolerance=tolerance,
            base=a or 0.0,
            judged=judged,
            unknown=tuple(notes),
        )


def _content(
    content: PairContent,
    ref_name: str,
    name: str,
    tolerances: Mapping[str, Tolerance],
) -> Iterable[Observation]:
    def tolerance(spec: MeasureSpec) -> Tolerance:
        return tolerances.get(spec.id, spec.tolerance)

    sizes = {
        ref_name: float(len(content.alignment.pairs) + len(content.removed)),
        name: float(len(content.alignment.pairs) + len(content.added)),
    }

    def counted(spec: MeasureSpec, evidence: tuple[Evidence, ...], detail: str = "") -> Observation:
        observation = Observation(
            spec=spec,
            reference=ref_name,
            condition=name,
            values=dict(sizes),
            difference=float(len(evidence)),
            amount=float(len(evidence)),
            tolerance=tolerance(spec),
            evidence=evidence,
        )
        if not detail:
            return observation
        return replace(
            observation,
            beyond=f"{observation.beyond} ({detail})",
            within=f"{observation.within} ({detail})",
        )

    # Changed facts first: the most dangerous confound, shown first among content findings.
    yield counted(comparisons.FACTS_CHANGED, content.facts)
    cover_ref = content.coverage_of_reference
    cover_other = content.coverage_of_version
    shortfall = 1.0 - min(cover_ref.share, cover_other.share)
    spec = comparisons.KEY_TERM_COVERAGE
    yield Observation(
        spec=spec,
        reference=ref_name,
        condition=name,
        values={ref_name: cover_other.share, name: cover_ref.share},
        difference=shortfall,
        amount=shortfall,
        tolerance=tolerance(spec),
        evidence=cover_ref.missing + cover_other.missing,
    )
    counts = {
        comparisons.PASSAGES_REMOVED: content.removed,
        comparisons.PASSAGES_ADDED: content.added,
        comparisons.PASSAGES_REWRITTEN: content.rewritten,
        comparisons.PASSAGES_MOVED: content.moved,
        comparisons.TEXT_REMOVED: content.text_lost,
        comparisons.TEXT_ADDED: content.text_new,
    }
    for spec, evidence in counts.items():
        yield counted(spec, evidence)
    # Rewording is judged per passage (its threshold); the lesson's share is said beside it.
    yield counted(comparisons.PASSAGES_REWORDED, content.reworded, content.describe_rewording())


def _spreads(profiles: Mapping[str, Profile], findings: Sequence[Finding]) -> tuple[Spread, ...]:
    worst: dict[str, Status] = {}
    order = [Status.DIFFERS, Status.INCONCLUSIVE, Status.INTENDED, Status.MATCHED]
    info: dict[str, tuple[Group, str]] = {}
    for finding in findings:
        current = worst.get(finding.dimension, Status.MATCHED)
        if order.index(finding.status) < order.index(current):
            current = finding.status
        worst[finding.dimension] = current
        info[finding.dimension] = (finding.group, finding.unit)
    spreads = []
    for dimension, status in worst.items():
        spec = registry.spec(dimension)
        if spec is not None and spec.from_zero:
            continue
        values = [
            value
            for profile in profiles.values()
            if (value := profile.value(dimension)) is not None
        ]
        if not values:
            continue
        group, unit = info[dimension]
        spreads.append(Spread(dimension, group, unit, min(values), max(values), status))
    return tuple(spreads)
