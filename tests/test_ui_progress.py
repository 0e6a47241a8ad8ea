"""The app's status line counts the seconds of a slow step (loading, asking, teaching) once it
runs past BUSY_AFTER, and stops counting when the step's result replaces the message."""

import asyncio
import re
import time

from tabq.ui import app as app_module
from tabq.ui.app import TabqApp
from tabq.ui.session import Session

SIZE = (100, 32)


def _status(app) -> str:
    return str(app.query_one("#status").render())


def test_a_slow_question_counts_its_seconds_then_shows_the_answer(demo_csv, tmp_path,
                                                                  monkeypatch):
    asked = Session.ask

    def slow(self, question):
        time.sleep(2.0)
        return asked(self, question)

    monkeypatch.setattr(Session, "ask", slow)
    monkeypatch.setattr(app_module, "BUSY_TICK", 0.1)

    async def run():
        app = TabqApp(demo_csv, tmp_path / "m")
        async with app.run_test(size=SIZE) as pilot:
            for _ in range(600):
                if app.session is not None:
                    break
                await pilot.pause(0.05)
            await pilot.press(*"how many jobs were cancelled", "enter")
            await pilot.pause(0.1)
            assert _status(app).startswith("asking: how many jobs were cancelled")
            await pilot.pause(1.2)
            assert re.fullmatch(r"asking: how many jobs were cancelled \d+ s", _status(app))
            for _ in range(600):
                if app.result is not None:
                    break
                await pilot.pause(0.05)
            await pilot.pause(0.3)
            assert "distinct answers" in _status(app) and app.status[2] is None
    asyncio.run(run())
