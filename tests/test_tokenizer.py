"""matcheck's port of spaCy's English tokenizer against spaCy itself (docs/references.md §30).

spaCy is the reference: ``spacy.blank("en")`` must give the same tokens (text and character
offset) as :mod:`matcheck.language.tokenizer` on every paragraph of the fixture lessons (read
by matcheck's readers from real converters' DOCX, PDF and Markdown), on cases picked for the
tokenizer's special rules, and on generated strings.
"""

from __future__ import annotations

import json
import pickle
import re
import subprocess
import sys
from functools import cache
from pathlib import Path

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from matcheck.language.tokenizer import Tokenizer, TokenizerRules, rules_from_spacy

ROOT = Path(__file__).resolve().parent.parent

HARD_CASES = [
    "don't",
    "Don't stop.",
    "CAN'T",
    "ca n't",
    "cannot",
    "gonna",
    "y'all",
    "ain't",
    "'Cause",
    "it’s",
    "’s",
    "ʼs",
    "''hello''",
    "rock'n'roll",
    "co-op's",
    "e.g., this",
    "i.e.)",
    "(Mr. Smith's bike)",
    "U.S.A. and U.K.",
    "Fig. 3",
    "vs.",
    "Dr.",
    "St.Paul",
    "A.",
    "A.B",
    "10a.m. ok",
    "a.m.,",
    "5km/h",
    "$5.00",
    "50%",
    "3-4",
    "1,000,000",
    "well-known",
    "a—b",
    "—",
    "wait...",
    "C++ code",
    ":-) fine",
    "x:)",
    "(:",
    "o.O",
    "<3",
    "(╯°□°）╯︵┻━┻",
    "http://example.com/a?b=1.",
    "https://ex.org).",
    "foo@bar.com",
    "  two  spaces ",
    "\ttab\nnew line",
    " lead",
    "a\u00a0b",
    "“quoted”",
    "'s",
    "''",
]


@cache
def _spacy():  # type: ignore[no-untyped-def]
    import spacy

    return spacy.blank("en")


@cache
def _port() -> Tokenizer:
    return Tokenizer(rules_from_spacy())


def _same(text: str) -> None:
    expected = [(token.idx, token.text) for token in _spacy()(text)]
    assert [(token.idx, token.text) for token in _port().tokens(text)] == expected


@pytest.mark.parametrize("text", HARD_CASES)
def test_hard_cases_are_tokenised_as_spacy_does(text: str) -> None:
    _same(text)


def _fixture_blocks() -> list[str]:
    from matcheck.readers import read

    texts = []
    for path in sorted((ROOT / "fixtures").rglob("*")):
        if path.suffix.lower() in {".md", ".txt", ".docx", ".pdf"} and path.name != "README.md":
            texts.extend(block.text for block in read(path).blocks)
    return texts


def test_every_fixture_paragraph_is_tokenised_as_spacy_does() -> None:
    texts = _fixture_blocks()
    assert len(texts) > 500  # the converters' fixtures are all there
    mismatched = [
        text
        for text in texts
        if [(t.idx, t.text) for t in _spacy()(text)]
        != [(t.idx, t.text) for t in _port().tokens(text)]
    ]
    assert mismatched == []


PIECES = st.sampled_from(
    [
        "a",
        "B",
        "x",
        "é",
        "ß",
        "1",
        "9",
        ".",
        ",",
        ";",
        ":",
        "!",
        "?",
        "'",
        '"',
        "(",
        ")",
        "[",
        "]",
        "-",
        "–",
        "—",
        "/",
        "\\",
        "$",
        "%",
        "&",
        "*",
        "+",
        "<",
        "=",
        ">",
        "@",
        "#",
        "_",
        "’",
        "“",
        "”",
        "…",
        "😀",
        " ",
        "  ",
        "\n",
        "\t",
        "\u00a0",
        "n't",
        "'s",
        "e.g.",
        "Mr.",
        "a.m.",
        "http://",
        "www.",
        ".com",
        ":)",
        "U.S.",
        "can",
        "'ll",
        "co-op",
        "10",
        "km",
    ]
)


@settings(max_examples=600, deadline=None)
@given(st.lists(PIECES, min_size=1, max_size=14).map("".join))
def test_generated_strings_are_tokenised_as_spacy_does(text: str) -> None:
    _same(text)


def test_white_space_runs_are_str_isspace() -> None:
    # spaCy tests each character with isspace(); the port finds runs with \s.
    pattern = re.compile(r"\s")
    assert all(
        bool(pattern.match(chr(code))) == chr(code).isspace() for code in range(sys.maxunicode + 1)
    )


def test_rules_survive_being_stored() -> None:
    rules = rules_from_spacy()
    stored = pickle.loads(pickle.dumps(rules))
    assert isinstance(stored, TokenizerRules) and stored == rules
    text = "Don't remove the valve (see Fig. 2), e.g. at 5 p.m.; it's well-known."
    assert Tokenizer(stored).tokens(text) == Tokenizer(rules).tokens(text)


