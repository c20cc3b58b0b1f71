"""``check DIR --scheduler``: the studies of a folder on a Dask cluster (here a local one of
two workers, threads of this process) give the same results and errors as a local run."""

from __future__ import annotations

from pathlib import Path

import pytest

from matcheck.batch import check_folder
from matcheck.errors import UsageError

distributed = pytest.importorskip(
    "distributed", reason="dask's distributed scheduler is not installed (matcheck[dask])"
)

LESSON = """# Composting

A compost heap needs green waste, brown waste, air and water. Turn it every few weeks so that
the middle stays warm, and keep it as damp as a wrung-out sponge.
"""

STUDY = """[study]
reference = "a"

[[conditions]]
name = "a"
files = ["a.md"]

[[conditions]]
name = "b"
files = ["{other}"]
"""


def _folder(root: Path) -> Path:
    for n, other in enumerate(["b.md", "b.md", "missing.md"]):
        study = root / f"s{n}"
        study.mkdir(parents=True)
        (study / "a.md").write_text(LESSON, encoding="utf-8")
        (study / "b.md").write_text(LESSON.replace("few", f"{n + 2}"), encoding="utf-8")
        (study / "study.toml").write_text(STUDY.format(other=other), encoding="utf-8")
    return root


def test_a_local_cluster_of_two_workers_gives_the_local_results(tmp_path: Path) -> None:
    folder = _folder(tmp_path / "studies")
    local = check_folder(folder, jobs=1, against=None, tolerances=())[1]
    with distributed.LocalCluster(
        n_workers=2, threads_per_worker=1, processes=False, dashboard_address=None
    ) as cluster:
        remote = check_folder(
            folder, jobs=None, against=None, tolerances=(), scheduler=cluster.scheduler_address
        )[1]
        assert len(cluster.scheduler.workers) == 2
    assert remote == local  # frozen dataclasses: reports and error lines compared whole
    assert remote[2].error is not None and "missing.md" in remote[2].error


def test_an_unreachable_scheduler_is_a_usage_error(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    import matcheck.cluster

    monkeypatch.setattr(matcheck.cluster, "CONNECT_TIMEOUT", 1)
    folder = _folder(tmp_path / "studies")
    with pytest.raises(UsageError, match="--scheduler"):
        check_folder(folder, jobs=None, against=None, tolerances=(), scheduler="tcp://127.0.0.1:9")


def test_workers_use_the_cache_and_say_so(tmp_path: Path) -> None:
    from dataclasses import replace

    from matcheck.cache import Cache

    folder = _folder(tmp_path / "studies")
    local = check_folder(folder, jobs=1, against=None, tolerances=())[1]
    with distributed.LocalCluster(
        n_workers=2, threads_per_worker=1, processes=False, dashboard_address=None
    ) as cluster:
        runs = [
            check_folder(
                folder,
                jobs=None,
                against=None,
                tolerances=(),
                cache=Cache.default(),
                scheduler=cluster.scheduler_address,
            )[1]
            for _ in range(2)
        ]
    for run in runs:
        assert [r.error for r in run] == [r.error for r in local]
        assert [replace(r.report, cache=None) for r in run if r.report] == [
            r.report for r in local if r.report
        ]
    assert [r.report.cache.from_cache for r in runs[1] if r.report] == [2, 2]  # type: ignore[union-attr]
