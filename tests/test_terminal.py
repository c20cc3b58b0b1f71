"""The terminal report: every version named in full at 80 and 160 columns, content counts
that say what they count, paths of a folder's studies kept apart, and a progress bar only on
a terminal and only for a long run."""

from __future__ import annotations

import io
import re
import time
from pathlib import Path

import pytest
from rich.console import Console

import matcheck
from matcheck.findings import Report, StudyResult
from matcheck.report.columns import column_layout, shown_paths, wrap_name
from matcheck.report.studies import render_summary
from matcheck.report.table import render_table

ROOT = Path(__file__).resolve().parent.parent
DEMO = ROOT / "fixtures" / "demo"
PAIR = [DEMO / "text-only.md", DEMO / "diagrams-confounded.docx"]


@pytest.fixture(scope="module")
def study() -> Report:
    result = matcheck.check(DEMO / "study.toml")
    assert isinstance(result, matcheck.Result)
    return result.report


def _render(report: Report, width: int) -> str:
    console = Console(width=width, record=True, file=io.StringIO(), color_system=None)
    render_table(report, console)
    return console.export_text()


def _headers(text: str) -> list[list[str]]:
    """The value-column headers of each contrast's table, each rebuilt from its lines:
    right-aligned headers end in the same column on every line of the header."""
    tables = []
    lines = text.splitlines()
    for index, line in enumerate(lines):
        if not re.match(r"^ ─{20,}", line):
            continue
        block = []
        back = index - 1
        while back >= 0 and lines[back].strip():
            block.insert(0, lines[back])
            back -= 1
        if not block or "Verdict" not in block[-1]:
            continue  # another table (the study's data)
        columns: dict[int, str] = {}
        for header_line in block:
            for token in re.finditer(r"\S+(?: \S+)*", header_line):
                columns[token.end()] = columns.get(token.end(), "") + token.group()
        tables.append(list(columns.values()))
    return tables


@pytest.mark.parametrize("width", [80, 160])
def test_every_version_is_named_in_full(study: Report, width: int) -> None:
    text = _render(study, width)
    tables = _headers(text)
    assert len(tables) == len(study.pairs())
    for pairing, headers in zip(study.pairs(), tables, strict=True):
        assert pairing.reference in headers and pairing.condition in headers, headers
    assert "diagrams-…" not in text
    assert max(len(line) for line in text.splitlines()) <= width


@pytest.mark.parametrize("width", [80, 160])
def test_long_and_similar_names_stay_distinct(width: int) -> None:
    names = ["heat-pump-lesson-with-diagrams-version-a", "heat-pump-lesson-with-diagrams-version-b"]
    report = matcheck.compare(PAIR, names=names).report
    (headers,) = _headers(_render(report, width))
    assert set(names) <= set(headers)


def test_content_counts_say_what_they_count(study: Report) -> None:
    text = " ".join(_render(study, 160).split())
    # The demo cuts one passage from diagrams-bold (fixtures/README.md).
    assert "passages removed: 0 in text-bold, 1 in diagrams-bold" in text
    assert re.search(r"passages_removed\s+0\s+1\s+1\s+exact", text)


def test_names_wrap_only_at_separators_and_lose_nothing() -> None:
    assert wrap_name("diagrams-plain", 9) == "diagrams-\nplain"
    assert wrap_name("text_bold.v2", 6) == "text_\nbold.\nv2"
    assert wrap_name("abcdefghij", 4) == "abcd\nefgh\nij"
    layout = column_layout(100, ["words"], ["text-bold", "diagrams-plain"], [("1,059", "1,000")])
    assert layout.headers == ("text-bold", "diagrams-plain")  # room enough: one line
    narrow = column_layout(80, [" ↳ automated_readability"], ["text-bold", "diagrams-plain"], [])
    assert narrow.headers == ("text-\nbold", "diagrams-\nplain")
    # Narrower still: the pieces break too, down to the numbers' width; nothing is lost.
    tight = column_layout(70, ["words"], ["text-bold", "diagrams-plain"], [("1,059", "1,000")])
    assert [h.replace("\n", "") for h in tight.headers] == ["text-bold", "diagrams-plain"]


def test_folder_summary_keeps_study_paths_apart() -> None:
    base = "/research/a-long-folder-of-bicycle-repair-studies/term-2"
    paths = [f"{base}/group-a/study.toml", f"{base}/group-b/study.toml"]
    assert shown_paths(paths) == (base, ["group-a/study.toml", "group-b/study.toml"])
    console = Console(width=80, record=True, file=io.StringIO(), color_system=None)
    render_summary([StudyResult(p, None, "broken") for p in paths], console)
    text = console.export_text()
    assert "group-a/study.toml" in text and "group-b/study.toml" in text


class _Terminal(io.StringIO):
    def isatty(self) -> bool:
        return True


def test_progress_bar_only_on_a_terminal_and_after_the_delay(
    monkeypatch: pytest.MonkeyPatch,
) -> None:
    from matcheck import progress

    quiet = io.StringIO()
    with progress.terminal_steps(3, "Checking", quiet) as steps:
        assert steps is progress.SILENT  # not a terminal: no bar
    short = _Terminal()
    with progress.terminal_steps(3, "Checking", short) as steps:
        steps.step("reading a")
    assert short.getvalue() == ""  # done before the delay: nothing drawn
    monkeypatch.setattr(progress, "DELAY", 0.0)
    long = _Terminal()
    with progress.terminal_steps(3, "Checking", long) as steps:
        steps.step("reading a")
        time.sleep(0.3)
        steps.step("reading b")
        time.sleep(0.3)
    assert "Checking: reading b" in long.getvalue()


def test_measure_names_are_whole_on_a_narrow_terminal(study: Report) -> None:
    # At 80 columns "passages_…" could not tell removed from added (a newcomer's trial): a
    # long measure name breaks after "_" onto another line instead, and loses nothing.
    text = _render(study, 80)
    rows = [line for line in text.splitlines() if re.match(r" (differs|intended|matched) ", line)]
    assert rows and not any("…" in row[:28] for row in rows)
    assert re.search(r"passages_ +\S.*\n +removed", text)
