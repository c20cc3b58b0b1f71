"""Reviewing material changes: --against a Git revision, GitHub annotations, folders of
studies, and the pre-commit hook's entry point, all in a real temporary Git repository."""

from __future__ import annotations

import json
import re
import shutil
import subprocess
import sys
from pathlib import Path

import pytest
from gitrepo import git

from matcheck.cli import main

ROOT = Path(__file__).resolve().parent.parent
FIXTURES = ROOT / "fixtures" / "demo"
BASE = (FIXTURES / "text-only.md").read_text(encoding="utf-8")
DROPPED = next(p for p in BASE.split("\n\n") if p.startswith("Let out any air"))
STUDY = """
[study]
title = "Diagrams"
reference = "text"

[factors.diagrams]
levels = ["none", "with"]
manipulates = ["figures"]

[[conditions]]
name = "text"
files = ["text.md"]
levels = { diagrams = "none" }

[[conditions]]
name = "diagrams"
files = ["diagrams.md"]
levels = { diagrams = "with" }
"""


@pytest.fixture
def repo(tmp_path: Path) -> Path:
    if shutil.which("git") is None:
        pytest.skip("git is not installed")
    root = tmp_path / "materials"
    study = root / "study"
    (study / "images").mkdir(parents=True)
    for image in (FIXTURES / "images").iterdir():
        (study / "images" / image.name).write_bytes(image.read_bytes())
    (study / "text.md").write_text(BASE, encoding="utf-8")
    (study / "diagrams.md").write_text((FIXTURES / "diagrams.md").read_text("utf-8"), "utf-8")
    (study / "study.toml").write_text(STUDY, encoding="utf-8")
    git(root, "init", "-q")
    git(root, "add", ".")
    git(root, "commit", "-qm", "study")
    # The change under review: the diagrams version silently loses a paragraph.
    changed = (study / "diagrams.md").read_text("utf-8").replace(DROPPED + "\n\n", "")
    (study / "diagrams.md").write_text(changed, encoding="utf-8")
    git(root, "commit", "-qam", "edit diagrams")
    return root


