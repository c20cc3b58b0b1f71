"""Write a report to a file: never over an input, always atomically."""

from __future__ import annotations

import os
import tempfile
from collections.abc import Sequence
from pathlib import Path

from matcheck.errors import UsageError


def write_output(output: Path, text: str, inputs: Sequence[Path]) -> None:
    """Write ``text`` to ``output`` via a temporary file and a rename.

    Refuses when ``output`` is one of the inputs (also through a link) or a directory, so a
    report can never replace a lesson.
    """
    target = output.resolve()
    for path in inputs:
        if path.exists() and (
            path.resolve() == target or (output.exists() and output.samefile(path))
        ):
            raise UsageError(f"--output {output} is one of the input files; choose another path")
    if output.is_dir():
        raise UsageError(f"--output {output} is a directory")
    if not target.parent.is_dir():
        raise UsageError(f"--output {output}: the folder {target.parent} does not exist")
    handle, temporary = tempfile.mkstemp(prefix=".matcheck-", suffix=".tmp", dir=target.parent)
    try:
        with os.fdopen(handle, "w", encoding="utf-8") as stream:
            stream.write(text)
        os.replace(temporary, target)
    except BaseException:
        if os.path.exists(temporary):
            os.unlink(temporary)
        raise
