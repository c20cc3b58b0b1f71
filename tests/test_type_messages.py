"""A wrong TYPE in the study file names the type expected and the type found (issue 20).

The type names are TOML 1.0's (string, integer, float, boolean, array, table, date-time),
since the study file is TOML (docs/study-file.md); ``tomllib`` reads each as the Python type
the TOML specification maps it to (Python docs, tomllib conversion table).
"""

from __future__ import annotations

import tomllib
from pathlib import Path

import pytest

from matcheck.cli import main
from matcheck.errors import ConfigError
from matcheck.study import load_study
from matcheck.valuetypes import got, toml_type

ACCEPTED = '[[accepted]]\nmeasure = "words"\nreference = "a"\ncondition = "b"\n'
STUDY = """
[study]
title = "Bleeding a radiator"
{study}

[[conditions]]
name = "a"
files = ["a.md"]

[[conditions]]
name = "b"
files = ["b.md"]
{tail}
"""


def _message(tmp_path: Path, study: str = "", tail: str = "") -> str:
    for name in ("a", "b"):
        (tmp_path / f"{name}.md").write_text("Close the valve. Open the screw.\n", "utf-8")
    (tmp_path / "learners.csv").write_text("learner,condition,Q1\n1,a,1\n2,b,0\n", "utf-8")
    path = tmp_path / "study.toml"
    path.write_text(STUDY.format(study=study, tail=tail), encoding="utf-8")
    with pytest.raises(ConfigError) as raised:
        load_study(path)
    return str(raised.value)


@pytest.mark.parametrize(
    ("study", "tail", "expected"),
    [
        # The case of the issue: in range, but a string.
        (
            'reading_rate = "238"',
            "",
            "study.reading_rate must be a number (words per minute), not the string '238'; "
            "write it without quotes",
        ),
        (
            "",
            '[posttest]\ncoverage_threshold = "0.7"',
            "posttest.coverage_threshold must be a number (a share between 0 and 1), "
            "not the string '0.7'; write it without quotes",
        ),
        (
            "",
            "[comparison]\nalpha = true",
            "comparison.alpha must be a number, not the boolean True",
        ),
        (
            "",
            '[tolerances]\nwords = ["5%"]',
            'tolerances.words must be a number or a percentage string like "3%", '
            "not the array ['5%']",
        ),
        (
            "",
            '[data]\nfiles = ["learners.csv"]\nposttest = ["Q1"]\nsmallest_effect = "0.5"',
            "data.smallest_effect must be a number above 0 and at most 5, "
            "not the string '0.5'; write it without quotes",
        ),
        (
            "",
            '[data]\nfiles = ["learners.csv"]\nposttest = ["Q1"]\ntime = 3',
            "data.time must be a column name (a string), not the integer 3",
        ),
        (
            "",
            '[sample]\nper_condition = "40"\nsmallest_effect = 0.5',
            "sample.per_condition must be",
        ),
        (
            "",
            '[sample]\nper_condition = 40\nsmallest_effect = 0.5\none_sided = "yes"',
            "sample.one_sided must be true or false (a boolean), not the string 'yes'",
        ),
        (
            "",
            ACCEPTED + 'up_to = true\nreason = "merged"',
            "accepted #1.up_to must be the largest difference accepted, with its sign: a "
            'number in the measure\'s unit (-59) or a percentage of the reference value ("-6%"), '
            "not the boolean True",
        ),
        (
            "",
            ACCEPTED + "up_to = -5\nreason = 3",
            "accepted #1.reason must be a non-empty string, not the integer 3",
        ),
    ],
)
def test_a_wrong_type_names_the_type_expected_and_found(
    tmp_path: Path, study: str, tail: str, expected: str
) -> None:
    assert expected in _message(tmp_path, study, tail)


def test_a_number_in_quotes_for_the_sample_says_to_drop_them(tmp_path: Path) -> None:
    message = _message(tmp_path, tail='[sample]\nper_condition = "40"\nsmallest_effect = 0.5')
    assert "not the string '40'; write it without quotes" in message


def test_out_of_range_keeps_the_range_message(tmp_path: Path) -> None:
    message = _message(tmp_path, study="reading_rate = 5000")
    assert "study.reading_rate must be words per minute, 20 to 2000, not 5000" in message


def test_toml_type_names_follow_the_toml_specification() -> None:
    parsed = tomllib.loads(
        's = "x"\ni = 1\nf = 1.5\nb = true\na = [1]\nt = {x = 1}\n'
        "d = 2026-01-02\ndt = 2026-01-02T03:04:05\ntm = 03:04:05\n"
    )
    names = {key: toml_type(value) for key, value in parsed.items()}
    assert names == {
        "s": "string",
        "i": "integer",
        "f": "float",
        "b": "boolean",
        "a": "array",
        "t": "table",
        "d": "date",
        "dt": "date-time",
        "tm": "time",
    }
    assert got("abc") == "not the string 'abc'"  # not a number: no advice about quotes
    assert got("0.5").endswith("write it without quotes")
    assert got("3%") == "not the string '3%'"  # a percentage stays a string in TOML


def test_the_cli_prints_one_line_and_exits_2(
    tmp_path: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    _message(tmp_path, study='reading_rate = "238"')
    assert main(["check", str(tmp_path / "study.toml")]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "not the string '238'" in err[0]
