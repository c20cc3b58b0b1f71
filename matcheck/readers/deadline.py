"""A wall-clock limit on reading one file (``ReadLimits.max_read_seconds``).

A parser stuck on a hostile file (a quadratic corner of a library, a page that takes minutes)
must not hang a run over a whole folder. The limit uses ``SIGALRM`` through
``signal.setitimer``, which POSIX delivers to the main thread only, so it applies when matcheck
reads in the main thread of a POSIX system; elsewhere (Windows, a worker thread) it is left
off rather than half-working, and when the caller already runs a real-time interval timer
(e.g. pytest-timeout) that timer is left alone and there is no limit either. Python runs the
handler between bytecodes, so a single long call into C (one huge regular expression, one
inflate) finishes before the limit takes effect.
"""

from __future__ import annotations

import signal
import threading
from collections.abc import Iterator
from contextlib import contextmanager
from types import FrameType

from matcheck.errors import LimitExceeded


class _Expired(BaseException):
    """Raised by the alarm handler. A BaseException, so that a reader's broad ``except
    Exception`` (which turns library errors into CorruptFile) cannot swallow it."""


def _can_alarm() -> bool:
    return (
        hasattr(signal, "setitimer")
        and threading.current_thread() is threading.main_thread()
        and signal.getitimer(signal.ITIMER_REAL) == (0.0, 0.0)
    )


@contextmanager
def deadline(seconds: float | None, path: str, what: str = "reading the file") -> Iterator[None]:
    """Raise :class:`LimitExceeded` naming ``max_read_seconds`` if the body runs too long.

    Nested deadlines: only the outermost one runs a timer (an inner one finds the timer set and
    leaves it alone), so a whole per-file run (read, analyse, measure) can be one budget."""
    if seconds is None or seconds <= 0 or not _can_alarm():
        yield
        return

    def expire(signum: int, frame: FrameType | None) -> None:
        raise _Expired

    previous = signal.signal(signal.SIGALRM, expire)
    try:
        try:
            signal.setitimer(signal.ITIMER_REAL, seconds)
            yield
        finally:
            signal.setitimer(signal.ITIMER_REAL, 0)
    except _Expired:
        # Also when the alarm fell between the end of the body and the timer's reset: the
        # outer handler catches it either way, so it never escapes as a BaseException.
        raise LimitExceeded(
            f"{what} took longer than max_read_seconds ({seconds:g} s); stopped",
            path=path,
            hint="raise it with --limit max_read_seconds=N if this is really a lesson",
        ) from None
    finally:
        signal.signal(signal.SIGALRM, signal.SIG_DFL if previous is None else previous)
