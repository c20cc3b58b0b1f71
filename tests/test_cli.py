"""The command line, driven through ``matcheck.cli.main([...])`` on the demo fixtures.

Exit statuses are the documented ones (matcheck/errors.py, README): 0 nothing differs,
1 something differs, 2 bad input or usage (one line on stderr, no traceback).
"""

from __future__ import annotations

import json
import random
import re
import shutil
import subprocess
import sys
from pathlib import Path
from typing import Any

import pytest

from matcheck.cli import main
from matcheck.measures import catalogue

CATALOGUE = catalogue()

DEMO = Path(__file__).resolve().parent.parent / "fixtures" / "demo"
EXPECTED = json.loads((DEMO / "expected.json").read_text(encoding="utf-8"))
TEXT_ONLY = DEMO / "text-only.md"
DIAGRAMS = DEMO / "diagrams.md"
CONFOUNDED = DEMO / "diagrams-confounded.md"
HEAVY = ("spacy", "sklearn", "pypdf", "docx", "PIL", "scipy", "statsmodels", "numpy", "fpdf")


@pytest.fixture(autouse=True)
def _stable_width(monkeypatch: pytest.MonkeyPatch) -> None:
    # Rich reads COLUMNS when it is not writing to a terminal; a fixed width keeps cells whole.
    monkeypatch.setenv("COLUMNS", "200")
    monkeypatch.delenv("FORCE_COLOR", raising=False)
    monkeypatch.setenv("NO_COLOR", "1")


def _run(capsys: pytest.CaptureFixture[str], *args: str | Path) -> tuple[int, str, str]:
    status = main([str(arg) for arg in args])
    captured = capsys.readouterr()
    return status, captured.out, captured.err


def _json(capsys: pytest.CaptureFixture[str], *args: str | Path) -> tuple[int, Any]:
    status, out, err = _run(capsys, *args, "--format", "json")
    assert "Traceback" not in err
    return status, json.loads(out)


def _findings(report: Any, dimension: str) -> list[Any]:
    return [f for f in report["findings"] if f["dimension"] == dimension]


# --- profile --------------------------------------------------------------------------------


def test_profile_table(capsys: pytest.CaptureFixture[str]) -> None:
    status, out, err = _run(capsys, "profile", TEXT_ONLY)
    assert status == 0
    assert err == ""
    for header in ("Group", "Measure", "Unit", "text-only.md"):
        assert header in out
    words = EXPECTED["versions"]["text-only"]["words"]  # 1059
    assert re.search(rf"words\s+│\s+words\s+│\s+{words:,}\s+│", out)
    for measure_id in ("flesch_reading_ease", "figures", "headings", "bold_words"):
        assert measure_id in out


def test_profile_json(capsys: pytest.CaptureFixture[str]) -> None:
    status, report = _json(capsys, "profile", TEXT_ONLY, DIAGRAMS)
    assert status == 0
    assert report["schema_version"]
    assert [Path(d["path"]).name for d in report["documents"]] == ["text-only.md", "diagrams.md"]
    for document, version in zip(report["documents"], ("text-only", "diagrams"), strict=True):
        assert document["format"] == "markdown"
        assert document["warnings"] == []
        measures = {m["dimension"]: m for m in document["measures"]}
        for item in document["measures"]:
            assert {"dimension", "group", "value", "unit"} <= item.keys()
            assert CATALOGUE[item["dimension"]].group.value == item["group"]
            assert CATALOGUE[item["dimension"]].unit == item["unit"]
        expected = EXPECTED["versions"][version]
        assert measures["words"]["value"] == expected["words"]
        assert measures["figures"]["value"] == expected["figures"]
        # Listings carry their items as values and the count apart.
        assert isinstance(measures["key_terms"]["value"], list)
        assert {"term", "weight"} <= measures["key_terms"]["value"][0].keys()


def test_profile_wpm_changes_reading_time(capsys: pytest.CaptureFixture[str]) -> None:
    status, report = _json(capsys, "profile", TEXT_ONLY, "--wpm", "175")
    assert status == 0
    measures = {m["dimension"]: m["value"] for m in report["documents"][0]["measures"]}
    assert measures["reading_time"] == pytest.approx(measures["words"] / 175)


# --- compare --------------------------------------------------------------------------------


