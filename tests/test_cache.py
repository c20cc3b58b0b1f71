"""The cache of each version's reading and measures (matcheck/cache.py, docs/performance.md).

What is checked is outside the cache itself: a report from the cache must equal, byte for
byte as JSON, the report of a cold run that reads every file (the cold run is the reference);
every change that can alter a profile must miss; a damaged or foreign entry must be rebuilt;
two processes filling one cache at once must leave only valid entries; and nothing may be
written beside the inputs. tests/conftest.py gives every test an empty cache folder.
"""

from __future__ import annotations

import json
import os
import shutil
import struct
import subprocess
import sys
import zlib
from pathlib import Path

import pytest

import matcheck.cache as cache_module
from matcheck.api import Version, compare_versions
from matcheck.cache import MAGIC, Cache, Store, default_folder
from matcheck.cli import main
from matcheck.findings import CacheUse
from matcheck.limits import ReadLimits
from matcheck.settings import Settings

ROOT = Path(__file__).resolve().parent.parent
DEMO = ROOT / "fixtures" / "demo"

LESSON = """# Heat pumps at home

A heat pump moves warmth from the outside air into the house. It does not burn any fuel, so
the running cost depends on the price of electricity and on how cold the winter gets.

## How it works

A fan draws outside air over a coil filled with a cold refrigerant. The refrigerant boils,
a compressor squeezes the vapour, and the hot vapour gives its heat to the water that runs
through the radiators. The cycle then starts again with the cooled refrigerant.

## Keeping it efficient

Clean the outdoor coil each spring and keep leaves away from the fan. Set the flow
temperature as low as the rooms allow, because every degree less saves energy.
"""
OTHER = LESSON.replace("each spring", "every spring and autumn")


def _png(width: int, height: int) -> bytes:
    """A minimal valid PNG of the given size (one grey channel, every row empty)."""

    def chunk(kind: bytes, data: bytes) -> bytes:
        body = kind + data
        return struct.pack(">I", len(data)) + body + struct.pack(">I", zlib.crc32(body))

    header = struct.pack(">IIBBBBB", width, height, 8, 0, 0, 0, 0)
    rows = zlib.compress(b"\0" * (width + 1) * height)
    # Source: PNG specification (ISO/IEC 15948), signature and IHDR layout; docs/references.md §17.
    signature = b"\x89PNG\r\n\x1a\n"
    return signature + chunk(b"IHDR", header) + chunk(b"IDAT", rows) + chunk(b"IEND", b"")


def _lessons(folder: Path) -> list[Version]:
    folder.mkdir(parents=True, exist_ok=True)
    (folder / "a.md").write_text(LESSON, encoding="utf-8")
    (folder / "b.md").write_text(OTHER, encoding="utf-8")
    return [Version("a", (folder / "a.md",)), Version("b", (folder / "b.md",))]


def _cache(folder: Path) -> Cache:
    """The cache of one run (as the command line makes it), over the entries in ``folder``."""
    return Cache(Store(folder, 2**30))


def _json(report: object) -> dict[str, object]:
    from matcheck.report.json_report import report_dict

    data = report_dict(report)  # type: ignore[arg-type]
    data.pop("cache", None)
    return data


# -- the same reports ---------------------------------------------------------------------


@pytest.mark.parametrize(
    "command",
    [
        ["check", "fixtures/demo/study.toml", "--format", "json"],
        ["compare", "fixtures/demo/text-only.md", "fixtures/demo/diagrams.docx", "-f", "json"],
        ["profile", "fixtures/demo/diagrams-confounded.pdf", "--format", "json"],
    ],
)
def test_cached_reports_equal_a_cold_run(
    command: list[str], capsys: pytest.CaptureFixture[str], monkeypatch: pytest.MonkeyPatch
) -> None:
    monkeypatch.chdir(ROOT)
    main([*command, "--no-cache"])
    cold = json.loads(capsys.readouterr().out)
    main(command)  # fills the cache
    first = json.loads(capsys.readouterr().out)
    main(command)  # reads it
    warm = json.loads(capsys.readouterr().out)
    assert "cache" not in cold  # --no-cache: no count, not even zero
    if command[0] != "profile":
        files = len(first["conditions"])
        assert first.pop("cache") == {"files": files, "from_cache": 0}
        assert warm.pop("cache") == {"files": files, "from_cache": files}
    assert first == cold
    assert warm == cold


def test_the_text_and_markdown_reports_say_how_many_files_came_from_the_cache(
    capsys: pytest.CaptureFixture[str], monkeypatch: pytest.MonkeyPatch
) -> None:
    monkeypatch.chdir(ROOT)
    monkeypatch.setenv("COLUMNS", "200")
    main(["check", "fixtures/demo/study.toml"])
    assert "0 of 4 lesson files from the cache" in capsys.readouterr().out
    main(["check", "fixtures/demo/study.toml", "--format", "markdown"])
    assert "4 of 4 lesson files from the cache" in capsys.readouterr().out
    main(["check", "fixtures/demo/study.toml", "--no-cache"])
    assert "from the cache" not in capsys.readouterr().out


