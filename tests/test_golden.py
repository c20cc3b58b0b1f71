"""Golden outputs: the demo's reports in every format, compared byte for byte.

These files are the project's own reviewed output, not an outside reference: they make the
effect of a refactor or a change of wording visible as a diff. After a reviewed change,
regenerate them with

    MATCHECK_UPDATE_GOLDEN=1 pytest tests/test_golden.py

and commit the diff with the change that caused it.
"""

from __future__ import annotations

import os
import re
import zipfile
from pathlib import Path

import pytest

from matcheck import __version__
from matcheck.cli import main

ROOT = Path(__file__).resolve().parent.parent
GOLDEN = Path(__file__).resolve().parent / "golden"
UPDATE = os.environ.get("MATCHECK_UPDATE_GOLDEN") == "1"

STUDY = "fixtures/demo/study.toml"
PAIR = ("fixtures/demo/text-only.md", "fixtures/demo/diagrams-confounded.docx")

CASES: dict[str, list[str]] = {
    "profile.txt": ["profile", "fixtures/demo/text-only.docx"],
    "profile.json": ["profile", "fixtures/demo/text-only.docx", "--format", "json"],
    "compare.txt": ["compare", *PAIR, "--manipulated", "figures"],
    "compare.json": ["compare", *PAIR, "--manipulated", "figures", "--format", "json"],
    "compare.md": ["compare", *PAIR, "--manipulated", "figures", "--format", "markdown"],
    "check.txt": ["check", STUDY],
    "check.json": ["check", STUDY, "--format", "json"],
    "check.md": ["check", STUDY, "--format", "markdown"],
    "check.github": ["check", STUDY, "--format", "github"],
    "table.md": ["table", STUDY, "--format", "markdown"],
    "table.csv": ["table", STUDY, "--format", "csv"],
    "table.tex": ["table", STUDY, "--format", "latex"],
    "table.prose.txt": ["table", STUDY, "--format", "text"],
}


@pytest.fixture(autouse=True)
def _stable_environment(monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.chdir(ROOT)
    monkeypatch.setenv("COLUMNS", "120")
    monkeypatch.setenv("NO_COLOR", "1")
    monkeypatch.delenv("FORCE_COLOR", raising=False)
    monkeypatch.delenv("GITHUB_STEP_SUMMARY", raising=False)


def _normalise(text: str) -> str:
    # The tool's version is not part of what the golden files pin down.
    return text.replace(f'"version": "{__version__}"', '"version": "X"')


def _compare(name: str, actual: str) -> None:
    path = GOLDEN / name
    if UPDATE:
        path.write_text(actual, encoding="utf-8", newline="")
        return
    assert path.exists(), f"{name} missing: run MATCHECK_UPDATE_GOLDEN=1 pytest {__file__}"
    with path.open(encoding="utf-8", newline="") as handle:
        expected = handle.read()
    assert actual == expected, f"{name} changed; review the diff and regenerate (module doc)"


@pytest.mark.parametrize("name", sorted(CASES))
def test_golden_output(name: str, capsys: pytest.CaptureFixture[str]) -> None:
    # The golden files pin a cold run; tests/test_cache.py checks a warm run says the same.
    main([*CASES[name], "--no-cache"])
    _compare(name, _normalise(capsys.readouterr().out))


def test_golden_word_table(tmp_path: Path) -> None:
    target = tmp_path / "table.docx"
    assert main(["table", STUDY, "--format", "docx", "-o", str(target), "--no-cache"]) == 0
    with zipfile.ZipFile(target) as archive:
        xml = archive.read("word/document.xml").decode("utf-8")
    # One element a line, so that a change shows as a readable diff.
    _compare("table.docx.xml", re.sub(r">\s*<", ">\n<", xml) + "\n")
