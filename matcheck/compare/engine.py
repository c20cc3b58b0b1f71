"""Compare measured versions: one finding per measure and pair, root causes named.

Detecting (the measures, the content model) is kept apart from deciding (the tolerance and
the declared manipulation, :mod:`matcheck.compare.verdicts`) and from explaining
(:mod:`matcheck.compare.causes`, which links echoes to their root cause and attaches the
located evidence).
"""

from __future__ import annotations

from collections.abc import Iterable, Mapping, Sequence

from matcheck.compare import causes
from matcheck.compare.causes import IMPLIED
from matcheck.compare.content import PairContent, build_model, compare_content
from matcheck.compare.verdicts import decide, decide_mean, decide_sections
from matcheck.errors import UsageError
from matcheck.findings import Finding, Spread, Status, Tolerance
from matcheck.measures import CATALOGUE
from matcheck.measures.base import Group, Profile

CONTENT_DIMENSIONS = {
    "key_term_coverage": "share",
    "passages_removed": "passages",
    "passages_added": "passages",
    "passages_rewritten": "passages",
    "passages_moved": "passages",
    "text_removed": "runs",
    "text_added": "runs",
}
# key_terms is a profile listing; the comparison judges content by coverage and alignment.
NOT_COMPARED = {"key_terms"}


def known_dimensions() -> dict[str, str]:
    """Every comparable measure id -> its group."""
    dims = {spec.id: spec.group.value for spec in CATALOGUE.values() if spec.id not in NOT_COMPARED}
    dims.update(dict.fromkeys(CONTENT_DIMENSIONS, Group.CONTENT.value))
    return dims


def expand_manipulated(names: Iterable[str]) -> dict[str, str]:
    """Measure id -> the declared name that makes it intended. Unknown names raise."""
    dims = known_dimensions()
    groups = {group.value for group in Group}
    intended: dict[str, str] = {}
    for name in names:
        if name in groups:
            intended.update({d: name for d, g in dims.items() if g == name and d not in intended})
        elif name in dims:
            intended.setdefault(name, name)
            for implied in IMPLIED.get(name, ()):
                intended.setdefault(implied, name)
        else:
            raise UsageError(
                f"--manipulated {name!r} is neither a group "
                f"({', '.join(sorted(groups))}) nor a measure id (see `matcheck measures`)"
            )
    return intended


def compare_profiles(
    profiles: Mapping[str, Profile],
    reference: str,
    manipulated: Sequence[str],
    tolerances: Mapping[str, Tolerance],
) -> tuple[tuple[Finding, ...], tuple[Spread, ...]]:
    """All findings of every version against ``reference``, and the spread over all."""
    pairs = [(reference, name, tuple(manipulated)) for name in profiles if name != reference]
    return compare_pairs(profiles, pairs, tolerances)


def compare_pairs(
    profiles: Mapping[str, Profile],
    pairs: Sequence[tuple[str, str, tuple[str, ...]]],
    tolerances: Mapping[str, Tolerance],
) -> tuple[tuple[Finding, ...], tuple[Spread, ...]]:
    """Findings for each ``(reference, condition, manipulated)`` pair, and the spread.

    One content model (TF-IDF over the passages of every version) serves all pairs.
    """
    model = build_model({name: profile.analysis for name, profile in profiles.items()})
    findings: list[Finding] = []
    for reference, name, manipulated in pairs:
        intended = expand_manipulated(manipulated)
        ref, profile = profiles[reference], profiles[name]
        content = compare_content(model, reference, name)
        pair = list(_measure_findings(ref, profile, reference, name, intended, tolerances))
        pair.extend(_content_findings(content, profiles, reference, name, intended, tolerances))
        findings.extend(causes.explain(pair, ref, profile, content))
    spreads = _spreads(profiles, findings) if len(profiles) > 2 else ()
    return tuple(findings), spreads


def _ids(*profiles: Profile) -> list[str]:
    seen: dict[str, None] = {}
    for profile in profiles:
        for measurement in profile.measurements:
            if measurement.id not in NOT_COMPARED:
                seen.setdefault(measurement.id, None)
    return list(seen)


