"""A process pool that leaves no worker behind, however the run ends.

``ProcessPoolExecutor`` used as a ``with`` block waits for running tasks on the way out, so
Ctrl-C or SIGTERM during ``check DIR`` would block until every worker finished its study,
or leave workers orphaned when the parent was killed while waiting. :func:`worker_pool` ends
the workers itself (SIGTERM, then SIGKILL after a grace period) when the block is left by an
exception, and workers ignore SIGINT so that only the parent decides.
"""

from __future__ import annotations

import signal
import threading
from collections.abc import Iterator
from concurrent.futures import ProcessPoolExecutor
from contextlib import contextmanager
from multiprocessing.context import BaseContext

from matcheck.interrupt import in_worker

GRACE_SECONDS = 5.0


@contextmanager
def worker_pool(workers: int, context: BaseContext | None) -> Iterator[ProcessPoolExecutor]:
    pool = ProcessPoolExecutor(max_workers=workers, mp_context=context, initializer=in_worker)
    try:
        yield pool
    except BaseException:
        with _signals_held():  # a second Ctrl-C must not orphan the workers mid-cleanup
            end_workers(pool)
        raise
    pool.shutdown(wait=True)


@contextmanager
def _signals_held() -> Iterator[None]:
    """Ignore SIGINT and SIGTERM for the body (main thread only; elsewhere nothing changes)."""
    if threading.current_thread() is not threading.main_thread():
        yield
        return
    previous = {sig: signal.signal(sig, signal.SIG_IGN) for sig in (signal.SIGINT, signal.SIGTERM)}
    try:
        yield
    finally:
        for sig, handler in previous.items():
            signal.signal(sig, signal.SIG_DFL if handler is None else handler)


def end_workers(pool: ProcessPoolExecutor) -> None:
    """Cancel what has not started and end the worker processes now."""
    # ``_processes`` is the executor's table of live workers (CPython 3.8 to 3.13); there is
    # no public way to reach them, and terminate() is the only way to stop a running task.
    processes = list((getattr(pool, "_processes", None) or {}).values())
    pool.shutdown(wait=False, cancel_futures=True)
    for process in processes:
        if process.is_alive():
            process.terminate()
    for process in processes:
        process.join(GRACE_SECONDS)
        if process.is_alive():
            process.kill()
            process.join()