# -- what misses --------------------------------------------------------------------------


def test_a_changed_file_misses_and_only_it_is_read_again(tmp_path: Path) -> None:
    versions = _lessons(tmp_path / "lessons")
    where = tmp_path / "cache"
    cold = compare_versions(versions)
    assert compare_versions(versions, cache=_cache(where)).cache == CacheUse(2, 0)
    assert compare_versions(versions, cache=_cache(where)).cache == CacheUse(2, 2)
    (tmp_path / "lessons" / "b.md").write_text(OTHER + "\nDrain the tank.\n", encoding="utf-8")
    changed = compare_versions(versions, cache=_cache(where))
    assert changed.cache == CacheUse(2, 1)
    assert _json(changed) == _json(compare_versions(versions))  # the new text, not the old
    assert _json(changed) != _json(cold)


@pytest.mark.parametrize(
    ("settings", "limits"),
    [
        (Settings(words_per_minute=150), ReadLimits()),
        (Settings(dale_chall_adjustment="above_5_percent"), ReadLimits()),
        (Settings(key_terms=5), ReadLimits()),
        (Settings(), ReadLimits(max_words=100_000)),
        (Settings(), ReadLimits(allow_outside_files=True)),
    ],
)
def test_a_changed_setting_misses(tmp_path: Path, settings: Settings, limits: ReadLimits) -> None:
    versions = _lessons(tmp_path / "lessons")
    where = tmp_path / "cache"
    compare_versions(versions, cache=_cache(where))
    again = compare_versions(versions, settings=settings, limits=limits, cache=_cache(where))
    assert again.cache == CacheUse(2, 0)


def test_the_reading_time_limit_alone_does_not_miss(tmp_path: Path) -> None:
    # It decides only whether a read fails, and failures are never stored.
    versions = _lessons(tmp_path / "lessons")
    where = tmp_path / "cache"
    compare_versions(versions, cache=_cache(where))
    again = compare_versions(versions, limits=ReadLimits(max_read_seconds=30), cache=_cache(where))
    assert again.cache == CacheUse(2, 2)


