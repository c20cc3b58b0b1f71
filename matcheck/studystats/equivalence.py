"""Student's t-test and TOST on the pooled variance, from summary statistics.

The TOST (Schuirmann 1987; Lakens 2017; docs/references.md §7) declares the difference
``mean_b − mean_a`` equivalent to zero within (low, upp) when both one-sided tests reject; its
p-value is the larger of the two. The pooled variance matches the worked example of §7
(df = n_a + n_b − 2) and ``statsmodels.stats.weightstats.ttost_ind(usevar='pooled')``;
compare/stats.py has the Welch forms used on sentence lengths. Bounds are raw units.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from matcheck.studystats.effects import Summary


@dataclass(frozen=True, slots=True)
class TTest:
    difference: float  # mean_b − mean_a
    se: float
    df: float
    t: float
    p: float


@dataclass(frozen=True, slots=True)
class Tost:
    low: float
    upp: float
    p_lower: float  # H0: difference <= low
    p_upper: float  # H0: difference >= upp
    ci_low: float  # the 100(1 − 2α)% interval
    ci_high: float
    alpha: float

    @property
    def p(self) -> float:
        return max(self.p_lower, self.p_upper)

    @property
    def equivalent(self) -> bool:
        return self.p < self.alpha


def _t_cdf(df: float, t: float) -> float:
    from scipy.special import stdtr

    return float(stdtr(df, t))


def _t_quantile(df: float, q: float) -> float:
    from scipy.special import stdtrit

    return float(stdtrit(df, q))


def _pooled(a: Summary, b: Summary) -> tuple[float, float, float]:
    df = a.n + b.n - 2
    variance = ((a.n - 1) * a.sd**2 + (b.n - 1) * b.sd**2) / df
    se = math.sqrt(variance * (1 / a.n + 1 / b.n))
    return b.mean - a.mean, se, df


def student_t(a: Summary, b: Summary) -> TTest:
    """Two-sided Student's t-test of mean_b − mean_a (pooled variance)."""
    difference, se, df = _pooled(a, b)
    t = difference / se if se else math.copysign(math.inf, difference) if difference else 0.0
    p = 2.0 * _t_cdf(df, -abs(t)) if math.isfinite(t) else 0.0
    return TTest(difference, se, df, t, p)


def tost(a: Summary, b: Summary, low: float, upp: float, alpha: float = 0.05) -> Tost:
    """TOST for ``low < mean_b − mean_a < upp``; needs a non-zero pooled variance."""
    difference, se, df = _pooled(a, b)
    if not se:
        inside = low < difference < upp
        return Tost(
            low, upp, 0.0 if inside else 1.0, 0.0 if inside else 1.0, difference, difference, alpha
        )
    p_lower = 1.0 - _t_cdf(df, (difference - low) / se)
    p_upper = _t_cdf(df, (difference - upp) / se)
    half = _t_quantile(df, 1 - alpha) * se
    return Tost(low, upp, p_lower, p_upper, difference - half, difference + half, alpha)
