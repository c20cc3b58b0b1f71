"""The designs power is computed for, and their contrasts (the terms a study tests).

A design is a number of levels per factor: two groups ``(2,)``, one factor of k groups
``(k,)``, a factorial ``(a, b, ...)``. Every main effect and every interaction of a factorial
is a *term*; its numerator degrees of freedom are the product of ``levels - 1`` over its
factors. Two adjustments apply to any design: a pre-test used as a covariate (ANCOVA,
``pretest_r``) and whole classes assigned to conditions (``icc`` and ``class_size``).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from enum import StrEnum
from itertools import combinations

# How the name of an interaction joins its factors (A×B); ``x`` is accepted on input.
TIMES = "×"


class Kind(StrEnum):
    TWO_GROUP = "two-group"
    K_GROUP = "k-group"
    FACTORIAL = "factorial"


class Measure(StrEnum):
    """Cohen's d (a standardised difference of two means) or f (SD of the means / SD)."""

    D = "d"
    F = "f"


@dataclass(frozen=True, slots=True)
class Term:
    """One contrast the design tests: a main effect or an interaction."""

    name: str
    factors: tuple[int, ...]
    df: int
    two_level: bool

    def f_from_d(self, d: float) -> float:
        """Cohen's f of a term whose factors all have two levels, from d.

        A two-level main effect with marginal means ``±Δ/2`` around the grand mean has
        ``f = d/2`` (Cohen 1988, §8.2: for two groups f = d/2); an interaction of j two-level
        factors, with d the difference of the simple differences (of differences, ...) in SD
        units, has effects ``±d·σ/2^j`` in every cell, so ``f = d/2^j``.
        """
        return d / float(2 ** len(self.factors))

    def d_from_f(self, f: float) -> float:
        return f * float(2 ** len(self.factors))


@dataclass(frozen=True, slots=True)
class Design:
    kind: Kind
    levels: tuple[int, ...]
    names: tuple[str, ...]
    alpha: float = 0.05
    one_sided: bool = False
    # n2/n1 for two groups (unequal allocation); 1 for every other design.
    ratio: float = 1.0
    # Pre-test/post-test correlation when the pre-test is a covariate; None: no covariate.
    pretest_r: float | None = None
    # Intraclass correlation and learners per class when classes are assigned.
    icc: float | None = None
    class_size: int | None = None

    @property
    def cells(self) -> int:
        return math.prod(self.levels)

    @property
    def clustered(self) -> bool:
        return self.class_size is not None

    @property
    def design_effect(self) -> float:
        from matcheck.power.adjust import design_effect

        if self.class_size is None:
            return 1.0
        return design_effect(self.class_size, self.icc or 0.0)

    @property
    def native(self) -> Measure:
        """The effect size a design is stated in by default."""
        return Measure.D if self.kind is Kind.TWO_GROUP else Measure.F

    def terms(self) -> tuple[Term, ...]:
        """Main effects in factor order, then interactions by order (A, B, A×B)."""
        result = []
        for size in range(1, len(self.levels) + 1):
            for chosen in combinations(range(len(self.levels)), size):
                df = math.prod(self.levels[i] - 1 for i in chosen)
                name = TIMES.join(self.names[i] for i in chosen)
                two = all(self.levels[i] == 2 for i in chosen)
                result.append(Term(name, chosen, df, two))
        return tuple(result)

    def term(self, name: str) -> Term:
        wanted = name.replace("x", TIMES).replace("*", TIMES) if self._letters() else name
        for term in self.terms():
            if term.name in (name, wanted):
                return term
        raise KeyError(name)

    def _letters(self) -> bool:
        return all(len(n) == 1 for n in self.names)


def factor_letters(count: int) -> tuple[str, ...]:
    return tuple("ABCDEFGH"[:count])


def d_from_difference(difference: float, sd: float) -> float:
    """Cohen's d of a difference between two means in the outcome's points: difference / SD."""
    return difference / sd
