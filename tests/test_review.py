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


def _git(repo: Path, *args: str) -> None:
    subprocess.run(
        ["git", "-c", "user.name=t", "-c", "user.email=t@example.org", *args],
        cwd=repo,
        check=True,
        capture_output=True,
    )


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
    _git(root, "init", "-q")
    _git(root, "add", ".")
    _git(root, "commit", "-qm", "study")
    # The change under review: the diagrams version silently loses a paragraph.
    changed = (study / "diagrams.md").read_text("utf-8").replace(DROPPED + "\n\n", "")
    (study / "diagrams.md").write_text(changed, encoding="utf-8")
    _git(root, "commit", "-qam", "edit diagrams")
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


def test_pre_commit_hook_entry_runs_as_pre_commit_would(repo: Path) -> None:
    text = (ROOT / ".pre-commit-hooks.yaml").read_text(encoding="utf-8")
    entry = re.search(r"^\s*entry:\s*(.+)$", text, re.MULTILINE)
    args = re.search(r"^\s*args:\s*\[(.*)\]$", text, re.MULTILINE)
    assert entry and args and "pass_filenames: false" in text
    command = entry.group(1).split() + [a.strip().strip("\"'") for a in args.group(1).split(",")]
    assert command[0] == "matcheck"
    # pre-commit runs the entry from the repository root; the installed console script is
    # `matcheck`, run here as `python -m matcheck` so the test uses this interpreter.
    result = subprocess.run(
        [sys.executable, "-m", "matcheck", *command[1:]],
        cwd=repo,
        capture_output=True,
        text=True,
        check=False,
    )
    assert result.returncode == 1, result.stderr
    assert "Traceback" not in result.stderr


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
