"""The table as a paragraph for the methods section: what matched, what differed and how."""

from __future__ import annotations

from collections.abc import Sequence

from matcheck.findings import Status
from matcheck.report.formatter import RenderOptions
from matcheck.report.methods.model import (
    FACTS,
    PASSAGES,
    VERDICTS,
    MethodsRow,
    MethodsTable,
    measure_of,
)
from matcheck.report.methods.notes import mention_sentences
from matcheck.report.methods.wording import join_list
from matcheck.settings import DEFAULT_WPM

_NUMBERS = {2: "two", 3: "three", 4: "four", 5: "five", 6: "six", 7: "seven", 8: "eight"}


def _values(row: MethodsRow, columns: Sequence[str]) -> str:
    measure = measure_of(row.measure)
    known = [(v, n) for v, n in zip(row.values, columns, strict=True) if v != "—"]
    if len(known) < len(columns):  # say whose value is which, and where it is unknown
        missing = [n for v, n in zip(row.values, columns, strict=True) if v == "—"]
        parts = join_list([f"{v}{measure.suffix} for {n}" for v, n in known])
        return f"{parts}; not measurable for {join_list(missing)}"
    return f"{join_list(row.values)}{measure.suffix}"


def _phrase(row: MethodsRow, table: MethodsTable, status: str = "") -> str:
    """The measure, its values, and (with ``status``) the contrasts of that status with
    their differences, so that every number names the comparison it belongs to."""
    measure = measure_of(row.measure)
    where = [
        f"{contrast.header} {difference}"
        for contrast, difference, own in zip(
            table.contrasts, row.differences, row.statuses, strict=True
        )
        if status and own == status
    ]
    if row.measure in (PASSAGES, FACTS):  # counted against a counterpart: the contrasts say
        return f"{measure.phrase} ({join_list(where)})" if where else measure.phrase
    values = _values(row, table.columns)
    return f"{measure.phrase} ({values}{'; ' + join_list(where) if where else ''})"


def render_text(table: MethodsTable, options: RenderOptions | None = None) -> str:
    """A paragraph for the methods section, to adapt: what matched, what the design varied,
    what differed and in which contrast, what was accepted or inconclusive and why.

    The default reading rate is cited as Brysbaert (2019), docs/references.md §3.
    """
    count = len(table.columns)
    versions = f"The {_NUMBERS.get(count, str(count))} versions ({join_list(table.columns)})"
    intended, differs = Status.INTENDED.value, Status.DIFFERS.value
    groups = (
        (
            "were matched on",
            [
                _phrase(r, table)
                for r in table.rows
                if r.verdict == VERDICTS[Status.MATCHED] and intended not in r.statuses
            ],
        ),
        (
            "differed as the design intends in",
            [_phrase(r, table, intended) for r in table.rows if intended in r.statuses],
        ),
        (
            "differed beyond tolerance in",
            [_phrase(r, table, differs) for r in table.rows if differs in r.statuses],
        ),
    )
    clauses = [
        f"{'they ' if index else ''}{verb} {join_list(phrases)}"
        for index, (verb, phrases) in enumerate((v, p) for v, p in groups if p)
    ]
    if not clauses:
        return f"{versions} were not compared on any measure the table shows.\n"
    sentences = [f"{versions} {'; '.join(clauses)}."]
    sentences += mention_sentences(table.mentions, f"Table {table.number}")
    if table.equivalence:
        sentences.append(f"Equivalence tests: {'; '.join(table.equivalence)}.")
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
