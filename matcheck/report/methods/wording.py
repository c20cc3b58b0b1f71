"""English for the note and the paragraph."""

from __future__ import annotations

from collections.abc import Sequence


def join_list(items: Sequence[str]) -> str:
    """``a``, ``a and b``, ``a, b, and c`` (APA 7 uses the serial comma; docs/references.md §11)."""
    if len(items) <= 2:
        return " and ".join(items)
    return ", ".join(items[:-1]) + ", and " + items[-1]
