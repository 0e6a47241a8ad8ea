"""Progress of a long step (reading a big file, a question's search, teaching) on stderr: one
line saying what tabq is doing and for how long, redrawn in place and wiped when done.

Only on a terminal (or with TABQ_PROGRESS=1, as the teaching progress bars), and only once a
step has run past DELAY, so quick answers and piped output stay exactly as they were. Steps
that count their work (searching many questions) have their own bars in `teaching.pool`.
"""

from __future__ import annotations

import contextlib
import os
import sys
import threading
import time
from collections.abc import Iterator
from pathlib import Path

from .files import size_text
from .safeio import printable

DELAY = 0.6             # seconds a step runs before its line appears
TICK = 0.1              # seconds between redraws
SPINNER = "◐◓◑◒"
CLEAR = "\r\x1b[K"
_ACTIVE = threading.Event()   # a `working` block is running: counting bars keep quiet
# Held while a line is written and across a fork (teaching forks its searches): a child never
# starts with the stream's lock held by a drawing thread it does not have.
_WRITING = threading.Lock()
if hasattr(os, "register_at_fork"):
    os.register_at_fork(before=_WRITING.acquire, after_in_parent=_WRITING.release,
                        after_in_child=_WRITING.release)


def drawing() -> bool:
    """Whether a progress line may be on the screen (so another bar would garble it)."""
    return _ACTIVE.is_set()


def wanted(stream) -> bool:
    """Progress only for a person watching: on a terminal, unless forced on for a test."""
    if os.environ.get("TABQ_PROGRESS") == "1":
        return True
    isatty = getattr(stream, "isatty", None)
    return bool(isatty and isatty())


@contextlib.contextmanager
def working(label: str, stream=None, delay: float | None = None) -> Iterator[None]:
    """Show `label`, a spinner and the seconds spent while the block runs (past `delay`,
    DELAY by default)."""
    stream = stream if stream is not None else sys.stderr
    delay = DELAY if delay is None else delay
    label = printable(label)           # a file name must not act on the terminal
    if not wanted(stream):
        yield
        return
    done = threading.Event()
    drawn = threading.Event()
    start = time.monotonic()

    def draw() -> None:
        if done.wait(delay):
            return
        turn = 0
        while not done.is_set():
            seconds = time.monotonic() - start
            _write(stream, f"{CLEAR}tabq: {label} {SPINNER[turn % len(SPINNER)]} {seconds:.1f} s")
            drawn.set()
            turn += 1
            done.wait(TICK)

    thread = threading.Thread(target=draw, name="tabq-progress", daemon=True)
    _ACTIVE.set()
    thread.start()
    try:
        yield
    finally:
        done.set()
        thread.join()
        _ACTIVE.clear()
        if drawn.is_set():
            _write(stream, CLEAR)


def reading_label(path: object) -> str:
    """'reading sales.csv (1.2 GB)': the name and, for one file, its size."""
    if not isinstance(path, (str, Path)):
        return "reading the table"
    name = Path(path).name or str(path)
    try:
        size = f" ({size_text(os.stat(path).st_size)})" if os.path.isfile(path) else ""
    except OSError:
        size = ""
    return f"reading {name}{size}"


def _write(stream, text: str) -> None:
    with _WRITING:
        try:
            stream.write(text)
            stream.flush()
        except (OSError, ValueError):   # the terminal went away: progress is not worth an error
            pass
