"""Every file this run has read, so that no output can land on one of them.

Readers note each file they open (lessons, Markdown images, post-tests, study files); the
report writer and the GitHub step summary refuse any of them as a destination
(matcheck/output.py). The set lives in the process; in ``check DIR`` each worker sends back,
with each result, the files it noted since its last result (:func:`take_new`), and the parent
adds them to its own. (Sending the whole set each time made a folder of studies cost
time quadratic in its size: 1.4 s of 10 for 200 studies.)
"""

from __future__ import annotations

import contextlib
from collections.abc import Iterable
from itertools import islice
from pathlib import Path

# An ordered set: the paths in the order they were first noted.
_READ: dict[Path, None] = {}


def note(path: Path) -> None:
    """Remember ``path`` (as given, and resolved through links) as an input of this run."""
    absolute = Path(path).absolute()
    if absolute in _READ:
        return  # noted before, with its resolved form
    _READ[absolute] = None
    with contextlib.suppress(OSError, RuntimeError, ValueError):  # a loop, a NUL byte
        _READ[Path(path).resolve()] = None


def note_all(paths: Iterable[Path]) -> None:
    for path in paths:
        note(path)


def read_so_far() -> tuple[Path, ...]:
    return tuple(sorted(_READ))


_taken = 0


def take_new() -> tuple[Path, ...]:
    """The paths first noted since the last call (all of them at the first)."""
    global _taken
    new = tuple(islice(_READ, _taken, None))
    _taken = len(_READ)
    return new


def forget() -> None:
    """Start over, as a new run would (tests)."""
    global _taken
    _READ.clear()
    _taken = 0
