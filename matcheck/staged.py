"""The pre-commit hook's choice: only the studies whose files a commit changes.

A study's files are its study file, every condition's files and its post-test files
(``conditions[].files``, ``posttest.files``, relative to the study file). pre-commit passes
the staged files it selected (``pass_filenames``, docs/references.md §23); without them, the
hook asks Git for the staged files (``git diff --cached --name-only``), so it also works as a
plain Git hook.
"""

from __future__ import annotations

import tomllib
from collections.abc import Iterable, Sequence
from pathlib import Path


def staged_files(folder: Path) -> list[Path]:
    """The files staged in the Git repository around ``folder`` (added, changed, renamed,
    deleted), as absolute paths."""
    import subprocess

    from matcheck.errors import UsageError

    command = ["git", "rev-parse", "--show-toplevel"]
    try:
        top = subprocess.run(command, cwd=folder, capture_output=True, check=False, timeout=60)
        if top.returncode != 0:
            raise UsageError(f"{folder} is not inside a Git repository: name the files to check")
        root = Path(top.stdout.decode("utf-8", "surrogateescape").strip())
        command = ["git", "diff", "--cached", "--name-only", "-z", "--diff-filter=ACDMR"]
        listed = subprocess.run(command, cwd=root, capture_output=True, check=False, timeout=60)
    except FileNotFoundError:
        raise UsageError("the hook needs git to find the staged files") from None
    if listed.returncode != 0:
        raise UsageError("git could not list the staged files")
    names = listed.stdout.decode("utf-8", "surrogateescape").split("\0")
    return [root / name for name in names if name]


def _strings(value: object) -> list[str]:
    if isinstance(value, str):
        return [value]
    if isinstance(value, list):
        return [v for v in value if isinstance(v, str)]
    return []


def declared_files(study: Path) -> set[Path]:
    """The study file and every file it names (resolved); just the study file when it cannot
    be read, so that a broken study file that is staged is still checked (and reported)."""
    files = {study.resolve()}
    try:
        data = tomllib.loads(study.read_text(encoding="utf-8"))
    except (OSError, UnicodeDecodeError, tomllib.TOMLDecodeError):
        return files
    names: list[str] = []
    conditions = data.get("conditions")
    for condition in conditions if isinstance(conditions, list) else []:
        if isinstance(condition, dict):
            names += _strings(condition.get("files"))
    posttest = data.get("posttest")
    if isinstance(posttest, dict):
        names += _strings(posttest.get("files"))
    return files | {(study.parent / name).resolve() for name in names}


def studies_touched(studies: Iterable[Path], changed: Sequence[Path]) -> list[Path]:
    """The studies any of whose files is among ``changed``, in the order given."""
    wanted = {path.resolve() for path in changed}
    return [study for study in studies if declared_files(study) & wanted]
