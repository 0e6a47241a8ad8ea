"""limits: how much of the machine one loaded table may use — DuckDB's memory limit and threads.

Every reader and the connection that holds TABLE are bounded by these from the start, so a huge
or hostile file fails with one line instead of taking the machine.
"""

from __future__ import annotations

import os

MEMORY_LIMIT_CAP = 4 << 30   # bytes; hard cap: temp_directory is '' so DuckDB cannot spill
THREADS_CAP = 4              # more threads than this buy little on one table and starve the UI


def threads() -> int:
    """The cores this process may use, at most THREADS_CAP."""
    try:
        cores = len(os.sched_getaffinity(0))
    except (AttributeError, OSError):
        cores = os.cpu_count() or 1
    return max(1, min(THREADS_CAP, cores))


def memory_limit() -> int:
    """Half the machine's memory, at most MEMORY_LIMIT_CAP, in bytes (the cap if unknown)."""
    try:
        total = os.sysconf("SC_PAGE_SIZE") * os.sysconf("SC_PHYS_PAGES")
    except (AttributeError, ValueError, OSError):
        return MEMORY_LIMIT_CAP
    return max(256 << 20, min(MEMORY_LIMIT_CAP, total // 2))
