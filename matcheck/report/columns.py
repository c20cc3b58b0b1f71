"""Column widths for the terminal report, so that no name is ever cut short.

A version's name is what tells two columns apart ("diagrams-bold" and "diagrams-plain"), so
it is shown whole: on one line where the terminal is wide enough, else broken after a
hyphen, underscore, dot, slash or space onto more lines of the header. The measure's name is
what the column gets least room for; where it is wider, it too is broken (report/table.py),
onto more lines of its row.
"""

from __future__ import annotations

import re
from collections.abc import Sequence
from dataclasses import dataclass

# Verdict, Diff., Tolerance and Id columns; one space of padding after each of the seven
# columns, a space between columns and one at each edge (rich.box.SIMPLE_HEAD, padding
# (0, 1, 0, 0)).
FIXED = 12 + 8 + 10 + 10
OVERHEAD = 7 + 6 + 2
MEASURE_MIN, MEASURE_MAX = 10, 30
NAME_MIN = 6
BREAK_AFTER = re.compile(r"(?<=[-_./ ])")


@dataclass(frozen=True, slots=True)
class Layout:
    measure: int
    names: tuple[int, ...]
    headers: tuple[str, ...]


def column_layout(
    width: int,
    measures: Sequence[str],
    names: Sequence[str],
    values: Sequence[Sequence[str]],
) -> Layout:
    """Widths of the measure column and of one column per version name, and each name's
    header (with line breaks where it is narrower than the name)."""
    room = max(width - FIXED - OVERHEAD, 0)
    measure = min(max([MEASURE_MIN, *(len(m) for m in measures)]), MEASURE_MAX)
    cells = [max([1, *(len(row[i]) for row in values)]) for i in range(len(names))]
    natural = [max(len(name), cell) for name, cell in zip(names, cells, strict=True)]
    if measure + sum(natural) <= room:
        return Layout(measure, tuple(natural), tuple(names))
    # Break names at their separators: a column is as wide as its longest piece or cell.
    narrow = [
        max(cell, min(len(name), max(6, max(len(p) for p in pieces(name)))))
        for name, cell in zip(names, cells, strict=True)
    ]
    if MEASURE_MIN + sum(narrow) > room:
        # Still too wide: break inside the pieces too, down to the numbers' width.
        narrow = [
            max(cell, min(len(name), NAME_MIN)) for name, cell in zip(names, cells, strict=True)
        ]
    spare = room - measure - sum(narrow)
    if spare < 0:
        measure = max(MEASURE_MIN, room - sum(narrow))
        spare = room - measure - sum(narrow)
    widths = []
    for name, base in zip(names, narrow, strict=True):
        grow = min(max(spare, 0), len(name) - base) if len(name) > base else 0
        spare -= grow
        widths.append(base + grow)
    headers = tuple(wrap_name(name, w) for name, w in zip(names, widths, strict=True))
    return Layout(measure, tuple(widths), headers)


def pieces(name: str) -> list[str]:
    """``diagrams-bold`` → ``["diagrams-", "bold"]``."""
    return [p for p in BREAK_AFTER.split(name) if p]


def wrap_name(name: str, width: int) -> str:
    """``name`` on lines of at most ``width`` characters, broken after separators where it
    can be and inside a piece longer than ``width`` where it must be. No character is lost."""
    if len(name) <= width:
        return name
    lines: list[str] = []
    line = ""
    for piece in pieces(name):
        while len(piece) > width:
            if line:
                lines.append(line)
                line = ""
            lines.append(piece[:width])
            piece = piece[width:]
        if len(line) + len(piece) > width:
            lines.append(line)
            line = piece
        else:
            line += piece
    if line:
        lines.append(line)
    return "\n".join(lines)


def shown_paths(paths: Sequence[str]) -> tuple[str, list[str]]:
    """The folder all ``paths`` share, and each path relative to it (the part that differs)."""
    import os

    if len(paths) < 2:
        return "", list(paths)
    try:
        common = os.path.commonpath(paths)
    except ValueError:  # absolute and relative paths mixed, or different drives
        return "", list(paths)
    if not common or common in paths:
        return "", list(paths)
    return common, [os.path.relpath(path, common) for path in paths]
