"""A progress bar on stderr for runs long enough to need one.

The orchestrator (:mod:`matcheck.api`) reports its steps to a :class:`Steps` (reading each
version, comparing); by default nobody listens. The CLI listens with :func:`terminal_steps`,
which draws a transient bar on stderr only when stderr is a terminal and only once the run
has lasted :data:`DELAY` seconds, so quick runs, pipes and CI logs never see it.
"""

from __future__ import annotations

import sys
import threading
from collections.abc import Iterator
from contextlib import contextmanager
from typing import TYPE_CHECKING, Protocol, TextIO

if TYPE_CHECKING:
    from rich.progress import Progress, TaskID

# Seconds before the bar appears: a run shorter than this shows nothing (common practice for
# command-line tools; about the time after which a user wonders whether anything happens).
DELAY = 2.0


class Steps(Protocol):
    def step(self, label: str) -> None:
        """The previous step is done; ``label`` says what happens next."""


class Silent:
    def step(self, label: str) -> None:
        return None


SILENT = Silent()


class _Bar:
    """Counts steps from the start; draws them once the delay has passed."""

    def __init__(self, total: int, title: str, stream: TextIO) -> None:
        self.total, self.title, self.stream = total, title, stream
        self.done = -1
        self.label = ""
        self._lock = threading.Lock()
        self._progress: Progress | None = None
        self._task: TaskID | None = None
        self._timer = threading.Timer(DELAY, self._show)
        self._timer.daemon = True
        self._closed = False

    def step(self, label: str) -> None:
        with self._lock:
            self.done += 1
            self.label = label
            if self._progress is not None and self._task is not None:
                self._progress.update(
                    self._task, completed=max(self.done, 0), description=self._text()
                )

    def _text(self) -> str:
        return f"{self.title}: {self.label}" if self.label else self.title

    def _show(self) -> None:
        from rich.console import Console
        from rich.progress import BarColumn, MofNCompleteColumn, Progress, TextColumn

        with self._lock:
            if self._closed:
                return
            self._progress = Progress(
                TextColumn("{task.description}", markup=False),
                BarColumn(),
                MofNCompleteColumn(),
                console=Console(file=self.stream),
                transient=True,
            )
            self._task = self._progress.add_task(
                self._text(), total=self.total, completed=max(self.done, 0)
            )
            self._progress.start()

    def start(self) -> None:
        self._timer.start()

    def stop(self) -> None:
        self._timer.cancel()
        with self._lock:
            self._closed = True
            if self._progress is not None:
                self._progress.stop()


@contextmanager
def terminal_steps(total: int, title: str, stream: TextIO | None = None) -> Iterator[Steps]:
    """A :class:`Steps` that shows a bar of ``total`` steps on ``stream`` (stderr) after
    :data:`DELAY` seconds, when the stream is a terminal."""
    stream = stream or sys.stderr
    if not stream.isatty():
        yield SILENT
        return
    bar = _Bar(total, title, stream)
    bar.start()
    try:
        yield bar
    finally:
        bar.stop()
