"""Power, sample size and sensitivity for one term of a design.

Power comes from well-kept libraries: statsmodels' ``TTestIndPower`` (two groups, with
unequal allocation) and ``FTestAnovaPower`` (k groups), and scipy's noncentral F and t
distributions where statsmodels has no class for the case (a term of a factorial, with
numerator df of the term and denominator df ``N − cells``; a covariate, which spends one more
error df). The two adjustments of :mod:`matcheck.power.adjust` scale what goes in: the
covariate divides the noncentrality by ``1 − ρ²``; when classes are assigned, the analysis is
of class means, with classes as the units (so the error df count classes), and the effect in
SDs of a class mean is ``d·√(m / deff)``, which is the design effect applied to the
noncentrality.

The sample is counted in *units* per condition: learners, or classes when classes are
assigned. The n needed is the smallest whole number of units with at least the target power
(found by bisection on whole numbers, so it is exact for the power function); the
sensitivity is the effect at which the power equals the target (scipy's ``brentq``).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from matcheck.power.adjust import class_mean_scale, residual_share
from matcheck.power.designs import Design, Kind, Measure, Term

# The largest sample searched (units per condition): beyond it a study is not plannable.
MAX_UNITS = 10_000_000
# Effects searched for the sensitivity, in the design's measure (d or f).
EFFECT_RANGE = (1e-6, 50.0)


class Unreachable(ValueError):
    """The target power cannot be reached within the search range."""


def units_minimum(design: Design) -> int:
    """The fewest units per condition that leave at least one error degree of freedom."""
    covariate = 0 if design.pretest_r is None else 1
    # At least 2 per condition, and N − cells − covariate ≥ 1 (N counts units).
    smallest = 2
    while (
        _units_total(design, smallest) - design.cells - covariate < 1
        or smallest * design.ratio < 2  # the second of two unequal groups, too
    ):
        smallest += 1
    return smallest


def learners(design: Design, units: float) -> float:
    """Learners per condition (the first group's, with unequal allocation)."""
    return units * design.class_size if design.class_size else units


def _units_total(design: Design, first: float) -> float:
    if design.kind is Kind.TWO_GROUP:
        return first * (1.0 + design.ratio)
    return first * design.cells


def power(design: Design, term: Term, effect: float, units: float) -> float:
    """The power to detect ``effect`` (d for two groups, else f) for ``term``.

    ``units`` per condition: learners, or classes when classes are assigned.
    """
    # The analysis counts units (learners, or class means); an effect in learner SDs is
    # √(m / deff) times larger in SDs of class means (adjust.class_mean_scale).
    n1 = float(units)
    effect *= class_mean_scale(design.class_size, design.icc)
    share = residual_share(design.pretest_r)
    alternative = "larger" if design.one_sided else "two-sided"
    if design.kind is Kind.TWO_GROUP:
        d = effect
        if design.pretest_r is None:
            from statsmodels.stats.power import TTestIndPower

            value = float(
                TTestIndPower().power(
                    effect_size=d,
                    nobs1=n1,
                    alpha=design.alpha,
                    ratio=design.ratio,
                    alternative=alternative,
                )
            )
            if not math.isnan(value):
                return value
            # statsmodels adds the far tail, which scipy's nct returns as NaN once it
            # underflows (power near 1): the same sum, with that tail taken as 0.
        n2 = n1 * design.ratio
        if design.pretest_r is None:
            ncp = d * math.sqrt(n1 * n2 / (n1 + n2))
            return _t_power(ncp, n1 + n2 - 2, design.alpha, design.one_sided)
        ncp = d * math.sqrt(n1 * n2 / (n1 + n2) / share)
        return _t_power(ncp, n1 + n2 - 3, design.alpha, design.one_sided)
    total = n1 * design.cells
    if design.kind is Kind.K_GROUP and design.pretest_r is None and not design.one_sided:
        from statsmodels.stats.power import FTestAnovaPower

        value = float(
            FTestAnovaPower().power(
                effect_size=effect, nobs=total, alpha=design.alpha, k_groups=design.cells
            )
        )
        if not math.isnan(value):
            return value
        # scipy's noncentral F (behind statsmodels) returns NaN once its series underflows at
        # a very large noncentrality; the generic path below handles that case.
    covariate = 0 if design.pretest_r is None else 1
    df_error = total - design.cells - covariate
    noncentrality = effect**2 * total / share
    if design.one_sided:
        return _t_power(math.sqrt(noncentrality), df_error, design.alpha, True)
    return _f_power(noncentrality, term.df, df_error, design.alpha)


def _f_power(noncentrality: float, df_num: float, df_den: float, alpha: float) -> float:
    from scipy.stats import f as central_f
    from scipy.stats import ncf

    critical = central_f.isf(alpha, df_num, df_den)
    value = float(ncf.sf(critical, df_num, df_den, noncentrality))
    if math.isnan(value):
        # The series underflows only far out in the tail: with the noncentral F's mean
        # ((df_num + λ) / df_num · df_den / (df_den − 2)) far above the critical value, power
        # is 1 to double precision (found by the property test in tests/test_power.py).
        if noncentrality > 10 * df_num * critical:
            return 1.0
        raise ArithmeticError(f"noncentral F power is undefined at λ = {noncentrality:g}")
    return value


def _t_power(ncp: float, df: float, alpha: float, one_sided: bool) -> float:
    """Power of a t test (both tails when two-sided, as statsmodels counts it)."""
    from scipy.stats import nct
    from scipy.stats import t as central_t

    if one_sided:
        return float(nct.sf(central_t.isf(alpha, df), df, ncp))
    critical = central_t.isf(alpha / 2, df)
    far = float(nct.cdf(-critical, df, ncp))
    # The far tail underflows to NaN in scipy's nct when the effect is large: it is ~0 then.
    return float(nct.sf(critical, df, ncp)) + (0.0 if math.isnan(far) else far)


def units_needed(design: Design, term: Term, effect: float, target: float) -> int:
    """The fewest whole units per condition with at least ``target`` power."""
    low = units_minimum(design)
    if power(design, term, effect, low) >= target:
        return low
    high = low
    while power(design, term, effect, high) < target:
        low, high = high, high * 2
        if high > MAX_UNITS:
            raise Unreachable(f"more than {MAX_UNITS:,} per condition would be needed")
    # Invariant: power(low) < target <= power(high).
    while high - low > 1:
        middle = (low + high) // 2
        if power(design, term, effect, middle) >= target:
            high = middle
        else:
            low = middle
    return high


def detectable(design: Design, term: Term, units: float, target: float) -> float:
    """The smallest effect (d for two groups, else f) with ``target`` power at ``units``."""
    from scipy.optimize import brentq

    low, limit = EFFECT_RANGE
    # Bracket from below: near power 1 the noncentral distributions lose precision (NaN).
    high = 0.1
    while power(design, term, high, units) < target:
        low, high = high, high * 2
        if high > limit:
            raise Unreachable("no effect size reaches that power with this sample")
    return float(brentq(lambda e: power(design, term, e, units) - target, low, high, xtol=1e-10))


@dataclass(frozen=True, slots=True)
class Effect:
    """An effect size for a term, in f and, where the term has two levels, in d."""

    f: float
    d: float | None

    def native(self, design: Design) -> float:
        """The value the solver works in: d for two groups, f otherwise."""
        if design.kind is Kind.TWO_GROUP:
            assert self.d is not None
            return self.d
        return self.f

    @classmethod
    def of(cls, design: Design, term: Term, value: float, measure: Measure) -> Effect:
        """Read ``value`` in ``measure`` for ``term``; ValueError if d does not apply."""
        if design.kind is Kind.TWO_GROUP:
            r = design.ratio
            # Cohen's f of two groups of shares p and 1 − p is d·√(p(1 − p)): d/2 when equal.
            share = math.sqrt(r) / (1.0 + r)
            return cls(value * share, value) if measure is Measure.D else cls(value, value / share)
        if measure is Measure.F:
            return cls(value, term.d_from_f(value) if term.two_level else None)
        if not term.two_level:
            raise ValueError(
                f"d applies to contrasts of two-level factors; {term.name} has {term.df} "
                "degrees of freedom (give f)"
            )
        return cls(term.f_from_d(value), value)

    @classmethod
    def from_native(cls, design: Design, term: Term, value: float) -> Effect:
        return cls.of(design, term, value, design.native)
