"""limits: how much of the machine one loaded table may use — DuckDB's memory limit and threads.

Every reader and the connection that holds TABLE are bounded by these from the start, so a huge
or hostile file fails with one line instead of taking the machine.
"""

from __future__ import annotations

import os

MEMORY_LIMIT_CAP = 4 << 30   # bytes; hard cap: temp_directory is '' so DuckDB cannot spill
THREADS_CAP = 4              # more threads than this buy little on one table and starve the UI
# Most columns one table may have. Typing and profiling grow with columns (2,000 columns of 4 rows
# load in about 8 s on 2 cores); a table wider than this is nearly always padding or transposed.
COLUMNS_MAX = 2_048


def too_wide(width: int) -> str | None:
    """The reason a table of `width` columns is refused, or None."""
    if width <= COLUMNS_MAX:
        return None
    return f"{width:,} columns; tabq reads at most {COLUMNS_MAX:,}"


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
