"""SVG snapshots of the app's main screens on the demo table (pytest-textual-snapshot).
Update with `pytest tests/test_ui_snapshots.py --long --snapshot-update` after a deliberate
change. Long tests (about 12 s: each types its question key by key, as a person would, for the
look of the box): CI runs them with --long; tests/test_ui.py drives the same screens."""

from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
DEMO = ROOT / "sample_tables" / "repair_jobs.csv"
APP = ROOT / "tests" / "fixtures" / "ui_app.py"
SIZE = (100, 32)
pytestmark = pytest.mark.long


def _steady(app) -> None:
    """No blinking cursor: a loaded machine would catch it on or off."""
    app._q("#question").cursor_blink = False


async def _answered(pilot, question: str) -> None:
    app = pilot.app
    _steady(app)
    await pilot.press(*question, "enter")
    for _ in range(1200):
        if app.result is not None and not app.workers:
            break
        await pilot.pause(0.05)
    await pilot.pause(0.2)


def test_snapshot_start(snap_compare):
    async def loaded(pilot):
        app = pilot.app
        _steady(app)
        for _ in range(1200):
            if (app.session is not None and not app.workers
                    and app._q("#rows-table").row_count and app._q("#words-table").columns):
                break
            await pilot.pause(0.05)
        await pilot.pause(0.3)
    assert snap_compare(str(APP), terminal_size=SIZE, run_before=loaded)


def test_snapshot_answers(snap_compare):
    assert snap_compare(str(APP), terminal_size=SIZE,
                        run_before=lambda p: _answered(p, "how many jobs were cancelled"))


def test_snapshot_grouped_answer(snap_compare):
    assert snap_compare(str(APP), terminal_size=SIZE,
                        run_before=lambda p: _answered(p, "number of jobs for each site"))


def test_snapshot_table_view(snap_compare):
    async def table(pilot):
        await _answered(pilot, "how many jobs were cancelled")
        await pilot.press("f3")
        await pilot.pause(0.2)
    assert snap_compare(str(APP), terminal_size=SIZE, run_before=table)
