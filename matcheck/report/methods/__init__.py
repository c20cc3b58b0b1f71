"""The equivalence table for a methods section: one row per measure, one column per condition
and one per contrast (``contrasts``), and a note naming what no row shows (``mentions``).

:func:`methods_table` (``build``) turns a :class:`~matcheck.findings.Report` into a
:class:`MethodsTable` of formatted strings (``model``); every renderer only lays those strings
out, so Markdown (``markdown``), CSV (``csv_file``), LaTeX (``latex``), Word (``word``) and the
prose paragraph (``prose``) always show the same numbers. Reporting standards for experiments
ask authors to describe each condition's materials and how they were made equivalent
(docs/references.md §11); the Word output follows the table style of APA 7.
"""

from __future__ import annotations

from matcheck.report.methods.build import methods_table
from matcheck.report.methods.contrasts import Contrast
from matcheck.report.methods.csv_file import render_csv
from matcheck.report.methods.latex import escape_latex, render_latex
from matcheck.report.methods.markdown import render_markdown
from matcheck.report.methods.model import (
    NOT_PROOF,
    TITLE,
    VERDICTS,
    AcceptedRow,
    Mention,
    MethodsRow,
    MethodsTable,
    TableMeasure,
    table_measures,
)
from matcheck.report.methods.prose import render_text
from matcheck.report.methods.word import render_docx
from matcheck.report.methods.wording import join_list

__all__ = [
    "NOT_PROOF",
    "TITLE",
    "VERDICTS",
    "AcceptedRow",
    "Contrast",
    "Mention",
    "MethodsRow",
    "MethodsTable",
    "TableMeasure",
    "escape_latex",
    "join_list",
    "methods_table",
    "render_csv",
    "render_docx",
    "render_latex",
    "render_markdown",
    "render_text",
    "table_measures",
]
