"""Achieved power of a two-sample t-test, for the null-result diagnosis.

The same computation as ``matcheck power`` for two independent groups (matcheck/power/:
statsmodels' ``TTestIndPower`` with unequal allocation, docs/references.md §6), so the
diagnosis and the planning agree to the last digit.
"""

from __future__ import annotations

# The conventional target (Cohen 1988; docs/references.md §6).
TARGET_POWER = 0.80


def achieved_power(effect: float, n1: int, n2: int, alpha: float = 0.05) -> float:
    """Power to detect |effect| (Cohen's d) with n1 + n2 learners, two-sided at ``alpha``."""
    from matcheck.power import solve
    from matcheck.power.designs import Design, Kind

    design = Design(Kind.TWO_GROUP, (2,), ("condition",), alpha=alpha, ratio=n2 / n1)
    return solve.power(design, design.terms()[0], abs(effect), n1)
