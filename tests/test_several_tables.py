"""Nothing taught is lost on a file with several tables: a confirmation remembers its table (the
SQLite table or the sheet), is replayed on it, and still answers after the weights file is gone
(the weights are a cache of the log). Counts are checked against sqlite3 and openpyxl reading
the same files, not against tabq."""

import asyncio
import json
import sqlite3

import openpyxl
import pytest

from tabq.cli import main
from tabq.load import load_table
from tabq.store import WEIGHTS, ModelFolder
from tabq.ui.app import TabqApp
from tabq.ui.widgets import TablePicker

PLANTS = ["Fern", "Basil", "Monstera", "Cactus", "Lavender", "Rosemary", "Orchid", "Aloe"]
STATUSES = ["paid", "pending", "paid", "refunded", "paid", "paid", "pending", "refunded", "paid",
            "paid", "refunded", "pending", "paid", "paid", "paid", "pending", "refunded", "paid"]
RETURNS = "how many returns were there"          # "returns" names no column or cell: taught
STAFF = [("Ada", "greenhouse"), ("Bo", "till"), ("Cy", "delivery"), ("Di", "till")]


def _orders() -> list[tuple]:
    return [(1000 + i, PLANTS[i % 8], round(4 + (i * 37) % 56 + 0.25, 2), status)
            for i, status in enumerate(STATUSES)]


@pytest.fixture(scope="module")
def shop_db(tmp_path_factory):
    """A SQLite file of two tables: `orders` (the one taught about) and `staff`."""
    path = tmp_path_factory.mktemp("db") / "shop.sqlite"
    with sqlite3.connect(path) as db:
        db.execute("CREATE TABLE staff (name TEXT, team TEXT)")
        db.executemany("INSERT INTO staff VALUES (?, ?)", STAFF)
        db.execute("CREATE TABLE orders (order_id INTEGER, plant TEXT, price REAL, status TEXT)")
        db.executemany("INSERT INTO orders VALUES (?, ?, ?, ?)", _orders())
    db.close()
    return path


@pytest.fixture(scope="module")
def shop_book(tmp_path_factory):
    """A workbook whose second sheet holds the orders."""
    path = tmp_path_factory.mktemp("book") / "shop.xlsx"
    book = openpyxl.Workbook()
    book.active.title = "staff"
    book.active.append(["name", "team"])
    for row in STAFF:
        book.active.append(list(row))
    orders = book.create_sheet("orders")
    orders.append(["order_id", "plant", "price", "status"])
    for row in _orders():
        orders.append(list(row))
    book.save(path)
    return path


def _refunds_in_sqlite(path) -> int:
    """The right answer, counted by sqlite3 (a second engine)."""
    with sqlite3.connect(path) as db:
        (n,) = db.execute("SELECT COUNT(*) FROM orders WHERE status = 'refunded'").fetchone()
    db.close()
    return n


def _refunds_in_sheet(path) -> int:
    """The right answer, counted from the sheet's cells by openpyxl."""
    rows = list(openpyxl.load_workbook(path, read_only=True)["orders"].iter_rows(values_only=True))
    return sum(row[3] == "refunded" for row in rows[1:])


def _ask(capsys, table, question, model) -> list:
    assert main(["ask", str(table), question, "--table", "orders", "--model", str(model),
                 "--json"]) == 0
    return json.loads(capsys.readouterr().out)["answers"][0]["answer"]


@pytest.mark.parametrize("kind", ["sqlite", "xlsx"])
def test_teach_with_table_answers_and_survives_losing_the_weights(kind, shop_db, shop_book,
                                                                  tmp_path, capsys):
    table = shop_db if kind == "sqlite" else shop_book
    right = _refunds_in_sqlite(shop_db) if kind == "sqlite" else _refunds_in_sheet(shop_book)
    model = tmp_path / "model"
    assert _ask(capsys, table, RETURNS, model) != [right]        # untaught: misread
    examples = tmp_path / "confirmed.jsonl"
    examples.write_text(json.dumps({"question": RETURNS, "answer": [right]}) + "\n")
    assert main(["teach", str(table), str(examples), "--table", "orders", "--model", str(model),
                 "--workers", "1"]) == 0
    assert "1 with a reading" in capsys.readouterr().out
    record = ModelFolder(model).read_log()[0]
    assert record.table.name == "orders"
    assert record.table.fingerprint == load_table(table, "orders").fingerprint
    assert _ask(capsys, table, RETURNS, model) == [right]
    saved = json.loads((model / WEIGHTS).read_text())["learned"]
    (model / WEIGHTS).unlink()
    assert _ask(capsys, table, RETURNS, model) == [right]        # rebuilt from the log
    assert json.loads((model / WEIGHTS).read_text())["learned"] == saved   # exactly


