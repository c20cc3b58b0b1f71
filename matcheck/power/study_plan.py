"""The study file's ``[sample]`` section: the planned sample and what it must detect.

:func:`parse_sample` validates the section's keys (messages name the key);
:func:`study_design` turns the study's conditions and factors into a power design and checks
that power can be computed for it; :func:`design_findings` gives ``matcheck check`` one
finding (group ``design``) per contrast the design tests.
"""

from __future__ import annotations

import re
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field
from pathlib import Path
from typing import TYPE_CHECKING, Any, Protocol

from matcheck.errors import ConfigError
from matcheck.power.designs import TIMES, Design, Kind, Measure, Term
from matcheck.power.rules import problem
from matcheck.valuetypes import got

if TYPE_CHECKING:
    from matcheck.findings import Finding
    from matcheck.power.plan import Assessment


class _Factor(Protocol):
    @property
    def name(self) -> str: ...
    @property
    def levels(self) -> tuple[str, ...]: ...


class Study(Protocol):
    """What a power design needs of :class:`matcheck.study.Study` (which imports this
    module, so it is not imported back)."""

    @property
    def path(self) -> Path: ...
    @property
    def conditions(self) -> Sequence[object]: ...
    @property
    def factors(self) -> Sequence[_Factor]: ...


SAMPLE_KEYS = {
    "per_condition",
    "classes_per_condition",
    "class_size",
    "icc",
    "smallest_effect",
    "effect_measure",
    "alpha",
    "target_power",
    "pretest_correlation",
    "one_sided",
}
# The contrast of a design without factors (every condition against every other).
CONDITIONS = "conditions"


@dataclass(frozen=True, slots=True)
class SamplePlan:
    """The planned sample (learners, or classes of a size, per condition) and its targets."""

    smallest_effect: float | None
    effects: dict[str, float] = field(default_factory=dict)
    effect_measure: Measure = Measure.D
    per_condition: int | None = None
    classes_per_condition: int | None = None
    class_size: int | None = None
    icc: float | None = None
    alpha: float = 0.05
    target_power: float = 0.8
    pretest_r: float | None = None
    one_sided: bool = False

    @property
    def units(self) -> int:
        value = self.classes_per_condition or self.per_condition
        assert value is not None
        return value


def _number(table: Mapping[str, Any], key: str, rule: str, shown: str) -> Any:
    value = table.get(key)
    if value is not None and (message := problem(rule, value, f"sample.{key}")):
        raise ConfigError(message, path=shown)
    return value


def parse_sample(table: Any, shown: str) -> SamplePlan:
    """Validate ``[sample]``; ConfigError naming the key."""
    if not isinstance(table, dict):
        raise ConfigError(f"[sample] must be a table, {got(table)}", path=shown)
    for key in table:
        if key not in SAMPLE_KEYS:
            allowed = ", ".join(sorted(SAMPLE_KEYS))
            raise ConfigError(f"[sample]: unknown key {key!r}; allowed: {allowed}", path=shown)
    per = _number(table, "per_condition", "n", shown)
    classes = _number(table, "classes_per_condition", "classes", shown)
    size = _number(table, "class_size", "class_size", shown)
    icc = _number(table, "icc", "icc", shown)
    if (per is None) == (classes is None):
        raise ConfigError(
            "[sample] needs per_condition (learners) or classes_per_condition (classes), "
            "one of the two",
            path=shown,
        )
    if classes is not None and (size is None or icc is None):
        raise ConfigError(
            "sample.classes_per_condition needs sample.class_size and sample.icc", path=shown
        )
    if per is not None and (size is not None or icc is not None):
        raise ConfigError(
            "sample.class_size and sample.icc go with classes_per_condition, not per_condition",
            path=shown,
        )
    measure_text = table.get("effect_measure", "d")
    if measure_text not in ("d", "f"):
        raise ConfigError(f'sample.effect_measure must be "d" or "f", not {measure_text!r}',
                          path=shown)  # fmt: skip
    effect, effects = _effects(table, shown)
    one_sided = table.get("one_sided", False)
    if not isinstance(one_sided, bool):
        raise ConfigError(
            f"sample.one_sided must be true or false (a boolean), {got(one_sided)}", path=shown
        )
    return SamplePlan(
        smallest_effect=effect,
        effects=effects,
        effect_measure=Measure(measure_text),
        per_condition=None if per is None else int(per),
        classes_per_condition=None if classes is None else int(classes),
        class_size=None if size is None else int(size),
        icc=icc,
        alpha=_number(table, "alpha", "alpha", shown) or 0.05,
        target_power=_number(table, "target_power", "power", shown) or 0.8,
        pretest_r=_number(table, "pretest_correlation", "pretest_r", shown),
        one_sided=one_sided,
    )


def _effects(table: Mapping[str, Any], shown: str) -> tuple[float | None, dict[str, float]]:
    if "smallest_effect" not in table:
        raise ConfigError("sample.smallest_effect is missing (the smallest effect of interest)",
                          path=shown)  # fmt: skip
    value = table["smallest_effect"]
    if isinstance(value, dict):
        effects = {}
        for name, number in value.items():
            if message := problem("effect", number, f"sample.smallest_effect.{name}"):
                raise ConfigError(message, path=shown)
            effects[_contrast_name(name)] = float(number)
        return None, effects
    if message := problem("effect", value, "sample.smallest_effect"):
        raise ConfigError(message, path=shown)
    return float(value), {}


def _contrast_name(name: str) -> str:
    """``a x b``, ``a*b``, ``a:b`` and ``a×b`` name the same interaction."""
    return TIMES.join(part.strip() for part in re.split(r"\s+x\s+|[×*:]", name))


