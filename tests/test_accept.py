"""Accepting a reviewed difference: [[accepted]] entries, `matcheck accept`, stale entries.

The lessons are built by construction from the demo's Markdown: the diagrams version loses
one paragraph (a passage removed, about 50 words fewer), so the differences a study reports,
and which passage they name, are known before the check runs. Byte-for-byte preservation is
checked on the file's bytes; TOML is read back with Python's tomllib (a TOML 1.0 parser,
docs/references.md §23).
"""

from __future__ import annotations

import json
import tomllib
from pathlib import Path
from typing import Any

import pytest

from matcheck.accepting import toml_string
from matcheck.cli import main

FIXTURES = Path(__file__).resolve().parent.parent / "fixtures" / "demo"
DIAGRAMS = (FIXTURES / "diagrams.md").read_text(encoding="utf-8")
BASE = (FIXTURES / "text-only.md").read_text(encoding="utf-8")
DROPPED = next(p for p in DIAGRAMS.split("\n\n") if p.startswith("Let out any air"))
OTHER = next(p for p in DIAGRAMS.split("\n\n") if p.startswith("Before you patch"))

STUDY = """# The tyre-repair pilot: one figure per section in the diagrams version.
[study]
title = "Diagrams"
reference = "text"   # the control

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

[tolerances]
words = "3%"          # agreed before the pilot
reading_time = "3%"
"""


def _without(*paragraphs: str) -> str:
    text = DIAGRAMS
    for paragraph in paragraphs:
        text = text.replace(paragraph + "\n\n", "")
    return text


@pytest.fixture
def study(tmp_path: Path) -> Path:
    folder = tmp_path / "study"
    (folder / "images").mkdir(parents=True)
    for image in (FIXTURES / "images").iterdir():
        (folder / "images" / image.name).write_bytes(image.read_bytes())
    (folder / "text.md").write_text(BASE, encoding="utf-8")
    (folder / "diagrams.md").write_text(_without(DROPPED), encoding="utf-8")
    path = folder / "study.toml"
    path.write_text(STUDY, encoding="utf-8")
    return path


def _json(capsys: pytest.CaptureFixture[str], *args: str) -> tuple[int, dict[str, Any]]:
    status = main(["check", *args, "--format", "json"])
    return status, json.loads(capsys.readouterr().out)


def _roots(data: dict[str, Any], status: str) -> dict[str, dict[str, Any]]:
    return {
        f["dimension"]: f
        for f in data["findings"]
        if f["status"] == status and f["caused_by"] is None
    }


def _accept_all(study: Path, capsys: pytest.CaptureFixture[str]) -> dict[str, dict[str, Any]]:
    """Accept every root difference by its id, with --write; return them."""
    status, data = _json(capsys, str(study))
    assert status == 1
    differs = _roots(data, "differs")
    # Known by construction: the lost paragraph is a passage removed, and its 51 words are
    # 4.8% of the lesson, beyond the study's 3%.
    assert {"passages_removed", "words"} <= set(differs)
    for finding in differs.values():
        assert (
            main(
                [
                    "accept",
                    str(study),
                    finding["id"],
                    "--reason",
                    f"Figure 2 shows this step ({finding['dimension']})",
                    "--by",
                    "A. Mensah",
                    "--date",
                    "2026-03-14",
                    "--write",
                ]
            )
            == 0
        )
    capsys.readouterr()
    return differs


