"""Check every study below a folder, in parallel.

A study file is any ``*.toml`` below the folder whose top level has ``[[conditions]]``
(``pyproject.toml`` and other TOML files are passed over). Studies are checked in worker
processes (``--jobs``, default: every core); each worker loads the language pipeline once and
reuses it. A study that cannot be read gets its one-line error and the others go on. This
module returns data; rendering and the exit status are the CLI's.
"""

from __future__ import annotations

import os
from collections.abc import Callable, Sequence
from concurrent.futures import as_completed
from pathlib import Path
from typing import TYPE_CHECKING

from matcheck.errors import MatcheckError, UsageError
from matcheck.findings import StudyResult
from matcheck.limits import DEFAULT_LIMITS, ReadLimits

if TYPE_CHECKING:
    from matcheck.cache import Cache

# Per-study work of the caller, done where the study was checked (see check_all).
Finish = Callable[[StudyResult], StudyResult]

SKIPPED_FOLDERS = {".git", ".venv", "venv", "node_modules", "__pycache__", ".tox", "build", "dist"}


def find_studies(folder: Path, *, allow_outside: bool = False) -> list[Path]:
    """Study files below ``folder``, sorted (matcheck/paths.py: regular files only, inside the
    folder after following links unless ``allow_outside``, at most MAX_STUDY_BYTES)."""
    from matcheck.paths import (
        MAX_STUDY_BYTES,
        inside,
        parse_study_toml,
        read_study_text,
        regular_file,
    )

    found = []
    for root, dirs, files in os.walk(folder):
        dirs[:] = sorted(d for d in dirs if d not in SKIPPED_FOLDERS and not d.startswith("."))
        for name in sorted(files):
            if not name.endswith(".toml"):
                continue
            path = Path(root) / name
            status = regular_file(path)  # a FIFO or /dev/zero named *.toml is never opened
            if isinstance(status, str) or not (allow_outside or inside(path, folder)):
                continue
            if status.st_size > MAX_STUDY_BYTES:
                found.append(path)  # reported by load_study, not passed over in silence
                continue
            try:
                text = read_study_text(path)
            except MatcheckError:
                continue
            try:
                data = parse_study_toml(text, path)
            except MatcheckError:
                # A broken study is reported with its error; other broken TOML is not ours.
                if "[[conditions]]" in text:
                    found.append(path)
                continue
            if isinstance(data.get("conditions"), list):
                found.append(path)
    return found


def check_one(
    path: Path,
    against: str | None,
    tolerances: Sequence[str],
    limits: ReadLimits = DEFAULT_LIMITS,
    cache: Cache | None = None,
) -> StudyResult:
    """Check one study; the project's own errors become a one-line result, not an exception."""
    from matcheck.api import check_against, check_study
    from matcheck.study import load_study

    try:
        if against:
            report = check_against(
                path, against, extra_tolerances=tolerances, limits=limits, cache=cache
            )
        else:
            study = load_study(path, allow_outside=limits.allow_outside_files)
            report = check_study(study, extra_tolerances=tolerances, limits=limits, cache=cache)
    except MatcheckError as problem:
        return StudyResult(str(path), None, str(problem))
    return StudyResult(str(path), report, None)


def _stored(
    path: Path, tolerances: Sequence[str], limits: ReadLimits, cache: Cache
) -> StudyResult | None:
    """The study's result when the cache holds its report whole, else ``None`` (also for a
    study that cannot be loaded: its own check reports that)."""
    from matcheck.api import stored_study_report
    from matcheck.study import load_study

    try:
        study = load_study(path, allow_outside=limits.allow_outside_files)
        report = stored_study_report(study, cache, limits=limits, extra_tolerances=tolerances)
    except MatcheckError:
        return None
    return None if report is None else StudyResult(str(path), report, None)


def _check_in_worker(
    path: Path,
    against: str | None,
    tolerances: Sequence[str],
    limits: ReadLimits,
    cache: Cache | None = None,
    finish: Finish | None = None,
) -> tuple[StudyResult, tuple[Path, ...]]:
    """:func:`check_one` in a worker process, with the files the worker read since its last
    result, this study's among them (so the parent can refuse them as outputs;
    matcheck.inputs)."""
    from matcheck.inputs import take_new

    result = check_one(path, against, tolerances, limits, cache)
    return (finish(result) if finish else result), take_new()


def check_remote(
    path: Path,
    *,
    against: str | None,
    tolerances: Sequence[str],
    limits: ReadLimits,
    use_cache: bool,
    finish: Finish | None = None,
) -> tuple[StudyResult, tuple[Path, ...]]:
    """:func:`_check_in_worker` on a cluster's worker, with the cache folder of the worker's
    machine."""
    from matcheck.cache import Cache

    cache = Cache.default() if use_cache else None
    return _check_in_worker(path, against, tolerances, limits, cache, finish)


