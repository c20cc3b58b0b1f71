"""Power, sample size and sensitivity (matcheck.power) against outside references.

- Cohen's table of n per group (docs/references.md §6);
- statsmodels' power classes as a reference library (its solvers, for a grid of designs);
- the ANCOVA and cluster adjustments against hand computations from their published
  formulas (docs/references.md §6.2, §6.3);
- sensitivity as the inverse of the sample-size computation (round trip).
"""

from __future__ import annotations

import math
from dataclasses import replace

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.stats import norm
from statsmodels.stats.power import FTestAnovaPower, TTestIndPower

from matcheck.power import solve
from matcheck.power.adjust import ancova_n, classes_needed, design_effect
from matcheck.power.designs import Design, Kind, Measure, d_from_difference
from matcheck.power.plan import Mode, analyse, assess
from matcheck.power.solve import Effect

TWO = Design(Kind.TWO_GROUP, (2,), ("groups",))


def _n(design: Design, effect: float, target: float, term_name: str | None = None) -> int:
    term = design.terms()[-1] if term_name is None else design.term(term_name)
    value = Effect.of(design, term, effect, design.native)
    return analyse(design, term, effect=value, target=target).n_per_group


# --- Cohen's table --------------------------------------------------------------------------

# Source: Cohen (1988) Table 2.4.1 and Cohen (1992) Table 2; docs/references.md §6.
COHEN = [(0.2, 0.80, 393), (0.5, 0.80, 64), (0.8, 0.80, 26), (0.2, 0.90, 526), (0.5, 0.90, 85),
         (0.8, 0.90, 34)]  # fmt: skip


@pytest.mark.parametrize(("d", "target", "published"), COHEN)
def test_cohen_table(d: float, target: float, published: int) -> None:
    # Cohen rounds from a normal approximation; the exact t computation may differ by one.
    assert abs(_n(TWO, d, target) - published) <= 1


def test_d_from_a_difference_in_points() -> None:
    # Common practice: a 10-point difference with an SD of 10 is d = 1.
    assert d_from_difference(10, 10) == 1.0
    assert d_from_difference(4.5, 15) == pytest.approx(0.3)


# --- statsmodels as reference library --------------------------------------------------------

GRID = [
    (d, alpha, one_sided, ratio)
    for d in (0.3, 0.5, 0.8)
    for alpha in (0.01, 0.05, 0.10)
    for one_sided in (False, True)
    for ratio in (1.0, 0.5, 2.0)
]


@pytest.mark.parametrize(("d", "alpha", "one_sided", "ratio"), GRID)
def test_two_groups_match_statsmodels_solver(
    d: float, alpha: float, one_sided: bool, ratio: float
) -> None:
    design = replace(TWO, alpha=alpha, one_sided=one_sided, ratio=ratio)
    alternative = "larger" if one_sided else "two-sided"
    reference = TTestIndPower().solve_power(
        effect_size=d, alpha=alpha, power=0.8, ratio=ratio, alternative=alternative
    )
    # Our n is the smallest whole n1 with the power: the ceiling of statsmodels' float n1.
    assert _n(design, d, 0.8) == math.ceil(reference - 1e-9)
    # Sensitivity at n = 50 against statsmodels solving for the effect.
    term = design.terms()[0]
    found = analyse(design, term, units=50, target=0.8)
    expected = TTestIndPower().solve_power(
        nobs1=50, alpha=alpha, power=0.8, ratio=ratio, alternative=alternative
    )
    assert found.effect.d == pytest.approx(expected, rel=1e-5)


@pytest.mark.parametrize("k", [3, 4, 6])
@pytest.mark.parametrize("f", [0.1, 0.25, 0.4])
def test_k_groups_match_statsmodels_solver(k: int, f: float) -> None:
    design = Design(Kind.K_GROUP, (k,), ("groups",))
    total = FTestAnovaPower().solve_power(effect_size=f, alpha=0.05, power=0.8, k_groups=k)
    assert _n(design, f, 0.8) == math.ceil(total / k - 1e-9)


