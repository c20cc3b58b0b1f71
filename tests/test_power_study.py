"""The study file's [sample] section: validation, the ``design`` findings of ``check`` in
every format, and the methods-section paragraph.

Small studies of plain-text lessons (two, three, or 2×2 conditions) keep the checks fast; the
power figures are compared with statsmodels (docs/references.md §6) and with
:mod:`matcheck.power` itself, so ``check`` and ``matcheck power`` agree.
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest
from statsmodels.stats.power import TTestIndPower

from matcheck.api import check_study
from matcheck.cli import main
from matcheck.errors import ConfigError
from matcheck.findings import Report, Status
from matcheck.report.design import sample_size_paragraph
from matcheck.study import load_study

LESSON = (
    "# Proofing bread dough\n\nLet the dough rise in a warm place until it doubles. "
    "A finger pressed into risen dough leaves a dent that springs back slowly.\n\n"
    "Over-proofed dough collapses in the oven, so bake it as soon as the dent stays.\n"
)

TWO_GROUPS = """
[[conditions]]
name = "warm"
files = ["a.md"]

[[conditions]]
name = "cool"
files = ["b.md"]
"""

FACTORIAL = """
[factors.timer]
levels = ["no", "yes"]
manipulates = ["length"]

[factors.photos]
levels = ["no", "yes"]
manipulates = ["figures"]

[[conditions]]
name = "plain"
files = ["a.md"]
levels = { timer = "no", photos = "no" }

[[conditions]]
name = "timer"
files = ["b.md"]
levels = { timer = "yes", photos = "no" }

[[conditions]]
name = "photos"
files = ["c.md"]
levels = { timer = "no", photos = "yes" }

