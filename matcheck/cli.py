"""The command line: parse options, call :mod:`matcheck.api`, render, choose the exit status.

Nothing here reads, measures or compares. Heavy libraries are imported by the commands, not
at start-up, so ``matcheck --help`` is instant. Exit statuses (one place, matcheck.errors):
0 nothing differs, 1 something differs, 2 bad input or usage, 3 a bug, 130 Ctrl-C,
143 SIGTERM.
"""

from __future__ import annotations

import sys
import traceback
from collections.abc import Sequence
from pathlib import Path
from typing import TYPE_CHECKING, Annotated

import typer

from matcheck import __version__
from matcheck.errors import (
    EXIT_BUG,
    EXIT_INPUT,
    EXIT_INTERRUPTED,
    EXIT_MATCHED,
    EXIT_TERMINATED,
    MatcheckError,
    UsageError,
)
from matcheck.findings import exit_status
from matcheck.report.formatter import Formatter, RenderOptions, Subject
from matcheck.report.registry import get, names, render_text

if TYPE_CHECKING:
    import click

    from matcheck.cache import Cache
    from matcheck.findings import Report
    from matcheck.limits import ReadLimits

app = typer.Typer(
    name="matcheck",
    help=(
        "Check that the lesson versions of an experiment differ only in the intended "
        "manipulation. Reads DOCX, PDF, Markdown and text."
    ),
    add_completion=False,
    no_args_is_help=True,
    pretty_exceptions_enable=False,
    rich_markup_mode=None,
)
_state = {"debug": False}


def _version(value: bool) -> None:
    if value:
        typer.echo(f"matcheck {__version__}")
        raise typer.Exit()


@app.callback()
def _root(
    debug: Annotated[bool, typer.Option("--debug", help="Show the traceback of an error.")] = False,
    version: Annotated[
        bool, typer.Option("--version", callback=_version, is_eager=True, help="Show the version.")
    ] = False,
) -> None:
    _state["debug"] = debug


Files = Annotated[list[Path], typer.Argument(help="Lesson files (DOCX, PDF, Markdown, text).")]
Wpm = Annotated[
    float,
    typer.Option("--wpm", help="Reading rate for reading time (default: Brysbaert 2019, 238)."),
]
Limits = Annotated[
    list[str] | None,
    typer.Option(
        "--limit",
        help="Change a resource limit: NAME=VALUE, e.g. max_words=2000000 (docs/limits.md).",
    ),
]
AllowOutside = Annotated[
    bool,
    typer.Option(
        "--allow-outside",
        help="Read files outside the study's or lesson's folder: lessons, post-tests and "
        "Markdown images that lead out (only for studies you trust; docs/limits.md).",
    ),
]
Output = Annotated[
    Path | None, typer.Option("--output", "-o", help="Write the report to this file.")
]


NoCache = Annotated[
    bool,
    typer.Option(
        "--no-cache", help="Read and measure every file again; neither use nor fill the cache."
    ),
]


@app.command()
def profile(
    files: Files,
    format: Annotated[
        str, typer.Option("--format", "-f", help=_formats(Subject.PROFILES))
    ] = "table",
    wpm: Wpm = 238.0,
    output: Output = None,
    allow_outside: AllowOutside = False,
    limit: Limits = None,
    no_cache: NoCache = False,
) -> int:
    """Measure each lesson file on every dimension."""
    from matcheck.api import profile_files
    from matcheck.settings import Settings

    formatter = get(Subject.PROFILES, format)
    profiles = profile_files(
        files, Settings(words_per_minute=wpm), _limits(allow_outside, limit), _cache(no_cache)
    )
    deliver(formatter, profiles, output, files)
    return EXIT_MATCHED


