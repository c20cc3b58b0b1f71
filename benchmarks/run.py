"""The benchmark: wall time and peak memory of whole ``matcheck`` processes, beside a baseline.

    python benchmarks/run.py [--sizes 1000,5000,20000,100000] [--formats docx,pdf,md]
                             [--repeat N] [--sections pairs,help] [--json results.json]

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


@dataclass
class PairRow:
    words: int
    fmt: str
    matcheck: Run
    baseline: Run

    @property
    def ratio(self) -> float:
        return self.matcheck.seconds / self.baseline.seconds


def measure(command: list[str], repeat: int) -> Run:
    """Median wall time and highest peak memory of ``repeat`` runs of ``command``."""
    times, peaks = [], []
    for _ in range(repeat):
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
    return Run(statistics.median(times), max(peaks))


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
    command = [PYTHON, "-m", "matcheck", "check", str(folder), "-f", "json", "-o"]
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
                warm_speedup >= JOBS_SPEEDUP,
                f"check DIR with 2 workers: {warm_speedup:.2f}x faster than 1 "
                f"(>= {JOBS_SPEEDUP}), checking alone",
            ),
        ],
    )


# A new section is a function of (options, work) -> Section, and one entry here.
SECTIONS: dict[str, Callable[[argparse.Namespace, Path], Section]] = {
    "pairs": run_pairs,
    "studies": run_studies,
    "help": run_help,
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