def warm_up(cache: Cache | None = None) -> None:
    """Import and load what every check needs (tokenizer, lemma and syllable tables, ...),
    taking the tables from ``cache`` when it holds them."""
    import numpy  # noqa: F401

    from matcheck.language.pipeline import lemma, stop_words
    from matcheck.language.syllables import count_syllables
    from matcheck.language.tables import use_store
    from matcheck.language.tokenizer import english
    from matcheck.language.wordlists import dale_chall_familiar

    use_store(cache)
    english().tokens("Warm up.")
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
    cache: Cache | None = None,
    scheduler: str | None = None,
    finish: Finish | None = None,
) -> list[StudyResult]:
    """Check studies with ``jobs`` worker processes (1: in this process), or on the Dask
    cluster at ``scheduler``; keeps path order.

    ``finish`` (picklable) is applied to each result where it was computed: the caller's
    per-study work, such as rendering, then runs in the workers instead of after them.
    """
    if scheduler:
        from functools import partial

        from matcheck.cluster import check_on_cluster
        from matcheck.inputs import note_all

        remote = partial(
            check_remote,
            against=against,
            tolerances=tuple(tolerances),
            limits=limits,
            use_cache=cache is not None,
            finish=finish,
        )
        gathered = check_on_cluster(paths, scheduler, remote)
        for _, read in gathered:
            note_all(read)
        return [result for result, _ in gathered]
    workers = jobs if jobs is not None else (os.cpu_count() or 1)
    if workers < 1:
        raise UsageError(f"--jobs must be at least 1, got {workers}")
    if workers == 1 or len(paths) == 1:
        done = [check_one(path, against, tolerances, limits, cache) for path in paths]
        return [finish(result) for result in done] if finish else done
    results: dict[str, StudyResult] = {}
    if cache is not None and not against:
        # Studies whose reports the cache holds whole are answered here, until the first
        # that it does not: a re-checked folder where little changed then starts no workers
        # (6 studies, all cached: 0.41 s with two workers before, 0.24 s with one).
        for path in paths:
            found = _stored(path, tolerances, limits, cache)
            if found is None:
                break
            results[str(path)] = finish(found) if finish else found
        left = [path for path in paths if str(path) not in results]
        if len(left) <= 1:  # not worth starting workers for
            for path in left:
                result = check_one(path, against, tolerances, limits, cache)
                results[str(path)] = finish(result) if finish else result
            return [results[str(path)] for path in paths]
    else:
        left = list(paths)
    import gc
    import multiprocessing

    context = None
    if "fork" in multiprocessing.get_all_start_methods():
        # Load the language data and libraries once here: forked workers share them instead
        # of each loading or building them (the tables take ~0.35 s to build when the cache
        # does not hold them).
        warm_up(cache)
        # What is loaded now stays for the whole run: out of the collector's sight, forked
        # workers neither traverse it nor copy its pages (the gc.freeze documentation's
        # advice before fork; 7% less processor time on 200 studies).
        gc.freeze()
        context = multiprocessing.get_context("fork")
    from matcheck.inputs import note_all
    from matcheck.workers import worker_pool

    try:
        with worker_pool(min(workers, len(left)), context) as pool:
            if cache is not None:
                from matcheck.shared import read_shared

                # Each version two or more studies share, once, into the cache they read.
                cache.fresh.update(read_shared(pool, left, limits, cache))
            futures = [
                pool.submit(_check_in_worker, path, against, tolerances, limits, cache, finish)
                for path in left
            ]
            if progress:
                from rich.progress import Progress

                with Progress(transient=True) as bar:
                    task = bar.add_task("Checking studies", total=len(futures))
                    for future in as_completed(futures):
                        result, read = future.result()
                        note_all(read)
                        results[result.path] = result
                        bar.advance(task)
            else:
                for future in as_completed(futures):
                    result, read = future.result()
                    note_all(read)
                    results[result.path] = result
    finally:
        gc.unfreeze()  # a caller that goes on (a notebook) collects as before
    return [results[str(path)] for path in paths]


def check_folder(
    folder: Path,
    *,
    jobs: int | None,
    against: str | None,
    tolerances: Sequence[str],
    limits: ReadLimits = DEFAULT_LIMITS,
    progress: bool = False,
    cache: Cache | None = None,
    scheduler: str | None = None,
    finish: Finish | None = None,
) -> tuple[list[Path], list[StudyResult]]:
    """The study files below ``folder`` and the result of checking each."""
    paths = find_studies(folder, allow_outside=limits.allow_outside_files)
    if not paths:
        raise UsageError(f"{folder}: no study files (TOML with [[conditions]]) below this folder")
    results = check_all(
        paths,
        jobs=jobs,
        against=against,
        tolerances=tolerances,
        progress=progress,
        limits=limits,
        cache=cache,
        scheduler=scheduler,
        finish=finish,
    )
    return paths, results