def test_accepted_differences_pass_and_keep_their_reason(
    study: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    differs = _accept_all(study, capsys)
    status, data = _json(capsys, str(study))
    assert status == 0  # accepted differences do not change the exit status
    assert data["summary"]["verdict"] == "matched"
    accepted = _roots(data, "accepted")
    assert set(accepted) == set(differs)
    removed = accepted["passages_removed"]
    assert removed["id"] == differs["passages_removed"]["id"]
    assert removed["basis"] == "accepted"
    assert removed["accepted"] == {
        "entry": list(differs).index("passages_removed") + 1,
        "up_to": "+1",
        "reason": "Figure 2 shows this step (passages_removed)",
        "by": "A. Mensah",
        "date": "2026-03-14",
    }
    assert data["summary"]["root_findings"]["accepted"] == len(differs)
    # An echo of an accepted root (reading time follows words) is accepted with it.
    echo = next(f for f in data["findings"] if f["dimension"] == "reading_time")
    assert (echo["caused_by"], echo["status"]) == ("words", "accepted")
    assert echo["reason"] == "follows the accepted words"
    assert data["warnings"] == []


@pytest.mark.parametrize("fmt", ["markdown", "github", "table"])
def test_accepted_reason_and_id_show_in_every_format(
    study: Path, fmt: str, capsys: pytest.CaptureFixture[str]
) -> None:
    differs = _accept_all(study, capsys)
    assert main(["check", str(study), "--format", fmt]) == 0
    out = capsys.readouterr().out
    identity = differs["passages_removed"]["id"]
    assert identity in out
    assert "Figure 2 shows this step (passages_removed)" in out
    if fmt == "github":
        line = next(x for x in out.splitlines() if identity in x)
        assert line.startswith("::notice ")  # accepted: not an error, not a warning


def test_accepted_difference_refires_when_it_grows(
    study: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    _accept_all(study, capsys)
    # A second paragraph lost: more passages removed (and a different evidence set), more
    # words lost than the accepted extent.
    (study.parent / "diagrams.md").write_text(_without(DROPPED, OTHER), encoding="utf-8")
    status, data = _json(capsys, str(study))
    assert status == 1
    differs = _roots(data, "differs")
    assert "beyond the accepted" in differs["words"]["reason"]
    assert "passages_removed" in differs
    assert "its evidence changed" in differs["passages_removed"]["reason"]
    stale = [w for w in data["warnings"] if w.startswith("stale: ")]
    assert len(stale) == 1 and "passages_removed" in stale[0] and "evidence changed" in stale[0]


def test_accepted_extent_without_id_refires_only_beyond_up_to(
    study: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    # An entry written by hand, without an id: any passage, up to one.
    entry = (
        '\n[[accepted]]\nreference = "text"\ncondition = "diagrams"\n'
        'measure = "passages_removed"\nup_to = 1\nreason = "one step is in a figure"\n'
    )
    study.write_text(STUDY + entry, encoding="utf-8")
    _, data = _json(capsys, str(study))
    assert "passages_removed" in _roots(data, "accepted")
    (study.parent / "diagrams.md").write_text(_without(DROPPED, OTHER), encoding="utf-8")
    _, data = _json(capsys, str(study))
    finding = _roots(data, "differs")["passages_removed"]
    assert finding["difference"] == 2
    assert finding["reason"].startswith("beyond the accepted +1 (accepted #1")


def test_a_different_passage_removed_has_another_id_and_refires(
    study: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    differs = _accept_all(study, capsys)
    # Same count (one passage removed), but another one: the evidence changed.
    (study.parent / "diagrams.md").write_text(_without(OTHER), encoding="utf-8")
    status, data = _json(capsys, str(study))
    assert status == 1
    removed = _roots(data, "differs")["passages_removed"]
    assert removed["difference"] == 1
    assert removed["id"] != differs["passages_removed"]["id"]
    assert any("evidence changed" in w for w in data["warnings"])


def test_the_id_ignores_where_the_passage_stands(
    study: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    _, before = _json(capsys, str(study))
    identity = _roots(before, "differs")["passages_removed"]["id"]
    # A heading added at the top renumbers every paragraph; the removed passage is the same.
    for name in ("text.md", "diagrams.md"):
        path = study.parent / name
        path.write_text("Read this before the practical.\n\n" + path.read_text("utf-8"), "utf-8")
    _, after = _json(capsys, str(study))
    moved = _roots(after, "differs")["passages_removed"]
    assert (
        moved["evidence"][0]["location"]
        != _roots(before, "differs")["passages_removed"]["evidence"][0]["location"]
    )
    assert moved["id"] == identity


@pytest.mark.parametrize("fmt", ["json", "markdown", "github", "table"])
def test_stale_entry_is_a_warning_in_every_format(
    study: Path, fmt: str, capsys: pytest.CaptureFixture[str]
) -> None:
    entry = (
        '\n[[accepted]]\nreference = "text"\ncondition = "diagrams"\nmeasure = "headings"\n'
        'up_to = 1\nreason = "a heading was merged"\n'
    )
    study.write_text(STUDY + entry, encoding="utf-8")
    main(["check", str(study), "--format", fmt])
    out = capsys.readouterr().out
    assert "stale: accepted #1 (headings, diagrams vs text)" in out
    if fmt == "github":
        assert any(x.startswith("::warning ") and "stale" in x for x in out.splitlines())


def test_contrast_entry_accepts_in_every_pair_of_the_factor(
    study: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    entry = (
        '\n[[accepted]]\ncontrast = "diagrams"\nmeasure = "passages_removed"\nup_to = 1\n'
        'reason = "the figure replaces the step"\n'
    )
    study.write_text(STUDY + entry, encoding="utf-8")
    _, data = _json(capsys, str(study))
    assert _roots(data, "accepted")["passages_removed"]["accepted"]["reason"] == (
        "the figure replaces the step"
    )


def test_appending_preserves_the_study_file_byte_for_byte(
    study: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    # Comments, odd spacing, a CRLF line ending and no newline at the end: all kept.
    original = (STUDY.replace("\n", "\r\n") + "# last line, no newline   ").encode("utf-8")
    study.write_bytes(original)
    _, data = _json(capsys, str(study))
    identity = _roots(data, "differs")["passages_removed"]["id"]
    reason = 'The "figure" shows it \\ by design'
    assert main(["accept", str(study), identity, "--reason", reason, "--write"]) == 0
    written = study.read_bytes()
    assert written.startswith(original)
    tail = written[len(original) :]
    assert b"\r\n" in tail and b"\n" not in tail.replace(b"\r\n", b"")  # the file's line ending
    parsed = tomllib.loads(written.decode("utf-8"))
    assert parsed["accepted"][0]["reason"] == reason
    assert parsed["accepted"][0]["id"] == identity
    assert parsed["study"]["reference"] == "text"


def test_without_write_the_entry_is_only_printed(
    study: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    before = study.read_bytes()
    _, data = _json(capsys, str(study))
    identity = _roots(data, "differs")["words"]["id"]
    assert main(["accept", str(study), identity[:7], "--reason", "shorter by design"]) == 0
    out = capsys.readouterr().out
    assert study.read_bytes() == before
    entry = tomllib.loads(out)["accepted"][0]
    assert entry["id"] == identity and entry["measure"] == "words"
    # Words have a relative tolerance: the extent is a percentage of the reference, rounded
    # away from zero so that it covers the difference as measured.
    difference = _roots(data, "differs")["words"]["relative_difference"]
    assert entry["up_to"].endswith("%")
    assert float(entry["up_to"].rstrip("%")) <= difference * 100 < 0


def test_write_refuses_when_the_file_changed_meanwhile(
    study: Path, capsys: pytest.CaptureFixture[str], monkeypatch: pytest.MonkeyPatch
) -> None:
    import matcheck.api

    _, data = _json(capsys, str(study))
    identity = _roots(data, "differs")["words"]["id"]
    check = matcheck.api.check_study

    def edited_meanwhile(*args: Any, **kwargs: Any) -> Any:
        report = check(*args, **kwargs)
        with study.open("a", encoding="utf-8") as stream:
            stream.write("# edited by a colleague\n")
        return report

    monkeypatch.setattr(matcheck.api, "check_study", edited_meanwhile)
    assert main(["accept", str(study), identity, "--reason", "x", "--write"]) == 2
    assert "changed while matcheck was checking it" in capsys.readouterr().err
    assert study.read_text("utf-8") == STUDY + "# edited by a colleague\n"


@pytest.mark.parametrize(
    ("entry", "message"),
    [
        ('measure = "words"\nup_to = 1', "accepted #1.reason is missing"),
        ('measure = "words"\nreason = "r"', "accepted #1.up_to is missing"),
        ('measure = "words"\nup_to = "a lot"\nreason = "r"', "accepted #1.up_to must be"),
        ('measure = "words"\nup_to = 0\nreason = "r"', "accepted #1.up_to must not be 0"),
        ('measure = "wordz"\nup_to = 1\nreason = "r"', "accepted #1.measure = 'wordz'"),
        ('measure = "words"\nup_to = 1\nreason = "r"\nwho = "me"', "unknown key 'who'"),
        ('measure = "words"\nup_to = 1\nreason = "r"\nid = "xyz"', "accepted #1.id = 'xyz'"),
        ('measure = "words"\nup_to = 1\nreason = "r"\ndate = "soon"', "accepted #1.date"),
        ('measure = "item_coverage"\nup_to = 1\nreason = "r"', "accepted #1.item is missing"),
        ('measure = "words"\nitem = "Q1"\nup_to = 1\nreason = "r"', "accepted #1.item goes"),
    ],
)
def test_invalid_entry_is_one_line_naming_the_key(
    study: Path, entry: str, message: str, capsys: pytest.CaptureFixture[str]
) -> None:
    pair = 'reference = "text"\ncondition = "diagrams"\n'
    study.write_text(STUDY + "\n[[accepted]]\n" + pair + entry + "\n", encoding="utf-8")
    assert main(["check", str(study)]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and message in err[0] and "study.toml" in err[0]


@pytest.mark.parametrize(
    ("where", "message"),
    [
        ('contrast = "signaling"', "accepted #1.contrast = 'signaling' is not a factor"),
        ('reference = "diagrams"\ncondition = "text"', "text vs diagrams is not a comparison"),
        ('reference = "text"', "accepted #1.condition is missing"),
        (
            'contrast = "diagrams"\nid = "0123456789"',
            "accepted #1.id names one comparison's finding",
        ),
    ],
)
def test_entry_must_name_a_comparison_of_the_study(
    study: Path, where: str, message: str, capsys: pytest.CaptureFixture[str]
) -> None:
    entry = f'\n[[accepted]]\n{where}\nmeasure = "words"\nup_to = 1\nreason = "r"\n'
    study.write_text(STUDY + entry, encoding="utf-8")
    assert main(["check", str(study)]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and message in err[0]


def test_accept_refuses_unknown_matched_or_accepted_ids(
    study: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    _, data = _json(capsys, str(study))
    matched = next(f for f in data["findings"] if f["status"] == "matched")
    assert main(["accept", str(study), "ffffffffff", "--reason", "r"]) == 2
    assert "no finding" in capsys.readouterr().err
    assert main(["accept", str(study), matched["id"], "--reason", "r"]) == 2
    assert "is matched: only a difference beyond tolerance" in capsys.readouterr().err
    identity = _roots(data, "differs")["words"]["id"]
    assert main(["accept", str(study), identity, "--reason", "r", "--write"]) == 0
    capsys.readouterr()
    assert main(["accept", str(study), identity, "--reason", "r"]) == 2
    assert "already accepted by accepted #1" in capsys.readouterr().err
    assert main(["accept", str(study), identity, "--reason", "  "]) == 2


def test_methods_table_lists_accepted_differences_with_reasons(
    study: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    _accept_all(study, capsys)
    assert main(["table", str(study), "--format", "markdown"]) == 0
    out = capsys.readouterr().out
    table, _, below = out.partition("*Accepted differences.*")
    passages = next(line for line in table.splitlines() if "Passages without counterpart" in line)
    assert passages.rstrip().endswith("| accepted |")
    assert "Figure 2 shows this step (passages_removed) (A. Mensah, 2026-03-14)" in below
    assert "Figure 2 shows this step" not in table  # listed apart from the measures
    assert main(["table", str(study), "--format", "csv"]) == 0
    rows = capsys.readouterr().out.splitlines()
    assert any(r.startswith("Accepted.,") and "passages_removed" in r for r in rows)
    for fmt in ("latex", "text"):
        assert main(["table", str(study), "--format", fmt]) == 0
        assert "Figure 2 shows this step (passages\\_removed)" in capsys.readouterr().out.replace(
            "passages_removed", "passages\\_removed"
        )
    from docx import Document

    target = study.parent / "table.docx"
    assert main(["table", str(study), "--format", "docx", "--output", str(target)]) == 0
    paragraphs = [p.text for p in Document(str(target)).paragraphs]
    assert any(
        p.startswith("Accepted. ") and "Figure 2 shows this step (passages_removed)" in p
        for p in paragraphs
    )


@pytest.mark.parametrize(
    "text", ["plain", 'quote " and \\ back', "tab\tnew\nline", "bell\x07 and é ✓"]
)
def test_toml_strings_round_trip_through_a_toml_parser(text: str) -> None:
    # Source: TOML 1.0.0, "Basic strings" (docs/references.md §23); tomllib as the reader.
    assert tomllib.loads(f"value = {toml_string(text)}")["value"] == text


def test_a_finding_about_the_learners_data_cannot_be_accepted(
    capsys: pytest.CaptureFixture[str],
) -> None:
    # The demo study has learners' data; its time on task differs between two conditions.
    demo = str(FIXTURES / "study.toml")
    _, data = _json(capsys, demo)
    timing = next(
        f for f in data["findings"] if f["dimension"] == "time_on_task" and f["status"] == "differs"
    )
    assert main(["accept", demo, timing["id"], "--reason", "r"]) == 2
    assert "about the learners' data" in capsys.readouterr().err


def test_spread_shows_an_accepted_measure_as_accepted() -> None:
    # By construction: words differ in one pair (accepted) and match in the other; headings
    # differ in one pair and are not accepted.
    from matcheck.compare.accept import restate_spreads
    from matcheck.findings import Finding, Group, Spread, Status

    def finding(dimension: str, condition: str, status: Status) -> Finding:
        return Finding(dimension, Group.LENGTH, "words", "a", condition, status, {}, 1.0, None, "")

    findings = [
        finding("words", "b", Status.ACCEPTED),
        finding("words", "c", Status.MATCHED),
        finding("headings", "b", Status.DIFFERS),
        finding("headings", "c", Status.ACCEPTED),
    ]
    spreads = [
        Spread("words", Group.LENGTH, "words", 900, 1000, Status.DIFFERS),
        Spread("headings", Group.STRUCTURE, "headings", 6, 7, Status.DIFFERS),
    ]
    restated = {s.dimension: s.status for s in restate_spreads(spreads, findings)}
    assert restated == {"words": Status.ACCEPTED, "headings": Status.DIFFERS}


def test_accepting_a_grown_difference_again_supersedes_the_old_entry(
    study: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    differs = _accept_all(study, capsys)
    # Words grow beyond the accepted extent; the team reviews and accepts the new size.
    (study.parent / "text.md").write_text(
        BASE.replace(OTHER + "\n\n", OTHER + "\n\n" + OTHER.replace("patch", "repair") + "\n\n"),
        "utf-8",
    )
    status, data = _json(capsys, str(study))
    words = _roots(data, "differs")["words"]
    assert status == 1 and "beyond the accepted" in words["reason"]
    assert words["id"] == differs["words"]["id"]  # same finding, larger
    assert main(["accept", str(study), words["id"], "--reason", "larger, reviewed", "--write"]) == 0
    assert "supersedes it" in capsys.readouterr().err
    _, data = _json(capsys, str(study))
    assert _roots(data, "accepted")["words"]["accepted"]["reason"] == "larger, reviewed"
    superseded = [w for w in data["warnings"] if "is superseded by accepted" in w]
    number = list(differs).index("words") + 1
    assert len(superseded) == 1 and superseded[0].startswith(f"stale: accepted #{number} (words")
