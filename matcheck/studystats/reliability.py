"""Post-test quality: internal consistency, item statistics, ceiling and floor, test length.

Sources (docs/references.md §10):
- Cronbach's α = (k/(k−1))·(1 − Σ s²ᵢ / s²_X) (Cronbach 1951); KR-20 (Kuder & Richardson
  1937) is α on 0/1 items. One variance convention throughout (n − 1 here), else the
  published 0.6963 becomes 0.7378 (the trap of §10).
- Feldt's interval for α (Feldt 1965; Feldt, Woodruff & Salih 1987): with n learners and k
  items, (1 − α̂)/(1 − α) follows F(n − 1, (n − 1)(k − 1)), so the 100(1 − γ)% interval is
  1 − (1 − α̂)·F_{1−γ/2} to 1 − (1 − α̂)·F_{γ/2}. FROM MEMORY; pingouin's cronbach_alpha uses
  the same formula (checked in tests/test_studystats.py).
- Item difficulty = the item's mean share of its maximum (p for 0/1 items); corrected
  item-total correlation = Pearson r of the item with the total of the other items.
- Ceiling/floor: more than 15 % of learners at the maximum/minimum possible score
  (Terwee et al. 2007).
- Spearman–Brown: ρ* = nρ/(1 + (n − 1)ρ), so a test of k items with reliability ρ needs
  k·ρ*(1 − ρ)/(ρ(1 − ρ*)) items for ρ* (Spearman 1910; Brown 1910; FROM MEMORY).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

CEILING_SHARE = 0.15  # Terwee et al. (2007): more than 15 % at an end of the scale


def _variance(values: Sequence[float]) -> float:
    n = len(values)
    mean = math.fsum(values) / n
    return math.fsum((x - mean) ** 2 for x in values) / (n - 1)


def cronbach_alpha(scores: Sequence[Sequence[float]]) -> float:
    """α of a learners × items matrix (KR-20 when every score is 0 or 1).

    Raises ValueError for fewer than two learners or items, or constant totals.
    """
    n, k = len(scores), len(scores[0]) if scores else 0
    if n < 2 or k < 2:
        raise ValueError("reliability needs at least two learners and two items")
    items = [_variance([row[j] for row in scores]) for j in range(k)]
    total = _variance([math.fsum(row) for row in scores])
    if total == 0:
        raise ValueError("every learner has the same total score")
    return (k / (k - 1)) * (1 - math.fsum(items) / total)


def feldt_interval(alpha: float, n: int, k: int, level: float = 0.95) -> tuple[float, float]:
    """Feldt's confidence interval for α from n learners and k items."""
    from scipy.special import fdtri

    df1, df2 = n - 1, (n - 1) * (k - 1)
    tail = (1 - level) / 2
    low = 1 - (1 - alpha) * float(fdtri(df1, df2, 1 - tail))
    high = 1 - (1 - alpha) * float(fdtri(df1, df2, tail))
    return low, high


def _pearson(x: Sequence[float], y: Sequence[float]) -> float | None:
    mx, my = math.fsum(x) / len(x), math.fsum(y) / len(y)
    sxy = math.fsum((a - mx) * (b - my) for a, b in zip(x, y, strict=True))
    sxx = math.fsum((a - mx) ** 2 for a in x)
    syy = math.fsum((b - my) ** 2 for b in y)
    return sxy / math.sqrt(sxx * syy) if sxx and syy else None


@dataclass(frozen=True, slots=True)
class ItemStats:
    item: str
    difficulty: float  # mean share of the item's maximum (p for 0/1 items)
    discrimination: float | None  # corrected item-total r; None for a constant item


def item_statistics(
    names: Sequence[str], scores: Sequence[Sequence[float]], maxima: Sequence[float]
) -> list[ItemStats]:
    """Difficulty and corrected item-total correlation of each item."""
    totals = [math.fsum(row) for row in scores]
    result = []
    for j, name in enumerate(names):
        column = [row[j] for row in scores]
        rest = [t - x for t, x in zip(totals, column, strict=True)]
        difficulty = math.fsum(column) / len(column) / maxima[j] if maxima[j] else 0.0
        result.append(ItemStats(name, difficulty, _pearson(column, rest)))
    return result


def end_shares(totals: Sequence[float], minimum: float, maximum: float) -> tuple[float, float]:
    """Shares of learners at the minimum (floor) and at the maximum (ceiling) score."""
    n = len(totals)
    floor = sum(1 for t in totals if t <= minimum) / n
    ceiling = sum(1 for t in totals if t >= maximum) / n
    return floor, ceiling


def end_effect(share: float) -> bool:
    """A ceiling or floor effect: strictly more than 15 % at one end (Terwee et al. 2007)."""
    return share > CEILING_SHARE


def spearman_brown(reliability: float, factor: float) -> float:
    """Reliability of a test ``factor`` times as long."""
    return factor * reliability / (1 + (factor - 1) * reliability)


def items_needed(reliability: float, items: int, target: float) -> int | None:
    """Items (parallel to the present ones) for ``target``; None when α ≤ 0 (no length helps)."""
    if reliability <= 0:
        return None
    if reliability >= target:
        return items
    factor = target * (1 - reliability) / (reliability * (1 - target))
    return math.ceil(items * factor - 1e-9)
