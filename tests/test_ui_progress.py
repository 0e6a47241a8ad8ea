"""The app's status line counts the seconds of a slow step (loading, asking, teaching) once it
runs past BUSY_AFTER, and stops counting when the step's result replaces the message."""

import asyncio
import re
import threading

from tabq.ui import app as app_module
from tabq.ui.app import TabqApp
from tabq.ui.session import Session

SIZE = (100, 32)


def _status(app) -> str:
    return str(app.query_one("#status").render())


async def _until(pilot, test, seconds: float = 60.0) -> None:
    for _ in range(int(seconds / 0.05)):
        if test():
            return
        await pilot.pause(0.05)
    raise AssertionError(f"the app did not get there in time: {_status(pilot.app)!r}")


def test_a_slow_question_counts_its_seconds_then_shows_the_answer(demo_csv, tmp_path,
                                                                  monkeypatch):
    """The question is held until the count has been seen, then let go: on a loaded machine a
    fixed sleep could end before the count showed, or the answer could come first."""
    asked, release = Session.ask, threading.Event()

    def slow(self, question):
        release.wait(120)      # a bound, so that a failed test cannot leave the thread waiting
        return asked(self, question)

    monkeypatch.setattr(Session, "ask", slow)
    monkeypatch.setattr(app_module, "BUSY_TICK", 0.1)
    counting = r"asking: how many jobs were cancelled \d+ s"

    async def run():
        app = TabqApp(demo_csv, tmp_path / "m")
        async with app.run_test(size=SIZE) as pilot:
            try:
                await _until(pilot, lambda: app.session is not None)
                app.query_one("#question").insert_text_at_cursor(   # pasted: see test_ui
                    "how many jobs were cancelled")
                await pilot.press("enter")
                await _until(pilot, lambda: _status(app).startswith(
                    "asking: how many jobs were cancelled"))
                assert app.status[2] is not None      # a busy message, whose seconds count
                await _until(pilot, lambda: re.fullmatch(counting, _status(app)))
            finally:
                release.set()
            await _until(pilot, lambda: app.result is not None)
            await _until(pilot, lambda: "distinct answers" in _status(app))
            assert app.status[2] is None
    asyncio.run(run())
