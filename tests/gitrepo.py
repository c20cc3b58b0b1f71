"""Running git in a temporary test repository (tests that need a real Git history)."""

from __future__ import annotations

import subprocess
from pathlib import Path


def git(repo: Path, *args: str) -> None:
    """``git ARGS`` in ``repo`` with a fixed author, failing the test on a non-zero status."""
    subprocess.run(
        ["git", "-c", "user.name=t", "-c", "user.email=t@example.org", *args],
        cwd=repo,
        check=True,
        capture_output=True,
    )
