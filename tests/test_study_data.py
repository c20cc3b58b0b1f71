"""Reading the learners' data: the [data] keys, file errors (file, row, column; exit 2), XLSX,
and the demo's findings. Statistics are checked against published values in
tests/test_studystats.py; here the checks are on reading and on the findings' verdicts."""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from matcheck.cli import main
from matcheck.data.learners import read_learners, read_pilot
from matcheck.data.spec import parse_data
from matcheck.errors import ConfigError, DataError

ROOT = Path(__file__).resolve().parent.parent
CONDITIONS = ("a", "b")
HEADER = "id,group,pre,Q1,Q2,Q3,minutes,done\n"
GOOD_ROWS = [
    "s1,a,3,1,0,1,10,yes",
    "s2,a,4,1,1,1,11,yes",
    "s3,a,2,0,0,1,9,yes",
    "s4,b,3,1,1,0,10,yes",
    "s5,b,5,1,1,1,12,yes",
    "s6,b,4,0,1,1,10,no",
    "s7,b,3,1,0,0,11,yes",
]
KEYS = {
    "files": "learners.csv",
    "id": "id",
    "condition": "group",
    "pretest": "pre",
    "posttest": ["Q*"],
    "time": "minutes",
    "completed": "done",
}


def _spec(tmp_path: Path, rows: list[str], **changes: object) -> object:
    (tmp_path / "learners.csv").write_text(HEADER + "\n".join(rows) + "\n", encoding="utf-8")
    study = tmp_path / "study.toml"
    return parse_data(study, {**KEYS, **changes})


def test_reads_learners_and_attrition(tmp_path: Path) -> None:
    data = read_learners(_spec(tmp_path, GOOD_ROWS), CONDITIONS)  # type: ignore[arg-type]
    assert data.items == ("Q1", "Q2", "Q3")
    assert [x.completed for x in data.of("b")] == [True, True, False, True]
    # A learner who did not complete has no outcome even where cells hold scores.
    assert data.of("b")[2].posttest is None
    assert data.posttest_max == 3.0


@pytest.mark.parametrize(
    ("rows", "message"),
    [
        ([*GOOD_ROWS[:-1], "s7,b,3,1,0"], "row 8: 5 cells, but the header has 8 columns"),
        ([*GOOD_ROWS[:-1], "s7,b,3,1,x,0,11,yes"], "row 8, column 'Q2': 'x' is not a number"),
        ([*GOOD_ROWS[:-1], "s7,c,3,1,0,0,11,yes"], "row 8, column 'group': 'c' is not a condition"),
        ([*GOOD_ROWS[:-1], "s1,b,3,1,0,0,11,yes"], "row 8, column 'id': id 's1' is already at"),
        ([*GOOD_ROWS[:-1], "s7,b,3,1,,0,11,yes"], "row 8, column 'Q2': the learner completed"),
        ([*GOOD_ROWS[:-1], "s7,b,3,1,0,0,11,maybe"], "row 8, column 'done': 'maybe' is not yes/no"),
        ([*GOOD_ROWS[:3], "s4,b,3,1,1,0,10,yes"], "condition 'b' has 1 learner with a post-test"),
    ],
)
def test_data_errors_name_file_row_and_column(
    tmp_path: Path, rows: list[str], message: str
) -> None:
    with pytest.raises(DataError) as problem:
        read_learners(_spec(tmp_path, rows), CONDITIONS)  # type: ignore[arg-type]
    assert message in str(problem.value)
    assert str(problem.value).startswith(str(tmp_path / "learners.csv"))


def test_unknown_column_names_the_key(tmp_path: Path) -> None:
    spec = _spec(tmp_path, GOOD_ROWS, posttest=["item*"])
    with pytest.raises(DataError, match=r"no column 'item\*' \(data.posttest\)"):
        read_learners(spec, CONDITIONS)  # type: ignore[arg-type]


@pytest.mark.parametrize(
    ("changes", "message"),
    [
        ({"colour": "x"}, "[data]: unknown key 'colour'"),
        ({"files": "missing.csv"}, "data.files: "),
        ({"posttest": []}, "data.posttest must be a column name"),
        ({"equivalence_bound": -1}, "data.equivalence_bound must be a number"),
        ({"attrition_boundary": "liberal"}, "data.attrition_boundary must be"),
        ({"alpha": True}, "data.alpha must be a number"),
    ],
)
def test_study_file_keys_are_validated(
    tmp_path: Path, changes: dict[str, object], message: str
) -> None:
    with pytest.raises(ConfigError) as problem:
        _spec(tmp_path, GOOD_ROWS, **changes)
    assert message in str(problem.value)


