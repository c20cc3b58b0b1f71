"""Overall and differential attrition, judged against the WWC attrition boundary.

Overall attrition is the share of all randomised learners without an outcome; differential
attrition is the absolute difference between the two conditions' attrition rates. The WWC
judges a contrast "low attrition" when its differential attrition lies at or below the
boundary for its overall attrition, under a cautious or an optimistic assumption about how
attrition relates to the outcome.

The boundary table (differential attrition in percentage points for overall attrition 0 %
to 57 %) is WWC Standards Handbook v4.0, Table II.1. SECONDARY: transcribed from the table by
a third-party reviewers' R package, not read in the handbook itself; the first rows (5.7 and
10.0 points at 0 %) agree with what we recall of v4.1 and v5.0. See docs/references.md §18.
Between whole percentages we interpolate linearly (our choice: the table is a sampled curve);
beyond 57 % overall attrition, the table has no row and attrition is high.
"""

from __future__ import annotations

from dataclasses import dataclass
from enum import StrEnum

SOURCE = "WWC Standards Handbook v4.0, Table II.1 (secondary transcription; docs/references.md §18)"

# Index = overall attrition in whole percent (0 … 57); value = differential boundary, points.
CAUTIOUS = (
    5.7, 5.8, 5.9, 5.9, 6.0, 6.1, 6.2, 6.3, 6.3, 6.3, 6.3, 6.2, 6.2, 6.1, 6.0, 5.9, 5.9, 5.8,
    5.7, 5.5, 5.4, 5.3, 5.2, 5.1, 4.9, 4.8, 4.7, 4.5, 4.4, 4.3, 4.1, 4.0, 3.8, 3.6, 3.5, 3.3,
    3.2, 3.1, 2.9, 2.8, 2.6, 2.5, 2.3, 2.1, 2.0, 1.8, 1.6, 1.5, 1.3, 1.2, 1.0, 0.9, 0.7, 0.6,
    0.4, 0.3, 0.2, 0.0,
)  # fmt: skip
OPTIMISTIC = (
    10.0, 10.1, 10.2, 10.3, 10.4, 10.5, 10.7, 10.8, 10.9, 10.9, 10.9, 10.9, 10.9, 10.9, 10.8,
    10.8, 10.7, 10.6, 10.5, 10.3, 10.2, 10.0, 9.9, 9.7, 9.5, 9.4, 9.2, 9.0, 8.8, 8.6, 8.4, 8.2,
    8.0, 7.8, 7.6, 7.4, 7.2, 7.0, 6.7, 6.5, 6.3, 6.0, 5.8, 5.6, 5.3, 5.1, 4.9, 4.6, 4.4, 4.2,
    3.9, 3.7, 3.5, 3.2, 3.0, 2.8, 2.6, 2.3,
)  # fmt: skip


class Assumption(StrEnum):
    CAUTIOUS = "cautious"
    OPTIMISTIC = "optimistic"


@dataclass(frozen=True, slots=True)
class Attrition:
    randomised: tuple[int, int]  # learners assigned to each condition
    analysed: tuple[int, int]  # learners with an outcome
    assumption: Assumption

    @property
    def rates(self) -> tuple[float, float]:
        return (
            1 - self.analysed[0] / self.randomised[0],
            1 - self.analysed[1] / self.randomised[1],
        )

    @property
    def overall(self) -> float:
        return 1 - sum(self.analysed) / sum(self.randomised)

    @property
    def differential(self) -> float:
        first, second = self.rates
        return abs(first - second)

    @property
    def boundary(self) -> float | None:
        """The largest differential attrition (a share) still low at this overall rate."""
        return boundary(self.overall, self.assumption)

    @property
    def low(self) -> bool:
        limit = self.boundary
        # Rounded to the table's precision (0.1 point) so that 5.7 % at 0 % is low.
        return limit is not None and round(self.differential * 100, 6) <= round(limit * 100, 6)


def boundary(overall: float, assumption: Assumption) -> float | None:
    """The differential boundary (a share) for an overall attrition share, or None past 57 %."""
    table = CAUTIOUS if assumption is Assumption.CAUTIOUS else OPTIMISTIC
    percent = overall * 100
    if percent < 0 or percent > len(table) - 1:
        return None
    below = int(percent)
    if below == len(table) - 1:
        return table[below] / 100
    share = percent - below
    return (table[below] * (1 - share) + table[below + 1] * share) / 100
