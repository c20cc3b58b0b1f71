"""A study file and lessons from an untrusted pull request, and command-line typos.

Threat model: docs/limits.md ("What a study from a pull request can and cannot do"). Every
hostile study is built here in ``tmp_path``. A refusal is exit 2 with exactly one stderr line
and no traceback (matcheck/errors.py); no file outside the study's folder is ever read or
quoted, no input is ever written, and nothing in a study becomes a workflow command, a
terminal escape sequence, Rich markup, Markdown/HTML, a spreadsheet formula or invalid XML.
Escaping rules: GitHub's documentation of workflow commands; OWASP "CSV Injection";
CommonMark §2.4 (backslash escapes) and §6.1 (code spans); XML 1.0 §2.2 (characters);
docs/references.md §22.
"""

from __future__ import annotations

import csv
import io
import json
import os
import re
import shutil
from pathlib import Path

import pytest
from gitrepo import git

from matcheck.cli import main
from matcheck.paths import MAX_STUDY_BYTES

DEMO = Path(__file__).resolve().parent.parent / "fixtures" / "demo"
SECRET = "TOP-SECRET-TOKEN-7f3a"
LESSON = (DEMO / "text-only.md").read_text(encoding="utf-8")
# The same lesson with one paragraph fewer, so a comparison finds something to report.
SHORTER = "\n\n".join(LESSON.split("\n\n")[:-2]) + "\n"


@pytest.fixture(autouse=True)
def _plain_terminal(monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setenv("COLUMNS", "200")
    monkeypatch.setenv("NO_COLOR", "1")
    monkeypatch.delenv("GITHUB_STEP_SUMMARY", raising=False)


def _run(capsys: pytest.CaptureFixture[str], *args: str | Path) -> tuple[int, str, str]:
    status = main([str(arg) for arg in args])
    captured = capsys.readouterr()
    return status, captured.out, captured.err


def _refused(status: int, out: str, err: str, *words: str) -> None:
    assert status == 2, err
    assert err.count("\n") == 1 and err.startswith("matcheck: error: "), err
    assert "Traceback" not in err and "internal error" not in err
    for word in words:
        assert word in err, err
    assert SECRET not in out + err


def _toml(value: str) -> str:
    return json.dumps(value)  # a JSON string is a valid TOML basic string


def _study(
    folder: Path,
    files: tuple[str, str] = ("a.md", "b.md"),
    names: tuple[str, str] = ("A", "B"),
    posttest: str | None = None,
    write_lessons: bool = True,
) -> Path:
    folder.mkdir(parents=True, exist_ok=True)
    if write_lessons:
        (folder / "a.md").write_text(LESSON, encoding="utf-8")
        (folder / "b.md").write_text(SHORTER, encoding="utf-8")
    text = '[study]\ntitle = "Tyre repair"\n'
    for name, file in zip(names, files, strict=True):
        text += f"\n[[conditions]]\nname = {_toml(name)}\nfiles = [{_toml(file)}]\n"
    if posttest is not None:
        text += f"\n[posttest]\nfiles = [{_toml(posttest)}]\n"
    path = folder / "study.toml"
    path.write_text(text, encoding="utf-8")
    return path


@pytest.fixture
def secret(tmp_path: Path) -> Path:
    path = tmp_path / "outside" / "secret.md"
    path.parent.mkdir()
    path.write_text(f"# Credentials\n\nThe deploy key is {SECRET} and must stay here.\n")
    return path


# --- usage errors ---------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("args", "word"),
    [
        (["powr"], "No such command"),
        (["check", "--bogus", "x.toml"], "--bogus"),
        (["check", "--format", "htm", "x.toml"], "htm"),
        (["compare"], "Missing argument"),
        (["check", "--jobs", "many", "x"], "--jobs"),
    ],
)
def test_usage_errors_are_one_line_and_exit_2(
    capsys: pytest.CaptureFixture[str], args: list[str], word: str
) -> None:
    _refused(*_run(capsys, *args), word)


# --- paths a study names ------------------------------------------------------------------


def test_absolute_path_is_refused(
    capsys: pytest.CaptureFixture[str], tmp_path: Path, secret: Path
) -> None:
    study = _study(tmp_path / "study", files=("a.md", str(secret)))
    for fmt in ("json", "markdown", "github", "table"):
        _refused(*_run(capsys, "check", study, "--format", fmt), "outside the study's folder")


def test_climbing_path_is_refused(
    capsys: pytest.CaptureFixture[str], tmp_path: Path, secret: Path
) -> None:
    study = _study(tmp_path / "study", files=("a.md", "../outside/secret.md"))
    _refused(*_run(capsys, "check", study), "conditions.B.files", "outside")


