"""The command line: parse options, call :mod:`matcheck.api`, render, choose the exit status.

Nothing here reads, measures or compares. Heavy libraries are imported by the commands, not
at start-up, so ``matcheck --help`` is instant. Exit statuses (one place, matcheck.errors):
0 nothing differs, 1 something differs, 2 bad input or usage, 3 a bug.
"""

from __future__ import annotations

import io
import sys
import traceback
from collections.abc import Callable, Sequence
from enum import StrEnum
from pathlib import Path
from typing import TYPE_CHECKING, Annotated

import typer

from matcheck import __version__
from matcheck.errors import (
    EXIT_BUG,
    EXIT_DIFFERS,
    EXIT_INPUT,
    EXIT_MATCHED,
    MatcheckError,
    UsageError,
)

if TYPE_CHECKING:
    from rich.console import Console

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


class CompareFormat(StrEnum):
    table = "table"
    json = "json"
    markdown = "markdown"


class ProfileFormat(StrEnum):
    table = "table"
    json = "json"


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
        help="Read Markdown images outside the lesson's folder (off: counted, not opened).",
    ),
]
Output = Annotated[
    Path | None, typer.Option("--output", "-o", help="Write the report to this file.")
]


@app.command()
def profile(
    files: Files,
    format: Annotated[ProfileFormat, typer.Option("--format", "-f")] = ProfileFormat.table,
    wpm: Wpm = 238.0,
    output: Output = None,
    allow_outside: AllowOutside = False,
    limit: Limits = None,
) -> int:
    """Measure each lesson file on every dimension."""
    from matcheck.api import profile_files
    from matcheck.settings import Settings

    profiles = profile_files(files, Settings(words_per_minute=wpm), _limits(allow_outside, limit))
    if format is ProfileFormat.json:
        from matcheck.report.profile import render_profiles_json

        emit(render_profiles_json(profiles), output, files)
    else:
        from matcheck.report.profile import render_profiles_table

        emit_rich(lambda console: render_profiles_table(profiles, console), output, files)
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
    format: Annotated[CompareFormat, typer.Option("--format", "-f")] = CompareFormat.table,
    output: Output = None,
    allow_outside: AllowOutside = False,
    limit: Limits = None,
) -> int:
    """Compare lesson versions; report every difference beyond the declared manipulation."""
    from matcheck.api import Version, compare_versions, version_names
    from matcheck.settings import Settings

    name_list = [n.strip() for n in names.split(",")] if names else None
    labels = version_names(files, name_list)
    versions = [Version(label, (path,)) for label, path in zip(labels, files, strict=True)]
    report = compare_versions(
        versions,
        reference=reference,
        manipulated=manipulated or (),
        tolerance_overrides=tolerance or (),
        settings=Settings(words_per_minute=wpm),
        limits=_limits(allow_outside, limit),
    )
    render_report(report, format.value, output, files)
    return EXIT_DIFFERS if report.differs else EXIT_MATCHED


def render_report(
    report: Report,
    format: str,
    output: Path | None,
    inputs: Sequence[Path],
    *,
    show_matched: bool = True,
) -> None:
    """Render a report in ``format`` to stdout or ``output``."""
    if format == "json":
        from matcheck.report.json_report import render_json

        emit(render_json(report), output, inputs)
    elif format == "markdown":
        from matcheck.report.markdown import render_markdown

        emit(render_markdown(report), output, inputs)
    elif format == "github":
        from matcheck.report.github import render_github

        emit(render_github(report), output, inputs)
    else:
        from matcheck.report.table import render_table

        emit_rich(
            lambda console: render_table(report, console, show_matched=show_matched),
            output,
            inputs,
        )


