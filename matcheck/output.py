"""Write a report to a file: never over an input, always atomically.

matcheck writes nothing but the report the user names with ``--output`` (reading a lesson
leaves its folder untouched). The report goes to a temporary file beside the target, is
flushed to disk, and is renamed over the target in one step (``os.replace``, atomic on POSIX
and Windows), so a crash or a full disk leaves the old file whole and no partial report.
"""

from __future__ import annotations

import os
import stat
import tempfile
from collections.abc import Sequence
from pathlib import Path

from matcheck.errors import UsageError


def write_output(output: Path, text: str | bytes, inputs: Sequence[Path]) -> None:
    """Write ``text`` (or the bytes of a binary report) to ``output`` via a temporary file
    and a rename.

    Refuses when ``output`` is one of the inputs (also through a symbolic or hard link), a
    directory, or an existing file that is not a regular file (a device, a pipe), so a report
    can never replace a lesson or anything that is not a report.
    """
    target = output.resolve()
    refuse_inputs(output, inputs, "--output")
    if output.is_dir():
        raise UsageError(f"--output {output} is a directory")
    if not target.parent.is_dir():
        raise UsageError(f"--output {output}: the folder {target.parent} does not exist")
    existing = target.stat() if target.exists() else None
    if existing is not None and not stat.S_ISREG(existing.st_mode):
        raise UsageError(f"--output {output} is not a regular file; choose a file path")
    # A replaced report keeps its permissions; a new one gets what the umask allows.
    mode = stat.S_IMODE(existing.st_mode) if existing is not None else 0o666 & ~_umask()
    try:
        handle, temporary = tempfile.mkstemp(prefix=".matcheck-", suffix=".tmp", dir=target.parent)
    except OSError as error:
        raise UsageError(f"--output {output} cannot be written ({error.strerror})") from None
    try:
        data = text if isinstance(text, bytes) else text.encode("utf-8", "surrogateescape")
        with os.fdopen(handle, "wb") as stream:
            stream.write(data)
            stream.flush()
            os.fsync(stream.fileno())
        os.chmod(temporary, mode)
        os.replace(temporary, target)
    except BaseException as error:
        if os.path.exists(temporary):
            os.unlink(temporary)
        if isinstance(error, OSError):
            raise UsageError(f"--output {output} cannot be written ({error.strerror})") from None
        raise


def refuse_inputs(output: Path, inputs: Sequence[Path], what: str) -> None:
    """Refuse ``output`` when it is one of ``inputs``, also through a symbolic or hard link."""
    target = output.resolve()
    for path in inputs:
        if path.exists() and (
            path.resolve() == target or (output.exists() and output.samefile(path))
        ):
            raise UsageError(f"{what} {output} is one of the input files; choose another path")


def append_output(output: Path, text: str, inputs: Sequence[Path]) -> None:
    """Append ``text`` to ``output`` (a CI step summary), never to an input or a non-file."""
    what = "GITHUB_STEP_SUMMARY"
    refuse_inputs(output, inputs, what)
    if output.exists() and not output.is_file():
        raise UsageError(f"{what} {output} is not a regular file")
    try:
        with output.open("a", encoding="utf-8") as stream:
            stream.write(text)
    except OSError as error:
        raise UsageError(f"{what} {output} cannot be written ({error.strerror})") from None


def _umask() -> int:
    # The umask can only be read by setting it; the CLI is single-threaded at this point.
    current = os.umask(0o022)
    os.umask(current)
    return current
