"""Tolerances: the defaults come from the measure specs; ``--tolerance`` overrides them.

Most defaults are judgment calls of common practice, and say so in their reason: no published
standard says how many words two lesson versions may differ by. Where a default is derived
(words per sentence from one Flesch–Kincaid grade) the derivation is the reason.
docs/tolerances.md lists them.
"""

from __future__ import annotations

import re
from collections.abc import Iterable, Mapping

from matcheck.errors import UsageError
from matcheck.findings import Tolerance
from matcheck.measures import registry
from matcheck.suggest import closest

# Units that count whole things: a tolerance below one of them is almost surely a share.
_COUNTS = {"words", "sentences", "paragraphs", "characters", "terms", "figures", "captions"}
_OVERRIDE = re.compile(r"^\s*([a-z0-9_]+)\s*=\s*([0-9]*\.?[0-9]+)\s*(%?)\s*$")


def default_tolerances() -> dict[str, Tolerance]:
    """Every compared measure's default tolerance, by id."""
    return {spec.id: spec.tolerance for spec in registry.compared().values()}


def parse_tolerances(
    overrides: Iterable[str], base: Mapping[str, Tolerance] | None = None
) -> dict[str, Tolerance]:
    """Apply ``MEASURE=VALUE`` overrides (``VALUE%`` for relative) to the defaults."""
    tolerances = dict(default_tolerances() if base is None else base)
    known = registry.compared()
    for text in overrides:
        match = _OVERRIDE.match(text)
        if not match:
            raise UsageError(
                f"--tolerance {text!r}: expected MEASURE=VALUE or MEASURE=VALUE% "
                "(e.g. words=3% or flesch_kincaid_grade=0.5)"
            )
        name, number, percent = match.groups()
        if name not in known:
            raise UsageError(
                f"--tolerance {text!r}: unknown measure {name!r}"
                f"{closest(name, known)} (see `matcheck measures`)"
            )
        value = float(number)
        if percent and known[name].from_zero:
            raise UsageError(
                f"--tolerance {text!r}: {name} is judged from zero, so give a number "
                f"(e.g. {name}={'0.2' if name == 'key_term_coverage' else '1'}), not a percentage"
            )
        spec = known[name]
        if not percent and value < 1 and spec.tolerance.relative and spec.unit in _COUNTS:
            raise UsageError(
                f"--tolerance {text!r}: {name} counts {spec.unit}, so {value:g} means less than "
                f"one {spec.unit.rstrip('s')}; for a share write {name}={value * 100:g}%"
            )
        tolerances[name] = (
            Tolerance(relative=value / 100, reason="set by the user")
            if percent
            else Tolerance(absolute=value, reason="set by the user")
        )
    return tolerances
