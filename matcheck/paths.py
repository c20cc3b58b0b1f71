"""Which files a study may name, and how a study file itself is read.

A study file may come from a stranger's pull request and be checked on a CI machine that holds
secrets, so every path it names (conditions, post-test) must resolve, after following symbolic
links, inside the study's folder, and be a regular file: an absolute path, ``../``, or a link
pointing out is refused with one line unless the user passes ``--allow-outside`` (then every
kind of path is allowed; docs/limits.md states the risk). A FIFO, device or directory is never
opened, as reading it could block forever or never end. The study file itself is read only if
it is a regular file of at most :data:`MAX_STUDY_BYTES`.
"""

from __future__ import annotations

import os
import stat
from pathlib import Path

from matcheck.errors import ConfigError

# A study file is a page of TOML (the demo's is 1 KiB); 1 MiB is a thousand times that and
# bounds the parse of a hostile one (common practice, not a published value).
MAX_STUDY_BYTES = 1024 * 1024


def shown(text: str | Path) -> str:
    """A path or value as it may appear in a one-line message."""
    from matcheck.report.escape import one_line

    return one_line(str(text))


def regular_file(path: Path) -> os.stat_result | str:
    """The file's status after following links, or what is wrong with it."""
    try:
        status = path.stat()
    except FileNotFoundError:
        return "does not exist"
    except (OSError, ValueError, RuntimeError) as error:  # loops, NUL bytes, permissions
        return f"cannot be read ({getattr(error, 'strerror', None) or error})"
    if stat.S_ISDIR(status.st_mode):
        return "is a directory, not a file"
    if not stat.S_ISREG(status.st_mode):
        return "is not a regular file (a pipe, device or socket is never opened)"
    return status


def inside(path: Path, folder: Path) -> bool:
    """Whether ``path`` resolves, links followed, inside ``folder``."""
    try:
        return path.resolve().is_relative_to(folder.resolve())
    except (OSError, ValueError, RuntimeError):
        return False


def study_path(study: Path, written: str, where: str, *, allow_outside: bool) -> Path:
    """The file ``written`` in the study (relative to its folder), checked; raises
    :class:`ConfigError` naming the key when it is outside the folder or not a regular file."""
    base = study.parent
    path = base / written
    if not allow_outside and not inside(path, base):
        raise ConfigError(
            f"{where}: {shown(written)} is outside the study's folder; not read "
            "(only with --allow-outside, for a study you trust)",
            path=shown(study),
        )
    status = regular_file(path)
    if isinstance(status, str):
        raise ConfigError(f"{where}: {shown(path)} {status}", path=shown(study))
    return path


def read_study_text(path: Path) -> str:
    """The text of a study file: a regular file of at most MAX_STUDY_BYTES, UTF-8 with or
    without a byte-order mark."""
    status = regular_file(path)
    if isinstance(status, str):
        raise ConfigError("no such study file" if "exist" in status else status, path=shown(path))
    if status.st_size > MAX_STUDY_BYTES:
        raise ConfigError(
            f"the study file is {status.st_size:,} bytes, above the limit of "
            f"{MAX_STUDY_BYTES:,}; a study file is a page of TOML",
            path=shown(path),
        )
    try:
        with path.open("rb") as stream:
            data = stream.read(MAX_STUDY_BYTES + 1)
    except OSError as error:
        raise ConfigError(f"cannot be read ({error.strerror})", path=shown(path)) from None
    if len(data) > MAX_STUDY_BYTES:  # it grew since the stat
        raise ConfigError(f"the study file is above {MAX_STUDY_BYTES:,} bytes", path=shown(path))
    try:
        text = data.decode("utf-8")
    except UnicodeDecodeError:
        raise ConfigError("the study file is not UTF-8 text", path=shown(path)) from None
    return text.removeprefix("\ufeff")  # a BOM, as Windows editors write


def parse_study_toml(text: str, path: Path) -> dict[str, object]:
    """Parse TOML; every failure (syntax, nesting too deep) is one ConfigError line."""
    import tomllib

    try:
        return tomllib.loads(text)
    except tomllib.TOMLDecodeError as problem:
        hint = (
            "; each condition is a [[conditions]] table (two brackets)"
            if "overwrite" in str(problem).lower() or "'conditions'" in str(problem)
            else ""
        )
        raise ConfigError(
            f"not valid TOML: {shown(str(problem))}{hint}", path=shown(path)
        ) from None
    except RecursionError:  # tomllib recurses once per nested array or inline table
        raise ConfigError("not a study file: nested too deeply", path=shown(path)) from None