def test_symlink_out_of_the_folder_is_refused(
    capsys: pytest.CaptureFixture[str], tmp_path: Path, secret: Path
) -> None:
    study = _study(tmp_path / "study", files=("a.md", "link.md"))
    (study.parent / "link.md").symlink_to(secret)
    _refused(*_run(capsys, "check", study, "--format", "json"), "link.md", "outside")


def test_posttest_outside_is_refused(
    capsys: pytest.CaptureFixture[str], tmp_path: Path, secret: Path
) -> None:
    study = _study(tmp_path / "study", posttest=str(secret))
    _refused(*_run(capsys, "check", study), "posttest.files", "outside")


def test_allow_outside_covers_every_kind_of_path(
    capsys: pytest.CaptureFixture[str], tmp_path: Path, secret: Path
) -> None:
    study = _study(tmp_path / "study", files=("a.md", "../outside/secret.md"))
    status, out, err = _run(capsys, "check", study, "--allow-outside", "--format", "json")
    assert status in (0, 1), err
    assert json.loads(out)["conditions"][1]["paths"][0].endswith("secret.md")


def test_a_link_inside_the_folder_is_fine(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    study = _study(tmp_path / "study", files=("a.md", "alias.md"))
    (study.parent / "alias.md").symlink_to("b.md")
    status, _, err = _run(capsys, "check", study, "--format", "json")
    assert status == 1, err


@pytest.mark.parametrize("kind", ["fifo", "directory", "device"])
def test_special_files_are_never_opened(
    capsys: pytest.CaptureFixture[str], tmp_path: Path, kind: str
) -> None:
    study = _study(tmp_path / "study", files=("a.md", "special.md"))
    special = study.parent / "special.md"
    if kind == "fifo":
        os.mkfifo(special)  # opening it for reading would block forever
    elif kind == "directory":
        special.mkdir()
    else:
        special.symlink_to("/dev/zero")  # reading it would never end
    _refused(*_run(capsys, "check", study), "special.md")


def test_folder_discovery_skips_special_files(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    root = tmp_path / "studies"
    _study(root / "good")
    os.mkfifo(root / "fifo.toml")
    (root / "zero.toml").symlink_to("/dev/zero")
    (root / "folder.toml").mkdir()
    status, out, err = _run(capsys, "check", root, "--jobs", "1", "--format", "json")
    assert status == 1, err
    assert [Path(s["path"]).name for s in json.loads(out)["studies"]] == ["study.toml"]


def test_folder_discovery_skips_studies_linked_from_outside(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    elsewhere = _study(tmp_path / "elsewhere")
    root = tmp_path / "studies"
    _study(root / "good")
    (root / "linked.toml").symlink_to(elsewhere)
    status, out, err = _run(capsys, "check", root, "--jobs", "1", "--format", "json")
    assert status == 1, err
    assert [Path(s["path"]).name for s in json.loads(out)["studies"]] == ["study.toml"]


def test_oversized_study_file_is_refused(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    study = _study(tmp_path / "study")
    padding = "# " + "x" * 1000 + "\n"
    study.write_text(study.read_text() + padding * (MAX_STUDY_BYTES // len(padding) + 1))
    _refused(*_run(capsys, "check", study), "above the limit")


def test_study_file_with_a_bom_is_read(capsys: pytest.CaptureFixture[str], tmp_path: Path) -> None:
    study = _study(tmp_path / "study")
    study.write_bytes(b"\xef\xbb\xbf" + study.read_bytes())
    status, _, err = _run(capsys, "check", study, "--format", "json")
    assert status == 1, err


def test_deeply_nested_toml_is_one_line_and_folder_goes_on(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    root = tmp_path / "studies"
    _study(root / "good")
    deep = root / "deep" / "study.toml"
    deep.parent.mkdir()
    deep.write_text("[[conditions]]\nname = " + "[" * 50_000 + "]" * 50_000 + "\n")
    _refused(*_run(capsys, "check", deep), "nested")
    status, out, err = _run(capsys, "check", root, "--jobs", "1", "--format", "json")
    studies = {Path(s["path"]).parent.name: s for s in json.loads(out)["studies"]}
    assert "nested" in studies["deep"]["error"], err
    assert studies["good"]["report"] is not None
    assert status == 1


# --- outputs never touch inputs -------------------------------------------------------------


def test_output_onto_a_lesson_in_folder_mode(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    study = _study(tmp_path / "studies" / "one")
    lesson = study.parent / "b.md"
    for args in (["--jobs", "1"], ["--jobs", "2"]):
        _refused(*_run(capsys, "check", tmp_path / "studies", *args, "-o", lesson), "input")
        assert lesson.read_text(encoding="utf-8") == SHORTER


def test_output_onto_a_lesson_through_a_link(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    study = _study(tmp_path / "study")
    link = tmp_path / "report.md"
    link.symlink_to(study.parent / "a.md")
    _refused(*_run(capsys, "check", study, "-o", link), "input")
    assert (study.parent / "a.md").read_text(encoding="utf-8") == LESSON


def test_output_onto_an_image_a_lesson_uses(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    folder = tmp_path / "study"
    shutil.copytree(DEMO / "images", folder / "images")
    _study(folder)
    (folder / "a.md").write_text((DEMO / "diagrams.md").read_text("utf-8"), encoding="utf-8")
    image = next(
        folder / "images" / p.name
        for p in (DEMO / "images").iterdir()
        if f"images/{p.name}" in (folder / "a.md").read_text("utf-8")
    )
    before = image.read_bytes()
    _refused(*_run(capsys, "check", folder / "study.toml", "-o", image), "input")
    _refused(*_run(capsys, "check", folder, "-j", "1", "-o", image), "input")
    assert image.read_bytes() == before


def test_step_summary_never_lands_on_a_lesson(
    capsys: pytest.CaptureFixture[str], tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    study = _study(tmp_path / "study")
    monkeypatch.setenv("GITHUB_STEP_SUMMARY", str(study.parent / "a.md"))
    _refused(*_run(capsys, "check", study, "--format", "github"), "GITHUB_STEP_SUMMARY")
    # In folder mode the lesson is read in a worker process; the parent still knows it.
    _study(tmp_path / "second")
    _refused(*_run(capsys, "check", tmp_path, "-j", "2", "-f", "github"), "GITHUB_STEP_SUMMARY")
    assert (study.parent / "a.md").read_text(encoding="utf-8") == LESSON
    summary = tmp_path / "summary.md"
    monkeypatch.setenv("GITHUB_STEP_SUMMARY", str(summary))
    status, _, err = _run(capsys, "check", study, "--format", "github")
    assert status == 1 and "## matcheck report" in summary.read_text(encoding="utf-8"), err


# --- everything printed is safe -----------------------------------------------------------

INJECTED = "B\n::error file=x.md::pwned\r\n::add-mask::x"


def _no_foreign_commands(out: str) -> None:
    for line in out.splitlines():
        if line.startswith("::"):
            assert line.startswith(("::error file=", "::error title=", "::warning ")), line
        assert "pwned" not in line or "%0A" in line, line


def test_no_workflow_command_injection(capsys: pytest.CaptureFixture[str], tmp_path: Path) -> None:
    study = _study(tmp_path / "studies" / "one", names=("A", INJECTED))
    _study(tmp_path / "studies" / "bad\n::error::pwned")  # a folder name with a newline
    bad = tmp_path / "studies" / "bad\n::error::pwned" / "study.toml"
    bad.write_text(bad.read_text() + "\n[tolerances]\nwords = true\n")
    status, out, err = _run(capsys, "check", study, "--format", "github")
    assert status == 1, err
    _no_foreign_commands(out)
    status, out, err = _run(capsys, "check", tmp_path / "studies", "-j", "1", "-f", "github")
    assert status == 1, err
    assert out.count("::error file=") >= 2
    _no_foreign_commands(out)


def test_errors_with_newlines_stay_one_line(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    study = _study(tmp_path / "study", files=("a.md", "missing\n::error::x.md"))
    _refused(*_run(capsys, "check", study), "does not exist", "\\n::error::x.md")


@pytest.mark.parametrize("name", ["A[/]", "A[bold red]x", "A\x1b]0;title\x07\x1b[31m", "B\\|x"])
def test_names_are_shown_as_written_in_the_table(
    capsys: pytest.CaptureFixture[str], tmp_path: Path, name: str
) -> None:
    study = _study(tmp_path / "study", names=(name, "other"))
    status, out, err = _run(capsys, "check", study)
    assert status == 1, err
    assert "\x1b" not in out and "\x07" not in out
    shown = name.replace("\x1b", "\\x1b").replace("\x07", "\\x07")
    assert shown[:8] in out


def test_markdown_image_path_with_markup(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    folder = tmp_path / "study"
    _study(folder)
    (folder / "a.md").write_text(LESSON + "\n![x](img[/]bold.png)\n", encoding="utf-8")
    status, out, err = _run(capsys, "check", folder / "study.toml")
    assert status == 1, err
    assert "img[/]bold.png" in out


def test_markdown_neutralises_html_and_keeps_backslashes(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    study = _study(tmp_path / "study", names=("<img src=http://evil.example/x.png>", "B\\|x"))
    status, out, err = _run(capsys, "check", study, "--format", "markdown")
    assert status == 1, err
    # Raw HTML is shown, never rendered: escaped in text and table cells, literal (inert)
    # only inside code spans (CommonMark §6.1: no HTML is recognised in a code span).
    outside_code = re.sub(r"(`+).*?\1", "", out)
    assert "<img" not in outside_code and "&lt;img" in out
    # The table cell holds B\\\|x: GFM unescapes \| to | first, then \\ to \ (CommonMark §2.4).
    assert "B\\\\\\|x" in out


def test_csv_cells_are_never_formulas(capsys: pytest.CaptureFixture[str], tmp_path: Path) -> None:
    name = '=HYPERLINK("http://evil.example","click")'
    study = _study(tmp_path / "study", names=(name, "@SUM(A1)"))
    status, out, err = _run(capsys, "table", study, "--format", "csv")
    assert status == 0, err
    header = next(csv.reader(io.StringIO(out)))
    assert "'" + name in header and "'@SUM(A1)" in header
    assert not any(cell.startswith(("=", "+", "-", "@")) for cell in header)


def test_docx_table_with_control_characters(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    study = _study(tmp_path / "study", names=("A\x01\x0b", "B\ufffe"))
    output = tmp_path / "table.docx"
    status, _, err = _run(capsys, "table", study, "--format", "docx", "-o", output)
    assert status == 0, err
    from docx import Document

    texts = [cell.text for table in Document(str(output)).tables for cell in table.rows[0].cells]
    assert "A" in texts and "B" in texts


# --- --against in a real repository -------------------------------------------------------


@pytest.fixture
def repo(tmp_path: Path) -> Path:
    if shutil.which("git") is None:
        pytest.skip("git is not installed")
    root = tmp_path / "repo"
    _study(root / "study")
    git(root, "init", "-q")
    return root


def test_against_with_unused_unsafe_links(
    capsys: pytest.CaptureFixture[str], repo: Path, secret: Path
) -> None:
    (repo / "study" / "absolute.md").symlink_to(secret)
    (repo / "study" / "escaping.md").symlink_to("../../outside/secret.md")
    git(repo, "add", "-A")
    git(repo, "commit", "-qm", "one")
    status, out, err = _run(capsys, "check", repo / "study" / "study.toml", "--against", "HEAD")
    assert status == 1, err
    assert SECRET not in out


def test_against_with_a_used_unsafe_link(
    capsys: pytest.CaptureFixture[str], repo: Path, secret: Path
) -> None:
    study = _study(repo / "study", files=("a.md", "escaping.md"), write_lessons=False)
    (repo / "study" / "escaping.md").symlink_to("../../outside/secret.md")
    git(repo, "add", "-A")
    git(repo, "commit", "-qm", "one")
    status, out, err = _run(capsys, "check", study, "--against", "HEAD", "--allow-outside")
    _refused(status, out, err, "at HEAD", "escaping.md")
    assert "matcheck-rev-" not in err


def test_against_with_a_blob_above_the_file_limit(
    capsys: pytest.CaptureFixture[str], repo: Path
) -> None:
    (repo / "study" / "big.bin").write_bytes(b"\0" * 300_000)
    git(repo, "add", "-A")
    git(repo, "commit", "-qm", "one")
    study = repo / "study" / "study.toml"
    # Unused: left out, the check goes on.
    status, _, err = _run(
        capsys, "check", study, "--against", "HEAD", "--limit", "max_file_bytes=200000"
    )
    assert status == 1, err
    # Used: one line saying why.
    _study(repo / "study", files=("a.md", "big.bin"), write_lessons=False)
    git(repo, "commit", "-qam", "two")
    status, _, err = _run(
        capsys, "check", study, "--against", "HEAD", "--limit", "max_file_bytes=200000"
    )
    assert status == 2 and err.count("\n") == 1 and "max_file_bytes" in err, err


def test_against_with_a_study_linked_from_outside_the_repository(
    capsys: pytest.CaptureFixture[str], repo: Path, tmp_path: Path
) -> None:
    git(repo, "add", "-A")
    git(repo, "commit", "-qm", "one")
    elsewhere = _study(tmp_path / "elsewhere")
    link = repo / "study" / "linked.toml"
    link.symlink_to(elsewhere)
    _refused(*_run(capsys, "check", link, "--against", "HEAD", "--allow-outside"), "outside")


# --- bounded work ---------------------------------------------------------------------------


def test_a_huge_single_word_is_refused_before_analysis(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    lesson = tmp_path / "word.md"
    lesson.write_text("# Valves\n\nPump the tyre. " + "x" * 200_000 + "\n", encoding="utf-8")
    _refused(*_run(capsys, "profile", lesson), "max_token_chars")
    # A long URL is far below the limit (docs/limits.md).
    lesson.write_text("# Valves\n\nSee " + "https://example.org/" + "a" * 3000 + " now.\n")
    status, _, err = _run(capsys, "profile", lesson, "--format", "json")
    assert status == 0, err


def test_the_time_limit_covers_the_analysis(
    capsys: pytest.CaptureFixture[str], tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    import time

    import matcheck.api

    measure = matcheck.api.profile_document

    def slow(*args: object, **kwargs: object) -> object:
        time.sleep(3)  # an analysis that takes longer than the budget below
        return measure(*args, **kwargs)  # type: ignore[arg-type]

    monkeypatch.setattr(matcheck.api, "profile_document", slow)
    study = _study(tmp_path / "study")
    status, out, err = _run(capsys, "check", study, "--limit", "max_read_seconds=1")
    _refused(status, out, err, "max_read_seconds", "reading and measuring")


@pytest.mark.parametrize("key", ["files", "pilot"])
def test_data_files_outside_are_refused(
    capsys: pytest.CaptureFixture[str], tmp_path: Path, secret: Path, key: str
) -> None:
    study = _study(tmp_path / "study")
    other = "pilot" if key == "files" else "files"
    (study.parent / "inside.csv").write_text("learner,condition,Q1\n1,A,1\n", encoding="utf-8")
    study.write_text(
        study.read_text()
        + f'\n[data]\n{key} = ["{secret}"]\n{other} = ["inside.csv"]\nposttest = ["Q*"]\n'
    )
    _refused(*_run(capsys, "check", study), f"data.{key}", "outside")


def test_output_onto_a_data_file(capsys: pytest.CaptureFixture[str], tmp_path: Path) -> None:
    folder = tmp_path / "demo"
    shutil.copytree(DEMO, folder, ignore=shutil.ignore_patterns("*.json"))
    before = (folder / "learners.csv").read_bytes()
    _refused(*_run(capsys, "check", folder / "study.toml", "-o", folder / "learners.csv"), "input")
    assert (folder / "learners.csv").read_bytes() == before


def test_names_from_the_learners_data_are_shown_as_written(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    folder = tmp_path / "demo"
    shutil.copytree(DEMO, folder, ignore=shutil.ignore_patterns("*.json"))
    hostile = "text-bold[/]<b>\x1b[2J"
    for name in ("study.toml", "learners.csv"):
        path = folder / name
        text = path.read_text(encoding="utf-8").replace('"text-bold"', _toml(hostile))
        if name == "learners.csv":
            text = text.replace(",text-bold,", f",{hostile},")
        path.write_text(text, encoding="utf-8")
    status, out, err = _run(capsys, "check", folder / "study.toml")
    assert status == 1, err
    assert "text-bold[/]" in out and "\x1b" not in out
    status, out, err = _run(capsys, "check", folder / "study.toml", "--format", "markdown")
    assert status == 1, err
    assert "<b>" not in re.sub(r"(`+).*?\1", "", out) and "\x1b" not in out


def test_latex_and_text_tables_carry_no_control_characters(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    study = _study(tmp_path / "study", names=("A\x1b]0;x\x07", "B\x9b31m"))
    for fmt in ("latex", "text", "markdown"):
        status, out, err = _run(capsys, "table", study, "--format", fmt)
        assert status == 0, err
        assert not any(c in out for c in "\x1b\x07\x9b"), fmt


def test_json_keeps_names_exactly_and_inert(
    capsys: pytest.CaptureFixture[str], tmp_path: Path
) -> None:
    name = "A\x1b[2J\x9b31m\u2028x"
    study = _study(tmp_path / "study", names=(name, "B"))
    status, out, err = _run(capsys, "check", study, "--format", "json")
    assert status == 1, err
    assert not any(c in out for c in "\x1b\x9b\u2028")
    assert json.loads(out)["conditions"][0]["name"] == name  # RFC 8259 §7 escapes


@pytest.mark.parametrize("kind", ["fifo", "device"])
def test_a_study_file_that_is_not_a_file(
    capsys: pytest.CaptureFixture[str], tmp_path: Path, kind: str
) -> None:
    study = tmp_path / "study.toml"
    if kind == "fifo":
        os.mkfifo(study)
    else:
        study.symlink_to("/dev/zero")
    for command in ("check", "table"):
        _refused(*_run(capsys, command, study), "not a regular file")
