"""Escaping of user text (study values, lesson text, file names) for each place it is printed.

Everything matcheck prints may come from a stranger's pull request, so each sink gets the text
in a form it cannot interpret as anything but text. One function per sink:

- :func:`one_line` and :func:`terminal`: control characters (C0, DEL, C1, which includes the
  ESC and CSI that start terminal escape sequences, and OSC) and Unicode line and paragraph
  separators are shown as Python escapes (``\\x1b``), so nothing reaches a terminal as a
  command and an error stays on one line.
- :func:`rich`: the same, then Rich's own markup escaping (``rich.markup.escape``), so ``[/]``
  or ``[bold]`` in a name is shown as written instead of failing or styling the output.
- :func:`workflow_data` / :func:`workflow_property`: GitHub workflow commands. Per GitHub's
  documentation of workflow commands, ``%``, CR and LF are percent-encoded in the message,
  and additionally ``:`` and ``,`` in properties; a newline can therefore never start a
  command of its own.
- :func:`markdown` / :func:`markdown_code`: GitHub-flavoured Markdown. Backslashes and the
  punctuation Markdown interprets inside a line are backslash-escaped (CommonMark §2.4: any
  ASCII punctuation may be escaped), ``&``, ``<`` and ``>`` become entities so raw HTML such as
  ``<img src=…>`` is shown, not rendered, and line breaks become spaces.
- :func:`csv_cell`: a text cell starting with ``=``, ``+``, ``-``, ``@``, tab or CR is prefixed
  with ``'`` so a spreadsheet shows it instead of evaluating it as a formula (OWASP, "CSV
  Injection"; docs/references.md §22). Numbers are left alone.
- :func:`json_text`: JSON keeps every value exactly, but DEL, C1 controls and the Unicode line
  separators are written as ``\\u`` escapes, so the JSON shown in a terminal is inert too.
- :func:`xml_text`: characters XML 1.0 does not allow (most C0 controls, lone surrogates,
  U+FFFE/U+FFFF) are dropped, as a Word document cannot hold them.
"""

from __future__ import annotations

import re

# C0 controls but tab, DEL, C1 controls, and the Unicode line/paragraph separators, which
# terminals and editors treat as line breaks. Newline and CR are handled by the callers'
# choice (one_line replaces them; terminal keeps newline).
_CONTROL = re.compile("[\x00-\x08\x0b-\x1f\x7f-\x9f\u2028\u2029\ud800-\udfff]")
_BREAKS = re.compile("\r\n|[\r\n\u0085\u2028\u2029]")
_XML_INVALID = re.compile("[^\x09\x0a\x0d\x20-\ud7ff\ue000-\ufffd\U00010000-\U0010ffff]")
# Characters Markdown (CommonMark and GitHub's extensions) reads as syntax inside a line:
# emphasis, code, links and images (``!`` and ``(`` only matter after ``[``/``]``), tables,
# strike-through. Line-start syntax (``#``, ``-``, ``>``) cannot occur: text is never put at
# the start of a line.
_MD_SPECIAL = re.compile(r"([\\`*\[\]|~]|(?<![^\W_])_|_(?![^\W_]))")
# (An underscore between two letters or digits, as in words_per_sentence, can never open or
# close emphasis in CommonMark §6.2, so it is left as it is.)
_JSON_RAW = re.compile("[\x7f-\x9f\u2028\u2029]")
_FORMULA_START = ("=", "+", "-", "@", "\t", "\r")


def _visible(match: re.Match[str]) -> str:
    char = match.group()
    return char.encode("unicode_escape", "backslashreplace").decode("ascii")


def terminal(text: str) -> str:
    """``text`` with control characters shown as escapes; newlines and tabs kept."""
    return _CONTROL.sub(_visible, text)


def one_line(text: str) -> str:
    """``text`` as one line: line breaks shown as ``\\n``, other controls as escapes."""
    return terminal(_BREAKS.sub(lambda m: m.group().encode("unicode_escape").decode(), text))


def rich(text: str) -> str:
    """``text`` safe to put into Rich markup (a table cell, a title, a printed line)."""
    from rich.markup import escape

    return escape(terminal(text))


def workflow_data(text: str) -> str:
    """The message part of a GitHub workflow command."""
    return text.replace("%", "%25").replace("\r", "%0D").replace("\n", "%0A")


def workflow_property(text: str) -> str:
    """A property value (``file=``, ``title=``) of a GitHub workflow command."""
    return workflow_data(text).replace(":", "%3A").replace(",", "%2C")


def markdown(text: str) -> str:
    """Inline Markdown text (also fit for a table cell): shown literally, on one line."""
    escaped = _MD_SPECIAL.sub(r"\\\1", terminal(text))
    escaped = escaped.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;")
    return _BREAKS.sub(" ", escaped).replace("\t", " ")


def markdown_code(text: str) -> str:
    """``text`` as an inline code span: a fence longer than any run of backticks inside
    (CommonMark §6.1), line breaks as spaces. Not for table cells (use :func:`markdown`)."""
    flat = _BREAKS.sub(" ", terminal(text))
    longest = max((len(run) for run in re.findall("`+", flat)), default=0)
    fence = "`" * (longest + 1)
    pad = " " if flat.startswith("`") or flat.endswith("`") or not flat.strip() else ""
    return f"{fence}{pad}{flat}{pad}{fence}"


def csv_cell(text: str) -> str:
    """A CSV cell a spreadsheet will not evaluate as a formula."""
    if not text.startswith(_FORMULA_START):
        return text
    try:
        float(text)
    except ValueError:
        return "'" + text
    return text


def json_text(text: str) -> str:
    """JSON from ``json.dumps(..., ensure_ascii=False)`` with DEL, the C1 controls and the
    line/paragraph separators as ``\\u`` escapes. json.dumps escapes only C0; these can
    occur only inside strings, where the escape means the same character (RFC 8259 §7)."""
    return _JSON_RAW.sub(lambda m: f"\\u{ord(m.group()):04x}", text)


def xml_text(text: str) -> str:
    """``text`` without the characters an XML 1.0 document cannot hold."""
    return _XML_INVALID.sub("", text)