@app.command()
def compare(
    files: Files,
    manipulated: Annotated[
        list[str] | None,
        typer.Option(
            "--manipulated",
            "-m",
            help="A group (length, readability, content, figures, structure, signaling) "
            "or a measure id that the design varies on purpose. Repeatable.",
        ),
    ] = None,
    names: Annotated[
        str | None, typer.Option("--names", help="Comma-separated names for the versions.")
    ] = None,
    reference: Annotated[
        str | None, typer.Option("--reference", help="The version the others are compared with.")
    ] = None,
    tolerance: Annotated[
        list[str] | None,
        typer.Option("--tolerance", "-t", help="MEASURE=VALUE or MEASURE=VALUE%. Repeatable."),
    ] = None,
    wpm: Wpm = 238.0,
    format: Annotated[
        list[str] | None, typer.Option("--format", "-f", help=_formats(Subject.REPORT))
    ] = None,
    output: Output = None,
    allow_outside: AllowOutside = False,
    limit: Limits = None,
    no_cache: NoCache = False,
) -> int:
    """Compare lesson versions; report every difference beyond the declared manipulation."""
    from matcheck.api import Version, compare_versions, version_names
    from matcheck.settings import Settings

    targets = _targets(Subject.REPORT, format, "table", output)
    name_list = [n.strip() for n in names.split(",")] if names else None
    labels = version_names(files, name_list)
    versions = [Version(label, (path,)) for label, path in zip(labels, files, strict=True)]
    from matcheck.progress import terminal_steps

    with terminal_steps(len(versions) + 1, "Comparing") as steps:
        report = compare_versions(
            versions,
            reference=reference,
            manipulated=manipulated or (),
            tolerance_overrides=tolerance or (),
            settings=Settings(words_per_minute=wpm),
            limits=_limits(allow_outside, limit),
            steps=steps,
            cache=_cache(no_cache),
        )
    deliver_all(targets, report, files)
    return exit_status([report])


@app.command()
def check(
    study: Annotated[
        Path,
        typer.Argument(help="A study file (TOML; docs/study-file.md), or a folder of them."),
    ],
    against: Annotated[
        str | None,
        typer.Option("--against", help="Also report what changed since this Git revision."),
    ] = None,
    tolerance: Annotated[
        list[str] | None,
        typer.Option("--tolerance", "-t", help="Override the study's tolerance: MEASURE=VALUE."),
    ] = None,
    jobs: Annotated[
        int | None,
        typer.Option("--jobs", "-j", help="Studies checked at once (default: all cores)."),
    ] = None,
    scheduler: Annotated[
        str | None,
        typer.Option(
            "--scheduler",
            help="Check a folder's studies on this Dask cluster (tcp://HOST:PORT; matcheck[dask]).",
        ),
    ] = None,
    format: Annotated[
        list[str] | None, typer.Option("--format", "-f", help=_formats(Subject.REPORT))
    ] = None,
    output: Output = None,
    all_rows: Annotated[
        bool, typer.Option("--all", help="List matched measures too in the table.")
    ] = False,
    allow_outside: AllowOutside = False,
    limit: Limits = None,
    no_cache: NoCache = False,
) -> int:
    """Check a study (or every study below a folder) as its design requires."""
    from matcheck.study import load_study

    if jobs is not None and jobs < 1:  # a typo is an error even where one study needs no jobs
        raise UsageError(f"--jobs must be at least 1, got {jobs}")
    limits = _limits(allow_outside, limit)
    cache = _cache(no_cache)
    options = RenderOptions(show_matched=all_rows)
    if study.is_dir():
        from functools import partial

        from matcheck.batch import check_folder
        from matcheck.report.studies import prerender

        targets = _targets(Subject.STUDIES, format, "table", output)
        paths, results = check_folder(
            study,
            jobs=jobs,
            against=against,
            tolerances=tolerance or (),
            limits=limits,
            progress=sys.stderr.isatty(),
            cache=cache,
            scheduler=scheduler,
            # Each study's part of the output is rendered by the worker that checked it.
            finish=partial(prerender, formats=tuple(f.name for f, _ in targets)),
        )
        reports = [r.report for r in results if r.report is not None]
        deliver_all(targets, results, paths, options)
        _step_summary([f for f, _ in targets], reports, paths)
        return exit_status(reports, failed=sum(1 for r in results if r.error))
    if scheduler:
        raise UsageError("--scheduler runs the studies of a folder: give a folder, not a file")
    targets = _targets(Subject.REPORT, format, "table", output)
    loaded = load_study(study, allow_outside=allow_outside)
    if against:
        from matcheck.api import check_against

        report = check_against(
            study, against, extra_tolerances=tolerance or (), limits=limits, cache=cache
        )
    else:
        from matcheck.api import check_study
        from matcheck.progress import terminal_steps

        with terminal_steps(len(loaded.conditions) + 1, "Checking") as steps:
            report = check_study(
                loaded, extra_tolerances=tolerance or (), limits=limits, steps=steps, cache=cache
            )
    inputs = [study, *(f for c in loaded.conditions for f in c.files), *loaded.posttest]
    deliver_all(targets, report, inputs, options)
    _step_summary([f for f, _ in targets], [report], inputs)
    return exit_status([report])


