"""Run one command as a child process; print its wall time and peak memory as JSON.

A fresh small process per measurement, so ``RUSAGE_CHILDREN`` holds exactly the command's
peak resident set (Linux reports ``ru_maxrss`` in KiB) and nothing from earlier runs.

    python benchmarks/peak.py -- python -m matcheck compare a.docx b.docx -f json -o out.json
"""

from __future__ import annotations

import json
import resource
import subprocess
import sys
import time


def main(argv: list[str]) -> int:
    if argv[:1] == ["--"]:
        argv = argv[1:]
    if not argv:
        print("usage: peak.py -- COMMAND ...", file=sys.stderr)
        return 2
    start = time.perf_counter()
    completed = subprocess.run(argv, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE)
    wall = time.perf_counter() - start
    usage = resource.getrusage(resource.RUSAGE_CHILDREN)
    peak_kib = usage.ru_maxrss
    result = {
        "seconds": wall,
        # Processor time of the command and its workers: on a shared machine the wall time
        # also holds the waits for a core, which this does not.
        "cpu_seconds": usage.ru_utime + usage.ru_stime,
        "peak_mib": peak_kib / 1024,
        "returncode": completed.returncode,
        "stderr": completed.stderr.decode("utf-8", "replace")[-2000:],
    }
    print(json.dumps(result))
    return 0


if __name__ == "__main__":
    raise SystemExit(main(sys.argv[1:]))