def _measure_findings(
    ref: Profile,
    other: Profile,
    ref_name: str,
    name: str,
    intended: Mapping[str, str],
    tolerances: Mapping[str, Tolerance],
) -> Iterable[Finding]:
    for measure_id in _ids(ref, other):
        spec = CATALOGUE.get(measure_id) or next(
            m.spec for p in (ref, other) for m in p.measurements if m.id == measure_id
        )
        ref_m, other_m = ref.get(measure_id), other.get(measure_id)
        # A heading level absent from one version is zero there, not unknown.
        a = ref_m.value if ref_m else 0.0
        b = other_m.value if other_m else 0.0
        if a is None and b is None:
            continue
        tolerance = tolerances.get(measure_id, Tolerance(reason="exact by default"))
        test = None
        if measure_id in intended:
            status, reason = decide(
                a, b, tolerance, intended=True, intended_by=intended[measure_id]
            )
        elif ref_m and other_m and ref_m.sample and other_m.sample:
            status, reason, test = decide_mean(ref_m.sample, other_m.sample, tolerance)
            if status is not Status.DIFFERS:
                local = decide_sections(ref_m, other_m, tolerance)
                if local is not None:
                    status, reason, test = local
        else:
            status, reason = decide(a, b, tolerance, intended=False)
        yield Finding(
            dimension=measure_id,
            group=spec.group.value,
            unit=spec.unit,
            reference=ref_name,
            condition=name,
            status=status,
            values={ref_name: a, name: b},
            difference=None if a is None or b is None else b - a,
            tolerance=tolerance,
            reason=reason,
            test=test,
        )


def _content_findings(
    content: PairContent,
    profiles: Mapping[str, Profile],
    ref_name: str,
    name: str,
    intended: Mapping[str, str],
    tolerances: Mapping[str, Tolerance],
) -> Iterable[Finding]:
    group = Group.CONTENT.value

    def verdict(dimension: str, shortfall: float) -> tuple[Status, str, Tolerance]:
        tolerance = tolerances.get(dimension, Tolerance())
        status, reason = decide(
            0.0,
            shortfall,
            tolerance,
            intended=dimension in intended,
            intended_by=intended.get(dimension, ""),
        )
        return status, reason, tolerance

    cover_ref = content.coverage_of_reference
    cover_other = content.coverage_of_version
    shortfall = 1.0 - min(cover_ref.share, cover_other.share)
    status, reason, tolerance = verdict("key_term_coverage", shortfall)
    yield Finding(
        dimension="key_term_coverage",
        group=group,
        unit="share",
        reference=ref_name,
        condition=name,
        status=status,
        values={ref_name: cover_other.share, name: cover_ref.share},
        difference=shortfall,
        tolerance=tolerance,
        reason=reason,
        evidence=cover_ref.missing + cover_other.missing,
    )
    counts = {
        "passages_removed": content.removed,
        "passages_added": content.added,
        "passages_rewritten": content.rewritten,
        "passages_moved": content.moved,
        "text_removed": content.text_lost,
        "text_added": content.text_new,
    }
    sizes = {
        ref_name: float(len(content.alignment.pairs) + len(content.removed)),
        name: float(len(content.alignment.pairs) + len(content.added)),
    }
    for dimension, evidence in counts.items():
        status, reason, tolerance = verdict(dimension, float(len(evidence)))
        yield Finding(
            dimension=dimension,
            group=group,
            unit="passages",
            reference=ref_name,
            condition=name,
            status=status,
            values=dict(sizes),
            difference=float(len(evidence)),
            tolerance=tolerance,
            reason=reason,
            evidence=evidence,
        )


def _spreads(profiles: Mapping[str, Profile], findings: Sequence[Finding]) -> tuple[Spread, ...]:
    worst: dict[str, Status] = {}
    order = [Status.DIFFERS, Status.INCONCLUSIVE, Status.INTENDED, Status.MATCHED]
    info: dict[str, tuple[str, str]] = {}
    for finding in findings:
        current = worst.get(finding.dimension, Status.MATCHED)
        if order.index(finding.status) < order.index(current):
            current = finding.status
        worst[finding.dimension] = current
        info[finding.dimension] = (finding.group, finding.unit)
    spreads = []
    for dimension, status in worst.items():
        if dimension in CONTENT_DIMENSIONS:
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
