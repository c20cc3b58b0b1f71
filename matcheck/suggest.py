"""Did-you-mean suggestions for names the user typed (measures, groups, options' values)."""

from __future__ import annotations

import difflib
from collections.abc import Iterable


def closest(name: str, known: Iterable[str], *, most: int = 3) -> str:
    """``" (did you mean a, b?)"`` for the nearest known names, or ``""`` when none is near."""
    matches = difflib.get_close_matches(name, list(dict.fromkeys(known)), n=most, cutoff=0.6)
    return f" (did you mean {', '.join(matches)}?)" if matches else ""
