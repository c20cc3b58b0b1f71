"""Messages a newcomer meets (issue 20, deliverable 4): each names the file or option, the
problem and what to do, in one line with exit status 2 (the CLI's rule, DEVELOPERS.md).

The names a suggestion may offer are the catalogue's (``matcheck measures``); the formats'
signatures are those of their standards: ODF 1.2 Part 3 §3.3 (the ``mimetype`` entry first
in the ZIP), RTF 1.9.1 (a file starts with ``{\\rtf1``), CommonMark 0.31 (ATX headings §4.2,
bullet lists §5.2, strong emphasis §6.2).
"""

from __future__ import annotations

import zipfile
from pathlib import Path

import pytest

from matcheck.api import Version, compare_versions
from matcheck.cli import main
from matcheck.findings import EvidenceKind

FIXTURES = Path(__file__).resolve().parent.parent / "fixtures" / "demo"


def _error(capsys: pytest.CaptureFixture[str], argv: list[str]) -> str:
    assert main(argv) == 2
    lines = capsys.readouterr().err.strip().splitlines()
    assert len(lines) == 1, lines
    return lines[0]


def _lesson(folder: Path, name: str = "a.md") -> Path:
    path = folder / name
    path.write_text("# Radiators\n\nBleed the radiator when it is cold.\n", encoding="utf-8")
    return path


def test_check_given_a_lesson_says_which_command_takes_it(
    tmp_path: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    line = _error(capsys, ["check", str(_lesson(tmp_path))])
    assert "is a lesson (.md), not a study file" in line
    assert "`compare` takes lesson files" in line and "a study file (TOML" in line


def test_table_given_a_folder_says_it_takes_one_study_file(
    tmp_path: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    line = _error(capsys, ["table", str(tmp_path)])
    assert str(tmp_path) in line and "is a folder" in line
    assert "takes one study file" in line and "no such study file" not in line


def test_odt_and_rtf_get_the_save_as_docx_hint(
    tmp_path: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    odt = tmp_path / "lesson.odt"
    with zipfile.ZipFile(odt, "w") as archive:  # ODF: "mimetype" stored first
        archive.writestr("mimetype", "application/vnd.oasis.opendocument.text")
        archive.writestr("content.xml", "<office:document-content/>")
    rtf = tmp_path / "lesson.rtf"
    rtf.write_bytes(b"{\\rtf1\\ansi Bleed the radiator.}")
    other = _lesson(tmp_path)
    for path, what in ((odt, "OpenDocument"), (rtf, "RTF")):
        line = _error(capsys, ["compare", str(other), str(path)])
        assert what in line and "save it as .docx" in line and path.name in line


@pytest.mark.parametrize(
    ("argv", "suggested"),
    [
        (["-m", "signalling"], "did you mean signaling?"),
        (["-m", "figure"], "did you mean figures"),
        (["--tolerance", "figure=2"], "did you mean figures"),
        (["--format", "jsn"], "did you mean json"),
    ],
)
def test_a_misspelt_name_gets_the_closest_valid_one(
    tmp_path: Path, capsys: pytest.CaptureFixture[str], argv: list[str], suggested: str
) -> None:
    a, b = _lesson(tmp_path, "a.md"), _lesson(tmp_path, "b.md")
    assert suggested in _error(capsys, ["compare", str(a), str(b), *argv])


def test_a_misspelt_manipulation_in_the_study_file_gets_a_suggestion(
    tmp_path: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    for name in ("a", "b"):
        _lesson(tmp_path, f"{name}.md")
    study = tmp_path / "study.toml"
    study.write_text(
        '[factors.cue]\nlevels = ["off", "on"]\nmanipulates = ["signalling"]\n'
        '[[conditions]]\nname = "a"\nfiles = ["a.md"]\nlevels = { cue = "off" }\n'
        '[[conditions]]\nname = "b"\nfiles = ["b.md"]\nlevels = { cue = "on" }\n',
        encoding="utf-8",
    )
    line = _error(capsys, ["check", str(study)])
    assert "factors.cue.manipulates" in line and "did you mean signaling?" in line


def test_markdown_saved_as_txt_gets_a_warning(
    tmp_path: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    path = tmp_path / "notes.txt"
    path.write_text("# Radiators\n\n- a cloth\n- a key\n\n**Bleed** it cold.\n", "utf-8")
    assert main(["profile", str(path), "--format", "json"]) == 0
    out = capsys.readouterr().out
    assert "the text looks like Markdown" in out and "name the file .md" in out
    plain = tmp_path / "plain.txt"
    plain.write_text("Bleed the radiator when it is cold. Close the screw.\n", "utf-8")
    assert main(["profile", str(plain), "--format", "json"]) == 0
    assert "looks like Markdown" not in capsys.readouterr().out


def test_a_figure_without_alt_text_is_located(tmp_path: Path) -> None:
    (tmp_path / "images").mkdir()
    image = (FIXTURES / "images" / "valve-types.png").read_bytes()
    (tmp_path / "images" / "key.png").write_bytes(image)
    lesson = "# Radiators\n\nBleed the radiator when it is cold.\n\n![{alt}](images/key.png)\n"
    (tmp_path / "a.md").write_text(lesson.format(alt="A bleed key"), encoding="utf-8")
    (tmp_path / "b.md").write_text(lesson.format(alt=""), encoding="utf-8")
    report = compare_versions(
        [Version("a", (tmp_path / "a.md",)), Version("b", (tmp_path / "b.md",))]
    )
    finding = next(f for f in report.findings if f.dimension == "figures_without_alt_text")
    assert finding.values == {"a": 0.0, "b": 1.0}
    (evidence,) = finding.evidence
    assert evidence.kind is EvidenceKind.NO_ALT_TEXT and evidence.condition == "b"
    # The image is line 5 of b.md, under "Radiators", by construction.
    assert evidence.location is not None
    assert evidence.location.describe() == "§ Radiators, line 5"
