"""The table as a LaTeX ``table`` float with booktabs rules."""

from __future__ import annotations

from matcheck.report.formatter import RenderOptions
from matcheck.report.methods.model import MethodsTable

# The ten characters LaTeX treats specially, and the non-ASCII signs pdfLaTeX's utf8 input
# does not define (U+2212, U+2265, U+2264) or defines only in text companion fonts.
_LATEX = str.maketrans(
    {
        "\\": r"\textbackslash{}",
        "&": r"\&",
        "%": r"\%",
        "$": r"\$",
        "#": r"\#",
        "_": r"\_",
        "{": r"\{",
        "}": r"\}",
        "~": r"\textasciitilde{}",
        "^": r"\textasciicircum{}",
        "−": "$-$",
        "±": r"$\pm$",
        "≥": r"$\geq$",
        "≤": r"$\leq$",
        "²": r"\textsuperscript{2}",
        "†": r"\textsuperscript{\dag}",
        "‡": r"\textsuperscript{\ddag}",
        "°": r"\textsuperscript{\textdegree}",
        "*": r"\textsuperscript{*}",
        "α": r"$\alpha$",
    }
)


# Past this many columns a table no longer fits the text width at normal size and spacing
# (about 2 cm a column; a judgment call, common practice).
_NORMAL_COLUMNS = 8


def escape_latex(text: str) -> str:
    # Control characters first become visible escapes (report/escape.py), whose backslash
    # the table then escapes: LaTeX cannot typeset them and a terminal must not receive them.
    from matcheck.report.escape import terminal

    return terminal(text).translate(_LATEX)


def render_latex(table: MethodsTable, options: RenderOptions | None = None) -> str:
    """A complete ``table`` float with booktabs rules; LaTeX numbers it (Table 1 here).

    Needs ``\\usepackage{booktabs}`` in the preamble.
    """
    width = len(table.header)
    spec = "@{}l" + "r" * (width - 2) + "l@{}"
    lines = [
        r"\begin{table}[htbp]",
        r"\centering",
        # A column per condition and per contrast: a wide table is set smaller and tighter
        # (inside the float, so the rest of the document is untouched); the Word output
        # turns the page instead (word._PORTRAIT_COLUMNS).
        *((r"\small", r"\setlength{\tabcolsep}{3pt}") if width > _NORMAL_COLUMNS else ()),
        f"% Table {table.number} of the matcheck report; LaTeX numbers floats in document order.",
        rf"\caption{{{escape_latex(table.title)}}}",
        rf"\label{{tab:equivalence-{table.number}}}",
        rf"\begin{{tabular}}{{{spec}}}",
        r"\toprule",
        " & ".join(escape_latex(cell) for cell in table.header) + r" \\",
        r"\midrule",
    ]
    for index, (_, rows) in enumerate(table.groups()):
        if index:
            lines.append(r"\addlinespace")
        label = escape_latex(rows[0].group_label)
        lines.append(rf"\multicolumn{{{width}}}{{@{{}}l}}{{\textit{{{label}}}}} \\")
        for row in rows:
            cells = row.cells
            lines.append(" & ".join(escape_latex(cell) for cell in cells) + r" \\")
    lines += [
        r"\bottomrule",
        r"\end{tabular}",
        r"\par\smallskip",
        r"\begin{minipage}{\linewidth}",
        rf"\footnotesize\textit{{Note.}} {escape_latex(table.note)}\par",
        *(
            rf"\footnotesize\textit{{Accepted.}} {escape_latex(row.sentence)}\par"
            for row in table.accepted
        ),
        r"\end{minipage}",
        r"\end{table}",
    ]
    return "\n".join(lines) + "\n"
