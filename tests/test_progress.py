"""Progress lines on long steps: on a terminal only, after a delay, wiped when done, and never in
what a program reads (standard output, or standard error when it is not a terminal)."""

import io
import os
import time

import pytest

from tabq import progress
from tabq.cli import main
from tabq.progress import CLEAR, reading_label, working


class Terminal(io.StringIO):
    def isatty(self):
        return True


@pytest.fixture(autouse=True)
def no_forcing(monkeypatch):
    monkeypatch.delenv("TABQ_PROGRESS", raising=False)


def _until_drawn(screen: Terminal, text: str, seconds: float = 60.0) -> None:
    """Keep the step running until the drawing thread has put `text` on the screen. A loaded
    machine may start that thread late: a fixed sleep would fail there, and how soon the line
    appears is not what these tests check (the delay is)."""
    deadline = time.monotonic() + seconds
    while text not in screen.getvalue():
        assert time.monotonic() < deadline, f"{text!r} was never drawn"
        time.sleep(0.01)


def test_a_long_step_on_a_terminal_says_what_and_how_long_then_wipes_itself():
    screen = Terminal()
    with working("reading sales.csv (2.0 GB)", screen, delay=0.02):
        assert progress.drawing()
        _until_drawn(screen, "tabq: reading sales.csv")
    shown = screen.getvalue()
    assert "tabq: reading sales.csv (2.0 GB)" in shown and " s" in shown
    assert shown.endswith(CLEAR) and not progress.drawing()


def test_nothing_when_quick_or_not_a_terminal():
    quick, piped = Terminal(), io.StringIO()
    with working("reading", quick, delay=5):
        pass
    with working("reading", piped, delay=0):
        time.sleep(0.2)
    assert quick.getvalue() == "" and piped.getvalue() == ""


def test_a_file_name_cannot_act_on_the_terminal(tmp_path):
    path = tmp_path / "evil\x1b[2Jname.csv"
    path.write_text("a\n1\n")
    screen = Terminal()
    with working(reading_label(str(path)), screen, delay=0):
        _until_drawn(screen, "name.csv")
    assert "\x1b[2J" not in screen.getvalue() and "\\x1b[2Jname.csv" in screen.getvalue()
    assert reading_label(str(path)).endswith("(0.0 MB)")


def test_the_cli_shows_progress_on_stderr_only(capsys, monkeypatch, demo_csv):
    monkeypatch.setenv("TABQ_PROGRESS", "1")        # stands in for a terminal
    monkeypatch.setattr(progress, "DELAY", 0.0)
    assert main(["ask", str(demo_csv), "how many jobs were cancelled", "--format", "csv"]) == 0
    out = capsys.readouterr()
    assert "tabq: reading repair_jobs.csv" in out.err and "tabq:" not in out.out
    assert out.out.splitlines()[0] == "count"


def test_a_fork_while_a_line_is_drawn_leaves_the_child_free_to_write():
    screen = Terminal()
    with working("teaching", screen, delay=0):
        time.sleep(0.05)
        child = os.fork()
        if child == 0:                      # the child writes through the same lock at once
            progress._write(io.StringIO(), "x")
            os._exit(0)
        _, status = os.waitpid(child, 0)
    assert os.waitstatus_to_exitcode(status) == 0
