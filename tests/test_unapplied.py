"""A declared manipulation that changes nothing is said, and an unknown value says why.

By construction: the demo's text-only lesson in Markdown and in DOCX is the same lesson, so a
design that declares figures manipulated between them manipulates nothing; text-only against
diagrams adds three figures (fixtures/demo/expected.json).
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from matcheck.cli import main

DEMO = Path(__file__).resolve().parent.parent / "fixtures" / "demo"


def _report(capsys: pytest.CaptureFixture[str], *files: str) -> dict[str, object]:
    main(["compare", *(str(DEMO / f) for f in files), "-m", "figures", "--format", "json"])
    report: dict[str, object] = json.loads(capsys.readouterr().out)
    return report


def test_a_manipulation_missing_from_the_files_is_a_warning(
    capsys: pytest.CaptureFixture[str],
) -> None:
    report = _report(capsys, "text-only.md", "text-only.docx")
    assert report["warnings"] == [
        "text-only.docx vs text-only.md: nothing that the design manipulates differs "
        "(figures); check that the manipulation is in the files"
    ]


def test_a_real_manipulation_gives_no_such_warning(capsys: pytest.CaptureFixture[str]) -> None:
    report = _report(capsys, "text-only.md", "diagrams.md")
    assert report["warnings"] == []


def test_an_unknown_value_says_which_format_cannot_show_it(
    capsys: pytest.CaptureFixture[str],
) -> None:
    report = _report(capsys, "text-only.md", "text-only.pdf")
    findings = report["findings"]
    assert isinstance(findings, list)
    (underline,) = [f for f in findings if f["dimension"] == "underline_words"]
    assert underline["basis"] == "not_shown"
    assert underline["reason"] == (
        "not measurable in every version (text-only.pdf: pdf cannot show underline)"
    )