@app.command()
def table(
    study: Annotated[Path, typer.Argument(help="A study file (TOML; docs/study-file.md).")],
    format: Annotated[
        list[str] | None, typer.Option("--format", "-f", help=_formats(Subject.METHODS))
    ] = None,
    output: Output = None,
    allow_outside: AllowOutside = False,
    no_cache: NoCache = False,
) -> int:
    """Write the equivalence table for the methods section (one column per condition)."""
    from matcheck.api import check_study
    from matcheck.report.methods import methods_table
    from matcheck.study import load_study

    targets = _targets(Subject.METHODS, format, "markdown", output)
    for formatter, path in targets:
        if formatter.binary and path is None:
            raise UsageError(
                f"--format {formatter.name} writes a binary file: give it with --output FILE"
                f"{formatter.extension}"
            )
    from matcheck.progress import terminal_steps

    loaded = load_study(study, allow_outside=allow_outside)
    with terminal_steps(len(loaded.conditions) + 1, "Checking") as steps:
        report = check_study(
            loaded, limits=_limits(allow_outside, None), steps=steps, cache=_cache(no_cache)
        )
    built = methods_table(report, coverage_threshold=loaded.coverage_threshold)
    inputs = [study, *(f for c in loaded.conditions for f in c.files), *loaded.posttest]
    deliver_all(targets, built, inputs)
    return EXIT_MATCHED


@app.command()
def power(
    effect: Annotated[float | None, typer.Option("--effect", help="Effect size (d, or f).")] = None,
    n: Annotated[int | None, typer.Option("--n", help="Learners per condition.")] = None,
    power_: Annotated[float | None, typer.Option("--power", help="Target power.")] = None,
    alpha: Annotated[float, typer.Option("--alpha", help="Significance level.")] = 0.05,
    one_sided: Annotated[bool, typer.Option("--one-sided", help="A one-sided test.")] = False,
    design: Annotated[
        str | None, typer.Option("--design", help="two-group, k-group or factorial.")
    ] = None,
    groups: Annotated[int | None, typer.Option("--groups", help="k for k-group.")] = None,
    levels: Annotated[str | None, typer.Option("--levels", help="Factorial, e.g. 2x2.")] = None,
    term: Annotated[str | None, typer.Option("--term", help="A, B, AxB...; default all.")] = None,
    effect_measure: Annotated[
        str | None, typer.Option("--effect-measure", help="d or f (default d for two groups).")
    ] = None,
    ratio: Annotated[float | None, typer.Option("--ratio", help="n2/n1, two groups.")] = None,
    pretest_r: Annotated[
        float | None, typer.Option("--pretest-r", help="Pre-test correlation (covariate).")
    ] = None,
    icc: Annotated[
        float | None, typer.Option("--icc", help="ICC when classes are assigned.")
    ] = None,
    class_size: Annotated[
        int | None, typer.Option("--class-size", help="Learners per class.")
    ] = None,
    classes: Annotated[int | None, typer.Option("--classes", help="Classes per condition.")] = None,
    difference: Annotated[
        float | None, typer.Option("--difference", help="Mean difference, in points (with --sd).")
    ] = None,
    sd: Annotated[float | None, typer.Option("--sd", help="Outcome SD, in points.")] = None,
    format: Annotated[str, typer.Option("--format", "-f", help=_formats(Subject.POWER))] = "text",
    output: Output = None,
) -> int:
    """Sample size, power or smallest detectable effect (give two of --n, --effect, --power)."""
    from matcheck.power.command import Request, run

    formatter = get(Subject.POWER, format)
    request = Request(
        design, groups, levels, term, effect, effect_measure, n, classes, power_, alpha,
        one_sided, ratio, pretest_r, icc, class_size, difference, sd,
    )  # fmt: skip
    results = run(request)
    deliver(formatter, results, output, [])
    return EXIT_MATCHED


