"""Check every study below a folder, in parallel.

A study file is any ``*.toml`` below the folder whose top level has ``[[conditions]]``
(``pyproject.toml`` and other TOML files are passed over). Studies are checked in worker
processes (``--jobs``, default: every core); each worker loads the language pipeline once and
reuses it. A study that cannot be read gets its one-line error and the others go on. This
module returns data; rendering and the exit status are the CLI's.
"""

from __future__ import annotations

import os
import tomllib
from collections.abc import Sequence
from concurrent.futures import ProcessPoolExecutor, as_completed
from pathlib import Path

from matcheck.errors import MatcheckError, UsageError
from matcheck.findings import StudyResult
from matcheck.limits import DEFAULT_LIMITS, ReadLimits

SKIPPED_FOLDERS = {".git", ".venv", "venv", "node_modules", "__pycache__", ".tox", "build", "dist"}


def find_studies(folder: Path) -> list[Path]:
    """Study files below ``folder``, sorted."""
    found = []
    for root, dirs, files in os.walk(folder):
        dirs[:] = sorted(d for d in dirs if d not in SKIPPED_FOLDERS and not d.startswith("."))
        for name in sorted(files):
            if not name.endswith(".toml"):
                continue
            path = Path(root) / name
            try:
                data = tomllib.loads(path.read_text(encoding="utf-8"))
            except (OSError, UnicodeDecodeError, tomllib.TOMLDecodeError):
                continue
            if isinstance(data.get("conditions"), list):
                found.append(path)
    return found


def check_one(
    path: Path,
    against: str | None,
    tolerances: Sequence[str],
    limits: ReadLimits = DEFAULT_LIMITS,
) -> StudyResult:
    """Check one study; the project's own errors become a one-line result, not an exception."""
    from matcheck.api import check_against, check_study
    from matcheck.study import load_study

    try:
        if against:
            report = check_against(path, against, extra_tolerances=tolerances, limits=limits)
        else:
            report = check_study(load_study(path), extra_tolerances=tolerances, limits=limits)
    except MatcheckError as problem:
        return StudyResult(str(path), None, str(problem))
    return StudyResult(str(path), report, None)


def warm_up() -> None:
    """Import and load what every check needs (pipeline, lemma and syllable tables, ...)."""
    import scipy.special  # noqa: F401
    import sklearn.feature_extraction.text  # noqa: F401

    from matcheck.language.pipeline import lemma, nlp, stop_words
    from matcheck.language.syllables import count_syllables
    from matcheck.language.wordlists import dale_chall_familiar

    nlp()("Warm up.")
    lemma("warming")
    stop_words()
    count_syllables("warming")
    dale_chall_familiar()


def check_all(
    paths: Sequence[Path],
    *,
    jobs: int | None,
    against: str | None = None,
    tolerances: Sequence[str] = (),
    progress: bool = False,
    limits: ReadLimits = DEFAULT_LIMITS,
) -> list[StudyResult]:
    """Check studies with ``jobs`` worker processes (1: in this process); keeps path order."""
    workers = jobs if jobs is not None else (os.cpu_count() or 1)
    if workers < 1:
        raise UsageError(f"--jobs must be at least 1, got {workers}")
    if workers == 1 or len(paths) == 1:
        return [check_one(path, against, tolerances, limits) for path in paths]
    results: dict[str, StudyResult] = {}
    import multiprocessing

    context = None
    if "fork" in multiprocessing.get_all_start_methods():
        # Load the language data and libraries once here: forked workers share them instead
        # of each paying the second or so it takes.
        warm_up()
        context = multiprocessing.get_context("fork")
    with ProcessPoolExecutor(max_workers=min(workers, len(paths)), mp_context=context) as pool:
        futures = [pool.submit(check_one, path, against, tolerances, limits) for path in paths]
        if progress:
            from rich.progress import Progress

            with Progress(transient=True) as bar:
                task = bar.add_task("Checking studies", total=len(futures))
                for future in as_completed(futures):
                    result = future.result()
                    results[result.path] = result
                    bar.advance(task)
        else:
            for future in as_completed(futures):
                result = future.result()
                results[result.path] = result
    return [results[str(path)] for path in paths]


def check_folder(
    folder: Path,
    *,
    jobs: int | None,
    against: str | None,
    tolerances: Sequence[str],
    limits: ReadLimits = DEFAULT_LIMITS,
    progress: bool = False,
) -> tuple[list[Path], list[StudyResult]]:
    """The study files below ``folder`` and the result of checking each."""
    paths = find_studies(folder)
    if not paths:
        raise UsageError(f"{folder}: no study files (TOML with [[conditions]]) below this folder")
    results = check_all(
        paths, jobs=jobs, against=against, tolerances=tolerances, progress=progress, limits=limits
    )
    return paths, results