[[conditions]]
name = "both"
files = ["d.md"]
levels = { timer = "yes", photos = "yes" }
"""


def _study(tmp_path: Path, design: str, sample: str) -> Path:
    for name in "abcd":
        (tmp_path / f"{name}.md").write_text(LESSON, encoding="utf-8")
    path = tmp_path / "study.toml"
    path.write_text(f"{design}\n[sample]\n{sample}\n", encoding="utf-8")
    return path


def _report(path: Path) -> Report:
    return check_study(load_study(path))


def test_two_groups_power_matches_statsmodels(tmp_path: Path) -> None:
    report = _report(_study(tmp_path, TWO_GROUPS, "per_condition = 40\nsmallest_effect = 0.5"))
    (finding,) = [f for f in report.findings if f.group == "design"]
    assert finding.dimension == "power:conditions"
    expected = TTestIndPower().power(effect_size=0.5, nobs1=40, alpha=0.05)
    assert finding.values["power"] == pytest.approx(expected)
    assert finding.status is Status.DIFFERS  # 0.60 < 0.80
    assert finding.values["needed_learners"] == 64  # Cohen's table, references §6
    assert "needs 64 learners per condition, has 40" in finding.reason
    assert report.differs


def test_power_curve_rises_through_the_planned_and_needed_samples(tmp_path: Path) -> None:
    report = _report(_study(tmp_path, TWO_GROUPS, "per_condition = 40\nsmallest_effect = 0.5"))
    (finding,) = [f for f in report.findings if f.group == "design"]
    curve = sorted(
        (int(key.removeprefix("power_at_")), value)
        for key, value in finding.values.items()
        if key.startswith("power_at_") and value is not None
    )
    assert len(curve) >= 12
    powers = [p for _, p in curve]
    assert powers == sorted(powers)  # power never falls as the sample grows
    at = dict(curve)
    # The curve passes through the finding's own numbers: statsmodels at 40 and at 64
    # (Cohen's table for d = 0.5: 64 per group for power .80; references §6).
    assert at[40] == pytest.approx(TTestIndPower().power(effect_size=0.5, nobs1=40, alpha=0.05))
    assert at[64] >= 0.80 > at[40]


def test_the_html_report_draws_the_power_curve(tmp_path: Path) -> None:
    from matcheck.report.html import render_html

    report = _report(_study(tmp_path, TWO_GROUPS, "per_condition = 40\nsmallest_effect = 0.5"))
    page = render_html(report)
    assert page.count('<polyline class="curve"') == 1  # one contrast
    assert "Power by sample" in page


def test_enough_learners_is_matched(tmp_path: Path) -> None:
    report = _report(_study(tmp_path, TWO_GROUPS, "per_condition = 64\nsmallest_effect = 0.5"))
    (finding,) = [f for f in report.findings if f.group == "design"]
    assert finding.status is Status.MATCHED
    assert not report.differs


def test_factorial_has_one_finding_per_contrast(tmp_path: Path) -> None:
    path = _study(tmp_path, FACTORIAL, "per_condition = 40\nsmallest_effect = 0.5")
    design = {f.dimension: f for f in _report(path).findings if f.group == "design"}
    assert set(design) == {"power:timer", "power:photos", "power:timer×photos"}
    # Main effects: d = 0.5 → f = 0.25 with 160 learners; the interaction (f = 0.125) falls
    # short. Same numbers as `matcheck power --levels 2x2 --n 40 --effect 0.5 --effect-measure d`.
    assert design["power:timer"].status is Status.MATCHED
    assert design["power:timer×photos"].status is Status.DIFFERS
    assert design["power:timer×photos"].values["needed_learners"] == 127


def test_per_contrast_effects_and_classes(tmp_path: Path) -> None:
    sample = (
        "classes_per_condition = 6\nclass_size = 24\nicc = 0.15\n"
        'smallest_effect = { timer = 0.4, photos = 0.4, "timer x photos" = 0.8 }'
    )
    design = [f for f in _report(_study(tmp_path, FACTORIAL, sample)).findings
              if f.group == "design"]  # fmt: skip
    assert [f.values["smallest_effect"] for f in design] == [0.4, 0.4, 0.8]
    assert all("classes per condition, has 6" in f.reason for f in design)
    assert design[0].values["planned_classes"] == 6


def test_every_format_shows_the_design(
    tmp_path: Path, capsys: pytest.CaptureFixture[str], monkeypatch: pytest.MonkeyPatch
) -> None:
    monkeypatch.setenv("COLUMNS", "200")
    monkeypatch.delenv("GITHUB_STEP_SUMMARY", raising=False)
    path = _study(tmp_path, TWO_GROUPS, "per_condition = 40\nsmallest_effect = 0.5")
    outputs = {}
    for format in ("json", "markdown", "github", "table"):
        status = main(["check", str(path), "--format", format])
        outputs[format] = capsys.readouterr().out
        assert status == 1, format  # the shortfall is a difference
    data = json.loads(outputs["json"])
    design = [f for f in data["findings"] if f["group"] == "design"]
    assert design[0]["status"] == "differs" and design[0]["values"]["needed_learners"] == 64
    assert "Design: power for each contrast" in outputs["markdown"]
    assert "needs 64 learners per condition" in outputs["markdown"]
    # One annotation naming the contrast (not a pair of versions), with its explanation.
    annotation = "::error title=matcheck%3A design::power:conditions: power 0.60 < 0.8"
    assert annotation in outputs["github"]
    assert "Design: power for each contrast" in outputs["table"]


def test_methods_paragraph(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    path = _study(
        tmp_path, FACTORIAL, "per_condition = 30\nsmallest_effect = 0.5\npretest_correlation = 0.6"
    )
    paragraph = sample_size_paragraph(_report(path))
    assert paragraph.startswith("With n = 30 learners per condition (120 in all), the study had ")
    assert "for the main effect of timer" in paragraph
    assert "for the timer × photos interaction" in paragraph
    assert "α = .05, two-sided, with the pre-test as covariate (assumed r = .60)" in paragraph
    assert main(["table", str(path), "--format", "text"]) == 0
    assert paragraph in capsys.readouterr().out


BAD = [
    ("per_condition = 40\nsmallest_effect = 0", "sample.smallest_effect"),
    ("per_condition = 40", "sample.smallest_effect"),
    ("per_condition = 1\nsmallest_effect = 0.5", "sample.per_condition"),
    ("per_condition = 40\nsmallest_effect = 0.5\ntarget_power = 1.2", "sample.target_power"),
    ("per_condition = 40\nsmallest_effect = 0.5\nalpha = 0.6", "sample.alpha"),
    ("per_condition = 40\nsmallest_effect = 0.5\npretest_correlation = 1", "pretest_correlation"),
    ("classes_per_condition = 4\nclass_size = 20\nicc = 1.0\nsmallest_effect = 0.5", "sample.icc"),
    ("classes_per_condition = 4\nsmallest_effect = 0.5", "sample.classes_per_condition"),
    ("smallest_effect = 0.5", "per_condition"),
    ("per_condition = 40\nsmallest_effect = 0.5\nsample_size = 3", "unknown key 'sample_size'"),
    ("per_condition = 40\nsmallest_effect = { speed = 0.5 }", "sample.smallest_effect"),
    ('per_condition = 40\nsmallest_effect = 0.5\neffect_measure = "r"', "sample.effect_measure"),
]


@pytest.mark.parametrize(("sample", "named"), BAD)
def test_bad_sample_names_the_key(tmp_path: Path, sample: str, named: str) -> None:
    path = _study(tmp_path, TWO_GROUPS, sample)
    with pytest.raises(ConfigError, match=named.replace("(", r"\(")):
        load_study(path)


def test_three_level_factor_needs_f(tmp_path: Path) -> None:
    three = TWO_GROUPS + '\n[[conditions]]\nname = "cold"\nfiles = ["c.md"]\n'
    with pytest.raises(ConfigError, match='effect_measure = "f"'):
        load_study(_study(tmp_path, three, "per_condition = 30\nsmallest_effect = 0.5"))
    study = load_study(
        _study(tmp_path, three, 'per_condition = 30\nsmallest_effect = 0.25\neffect_measure = "f"')
    )
    assert study.sample is not None and study.sample.effect_measure.value == "f"


def test_incomplete_factorial_is_refused(tmp_path: Path) -> None:
    # Three of the four cells: power is computed for full factorials only.
    design = FACTORIAL[: FACTORIAL.index('[[conditions]]\nname = "both"')]
    with pytest.raises(ConfigError, match="full factorial"):
        load_study(_study(tmp_path, design, "per_condition = 30\nsmallest_effect = 0.5"))


def test_bad_sample_exits_2_with_one_line(
    tmp_path: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    path = _study(tmp_path, TWO_GROUPS, "per_condition = 40\nsmallest_effect = -1")
    assert main(["check", str(path)]) == 2
    err = capsys.readouterr().err
    assert len(err.strip().splitlines()) == 1 and "sample.smallest_effect" in err