@pytest.mark.parametrize("k", [2, 3, 5])
@pytest.mark.parametrize("n", [10, 40, 120])
def test_noncentral_f_path_matches_statsmodels_anova(k: int, n: int) -> None:
    # The factorial path (scipy's ncf) on a one-factor design is statsmodels' one-way ANOVA.
    design = Design(Kind.FACTORIAL, (k,), ("A",))
    term = design.terms()[0]
    expected = FTestAnovaPower().power(effect_size=0.25, nobs=n * k, alpha=0.05, k_groups=k)
    assert solve.power(design, term, 0.25, n) == pytest.approx(expected, abs=1e-9)


@pytest.mark.parametrize("n", [10, 30, 64])
def test_two_groups_f_is_half_of_d(n: int) -> None:
    # Cohen (1988) §8.2: for two groups f = d/2; the F test of two groups is the t-test.
    k_design = Design(Kind.K_GROUP, (2,), ("groups",))
    term = k_design.terms()[0]
    expected = TTestIndPower().power(effect_size=0.5, nobs1=n, alpha=0.05)
    assert solve.power(k_design, term, 0.25, n) == pytest.approx(expected, abs=1e-9)


@pytest.mark.parametrize("n", [20, 50])
def test_main_effect_of_2x2_is_nearly_a_t_test_on_the_margins(n: int) -> None:
    # Main effect A of a 2×2 with n per cell: the margins hold 2n each and the noncentrality
    # is d²·n, as for a t-test of 2n per group; only the error df differ (4n − 4 vs 4n − 2).
    design = Design(Kind.FACTORIAL, (2, 2), ("A", "B"))
    term = design.term("A")
    effect = Effect.of(design, term, 0.5, Measure.D)
    assert effect.f == 0.25
    expected = TTestIndPower().power(effect_size=0.5, nobs1=2 * n, alpha=0.05)
    assert solve.power(design, term, effect.f, n) == pytest.approx(expected, abs=2e-3)


def test_factorial_terms_and_degrees_of_freedom() -> None:
    # Textbook ANOVA: in an a×b design, df(A) = a − 1, df(B) = b − 1, df(A×B) = (a − 1)(b − 1).
    design = Design(Kind.FACTORIAL, (2, 3), ("A", "B"))
    assert [(t.name, t.df) for t in design.terms()] == [("A", 1), ("B", 2), ("A×B", 2)]
    assert design.term("AxB").name == "A×B"
    with pytest.raises(ValueError, match="two-level"):
        Effect.of(design, design.term("B"), 0.5, Measure.D)


def test_interaction_d_is_a_difference_of_differences() -> None:
    # Cell means 0, 0 | 0, δ (in SD units): the interaction effects are ±δ/4, so f = δ/4,
    # and d of the interaction (difference of the simple differences) is δ.
    design = Design(Kind.FACTORIAL, (2, 2), ("A", "B"))
    means = [0.0, 0.0, 0.0, 0.6]
    grand = sum(means) / 4
    a = [(means[0] + means[1]) / 2 - grand, (means[2] + means[3]) / 2 - grand]
    b = [(means[0] + means[2]) / 2 - grand, (means[1] + means[3]) / 2 - grand]
    inter = [means[2 * i + j] - grand - a[i] - b[j] for i in range(2) for j in range(2)]
    f = math.sqrt(sum(x * x for x in inter) / 4)
    assert Effect.of(design, design.term("A×B"), 0.6, Measure.D).f == pytest.approx(f)


# --- sensitivity: the inverse of the sample size ---------------------------------------------

DESIGNS = [
    TWO,
    replace(TWO, ratio=2.0),
    Design(Kind.K_GROUP, (4,), ("groups",)),
    Design(Kind.FACTORIAL, (2, 3), ("A", "B")),
    replace(TWO, pretest_r=0.5),
    replace(TWO, icc=0.15, class_size=20),
]