@app.command()
def accept(
    study: Annotated[Path, typer.Argument(help="The study file (TOML; docs/study-file.md).")],
    finding: Annotated[
        str, typer.Argument(help="The finding's id, as the report's Id column shows it.")
    ],
    reason: Annotated[
        str, typer.Option("--reason", help="Why the difference is acceptable (required).")
    ],
    by: Annotated[str | None, typer.Option("--by", help="Who reviewed and accepted it.")] = None,
    date: Annotated[
        str | None, typer.Option("--date", help="When (YYYY-MM-DD; default: today).")
    ] = None,
    write: Annotated[
        bool,
        typer.Option(
            "--write",
            help="Append the entry to the study file (its existing text is kept byte for "
            "byte). Without it, the entry is only printed.",
        ),
    ] = False,
) -> int:
    """Print the [[accepted]] entry that accepts a reviewed difference (--write appends it)."""
    import datetime

    from matcheck.accepting import append_entry, entry_text, find_finding, overlapping
    from matcheck.api import check_study
    from matcheck.study import comparisons, load_study

    try:
        day = datetime.date.fromisoformat(date) if date else datetime.date.today()
    except ValueError:
        raise UsageError(f"--date {date!r} is not a date like 2026-03-14") from None
    try:
        original = study.read_bytes()
    except OSError:
        original = b""
    loaded = load_study(study)
    report = check_study(loaded)
    chosen = find_finding(report, finding, study)
    entry = entry_text(chosen, reason, by, day.isoformat())
    pair = (chosen.reference, chosen.condition)
    factor = next((p.factor for p in report.pairs() if (p.reference, p.condition) == pair), None)
    for older in overlapping(loaded.accepted, chosen, factor):
        sys.stderr.write(
            f"matcheck: note: {older.label()} accepts up to {older.extent()}; the new entry "
            "supersedes it: remove it from the study file\n"
        )
    if not write:
        sys.stdout.write(entry)
        sys.stderr.write(f"matcheck: add this to {study}, or run again with --write\n")
        return EXIT_MATCHED
    pairs = [(c.reference, c.condition) for c in comparisons(loaded)]
    number = append_entry(study, original, entry, pairs, [f.name for f in loaded.factors])
    sys.stderr.write(f"matcheck: appended accepted #{number} to {study}\n")
    return EXIT_MATCHED


@app.command()
def hook(
    files: Annotated[
        list[Path] | None,
        typer.Argument(help="Staged files (pre-commit passes them; default: ask Git)."),
    ] = None,
    format: Annotated[
        str, typer.Option("--format", "-f", help=_formats(Subject.STUDIES))
    ] = "table",
    jobs: Annotated[
        int | None, typer.Option("--jobs", "-j", help="Studies checked at once.")
    ] = None,
) -> int:
    """For a pre-commit hook: check only the studies whose files are staged, and say which."""
    from matcheck.batch import check_all, find_studies
    from matcheck.staged import staged_files, studies_touched

    formatter = get(Subject.STUDIES, format)
    folder = Path(".")  # pre-commit runs hooks from the repository's root
    changed = list(files) if files else staged_files(folder)
    studies = find_studies(folder)
    chosen = studies_touched(studies, changed)
    if not chosen:
        sys.stderr.write(
            f"matcheck: no staged file belongs to any of the {len(studies)} studies; "
            "nothing to check\n"
        )
        return EXIT_MATCHED
    shown = ", ".join(_shown(path, folder) for path in chosen)
    sys.stderr.write(
        f"matcheck: checking {len(chosen)} of {len(studies)} studies, those with staged "
        f"files: {shown}\n"
    )
    results = check_all(chosen, jobs=jobs)
    reports = [r.report for r in results if r.report is not None]
    if formatter.console:  # on a terminal: what differs in each study, then the summary
        from rich.console import Console

        console = Console()
        for result in results:
            if result.report is not None and result.report.differs:
                console.rule(result.path)
                get(Subject.REPORT, "table").load()(
                    result.report, console, RenderOptions(show_matched=False)
                )
    deliver(formatter, results, None, chosen)
    return exit_status(reports, failed=sum(1 for r in results if r.error))


def _shown(path: Path, folder: Path) -> str:
    try:
        return path.resolve().relative_to(folder.resolve()).as_posix()
    except ValueError:
        return str(path)


@app.command()
def measures() -> int:
    """List every measure with its id, group, unit and default tolerance."""
    from rich.console import Console
    from rich.table import Table

    from matcheck.measures import catalogue

    table = Table(header_style="bold")
    for column in ("Id", "Group", "Unit", "Default tolerance", "What it is"):
        table.add_column(column)
    for spec in catalogue().values():
        table.add_row(
            spec.id,
            spec.group.value,
            spec.unit,
            spec.tolerance.describe(spec.unit) if spec.compared else "—",
            spec.description,
        )
    Console().print(table)
    return EXIT_MATCHED


def _limits(allow_outside: bool, overrides: list[str] | None) -> ReadLimits:
    from dataclasses import replace

    from matcheck.limits import parse_limits

    limits = parse_limits(overrides or [])
    return replace(limits, allow_outside_files=True) if allow_outside else limits


_FORMAT_SUFFIXES = {".json", ".md", ".csv", ".tex", ".docx", ".html"}


def _cache(no_cache: bool) -> Cache | None:
    from matcheck.cache import Cache

    return None if no_cache else Cache.default()


def _formats(subject: Subject) -> str:
    return (
        "Output format: " + ", ".join(names(subject)) + ". Repeatable: several formats from one "
        "run go to --output STEM plus each format's extension."
    )


