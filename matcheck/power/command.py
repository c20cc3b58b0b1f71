"""``matcheck power``: the design from the command line, the question, the answer.

Every option is checked here, and a problem is one line naming the option (UsageError).
"""

from __future__ import annotations

import re
from dataclasses import dataclass

from matcheck.errors import UsageError
from matcheck.power import solve
from matcheck.power.designs import (
    Design,
    Kind,
    Measure,
    Term,
    d_from_difference,
    factor_letters,
)
from matcheck.power.plan import Result, analyse
from matcheck.power.rules import problem
from matcheck.power.solve import Effect, Unreachable


@dataclass(frozen=True, slots=True)
class Request:
    """The options of ``matcheck power`` as given (``None``: not given)."""

    design: str | None = None
    groups: int | None = None
    levels: str | None = None
    term: str | None = None
    effect: float | None = None
    effect_measure: str | None = None
    n: int | None = None
    classes: int | None = None
    power: float | None = None
    alpha: float = 0.05
    one_sided: bool = False
    ratio: float | None = None
    pretest_r: float | None = None
    icc: float | None = None
    class_size: int | None = None
    difference: float | None = None
    sd: float | None = None


def _check(name: str, value: object, option: str) -> None:
    if value is not None and (message := problem(name, value, option)):
        raise UsageError(message)


def _levels(text: str) -> tuple[int, ...]:
    if not re.fullmatch(r"\d+([x×*]\d+)+", text.strip()):
        raise UsageError(f"--levels must be levels per factor like 2x2 or 2x3, not {text!r}")
    levels = tuple(int(part) for part in re.split(r"[x×*]", text.strip()))
    if any(level < 2 for level in levels):
        raise UsageError(f"--levels: every factor needs 2 or more levels, not {text!r}")
    return levels


def build_design(request: Request) -> Design:
    """The design the options describe; UsageError naming the option otherwise."""
    for name, value, option in (
        ("alpha", request.alpha, "--alpha"),
        ("groups", request.groups, "--groups"),
        ("ratio", request.ratio, "--ratio"),
        ("pretest_r", request.pretest_r, "--pretest-r"),
        ("icc", request.icc, "--icc"),
        ("class_size", request.class_size, "--class-size"),
    ):
        _check(name, value, option)
    kind = _kind(request)
    if kind is Kind.TWO_GROUP:
        levels: tuple[int, ...] = (2,)
    elif kind is Kind.K_GROUP:
        if request.groups is None:
            raise UsageError("--design k-group needs --groups K (the number of groups)")
        levels = (request.groups,)
    else:
        if request.levels is None:
            raise UsageError("--design factorial needs --levels, e.g. --levels 2x2")
        levels = _levels(request.levels)
    if request.groups is not None and kind is not Kind.K_GROUP:
        raise UsageError("--groups applies to --design k-group")
    if request.levels is not None and kind is not Kind.FACTORIAL:
        raise UsageError("--levels applies to --design factorial")
    if request.ratio is not None and kind is not Kind.TWO_GROUP:
        raise UsageError("--ratio (unequal allocation) applies to --design two-group")
    if (request.icc is None) != (request.class_size is None):
        raise UsageError("--icc and --class-size go together (classes assigned to conditions)")
    return Design(
        kind=kind,
        levels=levels,
        names=factor_letters(len(levels)) if kind is Kind.FACTORIAL else ("groups",),
        alpha=request.alpha,
        one_sided=request.one_sided,
        ratio=request.ratio or 1.0,
        pretest_r=request.pretest_r,
        icc=request.icc,
        class_size=request.class_size,
    )


def _kind(request: Request) -> Kind:
    if request.design is None:
        if request.levels is not None:
            return Kind.FACTORIAL
        return Kind.K_GROUP if request.groups is not None else Kind.TWO_GROUP
    try:
        return Kind(request.design)
    except ValueError:
        names = ", ".join(kind.value for kind in Kind)
        raise UsageError(f"--design must be one of {names}, not {request.design!r}") from None


def _terms(design: Design, request: Request) -> tuple[Term, ...]:
    if request.term is None:
        return design.terms()
    if design.kind is not Kind.FACTORIAL:
        raise UsageError("--term applies to --design factorial")
    try:
        return (design.term(request.term),)
    except KeyError:
        names = ", ".join(term.name for term in design.terms())
        raise UsageError(f"--term must be one of {names}, not {request.term!r}") from None


def run(request: Request) -> list[Result]:
    """Every requested term's answer to the question the options ask."""
    design = build_design(request)
    terms = _terms(design, request)
    request = _from_difference(request)
    _check("effect", request.effect, "--effect")
    _check("power", request.power, "--power")
    _check("n", request.n, "--n")
    _check("classes", request.classes, "--classes")
    if design.clustered and request.n is not None:
        raise UsageError("with --class-size, give the sample as --classes (per condition)")
    if not design.clustered and request.classes is not None:
        raise UsageError("--classes needs --class-size and --icc")
    units = request.classes if design.clustered else request.n
    given = sum(x is not None for x in (units, request.effect, request.power))
    if given != 2:
        sample = "--classes" if design.clustered else "--n"
        raise UsageError(
            f"give exactly two of {sample}, --effect and --power: the third is computed"
        )
    if units is not None and units < solve.units_minimum(design):
        sample = "--classes" if design.clustered else "--n"
        raise UsageError(
            f"{sample} {units} is too few for this design: at least "
            f"{solve.units_minimum(design)} per condition (with --ratio, the second group too)"
        )
    if design.one_sided and any(term.df > 1 for term in terms):
        raise UsageError("--one-sided applies to contrasts with one degree of freedom")
    measure = _measure(design, request.effect_measure)
    results = []
    for term in terms:
        effect = None
        if request.effect is not None:
            try:
                effect = Effect.of(design, term, request.effect, measure)
            except ValueError as problem_text:
                raise UsageError(f"--effect-measure d: {problem_text}") from None
        try:
            results.append(analyse(design, term, units=units, effect=effect, target=request.power))
        except Unreachable as reason:
            where = f"{term.name}: " if design.kind is Kind.FACTORIAL else ""
            raise UsageError(f"{where}{reason}") from None
    return results


def _from_difference(request: Request) -> Request:
    """``--difference`` and ``--sd`` state d in the test's points: d = difference / SD."""
    from dataclasses import replace

    if request.difference is None and request.sd is None:
        return request
    if request.difference is None or request.sd is None:
        raise UsageError("--difference and --sd go together (d = difference / SD)")
    if request.effect is not None:
        raise UsageError("give --effect or --difference with --sd, not both")
    if request.effect_measure not in (None, Measure.D.value):
        raise UsageError("--difference with --sd states d: leave out --effect-measure f")
    _check("sd", request.sd, "--sd")
    _check("difference", request.difference, "--difference")
    effect = d_from_difference(request.difference, request.sd)
    _check("effect", effect, "--difference / --sd")
    return replace(request, effect=effect, effect_measure=Measure.D.value)


def _measure(design: Design, text: str | None) -> Measure:
    if text is None:
        return design.native
    try:
        return Measure(text)
    except ValueError:
        raise UsageError(f"--effect-measure must be d or f, not {text!r}") from None
