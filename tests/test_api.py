"""The Python API (docs/api.md): ``matcheck.compare`` and ``matcheck.check`` return the same
findings as the CLI's JSON, frames with the documented columns, every format without
recomputing, and raise the CLI's documented errors on bad input."""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path
from typing import Any

import pytest

import matcheck
from matcheck.cli import main
from matcheck.errors import ConfigError, InputError, UsageError
from matcheck.findings import Finding, Status
from matcheck.report.formatter import Subject
from matcheck.report.registry import names
from matcheck.result import FINDING_COLUMNS, MEASURE_COLUMNS, FolderResult, Result

ROOT = Path(__file__).resolve().parent.parent
DEMO = ROOT / "fixtures" / "demo"
STUDY = DEMO / "study.toml"
PAIR = [DEMO / "text-only.md", DEMO / "diagrams-confounded.docx"]


def _cli_json(capsys: pytest.CaptureFixture[str], *args: str) -> Any:
    # The API reads every file (no cache, so no cache count in its JSON); so does this run.
    main([*args, "--format", "json", "--no-cache"])
    return json.loads(capsys.readouterr().out)


@pytest.fixture(scope="module")
def study() -> Result:
    result = matcheck.check(STUDY)
    assert isinstance(result, Result)
    return result


def test_check_equals_the_cli_json(study: Result, capsys: pytest.CaptureFixture[str]) -> None:
    cli = _cli_json(capsys, "check", str(STUDY))
    assert json.loads(json.dumps(study.to_dict())) == cli
    assert study.exit_status == 1 and study.differs
    assert all(isinstance(f, Finding) for f in study.findings)
    assert len(study.findings) == len(cli["findings"])


def test_compare_equals_the_cli_json(capsys: pytest.CaptureFixture[str]) -> None:
    result = matcheck.compare(
        PAIR, manipulated=["figures"], names=["text", "diagrams"], tolerances={"words": "10%"}
    )
    cli = _cli_json(
        capsys,
        "compare",
        *map(str, PAIR),
        "-m",
        "figures",
        "--names",
        "text,diagrams",
        "-t",
        "words=10%",
    )
    assert json.loads(json.dumps(result.to_dict())) == cli
    (words,) = [f for f in result.findings if f.dimension == "words"]
    assert words.tolerance is not None and words.tolerance.relative == pytest.approx(0.10)


def test_render_every_registered_format_from_one_result(
    study: Result, monkeypatch: pytest.MonkeyPatch
) -> None:
    # One comparison: rendering must not read or compare again.
    import matcheck.api

    def no_more(*_: object, **__: object) -> None:
        raise AssertionError("render recomputed the comparison")

    monkeypatch.setattr(matcheck.api, "_measure_versions", no_more)
    for name in names(Subject.REPORT):
        rendered = study.render(name)
        assert rendered, name
    assert study.render("json") == json.dumps(study.to_dict(), indent=2, ensure_ascii=False) + "\n"
    assert study.render("html").startswith("<!DOCTYPE html>")
    assert study._repr_html_().startswith('<div class="mc">')
    for name in names(Subject.METHODS):
        assert study.render_methods(name), name


def test_to_frame_has_the_documented_columns(study: Result) -> None:
    frame = study.to_frame()
    assert tuple(frame.columns) == FINDING_COLUMNS
    assert len(frame) == len(study.findings)
    differs = frame[frame["status"] == "differs"]
    assert len(differs) == len(study.of_status(Status.DIFFERS))
    words = frame[(frame["dimension"] == "words") & (frame["condition"] == "diagrams-bold")]
    (row,) = words.to_dict("records")
    # The demo's values (fixtures/README.md): 1,059 words in text-bold, 1,000 in diagrams-bold.
    assert (row["reference"], row["reference_value"], row["condition_value"]) == (
        "text-bold",
        1059,
        1000,
    )
    assert row["difference"] == -59 and row["factor"] == "diagrams"
    assert row["tolerance_relative"] == pytest.approx(0.05) and row["evidence"] >= 1


def test_measures_frame_one_row_per_measure_and_version(study: Result) -> None:
    frame = study.measures_frame()
    assert tuple(frame.columns) == MEASURE_COLUMNS
    assert not frame.duplicated(["condition", "dimension"]).any()
    table = frame.pivot(index="dimension", columns="condition", values="value")
    assert table.loc["words", "text-bold"] == 1059
    assert table.loc["words", "diagrams-bold"] == 1000
    assert set(table.columns) == {"text-bold", "diagrams-bold", "text-plain", "diagrams-plain"}
    # Counts found between two versions are not a value of one version.
    assert "passages_removed" not in set(frame["dimension"])
    assert frame[frame["is_reference"]]["condition"].unique().tolist() == ["text-bold"]


def test_folder_result(tmp_path: Path) -> None:
    result = matcheck.check(DEMO)
    assert isinstance(result, FolderResult)
    assert sorted(Path(p).name for p in result.studies) == ["study-clean.toml", "study.toml"]
    assert result.errors == {}
    frame = result.to_frame()
    assert tuple(frame.columns) == ("study", *FINDING_COLUMNS)
    assert len(frame) == len(result.findings)
    assert result.render("html").startswith("<!DOCTYPE html>")
    assert result.exit_status == 1


def test_save_picks_the_format_from_the_extension(study: Result, tmp_path: Path) -> None:
    saved = study.save(tmp_path / "report.json")
    assert json.loads(saved.read_text(encoding="utf-8")) == json.loads(study.render("json"))
    with pytest.raises(UsageError, match=r"no format writes \.xyz"):
        study.save(tmp_path / "report.xyz")
    with pytest.raises(UsageError, match="one of the input files"):
        study.save(Path(study.report.conditions[0].paths[0]), format="json")


@pytest.mark.parametrize(
    ("call", "error", "message"),
    [
        (lambda: matcheck.compare([DEMO / "missing.md", PAIR[0]]), InputError, "missing.md"),
        (lambda: matcheck.compare(str(PAIR[0])), UsageError, "list of lesson files"),
        (lambda: matcheck.compare([PAIR[0]]), UsageError, "at least two"),
        (lambda: matcheck.compare(PAIR, tolerances={"wordz": 3}), UsageError, "wordz"),
        (lambda: matcheck.compare(PAIR, names=["a"]), UsageError, "--names"),
        (lambda: matcheck.compare(PAIR, manipulated="colour"), UsageError, "colour"),
        (lambda: matcheck.check(DEMO / "missing.toml"), ConfigError, "missing.toml"),
    ],
)
def test_bad_input_raises_the_documented_errors(call: Any, error: type, message: str) -> None:
    with pytest.raises(error, match=message):
        call()


def test_import_stays_light() -> None:
    code = (
        "import sys, matcheck; "
        "heavy = [m for m in ('spacy', 'sklearn', 'pandas', 'numpy', 'rich', 'typer') "
        "if m in sys.modules]; print(heavy)"
    )
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == "[]"


def test_frames_name_the_extra_without_pandas(
    study: Result, monkeypatch: pytest.MonkeyPatch
) -> None:
    monkeypatch.setitem(sys.modules, "pandas", None)  # import pandas now fails
    with pytest.raises(ImportError, match=r"matcheck\[pandas\]"):
        study.to_frame()


def test_the_worked_example_in_the_docs_is_what_the_api_prints(study: Result) -> None:
    docs = (ROOT / "docs" / "api.md").read_text(encoding="utf-8")
    assert repr(study) in docs
    roots = [f.dimension for f in study.of_status("differs") if f.caused_by is None]
    assert repr(roots) in docs
