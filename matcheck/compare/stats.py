"""Welch's t-test and the two one-sided tests (TOST), from the t distribution directly.

Both are a few lines over the Student t CDF (``scipy.special.stdtr``); importing
``scipy.stats`` and statsmodels for them would cost half a second of every run. The tests in
tests/test_stats.py check these against scipy.stats and statsmodels (reference libraries) and
against the worked TOST example of docs/references.md §7.

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


def _t_cdf(df: float, t: float) -> float:
    from scipy.special import stdtr

    return float(stdtr(df, t))


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
