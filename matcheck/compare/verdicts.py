"""The verdict on one measure for one pair of versions.

``decide`` is pure: values, tolerance and whether the measure is manipulated in, a
:class:`~matcheck.findings.Status` and its reason out. Mean sentence length gets a statistical
verdict on top of the descriptive one, because it is a mean over few, widely varying units:

- the sentences *are* the versions (not a sample of them), so a mean within the tolerance is
  *matched*; the report adds the two one-sided Welch tests (TOST; Schuirmann 1987,
  Lakens 2017) with the tolerance as bounds, for the methods section;
- a mean beyond the tolerance is *differs* when a Welch t-test at α = .05 shows a difference,
  and *inconclusive* when neither equivalence (TOST cannot pass with the estimate outside the
  bounds) nor difference can be established: too few, too varied sentences to tell.
"""

from __future__ import annotations

from collections.abc import Sequence

from matcheck.findings import StatTest, Status, Tolerance
from matcheck.measures.base import Measurement

ALPHA = 0.05


def decide(
    reference: float | None,
    value: float | None,
    tolerance: Tolerance,
    *,
    intended: bool,
    intended_by: str = "",
) -> tuple[Status, str]:
    if intended:
        return Status.INTENDED, f"manipulated ({intended_by})" if intended_by else "manipulated"
    if reference is None or value is None:
        return Status.INCONCLUSIVE, "not measurable in every version"
    difference = value - reference
    allowed = tolerance.allowed(reference)
    if abs(difference) <= allowed + 1e-12:
        return Status.MATCHED, "within tolerance"
    return Status.DIFFERS, "beyond tolerance: a possible confound"


def decide_mean(
    reference_sample: Sequence[float],
    sample: Sequence[float],
    tolerance: Tolerance,
) -> tuple[Status, str, StatTest | None]:
    """Verdict on a difference of means (the sentences of each version are its sample)."""
    import numpy as np

    a = np.asarray(reference_sample, dtype=float)
    b = np.asarray(sample, dtype=float)
    if not a.size or not b.size:
        return Status.INCONCLUSIVE, "no sentences in one version", None
    bound = tolerance.allowed(float(a.mean()))
    difference = float(b.mean() - a.mean())
    if sorted(a.tolist()) == sorted(b.tolist()):
        return Status.MATCHED, "identical sentence lengths", None
    if a.size < 2 or b.size < 2 or (float(a.var()) == 0.0 and float(b.var()) == 0.0):
        status = Status.MATCHED if abs(difference) <= bound else Status.DIFFERS
        return status, "too few or constant sentence lengths: compared as they are", None
    from matcheck.compare.stats import tost_welch_p, welch_p

    if abs(difference) <= bound:
        p_tost = tost_welch_p(a.tolist(), b.tolist(), -bound, bound)
        test = StatTest("TOST (Welch)", p_tost, f"equivalence bounds ±{bound:.2f} words")
        reason = "within tolerance" + (" (equivalent by TOST)" if p_tost < ALPHA else "")
        return Status.MATCHED, reason, test
    p_diff = welch_p(a.tolist(), b.tolist())
    test = StatTest("Welch t-test", p_diff, f"difference {difference:+.2f} words")
    if p_diff < ALPHA:
        return Status.DIFFERS, "beyond tolerance: a possible confound", test
    return (
        Status.INCONCLUSIVE,
        f"beyond tolerance, but {a.size} and {b.size} sentences vary too much to show "
        "a difference; read the passages",
        test,
    )


MIN_SECTION_SENTENCES = 3


def decide_sections(
    reference: Measurement, other: Measurement, tolerance: Tolerance
) -> tuple[Status, str, StatTest] | None:
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
    shared = [
        s
        for s in a
        if s in b and len(a[s]) >= MIN_SECTION_SENTENCES and len(b[s]) >= MIN_SECTION_SENTENCES
    ]
    if not shared:
        return None
    alpha = ALPHA / len(shared)
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
    return Status.DIFFERS, reason, test