@pytest.mark.parametrize("design", DESIGNS)
@pytest.mark.parametrize("units", [6, 25, 80])
def test_sensitivity_round_trip(design: Design, units: int) -> None:
    for term in design.terms():
        found = analyse(design, term, units=units, target=0.8)
        # At the detectable effect the power is the target, and the n it needs is this n.
        native = found.effect.native(design)
        assert solve.power(design, term, native, units) == pytest.approx(0.8, abs=1e-6)
        assert solve.units_needed(design, term, native * (1 + 1e-6), 0.8) == units
        back = analyse(design, term, effect=found.effect, target=0.8)
        assert back.units in (units, units + 1)  # power equals the target there, ± xtol


# --- the adjustments --------------------------------------------------------------------------


@pytest.mark.parametrize("rho", [0.3, 0.5, 0.7])
@pytest.mark.parametrize("d", [0.3, 0.5])
def test_ancova_matches_borm_formula(rho: float, d: float) -> None:
    # Borm, Fransen & Lemmens (2007): ANCOVA needs (1 − ρ²)·n of the t-test's n per group;
    # docs/references.md §6.2. Hand computation from statsmodels' float n for the t-test.
    n_t = TTestIndPower().solve_power(effect_size=d, alpha=0.05, power=0.8)
    approximate = n_t * (1 - rho**2)
    assert ancova_n(n_t, rho) == pytest.approx(approximate)
    exact = _n(replace(TWO, pretest_r=rho), d, 0.8)
    # The exact n spends one df on the covariate, so it can only be a little larger.
    assert math.ceil(approximate) <= exact <= math.ceil(approximate) + 2


@pytest.mark.parametrize(("n", "rho"), [(30, 0.5), (60, 0.6), (100, 0.3)])
def test_ancova_power_against_the_normal_approximation(n: int, rho: float) -> None:
    # Hand computation (large-sample): power ≈ Φ(d·√(n/2)/√(1 − ρ²) − z₁₋α/₂).
    d = 0.4
    expected = norm.cdf(d * math.sqrt(n / 2) / math.sqrt(1 - rho**2) - norm.ppf(0.975))
    design = replace(TWO, pretest_r=rho)
    assert solve.power(design, design.terms()[0], d, n) == pytest.approx(expected, abs=0.015)


def test_no_correlation_costs_one_degree_of_freedom() -> None:
    design = replace(TWO, pretest_r=0.0)
    plain = TTestIndPower().power(effect_size=0.5, nobs1=30, alpha=0.05)
    adjusted = solve.power(design, design.terms()[0], 0.5, 30)
    assert adjusted < plain
    assert adjusted == pytest.approx(plain, abs=3e-3)


@pytest.mark.parametrize(("m", "icc"), [(25, 0.2), (20, 0.1), (30, 0.05)])
@pytest.mark.parametrize("d", [0.25, 0.4])
def test_cluster_design_effect_by_hand(m: int, icc: float, d: float) -> None:
    # Donner & Klar (2000): deff = 1 + (m − 1)·ICC; docs/references.md §6.3. By hand: the
    # individually randomised n (statsmodels), times deff, in whole classes of m.
    assert design_effect(25, 0.2) == pytest.approx(5.8)
    n_individual = TTestIndPower().solve_power(effect_size=d, alpha=0.05, power=0.8)
    hand = math.ceil(n_individual * (1 + (m - 1) * icc) / m)
    assert classes_needed(n_individual, m, icc) == hand
    design = replace(TWO, icc=icc, class_size=m)
    value = Effect.of(design, design.terms()[0], d, Measure.D)
    result = analyse(design, design.terms()[0], effect=value, target=0.8)
    # The analysis of class means has fewer error df (2k − 2) than the learner count the
    # design-effect formula implies, so it needs the hand count or a class or two more.
    assert hand <= result.classes_per_group <= hand + 2
    assert result.n_per_group == result.classes_per_group * m


