"""Read a study's files as they were at a Git revision, without touching the working tree.

``git archive REV -- FOLDER`` streams the tracked files of the study's folder at REV into a
temporary directory (nothing is written to the repository, its index or its work tree).
"""

from __future__ import annotations

import io
import subprocess
import tarfile
from pathlib import Path

from matcheck.errors import ConfigError, UsageError


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


def export_folder(study: Path, revision: str, destination: Path) -> Path:
    """Extract the study's folder at ``revision`` under ``destination``; return the study path
    there. Raises :class:`ConfigError` when the study file did not exist at that revision."""
    root = repository_root(study)
    resolved = study.resolve()
    relative_folder = resolved.parent.relative_to(root)
    try:
        _git(["rev-parse", "--verify", "--quiet", f"{revision}^{{commit}}"], root)
    except UsageError:
        raise UsageError(f"--against {revision!r} is not a revision of this repository") from None
    spec = relative_folder.as_posix() or "."
    archive = _git(["archive", "--format=tar", revision, "--", spec], root)
    with tarfile.open(fileobj=io.BytesIO(archive)) as tar:
        tar.extractall(destination, filter="data")
    old_study = destination / resolved.relative_to(root)
    if not old_study.is_file():
        raise ConfigError(f"the study file did not exist at {revision}", path=str(study))
    return old_study