def test_compare_intended_manipulation_only_exits_0(capsys: pytest.CaptureFixture[str]) -> None:
    status, report = _json(capsys, "compare", TEXT_ONLY, DIAGRAMS, "-m", "figures")
    # expected.json: diagrams differs from text-only in "figures and their captions only".
    assert status == 0
    assert report["schema_version"]
    assert [c["name"] for c in report["conditions"]] == ["text-only", "diagrams"]
    assert report["conditions"][0]["reference"] is True
    assert report["findings"]
    for finding in report["findings"]:
        assert {"dimension", "group", "status", "values", "difference", "tolerance"} <= (
            finding.keys()
        )
        assert finding["status"] != "differs"
    (figures,) = _findings(report, "figures")
    assert figures["status"] == "intended"
    assert figures["values"] == {"text-only": 0, "diagrams": 3}
    assert figures["difference"] == 3
    (words,) = _findings(report, "words")
    assert words["status"] == "matched"
    assert words["tolerance"]["relative"] == pytest.approx(0.05)


def test_compare_confounded_exits_1_with_located_findings(
    capsys: pytest.CaptureFixture[str],
) -> None:
    status, report = _json(capsys, "compare", TEXT_ONLY, CONFOUNDED, "-m", "figures")
    assert status == 1
    assert report["summary"]["verdict"] == "differs"
    removed_paragraph = EXPECTED["versions"]["diagrams-confounded"]["removed_paragraph"]
    (removed,) = _findings(report, "passages_removed")
    assert removed["status"] == "differs"
    assert removed["difference"] == 1
    (evidence,) = removed["evidence"]
    assert evidence["kind"] == "passage_removed"
    assert evidence["condition"] == "text-only"
    assert evidence["location"]["section"] == removed_paragraph["section"]
    # The excerpt is the removed paragraph's opening words.
    assert removed_paragraph["text"].startswith(evidence["text"].removesuffix(" …"))
    # One section's sentences were split (expected.json split_section).
    (wps,) = _findings(report, "words_per_sentence")
    assert wps["status"] == "differs"
    assert wps["difference"] < 0
    (words,) = _findings(report, "words")
    assert words["values"] == {"text-only": 1059, "diagrams-confounded": 1000}
    assert words["status"] == "differs"  # 59 words is beyond the default 5%


def test_compare_markdown_has_a_table(capsys: pytest.CaptureFixture[str]) -> None:
    args = ("compare", TEXT_ONLY, CONFOUNDED, "-m", "figures", "-f", "markdown")
    status, out, _ = _run(capsys, *args)
    assert status == 1
    lines = out.splitlines()
    header = next(i for i, line in enumerate(lines) if line.startswith("| Group | Measure |"))
    # A GFM table: the header row is followed by a delimiter row of ---, --: or :-- cells.
    cell = r"(:?-{2,}:?|-{3,})"
    assert re.fullmatch(rf"\|{cell}(\|{cell})+\|", lines[header + 1])
    assert any(line.startswith("| length | `words` |") for line in lines)


def test_compare_table_default(capsys: pytest.CaptureFixture[str]) -> None:
    status, out, err = _run(capsys, "compare", TEXT_ONLY, CONFOUNDED, "-m", "figures")
    assert status == 1
    assert err == ""
    assert re.search(r"differs\s+words\s", out)
    assert re.search(r"intended\s+figures\s", out)


def test_output_writes_a_file(capsys: pytest.CaptureFixture[str], tmp_path: Path) -> None:
    target = tmp_path / "report.json"
    status, out, err = _run(
        capsys, "compare", TEXT_ONLY, DIAGRAMS, "-m", "figures", "-f", "json", "-o", target
    )
    assert status == 0
    assert out == ""
    assert err == ""
    assert json.loads(target.read_text(encoding="utf-8"))["findings"]
    table = tmp_path / "profile.txt"
    assert main(["profile", str(TEXT_ONLY), "-o", str(table)]) == 0
    assert "flesch_reading_ease" in table.read_text(encoding="utf-8")


