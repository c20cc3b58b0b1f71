"""A process pool that leaves no worker behind, however the run ends.

``ProcessPoolExecutor`` used as a ``with`` block waits for running tasks on the way out, so
Ctrl-C or SIGTERM during ``check DIR`` would block until every worker finished its study,
or leave workers orphaned when the parent was killed while waiting. :func:`worker_pool` ends
the workers itself (SIGTERM, then SIGKILL after a grace period) when the block is left by an
exception, and workers ignore SIGINT so that only the parent decides.
"""

from __future__ import annotations

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
        end_workers(pool)
        raise
    pool.shutdown(wait=True)


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
