"""The project cites its sources inside the repository, by section of docs/references.md.

Two checks keep that true as code is added: no text file names a path outside the
repository or of one machine (a home or working directory), and every section a file cites
as ``docs/references.md §N`` (or ``§N.M``) exists there as a heading.
"""

from __future__ import annotations

import re
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
REFERENCES = ROOT / "docs" / "references.md"
# What the repository ships as text; generated outputs (tests/golden) and data are not prose.
TEXT_SUFFIXES = {".py", ".md", ".toml", ".yml", ".yaml", ".txt", ".cfg", ".ini", ".sh", ""}
TOP_LEVEL = ("matcheck", "tests", "scripts", "benchmarks", "docs", "fixtures", ".ci")
SKIP = {ROOT / "tests" / "golden"}
# Built from pieces so that this file does not match itself.
MACHINE_PATHS = re.compile("|".join(("/" + "work/", "/" + "root/", "/" + "home/", "/" + "Users/")))
OUTSIDE_SHEET = re.compile(r"\b" + "REFERENCES" + r"\.md\b")  # an outside copy of the sources
CITATION = re.compile(r"§(\d+)(?:\.(\d+))?")


def _text_files() -> list[Path]:
    # Top-level dotfiles are tooling state (a worktree's .git file names its main checkout),
    # except the two the repository ships.
    shipped = {".gitignore", ".pre-commit-hooks.yaml"}
    files = [
        p
        for p in sorted(ROOT.iterdir())
        if p.is_file() and p.suffix in TEXT_SUFFIXES and (p.name in shipped or p.name[0] != ".")
    ]
    for top in TOP_LEVEL:
        for path in sorted((ROOT / top).rglob("*")):
            if any(path.is_relative_to(skip) for skip in SKIP) or "__pycache__" in path.parts:
                continue
            if path.is_file() and path.suffix in TEXT_SUFFIXES and path.stat().st_size < 2**20:
                files.append(path)
    return files


def _read(path: Path) -> str:
    return path.read_text(encoding="utf-8", errors="replace")


def _sections() -> set[str]:
    headings = re.findall(r"^#{2,3} §(\d+(?:\.\d+)?) ", _read(REFERENCES), flags=re.M)
    return set(headings)


def test_the_text_files_are_found() -> None:
    names = {path.relative_to(ROOT).as_posix() for path in _text_files()}
    assert {"README.md", "docs/references.md", "matcheck/measures/formulas.py"} <= names


@pytest.mark.parametrize("path", _text_files(), ids=lambda p: p.relative_to(ROOT).as_posix())
def test_no_path_outside_the_repository(path: Path) -> None:
    text = _read(path)
    assert not MACHINE_PATHS.search(text), "a path of one machine"
    assert not OUTSIDE_SHEET.search(text), "cite docs/references.md by section instead"


def test_references_sections_are_numbered_in_order() -> None:
    numbers = [int(n) for n in re.findall(r"^## §(\d+) ", _read(REFERENCES), flags=re.M)]
    assert numbers == list(range(1, len(numbers) + 1))


def test_every_cited_section_exists() -> None:
    sections = _sections()
    missing: list[str] = []
    checked = 0
    for path in _text_files():
        if path == REFERENCES:
            continue
        lines = _read(path).splitlines()
        for index, line in enumerate(lines):
            if "docs/references.md" not in line:
                continue
            # A citation may wrap: "(docs/references.md\n# §2.5)".
            window = line + " " + (lines[index + 1] if index + 1 < len(lines) else "")
            for major, minor in CITATION.findall(window):
                cited = f"{major}.{minor}" if minor else major
                checked += 1
                if cited not in sections:
                    missing.append(f"{path.relative_to(ROOT)}:{index + 1}: §{cited}")
    assert checked, "no citation found: the pattern no longer matches how files cite"
    assert not missing, missing
