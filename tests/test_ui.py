"""The terminal app driven by Pilot: ask, confirm, "none of these", compare and pick, undo;
checked on the model folder's log and on the re-ranked answers. Plus its non-UI helpers."""

import asyncio

import pandas as pd
import pytest

from tabq.store import ModelFolder
from tabq.table import ColumnRead, ReadReport
from tabq.ui.app import TabqApp
from tabq.ui.chart import bar_chart, bar_rows
from tabq.ui.session import Session, differing_rows, parse_answer
from tabq.ui.widgets import AnswerList, CompareScreen

SIZE = (100, 32)
NO_SHOWS = "how many no-shows were there"


async def _until(pilot, test, seconds: float = 60.0) -> None:
    for _ in range(int(seconds / 0.05)):
        if test():
            return
        await pilot.pause(0.05)
    raise AssertionError("the app did not get there in time")


async def _ask(app, pilot, question: str, typed: bool = False) -> None:
    """Ask in the question box: pasted, or `typed` key by key into the focused widget. A
    pilot's key press waits for the process to go idle (about 60 ms a key, 2 s a question),
    and what a typed key does is Textual's Input; one test types, the others paste."""
    before = app.result
    box = app.query_one("#question")
    if typed:
        await pilot.press(*question)
    else:
        box.focus()
        box.value = ""
        box.insert_text_at_cursor(question)
    await pilot.press("enter")
    await _until(pilot, lambda: app.result is not before and app.result is not None
                 and app.result.question == question)


def _log(folder) -> list:
    return ModelFolder(folder).read_log()


def test_the_question_box_starts_focused_and_enter_asks(penguins_csv, tmp_path):
    async def run():
        app = TabqApp(penguins_csv, tmp_path / "m")
        async with app.run_test(size=SIZE) as pilot:
            assert app.focused.id == "question"
            await _ask(app, pilot, "how many penguins live on dream island", typed=True)
            # 124 penguins on Dream: palmerpenguins documentation (Horst, Hill & Gorman 2020)
            assert app.result.answer == [124]
            assert app.focused is app.query_one(AnswerList)
    asyncio.run(run())


def test_a_late_result_for_an_old_question_is_dropped(demo_csv, tmp_path):
    async def run():
        app = TabqApp(demo_csv, tmp_path / "m")
        async with app.run_test(size=SIZE) as pilot:
            await _ask(app, pilot, "how many jobs were cancelled")
            stale = app.session.ask("how many jobs took more than 40 minutes of labour")
            app.show(stale, app.asked - 1)
            assert app.result.question == "how many jobs were cancelled"
    asyncio.run(run())


def test_confirm_logs_and_reranks_then_undo_takes_it_back(demo_csv, tmp_path):
    folder = tmp_path / "m"

    async def run():
        app = TabqApp(demo_csv, folder)
        async with app.run_test(size=SIZE) as pilot:
            await _ask(app, pilot, NO_SHOWS)
            untaught = app.result
            assert untaught.answer == [240]          # the untaught model misreads the word
            index = next(i for i, r in enumerate(untaught.readings) if r.answer == [10])
            for _ in range(index):
                await pilot.press("down")
            await pilot.press("y")
            await _until(pilot, lambda: app.result is not untaught and len(_log(folder)) == 1)
            record = _log(folder)[0]
            assert (record.question, record.answer) == (NO_SHOWS, [10])
            assert record.query is not None
            await _until(pilot, lambda: app.result.question == NO_SHOWS
                         and app.result is not untaught)
            taught = app.result
            assert taught.answer == [10]              # the confirmed answer now comes first
            await pilot.press("ctrl+z")
            await _until(pilot, lambda: app.result is not taught and len(_log(folder)) == 2)
            await _until(pilot, lambda: app.result is not taught)
            retraction = _log(folder)[1]
            assert retraction.of_id == record.id
            assert app.result.answer == [240]         # back to the untaught ranking
            assert len(_log(folder)) == 2             # nothing removed from the log
    asyncio.run(run())


def test_none_of_these_searches_for_the_typed_answer_and_offers_the_readings(demo_csv,
                                                                             tmp_path):
    folder = tmp_path / "m"

    async def run():
        app = TabqApp(demo_csv, folder)
        async with app.run_test(size=SIZE) as pilot:
            await _ask(app, pilot, NO_SHOWS)
            await pilot.press("n")
            await pilot.press(*"10", "enter")
            # two readings give 10 (minutes missing, status Cancelled): they are compared
            await _until(pilot, lambda: isinstance(app.screen, CompareScreen))
            readings = app.screen.comparison.readings
            cancelled = next(i for i, r in enumerate(readings) if "Cancelled" in r.sql)
            await pilot.press(str(cancelled + 1))
            await _until(pilot, lambda: len(_log(folder)) == 1)
            record = _log(folder)[0]
            assert record.answer == [10] and record.strength == 2.0
            assert "Cancelled" in record.query
            await _until(pilot, lambda: app.result.answer == [10]
                         and "Cancelled" in app.result.sql, 90)
    asyncio.run(run())


