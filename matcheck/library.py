"""The Python entry points, ``matcheck.compare`` and ``matcheck.check`` (docs/api.md).

They take what the CLI's options take, call :mod:`matcheck.api`, and return a
:class:`~matcheck.result.Result`. Bad input raises the same
:class:`~matcheck.errors.MatcheckError` subclasses the CLI turns into one line.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from os import PathLike
from pathlib import Path

from matcheck.errors import UsageError
from matcheck.limits import DEFAULT_LIMITS, ReadLimits
from matcheck.result import FolderResult, Result

Tolerances = Mapping[str, str | float] | Sequence[str] | None
PathArg = str | PathLike[str]


def compare(
    paths: Sequence[PathArg],
    *,
    manipulated: Sequence[str] | str = (),
    names: Sequence[str] | None = None,
    reference: str | None = None,
    tolerances: Tolerances = None,
    words_per_minute: float = 238.0,
    limits: ReadLimits = DEFAULT_LIMITS,
) -> Result:
    """Compare lesson versions, like ``matcheck compare``.

    ``paths``: one file per version. ``manipulated``: groups or measure ids varied on purpose.
    ``names``: one name per version (default: the file stems). ``reference``: the version the
    others are compared with (default: the first). ``tolerances``: ``{"words": "10%"}`` or
    ``["words=10%"]``, as ``--tolerance``.
    """
    from matcheck.api import Version, compare_versions, version_names
    from matcheck.settings import Settings

    files = _paths(paths, "paths")
    labels = version_names(files, list(names) if names is not None else None)
    report = compare_versions(
        [Version(label, (path,)) for label, path in zip(labels, files, strict=True)],
        reference=reference,
        manipulated=[manipulated] if isinstance(manipulated, str) else list(manipulated),
        tolerance_overrides=tolerance_strings(tolerances),
        settings=Settings(words_per_minute=words_per_minute),
        limits=limits,
    )
    return Result(report)


def check(
    study_path: PathArg,
    *,
    tolerances: Tolerances = None,
    against: str | None = None,
    limits: ReadLimits = DEFAULT_LIMITS,
    jobs: int | None = 1,
) -> Result | FolderResult:
    """Check a study file as its design requires, like ``matcheck check``; a folder gives a
    :class:`~matcheck.result.FolderResult` with every study below it (``jobs`` worker
    processes; None: every core)."""
    from matcheck.study import load_study

    path = Path(study_path)
    extra = tolerance_strings(tolerances)
    if path.is_dir():
        from matcheck.batch import check_folder

        _, results = check_folder(path, jobs=jobs, against=against, tolerances=extra, limits=limits)
        return FolderResult(tuple(results))
    loaded = load_study(path)
    if against:
        from matcheck.api import check_against

        report = check_against(path, against, extra_tolerances=extra, limits=limits)
    else:
        from matcheck.api import check_study

        report = check_study(loaded, extra_tolerances=extra, limits=limits)
    return Result(report, coverage_threshold=loaded.coverage_threshold)


def tolerance_strings(tolerances: Tolerances) -> list[str]:
    """``{"words": "10%", "figures": 1}`` → ``["words=10%", "figures=1"]``."""
    if tolerances is None:
        return []
    if isinstance(tolerances, str):
        return [tolerances]
    if isinstance(tolerances, Mapping):
        return [f"{measure}={value}" for measure, value in tolerances.items()]
    return [str(each) for each in tolerances]


def _paths(paths: Sequence[PathArg], what: str) -> list[Path]:
    if isinstance(paths, str | PathLike):
        raise UsageError(f"{what} must be a list of lesson files, got one path: {paths}")
    return [Path(each) for each in paths]
