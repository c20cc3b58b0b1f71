"""The one decision step: a status and a reason code for every dimension of a pair.

:func:`decide` takes what the comparison observed (:class:`Observation`: values, the amount
judged, the tolerance, any statistical test) and the declared manipulation, and returns the
findings. Its order of reasons is fixed and documented (docs/comparison.md):

1. *declared* — the design manipulates the measure (or its group);
2. *implied* — it is implied by a manipulated measure (its spec's ``implied_by``);
3. *not shown* — a value is unknown in one version (a format cannot show it);
4. a statistical judgement where the measure has one (mean sentence length, below);
5. *within* or *beyond* tolerance;
6. then echoes: a difference that follows a root cause that also differs (its spec's
   ``follows``) is shown under that cause; it is intended when the cause is, and never surer
   than the cause.

Mean sentence length gets a statistical verdict on top of the descriptive one, because it is a
mean over few, widely varying units:

- the sentences *are* the versions (not a sample of them), so a mean within the tolerance is
  *matched*; the report adds the two one-sided Welch tests (TOST; Schuirmann 1987,
  Lakens 2017) with the tolerance as bounds, for the methods section;
- a mean beyond the tolerance is *differs* when a Welch t-test at α = .05 shows a difference,
  and *inconclusive* when neither equivalence (TOST cannot pass with the estimate outside the
  bounds) nor difference can be established: too few, too varied sentences to tell.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from dataclasses import dataclass, replace

from matcheck.findings import Basis, Evidence, Finding, StatTest, Status, Tolerance
from matcheck.measures.base import Measurement, MeasureSpec
from matcheck.settings import DEFAULT_COMPARISON

ALPHA = DEFAULT_COMPARISON.alpha

STATUS_OF = {
    Basis.DECLARED: Status.INTENDED,
    Basis.IMPLIED: Status.INTENDED,
    Basis.WITHIN_TOLERANCE: Status.MATCHED,
    Basis.BEYOND_TOLERANCE: Status.DIFFERS,
    Basis.NOT_SHOWN: Status.INCONCLUSIVE,
    Basis.TEST_INCONCLUSIVE: Status.INCONCLUSIVE,
    Basis.ECHO: Status.INCONCLUSIVE,
    Basis.ACCEPTED: Status.ACCEPTED,  # set after this step, by compare/accept.py
}
ACTIVE = (Status.DIFFERS, Status.INTENDED, Status.INCONCLUSIVE)
Judgement = tuple[Basis, str, StatTest | None]


@dataclass(frozen=True, slots=True)
class Observation:
    """What the comparison saw on one dimension of one pair, before any verdict.

    ``amount`` is what the tolerance judges: the difference from the reference value ``base``
    for a measured value, or a count (a shortfall) from zero for a pairwise dimension; ``None``
    when a value is unknown. ``judged`` carries a statistical judgement that replaces the
    tolerance check; ``beyond`` the words for a difference beyond tolerance.
    """

    spec: MeasureSpec
    reference: str
    condition: str
    values: dict[str, float | None]
    difference: float | None
    amount: float | None
    tolerance: Tolerance
    base: float = 0.0
    judged: Judgement | None = None
    evidence: tuple[Evidence, ...] = ()
    item: str | None = None
    beyond: str = "beyond tolerance: a possible confound"
    within: str = "within tolerance"
    # Why a value is unknown, per version ("text-only.pdf: pdf cannot show underline").
    unknown: tuple[str, ...] = ()


def judge(observation: Observation, intended: Mapping[str, str]) -> Judgement:
    """Steps 1–5 for one observation."""
    spec = observation.spec
    if spec.id in intended:
        by = intended[spec.id]
        basis = Basis.DECLARED if by in (spec.id, spec.group) else Basis.IMPLIED
        return basis, f"manipulated ({by})", None
    if observation.amount is None:
        why = f" ({'; '.join(observation.unknown)})" if observation.unknown else ""
        return Basis.NOT_SHOWN, f"not measurable in every version{why}", None
    if observation.judged is not None:
        return observation.judged
    allowed = observation.tolerance.allowed(observation.base)
    if abs(observation.amount) <= allowed + 1e-12:
        return Basis.WITHIN_TOLERANCE, observation.within, None
    return Basis.BEYOND_TOLERANCE, observation.beyond, None


def decide(observations: Sequence[Observation], intended: Mapping[str, str]) -> list[Finding]:
    """The findings of one pair: each observation judged, then echoes tied to their cause."""
    first = [_finding(o, *judge(o, intended)) for o in observations]
    by_id = {f.dimension: f for f in first if f.item is None}
    specs = {o.spec.id: o.spec for o in observations}

    def active(dimension: str) -> bool:
        finding = by_id.get(dimension)
        return finding is not None and finding.status in ACTIVE

    def cause_of(finding: Finding) -> str | None:
        for cause in specs[finding.dimension].follows:
            if not active(cause.measure):
                continue
            if cause.opposite and not _opposite(finding, by_id[cause.measure]):
                continue
            return cause.measure
        return None

    decided = []
    for finding in first:
        cause = cause_of(finding) if finding.item is None else None
        if cause and finding.status in ACTIVE:
            root = by_id[cause]
            finding = replace(finding, caused_by=cause)
            if root.status is Status.INTENDED and finding.status is not Status.INTENDED:
                finding = replace(
                    finding,
                    status=Status.INTENDED,
                    basis=Basis.IMPLIED,
                    reason=f"follows from the manipulated {cause}",
                )
            elif root.status is Status.INCONCLUSIVE and finding.status is Status.DIFFERS:
                # An echo cannot be surer than its cause.
                finding = replace(
                    finding,
                    status=Status.INCONCLUSIVE,
                    basis=Basis.ECHO,
                    reason=f"follows {cause}, inconclusive",
                )
        decided.append(finding)
    return decided


def _finding(observation: Observation, basis: Basis, reason: str, test: StatTest | None) -> Finding:
    spec = observation.spec
    return Finding(
        dimension=spec.id,
        group=spec.group,
        unit=spec.unit,
        reference=observation.reference,
        condition=observation.condition,
        status=STATUS_OF[basis],
        values=observation.values,
        difference=observation.difference,
        tolerance=observation.tolerance,
        reason=reason,
        evidence=observation.evidence,
        test=test,
        basis=basis,
        item=observation.item,
    )


def _opposite(a: Finding, b: Finding) -> bool:
    if a.difference is None or b.difference is None:
        return False
    return a.difference * b.difference < 0


def decide_mean(
    reference_sample: Sequence[float],
    sample: Sequence[float],
    tolerance: Tolerance,
    alpha: float = ALPHA,
) -> Judgement:
    """Verdict on a difference of means (the sentences of each version are its sample)."""
    import numpy as np

    a = np.asarray(reference_sample, dtype=float)
    b = np.asarray(sample, dtype=float)
    if not a.size or not b.size:
        return Basis.NOT_SHOWN, "no sentences in one version", None
    bound = tolerance.allowed(float(a.mean()))
    difference = float(b.mean() - a.mean())
    if sorted(a.tolist()) == sorted(b.tolist()):
        return Basis.WITHIN_TOLERANCE, "identical sentence lengths", None
    if a.size < 2 or b.size < 2 or (float(a.var()) == 0.0 and float(b.var()) == 0.0):
        basis = Basis.WITHIN_TOLERANCE if abs(difference) <= bound else Basis.BEYOND_TOLERANCE
        return basis, "too few or constant sentence lengths: compared as they are", None
    from matcheck.compare.stats import tost_welch_p, welch_p

    if abs(difference) <= bound:
        p_tost = tost_welch_p(a.tolist(), b.tolist(), -bound, bound)
        test = StatTest("TOST (Welch)", p_tost, f"equivalence bounds ±{bound:.2f} words")
        reason = "within tolerance" + (" (equivalent by TOST)" if p_tost < alpha else "")
        return Basis.WITHIN_TOLERANCE, reason, test
    p_diff = welch_p(a.tolist(), b.tolist())
    test = StatTest("Welch t-test", p_diff, f"difference {difference:+.2f} words")
    if p_diff < alpha:
        return Basis.BEYOND_TOLERANCE, "beyond tolerance: a possible confound", test
    return (
        Basis.TEST_INCONCLUSIVE,
        f"beyond tolerance, but {a.size} and {b.size} sentences vary too much to show "
        "a difference; read the passages",
        test,
    )


MIN_SECTION_SENTENCES = DEFAULT_COMPARISON.min_section_sentences


def decide_sections(
    reference: Measurement,
    other: Measurement,
    tolerance: Tolerance,
    alpha: float = ALPHA,
    min_sentences: int = MIN_SECTION_SENTENCES,
) -> Judgement | None:
    """A mean that matches over the whole lesson can hide one section rewritten: check each
    section that both versions have (same heading) and at least three sentences in each.

    A section differs when its mean moved beyond the tolerance and a Welch t-test shows it
    at α = .05 divided by the number of sections tested (Bonferroni), so that testing many
    sections does not raise false alarms. Returns the largest such shift, or ``None``.
    """
    from matcheck.compare.stats import welch_p

    def by_section(measurement: Measurement) -> dict[str, list[float]]:
        groups: dict[str, list[float]] = {}
        for value, section in zip(measurement.sample, measurement.sample_sections, strict=False):
            groups.setdefault(section, []).append(value)
        return groups

    a, b = by_section(reference), by_section(other)
    shared = [s for s in a if s in b and len(a[s]) >= min_sentences and len(b[s]) >= min_sentences]
    if not shared:
        return None
    alpha = alpha / len(shared)
    worst: tuple[float, str, float, float, float] | None = None
    for section in shared:
        mean_a = sum(a[section]) / len(a[section])
        mean_b = sum(b[section]) / len(b[section])
        if abs(mean_b - mean_a) <= tolerance.allowed(mean_a):
            continue
        if sorted(a[section]) == sorted(b[section]):
            continue
        if len(set(a[section])) < 2 and len(set(b[section])) < 2:
            continue  # constant lengths in both: no variance to test against
        p_value = welch_p(a[section], b[section])
        if p_value < alpha and (worst is None or abs(mean_b - mean_a) > worst[0]):
            worst = (abs(mean_b - mean_a), section, mean_a, mean_b, p_value)
    if worst is None:
        return None
    _, section, mean_a, mean_b, p_value = worst
    name = section or "the text before the first heading"
    test = StatTest(
        "Welch t-test per section (Bonferroni)",
        p_value,
        f"§ {name}: {mean_a:.1f} → {mean_b:.1f}; α = {alpha:.3g}",
    )
    reason = (
        f"beyond tolerance in § {name} ({mean_a:.1f} → {mean_b:.1f} per sentence), "
        "though the whole-lesson mean is closer: a possible confound"
    )
    return Basis.BEYOND_TOLERANCE, reason, test


def unapplied(findings: Sequence[Finding]) -> list[str]:
    """Pairs whose declared manipulation shows no difference at all: the manipulation may be
    missing from the files (or the wrong file named), which no verdict would reveal."""
    declared: dict[tuple[str, str], list[Finding]] = {}
    for finding in findings:
        if finding.basis is Basis.DECLARED and finding.item is None:
            declared.setdefault((finding.reference, finding.condition), []).append(finding)
    return [
        f"{condition} vs {reference}: nothing that the design manipulates differs "
        f"({', '.join(sorted({f.group.value for f in found}))}); check that the manipulation "
        "is in the files"
        for (reference, condition), found in declared.items()
        if all(f.difference == 0 for f in found)
    ]