def study_design(study: Study, plan: SamplePlan) -> Design:
    """The power design of ``study``; ConfigError when power cannot be computed for it."""
    shown = str(study.path)
    conditions = len(study.conditions)
    if len(study.factors) <= 1:
        names: tuple[str, ...] = (study.factors[0].name,) if study.factors else (CONDITIONS,)
        kind = Kind.TWO_GROUP if conditions == 2 else Kind.K_GROUP
        levels: tuple[int, ...] = (conditions,)
    else:
        kind = Kind.FACTORIAL
        names = tuple(factor.name for factor in study.factors)
        levels = tuple(len(factor.levels) for factor in study.factors)
        cells = 1
        for level in levels:
            cells *= level
        if cells != conditions:
            raise ConfigError(
                f"[sample]: power is computed for full factorial designs; the factors make "
                f"{cells} cells but the study has {conditions} conditions",
                path=shown,
            )
    design = Design(
        kind=kind,
        levels=levels,
        names=names,
        alpha=plan.alpha,
        one_sided=plan.one_sided,
        pretest_r=plan.pretest_r,
        icc=plan.icc,
        class_size=plan.class_size,
    )
    _check_contrasts(design, plan, shown)
    return design


def _check_contrasts(design: Design, plan: SamplePlan, shown: str) -> None:
    terms = design.terms()
    known = {term.name for term in terms}
    for name in plan.effects:
        if name not in known:
            raise ConfigError(
                f"sample.smallest_effect: {name!r} is not a contrast of the design "
                f"({', '.join(sorted(known))})",
                path=shown,
            )
    for term in terms:
        if plan.effects and term.name not in plan.effects:
            raise ConfigError(f"sample.smallest_effect has no value for {term.name!r}",
                              path=shown)  # fmt: skip
        if plan.one_sided and term.df > 1:
            raise ConfigError(
                f"sample.one_sided: {term.name} has {term.df} degrees of freedom; a one-sided "
                "test needs one",
                path=shown,
            )
        if (
            plan.effect_measure is Measure.D
            and design.kind is not Kind.TWO_GROUP
            and not term.two_level
        ):
            raise ConfigError(
                f'sample.effect_measure = "d" fits contrasts of two levels; {term.name} has '
                f'{term.df} degrees of freedom: give the effect as f (effect_measure = "f")',
                path=shown,
            )


def _assess(design: Design, term: Term, plan: SamplePlan) -> Assessment:
    from matcheck.power.plan import assess
    from matcheck.power.solve import Effect

    value = plan.effects.get(term.name, plan.smallest_effect)
    assert value is not None
    effect = Effect.of(design, term, value, plan.effect_measure)
    return assess(design, term, plan.units, effect, plan.target_power)


def design_findings(study: Study, plan: SamplePlan) -> tuple[Finding, ...]:
    """One finding per contrast: ``differs`` when the planned sample falls short."""
    design = study_design(study, plan)
    return tuple(
        _finding(design, term, _assess(design, term, plan), plan.effect_measure)
        for term in design.terms()
    )


def _finding(design: Design, term: Term, result: Assessment, measure: Measure) -> Finding:
    from matcheck.findings import Basis, Finding, Group, Status

    has, needs, detects = result.has, result.needs, result.detects
    symbol = measure.value
    wanted, smallest = (
        (has.effect.d, detects.effect.d)
        if measure is Measure.D
        else (has.effect.f, detects.effect.f)
    )
    assert wanted is not None and smallest is not None
    unit = "classes" if design.clustered else "learners"
    planned = has.classes_per_group if design.clustered else has.n_per_group
    needed = needs.classes_per_group if design.clustered else needs.n_per_group
    target = has.target or 0.0
    sign = "<" if result.short else "≥"
    reason = (
        f"power {has.power:.2f} {sign} {target:g} to detect {symbol} = {wanted:.2f}: needs "
        f"{needed} {unit} per condition, has {planned}; detects {symbol} ≥ {smallest:.2f}"
    )
    values: dict[str, float | None] = {
        "power": has.power,
        "target_power": target,
        f"planned_{unit}": float(planned or 0),
        f"needed_{unit}": float(needed or 0),
        "smallest_effect": wanted,
        "detectable_effect": smallest,
        "alpha": design.alpha,
        "one_sided": float(design.one_sided),
        "pretest_correlation": design.pretest_r,
        "icc": design.icc,
        "class_size": None if design.class_size is None else float(design.class_size),
        # The power curve: power at a range of samples per condition, for charts.
        **power_curve(design, term, has.effect.native(design), planned, needed),
    }
    return Finding(
        dimension=f"power:{term.name}",
        group=Group.DESIGN,
        unit=symbol,
        reference="",
        condition="",
        status=Status.DIFFERS if result.short else Status.MATCHED,
        values=values,
        difference=has.power - target,
        tolerance=None,
        reason=reason,
        basis=Basis.POWER,
    )


CURVE_POINTS = 12
CURVE_PREFIX = "power_at_"


def power_curve(
    design: Design, term: Term, effect: float, planned: float | None, needed: float | None
) -> dict[str, float | None]:
    """Power at CURVE_POINTS samples per condition, from the design's minimum to about twice
    the larger of the planned and needed samples; keys ``power_at_<units>``."""
    from matcheck.power.solve import power, units_minimum

    low = units_minimum(design)
    high = max(low + CURVE_POINTS, 2 * int(max(planned or 0, needed or 0)))
    step = max(1, round((high - low) / (CURVE_POINTS - 1)))
    units = sorted({*range(low, high + 1, step), *(int(x) for x in (planned, needed) if x)})
    return {f"{CURVE_PREFIX}{n}": power(design, term, effect, n) for n in units}
