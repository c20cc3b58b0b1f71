"""The statistics of the learners' data against published values and a second library.

Every expected number comes from outside the project: docs/references.md names the source of
each (§4 effect sizes, §5 WWC, §18 attrition boundary, §6 power, §7 TOST, §10 reliability).
pingouin and statsmodels are reference libraries (test-only for pingouin).
"""

from __future__ import annotations

import math

import pytest

from matcheck.studystats import reliability as rel
from matcheck.studystats.attrition import Assumption, Attrition, boundary
from matcheck.studystats.effects import (
    Band,
    Summary,
    approximate_j,
    cohen_d,
    cox_index,
    exact_j,
    glass_delta,
    hedges_g,
    wwc_band,
)
from matcheck.studystats.equivalence import student_t, tost
from matcheck.studystats.power import achieved_power

# Source: Wuensch, KR20.txt (East Carolina Univ.), 10 students × 10 items; docs/references.md §10.
WUENSCH = [
    [1, 1, 1, 1, 1, 1, 0, 1, 1, 0],
    [1, 0, 1, 1, 0, 1, 1, 1, 0, 1],
    [1, 1, 1, 1, 0, 1, 1, 0, 0, 1],
    [0, 0, 1, 0, 0, 0, 1, 0, 0, 0],
    [0, 0, 0, 0, 0, 1, 0, 0, 1, 0],
    [1, 1, 1, 0, 1, 1, 1, 1, 1, 1],
    [1, 1, 0, 1, 1, 1, 0, 1, 1, 1],
    [1, 1, 1, 1, 1, 1, 1, 1, 0, 1],
    [0, 1, 0, 1, 1, 1, 1, 1, 0, 1],
    [1, 1, 0, 1, 1, 0, 1, 1, 1, 0],
]
# Source: docs/references.md §7 (statsmodels 0.15.0 output, matches the hand calculation).
TOST_X1 = [5, 6, 7, 5, 6, 7, 5, 6, 7, 6, 5, 6, 7, 6, 6, 5, 7, 6, 6, 6]
TOST_X2 = [6, 5, 7, 6, 5, 6, 7, 6, 5, 6, 6, 7, 5, 6, 6, 5, 7, 6, 6, 5]


# -- effect sizes (§4) -------------------------------------------------------------------


def test_hedges_g_published_example_needs_the_exact_correction() -> None:
    # Source: reproducer::calculateHg docs (rdrr.io): M 10 vs 15, SD 2, n 20 + 20 → d 2.5,
    # g 2.450276 with the exact J; the approximate J gives 2.450331. docs/references.md §4.
    control, treatment = Summary(20, 10.0, 2.0), Summary(20, 15.0, 2.0)
    assert cohen_d(control, treatment) == pytest.approx(2.5, abs=1e-12)
    assert hedges_g(control, treatment).value == pytest.approx(2.450276, abs=1e-6)
    assert 2.5 * approximate_j(38) == pytest.approx(2.450331, abs=1e-6)


def test_exact_j_from_gamma_functions_by_hand() -> None:
    # J(4) = Γ(2)/(√2·Γ(1.5)) = 1/(√2·√π/2) = √2/√π (Hedges 1981); docs/references.md §4.
    assert exact_j(4) == pytest.approx(math.sqrt(2 / math.pi), abs=1e-12)
    assert exact_j(10_000) == pytest.approx(approximate_j(10_000), abs=1e-9)


def test_lecture_notes_example() -> None:
    # Source: docs/references.md §4 example 2: M 103 vs 100, SD 5.5 and 4.5, n 50 + 50.
    control, treatment = Summary(50, 100.0, 4.5), Summary(50, 103.0, 5.5)
    assert cohen_d(control, treatment) == pytest.approx(0.5970, abs=1e-4)
    assert hedges_g(control, treatment).value == pytest.approx(0.5924, abs=1e-4)


def test_glass_delta_uses_the_control_sd() -> None:
    # Source: docs/references.md §4 example 3: M_T 7.50, M_C 2.725, s_C 2.038 → Δ 2.3430.
    delta = glass_delta(Summary(10, 2.725, 2.038), Summary(10, 7.50, 5.0))
    assert delta.value == pytest.approx(2.3430, abs=1e-4)


