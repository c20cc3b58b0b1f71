"""What ``matcheck power`` prints: a sentence per contrast, or one JSON object."""

from __future__ import annotations

import json
from collections.abc import Sequence
from typing import Any

from matcheck.power.designs import Design, Kind
from matcheck.power.plan import Mode, Result

DESIGN_NAMES = {
    Kind.TWO_GROUP: "two independent groups",
    Kind.K_GROUP: "{k} groups, one-way",
    Kind.FACTORIAL: "{levels} factorial",
}


def describe_design(design: Design) -> str:
    text = DESIGN_NAMES[design.kind].format(
        k=design.cells, levels="×".join(str(level) for level in design.levels)
    )
    if design.kind is Kind.TWO_GROUP and design.ratio != 1:
        text += f" (allocation 1:{design.ratio:g})"
    if design.pretest_r is not None:
        text += f", pre-test as covariate (ρ = {design.pretest_r:g})"
    if design.class_size is not None:
        text += (
            f", classes of {design.class_size} assigned (ICC = {design.icc:g}, "
            f"design effect {design.design_effect:.3g})"
        )
    sided = "one-sided" if design.one_sided else "two-sided"
    return f"{text}; α = {design.alpha:g}, {sided}"


def effect_text(result: Result) -> str:
    effect = result.effect
    if result.design.kind is Kind.TWO_GROUP or (effect.d is not None and result.term.df == 1):
        assert effect.d is not None
        return f"d = {effect.d:.3f} (f = {effect.f:.3f})"
    return f"f = {effect.f:.3f}"


def sample_text(result: Result) -> str:
    n = result.n_by_group
    if result.design.kind is Kind.TWO_GROUP and n[0] != n[1]:
        learners = f"{n[0]} and {n[1]} learners"
    else:
        learners = f"{n[0]} learners per condition"
    total = f"{sum(n)} in all"
    if result.classes_per_group is not None:
        return f"{result.classes_per_group} classes per condition ({learners}, {total})"
    return f"{learners} ({total})"


def sentence(result: Result) -> str:
    label = f"{result.term.name}: " if result.design.kind is Kind.FACTORIAL else ""
    if result.mode is Mode.N:
        return (
            f"{label}{sample_text(result)} for power {result.target:g} to detect "
            f"{effect_text(result)}; power at that sample {result.power:.3f}"
        )
    if result.mode is Mode.POWER:
        return (
            f"{label}power {result.power:.3f} to detect {effect_text(result)} "
            f"with {sample_text(result)}"
        )
    return (
        f"{label}smallest effect detectable with power {result.power:g}: {effect_text(result)}, "
        f"with {sample_text(result)}"
    )


def render_text(results: Sequence[Result], options: object = None) -> str:
    """A sentence per contrast (``options``: the registry's RenderOptions, unused)."""
    text = describe_design(results[0].design)
    lines = [text[0].upper() + text[1:] + "."]
    lines += [f"  {sentence(result)}" for result in results]
    approximations = [
        (result, result.ancova_approximation)
        for result in results
        if result.ancova_approximation is not None
    ]
    for result, approx in approximations:
        which = f" for {result.term.name}" if result.design.kind is Kind.FACTORIAL else ""
        lines.append(
            f"  (Borm et al. 2007 approximation{which}: {approx:.1f} learners per condition)"
        )
    lines.append("Power analysis rests on the assumed effect size: state where it comes from.")
    return "\n".join(lines) + "\n"


def result_dict(result: Result) -> dict[str, Any]:
    design = result.design
    return {
        "term": result.term.name,
        "df": result.term.df,
        "n_per_group": result.n_per_group,
        "n_by_group": list(result.n_by_group),
        "n_total": sum(result.n_by_group),
        "classes_per_group": result.classes_per_group,
        "power": result.power,
        "effect": result.effect.d if design.kind is Kind.TWO_GROUP else result.effect.f,
        "effect_measure": "d" if design.kind is Kind.TWO_GROUP else "f",
        "d": result.effect.d,
        "f": result.effect.f,
        "ancova_approximation_n": result.ancova_approximation,
    }


def governing(results: Sequence[Result]) -> Result:
    """The contrast that sets the study's size: most units, least power, largest effect."""
    mode = results[0].mode
    if mode is Mode.N:
        return max(results, key=lambda r: r.units)
    if mode is Mode.POWER:
        return min(results, key=lambda r: r.power)
    return max(results, key=lambda r: r.effect.f)


def render_json(results: Sequence[Result], options: object = None) -> str:
    design = results[0].design
    top = governing(results)
    data: dict[str, Any] = {
        "mode": top.mode.value,
        "design": design.kind.value,
        "levels": list(design.levels),
        "alpha": design.alpha,
        "alternative": "one-sided" if design.one_sided else "two-sided",
        "target_power": top.target,
        "ratio": design.ratio,
        "pretest_r": design.pretest_r,
        "icc": design.icc,
        "class_size": design.class_size,
        "design_effect": design.design_effect,
        **result_dict(top),
        "contrasts": [result_dict(result) for result in results],
    }
    return json.dumps(data, indent=2, ensure_ascii=False) + "\n"
