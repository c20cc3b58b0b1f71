"""The ranges of every power input, checked the same way for the CLI and the study file.

:func:`problem` returns the one-line complaint (naming ``label``, the option or key) or
``None``; the caller raises the error of its context (UsageError or ConfigError).
"""

from __future__ import annotations

from collections.abc import Callable

from matcheck.valuetypes import got

# name → (accepts, what it must be)
RULES: dict[str, tuple[Callable[[float], bool], str]] = {
    # Above 5 SD is no effect a study of instruction plans for: almost surely points or a
    # percentage given where d (or f) is meant (Cohen 1988: 0.2 small, 0.5 medium, 0.8 large).
    "effect": (
        lambda v: 0 < v <= 5,
        "an effect size above 0 and at most 5, in standard deviations (d 0.2 small, 0.5 medium, "
        "0.8 large)",
    ),
    "difference": (lambda v: v > 0, "a difference between means above 0"),
    "sd": (lambda v: v > 0, "a standard deviation above 0"),
    "power": (lambda v: 0 < v < 1, "a power between 0 and 1 (both excluded)"),
    "alpha": (lambda v: 0 < v <= 0.5, "an alpha in (0, 0.5]"),
    "pretest_r": (lambda v: 0 <= v < 1, "a correlation in [0, 1)"),
    "icc": (lambda v: 0 <= v < 1, "an intraclass correlation in [0, 1)"),
    "n": (lambda v: v >= 2 and float(v).is_integer(), "a whole number of 2 or more per group"),
    "classes": (lambda v: v >= 2 and float(v).is_integer(), "a whole number of 2 or more classes"),
    "class_size": (lambda v: v >= 2 and float(v).is_integer(), "a whole number of 2 or more"),
    "ratio": (lambda v: 0 < v <= 100, "a ratio of group sizes in (0, 100]"),
    "groups": (lambda v: v >= 2 and float(v).is_integer(), "a whole number of 2 or more groups"),
}


def problem(name: str, value: object, label: str) -> str | None:
    """``None`` if ``value`` is valid for ``name``, else the complaint naming ``label``."""
    accepts, wanted = RULES[name]
    if isinstance(value, bool) or not isinstance(value, int | float):
        return f"{label} must be {wanted}, {got(value)}"
    number = float(value)
    if number != number or not accepts(number):  # NaN fails every rule
        return f"{label} must be {wanted}, not {value:g}"
    return None