def test_wwc_worked_example_g_and_cox_index() -> None:
    # Source: docs/references.md §5: pretest (5, 6, 7) vs (4, 5, 6): d 1.0, ω 0.8, g 0.800;
    # p 2/3 vs 1/3: ln 4 / 1.65 = 0.8402 without ω, 0.6721 with it.
    control, treatment = Summary.of([4, 5, 6]), Summary.of([5, 6, 7])
    d = cohen_d(control, treatment)
    assert d == pytest.approx(1.0)
    assert approximate_j(6 - 2) * d == pytest.approx(0.800, abs=1e-12)  # WWC's ω
    # Exact J(4) = 0.7979 (COMPUTED): the same band either way.
    assert wwc_band(hedges_g(control, treatment).value) is Band.NOT_EQUIVALENT
    cox = cox_index(1 / 3, 2 / 3)
    assert cox == pytest.approx(0.8402, abs=1e-4)
    assert approximate_j(4) * cox == pytest.approx(0.6721, abs=1e-4)


@pytest.mark.parametrize(
    ("effect", "band"),
    [
        (0.0, Band.EQUIVALENT),
        (0.05, Band.EQUIVALENT),  # "up to 0.05" is equivalent (WWC FAQ, §5)
        (-0.0501, Band.NEEDS_ADJUSTMENT),
        (0.25, Band.NEEDS_ADJUSTMENT),  # ≤ at 0.25 (v4.1, §5)
        (0.2501, Band.NOT_EQUIVALENT),
        (-1.0, Band.NOT_EQUIVALENT),
    ],
)
def test_wwc_bands_at_their_edges(effect: float, band: Band) -> None:
    assert wwc_band(effect) is band


def test_effect_sizes_agree_with_pingouin() -> None:
    pg = pytest.importorskip("pingouin")
    control, treatment = Summary.of(TOST_X2), Summary.of(TOST_X1)
    d = pg.compute_effsize(TOST_X1, TOST_X2, eftype="cohen")
    assert cohen_d(control, treatment) == pytest.approx(d, abs=1e-12)
    # pingouin's Hedges' g uses the approximate J: close, not equal (n = 40).
    g_approx = pg.compute_effsize(TOST_X1, TOST_X2, eftype="hedges")
    g = hedges_g(control, treatment)
    assert g.value == pytest.approx(g_approx, abs=1e-4)
    assert g.value == pytest.approx(d * exact_j(38), abs=1e-12)
    low, high = pg.compute_esci(stat=g.value, nx=20, ny=20, eftype="cohen", decimals=12)
    assert (g.low, g.high) == pytest.approx((low, high), abs=1e-9)


# -- equivalence (§7) --------------------------------------------------------------------


def test_tost_published_example() -> None:
    # Source: docs/references.md §7: t1 2.6285 p1 0.00615, t2 −1.7523 p2 0.04389, df 38,
    # TOST p 0.04389, 90% CI (−0.2848, 0.4848). x1 − x2 is b − a here.
    a, b = Summary.of(TOST_X2), Summary.of(TOST_X1)
    result = tost(a, b, -0.5, 0.5)
    assert result.p == pytest.approx(0.04389, abs=1e-5)
    assert result.p_lower == pytest.approx(0.00615, abs=1e-5)
    assert (result.ci_low, result.ci_high) == pytest.approx((-0.2848, 0.4848), abs=1e-4)
    assert result.equivalent


def test_tost_and_t_test_agree_with_statsmodels() -> None:
    weightstats = pytest.importorskip("statsmodels.stats.weightstats")
    p, _, _ = weightstats.ttost_ind(TOST_X1, TOST_X2, -0.3, 0.3, usevar="pooled")
    ours = tost(Summary.of(TOST_X2), Summary.of(TOST_X1), -0.3, 0.3)
    assert ours.p == pytest.approx(p, abs=1e-10)
    assert not ours.equivalent
    t, p_two, df = weightstats.ttest_ind(TOST_X1, TOST_X2, usevar="pooled")
    mine = student_t(Summary.of(TOST_X2), Summary.of(TOST_X1))
    assert (mine.t, mine.p, mine.df) == pytest.approx((t, p_two, df), abs=1e-10)


# -- reliability (§10) -------------------------------------------------------------------


def test_kr20_published_matrix_without_the_variance_trap() -> None:
    # Source: Wuensch KR20.txt; docs/references.md §10: Σpq 2.18, population variance 5.84,
    # KR-20 0.6963; Σpq over the sample variance (6.489) would give the wrong 0.7378.
    value = rel.cronbach_alpha(WUENSCH)
    assert value == pytest.approx(0.6963, abs=1e-4)
    assert value != pytest.approx(0.7378, abs=1e-3)
    totals = [sum(row) for row in WUENSCH]
    assert totals == [8, 7, 7, 2, 2, 9, 8, 9, 7, 7]


