"""The study file: validation messages, and the factorial comparison logic on a 2×2 study.

The 2×2 study is built by construction from the demo lesson's Markdown: factor ``diagrams``
(one figure added) and factor ``signaling`` (bold marks removed). One cell additionally lost a
paragraph: that planted confound must show in exactly the two contrasts that involve that
cell, and nowhere else.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from matcheck.api import check_study
from matcheck.cli import main
from matcheck.errors import ConfigError
from matcheck.findings import Status
from matcheck.study import comparisons, load_study

FIXTURES = Path(__file__).resolve().parent.parent / "fixtures" / "demo"
BASE = (FIXTURES / "text-only.md").read_text(encoding="utf-8")
FIGURE = "## Know Your Valve\n\n![Three valve types](images/valve-types.png)\n"
DROPPED = next(p for p in BASE.split("\n\n") if p.startswith("Let out any air"))

STUDY = """
[study]
title = "Diagrams × signaling in a tyre-repair lesson"
reference = "text-bold"

[factors.diagrams]
levels = ["none", "with"]
manipulates = ["figures"]

[factors.signaling]
levels = ["bold", "plain"]
manipulates = ["signaling"]

[[conditions]]
name = "text-bold"
files = ["text-bold.md"]
levels = { diagrams = "none", signaling = "bold" }

[[conditions]]
name = "diagrams-bold"
files = ["diagrams-bold.md"]
levels = { diagrams = "with", signaling = "bold" }

[[conditions]]
name = "text-plain"
files = ["text-plain.md"]
levels = { diagrams = "none", signaling = "plain" }

