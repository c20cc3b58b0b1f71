"""Welch's t-test and the two one-sided tests (TOST), from the t distribution directly.

Both are a few lines over the Student t CDF, computed here from the regularized incomplete
beta function (Abramowitz & Stegun 26.7.1 and 26.5.8; the continued fraction evaluated by the
modified Lentz method, Press et al., *Numerical Recipes*, 3rd ed., §5.2 and §6.4; docs/
references.md §29). Importing ``scipy.special`` for it would cost ~0.1 s of every re-check,
``scipy.stats`` and statsmodels half a second. The tests in tests/test_stats.py check the CDF
against ``scipy.special.stdtr`` and the tests against scipy.stats and statsmodels (reference
libraries) and against the worked TOST example of docs/references.md §7.

Welch (1947): t = (mean_b − mean_a) / √(s²_a/n_a + s²_b/n_b), with the Welch–Satterthwaite
degrees of freedom. TOST (Schuirmann 1987): equivalence within (low, upp) when both
one-sided tests reject; its p-value is the larger of the two.
"""

from __future__ import annotations

import math
from collections.abc import Sequence


def _moments(sample: Sequence[float]) -> tuple[int, float, float]:
    n = len(sample)
    mean = sum(sample) / n
    variance = sum((x - mean) ** 2 for x in sample) / (n - 1)
    return n, mean, variance


def _welch(a: Sequence[float], b: Sequence[float]) -> tuple[float, float, float]:
    """Difference of means (b − a), its standard error, and the Welch degrees of freedom."""
    n_a, mean_a, var_a = _moments(a)
    n_b, mean_b, var_b = _moments(b)
    part_a, part_b = var_a / n_a, var_b / n_b
    se = math.sqrt(part_a + part_b)
    df = (part_a + part_b) ** 2 / (part_a**2 / (n_a - 1) + part_b**2 / (n_b - 1))
    return mean_b - mean_a, se, df


# The continued fraction stops when a step changes it by less than this (double precision).
_EPSILON = 1e-16
_TINY = 1e-300  # keeps Lentz's method off a division by zero
_MAX_STEPS = 10_000


def _beta_fraction(a: float, b: float, x: float) -> float:
    """The continued fraction of I_x(a, b) (A&S 26.5.8), by the modified Lentz method."""

    def guard(value: float) -> float:
        return value if abs(value) >= _TINY else _TINY

    c, d = 1.0, 1.0 / guard(1.0 - (a + b) * x / (a + 1.0))
    fraction = d
    for m in range(1, _MAX_STEPS):
        even = m * (b - m) * x / ((a - 1.0 + 2 * m) * (a + 2 * m))
        d = 1.0 / guard(1.0 + even * d)
        c = guard(1.0 + even / c)
        fraction *= d * c
        odd = -(a + m) * (a + b + m) * x / ((a + 2 * m) * (a + 1.0 + 2 * m))
        d = 1.0 / guard(1.0 + odd * d)
        c = guard(1.0 + odd / c)
        step = d * c
        fraction *= step
        if abs(step - 1.0) < _EPSILON:
            break
    return fraction


def _incomplete_beta(a: float, b: float, x: float, one_minus_x: float) -> float:
    """The regularized incomplete beta I_x(a, b); ``one_minus_x`` is passed exactly."""
    if x <= 0.0:
        return 0.0
    if one_minus_x <= 0.0:
        return 1.0
    log_front = (
        math.lgamma(a + b)
        - math.lgamma(a)
        - math.lgamma(b)
        + a * math.log(x)
        + b * math.log(one_minus_x)
    )
    # The fraction converges fast below (a + 1) / (a + b + 2); above, use I_x(a, b) =
    # 1 - I_{1-x}(b, a) (A&S 26.5.2).
    if x < (a + 1.0) / (a + b + 2.0):
        return math.exp(log_front) * _beta_fraction(a, b, x) / a
    return 1.0 - math.exp(log_front) * _beta_fraction(b, a, one_minus_x) / b


def _t_cdf(df: float, t: float) -> float:
    """P(T <= t) for Student's t with ``df`` degrees of freedom: the tail beyond |t| is
    I_x(df/2, 1/2) / 2 with x = df / (df + t²) (A&S 26.7.1)."""
    if t == 0.0:
        return 0.5
    square = t * t
    tail = 0.5 * _incomplete_beta(0.5 * df, 0.5, df / (df + square), square / (df + square))
    return tail if t < 0 else 1.0 - tail


def welch_p(a: Sequence[float], b: Sequence[float]) -> float:
    """Two-sided p-value of Welch's t-test for a difference of means.

    Needs at least two values in each sample and a non-zero variance in one of them.
    """
    difference, se, df = _welch(a, b)
    t = difference / se
    return 2.0 * _t_cdf(df, -abs(t))


def tost_welch_p(a: Sequence[float], b: Sequence[float], low: float, upp: float) -> float:
    """TOST p-value for ``low < mean(b) − mean(a) < upp`` with Welch's standard error."""
    difference, se, df = _welch(a, b)
    p_lower = 1.0 - _t_cdf(df, (difference - low) / se)  # H0: difference <= low
    p_upper = _t_cdf(df, (difference - upp) / se)  # H0: difference >= upp
    return max(p_lower, p_upper)
