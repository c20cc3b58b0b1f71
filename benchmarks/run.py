"""The benchmark: wall time and peak memory of whole ``matcheck`` processes, beside a baseline.

    python benchmarks/run.py [--sizes 1000,5000,20000,100000] [--formats docx,pdf,md]
                             [--repeat N] [--sections pairs,studies,help,recheck,folder]
                             [--json results.json]

Lessons are generated into a temporary folder (never the repository) by
:mod:`benchmarks.lessons`. Each measurement is a separate process started through
``benchmarks/peak.py``, which reports the command's own wall time and peak resident memory.
See docs/performance.md for the targets and the last measured table.

Sections are independent; each is a function that takes the options and the work folder and
returns rows for the summary, so a new one (for example many studies at once with ``--jobs``)
is one function and one entry in :data:`SECTIONS`.
"""

from __future__ import annotations

import argparse
import itertools
import json
import math
import os
import shutil
import statistics
import subprocess
import sys
import tempfile
import time
from collections.abc import Callable
from dataclasses import asdict, dataclass
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))

from lessons import lesson_words, make_lesson, write_pair  # noqa: E402

PYTHON = sys.executable
# Targets of issue 6 (docs/performance.md).
RATIO_TARGET = 1.3
GROWTH_PER_4X = 5.0
LARGEST_SECONDS = 30.0
LARGEST_MIB = 1024.0
HELP_SECONDS = 0.5


@dataclass
class Run:
    seconds: float
    peak_mib: float
    cpu_seconds: float = 0.0


@dataclass
class PairRow:
    words: int
    fmt: str
    matcheck: Run
    baseline: Run

    @property
    def ratio(self) -> float:
        return self.matcheck.seconds / self.baseline.seconds


def measure(command: list[str], repeat: int, before: Callable[[int], None] | None = None) -> Run:
    """Median wall and processor time and highest peak memory of ``repeat`` runs of
    ``command``; ``before(i)`` prepares run ``i`` (empties the cache, changes a file, ...)."""
    times, peaks, cpus = [], [], []
    for index in range(repeat):
        if before is not None:
            before(index)
        out = subprocess.run(
            [PYTHON, str(HERE / "peak.py"), "--", *command],
            check=True,
            capture_output=True,
            text=True,
        )
        result = json.loads(out.stdout)
        if result["returncode"] not in (0, 1):  # 1: matcheck found a difference, as it should
            raise SystemExit(f"{' '.join(command)} failed:\n{result['stderr']}")
        times.append(result["seconds"])
        peaks.append(result["peak_mib"])
        cpus.append(result["cpu_seconds"])
    return Run(statistics.median(times), max(peaks), statistics.median(cpus))


@dataclass
class Section:
    """What one section found: rows for ``--json``, lines for the table, target verdicts."""

    data: list[dict[str, object]]
    table: list[str]
    checks: list[str]


def check(ok: bool, text: str) -> str:
    return f"{'PASS' if ok else 'MISS'}  {text}"


def run_pairs(options: argparse.Namespace, work: Path) -> Section:
    """``matcheck compare A B`` and the baseline on each size and format."""
    rows: list[PairRow] = []
    for fmt in options.formats:
        for size in options.sizes:
            started = time.perf_counter()
            a, b = write_pair(size, fmt, work / fmt)
            made = time.perf_counter() - started
            words = lesson_words(make_lesson(size))
            report = work / fmt / f"report-{size}.json"
            compare = [PYTHON, "-m", "matcheck", "compare", str(a), str(b), "-f", "json"]
            compare.append("--no-cache")  # every run reads and measures (see the cache sections)
            matcheck = measure([*compare, "-o", str(report)], options.repeat)
            json.loads(report.read_text(encoding="utf-8"))  # the report was written and parses
            baseline = measure([PYTHON, str(HERE / "baseline.py"), str(a), str(b)], options.repeat)
            rows.append(PairRow(words, fmt, matcheck, baseline))
            print(
                f"  {fmt} {words:,} words (generated in {made:.1f} s): matcheck "
                f"{matcheck.seconds:.2f} s {matcheck.peak_mib:.0f} MiB, baseline "
                f"{baseline.seconds:.2f} s {baseline.peak_mib:.0f} MiB",
                file=sys.stderr,
            )
    data = [{**asdict(row), "ratio": row.ratio} for row in rows]
    return Section(data, pair_table(rows), pair_checks(rows))