[[conditions]]
name = "diagrams-plain"
files = ["diagrams-plain.md"]
levels = { diagrams = "with", signaling = "plain" }
"""


def _write_2x2(folder: Path, study: str = STUDY) -> Path:
    (folder / "images").mkdir(exist_ok=True)
    for image in (FIXTURES / "images").iterdir():
        (folder / "images" / image.name).write_bytes(image.read_bytes())
    with_figure = BASE.replace("## Know Your Valve\n", FIGURE)
    plain = BASE.replace("**", "")
    (folder / "text-bold.md").write_text(BASE, encoding="utf-8")
    (folder / "diagrams-bold.md").write_text(with_figure, encoding="utf-8")
    (folder / "text-plain.md").write_text(plain, encoding="utf-8")
    # The planted confound: this cell also lost a paragraph.
    confounded = with_figure.replace("**", "").replace(DROPPED + "\n\n", "")
    (folder / "diagrams-plain.md").write_text(confounded, encoding="utf-8")
    path = folder / "study.toml"
    path.write_text(study, encoding="utf-8")
    return path


def test_factorial_comparisons_are_the_one_factor_contrasts(tmp_path: Path) -> None:
    study = load_study(_write_2x2(tmp_path))
    pairs = {(c.reference, c.condition): (c.factor, c.manipulated) for c in comparisons(study)}
    assert pairs == {
        ("text-bold", "diagrams-bold"): ("diagrams", ("figures",)),
        ("text-bold", "text-plain"): ("signaling", ("signaling",)),
        ("diagrams-bold", "diagrams-plain"): ("signaling", ("signaling",)),
        ("text-plain", "diagrams-plain"): ("diagrams", ("figures",)),
    }


def test_planted_confound_shows_in_exactly_the_contrasts_of_its_cell(tmp_path: Path) -> None:
    report = check_study(load_study(_write_2x2(tmp_path)))
    assert report.differs
    differing_pairs = {
        (f.reference, f.condition) for f in report.findings if f.status is Status.DIFFERS
    }
    assert differing_pairs == {
        ("diagrams-bold", "diagrams-plain"),
        ("text-plain", "diagrams-plain"),
    }
    for pairing in report.pairs():
        findings = {f.dimension: f for f in report.findings_of(pairing)}
        if pairing.factor == "diagrams":
            assert findings["figures"].status is Status.INTENDED
            # Conditions sharing a signaling level must match on signaling.
            assert findings["emphasized_words"].status is Status.MATCHED
        else:
            assert findings["emphasized_words"].status is Status.INTENDED
            # Conditions sharing a diagrams level must match on figures.
            assert findings["figures"].status is Status.MATCHED
        if "diagrams-plain" in (pairing.reference, pairing.condition):
            removed = findings["passages_removed"]
            assert removed.status is Status.DIFFERS
            assert removed.evidence[0].location is not None
            assert removed.evidence[0].location.section == "Removing the Tyre"


def test_check_command_exit_status_and_json(
    tmp_path: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    import json

    path = _write_2x2(tmp_path)
    assert main(["check", str(path), "--format", "json"]) == 1
    data = json.loads(capsys.readouterr().out)
    assert data["title"].startswith("Diagrams")
    assert len(data["comparisons"]) == 4
    clean = STUDY.replace('files = ["diagrams-plain.md"]', 'files = ["clean.md"]')
    (tmp_path / "clean.md").write_text(
        BASE.replace("## Know Your Valve\n", FIGURE).replace("**", ""), encoding="utf-8"
    )
    clean_path = tmp_path / "clean.toml"
    clean_path.write_text(clean, encoding="utf-8")
    assert main(["check", str(clean_path), "--format", "json"]) == 0


def _error(tmp_path: Path, text: str) -> str:
    _write_2x2(tmp_path)
    path = tmp_path / "bad.toml"
    path.write_text(text, encoding="utf-8")
    with pytest.raises(ConfigError) as error:
        load_study(path)
    return str(error.value)


@pytest.mark.parametrize(
    ("edit", "message"),
    [
        (lambda s: s + "\n[extra]\nx = 1\n", "unknown key 'extra'"),
        (
            lambda s: s.replace('title = "', 'colour = "red"\ntitle = "'),
            "[study]: unknown key 'colour'",
        ),
        (
            lambda s: s.replace('files = ["text-plain.md"]', 'files = ["nope.md"]'),
            "nope.md does not exist",
        ),
        (
            lambda s: s.replace('manipulates = ["figures"]', 'manipulates = ["pictures"]'),
            "factors.diagrams.manipulates: 'pictures' is neither a group",
        ),
        (
            lambda s: s.replace(
                'levels = { diagrams = "none", signaling = "plain" }',
                'levels = { diagrams = "none" }',
            ),
            "conditions.text-plain.levels has no level for factor 'signaling'",
        ),
        (
            lambda s: s.replace(
                'levels = { diagrams = "none", signaling = "plain" }',
                'levels = { diagrams = "none", signaling = "loud" }',
            ),
            "conditions.text-plain.levels.signaling = 'loud' is not one of bold, plain",
        ),
        (
            lambda s: s.replace('reference = "text-bold"', 'reference = "control"'),
            "study.reference = 'control' is not a condition",
        ),
        (lambda s: s + '\n[tolerances]\nwords = "lots"\n', "[tolerances]"),
        (lambda s: s + "\n[tolerances]\nvibes = 3\n", "unknown measure 'vibes'"),
        (
            lambda s: s.replace('name = "text-plain"', 'name = "text-bold"'),
            "two conditions are named 'text-bold'",
        ),
        (
            lambda s: s.replace('levels = ["none", "with"]', 'levels = ["none", "with", "video"]'),
            "factors.diagrams.levels: 'video' is used by no condition",
        ),
        (
            lambda s: s.replace('files = ["text-plain.md"]', 'files = ["text-bold.md"]'),
            "conditions 'text-bold' and 'text-plain' use the same files",
        ),
        (lambda s: s + '\n[conditions]\nname = "x"\n', "[[conditions]] table (two brackets)"),
        (lambda s: s.replace("[study]", "[study"), "not valid TOML"),
        (lambda s: s + '\n[posttest]\nfiles = ["quiz.md"]\n', "posttest.files: "),
        (
            lambda s: s.replace('files = ["text-bold.md"]\n', ""),
            "conditions.text-bold.files is missing",
        ),
    ],
)
def test_validation_messages_name_the_key(tmp_path: Path, edit: object, message: str) -> None:
    text = edit(STUDY)  # type: ignore[operator]
    assert message in _error(tmp_path, text)


def test_bad_study_file_exits_2_with_one_line(
    tmp_path: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    path = tmp_path / "study.toml"
    path.write_text("[study]\ntitle = 3\n", encoding="utf-8")
    assert main(["check", str(path)]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and err[0].startswith("matcheck: error:") and "study.toml" in err[0]


def test_table_command_formats(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    import csv
    import io

    path = _write_2x2(tmp_path)
    assert main(["table", str(path), "--format", "csv"]) == 0
    rows = list(csv.reader(io.StringIO(capsys.readouterr().out)))
    assert rows[0][2:6] == ["text-bold", "diagrams-bold", "text-plain", "diagrams-plain"]
    assert main(["table", str(path), "--format", "docx"]) == 2  # a Word file needs --output
    assert "--output" in capsys.readouterr().err
    target = tmp_path / "table1.docx"
    assert main(["table", str(path), "--format", "docx", "--output", str(target)]) == 0
    from docx import Document

    cells = Document(str(target)).tables[0].rows[0].cells
    assert [c.text for c in cells][1:5] == [
        "text-bold",
        "diagrams-bold",
        "text-plain",
        "diagrams-plain",
    ]