def test_against_reports_the_change_and_the_broken_equivalence(
    repo: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    study = repo / "study" / "study.toml"
    status = main(["check", str(study), "--against", "HEAD~1", "--format", "json"])
    data = json.loads(capsys.readouterr().out)
    assert status == 1
    assert data["revision"] == "HEAD~1"
    regressions = data["regressions"]
    assert any(
        r.startswith("diagrams changed since HEAD~1") and "1 passage removed" in r
        for r in regressions
    )
    assert any(
        r.startswith("diagrams now differs from text in ") and "content (passages_removed)" in r
        for r in regressions
    )
    changes = [c for c in data["changes"] if c["dimension"] == "passages_removed"]
    assert changes and changes[0]["condition"] == "diagrams"
    assert changes[0]["evidence"][0]["location"]["section"] == "Removing the Tyre"
    # The working tree was not touched: git sees no change.
    porcelain = subprocess.run(
        ["git", "status", "--porcelain"], cwd=repo, capture_output=True, text=True, check=True
    )
    assert porcelain.stdout == ""


def test_unknown_revision_is_one_clear_line(repo: Path, capsys: pytest.CaptureFixture[str]) -> None:
    assert main(["check", str(repo / "study" / "study.toml"), "--against", "nope"]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "'nope' is not a revision" in err[0]


def test_github_annotations_point_at_the_file_and_line(
    repo: Path, capsys: pytest.CaptureFixture[str], monkeypatch: pytest.MonkeyPatch
) -> None:
    summary = repo / "summary.md"
    monkeypatch.setenv("GITHUB_STEP_SUMMARY", str(summary))
    monkeypatch.chdir(repo)
    assert main(["check", "study/study.toml", "--format", "github"]) == 1
    lines = capsys.readouterr().out.splitlines()
    # GitHub workflow commands: ::error file=...,line=...,title=...::message
    errors = [line for line in lines if line.startswith("::error ")]
    assert errors
    removed = next(line for line in errors if "passages_removed" in line)
    match = re.match(r"::error file=([^,]+),line=(\d+),title=([^:]+)::(.+)", removed)
    assert match is not None
    assert match.group(1) == "study/text.md"  # the removed passage stands in the reference
    line = int(match.group(2))
    assert BASE.splitlines()[line - 1].startswith("Let out any air")
    assert "%0A" in match.group(4)  # newlines escaped as the workflow-command format requires
    assert "matcheck report" in summary.read_text(encoding="utf-8")


def test_folder_of_studies_in_parallel(repo: Path, capsys: pytest.CaptureFixture[str]) -> None:
    clean = repo / "clean"
    shutil.copytree(repo / "study", clean)
    (clean / "diagrams.md").write_text((FIXTURES / "diagrams.md").read_text("utf-8"), "utf-8")
    (repo / "pyproject.toml").write_text("[project]\nname = 'x'\n", encoding="utf-8")
    assert main(["check", str(repo), "--jobs", "2", "--format", "json"]) == 1
    data = json.loads(capsys.readouterr().out)
    verdicts = {
        Path(s["path"]).parent.name: s["report"]["summary"]["verdict"] for s in data["studies"]
    }
    assert verdicts == {"clean": "matched", "study": "differs"}
    assert main(["check", str(clean), "--jobs", "1"]) == 0


ADDED = (
    "Rim tape covers the spoke holes inside the rim. Check that it sits centred and has no "
    "tears, because a spoke end that touches the inner tube wears a fresh puncture within days."
)


def test_against_new_differences_are_errors_and_old_ones_notices(
    repo: Path, capsys: pytest.CaptureFixture[str], monkeypatch: pytest.MonkeyPatch
) -> None:
    # At HEAD the diagrams version already lacks a paragraph (committed by the fixture);
    # the pull request under review now adds a passage the text version does not have.
    study = repo / "study"
    diagrams = (study / "diagrams.md").read_text("utf-8")
    anchor = "Put just enough air"
    (study / "diagrams.md").write_text(diagrams.replace(anchor, ADDED + "\n\n" + anchor), "utf-8")
    git(repo, "commit", "-qam", "add a passage on rim tape")
    summary = repo / "summary.md"
    monkeypatch.setenv("GITHUB_STEP_SUMMARY", str(summary))
    monkeypatch.chdir(repo)
    assert main(["check", "study/study.toml", "--against", "HEAD~1", "--format", "github"]) == 1
    lines = capsys.readouterr().out.splitlines()
    added = next(line for line in lines if "passages_added" in line)
    removed = next(line for line in lines if "passages_removed" in line)
    # Source: GitHub workflow commands, docs/references.md §23 (::error / ::notice file,line).
    match = re.match(r"::error file=([^,]+),line=(\d+),title=[^:]+::(.+)", added)
    assert match is not None, added
    assert match.group(1) == "study/diagrams.md"
    new_lines = (study / "diagrams.md").read_text("utf-8").splitlines()
    assert new_lines[int(match.group(2)) - 1].startswith("Rim tape covers")
    assert match.group(3).startswith("new since HEAD~1: ")
    match = re.match(r"::notice file=([^,]+),line=(\d+),title=[^:]+::(.+)", removed)
    assert match is not None, removed
    assert match.group(1) == "study/text.md"
    assert BASE.splitlines()[int(match.group(2)) - 1].startswith("Let out any air")
    assert match.group(3).startswith("already at HEAD~1: ")
    # The step summary lists the new problem first.
    text = summary.read_text("utf-8")
    new_at, old_at = text.index("### New since `HEAD~1`"), text.index("### Already at `HEAD~1`")
    assert new_at < old_at
    assert "passages_added" in text[new_at:old_at]
    assert "passages_removed" in text[old_at : text.index("###", old_at + 4)]
    assert "passages_removed" not in text[new_at:old_at]
    capsys.readouterr()
    assert main(["check", "study/study.toml", "--against", "HEAD~1", "--format", "json"]) == 1
    findings = json.loads(capsys.readouterr().out)["findings"]
    new = {f["dimension"]: f["new"] for f in findings if f["status"] == "differs"}
    assert new["passages_added"] is True and new["passages_removed"] is False


def test_against_a_grown_difference_is_new(repo: Path, capsys: pytest.CaptureFixture[str]) -> None:
    # The same measure differed at HEAD~1, but the pull request makes it larger.
    study = repo / "study"
    (study / "study.toml").write_text(STUDY + '\n[tolerances]\nwords = "3%"\n', "utf-8")
    git(repo, "commit", "-qam", "agree a tolerance")
    other = next(p for p in BASE.split("\n\n") if p.startswith("Before you patch"))
    diagrams = (study / "diagrams.md").read_text("utf-8").replace(other + "\n\n", "")
    (study / "diagrams.md").write_text(diagrams, "utf-8")
    git(repo, "commit", "-qam", "drop another paragraph")
    main(["check", str(study / "study.toml"), "--against", "HEAD~1", "--format", "json"])
    findings = json.loads(capsys.readouterr().out)["findings"]
    words = next(f for f in findings if f["dimension"] == "words")
    assert words["status"] == "differs" and words["new"] is True  # −4.8% then, −10% now


def _two_studies(tmp_path: Path) -> Path:
    if shutil.which("git") is None:
        pytest.skip("git is not installed")
    root = tmp_path / "materials"
    for name in ("bikes", "brakes"):
        study = root / name
        (study / "images").mkdir(parents=True)
        for image in (FIXTURES / "images").iterdir():
            (study / "images" / image.name).write_bytes(image.read_bytes())
        (study / "text.md").write_text(BASE, encoding="utf-8")
        diagrams = (FIXTURES / "diagrams.md").read_text("utf-8")
        (study / "diagrams.md").write_text(diagrams, "utf-8")
        (study / "study.toml").write_text(STUDY, encoding="utf-8")
    (root / "README.md").write_text("Lesson materials.\n", encoding="utf-8")
    git(root, "init", "-q")
    git(root, "add", ".")
    git(root, "commit", "-qm", "two studies")
    return root


def _hook_command() -> list[str]:
    """The hook's entry as .pre-commit-hooks.yaml declares it, run with this interpreter."""
    text = (ROOT / ".pre-commit-hooks.yaml").read_text(encoding="utf-8")
    entry = re.search(r"^\s*entry:\s*(.+)$", text, re.MULTILINE)
    assert entry is not None and "pass_filenames: true" in text
    command = entry.group(1).split()
    assert command[0] == "matcheck"
    # pre-commit runs the entry from the repository root; the installed console script is
    # `matcheck`, run here as `python -m matcheck` so the test uses this interpreter.
    return [sys.executable, "-m", "matcheck", *command[1:]]


def _staged(repo: Path) -> list[str]:
    """The staged files that the hook's `files` pattern selects, as pre-commit passes them."""
    text = (ROOT / ".pre-commit-hooks.yaml").read_text(encoding="utf-8")
    found = re.search(r"^\s*files:\s*(.+)$", text, re.MULTILINE)
    assert found is not None
    names = subprocess.run(
        ["git", "diff", "--cached", "--name-only"],
        cwd=repo,
        capture_output=True,
        text=True,
        check=True,
    ).stdout.split()
    return [name for name in names if re.search(found.group(1).strip(), name)]


def test_pre_commit_hook_checks_only_the_studies_with_staged_files(tmp_path: Path) -> None:
    repo = _two_studies(tmp_path)
    # Only the second study changes: its diagrams version loses a paragraph.
    brakes = repo / "brakes" / "diagrams.md"
    brakes.write_text(brakes.read_text("utf-8").replace(DROPPED + "\n\n", ""), "utf-8")
    git(repo, "add", "brakes/diagrams.md")
    command = _hook_command()
    for extra in (_staged(repo), []):  # as pre-commit passes the files; as a plain Git hook
        result = subprocess.run(
            [*command, *extra], cwd=repo, capture_output=True, text=True, check=False
        )
        assert result.returncode == 1, result.stderr
        assert "checking 1 of 2 studies, those with staged files: brakes/study.toml" in (
            result.stderr
        )
        assert "brakes/study.toml" in result.stdout and "bikes" not in result.stdout
        assert "Traceback" not in result.stderr
    # Nothing of a study staged: nothing to check, the commit goes ahead.
    git(repo, "reset", "-q")
    (repo / "README.md").write_text("Lesson materials, autumn.\n", encoding="utf-8")
    git(repo, "add", "README.md")
    result = subprocess.run(
        [*command, *_staged(repo)], cwd=repo, capture_output=True, text=True, check=False
    )
    assert result.returncode == 0 and "nothing to check" in result.stderr
    # A study file staged on its own counts as that study's change.
    study = repo / "bikes" / "study.toml"
    study.write_text(STUDY + "# reviewed\n", encoding="utf-8")
    git(repo, "add", "bikes/study.toml")
    result = subprocess.run(
        [*command, *_staged(repo)], cwd=repo, capture_output=True, text=True, check=False
    )
    assert result.returncode == 0, result.stdout + result.stderr
    assert "those with staged files: bikes/study.toml" in result.stderr


def test_github_annotation_names_the_part_of_a_lesson_in_parts(
    repo: Path, capsys: pytest.CaptureFixture[str], monkeypatch: pytest.MonkeyPatch
) -> None:
    # The diagrams condition in two files: the removed paragraph's counterpart context is in
    # part 2, so an annotation about it must point at part 2, not part 1.
    study = repo / "study"
    text = (study / "text.md").read_text("utf-8")
    cut = text.index("## Removing the Tyre")
    (study / "text-1.md").write_text(text[:cut], "utf-8")
    (study / "text-2.md").write_text(text[cut:], "utf-8")
    (study / "study.toml").write_text(
        STUDY.replace('files = ["text.md"]', 'files = ["text-1.md", "text-2.md"]'), "utf-8"
    )
    monkeypatch.chdir(repo)
    assert main(["check", "study/study.toml", "--format", "github"]) == 1
    removed = next(
        line for line in capsys.readouterr().out.splitlines() if "passages_removed" in line
    )
    match = re.match(r"::error file=([^,]+),line=(\d+),", removed)
    assert match is not None and match.group(1) == "study/text-2.md"
    part_two = (study / "text-2.md").read_text("utf-8").splitlines()
    assert part_two[int(match.group(2)) - 1].startswith("Let out any air")


def test_step_summary_of_a_folder_lists_every_study_s_new_problems_first(
    tmp_path: Path, capsys: pytest.CaptureFixture[str], monkeypatch: pytest.MonkeyPatch
) -> None:
    repo = _two_studies(tmp_path)
    brakes = repo / "brakes" / "diagrams.md"
    brakes.write_text(brakes.read_text("utf-8").replace(DROPPED + "\n\n", ""), "utf-8")
    git(repo, "commit", "-qam", "the brakes lesson loses a paragraph")
    summary = repo / "summary.md"
    monkeypatch.setenv("GITHUB_STEP_SUMMARY", str(summary))
    monkeypatch.chdir(repo)
    args = ["check", ".", "--against", "HEAD~1", "--format", "github", "--jobs", "1"]
    assert main(args) == 1
    errors = [x for x in capsys.readouterr().out.splitlines() if x.startswith("::error ")]
    assert errors and all("new since HEAD~1: " in x for x in errors)
    assert any("file=brakes/text.md" in x and "passages_removed" in x for x in errors)
    text = summary.read_text("utf-8")
    assert text.startswith("## New since `HEAD~1` in 2 studies")
    digest = text[: text.index("## matcheck report")]
    assert "0 new, 0 already there" in digest and "passages_removed" in digest


def test_against_in_the_html_report(repo: Path, tmp_path: Path) -> None:
    study = repo / "study" / "study.toml"
    page = tmp_path / "report.html"
    assert main(["check", str(study), "--against", "HEAD~1", "-f", "html", "-o", str(page)]) == 1
    text = page.read_text(encoding="utf-8")
    assert "<h2>Since HEAD~1</h2>" in text
    assert "diagrams changed since HEAD~1" in text
    # The change itself, in the table of what changed: the passage the revision removed.
    changes = text[text.index("<h2>Since HEAD~1</h2>") :]
    assert "<td>diagrams</td><td>passages_removed</td>" in changes
