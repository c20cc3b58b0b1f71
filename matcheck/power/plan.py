"""The three questions of a power analysis, for every contrast of a design.

- *n*: the sample per condition needed for an effect size and a target power;
- *power*: the power a sample has for an effect size;
- *sensitivity*: the smallest effect a sample detects with the target power.

:func:`analyse` answers one of them for one term; :func:`assess` answers all three for a
planned study (what ``matcheck check`` reports for each contrast).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from enum import StrEnum

from matcheck.power import solve
from matcheck.power.designs import Design, Kind, Term
from matcheck.power.solve import Effect


class Mode(StrEnum):
    N = "n"
    POWER = "power"
    SENSITIVITY = "sensitivity"


@dataclass(frozen=True, slots=True)
class Result:
    """One term's answer: the sample (in units per condition), the effect and the power."""

    design: Design
    term: Term
    mode: Mode
    units: int
    effect: Effect
    power: float
    target: float | None = None

    @property
    def n_by_group(self) -> tuple[int, ...]:
        """Learners in each condition (two groups: the second scaled by the ratio)."""
        first = int(solve.learners(self.design, self.units))
        if self.design.kind is Kind.TWO_GROUP:
            return (first, math.ceil(first * self.design.ratio - 1e-9))
        return (first,) * self.design.cells

    @property
    def n_per_group(self) -> int:
        return self.n_by_group[0]

    @property
    def classes_per_group(self) -> int | None:
        return self.units if self.design.clustered else None

    @property
    def ancova_approximation(self) -> float | None:
        """Borm et al. (2007): the unadjusted n per group times ``1 − ρ²`` (learners)."""
        if self.design.pretest_r is None or self.mode is not Mode.N or self.target is None:
            return None
        from dataclasses import replace

        from matcheck.power.adjust import ancova_n

        plain = replace(self.design, pretest_r=None)
        units = units_float(plain, self.term, self.effect.native(plain), self.target)
        return ancova_n(solve.learners(plain, units), self.design.pretest_r)


def units_float(design: Design, term: Term, effect: float, target: float) -> float:
    """The (fractional) units per condition at which the power equals ``target``."""
    from scipy.optimize import brentq

    whole = solve.units_needed(design, term, effect, target)
    low = float(solve.units_minimum(design))
    if solve.power(design, term, effect, low) >= target:
        return low
    return float(brentq(lambda u: solve.power(design, term, effect, u) - target, low, float(whole)))


def analyse(
    design: Design,
    term: Term,
    *,
    units: int | None = None,
    effect: Effect | None = None,
    target: float | None = None,
) -> Result:
    """Answer the question the missing one of ``units``, ``effect``, ``target`` asks."""
    if units is None:
        assert effect is not None and target is not None
        needed = solve.units_needed(design, term, effect.native(design), target)
        reached = solve.power(design, term, effect.native(design), needed)
        return Result(design, term, Mode.N, needed, effect, reached, target)
    if effect is None:
        assert target is not None
        found = solve.detectable(design, term, units, target)
        return Result(
            design,
            term,
            Mode.SENSITIVITY,
            units,
            Effect.from_native(design, term, found),
            target,
            target,
        )
    reached = solve.power(design, term, effect.native(design), units)
    return Result(design, term, Mode.POWER, units, effect, reached, target)


@dataclass(frozen=True, slots=True)
class Assessment:
    """A planned study's contrast: its power, the sample it needs, what it can detect."""

    has: Result
    needs: Result
    detects: Result

    @property
    def short(self) -> bool:
        assert self.has.target is not None
        return self.has.power < self.has.target


def assess(design: Design, term: Term, units: int, effect: Effect, target: float) -> Assessment:
    return Assessment(
        has=analyse(design, term, units=units, effect=effect, target=target),
        needs=analyse(design, term, effect=effect, target=target),
        detects=analyse(design, term, units=units, target=target),
    )