def _targets(
    subject: Subject, formats: list[str] | None, default: str, output: Path | None
) -> list[tuple[Formatter, Path | None]]:
    """Each format asked for, checked before any work, with the file it goes to."""
    from matcheck.output_names import output_names

    return output_names([get(subject, name) for name in formats or [default]], output)


def deliver_all(
    targets: Sequence[tuple[Formatter, Path | None]],
    subject: object,
    inputs: Sequence[Path],
    options: RenderOptions | None = None,
) -> None:
    """Render ``subject`` once per format, each to its own place."""
    for formatter, output in targets:
        deliver(formatter, subject, output, inputs, options)


def deliver(
    formatter: Formatter,
    subject: object,
    output: Path | None,
    inputs: Sequence[Path],
    options: RenderOptions | None = None,
) -> None:
    """Render ``subject`` and write it to stdout, or to ``output`` (never over an input)."""
    options = options or RenderOptions()
    if output is None and formatter.console:
        from rich.console import Console

        formatter.load()(subject, Console(), options)
        return
    rendered = render_text(formatter, subject, options)
    if output is None:
        if isinstance(rendered, bytes):
            sys.stdout.buffer.write(rendered)
        else:
            sys.stdout.write(rendered)
        return
    from matcheck.output import write_output

    write_output(output, rendered, inputs)
    suffix = output.suffix.lower()
    if suffix in _FORMAT_SUFFIXES and suffix != formatter.extension:
        sys.stderr.write(
            f"matcheck: warning: --output {output} ends in {suffix}, but --format "
            f"{formatter.name} writes {formatter.description}\n"
        )


def _step_summary(
    formatters: Sequence[Formatter], reports: Sequence[Report], inputs: Sequence[Path]
) -> None:
    """On GitHub Actions, the annotations go with a Markdown summary of each report."""
    import os

    summary = os.environ.get("GITHUB_STEP_SUMMARY")
    if all(f.name != "github" for f in formatters) or not summary or not reports:
        return
    from matcheck.output import append_output
    from matcheck.report.markdown import render_markdown, review_digest

    text = "".join(render_markdown(r) + "\n" for r in reports)
    if len(reports) > 1 and any(r.revision for r in reports):
        text = review_digest(reports) + "\n" + text  # new problems of every study first
    append_output(Path(summary), text, inputs)


def main(argv: Sequence[str] | None = None) -> int:
    """Run the CLI; returns the exit status instead of raising SystemExit.

    Every way out is one line on stderr: usage errors (the command-line library's own message)
    and bad input exit 2, Ctrl-C 130, SIGTERM 143, a bug 3.
    """
    from matcheck.interrupt import Terminated, on_sigterm
    from matcheck.report.escape import one_line

    args = list(sys.argv[1:] if argv is None else argv)
    _state["debug"] = "--debug" in args
    on_sigterm()
    try:
        result = app(args=args, prog_name="matcheck", standalone_mode=False)
    except _cli_exits() as stop:
        return int(getattr(stop, "exit_code", EXIT_MATCHED))
    except _cli_errors() as problem:
        # Typer vendors its own copy of click; both raise the same kinds of exception.
        sys.stderr.write(f"matcheck: error: {one_line(problem.format_message())}\n")
        return EXIT_INPUT
    except _cli_aborts():
        sys.stderr.write("matcheck: interrupted\n")
        return EXIT_INTERRUPTED
    except Terminated:
        sys.stderr.write("matcheck: terminated\n")
        return EXIT_TERMINATED
    except MatcheckError as problem:
        if _state["debug"]:
            traceback.print_exc()
        sys.stderr.write(f"matcheck: error: {one_line(str(problem))}\n")
        return problem.exit_code
    except Exception as bug:
        if _state["debug"]:
            traceback.print_exc()
        sys.stderr.write(
            f"matcheck: internal error ({type(bug).__name__}: {one_line(str(bug))}); this is a "
            "bug, please report it with the input if you can (run with --debug for the "
            "traceback)\n"
        )
        return EXIT_BUG
    if result == EXIT_INTERRUPTED:  # Typer turns Ctrl-C into a silent return of 130
        sys.stderr.write("matcheck: interrupted\n")
    return int(result) if isinstance(result, int) else EXIT_MATCHED


def _cli_exits() -> tuple[type[BaseException], ...]:
    import click

    return (click.exceptions.Exit, typer.Exit)


def _cli_errors() -> tuple[type[click.ClickException], type[typer.TyperException]]:
    import click

    return (click.ClickException, typer.TyperException)


def _cli_aborts() -> tuple[type[BaseException], ...]:
    import click

    return (KeyboardInterrupt, click.exceptions.Abort, typer.Abort)


__all__ = ["app", "main"]
