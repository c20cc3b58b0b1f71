"""Where each format goes when one run writes several (``--format html --format json -o report``).

The rule (docs/outputs.md, "Several formats from one run"):

- one ``--format``: as always, stdout or the ``--output`` file exactly as given;
- several: ``--output`` is required and names the *stem*: each format writes the stem plus its
  extension (``report`` → ``report.html``, ``report.json``). A stem that already ends with the
  extension of one of the formats asked for loses it (``report.html`` → ``report.html``,
  ``report.json``). Two formats with the same extension (``table`` and ``github``, both
  ``.txt``) each add their name: ``report.table.txt``, ``report.github.txt``.

The same format given twice is written once.
"""

from __future__ import annotations

from collections.abc import Sequence
from pathlib import Path

from matcheck.errors import UsageError
from matcheck.report.formatter import Formatter


def output_names(
    formatters: Sequence[Formatter], output: Path | None
) -> list[tuple[Formatter, Path | None]]:
    """Each formatter (duplicates dropped, order kept) with the file it writes (None: stdout)."""
    unique = list({f.name: f for f in formatters}.values())
    if len(unique) == 1:
        return [(unique[0], output)]
    if output is None:
        names = " ".join(f"--format {f.name}" for f in unique)
        raise UsageError(
            f"{names}: several formats need --output STEM (each writes STEM plus its extension, "
            "e.g. -o report gives report.html and report.json)"
        )
    extensions = [f.extension for f in unique]
    stem = output
    if output.suffix and output.suffix in extensions:
        stem = output.with_suffix("")
    paths: list[tuple[Formatter, Path | None]] = []
    for formatter in unique:
        shared = extensions.count(formatter.extension) > 1
        suffix = f".{formatter.name}{formatter.extension}" if shared else formatter.extension
        paths.append((formatter, stem.with_name(stem.name + suffix)))
    return paths
