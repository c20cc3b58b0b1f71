"""Ctrl-C and SIGTERM end the run with the documented status and leave nothing behind.

Each test starts matcheck in a subprocess, waits until the part under test is running (worker
processes exist, or the temporary folder of ``--against`` does), sends the signal and checks
the exit status (130 for SIGINT, 143 for SIGTERM: 128 + the signal number, the shell's
convention; docs/references.md §22) and that no worker process or temporary folder is left.
"""

from __future__ import annotations

import os
import shutil
import signal
import subprocess
import sys
import time
from collections.abc import Callable
from pathlib import Path

import pytest

DEMO = Path(__file__).resolve().parent.parent / "fixtures" / "demo"
pytestmark = pytest.mark.skipif(sys.platform == "win32", reason="POSIX signals")


def _children(pid: int) -> set[int]:
    found: set[int] = set()
    for task in Path(f"/proc/{pid}/task").glob("*"):
        try:
            found |= {int(p) for p in (task / "children").read_text().split()}
        except OSError:
            continue
    return found


def _alive(pid: int) -> bool:
    try:
        stat = Path(f"/proc/{pid}/stat").read_text()
    except OSError:
        return False
    return stat.rsplit(")", 1)[1].split()[0] != "Z"


def _wait_for(condition: Callable[[], bool], seconds: float = 60.0) -> bool:
    end = time.monotonic() + seconds
    while time.monotonic() < end:
        if condition():
            return True
        time.sleep(0.05)
    return False


def _studies(folder: Path, count: int) -> Path:
    for index in range(count):
        shutil.copytree(DEMO, folder / f"study{index}", ignore=shutil.ignore_patterns("*.json"))
    return folder


def _start(args: list[str], cwd: Path, env: dict[str, str] | None = None) -> subprocess.Popen[str]:
    return subprocess.Popen(
        [sys.executable, "-m", "matcheck", *args],
        cwd=cwd,
        stdout=subprocess.DEVNULL,
        stderr=subprocess.PIPE,
        text=True,
        start_new_session=True,
        env={**os.environ, **(env or {})},
    )


@pytest.mark.skipif(not Path("/proc/self/task").exists(), reason="needs /proc")
@pytest.mark.parametrize(
    ("signum", "status"), [(signal.SIGTERM, 143), (signal.SIGINT, 130)], ids=["TERM", "INT"]
)
def test_check_folder_ends_its_workers(tmp_path: Path, signum: int, status: int) -> None:
    folder = _studies(tmp_path / "studies", 6)
    process = _start(["check", str(folder), "--jobs", "2", "--format", "json"], tmp_path)
    try:
        assert _wait_for(lambda: len(_children(process.pid)) >= 2), "no workers started"
        workers = _children(process.pid)
        time.sleep(0.3)
        if signum == signal.SIGINT:
            os.killpg(process.pid, signum)  # Ctrl-C reaches the whole process group
        else:
            process.send_signal(signum)  # timeout(1) and CI runners signal the main process
        _, err = process.communicate(timeout=60)
    finally:
        if process.poll() is None:
            os.killpg(process.pid, signal.SIGKILL)
    assert process.returncode == status, err
    assert err.strip() in ("matcheck: interrupted", "matcheck: terminated")
    assert _wait_for(lambda: not any(_alive(pid) for pid in workers), 10), "workers left"


@pytest.mark.skipif(shutil.which("git") is None, reason="needs git")
def test_sigterm_during_against_removes_the_temporary_folder(tmp_path: Path) -> None:
    repo = tmp_path / "repo"
    shutil.copytree(DEMO, repo, ignore=shutil.ignore_patterns("*.json"))
    git = ["git", "-c", "user.name=t", "-c", "user.email=t@example.org"]
    subprocess.run([*git, "init", "-q"], cwd=repo, check=True)
    subprocess.run([*git, "add", "-A"], cwd=repo, check=True)
    subprocess.run([*git, "commit", "-qm", "one"], cwd=repo, check=True)
    temp = tmp_path / "temp"
    temp.mkdir()
    process = _start(
        ["check", "study.toml", "--against", "HEAD", "--format", "json"],
        repo,
        {"TMPDIR": str(temp)},
    )
    try:
        assert _wait_for(lambda: any(temp.glob("matcheck-rev-*"))), "no temporary folder"
        process.send_signal(signal.SIGTERM)
        _, err = process.communicate(timeout=60)
    finally:
        if process.poll() is None:
            os.killpg(process.pid, signal.SIGKILL)
    assert process.returncode == 143, err
    assert not list(temp.glob("matcheck-rev-*"))
