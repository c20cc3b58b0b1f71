"""Welch's t-test and TOST (matcheck.compare.stats) against reference libraries and a
published worked example (docs/references.md §7)."""

from __future__ import annotations

import random

import pytest

from matcheck.compare.stats import tost_welch_p, welch_p

# docs/references.md §7 (COMPUTED with statsmodels 0.15.0, matches the hand calculation).
X1 = [5, 6, 7, 5, 6, 7, 5, 6, 7, 6, 5, 6, 7, 6, 6, 5, 7, 6, 6, 6]
X2 = [6, 5, 7, 6, 5, 6, 7, 6, 5, 6, 6, 7, 5, 6, 6, 5, 7, 6, 6, 5]


def test_tost_worked_example() -> None:
    # ttost_ind(x1, x2, -0.5, 0.5) gives p = 0.04389 (pooled); the samples have equal sizes and
    # nearly equal variances, so Welch's p agrees to the printed precision. Our function takes
    # (reference, other) and tests other - reference: x1 - x2 is other=X1, reference=X2.
    assert tost_welch_p(X2, X1, -0.5, 0.5) == pytest.approx(0.04389, abs=2e-4)


@pytest.mark.parametrize("seed", range(8))
def test_agrees_with_scipy_and_statsmodels(seed: int) -> None:
    from scipy import stats
    from statsmodels.stats.weightstats import ttost_ind

    rng = random.Random(seed)
    a = [rng.gauss(18, 6) for _ in range(rng.randint(3, 60))]
    b = [rng.gauss(16, 9) for _ in range(rng.randint(3, 60))]
    # scipy.stats.ttest_ind(equal_var=False) is Welch's test (scipy documentation).
    assert welch_p(a, b) == pytest.approx(stats.ttest_ind(b, a, equal_var=False).pvalue, rel=1e-9)
    # statsmodels' ttost_ind(x1, x2, low, upp, usevar="unequal") tests low < m1 - m2 < upp.
    expected = ttost_ind(b, a, -2.5, 2.5, usevar="unequal")[0]
    assert tost_welch_p(a, b, -2.5, 2.5) == pytest.approx(expected, rel=1e-9)


@pytest.mark.parametrize("df", [0.3, 1.0, 2.5, 10.0, 29.3, 100.0, 1000.0, 1e4, 1e6])
def test_t_cdf_is_scipys(df: float) -> None:
    # scipy.special.stdtr is the reference library (docs/references.md §29).
    from scipy.special import stdtr

    from matcheck.compare.stats import _t_cdf

    points = [k / 4 for k in range(-240, 241)] + [1e-8, -1e-8, 1e3, -1e3, 1e6, -1e6]
    for t in points:
        expected = float(stdtr(df, t))
        tolerance = 1e-12 if df <= 1000 and abs(t) <= 60 and df >= 2 else 1e-8
        assert _t_cdf(df, t) == pytest.approx(expected, rel=tolerance, abs=1e-300)
