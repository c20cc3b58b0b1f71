"""The study's data as findings: groups (baseline, attrition, exposure), instrument, outcome.

:func:`assess_data` reads the learners' data the study file names and returns findings in
three groups, for every pair of conditions the design compares, plus the aggregates
(:class:`~matcheck.data.summary.StudyData`) that the reports and the methods table show.
Verdicts map onto the report's statuses: matched (equivalent, low attrition, reliable),
inconclusive (needs adjustment, unsure, a possible problem of the post-test, a null result
with its diagnosis), differs (a baseline beyond 0.25 SD, high attrition, unequal exposure);
a significant effect of the manipulation is intended.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence

from matcheck.data.learners import (
    ItemScores,
    Learner,
    LearnerData,
    read_learners,
    read_pilot,
    study_scores,
)
from matcheck.data.spec import DataSpec
from matcheck.data.summary import Attrition, BaselineRow, GroupStats, Instrument, StudyData
from matcheck.findings import (
    Basis,
    Evidence,
    EvidenceKind,
    Finding,
    Group,
    StatTest,
    Status,
    Tolerance,
)
from matcheck.studystats import reliability as rel
from matcheck.studystats.attrition import SOURCE as ATTRITION_SOURCE
from matcheck.studystats.attrition import Assumption
from matcheck.studystats.attrition import Attrition as AttritionRates
from matcheck.studystats.effects import (
    ADJUSTMENT_MAX,
    EQUIVALENT_MAX,
    Band,
    Summary,
    cox_index,
    glass_delta,
    hedges_g,
    pooled_sd,
    wwc_band,
)
from matcheck.studystats.equivalence import student_t, tost
from matcheck.studystats.power import TARGET_POWER, achieved_power

DATA_GROUPS = (Group.GROUPS, Group.INSTRUMENT, Group.OUTCOME)
# The reason code of each status (findings.Basis) for the data's verdicts.
_BASIS = {
    Status.MATCHED: Basis.WITHIN_TOLERANCE,
    Status.DIFFERS: Basis.BEYOND_TOLERANCE,
    Status.INCONCLUSIVE: Basis.TEST_INCONCLUSIVE,
    Status.INTENDED: Basis.DECLARED,
}
WWC = "WWC: ≤0.05 SD equivalent, ≤0.25 with adjustment (docs/references.md §5)"
# Common practice (Nunnally 1978, FROM MEMORY; docs/references.md §10).
RELIABILITY_MIN = 0.70
# Ebel's rule of thumb for a corrected item-total correlation (FROM MEMORY; common practice).
DISCRIMINATION_MIN = 0.20
_STATUS = {
    Band.EQUIVALENT: Status.MATCHED,
    Band.NEEDS_ADJUSTMENT: Status.INCONCLUSIVE,
    Band.NOT_EQUIVALENT: Status.DIFFERS,
}


def _summary(values: Sequence[float]) -> Summary | None:
    return Summary.of(values) if len(values) >= 2 else None


def _finding(
    dimension: str,
    group: str,
    unit: str,
    pair: tuple[str, str],
    status: Status,
    values: dict[str, float | None],
    difference: float | None,
    reason: str,
    **extra: object,
) -> Finding:
    return Finding(
        dimension=dimension,
        group=Group(group),
        basis=_BASIS[status],
        unit=unit,
        reference=pair[0],
        condition=pair[1],
        status=status,
        values=values,
        difference=difference,
        reason=reason,
        tolerance=extra.pop("tolerance", None),  # type: ignore[arg-type]
        **extra,  # type: ignore[arg-type]
    )


def assess_data(
    spec: DataSpec,
    conditions: Sequence[str],
    reference: str,
    pairs: Sequence[tuple[str, str]],
    lesson_findings: Sequence[Finding],
) -> tuple[tuple[Finding, ...], StudyData]:
    data = read_learners(spec, conditions) if spec.files else None
    scores: list[ItemScores] = []
    if spec.pilot:
        scores.append(read_pilot(spec))
    if data is not None:
        scores.append(study_scores(data))
    findings: list[Finding] = []
    instruments = tuple(_instrument(s, spec, lesson_findings) for s in scores)
    for instrument in instruments:
        findings += _instrument_findings(instrument)
    baseline: list[BaselineRow] = []
    attrition: tuple[Attrition, ...] = ()
    sentence = ""
    if data is not None:
        baseline = _baseline_rows(data, conditions, reference)
        for pair in pairs:
            findings += _baseline_findings(data, spec, pair)
            findings.append(_attrition_finding(data, spec, pair))
            if spec.time:
                findings.append(_time_finding(data, spec, pair))
        attrition = tuple(
            Attrition(c, len(data.of(c)), sum(1 for x in data.of(c) if x.completed))
            for c in conditions
        )
        sentence = _attrition_sentence(data, spec, pairs)
        reliability = instruments[-1] if instruments else None
        for pair in pairs:
            findings.append(
                _outcome_finding(data, spec, pair, reliability, [*lesson_findings, *findings])
            )
    return tuple(findings), StudyData(reference, tuple(baseline), instruments, attrition, sentence)


# -- post-test quality ------------------------------------------------------------------


def _instrument(scores: ItemScores, spec: DataSpec, lesson: Sequence[Finding]) -> Instrument:
    matrix = scores.scores
    binary = all(v in (0.0, 1.0) for row in matrix for v in row)
    try:
        value: float | None = rel.cronbach_alpha(matrix)
    except ValueError:
        value = None
    interval = (
        rel.feldt_interval(value, len(matrix), len(scores.items)) if value is not None else None
    )
    totals = [math.fsum(row) for row in matrix]
    floor, ceiling = rel.end_shares(totals, 0.0, scores.posttest_max)
    needed = (
        rel.items_needed(value, len(scores.items), spec.target_reliability)
        if value is not None
        else None
    )
    coverage = tuple((item, _coverage(item, lesson)) for item in scores.items)
    return Instrument(
        source=scores.source,
        learners=len(matrix),
        items=len(scores.items),
        coefficient="KR-20" if binary else "Cronbach's alpha",
        reliability=value,
        interval=interval,
        floor=floor,
        ceiling=ceiling,
        maximum=scores.posttest_max,
        target=spec.target_reliability,
        needed=needed,
        item_stats=tuple(rel.item_statistics(scores.items, matrix, scores.item_maxima)),
        coverage=coverage,
    )


def _coverage(item: str, lesson: Sequence[Finding]) -> str:
    """What the lesson comparison found for this item: where it is not taught, if anywhere."""
    mine = [f for f in lesson if f.group is Group.ASSESSMENT and f.item == item]
    if not mine:
        return "—"
    gaps = sorted(
        {
            e.condition
            for f in mine
            if f.status is Status.DIFFERS
            for e in f.evidence
            if e.kind is EvidenceKind.ITEM_NOT_TAUGHT
        }
    )
    if gaps:
        return f"not taught in {', '.join(gaps)}"
    reasons = {f.reason for f in mine}
    if reasons == {"taught in neither"}:
        return "taught in no condition"
    return "taught in every condition" if reasons == {"taught in both"} else "same in every pair"


def _instrument_findings(instrument: Instrument) -> list[Finding]:
    pair = (instrument.source, instrument.source)
    where = f"{instrument.items} items, {instrument.learners} learners ({instrument.source})"
    result = []
    value = instrument.reliability
    if value is None:
        result.append(
            _finding(
                "reliability",
                "instrument",
                "score",
                pair,
                Status.INCONCLUSIVE,
                {instrument.source: None},
                None,
                f"{instrument.coefficient} cannot be computed: every learner has the same "
                f"total ({where})",
            )
        )
    else:
        low, high = instrument.interval or (math.nan, math.nan)
        reason = (
            f"{instrument.coefficient} = {value:.2f} (95% CI {low:.2f} to {high:.2f}, Feldt) "
            f"on {where}"
        )
        if instrument.needed is not None and instrument.needed > instrument.items:
            reason += (
                f"; about {instrument.needed} items like these would reach "
                f"{instrument.target:.2f} (Spearman–Brown)"
            )
        elif instrument.needed is None:
            reason += "; no test length helps: the items do not measure one thing"
        ok = value >= RELIABILITY_MIN
        reason += "" if ok else f"; below {RELIABILITY_MIN:.2f} (common practice)"
        result.append(
            _finding(
                "reliability",
                "instrument",
                "score",
                pair,
                Status.MATCHED if ok else Status.INCONCLUSIVE,
                {instrument.source: value},
                None,
                reason,
                tolerance=Tolerance(
                    absolute=RELIABILITY_MIN, reason="minimum reliability, common practice"
                ),
            )
        )
    for name, share, end in (
        ("ceiling", instrument.ceiling, f"the maximum ({instrument.maximum:g})"),
        ("floor", instrument.floor, "the minimum (0)"),
    ):
        bad = rel.end_effect(share)
        reason = f"{share * 100:.1f}% of learners scored {end}; " + (
            "more than 15%: differences at that end cannot show (Terwee et al. 2007)"
            if bad
            else "at most 15% (Terwee et al. 2007)"
        )
        result.append(
            _finding(
                name,
                "instrument",
                "share",
                pair,
                Status.INCONCLUSIVE if bad else Status.MATCHED,
                {instrument.source: share},
                None,
                reason,
                tolerance=Tolerance(
                    absolute=rel.CEILING_SHARE, reason="Terwee et al. 2007 (docs/references.md §10)"
                ),
            )
        )
    weak = [
        s
        for s in instrument.item_stats
        if s.discrimination is None or s.discrimination < DISCRIMINATION_MIN
    ]
    evidence = tuple(
        Evidence(
            kind=EvidenceKind.WEAK_ITEM,
            condition=instrument.source,
            text=f"{s.item}: difficulty {s.difficulty:.2f}, corrected item-total r "
            + (
                "— (everyone scored the same)"
                if s.discrimination is None
                else f"{s.discrimination:.2f}"
            ),
        )
        for s in weak
    )
    result.append(
        _finding(
            "item_discrimination",
            "instrument",
            "items",
            pair,
            Status.INCONCLUSIVE if weak else Status.MATCHED,
            {instrument.source: float(len(weak))},
            None,
            (
                f"{len(weak)} of {instrument.items} items discriminate poorly "
                f"(corrected item-total r below {DISCRIMINATION_MIN:.2f}, common practice)"
            )
            if weak
            else f"every item's corrected item-total r is at least {DISCRIMINATION_MIN:.2f}",
            evidence=evidence,
        )
    )
    return result


# -- groups: baseline, attrition, exposure ---------------------------------------------


def _baseline_rows(
    data: LearnerData, conditions: Sequence[str], reference: str
) -> list[BaselineRow]:
    rows = []
    for measure, statistic, getter in _baseline_measures(data):
        groups = []
        samples = {}
        for condition in conditions:
            values = [v for x in data.of(condition) if x.completed if (v := getter(x)) is not None]
            samples[condition] = values
            summary = _summary(values)
            if summary is not None:
                groups.append(GroupStats(condition, summary.n, summary.mean, summary.sd))
        effects = []
        for condition in conditions:
            if condition == reference:
                continue
            effect = _effect(samples[reference], samples[condition], statistic)
            band = wwc_band(effect).value if effect is not None else "cannot be computed"
            effects.append((condition, effect, band))
        rows.append(BaselineRow(measure, statistic, tuple(groups), tuple(effects)))
    return rows


Getter = Callable[[Learner], float | None]


def _baseline_measures(data: LearnerData) -> list[tuple[str, str, Getter]]:
    measures: list[tuple[str, str, Getter]] = []
    if data.pretest_columns:
        measures.append(("pretest", "g", lambda x: x.pretest))
    for trait in data.traits:
        statistic = "Cox" if trait in data.binary_traits else "g"
        measures.append((trait, statistic, _trait_getter(trait)))
    return measures


def _trait_getter(trait: str) -> Getter:
    def get(learner: Learner) -> float | None:
        return learner.traits.get(trait)

    return get


def _effect(control: Sequence[float], treatment: Sequence[float], statistic: str) -> float | None:
    if len(control) < 2 or len(treatment) < 2:
        return None
    if statistic == "Cox":
        p_c, p_t = sum(control) / len(control), sum(treatment) / len(treatment)
        return cox_index(p_c, p_t) if 0 < p_c < 1 and 0 < p_t < 1 else None
    a, b = Summary.of(control), Summary.of(treatment)
    return hedges_g(a, b).value if pooled_sd(a, b) else None


def _baseline_findings(data: LearnerData, spec: DataSpec, pair: tuple[str, str]) -> list[Finding]:
    result = []
    for measure, statistic, getter in _baseline_measures(data):
        samples = [
            [v for x in data.of(c) if x.completed if (v := getter(x)) is not None] for c in pair
        ]
        effect = _effect(samples[0], samples[1], statistic)
        means = [math.fsum(s) / len(s) if s else None for s in samples]
        values = {pair[0]: means[0], pair[1]: means[1]}
        label = "Hedges' g" if statistic == "g" else "Cox index"
        tolerance = Tolerance(absolute=EQUIVALENT_MAX, reason=WWC)
        if effect is None:
            result.append(
                _finding(
                    f"baseline:{measure}",
                    "groups",
                    "SD",
                    pair,
                    Status.INCONCLUSIVE,
                    values,
                    None,
                    f"the {label} of {measure} cannot be computed (too few learners, no "
                    "spread, or a share of 0 or 1)",
                    tolerance=tolerance,
                )
            )
            continue
        band = wwc_band(effect)
        reason = f"{label} = {effect:+.3f}: {band.value} (WWC bands 0.05 / 0.25)"
        if band is Band.NEEDS_ADJUSTMENT:
            reason += f"; the analysis must adjust for {measure}"
        test = None
        if statistic == "g":
            a, b = Summary.of(samples[0]), Summary.of(samples[1])
            raw = spec.equivalence_bound * pooled_sd(a, b)
            result_t = tost(a, b, -raw, raw, spec.alpha)
            verdict = "equivalent" if result_t.equivalent else "not shown equivalent"
            test = StatTest(
                "TOST",
                result_t.p,
                f"bounds ±{spec.equivalence_bound:g} SD (±{raw:.3g}); "
                f"{100 * (1 - 2 * spec.alpha):g}% CI {result_t.ci_low:+.3g} to "
                f"{result_t.ci_high:+.3g}; {verdict}",
            )
            reason += (
                f"; TOST p = {result_t.p:.3f} ({verdict} within ±{spec.equivalence_bound:g} SD)"
            )
        result.append(
            _finding(
                f"baseline:{measure}",
                "groups",
                "SD",
                pair,
                _STATUS[band],
                values,
                effect,
                reason,
                tolerance=tolerance,
                test=test,
            )
        )
    return result


def _attrition_rates(data: LearnerData, spec: DataSpec, pair: tuple[str, str]) -> AttritionRates:
    randomised = tuple(len(data.of(c)) for c in pair)
    analysed = tuple(sum(1 for x in data.of(c) if x.completed) for c in pair)
    return AttritionRates(
        (randomised[0], randomised[1]),
        (analysed[0], analysed[1]),
        Assumption(spec.attrition_boundary),
    )


def _attrition_finding(data: LearnerData, spec: DataSpec, pair: tuple[str, str]) -> Finding:
    rates = _attrition_rates(data, spec, pair)
    limit = rates.boundary
    reason = (
        f"overall {rates.overall * 100:.1f}%, differential {rates.differential * 100:.1f} points; "
    )
    if limit is None:
        reason += f"overall attrition beyond the table's 57%: high attrition ({ATTRITION_SOURCE})"
    else:
        reason += (
            f"{'low' if rates.low else 'high'} attrition under the {rates.assumption.value} "
            f"boundary ({limit * 100:.1f} points at this overall rate; {ATTRITION_SOURCE})"
        )
    return _finding(
        "attrition",
        "groups",
        "share",
        pair,
        Status.MATCHED if rates.low else Status.DIFFERS,
        {pair[0]: rates.rates[0], pair[1]: rates.rates[1]},
        rates.rates[1] - rates.rates[0],
        reason,
        tolerance=Tolerance(absolute=limit or 0.0, reason=ATTRITION_SOURCE),
    )


def _time_finding(data: LearnerData, spec: DataSpec, pair: tuple[str, str]) -> Finding:
    samples = [[x.time for x in data.of(c) if x.completed and x.time is not None] for c in pair]
    a, b = _summary(samples[0]), _summary(samples[1])
    if a is None or b is None or not pooled_sd(a, b):
        return _finding(
            "time_on_task",
            "groups",
            "minutes",
            pair,
            Status.INCONCLUSIVE,
            {pair[0]: a.mean if a else None, pair[1]: b.mean if b else None},
            None,
            "too few times on task (or no spread) to compare",
        )
    bound = spec.time_bound or spec.equivalence_bound * pooled_sd(a, b)
    equivalence = tost(a, b, -bound, bound, spec.alpha)
    difference = student_t(a, b)
    if equivalence.equivalent:
        status, verdict = Status.MATCHED, "equivalent"
    elif difference.p < spec.alpha:
        status, verdict = Status.DIFFERS, "different"
    else:
        status, verdict = Status.INCONCLUSIVE, "neither shown equivalent nor different"
    reason = (
        f"mean {a.mean:.1f} vs {b.mean:.1f} minutes: {verdict} "
        f"(TOST p = {equivalence.p:.3f} within ±{bound:.3g} minutes; t-test p = {difference.p:.3f})"
    )
    if status is Status.DIFFERS:
        reason += "; time, not the manipulation, may explain a difference in learning"
    elif status is Status.INCONCLUSIVE:
        reason += "; too few learners or too varied times to show equal exposure"
    return _finding(
        "time_on_task",
        "groups",
        "minutes",
        pair,
        status,
        {pair[0]: a.mean, pair[1]: b.mean},
        b.mean - a.mean,
        reason,
        tolerance=Tolerance(absolute=round(bound, 2), reason="equivalence bounds of the TOST"),
        test=StatTest(
            "TOST",
            equivalence.p,
            f"{100 * (1 - 2 * spec.alpha):g}% CI {equivalence.ci_low:+.3g} to "
            f"{equivalence.ci_high:+.3g} minutes",
        ),
    )


def _attrition_sentence(data: LearnerData, spec: DataSpec, pairs: Sequence[tuple[str, str]]) -> str:
    everyone = len(data.learners)
    analysed = sum(1 for x in data.learners if x.completed)
    overall = 1 - analysed / everyone
    rates = [_attrition_rates(data, spec, pair) for pair in pairs]
    worst = max((r.differential for r in rates), default=0.0)
    high = [pair for pair, r in zip(pairs, rates, strict=True) if not r.low]
    judged = (
        f"within the WWC {spec.attrition_boundary} boundary for every contrast"
        if not high
        else f"beyond the WWC {spec.attrition_boundary} boundary for "
        + ", ".join(f"{b} vs {a}" for a, b in high)
    )
    return (
        f"Of {everyone} learners assigned, {analysed} completed the post-test "
        f"(overall attrition {overall * 100:.1f}%); differential attrition was at most "
        f"{worst * 100:.1f} percentage points, {judged}."
    )


# -- outcome ----------------------------------------------------------------------------


def _outcome_finding(
    data: LearnerData,
    spec: DataSpec,
    pair: tuple[str, str],
    instrument: Instrument | None,
    others: Sequence[Finding],
) -> Finding:
    totals = [[math.fsum(x.posttest) for x in data.of(c) if x.posttest is not None] for c in pair]
    a, b = Summary.of(totals[0]), Summary.of(totals[1])
    values: dict[str, float | None] = {pair[0]: a.mean, pair[1]: b.mean}
    if not pooled_sd(a, b) or not a.sd:
        return _finding(
            "posttest_score",
            "outcome",
            "points",
            pair,
            Status.INCONCLUSIVE,
            values,
            b.mean - a.mean,
            "no spread in post-test scores: no effect size",
        )
    g, delta, t = hedges_g(a, b), glass_delta(a, b), student_t(a, b)
    detail = (
        f"t({t.df:g}) = {t.t:.2f}; "
        f"Hedges' g = {g.value:+.2f} [95% CI {g.low:+.2f}, {g.high:+.2f}]; "
        f"Glass's Δ = {delta.value:+.2f} [{delta.low:+.2f}, {delta.high:+.2f}] on {pair[0]}'s SD"
    )
    reason = (
        f"difference {b.mean - a.mean:+.2f} points (n = {a.n} + {b.n}); {detail}; p = {t.p:.3f}"
    )
    if t.p < spec.alpha:
        return _finding(
            "posttest_score",
            "outcome",
            "points",
            pair,
            Status.INTENDED,
            values,
            b.mean - a.mean,
            reason + " — significant",
            test=StatTest("Student's t", t.p, detail),
        )
    evidence = _diagnosis(data, spec, pair, a.n, b.n, instrument, others)
    possible = sum(1 for e in evidence if e.kind is EvidenceKind.POSSIBLE_REASON)
    reason += f" — not significant; {possible} possible reason{'s' if possible != 1 else ''}"
    return _finding(
        "posttest_score",
        "outcome",
        "points",
        pair,
        Status.INCONCLUSIVE,
        values,
        b.mean - a.mean,
        reason,
        test=StatTest("Student's t", t.p, detail),
        evidence=evidence,
    )


def _diagnosis(
    data: LearnerData,
    spec: DataSpec,
    pair: tuple[str, str],
    n1: int,
    n2: int,
    instrument: Instrument | None,
    others: Sequence[Finding],
) -> tuple[Evidence, ...]:
    """Each usual reason for a null result, marked possible or ruled out."""
    checks: list[tuple[bool, str]] = []
    power = achieved_power(spec.smallest_effect, n1, n2, spec.alpha)
    checks.append(
        (
            power < TARGET_POWER,
            f"power: {power:.2f} to detect d = {spec.smallest_effect:g} with {n1} + {n2} learners "
            f"(target {TARGET_POWER:.2f})",
        )
    )
    if instrument is not None and instrument.reliability is not None:
        checks.append(
            (
                instrument.reliability < RELIABILITY_MIN,
                f"reliability: {instrument.coefficient} = {instrument.reliability:.2f} "
                f"(minimum {RELIABILITY_MIN:.2f})",
            )
        )
        end = max(instrument.ceiling, instrument.floor)
        which = "ceiling" if instrument.ceiling >= instrument.floor else "floor"
        checks.append(
            (
                rel.end_effect(end),
                f"{which}: {end * 100:.1f}% of learners at the "
                f"{'maximum' if which == 'ceiling' else 'minimum'} (limit 15%)",
            )
        )

    def of_pair(dimension: str) -> list[Finding]:
        return [
            f for f in others if (f.reference, f.condition) == pair and f.dimension == dimension
        ]

    for dimension, label in (("time_on_task", "exposure"), ("attrition", "attrition")):
        for finding in of_pair(dimension):
            checks.append((finding.status is not Status.MATCHED, f"{label}: {finding.reason}"))
    unbalanced = [
        f.dimension.removeprefix("baseline:")
        for f in others
        if (f.reference, f.condition) == pair
        and f.dimension.startswith("baseline:")
        and f.status is not Status.MATCHED
    ]
    checks.append(
        (
            bool(unbalanced),
            "baseline: "
            + (
                f"not equivalent on {', '.join(unbalanced)} (adjust, or the estimate is biased)"
                if unbalanced
                else "equivalent on every measure"
            ),
        )
    )
    confounds = [
        f.dimension
        for f in others
        if (f.reference, f.condition) == pair
        and f.group not in DATA_GROUPS
        and f.status is Status.DIFFERS
        and f.caused_by is None
    ]
    checks.append(
        (
            bool(confounds),
            "materials: "
            + (
                f"the versions also differ in {', '.join(confounds)}"
                if confounds
                else "no difference beyond the manipulation"
            ),
        )
    )
    return tuple(
        Evidence(
            kind=EvidenceKind.POSSIBLE_REASON if possible else EvidenceKind.RULED_OUT,
            condition=pair[1],
            text=text,
        )
        for possible, text in checks
    )


__all__ = ["ADJUSTMENT_MAX", "DATA_GROUPS", "assess_data"]