def test_a_new_version_or_changed_code_misses(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    versions = _lessons(tmp_path / "lessons")
    where = tmp_path / "cache"
    compare_versions(versions, cache=_cache(where))
    monkeypatch.setattr(cache_module, "__version__", "99.0.0")
    assert compare_versions(versions, cache=_cache(where)).cache == CacheUse(2, 0)
    assert compare_versions(versions, cache=_cache(where)).cache == CacheUse(2, 2)
    monkeypatch.setattr(cache_module, "code_digest", lambda: "a source file was edited")
    assert compare_versions(versions, cache=_cache(where)).cache == CacheUse(2, 0)


def test_the_code_digest_covers_every_source_file() -> None:
    package = Path(cache_module.__file__).parent
    digest = cache_module.code_digest()
    assert len(digest) == 64
    assert sum(1 for _ in package.rglob("*.py")) > 50  # the whole package, not one module


def test_a_changed_image_of_a_markdown_lesson_misses(tmp_path: Path) -> None:
    # The figure measures read the image's size from its header, so the image is an input.
    folder = tmp_path / "lessons"
    versions = _lessons(folder)
    figure = "\n![The outdoor unit](unit.png)\n"
    for version in versions:
        path = version.paths[0]
        path.write_text(path.read_text(encoding="utf-8") + figure, encoding="utf-8")
    (folder / "unit.png").write_bytes(_png(240, 140))
    where = tmp_path / "cache"
    compare_versions(versions, cache=_cache(where))
    assert compare_versions(versions, cache=_cache(where)).cache == CacheUse(2, 2)
    (folder / "unit.png").write_bytes(_png(640, 480))
    changed = compare_versions(versions, cache=_cache(where))
    assert changed.cache == CacheUse(2, 0)
    assert _json(changed) == _json(compare_versions(versions))
    (folder / "unit.png").unlink()
    assert compare_versions(versions, cache=_cache(where)).cache == CacheUse(2, 0)


def test_the_same_bytes_elsewhere_hit_and_report_their_own_path(tmp_path: Path) -> None:
    versions = _lessons(tmp_path / "one")
    moved = _lessons(tmp_path / "two")
    where = tmp_path / "cache"
    compare_versions(versions, cache=_cache(where))
    report = compare_versions(moved, cache=_cache(where))
    assert report.cache == CacheUse(2, 2)
    assert _json(report) == _json(compare_versions(moved))


# -- damaged entries and concurrent runs ----------------------------------------------------


def _entries(folder: Path) -> list[Path]:
    return sorted(folder.glob("v*/*/*.entry"))


@pytest.mark.parametrize(
    "damage",
    [
        lambda data: data[: len(data) // 2],  # truncated
        lambda data: data[:-10] + bytes(10),  # payload overwritten
        lambda data: b"not a cache entry",
        lambda data: data.replace(MAGIC, b"something-else\n", 1),
        lambda data: data.replace(b'"format": ', b'"format": 9', 1),  # another format
    ],
)
def test_a_corrupt_or_foreign_entry_is_rebuilt(tmp_path: Path, damage: object) -> None:
    versions = _lessons(tmp_path / "lessons")
    where = tmp_path / "cache"
    cold = _json(compare_versions(versions, cache=_cache(where)))
    entries = _entries(tmp_path / "cache")
    assert len(entries) == 2
    for entry in entries:
        entry.write_bytes(damage(entry.read_bytes()))  # type: ignore[operator]
    rebuilt = compare_versions(versions, cache=_cache(where))
    assert rebuilt.cache == CacheUse(2, 0)
    assert _json(rebuilt) == cold
    assert compare_versions(versions, cache=_cache(where)).cache == CacheUse(2, 2)


def test_a_valid_pickle_under_the_wrong_key_is_not_used(tmp_path: Path) -> None:
    versions = _lessons(tmp_path / "lessons")
    where = tmp_path / "cache"
    compare_versions(versions, cache=_cache(where))
    first, second = _entries(tmp_path / "cache")
    second.write_bytes(first.read_bytes())  # the header names the other key
    assert compare_versions(versions, cache=_cache(where)).cache == CacheUse(2, 1)


@pytest.mark.skipif(not hasattr(os, "geteuid") or os.geteuid() != 0, reason="needs chown (root)")
def test_an_entry_owned_by_another_user_is_never_unpickled(tmp_path: Path) -> None:
    versions = _lessons(tmp_path / "lessons")
    where = tmp_path / "cache"
    compare_versions(versions, cache=_cache(where))
    entries = _entries(where)
    os.chown(entries[0], 12345, 12345)  # as if someone else had written it
    assert compare_versions(versions, cache=_cache(where)).cache == CacheUse(2, 1)


def test_two_concurrent_runs_leave_a_valid_cache(tmp_path: Path) -> None:
    study = tmp_path / "study"
    shutil.copytree(DEMO, study)
    cache = tmp_path / "cache"
    env = {**os.environ, "MATCHECK_CACHE_DIR": str(cache)}
    command = [sys.executable, "-m", "matcheck", "check", str(study / "study.toml"), "-f", "json"]
    runs = [subprocess.Popen(command, stdout=subprocess.PIPE, env=env) for _ in range(2)]
    outputs = [run.communicate(timeout=600)[0] for run in runs]
    assert [run.returncode for run in runs] == [1, 1]  # the demo differs on purpose
    reports = [json.loads(output) for output in outputs]
    for report in reports:
        report.pop("cache")
    assert reports[0] == reports[1]
    store = Store(cache, 2**30)
    entries = _entries(cache)
    assert entries and not list(cache.rglob(".tmp-*"))  # no temporary file left behind
    for entry in entries:
        assert store.load(entry.stem) is not None, entry  # every entry whole and valid
    third = subprocess.run(command, capture_output=True, env=env, timeout=600, check=False)
    assert json.loads(third.stdout)["cache"] == {"files": 4, "from_cache": 4}


# -- where it writes, and how much ------------------------------------------------------------


def test_nothing_is_written_beside_the_inputs(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch, capsys: pytest.CaptureFixture[str]
) -> None:
    study = tmp_path / "study"
    shutil.copytree(DEMO, study)
    before = {p: p.stat().st_mtime_ns for p in study.rglob("*")}
    cache = tmp_path / "cache"
    monkeypatch.setenv("MATCHECK_CACHE_DIR", str(cache))
    monkeypatch.chdir(study)
    for _ in range(2):
        main(["check", "study.toml", "-f", "json"])
        main(["table", "study.toml"])
        main(["compare", "text-only.md", "diagrams.md"])
        main(["profile", "text-plain.docx"])
    capsys.readouterr()
    assert {p: p.stat().st_mtime_ns for p in study.rglob("*")} == before
    assert _entries(cache)


def test_the_cache_folder_follows_xdg(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    # Source: XDG Base Directory Specification 0.8 ($XDG_CACHE_HOME, default $HOME/.cache;
    # a relative value is invalid and ignored); docs/references.md §28.
    monkeypatch.delenv("MATCHECK_CACHE_DIR")
    monkeypatch.setenv("HOME", str(tmp_path / "home"))
    monkeypatch.delenv("XDG_CACHE_HOME", raising=False)
    assert default_folder() == tmp_path / "home" / ".cache" / "matcheck"
    monkeypatch.setenv("XDG_CACHE_HOME", "relative/cache")
    assert default_folder() == tmp_path / "home" / ".cache" / "matcheck"
    monkeypatch.setenv("XDG_CACHE_HOME", str(tmp_path / "xdg"))
    assert default_folder() == tmp_path / "xdg" / "matcheck"
    monkeypatch.setenv("MATCHECK_CACHE_DIR", str(tmp_path / "mine"))
    assert default_folder() == tmp_path / "mine"


def test_the_least_recently_used_entries_are_evicted(tmp_path: Path) -> None:
    store = Store(tmp_path / "cache", max_bytes=10_000)
    keys = [f"{n:064x}" for n in range(6)]
    for age, key in enumerate(keys):
        store.save(key, bytes(3_000))
        os.utime(store.path_of(key), (1_000_000 + age, 1_000_000 + age))
    assert store.load(keys[0]) is not None  # used now: the newest
    assert store.evict() > 0
    kept = {path.stem for path in _entries(tmp_path / "cache")}
    assert sum(path.stat().st_size for path in _entries(tmp_path / "cache")) <= 10_000 * 0.8
    assert keys[0] in kept and keys[5] in kept
    assert keys[1] not in kept and keys[2] not in kept


def test_an_unwritable_cache_does_not_stop_the_check(tmp_path: Path) -> None:
    versions = _lessons(tmp_path / "lessons")
    blocker = tmp_path / "file-not-folder"
    blocker.write_text("x", encoding="utf-8")
    report = compare_versions(versions, cache=_cache(blocker / "cache"))
    assert _json(report) == _json(compare_versions(versions))


def test_a_cached_lesson_and_its_image_are_still_refused_as_outputs(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch, capsys: pytest.CaptureFixture[str]
) -> None:
    # A hit reads no file, yet the image and the lessons stay inputs of the run
    # (matcheck/inputs.py), so that -o cannot overwrite them.
    import matcheck.inputs

    folder = tmp_path / "lessons"
    versions = _lessons(folder)
    for version in versions:
        path = version.paths[0]
        path.write_text(path.read_text(encoding="utf-8") + "\n![Unit](unit.png)\n", "utf-8")
    image = _png(240, 140)
    (folder / "unit.png").write_bytes(image)
    monkeypatch.chdir(folder)
    assert main(["compare", "a.md", "b.md"]) == 0
    for target in ("unit.png", "a.md"):
        matcheck.inputs.forget()  # a new run: nothing noted yet
        assert main(["compare", "a.md", "b.md", "-o", target]) == 2
    assert (folder / "unit.png").read_bytes() == image
    assert (folder / "a.md").read_text(encoding="utf-8").startswith("# Heat pumps")
    capsys.readouterr()


@pytest.mark.parametrize(
    ("changed", "edit"),
    [
        ("learners.csv", lambda text: "\n".join(text.splitlines()[:-3]) + "\n"),  # fewer rows
        (
            "posttest.md",
            lambda text: (
                text
                + "\n8. How often should a chain be oiled?\n\n   Answer: Every few hundred km.\n"
            ),
        ),
        ("study.toml", lambda text: text.replace("reading_rate = 238", "reading_rate = 180")),
        ("images/tyre-levers.png", None),
    ],
)
def test_a_whole_study_report_misses_when_any_of_its_inputs_changes(
    tmp_path: Path,
    monkeypatch: pytest.MonkeyPatch,
    capsys: pytest.CaptureFixture[str],
    changed: str,
    edit: object,
) -> None:
    # An unchanged study's report comes from the cache whole; a change of the learners'
    # data, the post-test, the study file or an image must give the cold run's report.
    study = tmp_path / "study"
    shutil.copytree(DEMO, study)
    toml = study / "study.toml"  # a Markdown condition, so that the images count
    toml.write_text(
        toml.read_text(encoding="utf-8").replace("diagrams-plain.docx", "diagrams-plain.md"),
        encoding="utf-8",
    )
    monkeypatch.chdir(study)
    command = ["check", "study.toml", "-f", "json"]
    main(command)
    capsys.readouterr()
    main(command)
    before = json.loads(capsys.readouterr().out)
    assert before.pop("cache") == {"files": 4, "from_cache": 4}
    target = study / changed
    if edit is None:
        target.write_bytes(b"no longer a picture")  # its size becomes unknown, with a warning
    else:
        text = target.read_text(encoding="utf-8")
        assert edit(text) != text  # type: ignore[operator]
        target.write_text(edit(text), encoding="utf-8")  # type: ignore[operator]
    main(command)
    warm = json.loads(capsys.readouterr().out)
    warm.pop("cache")
    main([*command, "--no-cache"])
    assert warm == json.loads(capsys.readouterr().out)
    assert warm != before  # the edit changes the report
