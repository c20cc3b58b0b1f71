"""``check DIR --scheduler ADDRESS``: check the studies on a Dask distributed cluster.

Each study is one task running :func:`matcheck.batch.check_one` on a worker (given here by
``check DIR`` as ``task``), exactly as a
local worker process runs it, so a study that cannot be read comes back as its one-line
error and a bug in a task is raised here as it would be locally. The paths go to the
workers as given, so the workers must see the study files at the same paths (a shared or
synchronised file system; give an absolute folder unless the workers start in the same
working folder) and have matcheck installed; each uses the cache folder of its own machine.
``dask`` and ``distributed`` are the optional extra ``matcheck[dask]``, imported only here.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from pathlib import Path

from matcheck.errors import UsageError
from matcheck.findings import StudyResult

# Seconds to wait for the scheduler before giving up with a usage error.
CONNECT_TIMEOUT = 30


Outcome = tuple[StudyResult, tuple[Path, ...]]


def check_on_cluster(
    paths: Sequence[Path], address: str, task: Callable[[Path], Outcome]
) -> list[Outcome]:
    """``task(path)`` of each study on the cluster (its result and the files it read), in the
    order of ``paths``."""
    try:
        from distributed import Client
    except ImportError:
        raise UsageError("--scheduler needs Dask: pip install 'matcheck[dask]'") from None
    try:
        client = Client(  # type: ignore[no-untyped-call]
            address, timeout=CONNECT_TIMEOUT, set_as_default=False
        )
    except (OSError, TimeoutError, ValueError) as error:
        raise UsageError(f"--scheduler {address}: cannot connect ({error})") from None
    with client:
        futures = [
            client.submit(
                task,
                path,
                pure=False,
                key=f"matcheck-check-{index}-{path.name}",
            )
            for index, path in enumerate(paths)
        ]
        results: list[Outcome] = client.gather(futures)  # type: ignore[no-untyped-call]
    return results
