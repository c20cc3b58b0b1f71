"""Every file this run has read, so that no output can land on one of them.

Readers note each file they open (lessons, Markdown images, post-tests, study files); the
report writer and the GitHub step summary refuse any of them as a destination
(matcheck/output.py). The set lives in the process; in ``check DIR`` each worker sends its
set back with its result and the parent adds it to its own.
"""

from __future__ import annotations

import contextlib
from collections.abc import Iterable
from pathlib import Path

_READ: set[Path] = set()


def note(path: Path) -> None:
    """Remember ``path`` (as given, and resolved through links) as an input of this run."""
    _READ.add(Path(path).absolute())
    with contextlib.suppress(OSError, RuntimeError, ValueError):  # a loop, a NUL byte
        _READ.add(Path(path).resolve())


def note_all(paths: Iterable[Path]) -> None:
    for path in paths:
        note(path)


def read_so_far() -> tuple[Path, ...]:
    return tuple(sorted(_READ))
