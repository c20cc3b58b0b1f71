"""``matcheck power`` on the command line: the three modes, JSON, and bad input (exit 2)."""

from __future__ import annotations

import json
from typing import Any

import pytest

from matcheck.cli import main


def _run(capsys: pytest.CaptureFixture[str], *args: str) -> tuple[int, str, str]:
    status = main(["power", *args])
    captured = capsys.readouterr()
    return status, captured.out, captured.err


def _json(capsys: pytest.CaptureFixture[str], *args: str) -> Any:
    status, out, err = _run(capsys, *args, "--format", "json")
    assert status == 0, err
    return json.loads(out)


def test_three_modes_agree(capsys: pytest.CaptureFixture[str]) -> None:
    # Cohen's table: d = 0.5, power .80, α = .05 two-sided → 64 per group (references §6).
    needed = _json(capsys, "--effect", "0.5", "--power", "0.8")
    assert needed["mode"] == "n" and needed["n_per_group"] == 64
    assert needed["effect"] == 0.5 and needed["power"] >= 0.8
    power = _json(capsys, "--n", "64", "--effect", "0.5")
    assert power["mode"] == "power" and power["power"] == pytest.approx(needed["power"])
    sensitivity = _json(capsys, "--n", "64", "--power", "0.8")
    assert sensitivity["mode"] == "sensitivity" and sensitivity["effect"] <= 0.5


def test_difference_in_points(capsys: pytest.CaptureFixture[str]) -> None:
    # Common practice: 10 points apart with an SD of 10 is d = 1.
    by_points = _json(capsys, "--difference", "10", "--sd", "10", "--power", "0.8")
    by_d = _json(capsys, "--effect", "1", "--power", "0.8")
    assert by_points["effect"] == 1.0 and by_points["n_per_group"] == by_d["n_per_group"]


def test_factorial_reports_every_term(capsys: pytest.CaptureFixture[str]) -> None:
    data = _json(capsys, "--levels", "2x2", "--effect", "0.5", "--effect-measure", "d",
                 "--power", "0.8")  # fmt: skip
    terms = {c["term"]: c for c in data["contrasts"]}
    assert set(terms) == {"A", "B", "A×B"}
    # The interaction's f is d/4, a main effect's d/2: it needs about four times the n.
    assert terms["A×B"]["f"] == 0.125 and terms["A"]["f"] == 0.25
    assert data["term"] == "A×B" and data["n_per_group"] == terms["A×B"]["n_per_group"]
    one = _json(capsys, "--levels", "2x2", "--term", "A", "--effect", "0.25", "--power", "0.8")
    assert [c["term"] for c in one["contrasts"]] == ["A"]


def test_cluster_output_counts_classes(capsys: pytest.CaptureFixture[str]) -> None:
    data = _json(capsys, "--effect", "0.5", "--power", "0.8", "--icc", "0.1",
                 "--class-size", "20")  # fmt: skip
    assert data["design_effect"] == pytest.approx(2.9)
    assert data["n_per_group"] == data["classes_per_group"] * 20
    status, out, _ = _run(capsys, "--classes", "10", "--power", "0.8", "--icc", "0.1",
                          "--class-size", "20")  # fmt: skip
    assert status == 0 and "10 classes per condition" in out


def test_text_output_states_the_caution(capsys: pytest.CaptureFixture[str]) -> None:
    status, out, _ = _run(capsys, "--effect", "0.5", "--power", "0.8", "--pretest-r", "0.5")
    assert status == 0
    assert "assumed effect size" in out and "Borm" in out


BAD = [
    (["--effect", "0", "--power", "0.8"], "--effect"),
    (["--effect", "-0.3", "--power", "0.8"], "--effect"),
    (["--effect", "0.5", "--power", "1"], "--power"),
    (["--effect", "0.5", "--power", "0"], "--power"),
    (["--effect", "0.5", "--power", "0.8", "--alpha", "0.6"], "--alpha"),
    (["--effect", "0.5", "--power", "0.8", "--alpha", "0"], "--alpha"),
    (["--n", "1", "--effect", "0.5"], "--n"),
    (["--n", "3", "--effect", "0.5", "--ratio", "0.5"], "--n 3 is too few"),
    (["--effect", "0.5", "--power", "0.8", "--pretest-r", "1"], "--pretest-r"),
    (["--effect", "0.5", "--power", "0.8", "--pretest-r", "-0.2"], "--pretest-r"),
    (["--effect", "0.5", "--power", "0.8", "--icc", "1", "--class-size", "20"], "--icc"),
    (["--effect", "0.5", "--power", "0.8", "--icc", "0.1"], "--class-size"),
    (["--effect", "0.5", "--power", "0.8", "--ratio", "0"], "--ratio"),
    (["--effect", "0.5"], "--power"),
    (["--effect", "0.5", "--power", "0.8", "--n", "20"], "--effect"),
    (["--design", "latin-square", "--effect", "0.5", "--power", "0.8"], "--design"),
    (["--levels", "2y2", "--effect", "0.5", "--power", "0.8"], "--levels"),
    (["--levels", "2x2", "--term", "C", "--effect", "0.5", "--power", "0.8"], "--term"),
    (["--levels", "2x3", "--effect", "0.5", "--effect-measure", "d", "--power", "0.8"], "d"),
    (["--groups", "3", "--effect", "0.2", "--power", "0.8", "--one-sided"], "--one-sided"),
    (["--difference", "10", "--power", "0.8"], "--sd"),
    (["--difference", "10", "--sd", "0", "--power", "0.8"], "--sd"),
]


@pytest.mark.parametrize(("args", "named"), BAD)
def test_bad_input_is_one_line_exit_2(
    capsys: pytest.CaptureFixture[str], args: list[str], named: str
) -> None:
    status, out, err = _run(capsys, *args)
    assert status == 2
    assert out == ""
    assert len(err.strip().splitlines()) == 1 and "Traceback" not in err
    assert named in err