def test_alpha_and_feldt_interval_agree_with_pingouin() -> None:
    pg = pytest.importorskip("pingouin")
    pd = pytest.importorskip("pandas")
    frame = pd.DataFrame(WUENSCH)
    alpha, (low, high) = pg.cronbach_alpha(data=frame, ci=0.95)
    assert rel.cronbach_alpha(WUENSCH) == pytest.approx(alpha, abs=1e-10)
    ours = rel.feldt_interval(rel.cronbach_alpha(WUENSCH), 10, 10)
    # pingouin rounds its interval to three decimals.
    assert ours == pytest.approx((low, high), abs=5e-4)


def test_item_statistics_on_the_published_matrix() -> None:
    # Source: Wuensch KR20.txt: p = .7 .7 .6 .7 .6 .8 .7 .7 .5 .6; docs/references.md §10.
    names = [f"i{j}" for j in range(1, 11)]
    stats = rel.item_statistics(names, WUENSCH, [1.0] * 10)
    assert [round(s.difficulty, 10) for s in stats] == [
        0.7,
        0.7,
        0.6,
        0.7,
        0.6,
        0.8,
        0.7,
        0.7,
        0.5,
        0.6,
    ]
    # Corrected item-total r of item 1 by hand: r(item 1, total − item 1).
    column = [row[0] for row in WUENSCH]
    rest = [sum(row) - row[0] for row in WUENSCH]
    np = pytest.importorskip("numpy")
    assert stats[0].discrimination == pytest.approx(float(np.corrcoef(column, rest)[0, 1]))


def test_ceiling_and_floor_at_the_fifteen_percent_rule() -> None:
    # Source: Terwee et al. 2007 (docs/references.md §10): an effect when MORE than 15 %
    # score the lowest or highest possible score.
    totals = [10] * 3 + [5] * 17  # 3 of 20 = 15 % at the maximum: no ceiling effect
    floor, ceiling = rel.end_shares(totals, 0, 10)
    assert (floor, ceiling) == (0.0, 0.15)
    assert not rel.end_effect(ceiling)
    totals = [10] * 4 + [0] * 4 + [5] * 12  # 20 % at each end
    floor, ceiling = rel.end_shares(totals, 0, 10)
    assert rel.end_effect(ceiling) and rel.end_effect(floor)


def test_spearman_brown_by_hand() -> None:
    # Spearman–Brown (docs/references.md §10), by hand: doubling a test of reliability 0.6
    # gives 2·0.6/(1 + 0.6) = 0.75; 10 items at 0.6 need 10·0.8·0.4/(0.6·0.2) = 26.67 → 27
    # items for 0.8.
    assert rel.spearman_brown(0.6, 2) == pytest.approx(0.75)
    assert rel.items_needed(0.6, 10, 0.8) == 27
    assert rel.spearman_brown(0.6, 27 / 10) >= 0.8 > rel.spearman_brown(0.6, 26 / 10)
    assert rel.items_needed(0.85, 10, 0.8) == 10
    assert rel.items_needed(-0.1, 10, 0.8) is None


# -- attrition (§18) and power (§6) -------------------------------------------------------


def test_attrition_boundary_table_and_documented_examples() -> None:
    # Source: WWC Standards Handbook v4.0 Table II.1 as transcribed by a reviewers' R package
    # (SECONDARY; docs/references.md §18), with that package's documented examples.
    assert boundary(0.0, Assumption.CAUTIOUS) == pytest.approx(0.057)
    assert boundary(0.0, Assumption.OPTIMISTIC) == pytest.approx(0.100)
    assert boundary(0.10, Assumption.CAUTIOUS) == pytest.approx(0.063)
    assert boundary(0.58, Assumption.CAUTIOUS) is None
    # 20 of 40 and 31 of 49 analysed: overall 43 %, differential 13 points → high attrition.
    first = Attrition((40, 49), (20, 31), Assumption.OPTIMISTIC)
    assert round(first.overall * 100) == 43 and round(first.differential * 100) == 13
    assert not first.low
    # 30 of 40 and 40 of 48: overall 20 %, differential 8 points → low only optimistically.
    second = Attrition((40, 48), (30, 40), Assumption.CAUTIOUS)
    assert round(second.overall * 100) == 20 and round(second.differential * 100) == 8
    assert not second.low
    assert Attrition((40, 48), (30, 40), Assumption.OPTIMISTIC).low


def test_achieved_power_matches_cohens_table() -> None:
    # Source: Cohen (1988) Table 2.4.1 / Cohen (1992) Table 2; docs/references.md §6:
    # d = 0.5 needs 64 per group and d = 0.8 needs 26 for power .80 (two-sided α .05).
    assert achieved_power(0.5, 64, 64) == pytest.approx(0.80, abs=0.01)
    assert achieved_power(0.8, 26, 26) == pytest.approx(0.80, abs=0.01)
    assert achieved_power(0.5, 30, 30) < 0.80
