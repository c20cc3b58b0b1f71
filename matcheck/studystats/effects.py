"""Standardised mean differences and the WWC baseline-equivalence bands.

Sources (docs/references.md §4, §5):
- Pooled SD, Cohen's d, Hedges' g = J·d with the exact J(m) = Γ(m/2)/(√(m/2)·Γ((m−1)/2)),
  m = n₁ + n₂ − 2 (Hedges 1981; Hedges & Olkin 1985, p. 104).
- Glass's Δ = (M_T − M_C)/s_C, the control group's SD (Glass, McGaw & Smith 1981).
- Cox index = ln(odds ratio)/1.65 (WWC Procedures Handbook v4.1 and v5.0). Whether the
  small-sample factor ω applies is a choice the sources disagree on (§5): we apply the exact J
  to g and, like the WWC handbook v4.1 as read by its implementers, no factor to the Cox index.
- WWC bands on |effect|: ≤ 0.05 equivalent, > 0.05 to ≤ 0.25 needs statistical adjustment,
  > 0.25 not equivalent (WWC FAQ citing Handbook v3.0; same bands in v4.1 and v5.0).

Standard errors for the intervals are the large-sample ones of Hedges & Olkin (1985,
eq. 5.15 for g; Glass's Δ after Hedges 1981), FROM MEMORY (docs/references.md §4); the
interval is g ± t(n₁ + n₂ − 2)·SE, as R's effsize::cohen.d and pingouin's compute_esci do
(checked against pingouin in tests/test_studystats.py).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from enum import StrEnum

COX_DIVISOR = 1.65
EQUIVALENT_MAX = 0.05
ADJUSTMENT_MAX = 0.25


class Band(StrEnum):
    """The WWC baseline-equivalence band of one standardised difference."""

    EQUIVALENT = "equivalent"
    NEEDS_ADJUSTMENT = "needs adjustment"
    NOT_EQUIVALENT = "not equivalent"


def wwc_band(effect: float) -> Band:
    """The band of |effect| (Hedges' g or Cox index) with the WWC's closed upper ends."""
    size = abs(effect)
    if size <= EQUIVALENT_MAX:
        return Band.EQUIVALENT
    if size <= ADJUSTMENT_MAX:
        return Band.NEEDS_ADJUSTMENT
    return Band.NOT_EQUIVALENT


@dataclass(frozen=True, slots=True)
class Summary:
    """n, mean and sample SD (n − 1) of one group."""

    n: int
    mean: float
    sd: float

    @classmethod
    def of(cls, values: Sequence[float]) -> Summary:
        n = len(values)
        mean = math.fsum(values) / n
        variance = math.fsum((x - mean) ** 2 for x in values) / (n - 1) if n > 1 else 0.0
        return cls(n, mean, math.sqrt(variance))


@dataclass(frozen=True, slots=True)
class Estimate:
    """An effect size with its two-sided confidence interval."""

    value: float
    low: float
    high: float
    level: float = 0.95


def exact_j(m: float) -> float:
    """Hedges' exact small-sample correction J(m), via log-gamma for large m."""
    if m <= 1:
        raise ValueError("J needs more than one degree of freedom")
    return math.exp(math.lgamma(m / 2) - math.lgamma((m - 1) / 2)) / math.sqrt(m / 2)


def approximate_j(m: float) -> float:
    """Hedges' approximation J ≈ 1 − 3/(4m − 1) (the WWC's ω with m = N − 2)."""
    return 1.0 - 3.0 / (4.0 * m - 1.0)


def pooled_sd(a: Summary, b: Summary) -> float:
    return math.sqrt(((a.n - 1) * a.sd**2 + (b.n - 1) * b.sd**2) / (a.n + b.n - 2))


def cohen_d(control: Summary, treatment: Summary) -> float:
    """(M_T − M_C)/S_p; raises ZeroDivisionError when both groups are constant."""
    return (treatment.mean - control.mean) / pooled_sd(control, treatment)


def _critical(level: float, df: int) -> float:
    from scipy.special import stdtrit

    return float(stdtrit(df, 0.5 + level / 2))


def hedges_g(control: Summary, treatment: Summary, level: float = 0.95) -> Estimate:
    """Hedges' g (exact J) with its normal-theory interval."""
    n1, n2 = control.n, treatment.n
    g = exact_j(n1 + n2 - 2) * cohen_d(control, treatment)
    se = math.sqrt((n1 + n2) / (n1 * n2) + g**2 / (2 * (n1 + n2)))
    half = _critical(level, n1 + n2 - 2) * se
    return Estimate(g, g - half, g + half, level)


def glass_delta(control: Summary, treatment: Summary, level: float = 0.95) -> Estimate:
    """Glass's Δ on the control group's SD, with its normal-theory interval."""
    delta = (treatment.mean - control.mean) / control.sd
    n1, n2 = control.n, treatment.n
    se = math.sqrt((n1 + n2) / (n1 * n2) + delta**2 / (2 * (n1 - 1)))
    half = _critical(level, n1 + n2 - 2) * se
    return Estimate(delta, delta - half, delta + half, level)


def cox_index(p_control: float, p_treatment: float) -> float:
    """ln(odds ratio)/1.65 for two proportions strictly between 0 and 1."""
    for p in (p_control, p_treatment):
        if not 0 < p < 1:
            raise ValueError("the Cox index needs proportions strictly between 0 and 1")
    log_or = math.log(p_treatment / (1 - p_treatment)) - math.log(p_control / (1 - p_control))
    return log_or / COX_DIVISOR