def test_a_cached_run_does_not_import_spacy(tmp_path: Path) -> None:
    # The rules come from the cache once stored: a re-check does not pay spaCy's import.
    lesson = tmp_path / "lesson.md"
    lesson.write_text("# Valves\n\nDon't over-tighten the valve. Check it after 2 days.\n")
    probe = (
        "import sys\n"
        "from pathlib import Path\n"
        "from matcheck.api import measure_version, Version\n"
        "from matcheck.cache import Cache\n"
        "from matcheck.limits import DEFAULT_LIMITS\n"
        "from matcheck.settings import Settings\n"
        "path = Path(sys.argv[1])\n"
        "profile = measure_version(Version('v', (path,)), Settings(), DEFAULT_LIMITS, "
        "Cache.default())\n"
        "print('spacy' in sys.modules, profile.get('words').value)\n"
    )
    env = {"MATCHECK_CACHE_DIR": str(tmp_path / "cache"), "PATH": "/usr/bin:/bin"}
    first = subprocess.run(
        [sys.executable, "-c", probe, str(lesson)], capture_output=True, text=True, env=env
    )
    assert first.returncode == 0, first.stderr
    # spaCy gives the rules once, unless the packaged copy is of the installed release.
    from matcheck.language.tables import library_version
    from matcheck.language.tokenizer import packaged_rules

    packaged = packaged_rules()
    same_release = packaged is not None and packaged[0] == library_version("spacy")
    assert first.stdout.split() == [str(not same_release), "10.0"]
    lesson.write_text("# Valves\n\nDon't over-tighten the valve. Check it after 3 days.\n")
    second = subprocess.run(
        [sys.executable, "-c", probe, str(lesson)], capture_output=True, text=True, env=env
    )
    assert second.returncode == 0, second.stderr
    assert second.stdout.split() == ["False", "10.0"]


def test_the_packaged_rules_are_the_installed_spacys_or_unused(
    monkeypatch: pytest.MonkeyPatch,
) -> None:
    # scripts/build_tokenizer_rules.py wrote them; they serve only the release they came from.
    from matcheck.language import tables, tokenizer

    packaged = tokenizer.packaged_rules()
    assert packaged is not None
    release, rules = packaged
    if release == tables.library_version("spacy"):
        assert rules == rules_from_spacy()
    monkeypatch.setattr(tables, "library_version", lambda name: "0.0-other")
    taken: list[int] = []
    monkeypatch.setattr(tokenizer, "rules_from_spacy", lambda: taken.append(1) or rules)
    tokenizer.installed_rules()
    assert taken == [1]  # another release: the rules come from spaCy itself


def test_a_recheck_after_an_edit_imports_neither_spacy_nor_scipy(tmp_path: Path) -> None:
    # docs/performance.md: a re-check after one edited file must stay under a second; spaCy
    # (~0.6 s) and scipy (~0.15 s, its array layer walks all of numpy) are not needed for it.
    for name, extra in (("a.md", ""), ("b.md", " Check it again after a week.")):
        (tmp_path / name).write_text(
            "# Valves\n\nDon't over-tighten the valve; a quarter turn past snug is enough."
            f"{extra}\n\n## Leaks\n\nA slow leak shows as bubbles in soapy water.\n",
            encoding="utf-8",
        )
    (tmp_path / "study.toml").write_text(
        '[study]\ntitle = "Valves"\n\n[[conditions]]\nname = "a"\nfiles = ["a.md"]\n\n'
        '[[conditions]]\nname = "b"\nfiles = ["b.md"]\n',
        encoding="utf-8",
    )
    probe = (
        "import atexit, sys\n"
        "atexit.register(lambda: sys.stderr.write("
        "'MODULES ' + ' '.join(sorted(m for m in ('spacy', 'scipy') if m in sys.modules))))\n"
        "from matcheck.cli import main\n"
        "sys.argv = ['matcheck', 'check', sys.argv[1], '-f', 'json']\n"
        "main()\n"
    )
    env = {"MATCHECK_CACHE_DIR": str(tmp_path / "cache"), "PATH": "/usr/bin:/bin"}
    study = str(tmp_path / "study.toml")
    subprocess.run([sys.executable, "-c", probe, study], capture_output=True, env=env)
    (tmp_path / "b.md").write_text(
        (tmp_path / "b.md").read_text(encoding="utf-8").replace("a week", "ten days"),
        encoding="utf-8",
    )
    again = subprocess.run([sys.executable, "-c", probe, study], capture_output=True, env=env)
    report = json.loads(again.stdout)
    assert report["cache"] == {"files": 2, "from_cache": 1}
    assert again.stderr.decode().strip().endswith("MODULES"), again.stderr.decode()[-300:]