class CheckFormat(StrEnum):
    table = "table"
    json = "json"
    markdown = "markdown"
    github = "github"


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
    format: Annotated[CheckFormat, typer.Option("--format", "-f")] = CheckFormat.table,
    output: Output = None,
    all_rows: Annotated[
        bool, typer.Option("--all", help="List matched measures too in the table.")
    ] = False,
    allow_outside: AllowOutside = False,
    limit: Limits = None,
) -> int:
    """Check a study (or every study below a folder) as its design requires."""
    from matcheck.study import load_study

    if study.is_dir():
        from matcheck.batch import check_folder

        return check_folder(
            study,
            jobs=jobs,
            format=format.value,
            output=output,
            against=against,
            tolerances=tolerance or (),
            limits=_limits(allow_outside, limit),
        )
    loaded = load_study(study)
    if against:
        from matcheck.api import check_against

        report = check_against(
            study, against, extra_tolerances=tolerance or (), limits=_limits(allow_outside, limit)
        )
    else:
        from matcheck.api import check_study

        report = check_study(
            loaded, extra_tolerances=tolerance or (), limits=_limits(allow_outside, limit)
        )
    inputs = [study, *(f for c in loaded.conditions for f in c.files), *loaded.posttest]
    render_report(report, format.value, output, inputs, show_matched=all_rows)
    return EXIT_DIFFERS if report.differs else EXIT_MATCHED


class TableFormat(StrEnum):
    markdown = "markdown"
    csv = "csv"
    latex = "latex"
    docx = "docx"
    text = "text"


@app.command()
def table(
    study: Annotated[Path, typer.Argument(help="A study file (TOML; docs/study-file.md).")],
    format: Annotated[TableFormat, typer.Option("--format", "-f")] = TableFormat.markdown,
    output: Output = None,
) -> int:
    """Write the equivalence table for the methods section (one column per condition)."""
    from matcheck.api import check_study
    from matcheck.report import methods as tables
    from matcheck.study import load_study

    if format is TableFormat.docx and output is None:
        raise UsageError("--format docx writes a Word file: give it with --output FILE.docx")
    loaded = load_study(study)
    report = check_study(loaded)
    built = tables.methods_table(report, coverage_threshold=loaded.coverage_threshold)
    inputs = [study, *(f for c in loaded.conditions for f in c.files), *loaded.posttest]
    if format is TableFormat.docx:
        assert output is not None
        tables.write_docx(built, output, inputs=inputs)
        return EXIT_MATCHED
    render = {
        TableFormat.markdown: tables.render_markdown,
        TableFormat.csv: tables.render_csv,
        TableFormat.latex: tables.render_latex,
        TableFormat.text: tables.render_text,
    }[format]
    emit(render(built), output, inputs)
    return EXIT_MATCHED


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


def emit(text: str, output: Path | None, inputs: Sequence[Path]) -> None:
    if output is None:
        sys.stdout.write(text)
        return
    from matcheck.output import write_output

    write_output(output, text, inputs)


def emit_rich(
    render: Callable[[Console], None], output: Path | None, inputs: Sequence[Path]
) -> None:
    from rich.console import Console

    if output is None:
        render(Console())
        return
    console = Console(record=True, width=140, file=io.StringIO(), color_system=None)
    render(console)
    emit(console.export_text(), output, inputs)


def main(argv: Sequence[str] | None = None) -> int:
    """Run the CLI; returns the exit status instead of raising SystemExit."""
    import click

    args = list(sys.argv[1:] if argv is None else argv)
    _state["debug"] = "--debug" in args
    try:
        result = app(args=args, prog_name="matcheck", standalone_mode=False)
    except click.exceptions.Exit as stop:
        return int(stop.exit_code)
    except click.ClickException as problem:
        problem.show()
        return EXIT_INPUT
    except click.exceptions.Abort:
        sys.stderr.write("matcheck: interrupted\n")
        return EXIT_INPUT
    except MatcheckError as problem:
        if _state["debug"]:
            traceback.print_exc()
        sys.stderr.write(f"matcheck: error: {problem}\n")
        return problem.exit_code
    except Exception as bug:
        if _state["debug"]:
            traceback.print_exc()
        sys.stderr.write(
            f"matcheck: internal error ({type(bug).__name__}: {bug}); this is a bug, please "
            "report it with the input if you can (run with --debug for the traceback)\n"
        )
        return EXIT_BUG
    return int(result) if isinstance(result, int) else EXIT_MATCHED


__all__ = ["app", "main"]
