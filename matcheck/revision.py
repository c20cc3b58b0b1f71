"""Read a study's files as they were at a Git revision, without touching the working tree.

``git archive REV -- FOLDER`` streams the tracked files of the study's folder at REV into a
temporary directory (nothing is written to the repository, its index or its work tree). The
archive is read as a stream, member by member, with the same size limit as any lesson file
(``max_file_bytes``) and the ``data`` extraction filter of :mod:`tarfile`: a member that would
land outside the folder, a link pointing out of it or to an absolute path, and a device or
pipe are left out rather than failing the whole run, so they matter only when the study at
that revision names them (then the one-line error says why they are missing).
"""

from __future__ import annotations

import subprocess
import tarfile
from pathlib import Path
from typing import TYPE_CHECKING

from matcheck.errors import ConfigError, UsageError
from matcheck.limits import DEFAULT_LIMITS, ReadLimits

if TYPE_CHECKING:
    from matcheck.study import Study


def _git(args: list[str], cwd: Path) -> bytes:
    try:
        result = subprocess.run(
            ["git", *args], cwd=cwd, capture_output=True, check=False, timeout=120
        )
    except FileNotFoundError:
        raise UsageError("--against needs git, which is not installed") from None
    if result.returncode != 0:
        message = result.stderr.decode("utf-8", "replace").strip().splitlines()
        raise UsageError(f"git {' '.join(args[:2])}: {message[-1] if message else 'failed'}")
    return result.stdout


def repository_root(path: Path) -> Path:
    folder = path if path.is_dir() else path.parent
    try:
        return Path(_git(["rev-parse", "--show-toplevel"], folder.resolve()).decode().strip())
    except UsageError:
        raise ConfigError(
            "--against needs the study to be inside a Git repository", path=str(path)
        ) from None


class _Extractor:
    """The tar filter: keeps what is safe and within the limits, notes what it leaves out."""

    def __init__(self, limits: ReadLimits) -> None:
        self.limits = limits
        self.left_out: dict[str, str] = {}
        self.total = 0

    def __call__(self, member: tarfile.TarInfo, destination: str) -> tarfile.TarInfo | None:
        if member.isfile() and member.size > self.limits.max_file_bytes:
            return self._leave(member, f"is above max_file_bytes ({member.size:,} bytes)")
        if member.isfile() and self.total + member.size > self.limits.max_zip_uncompressed_bytes:
            return self._leave(member, "is beyond max_zip_uncompressed_bytes for the folder")
        try:
            kept = tarfile.data_filter(member, destination)
        except tarfile.FilterError as refused:
            reason = type(refused).__name__.removesuffix("Error")
            words = {
                "AbsoluteLink": "is a link to an absolute path",
                "OutsideDestination": "would be written outside the study's folder",
                "LinkOutsideDestination": "is a link pointing outside the study's folder",
                "SpecialFile": "is not a regular file",
                "AbsolutePath": "has an absolute path",
            }
            return self._leave(member, words.get(reason, "cannot be extracted safely"))
        if kept is not None and kept.isfile():
            self.total += kept.size
        return kept

    def _leave(self, member: tarfile.TarInfo, reason: str) -> tarfile.TarInfo | None:
        self.left_out[member.name] = reason
        return None


def export_folder(
    study: Path, revision: str, destination: Path, limits: ReadLimits = DEFAULT_LIMITS
) -> tuple[Path, dict[str, str]]:
    """Extract the study's folder at ``revision`` under ``destination``; return the study path
    there and the members left out (path in the repository: why). Raises
    :class:`ConfigError` when the study file did not exist at that revision."""
    root = repository_root(study)
    resolved = study.resolve()
    try:
        relative_folder = resolved.parent.relative_to(root)
    except ValueError:
        raise ConfigError(
            f"the study file resolves to {resolved}, outside the repository at {root}",
            path=str(study),
        ) from None
    try:
        _git(["rev-parse", "--verify", "--quiet", f"{revision}^{{commit}}"], root)
    except UsageError:
        raise UsageError(f"--against {revision!r} is not a revision of this repository") from None
    spec = relative_folder.as_posix() or "."
    extractor = _Extractor(limits)
    _extract(["archive", "--format=tar", revision, "--", spec], root, destination, extractor)
    old_study = destination / resolved.relative_to(root)
    if not old_study.is_file():
        raise ConfigError(f"the study file did not exist at {revision}", path=str(study))
    return old_study, extractor.left_out


def _extract(args: list[str], root: Path, destination: Path, extractor: _Extractor) -> None:
    """Stream ``git archive`` into ``destination`` without holding the archive in memory."""
    try:
        process = subprocess.Popen(
            ["git", *args], cwd=root, stdout=subprocess.PIPE, stderr=subprocess.PIPE
        )
    except FileNotFoundError:
        raise UsageError("--against needs git, which is not installed") from None
    assert process.stdout is not None and process.stderr is not None
    try:
        with tarfile.open(fileobj=process.stdout, mode="r|") as tar:
            tar.extractall(destination, filter=extractor)
        while process.stdout.read(65536):  # the archive's trailing padding
            pass
    except BaseException as problem:
        process.kill()
        process.wait()
        if isinstance(problem, tarfile.TarError):
            raise UsageError(f"git archive: the archive cannot be read ({problem})") from None
        raise
    errors = process.stderr.read().decode("utf-8", "replace").strip().splitlines()
    process.wait()
    if process.returncode != 0:
        raise UsageError(f"git archive: {errors[-1] if errors else 'failed'}")


def load_study_at(
    study: Path, revision: str, destination: Path, limits: ReadLimits = DEFAULT_LIMITS
) -> Study:
    """The study as it was at ``revision``, extracted under ``destination``. Errors name the
    study and the revision, never the temporary folder, and say why a file the study names
    was left out of the extraction."""
    from matcheck.study import load_study

    old_path, left_out = export_folder(study, revision, destination, limits)
    try:
        return load_study(old_path, with_data=False, allow_outside=limits.allow_outside_files)
    except ConfigError as problem:
        message = problem.message  # name files as git does (REV:path), not the temporary copy
        for folder in (str(destination.resolve()), str(destination)):
            message = message.replace(folder + "/", f"{revision}:").replace(folder, revision)
        why = [f"{name} {why}" for name, why in left_out.items() if Path(name).name in message]
        if why:
            message += f" (at {revision}: {'; '.join(why)}; left out)"
        raise ConfigError(f"at {revision}: {message}", path=str(study)) from None
