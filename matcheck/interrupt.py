"""Ending a run on SIGINT or SIGTERM without leaving worker processes or temporary folders.

Python turns SIGINT into :class:`KeyboardInterrupt`; SIGTERM, by default, kills the process at
once, so ``with`` blocks (temporary folders, the worker pool) never clean up. :func:`on_sigterm`
makes SIGTERM raise :class:`Terminated` instead, which unwinds like Ctrl-C; the CLI maps both
to their documented exit statuses (:mod:`matcheck.errors`). Worker processes ignore SIGINT
(Ctrl-C reaches the whole process group) and die on SIGTERM: the parent ends them itself.
"""

from __future__ import annotations

import signal
import threading
from types import FrameType


class Terminated(BaseException):
    """SIGTERM arrived. A BaseException, so no ``except Exception`` can swallow it."""


def _raise_terminated(signum: int, frame: FrameType | None) -> None:
    raise Terminated


def on_sigterm() -> None:
    """Make SIGTERM raise :class:`Terminated` (main thread only; elsewhere nothing changes)."""
    if threading.current_thread() is threading.main_thread() and hasattr(signal, "SIGTERM"):
        signal.signal(signal.SIGTERM, _raise_terminated)


def in_worker() -> None:
    """Initializer of worker processes: the parent handles Ctrl-C and ends its workers."""
    signal.signal(signal.SIGINT, signal.SIG_IGN)
    signal.signal(signal.SIGTERM, signal.SIG_DFL)
