"""The table as a paragraph for the methods section: what matched, what differed and how."""

from __future__ import annotations

from collections.abc import Sequence

from matcheck.report.formatter import RenderOptions
from matcheck.report.methods.model import FACTS, PASSAGES, MethodsRow, MethodsTable, measure_of
from matcheck.report.methods.wording import join_list
from matcheck.settings import DEFAULT_WPM

_NUMBERS = {2: "two", 3: "three", 4: "four", 5: "five", 6: "six", 7: "seven", 8: "eight"}
_CLAUSES = (
    ("yes", "were matched on"),
    ("intended", "differed as intended in"),
    ("no", "differed beyond tolerance in"),
    ("accepted", "differed, as reviewed and accepted by the authors, in"),
    ("n/a", "could not be compared conclusively on"),
)


def _phrase(row: MethodsRow, columns: Sequence[str]) -> str:
    measure = measure_of(row.measure)
    known = [(v, n) for v, n in zip(row.values, columns, strict=True) if v != "—"]
    if row.measure in (PASSAGES, FACTS):  # counted against a counterpart: name whose count
        return f"{measure.phrase} ({join_list([f'{v} for {n}' for v, n in known])})"
    if len(known) < len(columns):  # say whose value is which, and where it is unknown
        missing = [n for v, n in zip(row.values, columns, strict=True) if v == "—"]
        parts = join_list([f"{v}{measure.suffix} for {n}" for v, n in known])
        return f"{measure.phrase} ({parts}; not measurable for {join_list(missing)})"
    return f"{measure.phrase} ({join_list(row.values)}{measure.suffix})"


def render_text(table: MethodsTable, options: RenderOptions | None = None) -> str:
    """A paragraph for the methods section, to adapt: what matched, what differed and how.

    The default reading rate is cited as Brysbaert (2019), docs/references.md §3.
    """
    count = len(table.columns)
    versions = f"The {_NUMBERS.get(count, str(count))} versions ({join_list(table.columns)})"
    clauses: list[str] = []
    for verdict, verb in _CLAUSES:
        phrases = [_phrase(row, table.columns) for row in table.rows if row.verdict == verdict]
        if phrases:
            clauses.append(f"{'they ' if clauses else ''}{verb} {join_list(phrases)}")
    if not clauses:
        return f"{versions} were not compared on any measure the table shows.\n"
    sentences = [f"{versions} {'; '.join(clauses)}."]
    if any(row.measure == "reading_time" for row in table.rows):
        sentences.append(
            f"Reading time was estimated at {table.words_per_minute:g} words per minute"
            + (" (Brysbaert, 2019)." if table.words_per_minute == DEFAULT_WPM else ".")
        )
    if table.accepted:
        reasons = "; ".join(row.sentence.rstrip(".") for row in table.accepted)
        sentences.append(f"Accepted differences and their reasons: {reasons}.")
    sentences.append(f"Table {table.number} gives every measure with its tolerance.")
    if table.data is not None:
        from matcheck.report.study_data import methods_sentence

        sentences.append(methods_sentence(table.data))
    sample = f"\n\n{table.sample_size}" if table.sample_size else ""
    from matcheck.report.escape import terminal

    return terminal(" ".join(s for s in sentences if s) + sample) + "\n"