def test_a_later_teaching_replays_the_earlier_table_not_skips_it(shop_db, tmp_path, capsys):
    model = tmp_path / "model"
    first = tmp_path / "one.jsonl"
    first.write_text(json.dumps({"question": RETURNS, "answer": [_refunds_in_sqlite(shop_db)]}))
    assert main(["teach", str(shop_db), str(first), "--table", "orders", "--model", str(model),
                 "--workers", "1"]) == 0
    second = tmp_path / "two.jsonl"
    second.write_text(json.dumps({"question": "how many people work at the till",
                                  "answer": [sum(team == "till" for _, team in STAFF)]}))
    capsys.readouterr()
    assert main(["teach", str(shop_db), str(second), "--table", "staff", "--model", str(model),
                 "--workers", "1"]) == 0
    out = capsys.readouterr()
    assert "1 earlier ones replayed" in out.out and "skipped" not in out.err
    assert [r.table.name for r in ModelFolder(model).read_log()] == ["orders", "staff"]


def test_teach_names_an_unknown_table_in_one_line(shop_db, tmp_path, capsys):
    examples = tmp_path / "ex.jsonl"
    examples.write_text(json.dumps({"question": RETURNS, "answer": [4]}) + "\n")
    code = main(["teach", str(shop_db), str(examples), "--table", "nope", "--model",
                 str(tmp_path / "m")])
    err = capsys.readouterr().err
    assert code == 2 and err.count("\n") == 1 and "'nope'" in err
    assert not (tmp_path / "m").exists()


async def _until(pilot, test, seconds: float = 90.0) -> None:
    for _ in range(int(seconds / 0.05)):
        if test():
            return
        await pilot.pause(0.05)
    raise AssertionError("the app did not get there in time")


def test_the_app_lets_the_analyst_choose_a_table_and_a_pick_there_is_kept(shop_db, tmp_path):
    model = tmp_path / "model"
    right = _refunds_in_sqlite(shop_db)

    async def run():
        app = TabqApp(shop_db, model)
        async with app.run_test(size=(100, 32)) as pilot:
            await _until(pilot, lambda: isinstance(app.screen, TablePicker))
            assert app.screen.names == ["orders", "staff"]
            await pilot.press("enter")                   # the first, highlighted: orders
            await _until(pilot, lambda: app.session is not None)
            assert app.session.open.table.name == "orders"
            app.query_one("#question").focus()
            app.query_one("#question").insert_text_at_cursor(RETURNS)   # pasted: see test_ui
            await pilot.press("enter")
            await _until(pilot, lambda: app.result is not None)
            untaught = app.result
            assert untaught.answer != [right]
            index = next(i for i, r in enumerate(untaught.readings) if r.answer == [right])
            for _ in range(index):
                await pilot.press("down")
            await pilot.press("y")
            await _until(pilot, lambda: len(ModelFolder(model).read_log()) == 1
                         and app.result is not untaught and app.result.answer == [right])
    asyncio.run(run())
    assert ModelFolder(model).read_log()[0].table.name == "orders"
    (model / WEIGHTS).unlink()                       # the next time the app opens
    reopened = TabqApp(shop_db, model, "orders")

    async def again():
        async with reopened.run_test(size=(100, 32)) as pilot:
            await _until(pilot, lambda: reopened.session is not None)
            reopened.query_one("#question").focus()
            reopened.query_one("#question").insert_text_at_cursor(RETURNS)
            await pilot.press("enter")
            await _until(pilot, lambda: reopened.result is not None)
            assert reopened.result.answer == [right]
    asyncio.run(again())


def test_a_question_with_no_table_open_says_so_instead_of_waiting(tmp_path):
    broken = tmp_path / "broken.sqlite"
    broken.write_bytes(b"SQLite format 3\x00" + b"\x07" * 200)

    async def run():
        app = TabqApp(broken, tmp_path / "m")
        async with app.run_test(size=(100, 32)) as pilot:
            # the loader done: its own message cannot come after the one asked about
            await _until(pilot, lambda: app.not_open is not None and not app.workers)
            await pilot.press(*"how many", "enter")
            await pilot.pause(0.2)
            status = str(app.query_one("#status").render())
            assert "No table is open" in status and "asking" not in status
    asyncio.run(run())