def test_a_word_taught_by_one_pick_reads_a_related_question_right(demo_csv, tmp_path):
    # issue 4's "teach a new word in under a minute": ask, pick the meant reading once, ask a
    # related question, and the learned reading comes first
    folder = tmp_path / "m"
    jobs = pd.read_csv(demo_csv, keep_default_na=False)
    cancelled_at_wharf = int(((jobs.status == "Cancelled") & (jobs.site == "Wharf Shed")).sum())

    async def run():
        app = TabqApp(demo_csv, folder)
        async with app.run_test(size=SIZE) as pilot:
            await _ask(app, pilot, NO_SHOWS)
            await pilot.press("n")
            await pilot.press(*"10", "enter")
            await _until(pilot, lambda: isinstance(app.screen, CompareScreen))
            readings = app.screen.comparison.readings
            await pilot.press(str(next(i for i, r in enumerate(readings)
                                       if "Cancelled" in r.sql) + 1))
            await _until(pilot, lambda: len(_log(folder)) == 1)
            await _until(pilot, lambda: app.result.question == NO_SHOWS
                         and app.result.answer == [10], 90)
            await _ask(app, pilot, "how many no-shows at Wharf Shed")
            assert app.result.answer == [cancelled_at_wharf], app.result.sql   # pandas count
            assert "Cancelled" in app.result.sql and "Wharf Shed" in app.result.sql
    asyncio.run(run())


def test_none_of_these_with_an_answer_no_reading_gives_says_so(demo_csv, tmp_path):
    folder = tmp_path / "m"

    async def run():
        app = TabqApp(demo_csv, folder)
        async with app.run_test(size=SIZE) as pilot:
            await _ask(app, pilot, NO_SHOWS)
            await pilot.press("n")
            await pilot.press(*"98765", "enter")
            await _until(pilot, lambda: "No reading" in str(app._q("#status").render()))
            assert _log(folder) == []
    asyncio.run(run())


def test_a_bad_table_is_a_message_not_a_crash(tmp_path):
    bad = tmp_path / "empty.csv"
    bad.write_text("")

    async def run():
        app = TabqApp(bad, tmp_path / "m")
        async with app.run_test(size=SIZE) as pilot:
            # the loader shows its message, then updates the bar: a test that closes the app
            # in between (a loaded machine let it) leaves that step no bar to update
            await _until(pilot, lambda: "tabq:" in str(app._q("#status").render())
                         and not app.workers)
            assert app.session is None
    asyncio.run(run())


def test_a_per_group_answer_is_a_table_with_bars(penguins_csv, tmp_path):
    async def run():
        app = TabqApp(penguins_csv, tmp_path / "m")
        async with app.run_test(size=(120, 40)) as pilot:
            await _ask(app, pilot, "number of penguins for each species")
            best = app.result.best
            assert best.is_table
            counts = pd.read_csv(penguins_csv)["species"].value_counts().to_dict()  # pandas
            assert dict(best.answer) == counts
            await pilot.pause(0.2)
            screen = app.export_screenshot()
            assert "Adelie" in screen and "152" in screen and "█" in screen  # table and bars
    asyncio.run(run())


def test_the_keys_are_in_bindings():
    keys = {b.key for b in TabqApp.BINDINGS} | {b.key for b in AnswerList.BINDINGS}
    assert {"ctrl+q", "ctrl+z", "y", "n", "d", "f2", "f3", "f4", "f5"} <= keys


# ── the non-UI helpers ────────────────────────────────────────────────────────────────────────
def test_parse_answer_keeps_thousands_together():
    assert parse_answer("12,467") == ["12,467"]
    assert parse_answer("Dream, Biscoe") == ["Dream", "Biscoe"]
    assert parse_answer("a; b ;") == ["a", "b"]


def test_bars_scale_to_the_largest_value():
    rows = bar_rows([("Adelie", 152), ("Gentoo", 76), ("x", "n/a")], 20)
    assert [len(bar) for _, bar, _ in rows] == [20, 10, 0]
    assert bar_chart([]) == "(no groups)"


def test_differing_rows_finds_rows_where_two_readings_part(penguins_csv):
    session = Session(penguins_csv, None)
    result = session.ask("how many penguins live on dream island")
    dream = next(c for c in result.candidates if c.sql.endswith("\"island\" = 'Dream'"))
    other = next(c for c in result.candidates if c.answer != dream.answer and not c.error)
    rows, answers = differing_rows(session.open.table, [dream.form, other.form])
    assert answers[0] != answers[1]
    frame = pd.read_csv(penguins_csv).iloc[list(rows)]                 # pandas, by position
    assert answers[0] == [int((frame["island"] == "Dream").sum())]


def test_no_rows_tell_apart_two_readings_of_one_meaning(demo_csv):
    session = Session(demo_csv, None)
    result = session.ask(NO_SHOWS)
    alike = [c for c in result.candidates if c.answer == [10]]
    same = [c for c in alike if "labour_min" in c.sql and "Cancelled" not in c.sql][:1]
    assert differing_rows(session.open.table, [same[0].form, same[0].form]) is None


def test_how_the_table_was_read_is_in_the_bar_and_in_full_on_the_table_tab(demo_csv, tmp_path):
    # until the loaders fill the report, one made here stands in for a messy file's
    report = ReadReport(format="csv", encoding="cp1252", delimiter=";", decimal_mark=",",
                        header_line=4, guesses=["dates read day first"],
                        columns=[ColumnRead("price", "price", "number", 0.95, "decimal comma")])
    report.skip("preamble", [1, 2, 3])

    async def run():
        app = TabqApp(demo_csv, tmp_path / "m")
        async with app.run_test(size=(120, 32)) as pilot:
            await _until(pilot, lambda: app.session is not None and not app.workers)
            app.session.open.table.report = report
            app._loaded()
            await pilot.pause(0.1)
            bar = str(app._q("#bar").render())
            assert "read (f3): 3 preamble rows left out (lines 1, 2, 3); d…" in bar
            await pilot.press("f3")
            await pilot.pause(0.1)
            details = str(app._q("#read-info").render())
            for said in ("semicolon-separated", "decimal comma", "header on line 4",
                         "3 preamble rows left out (lines 1, 2, 3).", "Dates read day first.",
                         "price: number, 95% of its cells read as such"):
                assert said in details
    asyncio.run(run())
