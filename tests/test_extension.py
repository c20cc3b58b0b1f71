"""Proof of extension: a new measure and a new output format are one spec (or one function)
plus one registration each, and flow through ``compare`` to every output.

The toy measure counts question marks; it is registered from within the test and removed
afterwards. By construction, the second lesson has two more questions than the first.
"""

from __future__ import annotations

import json
from collections.abc import Iterator
from pathlib import Path

import pytest

from matcheck.cli import main
from matcheck.findings import Group, Report, Tolerance
from matcheck.language.analysis import Analysis
from matcheck.measures import registry
from matcheck.measures.base import Measurement, MeasureSpec
from matcheck.report.formatter import Formatter, RenderOptions, Subject
from matcheck.report.registry import register, unregister
from matcheck.settings import Settings

QUESTIONS = MeasureSpec(
    "question_marks",
    Group.READABILITY,
    "questions",
    "Question marks in the lesson text (a toy measure for this test)",
    Tolerance(absolute=1, reason="one question (test)"),
)


def measure_questions(analysis: Analysis, settings: Settings) -> Iterator[Measurement]:
    text = " ".join(block.text for block in analysis.document.blocks)
    yield Measurement(QUESTIONS, float(text.count("?")))


def render_findings_count(report: Report, options: RenderOptions | None = None) -> str:
    """A toy format: one line per finding, ``dimension status``."""
    return "".join(f"{f.dimension} {f.status.value}\n" for f in report.findings)


TOY_FORMAT = Formatter(
    "lines", Subject.REPORT, f"{__name__}:render_findings_count", "one line per finding"
)

LESSON = (
    "# Pumps\n\nA heat pump moves heat from outside to inside.{extra}\n\nIt uses a compressor.\n"
)


@pytest.fixture()
def lessons(tmp_path: Path) -> tuple[Path, Path]:
    a = tmp_path / "a.md"
    b = tmp_path / "b.md"
    a.write_text(LESSON.format(extra=""), encoding="utf-8")
    b.write_text(LESSON.format(extra=" Why? How?"), encoding="utf-8")
    return a, b


@pytest.fixture()
def toy_measure() -> Iterator[None]:
    registry.register_measures(measure_questions, [QUESTIONS])  # the one registration
    yield
    registry.unregister(measure_questions, [QUESTIONS])


@pytest.fixture()
def toy_format() -> Iterator[None]:
    register(TOY_FORMAT)  # the one registration
    yield
    unregister(Subject.REPORT, "lines")


@pytest.mark.usefixtures("toy_measure")
def test_a_registered_measure_flows_to_json(
    lessons: tuple[Path, Path], capsys: pytest.CaptureFixture[str]
) -> None:
    main(["compare", str(lessons[0]), str(lessons[1]), "--format", "json"])
    report = json.loads(capsys.readouterr().out)
    (finding,) = [f for f in report["findings"] if f["dimension"] == "question_marks"]
    assert finding["values"] == {"a": 0.0, "b": 2.0}
    assert finding["status"] == "differs"  # 2 questions against a tolerance of 1
    assert finding["basis"] == "beyond_tolerance"
    assert finding["group"] == "readability"
    assert finding["tolerance"]["reason"] == "one question (test)"


@pytest.mark.usefixtures("toy_measure")
def test_a_registered_measure_can_be_manipulated_and_overridden(
    lessons: tuple[Path, Path], capsys: pytest.CaptureFixture[str]
) -> None:
    status = main(["compare", *map(str, lessons), "-m", "question_marks", "--format", "json"])
    findings = json.loads(capsys.readouterr().out)["findings"]
    (finding,) = [f for f in findings if f["dimension"] == "question_marks"]
    assert finding["status"] == "intended" and finding["basis"] == "declared"
    main(["compare", *map(str, lessons), "-t", "question_marks=2", "--format", "json"])
    findings = json.loads(capsys.readouterr().out)["findings"]
    (finding,) = [f for f in findings if f["dimension"] == "question_marks"]
    assert finding["status"] == "matched"
    assert status in (0, 1)


def test_the_measure_is_gone_after_unregistering(lessons: tuple[Path, Path]) -> None:
    assert registry.spec("question_marks") is None
    assert main(["compare", *map(str, lessons), "-m", "question_marks"]) == 2


@pytest.mark.usefixtures("toy_measure", "toy_format")
def test_a_registered_format_renders_the_report(
    lessons: tuple[Path, Path], capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    assert main(["compare", *map(str, lessons), "--format", "lines"]) == 1
    lines = capsys.readouterr().out.splitlines()
    assert "question_marks differs" in lines
    assert "paragraphs matched" in lines
    target = tmp_path / "out.txt"
    main(["compare", *map(str, lessons), "--format", "lines", "-o", str(target)])
    assert target.read_text(encoding="utf-8").splitlines() == lines


def test_an_unknown_format_is_a_usage_error(
    lessons: tuple[Path, Path], capsys: pytest.CaptureFixture[str]
) -> None:
    assert main(["compare", *map(str, lessons), "--format", "jsno"]) == 2
    error = capsys.readouterr().err
    assert error.count("\n") == 1
    assert "did you mean json" in error and "choose one of table, json" in error
