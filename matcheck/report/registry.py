"""One registry of output formats: every format of every command is one entry here.

A format renders one *subject*: a comparison or study :class:`~matcheck.findings.Report`
(``compare``, ``check``), the results of a folder of studies (``check DIR``), the profiles of
lesson files (``profile``) or the methods-section table (``table``). Each entry names the
function that renders it as ``"module:function"``, imported only when that format is used, so
``matcheck --help`` stays instant. A function takes the subject and :class:`RenderOptions` and
returns text, or bytes for a binary format; a *console* format prints on a Rich console
instead (in colour on a terminal) and is recorded as plain text for a file.

A new output format is one module with its function plus one entry: a line in
:data:`matcheck.report.formats.BUILTIN`, or a :func:`register` call from a plug-in or a test.
"""

from __future__ import annotations

from typing import Any

from matcheck.errors import UsageError
from matcheck.report.formatter import Formatter, RenderOptions, Subject
from matcheck.suggest import closest

FORMATTERS: dict[tuple[Subject, str], Formatter] = {}
_loaded = False


def register(formatter: Formatter) -> Formatter:
    _builtins()
    FORMATTERS[formatter.subject, formatter.name] = formatter
    return formatter


def unregister(subject: Subject, name: str) -> None:
    FORMATTERS.pop((subject, name), None)


def names(subject: Subject) -> list[str]:
    _builtins()
    return [name for (each, name) in FORMATTERS if each is subject]


def get(subject: Subject, name: str) -> Formatter:
    """The format ``name`` of ``subject``; a usage error naming the choices otherwise."""
    _builtins()
    formatter = FORMATTERS.get((subject, name))
    if formatter is None:
        choices = names(subject)
        raise UsageError(
            f"--format {name!r} is not a format of this command{closest(name, choices)}; "
            f"choose one of {', '.join(choices)}"
        )
    return formatter


def render_text(formatter: Formatter, subject: Any, options: RenderOptions) -> str | bytes:
    """Render to text (or bytes); a console format is recorded without colour."""
    function = formatter.load()
    if not formatter.console:
        result: str | bytes = function(subject, options)
        return result
    import io

    from rich.console import Console

    console = Console(record=True, width=options.width, file=io.StringIO(), color_system=None)
    function(subject, console, options)
    return console.export_text()


def _builtins() -> None:
    global _loaded
    if _loaded:
        return
    from matcheck.report.formats import BUILTIN

    for formatter in BUILTIN:
        FORMATTERS.setdefault((formatter.subject, formatter.name), formatter)
    _loaded = True
