"""Achieved power of a two-sample t-test, for the null-result diagnosis.

statsmodels' ``TTestIndPower`` (docs/references.md §6) gives the power of the two-sided
two-sample t-test for a standardised effect d, n₁ learners in the first group and
``ratio = n₂/n₁``. Imported lazily: statsmodels is slow to import.
"""

from __future__ import annotations

# The conventional target (Cohen 1988; docs/references.md §6).
TARGET_POWER = 0.80


def achieved_power(effect: float, n1: int, n2: int, alpha: float = 0.05) -> float:
    """Power to detect |effect| (Cohen's d) with n1 + n2 learners, two-sided at ``alpha``."""
    from statsmodels.stats.power import TTestIndPower

    power = TTestIndPower().power(
        effect_size=abs(effect), nobs1=n1, alpha=alpha, ratio=n2 / n1, alternative="two-sided"
    )
    return float(power)