@pytest.mark.parametrize(("m", "icc", "classes"), [(25, 0.2, 8), (20, 0.1, 5), (12, 0.0, 3)])
def test_cluster_power_is_a_t_test_of_class_means(m: int, icc: float, classes: int) -> None:
    # A class mean has variance σ²·(ICC + (1 − ICC)/m) = σ²·deff/m, so the t-test of class
    # means sees d·√(m/deff) with k classes per group (statsmodels as reference).
    d = 0.4
    deff = 1 + (m - 1) * icc
    expected = TTestIndPower().power(effect_size=d * math.sqrt(m / deff), nobs1=classes, alpha=0.05)
    design = replace(TWO, icc=icc, class_size=m)
    assert solve.power(design, design.terms()[0], d, classes) == pytest.approx(expected, abs=1e-9)


# --- a planned study --------------------------------------------------------------------------


def test_assess_reports_power_need_and_sensitivity() -> None:
    term = TWO.terms()[0]
    planned = assess(TWO, term, 40, Effect.of(TWO, term, 0.5, Measure.D), 0.8)
    assert planned.short
    assert planned.has.mode is Mode.POWER
    assert planned.has.power == pytest.approx(
        TTestIndPower().power(effect_size=0.5, nobs1=40, alpha=0.05)
    )
    assert abs(planned.needs.n_per_group - 64) <= 1  # Cohen's table, docs/references.md §6
    assert planned.detects.effect.d is not None and planned.detects.effect.d > 0.5


@pytest.mark.parametrize("n", [12, 40])
def test_one_sided_f_path_is_the_one_sided_t_test(n: int) -> None:
    # A one-df term tested one-sided is a t-test in one tail (statsmodels, 'larger').
    design = Design(Kind.FACTORIAL, (2,), ("A",), one_sided=True)
    expected = TTestIndPower().power(effect_size=0.5, nobs1=n, alpha=0.05, alternative="larger")
    assert solve.power(design, design.terms()[0], 0.25, n) == pytest.approx(expected, abs=1e-9)


def test_unequal_groups_f_and_d() -> None:
    # Cohen's f of two groups with shares p and 1 − p is d·√(p(1 − p)); equal groups: d/2.
    design = replace(TWO, ratio=3.0)
    effect = Effect.of(design, design.terms()[0], 0.5, Measure.D)
    assert effect.f == pytest.approx(0.5 * math.sqrt(0.25 * 0.75))
    back = Effect.of(design, design.terms()[0], effect.f, Measure.F)
    assert back.d == pytest.approx(0.5)


def test_an_effect_too_small_to_plan_for_is_refused() -> None:
    term = TWO.terms()[0]
    with pytest.raises(solve.Unreachable, match="per condition would be needed"):
        solve.units_needed(TWO, term, 1e-4, 0.99)


@given(
    units=st.integers(min_value=4, max_value=400),
    effect=st.floats(min_value=0.05, max_value=1.5),
    design=st.sampled_from(DESIGNS),
)
@settings(max_examples=40, deadline=None)
def test_power_grows_with_sample_and_effect(units: int, effect: float, design: Design) -> None:
    # A property of every power function: more learners or a larger effect never lose power.
    term = design.terms()[0]
    here = solve.power(design, term, effect, units)
    assert alpha_floor(design) <= here <= 1.0
    assert solve.power(design, term, effect, units + 1) >= here - 1e-12
    assert solve.power(design, term, effect * 1.1, units) >= here - 1e-12


def alpha_floor(design: Design) -> float:
    """Power to detect a positive effect is at least about α/2 (two-sided) or α (one-sided)."""
    return design.alpha / 2 if not design.one_sided else design.alpha