def test_xlsx_reads_like_csv(tmp_path: Path) -> None:
    openpyxl = pytest.importorskip("openpyxl")
    book = openpyxl.Workbook()
    sheet = book.active
    for line in [HEADER.strip(), *GOOD_ROWS]:
        sheet.append([int(c) if c.isdigit() else c for c in line.split(",")])
    book.save(tmp_path / "learners.xlsx")
    spec = _spec(tmp_path, GOOD_ROWS, files="learners.xlsx")
    from_xlsx = read_learners(spec, CONDITIONS)  # type: ignore[arg-type]
    from_csv = read_learners(_spec(tmp_path, GOOD_ROWS), CONDITIONS)  # type: ignore[arg-type]
    assert from_xlsx == from_csv


def test_pilot_needs_every_item(tmp_path: Path) -> None:
    (tmp_path / "pilot.csv").write_text("Q1,Q2\n1,0\n1,\n", encoding="utf-8")
    spec = parse_data(tmp_path / "study.toml", {"pilot": "pilot.csv", "posttest": "Q*"})
    with pytest.raises(DataError, match=r"row 3, column 'Q2': the score is empty"):
        read_pilot(spec)


def test_cli_exits_2_on_a_bad_data_file(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    for name in CONDITIONS:
        (tmp_path / f"{name}.md").write_text(
            "# Tyres\n\nPump the tyre to the pressure printed on its wall.\n", encoding="utf-8"
        )
    rows = [*GOOD_ROWS[:-1], "s7,b,3,1,zero,0,11,yes"]
    (tmp_path / "learners.csv").write_text(HEADER + "\n".join(rows) + "\n", encoding="utf-8")
    (tmp_path / "study.toml").write_text(
        '[[conditions]]\nname = "a"\nfiles = "a.md"\n[[conditions]]\nname = "b"\n'
        'files = "b.md"\n[data]\nfiles = "learners.csv"\ncondition = "group"\n'
        'posttest = "Q*"\ncompleted = "done"\n',
        encoding="utf-8",
    )
    status = main(["check", str(tmp_path / "study.toml")])
    err = capsys.readouterr().err
    assert status == 2
    assert "Traceback" not in err
    assert "learners.csv: row 8, column 'Q2': 'zero' is not a number" in err


def test_demo_shows_adjustment_ceiling_and_diagnosis(capsys: pytest.CaptureFixture[str]) -> None:
    """The demo's invented data are built (scripts/make_demo_data.py) so that one condition's
    baseline needs adjustment and the post-test has a ceiling; no raw row reaches the report."""
    status = main(["check", str(ROOT / "fixtures/demo/study.toml"), "--format", "json"])
    report = json.loads(capsys.readouterr().out)
    assert status == 1
    found = {
        (f["group"], f["dimension"], f["condition"]): f
        for f in report["findings"]
        if f["group"] in ("groups", "instrument", "outcome")
    }
    adjust = found["groups", "baseline:pretest", "diagrams-plain"]
    assert adjust["status"] == "inconclusive" and "needs adjustment" in adjust["reason"]
    assert found["groups", "baseline:pretest", "diagrams-bold"]["status"] == "matched"
    assert found["instrument", "ceiling", "study"]["status"] == "inconclusive"
    outcome = found["outcome", "posttest_score", "diagrams-plain"]
    kinds = {e["kind"] for e in outcome["evidence"]}
    assert outcome["status"] == "inconclusive" and kinds == {"possible_reason", "ruled_out"}
    text = json.dumps(report)
    assert "L001" not in text and "P01" not in text  # learners' ids never leave the data


def test_against_a_revision_without_the_untracked_learners_data(
    tmp_path: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    """Learners' data are rarely under version control: --against reads the past materials
    without them, and the data findings are today's."""
    import shutil
    import subprocess

    if shutil.which("git") is None:
        pytest.skip("git is not installed")
    for name in CONDITIONS:
        (tmp_path / f"{name}.md").write_text(
            "# Tyres\n\nPump the tyre to the pressure printed on its wall.\n", encoding="utf-8"
        )
    (tmp_path / "learners.csv").write_text(HEADER + "\n".join(GOOD_ROWS) + "\n", "utf-8")
    (tmp_path / ".gitignore").write_text("learners.csv\n", encoding="utf-8")
    (tmp_path / "study.toml").write_text(
        '[[conditions]]\nname = "a"\nfiles = "a.md"\n[[conditions]]\nname = "b"\n'
        'files = "b.md"\n[data]\nfiles = "learners.csv"\ncondition = "group"\n'
        'posttest = "Q*"\ncompleted = "done"\n',
        encoding="utf-8",
    )
    git = ["git", "-c", "user.name=t", "-c", "user.email=t@example.org"]
    subprocess.run([*git, "init", "-q"], cwd=tmp_path, check=True)
    subprocess.run([*git, "add", "."], cwd=tmp_path, check=True)
    subprocess.run([*git, "commit", "-qm", "study"], cwd=tmp_path, check=True)
    status = main(["check", str(tmp_path / "study.toml"), "--against", "HEAD", "--format", "json"])
    captured = capsys.readouterr()
    assert status in (0, 1), captured.err
    report = json.loads(captured.out)
    assert any(f["group"] == "outcome" for f in report["findings"])


def _assess(tmp_path: Path, rows: list[str], **changes: object) -> dict[tuple[str, str], object]:
    from matcheck.data.assess import assess_data

    spec = _spec(tmp_path, rows, **changes)
    findings, _ = assess_data(spec, CONDITIONS, "a", [("a", "b")], [])  # type: ignore[arg-type]
    return {(f.dimension, f.condition): f for f in findings}


def _learners(group: str, pre: list[int], post: list[list[int]], minutes: list[float]) -> list[str]:
    return [
        f"{group}{i},{group},{p},{','.join(map(str, q))},{m},yes"
        for i, (p, q, m) in enumerate(zip(pre, post, minutes, strict=True))
    ]


def test_verdicts_follow_the_published_rules(tmp_path: Path) -> None:
    # Pre-tests 1 SD apart (g far beyond 0.25), a large effect, equal times, no attrition.
    post_a = [[0, 0, 1], [0, 1, 0], [1, 0, 0], [0, 0, 0], [1, 1, 0], [0, 1, 0]] * 2
    post_b = [[1, 1, 1], [1, 1, 0], [1, 1, 1], [0, 1, 1], [1, 1, 1], [1, 0, 1]] * 2
    rows = _learners("a", [2, 3, 4, 2, 3, 4] * 2, post_a, [10, 11, 12, 10, 11, 12] * 2)
    rows += _learners("b", [3, 4, 5, 3, 4, 5] * 2, post_b, [10, 11, 12, 10, 11, 12] * 2)
    found = _assess(tmp_path, rows, time_bound=2.0)
    baseline = found["baseline:pretest", "b"]
    assert baseline.status.value == "differs" and "not equivalent" in baseline.reason  # type: ignore[attr-defined]
    assert found["attrition", "b"].status.value == "matched"  # type: ignore[attr-defined]
    # Identical times: the TOST shows them equivalent within ±2 minutes (with the default
    # ±0.25 SD, 12 learners per condition are too few to show it).
    assert found["time_on_task", "b"].status.value == "matched"  # type: ignore[attr-defined]
    # A significant effect of the manipulation is intended, with g and Glass's Δ.
    outcome = found["posttest_score", "b"]
    assert outcome.status.value == "intended"  # type: ignore[attr-defined]
    assert "Hedges' g" in outcome.reason and "Glass's Δ" in outcome.reason  # type: ignore[attr-defined]


def test_high_attrition_and_unequal_time_differ(tmp_path: Path) -> None:
    post = [[0, 1, 1], [1, 0, 1], [1, 1, 0], [0, 0, 1], [1, 1, 1], [0, 1, 0]]
    rows = _learners("a", [2, 3, 4, 2, 3, 4], post, [10, 11, 12, 10, 11, 12])
    rows += _learners("b", [2, 3, 4, 2, 3, 4], post, [5, 6, 7, 5, 6, 7])
    rows += [f"d{i},b,3,,,,,no" for i in range(4)]  # 4 of 10 in b left: 40 % vs 0 %
    found = _assess(tmp_path, rows)
    attrition = found["attrition", "b"]
    assert attrition.status.value == "differs"  # type: ignore[attr-defined]
    assert attrition.difference == pytest.approx(0.4)  # type: ignore[attr-defined]
    assert found["time_on_task", "b"].status.value == "differs"  # type: ignore[attr-defined]
    # The same post-test in both: a null result, with exposure and attrition as reasons.
    outcome = found["posttest_score", "b"]
    possible = [e.text for e in outcome.evidence if e.kind == "possible_reason"]  # type: ignore[attr-defined]
    assert any(text.startswith("exposure") for text in possible)
    assert any(text.startswith("attrition") for text in possible)
    assert any(text.startswith("power") for text in possible)
