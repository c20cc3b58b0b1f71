"""Several formats from one run (``--format html --format json -o report``): one comparison,
each format in its file by the rule of docs/formats.md; one ``--format`` as before."""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from matcheck.cli import main
from matcheck.errors import UsageError
from matcheck.output_names import output_names
from matcheck.report.formatter import Subject
from matcheck.report.registry import get

ROOT = Path(__file__).resolve().parent.parent
STUDY = ROOT / "fixtures" / "demo" / "study.toml"


def _names(subject: Subject, formats: list[str], output: str | None) -> list[str | None]:
    pairs = output_names([get(subject, f) for f in formats], Path(output) if output else None)
    return [str(path) if path else None for _, path in pairs]


def test_the_naming_rule() -> None:
    report, methods = Subject.REPORT, Subject.METHODS
    assert _names(report, ["json"], "out.txt") == ["out.txt"]  # one format: as given
    assert _names(report, ["json"], None) == [None]
    assert _names(report, ["html", "json"], "report") == ["report.html", "report.json"]
    assert _names(report, ["html", "json"], "report.html") == ["report.html", "report.json"]
    assert _names(report, ["html", "json", "html"], "r") == ["r.html", "r.json"]
    assert _names(report, ["table", "github"], "r") == ["r.table.txt", "r.github.txt"]
    assert _names(methods, ["markdown", "docx"], "t.v2") == ["t.v2.md", "t.v2.docx"]
    with pytest.raises(UsageError, match="several formats need --output"):
        _names(report, ["html", "json"], None)


def test_methods_table_in_four_formats_from_one_run(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch, capsys: pytest.CaptureFixture[str]
) -> None:
    import matcheck.api

    calls = []
    check_study = matcheck.api.check_study
    monkeypatch.setattr(
        matcheck.api, "check_study", lambda *a, **k: calls.append(1) or check_study(*a, **k)
    )
    stem = tmp_path / "table"
    formats = ["markdown", "csv", "latex", "docx"]
    assert (
        main(["table", str(STUDY), *(x for f in formats for x in ("-f", f)), "-o", str(stem)]) == 0
    )
    assert len(calls) == 1
    for extension in (".md", ".csv", ".tex", ".docx"):
        assert (tmp_path / f"table{extension}").stat().st_size > 0
    # Each file is what the same format writes alone.
    main(["table", str(STUDY), "-f", "markdown"])
    alone = capsys.readouterr().out
    assert (tmp_path / "table.md").read_text(encoding="utf-8") == alone


def test_check_html_and_json_from_one_run(tmp_path: Path) -> None:
    assert main(["check", str(STUDY), "-f", "html", "-f", "json", "-o", str(tmp_path / "r")]) == 1
    report = json.loads((tmp_path / "r.json").read_text(encoding="utf-8"))
    assert report["summary"]["verdict"] == "differs"
    assert (tmp_path / "r.html").read_text(encoding="utf-8").startswith("<!DOCTYPE html>")


def test_several_formats_without_output_is_a_usage_error(
    capsys: pytest.CaptureFixture[str],
) -> None:
    assert main(["check", str(STUDY), "-f", "html", "-f", "json"]) == 2
    err = capsys.readouterr().err
    assert err.count("\n") == 1 and "--output" in err and "Traceback" not in err
    assert main(["check", str(STUDY), "-f", "html", "-f", "jsno", "-o", "x"]) == 2
    assert "did you mean json" in capsys.readouterr().err
