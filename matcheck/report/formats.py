"""The built-in output formats, in one list (the registry, :mod:`matcheck.report.registry`,
loads it). Each row names a format, what it renders and the function that renders it; the
function's module is imported only when the format is used.
"""

from __future__ import annotations

from matcheck.report.formatter import Formatter, Subject

R, S, P, M = Subject.REPORT, Subject.STUDIES, Subject.PROFILES, Subject.METHODS
_M = "matcheck.report"

BUILTIN = (
    # compare and check: one report
    Formatter("table", R, f"{_M}.table:render_table", "terminal tables", console=True),
    Formatter("json", R, f"{_M}.json_report:render_json", "JSON", extension=".json"),
    Formatter("markdown", R, f"{_M}.markdown:render_markdown", "Markdown", extension=".md"),
    Formatter("github", R, f"{_M}.github:render_github", "GitHub workflow annotations"),
    Formatter("html", R, f"{_M}.html:render_html", "one offline HTML page", extension=".html"),
    # check DIR: every study below a folder
    Formatter("table", S, f"{_M}.studies:render_summary", "one row per study", console=True),
    Formatter("json", S, f"{_M}.studies:render_json", "JSON", extension=".json"),
    Formatter("markdown", S, f"{_M}.studies:render_markdown", "Markdown", extension=".md"),
    Formatter("github", S, f"{_M}.studies:render_github", "GitHub workflow annotations"),
    Formatter("html", S, f"{_M}.html:render_studies_html", "one HTML page", extension=".html"),
    # profile: the measures of each file
    Formatter("table", P, f"{_M}.profile:render_profiles_table", "terminal table", console=True),
    Formatter("json", P, f"{_M}.profile:render_profiles_json", "JSON", extension=".json"),
    # table: the methods-section table
    Formatter("markdown", M, f"{_M}.methods.markdown:render_markdown", "Markdown", extension=".md"),
    Formatter("csv", M, f"{_M}.methods.csv_file:render_csv", "CSV", extension=".csv"),
    Formatter("latex", M, f"{_M}.methods.latex:render_latex", "LaTeX", extension=".tex"),
    Formatter("docx", M, f"{_M}.methods.word:render_docx", "Word", binary=True, extension=".docx"),
    Formatter("text", M, f"{_M}.methods.prose:render_text", "a methods paragraph"),
    # power: sample size, power or sensitivity of a design
    Formatter("text", Subject.POWER, "matcheck.power.render:render_text", "sentences"),
    Formatter(
        "json", Subject.POWER, "matcheck.power.render:render_json", "JSON", extension=".json"
    ),
)
