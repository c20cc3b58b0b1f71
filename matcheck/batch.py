"""Check every study below a folder, in parallel, and summarise.

A study file is any ``*.toml`` below the folder whose top level has ``[[conditions]]``
(``pyproject.toml`` and other TOML files are passed over). Studies are checked in worker
processes (``--jobs``, default: every core); each worker loads the language pipeline once and
reuses it. A study that cannot be read is reported with its one-line error and counts as a
failure (exit status 2 when nothing differs, else 1).
"""

from __future__ import annotations

import os
import sys
import tomllib
from collections.abc import Sequence
from concurrent.futures import ProcessPoolExecutor, as_completed
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING

from matcheck.errors import EXIT_DIFFERS, EXIT_INPUT, EXIT_MATCHED, MatcheckError, UsageError
from matcheck.findings import SCHEMA_VERSION, Report
from matcheck.limits import DEFAULT_LIMITS, ReadLimits

if TYPE_CHECKING:
    from rich.console import Console

SKIPPED_FOLDERS = {".git", ".venv", "venv", "node_modules", "__pycache__", ".tox", "build", "dist"}


@dataclass(frozen=True, slots=True)
class StudyResult:
    path: Path
    report: Report | None
    error: str | None


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
        return StudyResult(path, None, str(problem))
    return StudyResult(path, report, None)


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
    results: dict[Path, StudyResult] = {}
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
    return [results[path] for path in paths]


def check_folder(
    folder: Path,
    *,
    jobs: int | None,
    format: str,
    output: Path | None,
    against: str | None,
    tolerances: Sequence[str],
    limits: ReadLimits = DEFAULT_LIMITS,
) -> int:
    """The ``check DIR`` command: returns the exit status."""
    import json

    from matcheck.cli import emit, emit_rich
    from matcheck.report.json_report import report_dict

    paths = find_studies(folder)
    if not paths:
        raise UsageError(f"{folder}: no study files (TOML with [[conditions]]) below this folder")
    results = check_all(
        paths,
        jobs=jobs,
        against=against,
        tolerances=tolerances,
        progress=sys.stderr.isatty(),
        limits=limits,
    )
    inputs = [*paths]
    if format == "json":
        data = {
            "schema_version": SCHEMA_VERSION,
            "studies": [
                {
                    "path": str(r.path),
                    "error": r.error,
                    "report": report_dict(r.report) if r.report else None,
                }
                for r in results
            ],
        }
        emit(json.dumps(data, indent=2, ensure_ascii=False) + "\n", output, inputs)
    elif format in ("markdown", "github"):
        from matcheck.report.github import render_github
        from matcheck.report.markdown import render_markdown

        render = render_markdown if format == "markdown" else render_github
        parts = []
        for result in results:
            if result.report is not None:
                parts.append(render(result.report))
            elif format == "github":
                parts.append(f"::error file={result.path}::{result.error}\n")
            else:
                parts.append(f"## {result.path}\n\n❗ {result.error}\n")
        emit("\n".join(parts), output, inputs)
    else:
        emit_rich(lambda console: _summary(results, console), output, inputs)
    if any(r.report is not None and r.report.differs for r in results):
        return EXIT_DIFFERS
    if any(r.error for r in results):
        return EXIT_INPUT
    return EXIT_MATCHED


def _summary(results: Sequence[StudyResult], console: Console) -> None:
    from rich.markup import escape
    from rich.table import Table

    from matcheck.findings import Status

    table = Table(title="Studies", title_justify="left", header_style="bold")
    for column in ("Study", "Conditions", "Verdict", "Differ", "Inconclusive", "Problem"):
        table.add_column(column)
    for result in results:
        if result.report is None:
            table.add_row(
                escape(str(result.path)),
                "—",
                "error",
                "—",
                "—",
                escape(result.error or ""),
                style="red",
            )
            continue
        report = result.report
        differ = len(report.root_findings(Status.DIFFERS))
        unclear = len(report.root_findings(Status.INCONCLUSIVE))
        verdict = "differs" if report.differs else "matched"
        table.add_row(
            escape(str(result.path)),
            str(len(report.conditions)),
            verdict,
            str(differ),
            str(unclear),
            "",
            style="bold red" if report.differs else None,
        )
    console.print(table)
    failing = sum(1 for r in results if r.report is not None and r.report.differs)
    errors = sum(1 for r in results if r.error)
    console.print(
        f"{len(results)} studies: {failing} with possible confounds, {errors} unreadable. "
        "Run `matcheck check STUDY.toml` on one for its located findings."
    )
