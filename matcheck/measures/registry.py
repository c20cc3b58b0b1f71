"""The one catalogue of measures: every spec by id, and the functions that measure them.

A new measure is a module with its specs and one function, registered with
:func:`register_measures` below (see DEVELOPERS.md). Everything else — default tolerances,
what follows from what, labels, decimals, what a format cannot show — derives from the specs.
"""

from __future__ import annotations

from collections.abc import Iterable, Iterator

from matcheck.findings import Group
from matcheck.measures.base import MeasureFunction, MeasureSpec

_SPECS: dict[str, MeasureSpec] = {}
MEASURE_FUNCTIONS: list[MeasureFunction] = []


def register_specs(specs: Iterable[MeasureSpec]) -> None:
    """Declare specs; an id declared twice with another meaning is a programming error."""
    for spec in specs:
        known = _SPECS.get(spec.id)
        if known is not None and known != spec:
            raise ValueError(f"measure id {spec.id!r} is declared twice, differently")
        _SPECS[spec.id] = spec


def register_measures(function: MeasureFunction, specs: Iterable[MeasureSpec]) -> None:
    """Add a measure function and the specs of what it yields."""
    register_specs(specs)
    if function not in MEASURE_FUNCTIONS:
        MEASURE_FUNCTIONS.append(function)


def unregister(function: MeasureFunction, specs: Iterable[MeasureSpec]) -> None:
    """Undo :func:`register_measures` (for tests that add a measure of their own)."""
    if function in MEASURE_FUNCTIONS:
        MEASURE_FUNCTIONS.remove(function)
    for spec in specs:
        _SPECS.pop(spec.id, None)


def spec(measure_id: str) -> MeasureSpec | None:
    return _SPECS.get(measure_id)


def specs() -> Iterator[MeasureSpec]:
    """Every spec, in group order and then in declaration order."""
    order = list(Group)
    yield from sorted(_SPECS.values(), key=lambda s: order.index(s.group))


def compared() -> dict[str, MeasureSpec]:
    """Every dimension a comparison can report on, by id."""
    return {s.id: s for s in specs() if s.compared}


def implied_by(measure_id: str) -> tuple[str, ...]:
    """The measures intended too when ``measure_id`` is manipulated."""
    return tuple(s.id for s in specs() if s.implied_by == measure_id)
