"""``check DIR`` with the cache: each distinct lesson file is read once even when several
studies share it, with one worker or two, and the reports are those of a run without the
cache (counts by construction: the folder below has 1 shared file and 3 of its own)."""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from matcheck.batch import check_folder
from matcheck.cache import Cache, default_folder

LESSON = """# Bread at home

Mix flour, water, salt and a little yeast, then let the dough rest until it doubles. Shape
the loaf gently so that the gas stays inside, and bake it in a hot oven with steam for the
first ten minutes. A crust that sounds hollow when tapped means the bread is done.

## Timing

A cold rise in the fridge overnight gives a deeper flavour and fits around a working day.
"""

STUDY = """[study]
title = "Bread study {n}"
reference = "control"

[[conditions]]
name = "control"
files = ["shared/control.md"]

[[conditions]]
name = "treatment"
files = ["own/treatment{n}.md"]
"""


def _folder(root: Path) -> Path:
    (root / "shared").mkdir(parents=True)
    (root / "shared" / "control.md").write_text(LESSON, encoding="utf-8")
    (root / "own").mkdir()
    # Study files share a folder: a study reads only files at or below its own folder.
    for n in range(3):
        changed = LESSON.replace("ten minutes", f"{10 + 5 * (n + 1)} minutes")
        (root / "own" / f"treatment{n}.md").write_text(changed, encoding="utf-8")
        (root / f"study{n}.toml").write_text(STUDY.format(n=n), encoding="utf-8")
    return root


def _reports(results: list) -> list[str]:  # type: ignore[type-arg]
    from matcheck.report.json_report import report_dict

    out = []
    for result in results:
        data = report_dict(result.report)
        data.pop("cache", None)
        out.append(json.dumps(data, sort_keys=True))
    return out


@pytest.mark.parametrize("jobs", [1, 2])
def test_each_distinct_file_is_read_once(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch, jobs: int
) -> None:
    import multiprocessing

    if jobs > 1 and "fork" not in multiprocessing.get_all_start_methods():
        pytest.skip("the read log is shared with the workers through fork")
    import matcheck.readers

    folder = _folder(tmp_path / "studies")
    log = tmp_path / "reads.log"
    real_read = matcheck.readers.read

    def logged_read(path: Path, *args: object, **kwargs: object) -> object:
        with log.open("a", encoding="utf-8") as handle:  # appends are whole lines
            handle.write(f"{Path(path).resolve()}\n")
        return real_read(path, *args, **kwargs)  # type: ignore[arg-type]

    uncached = check_folder(folder, jobs=1, against=None, tolerances=())[1]
    monkeypatch.setattr(matcheck.readers, "read", logged_read)
    cache = Cache.default()
    results = check_folder(folder, jobs=jobs, against=None, tolerances=(), cache=cache)[1]
    reads = log.read_text(encoding="utf-8").splitlines()
    assert len(reads) == 4 and len(set(reads)) == 4  # 1 shared + 3 own, each once
    assert all(r.error is None for r in results)
    assert _reports(results) == _reports(uncached)
    # Read in this run, so none of them "from the cache"; a second run reads nothing.
    assert [r.report.cache.from_cache for r in results] == [0, 0, 0]  # type: ignore[union-attr]
    log.unlink()
    again = check_folder(folder, jobs=jobs, against=None, tolerances=(), cache=Cache.default())[1]
    assert not log.exists()
    assert [r.report.cache.from_cache for r in again] == [2, 2, 2]  # type: ignore[union-attr]
    assert default_folder() != folder and not list(folder.rglob("*.entry"))


def test_the_folder_summary_counts_the_files_from_the_cache(
    tmp_path: Path, capsys: pytest.CaptureFixture[str], monkeypatch: pytest.MonkeyPatch
) -> None:
    from matcheck.cli import main

    folder = _folder(tmp_path / "studies")
    monkeypatch.setenv("COLUMNS", "200")
    main(["check", str(folder), "--jobs", "1"])
    assert "0 of 6 lesson files from the cache" in capsys.readouterr().out
    main(["check", str(folder), "--jobs", "1"])
    assert "6 of 6 lesson files from the cache" in capsys.readouterr().out
    main(["check", str(folder), "--jobs", "1", "--no-cache"])
    assert "from the cache" not in capsys.readouterr().out


@pytest.mark.parametrize("cache_flag", [[], ["--no-cache"]])
@pytest.mark.parametrize("target", ["shared/control.md", "own/treatment2.md"])
def test_two_workers_still_refuse_every_lesson_as_the_output(
    tmp_path: Path, cache_flag: list[str], target: str
) -> None:
    # Workers send the files they read back with each result (matcheck.inputs.take_new); a
    # file read while the cache was filled must still reach the parent.
    import subprocess
    import sys

    root = _folder(tmp_path / "studies")
    lesson = root / target
    before = lesson.read_bytes()
    command = [sys.executable, "-m", "matcheck", "check", str(root), "--jobs", "2", "-f", "json"]
    done = subprocess.run(
        [*command, *cache_flag, "-o", str(lesson)], capture_output=True, text=True
    )
    assert done.returncode == 2, done.stderr
    assert str(lesson.name) in done.stderr and "Traceback" not in done.stderr
    assert lesson.read_bytes() == before


def test_a_folder_the_cache_holds_starts_no_workers(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    # Reports the cache holds whole are answered before any worker starts; after an edit,
    # the studies from the first one the cache misses go to the workers, and the edit shows.
    import matcheck.workers

    folder = _folder(tmp_path / "studies")
    first = check_folder(folder, jobs=2, against=None, tolerances=(), cache=Cache.default())[1]

    def no_pool(*_args: object, **_kwargs: object) -> None:
        raise AssertionError("a worker pool was started")

    with monkeypatch.context() as patch:
        patch.setattr(matcheck.workers, "worker_pool", no_pool)
        again = check_folder(folder, jobs=2, against=None, tolerances=(), cache=Cache.default())[1]
    assert _reports(again) == _reports(first)
    assert [r.report.cache.from_cache for r in again] == [2, 2, 2]  # type: ignore[union-attr]

    edited = folder / "own" / "treatment1.md"
    edited.write_text(edited.read_text(encoding="utf-8") + "\nStore the loaf in a paper bag.\n")
    after = check_folder(folder, jobs=2, against=None, tolerances=(), cache=Cache.default())[1]
    assert [r.report.cache.from_cache for r in after] == [2, 1, 2]  # type: ignore[union-attr]
    uncached = check_folder(folder, jobs=1, against=None, tolerances=())[1]
    assert _reports(after) == _reports(uncached)
