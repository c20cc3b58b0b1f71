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


def write_output(
    output: Path, text: str | bytes, inputs: Sequence[Path], *, update_input: bool = False
) -> None:
    """Write ``text`` (or the bytes of a binary report) to ``output`` via a temporary file
    and a rename.

    Refuses when ``output`` is one of the inputs (also through a symbolic or hard link), a
    directory, or an existing file that is not a regular file (a device, a pipe), so a report
    can never replace a lesson or anything that is not a report.
    """
    target = output.resolve()
    # The one deliberate exception: `accept --write` appends to the study file it was asked
    # to, and only on that explicit request.
    if not update_input:
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
    """Refuse ``output`` when it is a file this run read (given in ``inputs``, or noted by a
    reader in :mod:`matcheck.inputs`: lessons, their images, post-tests, study files), also
    through a symbolic or hard link."""
    from matcheck.inputs import read_so_far

    target = output.resolve()
    exists = output.exists()
    for path in (*inputs, *read_so_far()):
        try:
            same = path.resolve() == target or (exists and path.exists() and output.samefile(path))
        except (OSError, RuntimeError, ValueError):
            continue
        if same:
            raise UsageError(
                f"{what} {_shown(output)} is one of the input files (this run reads "
                f"{_shown(path)}); choose another path"
            )


def _shown(path: Path) -> str:
    from matcheck.report.escape import one_line

    return one_line(str(path))


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