def test_output_never_overwrites_an_input(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    lesson = tmp_path / "text-only.md"
    shutil.copyfile(TEXT_ONLY, lesson)
    before = lesson.read_bytes()
    status, _, err = _run(capsys, "compare", lesson, DIAGRAMS, "-m", "figures", "-o", lesson)
    assert status == 2
    assert lesson.read_bytes() == before
    assert err.startswith("matcheck: error:")
    assert len(err.splitlines()) == 1
    # Also through another spelling of the same path.
    other = tmp_path / "." / "text-only.md"
    assert main(["profile", str(lesson), "-o", str(other)]) == 2
    assert lesson.read_bytes() == before


# --- bad input ------------------------------------------------------------------------------


def _bad_inputs(tmp_path: Path) -> dict[str, list[str]]:
    empty = tmp_path / "empty.md"
    empty.write_bytes(b"")
    noise = tmp_path / "noise.docx"
    noise.write_bytes(random.Random(0).randbytes(4096))
    broken_zip = tmp_path / "broken.docx"
    broken_zip.write_bytes(b"PK\x03\x04" + random.Random(1).randbytes(4096))
    folder = tmp_path / "folder"
    folder.mkdir()
    pair = [str(TEXT_ONLY), str(DIAGRAMS)]
    return {
        "missing": ["profile", str(tmp_path / "missing.md")],
        "directory": ["profile", str(folder)],
        "empty": ["profile", str(empty)],
        "random bytes docx": ["profile", str(noise)],
        "broken zip docx": ["compare", str(broken_zip), *pair],
        "unknown manipulated": ["compare", *pair, "-m", "colour"],
        "bad tolerance": ["compare", *pair, "--tolerance", "words=lots"],
        "unknown tolerance measure": ["compare", *pair, "--tolerance", "colour=3%"],
        "names count": ["compare", *pair, "--names", "a,b,c"],
        "unknown reference": ["compare", *pair, "--reference", "nope"],
        "bad wpm": ["profile", str(TEXT_ONLY), "--wpm", "5"],
        "no workers": ["check", str(DEMO / "study.toml"), "--jobs", "0"],
    }


CASES = [
    "missing",
    "directory",
    "empty",
    "random bytes docx",
    "broken zip docx",
    "unknown manipulated",
    "bad tolerance",
    "unknown tolerance measure",
    "names count",
    "unknown reference",
    "bad wpm",
    "no workers",
]


@pytest.mark.parametrize("case", CASES)
def test_bad_input_is_one_line_exit_2(
    case: str, capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    args = _bad_inputs(tmp_path)[case]
    status, out, err = _run(capsys, *args)
    assert status == 2
    lines = err.splitlines()
    assert len(lines) == 1, err
    assert lines[0].startswith("matcheck: error:")
    assert "Traceback" not in err + out
    if args[0] == "profile" and case != "bad wpm":
        assert Path(args[1]).name in lines[0]  # the message names the file


def test_debug_shows_the_traceback(capsys: pytest.CaptureFixture[str], tmp_path: Path) -> None:
    status, _, err = _run(capsys, "--debug", "profile", tmp_path / "missing.md")
    assert status == 2
    assert "Traceback (most recent call last)" in err
    assert err.splitlines()[-1].startswith("matcheck: error:")


# --- start-up and listing -------------------------------------------------------------------


def test_help_does_not_import_heavy_libraries() -> None:
    code = (
        "import sys; from matcheck.cli import main; status = main(['--help']); "
        f"heavy = {set(HEAVY)!r}; "
        "print(sorted(m for m in sys.modules if m.split('.')[0] in heavy)); print(status)"
    )
    result = subprocess.run(
        [sys.executable, "-c", code], capture_output=True, text=True, timeout=60, check=False
    )
    lines = result.stdout.strip().splitlines()
    assert "Usage:" in result.stdout
    assert lines[-2:] == ["[]", "0"], result.stdout + result.stderr


def test_python_m_matcheck_help_is_light() -> None:
    # -X importtime lists every module the interpreter imports (CPython docs), one per line.
    result = subprocess.run(
        [sys.executable, "-X", "importtime", "-m", "matcheck", "--help"],
        capture_output=True,
        text=True,
        timeout=60,
        check=False,
    )
    assert result.returncode == 0
    assert "Usage:" in result.stdout
    imported = {
        line.rsplit("|", 1)[-1].strip().split(".")[0]
        for line in result.stderr.splitlines()
        if line.startswith("import time:")
    }
    assert "matcheck" in imported  # the listing works
    assert imported.isdisjoint(HEAVY), sorted(imported & set(HEAVY))


def test_version(capsys: pytest.CaptureFixture[str]) -> None:
    from matcheck import __version__

    status, out, _ = _run(capsys, "--version")
    assert status == 0
    assert out.strip() == f"matcheck {__version__}"


def test_measures_lists_every_catalogue_id(capsys: pytest.CaptureFixture[str]) -> None:

    status, out, _ = _run(capsys, "measures")
    assert status == 0
    listed = {match.group(1) for match in re.finditer(r"^│ ([a-z0-9_]+)\s+│", out, re.M)}
    assert set(CATALOGUE) <= listed