def run_help(options: argparse.Namespace, work: Path) -> Section:
    """Start-up: ``matcheck --help`` must not import the heavy libraries."""
    run = measure([PYTHON, "-m", "matcheck", "--help"], max(options.repeat, 5))
    return Section(
        [asdict(run)],
        [f"matcheck --help: {run.seconds:.3f} s, {run.peak_mib:.0f} MiB"],
        [
            check(
                run.seconds < HELP_SECONDS,
                f"matcheck --help: {run.seconds:.2f} s (< {HELP_SECONDS})",
            )
        ],
    )


STUDIES = 20
CONDITIONS = 4  # a 2x2 design's worth of versions per study
STUDY_WORDS = 3000
JOBS_SPEEDUP = 1.6


def run_studies(options: argparse.Namespace, work: Path) -> Section:
    """``matcheck check DIR`` on 20 four-condition studies with one worker and with two."""
    folder = work / "studies"
    for index in range(STUDIES):
        study = folder / f"study-{index:02d}"
        lines = [f'[study]\ntitle = "Study {index}"\n']
        for pair in range(CONDITIONS // 2):
            a, b = write_pair(STUDY_WORDS + 50 * index, "md", study / f"pair-{pair}")
            for path in (a, b):
                name = f"{pair}-{path.stem}"
                relative = path.relative_to(study).as_posix()
                lines.append(f'[[conditions]]\nname = "{name}"\nfiles = ["{relative}"]\n')
        (study / "study.toml").write_text("\n".join(lines), encoding="utf-8")
    command = [PYTHON, "-m", "matcheck", "check", str(folder), "--no-cache", "-f", "json", "-o"]
    one = measure([*command, str(work / "one.json"), "--jobs", "1"], options.repeat)
    two = measure([*command, str(work / "two.json"), "--jobs", "2"], options.repeat)
    speedup = one.seconds / two.seconds
    # The checking alone, in one warm process: start-up (imports, ~1.3 s) is serial in both
    # runs above, so it bounds their ratio (Amdahl); this shows what the workers themselves give.
    probe = (
        "import json, sys, time; from pathlib import Path; from matcheck import batch; "
        "paths = batch.find_studies(Path(sys.argv[1])); batch.warm_up(); t = time.perf_counter(); "
        "batch.check_all(paths, jobs=1); one = time.perf_counter() - t; t = time.perf_counter(); "
        "batch.check_all(paths, jobs=2); print(json.dumps([one, time.perf_counter() - t]))"
    )
    warm = json.loads(
        subprocess.run(
            [PYTHON, "-c", probe, str(folder)], check=True, capture_output=True, text=True
        ).stdout
    )
    warm_speedup = warm[0] / warm[1]
    return Section(
        [
            {
                "studies": STUDIES,
                "jobs_1": asdict(one),
                "jobs_2": asdict(two),
                "speedup": speedup,
                "warm_seconds": warm,
                "warm_speedup": warm_speedup,
            }
        ],
        [
            f"check DIR, {STUDIES} studies of {CONDITIONS} versions of ~{STUDY_WORDS:,} words "
            "(Markdown):",
            f"  --jobs 1: {one.seconds:.2f} s, {one.peak_mib:.0f} MiB peak",
            f"  --jobs 2: {two.seconds:.2f} s, {two.peak_mib:.0f} MiB peak (largest process)",
            f"  checking alone, after start-up: {warm[0]:.2f} s with 1 worker, "
            f"{warm[1]:.2f} s with 2 ({warm_speedup:.2f}x)",
        ],
        [
            check(
                speedup >= JOBS_SPEEDUP,
                f"check DIR with 2 workers: {speedup:.2f}x faster than 1 (>= {JOBS_SPEEDUP}), "
                "whole process",
            ),
            check(
                speedup >= FOLDER_SPEEDUP,
                f"check DIR with 2 workers, {STUDIES} studies: {speedup:.2f}x faster than 1 "
                f"(issue 19: >= {FOLDER_SPEEDUP}), whole process",
            ),
            check(
                warm_speedup >= JOBS_SPEEDUP,
                f"check DIR with 2 workers: {warm_speedup:.2f}x faster than 1 "
                f"(>= {JOBS_SPEEDUP}), checking alone",
            ),
        ],
    )


# Issue 19: the cache (docs/performance.md, "The cache").
RECHECK_WORDS = 5000
UNCHANGED_SECONDS = 0.5
ONE_CHANGED_SECONDS = 1.0
FOLDER_STUDIES = 200
FOLDER_POOL = 40  # distinct lessons the 200 studies draw their four versions from
FOLDER_WORDS = 1000
FOLDER_MARGIN = 1.2
FOLDER_SPEEDUP = 1.8


def _empty_cache(_: int = 0) -> None:
    shutil.rmtree(os.environ["MATCHECK_CACHE_DIR"], ignore_errors=True)


def _study_file(study: Path, files: list[Path], title: str, name: str = "study.toml") -> Path:
    lines = [f'[study]\ntitle = "{title}"\n']
    for index, path in enumerate(files):
        relative = Path(os.path.relpath(path, study)).as_posix()
        lines.append(f'[[conditions]]\nname = "v{index}"\nfiles = ["{relative}"]\n')
    target = study / name
    target.write_text("\n".join(lines), encoding="utf-8")
    return target


def run_recheck(options: argparse.Namespace, work: Path) -> Section:
    """One study of four ~5,000-word DOCX versions: cold, unchanged, and one file changed."""
    study = work / "recheck"
    files = [*write_pair(RECHECK_WORDS, "docx", study / "p0")]
    files += [*write_pair(RECHECK_WORDS + 40, "docx", study / "p1")]
    # An edit of the last version before each run (one sentence added, as in a pull request),
    # a different one each time, so that every run misses on that file and only on it.
    import docx

    variants = []
    for k in range(options.repeat):
        edited = docx.Document(str(files[-1]))
        edited.add_paragraph(f"Check the seal again after {k + 2} days of use.")
        variants.append(work / "variants" / f"{k}.docx")
        variants[-1].parent.mkdir(parents=True, exist_ok=True)
        edited.save(str(variants[-1]))
    target = _study_file(study, files, "Recheck")
    command = [PYTHON, "-m", "matcheck", "check", str(target), "-f", "json", "-o"]
    out = str(work / "recheck.json")
    cold = measure([*command, out, "--no-cache"], options.repeat)
    _empty_cache()
    subprocess.run([*command, out], check=False, capture_output=True)  # fills the cache
    warm = measure([*command, out], options.repeat)

    def change_one(index: int) -> None:
        shutil.copyfile(variants[index], files[-1])

    changed = measure([*command, out], options.repeat, before=change_one)
    report = json.loads(Path(out).read_text(encoding="utf-8"))
    assert report["cache"] == {"files": 4, "from_cache": 3}, report["cache"]
    runs = {"cold": cold, "unchanged": warm, "one_changed": changed}
    return Section(
        [{name: asdict(run) for name, run in runs.items()}],
        [
            f"check STUDY, 4 DOCX versions of ~{RECHECK_WORDS:,} words:",
            *(
                f"  {name}: {run.seconds:.2f} s wall, {run.cpu_seconds:.2f} s processor, "
                f"{run.peak_mib:.0f} MiB"
                for name, run in runs.items()
            ),
        ],
        [
            check(
                warm.seconds < UNCHANGED_SECONDS,
                f"unchanged study from the cache: {warm.seconds:.2f} s (< {UNCHANGED_SECONDS})",
            ),
            check(
                changed.seconds < ONE_CHANGED_SECONDS,
                f"one of four files changed: {changed.seconds:.2f} s (< {ONE_CHANGED_SECONDS})",
            ),
        ],
    )


def run_folder(options: argparse.Namespace, work: Path) -> Section:
    """200 studies of four Markdown versions drawn from 40 lessons, 1 and 2 workers."""
    folder = work / "folder"
    pool: list[Path] = []
    for index in range(FOLDER_POOL // 2):
        pool += write_pair(FOLDER_WORDS + 20 * index, "md", folder / "lessons" / f"l{index:02d}")
    for index in range(FOLDER_STUDIES):
        # A shared control, and three others chosen by a fixed stride through the pool. The
        # study files sit above the lessons: a study reads only files at or below its folder.
        chosen = [pool[0], *(pool[1 + (index * 7 + k * 13) % (FOLDER_POOL - 1)] for k in range(3))]
        _study_file(folder, chosen, f"Study {index}", f"study-{index:03d}.toml")
    command = [PYTHON, "-m", "matcheck", "check", str(folder), "-f", "json", "-o"]
    out = str(work / "folder.json")
    cold_one = measure([*command, out, "--jobs", "1", "--no-cache"], options.repeat)
    cold_two = measure([*command, out, "--jobs", "2", "--no-cache"], options.repeat)
    empty_one = measure([*command, out, "--jobs", "1"], options.repeat, before=_empty_cache)
    empty_two = measure([*command, out, "--jobs", "2"], options.repeat, before=_empty_cache)
    warm_two = measure([*command, out, "--jobs", "2"], options.repeat)
    runs = {
        "no cache, 1 worker": cold_one,
        "no cache, 2 workers": cold_two,
        "empty cache, 1 worker": empty_one,
        "empty cache, 2 workers": empty_two,
        "full cache, 2 workers": warm_two,
    }
    bound = cold_one.seconds / 2
    speedup = empty_one.seconds / empty_two.seconds
    return Section(
        [{name: asdict(run) for name, run in runs.items()}],
        [
            f"check DIR, {FOLDER_STUDIES} studies x 4 Markdown versions of ~{FOLDER_WORDS:,} "
            f"words drawn from {FOLDER_POOL} lessons:",
            *(
                f"  {name}: {run.seconds:.2f} s wall, {run.cpu_seconds:.2f} s processor, "
                f"{run.peak_mib:.0f} MiB (largest process)"
                for name, run in runs.items()
            ),
        ],
        [
            check(
                empty_two.seconds <= FOLDER_MARGIN * bound,
                f"{FOLDER_STUDIES} studies, 2 workers, empty cache: {empty_two.seconds:.1f} s "
                f"(<= {FOLDER_MARGIN} x cold total / 2 = {FOLDER_MARGIN * bound:.1f} s)",
            ),
            check(
                speedup >= FOLDER_SPEEDUP,
                f"{FOLDER_STUDIES} studies: 2 workers {speedup:.2f}x faster than 1, whole "
                f"process, empty cache (>= {FOLDER_SPEEDUP})",
            ),
        ],
    )


# A new section is a function of (options, work) -> Section, and one entry here.
SECTIONS: dict[str, Callable[[argparse.Namespace, Path], Section]] = {
    "pairs": run_pairs,
    "studies": run_studies,
    "help": run_help,
    "recheck": run_recheck,
    "folder": run_folder,
}


def exponent(small: PairRow, large: PairRow, value: Callable[[PairRow], float]) -> float:
    """k in cost ∝ words^k between two sizes (1 is linear)."""
    return math.log(value(large) / value(small)) / math.log(large.words / small.words)


def pair_table(rows: list[PairRow]) -> list[str]:
    lines = [
        "| words | format | matcheck s | baseline s | ratio | matcheck MiB | baseline MiB "
        "| time growth | memory growth |",
        "|---:|---|---:|---:|---:|---:|---:|---:|---:|",
    ]
    previous: dict[str, PairRow] = {}
    for row in rows:
        growth = memory = "—"
        if (last := previous.get(row.fmt)) is not None:
            step = row.words / last.words
            growth = f"{row.matcheck.seconds / last.matcheck.seconds:.2f}x ({step:.1f}x words)"
            memory = f"{row.matcheck.peak_mib / last.matcheck.peak_mib:.2f}x"
        previous[row.fmt] = row
        lines.append(
            f"| {row.words:,} | {row.fmt} | {row.matcheck.seconds:.2f} | "
            f"{row.baseline.seconds:.2f} | {row.ratio:.2f} | {row.matcheck.peak_mib:.0f} | "
            f"{row.baseline.peak_mib:.0f} | {growth} | {memory} |"
        )
    return lines


def pair_checks(rows: list[PairRow]) -> list[str]:
    """Each target of docs/performance.md about pairs, met or not."""
    out: list[str] = []
    for row in rows:
        if row.fmt == "docx" and 4000 <= row.words <= 6000:
            out.append(
                check(
                    row.ratio <= RATIO_TARGET,
                    f"5k DOCX within {RATIO_TARGET}x baseline: {row.ratio:.2f}x",
                )
            )
    # A 4x step may cost 5x: the exponent log 5 / log 4 = 1.16 allows that at any step size.
    limit = math.log(GROWTH_PER_4X) / math.log(4)
    by_format: dict[str, list[PairRow]] = {}
    for row in rows:
        by_format.setdefault(row.fmt, []).append(row)
    for fmt, items in by_format.items():
        for small, large in itertools.pairwise(items):
            k_time = exponent(small, large, lambda r: r.matcheck.seconds)
            k_mem = exponent(small, large, lambda r: r.matcheck.peak_mib)
            out.append(
                check(
                    k_time <= limit and k_mem <= limit,
                    f"{fmt} {small.words:,} -> {large.words:,} words: time ∝ words^{k_time:.2f},"
                    f" memory ∝ words^{k_mem:.2f} (limit {limit:.2f})",
                )
            )
    for row in rows:
        if row.words >= 90_000:
            out.append(
                check(
                    row.matcheck.seconds < LARGEST_SECONDS and row.matcheck.peak_mib < LARGEST_MIB,
                    f"{row.fmt} {row.words:,} words: {row.matcheck.seconds:.1f} s "
                    f"(< {LARGEST_SECONDS:.0f}), {row.matcheck.peak_mib:.0f} MiB "
                    f"(< {LARGEST_MIB:.0f})",
                )
            )
    return out


def parse(argv: list[str]) -> argparse.Namespace:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])

    def ints(text: str) -> list[int]:
        return [int(part) for part in text.split(",") if part]

    def names(text: str) -> list[str]:
        return [part for part in text.split(",") if part]

    parser.add_argument("--sizes", type=ints, default=[1000, 5000, 20000, 100000])
    parser.add_argument("--formats", type=names, default=["docx", "pdf", "md"])
    parser.add_argument("--repeat", type=int, default=1, help="runs per measurement (median)")
    parser.add_argument("--sections", type=names, default=list(SECTIONS))
    parser.add_argument("--json", type=Path, help="also write the measurements here")
    parser.add_argument("--keep", action="store_true", help="keep the generated lessons")
    options = parser.parse_args(argv)
    unknown = set(options.sections) - set(SECTIONS)
    if unknown or set(options.formats) - {"docx", "pdf", "md"}:
        parser.error(f"unknown section or format: {', '.join(sorted(unknown)) or options.formats}")
    return options


def main(argv: list[str]) -> int:
    options = parse(argv)
    work = Path(tempfile.mkdtemp(prefix="matcheck-bench-"))
    print(f"lessons in {work}", file=sys.stderr)
    # A cache of the benchmark's own, empty at the start: the user's is neither used nor filled.
    os.environ["MATCHECK_CACHE_DIR"] = str(work / "cache")
    results: dict[str, Section] = {}
    try:
        for name in options.sections:
            results[name] = SECTIONS[name](options, work)
    finally:
        if not options.keep:
            shutil.rmtree(work, ignore_errors=True)
    for section in results.values():
        print("\n".join(section.table), end="\n\n")
    print("\n".join(line for section in results.values() for line in section.checks))
    if options.json:
        payload = {name: section.data for name, section in results.items()}
        options.json.write_text(json.dumps(payload, indent=2), encoding="utf-8")
    return 0


if __name__ == "__main__":
    raise SystemExit(main(sys.argv[1:]))
