"""Tests of the load stage (tabq/load.py and the modules of its steps) and of the cell parsers
it uses (tabq/values.py).

All tables here are invented for the tests, except the Palmer penguins check at the end.
"""

from __future__ import annotations

import datetime
import hashlib
import importlib.resources
import random
import sqlite3
import threading

import duckdb
import pytest

from tabq import limits, retype, values
from tabq.errors import TableFileError, UnknownTableError
from tabq.load import load_table
from tabq.retype import clean_names
from tabq.table import ROW, TABLE, VALUE_CAP

# ---------------------------------------------------------------- helpers


def write(path, text: str, encoding: str = "utf-8"):
    path.write_bytes(text.encode(encoding))
    return path


def rows(table, sql: str, params=None) -> list[tuple]:
    return table.con.execute(sql, params).fetchall()


def names(table) -> list[str]:
    return [c.name for c in table.columns]


def sha256(path) -> str:
    return hashlib.sha256(path.read_bytes()).hexdigest()


def fail(path, error=TableFileError, **kwargs) -> str:
    """The error load_table raises for `path`, checked to be one line naming the file."""
    with pytest.raises(error) as caught:
        load_table(path, **kwargs)
    message = str(caught.value)
    assert "\n" not in message
    assert path.name in message
    return message


# ---------------------------------------------------------------- values.py


@pytest.mark.parametrize("text, number", [
    ("7,169", 7169), ("10,727", 10727), ("8.9 km (5.5 mi)", 8.9), ("4th", 4), ("4th, Western", 4),
    ("$1.2 million", 1.2), ("L 13–17", 13), ("−5", -5), ("-5", -5), ("–5", -5), ("+3", 3),
    (".5", 0.5), ("1,234.5", 1234.5), ("45%", 45), ("1.83 m (6 ft 0 in)", 1.83),
    ("4x400 m relay", 4), ("Deutscher Schachbund [27]", None), ("Ada Quill", None), ("", None),
    (None, None), ("12\u202f345", 12345), ("0 years, 172 days", 0),
])
def test_parse_number(text, number):
    assert values.parse_number(text) == number


@pytest.mark.parametrize("text, numbers", [
    ("2–1", [2, 1]), ("L 13–17", [13, 17]), ("8.9 km (5.5 mi)", [8.9, 5.5]),
    ("1944-03-26", [1944, 3, 26]), ("x-5", [5]), ("a -5", [-5]), ("U23", []), ("1,2345", [1, 2345]),
])
def test_parse_numbers(text, numbers):
    assert values.parse_numbers(text) == numbers


@pytest.mark.parametrize("text, date", [
    ("26 March 1944*", (1944, 3, 26)), ("March 26, 1944", (1944, 3, 26)),
    ("1944-03-26", (1944, 3, 26)), ("26/03/1944", (1944, 3, 26)), ("26 Mar 1944", (1944, 3, 26)),
    ("Sunday, 26th March 1944", (1944, 3, 26)), ("Mar. 26, 1944 [3]", (1944, 3, 26)),
    ("26-Mar-1944", (1944, 3, 26)), ("26.03.1944", (1944, 3, 26)), ("03.04.1944", (1944, 4, 3)),
    ("03/04/1944", (1944, 3, 4)), ("26 March 1944 (aged 45)", (1944, 3, 26)),
    ("2001-05-06 12:30:00", (2001, 5, 6)), ("2001-05-06T12:30", (2001, 5, 6)),
    ("1944", None), ("March 1944", None), ("31 February 1944", None), ("13/13/1944", None),
    ("April 30 to May 6, 1863", None), ("4th", None), ("", None), (None, None),
])
def test_parse_date(text, date):
    assert values.parse_date(text) == (datetime.date(*date) if date else None)


def test_parse_date_day_first_choice():
    assert values.parse_date("03/04/1944", dayfirst=True) == datetime.date(1944, 4, 3)
    assert values.numeric_date_order(["03/04/1944", "26/03/1944"]) is True
    assert values.numeric_date_order(["03/04/1944", "03/26/1944"]) is False
    assert values.numeric_date_order(["03/04/1944", "Ada"]) is None


@pytest.mark.parametrize("text, year", [
    ("2006–Present", 2006), ("1998 season", 1998), ("1998–99", 1998), ("26 March 1944", 1944),
    ("$1999", None), ("12345", None), ("0999", None), ("3000", None), ("1999.5", None),
    ("45%", None), ("none", None), ("", None), (None, None),
])
def test_parse_year(text, year):
    assert values.parse_year(text) == year


@pytest.mark.parametrize("text", ["—", "-", "–", "n/a", " N/A ", "", "?", "TBA", "NA", None,
                                  "\u00a0—\u00a0", "#N/A"])
def test_placeholders(text):
    assert values.is_placeholder(text)


@pytest.mark.parametrize("text", ["0", "x", "Total", "Ada Quill", "2–1"])
def test_not_placeholders(text):
    assert not values.is_placeholder(text)


def test_clean_and_normal_text():
    assert values.clean_cell("\u00a0 Ada  Quill \u00a0\n") == "Ada  Quill"
    assert values.clean_cell(" \u00a0 ") is None
    assert values.normal_text("Ada\u00a0 QUILL ") == "ada quill"
    assert values.strip_footnotes("26 March 1944*[3]") == "26 March 1944"


# ---------------------------------------------------------------- headers


def test_clean_names():
    headers = ["Price (€)", "No.", "", "name", "name", "__row", "Área km²", "2004", "a__b",
               "Год", "Win %", "Name"]
    assert clean_names(headers) == [
        "price", "no", "column_3", "name", "name_2", "row", "area_km2", "c_2004", "a_b",
        "column_10", "win_pct", "name_3"]


def test_headers_in_a_file(tmp_path):
    path = write(tmp_path / "heads.csv",
                 'Name,Name,,"\u00a0Price (€) ",__row,"Two\nlines"\nAda,Bo,x,1,2,3\n')
    table = load_table(path)
    assert names(table) == ["name", "name_2", "column_3", "price", "row", "two_lines"]
    assert [c.header for c in table.columns] == ["Name", "Name", "", "Price (€)", "__row",
                                                 "Two\nlines"]
    assert ROW not in names(table)
    assert rows(table, f"SELECT name, name_2, price FROM {TABLE}") == [("Ada", "Bo", 1)]


# ---------------------------------------------------------------- types and typed views

MESSY = """Runner,Distance,Result,Race day,Season,Place,Fee,Score,Club
Ada Quill,8.9 km (5.5 mi),W 2–1,26 March 1944*,2006–Present,4th,"7,169",12,North
Bo Fennick,"12.0 km (7.5 mi)",L 13–17,"March 27, 1944",1998 season,1st,"$1,020",—,North
Cy Marrow,5 km,D 1–1,1944-03-28,2001,2nd,n/a,7,South
Di Ostrander,—,L 0–3,29/03/1944,—,3rd (tie),−5,NA,  South\u00a0
Ed Pellow,21.1 km,W 3–0,30 Mar 1944,1999–2003,5th,80,9,West
"""


@pytest.fixture
def messy(tmp_path):
    return load_table(write(tmp_path / "messy.csv", MESSY))


def test_typed_views_exist(messy):
    kinds = {c.name: (c.kind, c.base, c.view) for c in messy.columns}
    assert kinds["distance__number"] == ("number", "distance", "number")
    assert kinds["result__number"] == ("number", "result", "number")
    assert kinds["result__number2"] == ("number", "result", "number2")
    assert kinds["race_day__date"] == ("date", "race_day", "date")
    assert kinds["season__year"] == ("number", "season", "year")
    assert kinds["place__number"] == ("number", "place", "number")
    # every real cell of Fee is one amount ("$1,020", "−5"): the column itself is a number
    assert kinds["fee"] == ("number", "fee", None) and "fee__number" not in kinds
    assert "race_day__number" not in kinds       # a date column gets only its date view
    assert "runner__number" not in kinds
    assert messy.column("distance__number").header == "Distance"


def test_typed_view_values(messy):
    got = rows(messy, f"SELECT distance__number, result__number, result__number2, race_day__date, "
                      f"season__year, place__number, fee FROM {TABLE} ORDER BY {ROW}")
    d = datetime.date
    assert got == [
        (8.9, 2, 1, d(1944, 3, 26), 2006, 4, 7169),
        (12.0, 13, 17, d(1944, 3, 27), 1998, 1, 1020),
        (5, 1, 1, d(1944, 3, 28), 2001, 2, None),
        (None, 0, 3, d(1944, 3, 29), None, 3, -5),
        (21.1, 3, 0, d(1944, 3, 30), 1999, 5, 80),
    ]


def test_placeholders_do_not_stop_number_type(messy):
    score = messy.column("score")
    assert (score.kind, score.nulls, score.minimum, score.maximum, score.integer) == \
        ("number", 2, 7.0, 12.0, True)
    assert rows(messy, f"SELECT score FROM {TABLE} ORDER BY {ROW}") == [(12,), (None,), (7,),
                                                                         (None,), (9,)]


def test_text_cells_trimmed_and_profiled(messy):
    club = messy.column("club")
    assert club.values == ("North", "South", "West")   # most frequent first, NBSP trimmed
    assert (club.kind, club.distinct, club.nulls) == ("text", 3, 0)
    distance = messy.column("distance")
    # the placeholder "—" is a missing cell, not a value
    assert distance.values[0] == "8.9 km (5.5 mi)" and "—" not in distance.values
    assert distance.nulls == 1
    assert messy.column("distance__number").nulls == 1
    assert messy.column("distance__number").minimum == 5.0


def test_duckdb_types_kept(tmp_path):
    path = write(tmp_path / "typed.csv", "n,x,day,stamp,ok\n1,1.5,2020-01-02,2020-01-02 10:00:00,"
                                         "true\n2,2.5,2021-03-04,2021-03-04 00:00:00,false\n")
    table = load_table(path)
    kinds = [(c.name, c.kind) for c in table.columns]
    assert kinds == [("n", "number"), ("x", "number"), ("day", "date"), ("stamp", "date"),
                     ("ok", "bool")]
    assert table.column("n").integer and not table.column("x").integer
    assert table.column("day").minimum == "2020-01-02"
    assert table.column("stamp").maximum == "2021-03-04T00:00:00"
    assert table.column("ok").values in (("true", "false"), ("false", "true"))
    assert table.column("ok").minimum is None


def test_midnight_stamps_become_dates(tmp_path):
    path = write(tmp_path / "m.csv", "when\n2020-01-02 00:00:00\n2020-01-03 00:00:00\n")
    table = load_table(path)
    assert table.column("when").kind == "date"
    assert rows(table, f"SELECT typeof(\"when\") FROM {TABLE} LIMIT 1") == [("DATE",)]


def test_values_capped(tmp_path):
    path = write(tmp_path / "many.csv", "code\n" + "".join(f"k{i}\n" for i in range(VALUE_CAP + 9)))
    code = load_table(path).column("code")
    assert code.distinct == VALUE_CAP + 9 and len(code.values) == VALUE_CAP


def test_varied_text_columns_use_sql(tmp_path, monkeypatch):
    # Above VIEW_DISTINCT_CAP distinct texts a column is trimmed and retyped in SQL, with no views.
    monkeypatch.setattr(retype, "VIEW_DISTINCT_CAP", 3)
    path = write(tmp_path / "varied.csv",
                 "a,b\n 1 ,x 1\n2,x 2\n—,\u00a0x 3 \n4,x 4\n5,x 4\n6,n/a\n")
    table = load_table(path)
    assert [(c.name, c.kind) for c in table.columns] == [("a", "number"), ("b", "text")]
    assert rows(table, f"SELECT a, b FROM {TABLE} ORDER BY {ROW}") == [
        (1, "x 1"), (2, "x 2"), (None, "x 3"), (4, "x 4"), (5, "x 4"), (6, None)]
    b = table.column("b")
    assert (b.values[0], b.distinct, b.nulls) == ("x 4", 4, 1)


# ---------------------------------------------------------------- rows: order, empties, totals


def test_row_order_kept(tmp_path):
    ids = list(range(5000))
    random.Random(3).shuffle(ids)
    path = write(tmp_path / "order.csv", "id,label\n" + "".join(f"{i},l{i}\n" for i in ids))
    table = load_table(path)
    assert [r[0] for r in rows(table, f"SELECT id FROM {TABLE} ORDER BY {ROW}")] == ids
    assert [r[0] for r in rows(table, f"SELECT {ROW} FROM {TABLE}")] == list(range(5000))
    assert rows(table, f"SELECT typeof({ROW}) FROM {TABLE} LIMIT 1") == [("BIGINT",)]


def test_empty_rows_dropped_and_row_dense(tmp_path):
    table = load_table(write(tmp_path / "gaps.csv", "a,b\n1,x\n,\n2,y\n , \n3,z\n"))
    assert rows(table, f"SELECT {ROW}, a FROM {TABLE}") == [(0, 1), (1, 2), (2, 3)]
    assert table.row_count == 3


def _totals(table) -> list[int]:
    return [line for s in table.report.skipped if s.why == "total" for line in s.lines]


def test_total_rows_are_left_out_and_said(tmp_path):
    text = "Nation,Gold\nArvel,3\nBront,2\nTotal,5\n"
    medals = load_table(write(tmp_path / "medals.csv", text))
    assert (medals.row_count, _totals(medals)) == (2, [4])      # the file's line 4
    assert rows(medals, f"SELECT sum(gold), count(*) FROM {TABLE}") == [(5, 2)]
    assert medals.column("nation").values == ("Arvel", "Bront")
    text = "Rank,Nation,Gold\n1,Arvel,3\n2,Bront,2\n,Grand total:,5\n"
    assert _totals(load_table(write(tmp_path / "medals2.csv", text))) == [4]
    text = "Season,Team,Goals\n2001,Arvel,3\n2002,Bront,2\nCareer totals,,5\n"
    assert _totals(load_table(write(tmp_path / "career.csv", text))) == [4]


def test_rows_that_only_look_like_totals_stay(tmp_path):
    text = "Nation,Gold\nArvel,3\nTotal,5\nBront,2\n"     # 5 is not the sum of the rows above
    assert load_table(write(tmp_path / "medals3.csv", text)).row_count == 3
    film = load_table(write(tmp_path / "film.csv", "Film,Year\nTotal Recall,1990\nAll Ears,1991\n"))
    assert film.row_count == 2 and not film.report.skipped


def test_subtotal_rows_are_left_out(tmp_path):
    # a depot report: each region's orders, then its subtotal, then a grand total
    blocks = {"North": [120.5, 80.0], "South": [42.25, 7.75, 10.0]}
    lines = ["region,order,amount"]
    for region, amounts in blocks.items():
        lines += [f"{region},{region[0]}{i},{a}" for i, a in enumerate(amounts)]
        lines.append(f"Subtotal {region},,{sum(amounts)}")
    lines.append(f"Grand total,,{sum(sum(a) for a in blocks.values())}")
    table = load_table(write(tmp_path / "depot.csv", "\n".join(lines) + "\n"))
    assert table.row_count == 5 and _totals(table) == [4, 8, 9]
    assert rows(table, f"SELECT sum(amount) FROM {TABLE}") == [(260.5,)]
    assert rows(table, f"SELECT {ROW} FROM {TABLE}") == [(i,) for i in range(5)]


# ---------------------------------------------------------------- formats


def test_tsv_and_semicolons(tmp_path):
    tsv = load_table(write(tmp_path / "a.tsv", "x\ty\n1\tAda\n2\tBo\n"))
    assert names(tsv) == ["x", "y"] and tsv.row_count == 2
    semi = load_table(write(tmp_path / "b.csv", 'x;y\n1;"7,5"\n'))
    # "7,5" settles its column's decimal mark: a comma, so the cell is the number 7.5
    assert rows(semi, f"SELECT x, y FROM {TABLE}") == [(1, 7.5)]


def test_header_only_csv(tmp_path):
    table = load_table(write(tmp_path / "head.csv", "name,age\n"))
    assert table.row_count == 0 and names(table) == ["name", "age"]


def test_ragged_csv_padded_and_cut(tmp_path):
    path = write(tmp_path / "ragged.csv", 'x,x,,y\n1,2,3\n4,5,6,7,8\n"unterminated,9\n')
    table = load_table(path)
    assert names(table) == ["x", "x__number", "x_2", "column_3", "y"]
    assert rows(table, f"SELECT x, x_2, column_3, y FROM {TABLE} ORDER BY {ROW}") == \
        [("1", 2, 3, None), ("4", 5, 6, 7), ("unterminated,9", None, None, None)]


def test_rowid_header_and_multiline_cells(tmp_path):
    path = write(tmp_path / "r.csv", 'rowid,note\n10,"two\nlines"\n20,plain\n')
    table = load_table(path)
    assert rows(table, f"SELECT {ROW}, rowid, note FROM {TABLE} ORDER BY {ROW}") == \
        [(0, 10, "two\nlines"), (1, 20, "plain")]


def test_byte_order_mark(tmp_path):
    table = load_table(write(tmp_path / "bom.csv", "\ufeffName,Age\nAda,36\n"))
    assert [c.header for c in table.columns] == ["Name", "Age"] and names(table) == ["name", "age"]


def test_legacy_encodings(tmp_path):
    table = load_table(write(tmp_path / "latin.csv", "name,city\nZoë,Málaga\n", "cp1252"))
    assert rows(table, f"SELECT name, city FROM {TABLE}") == [("Zoë", "Málaga")]
    table = load_table(write(tmp_path / "wide.csv", "name,n\nZoë,1\n", "utf-16"))
    assert rows(table, f"SELECT name, n FROM {TABLE}") == [("Zoë", 1)]


def test_unknown_extension_with_text_is_read_as_csv(tmp_path):
    table = load_table(write(tmp_path / "data.dat", "a,b\n1,2\n"))
    assert table.row_count == 1 and table.title == "data"


def test_parquet(tmp_path):
    path = tmp_path / "runs.parquet"
    with duckdb.connect() as con:
        con.execute("COPY (SELECT range AS id, 'r' || range AS label, range * 0.5 AS pace "
                    "FROM range(1000)) TO ? (FORMAT parquet)", [str(path)])
    table = load_table(path)
    assert table.row_count == 1000 and names(table) == ["id", "label", "pace"]
    assert rows(table, f"SELECT count(*) FROM {TABLE} WHERE id <> {ROW}") == [(0,)]
    assert table.column("pace").maximum == 499.5


def test_json_lines_and_array(tmp_path):
    lines = write(tmp_path / "a.jsonl", '{"who":"Ada","n":1}\n{"who":"Bo","n":2.5,"x":{"k":1}}\n')
    table = load_table(lines)
    assert names(table) == ["who", "n", "x"]
    assert rows(table, f"SELECT who, n, x FROM {TABLE} ORDER BY {ROW}") == \
        [("Ada", 1.0, None), ("Bo", 2.5, '{"k":1}')]
    array = write(tmp_path / "b.json", '[{"who":"Ada","n":"7"},{"who":"Bo","n":"—"}]')
    table = load_table(array)
    assert table.column("n").kind == "number" and table.row_count == 2
    mixed = write(tmp_path / "c.ndjson", '{"v":1}\n{"v":"two"}\n{"v":null}\n{"v":3}\n')
    assert rows(load_table(mixed), f"SELECT {ROW}, v FROM {TABLE} ORDER BY {ROW}") == \
        [(0, "1"), (1, "two"), (2, "3")]   # a row with no value at all is dropped


def test_bad_json(tmp_path):
    assert "JSON" in fail(write(tmp_path / "bad.json", "{not json"))
    assert "JSON" in fail(write(tmp_path / "none.json", "[]"))


def make_workbook(path):
    import openpyxl
    book = openpyxl.Workbook()
    sheet = book.active
    sheet.title = "Runs"
    sheet.append(["Runner", "Distance", "Day", None])
    sheet.append(["Ada", 8.9, datetime.datetime(2024, 5, 1), None])
    sheet.append(["Bo", 12, datetime.datetime(2024, 5, 2), None])
    sheet.append([None, None, None, None])
    sheet.append(["Cy", "5 km", datetime.datetime(2024, 5, 3), None])
    other = book.create_sheet("Fees")
    other.append(["Club", "Fee"])
    other.append(["North", 10])
    book.save(path)


def test_xlsx(tmp_path):
    path = tmp_path / "season.xlsx"
    make_workbook(path)
    table = load_table(path)
    assert table.title == "Runs" and names(table) == ["runner", "distance", "distance__number",
                                                      "day"]
    assert table.column("day").kind == "date" and table.column("day").minimum == "2024-05-01"
    assert rows(table, f"SELECT runner, distance, distance__number FROM {TABLE} ORDER BY {ROW}") \
        == [("Ada", "8.9", 8.9), ("Bo", "12", 12.0), ("Cy", "5 km", 5.0)]
    fees = load_table(path, table="fees")
    assert fees.title == "Fees" and rows(fees, f"SELECT club, fee FROM {TABLE}") == [("North", 10)]
    assert "Runs" in fail(path, UnknownTableError, table="Prices")
    assert fees.fingerprint != table.fingerprint


def test_sqlite(tmp_path):
    path = tmp_path / "club.sqlite"
    with sqlite3.connect(path) as db:
        db.execute('CREATE TABLE "run""s" (who TEXT, km REAL, day TEXT, note BLOB)')
        db.executemany('INSERT INTO "run""s" VALUES (?, ?, ?, ?)',
                       [("Ada", 8.9, "2024-05-01", b"ok"), ("Bo", 12.0, "2024-05-02", None)])
    db.close()
    table = load_table(path)
    assert table.title == 'run"s' and table.row_count == 2
    assert [(c.name, c.kind) for c in table.columns] == [("who", "text"), ("km", "number"),
                                                         ("day", "date"), ("note", "text")]
    assert rows(table, f"SELECT who, km, note FROM {TABLE} ORDER BY {ROW}") == \
        [("Ada", 8.9, "ok"), ("Bo", 12.0, None)]
    with sqlite3.connect(path) as db:
        db.execute("CREATE TABLE fees (club TEXT, fee INTEGER)")
        db.execute("INSERT INTO fees VALUES ('North', 10)")
    db.close()
    message = fail(path, UnknownTableError)
    assert "fees" in message and 'run"s' in message
    fees = load_table(path, table="FEES")
    assert rows(fees, f"SELECT club, fee FROM {TABLE}") == [("North", 10)]
    assert fees.fingerprint != load_table(path, table='run"s').fingerprint
    fail(path, UnknownTableError, table="prices")


def test_sqlite_odd_cells(tmp_path):
    path = tmp_path / "odd.db"
    with sqlite3.connect(path) as db:
        db.execute("CREATE TABLE a (x)")
        db.executemany("INSERT INTO a VALUES (?)", [(b"\x00\xff",), (3,), (2.5,), ("Zoë",)])
        db.execute("INSERT INTO a VALUES (CAST(X'FF41' AS TEXT))")   # not valid UTF-8
    db.close()
    got = rows(load_table(path), f"SELECT x FROM {TABLE} ORDER BY {ROW}")
    assert got == [("00ff",), ("3",), ("2.5",), ("Zoë",), ("\ufffdA",)]


def test_sqlite_wal_leaves_no_files(tmp_path):
    path = tmp_path / "wal.db"
    with sqlite3.connect(path) as db:
        db.execute("PRAGMA journal_mode = wal")
        db.execute("CREATE TABLE a (x INTEGER)")
        db.execute("INSERT INTO a VALUES (1)")
    db.close()
    before = sorted(p.name for p in tmp_path.iterdir())
    digest = sha256(path)
    assert rows(load_table(path), f"SELECT x FROM {TABLE}") == [(1,)]
    assert sorted(p.name for p in tmp_path.iterdir()) == before and sha256(path) == digest
    # With a writer still open, rows sit in the -wal file: they are read from a copy.
    writer = sqlite3.connect(path)
    writer.execute("PRAGMA wal_autocheckpoint = 0")
    writer.execute("INSERT INTO a VALUES (2)")
    writer.commit()
    before = sorted(p.name for p in tmp_path.iterdir())
    assert rows(load_table(path), f"SELECT x FROM {TABLE} ORDER BY x") == [(1,), (2,)]
    assert sorted(p.name for p in tmp_path.iterdir()) == before
    writer.close()


# ---------------------------------------------------------------- bad files


def test_bad_files(tmp_path):
    assert "no such file" in fail(tmp_path / "missing.csv")
    folder = tmp_path / "folder.csv"
    folder.mkdir()
    assert "folder" in fail(folder)
    assert "empty" in fail(write(tmp_path / "empty.csv", ""))
    garbage = tmp_path / "garbage.csv"
    garbage.write_bytes(random.Random(7).randbytes(4000))
    assert "binary" in fail(garbage)
    fake = tmp_path / "fake.sqlite"
    fake.write_bytes(b"SQLite format 3\0 not really")
    assert "SQLite" in fail(fake)
    assert "SQLite" in fail(write(tmp_path / "text.sqlite", "a,b\n1,2\n"))
    assert "xlsx" in fail(write(tmp_path / "book.xlsx", "a,b\n1,2\n"))
    zipped = tmp_path / "notbook.xlsx"
    import zipfile
    with zipfile.ZipFile(zipped, "w") as z:
        z.writestr("hello.txt", "hi")
    assert "Excel" in fail(zipped)
    assert "Parquet" in fail(write(tmp_path / "p.parquet", "a,b\n"))
    blob = tmp_path / "blob.bin"
    blob.write_bytes(bytes(range(256)) * 4)
    assert "kind of table file" in fail(blob)


def test_sqlite_without_tables(tmp_path):
    path = tmp_path / "none.db"
    with sqlite3.connect(path) as db:
        db.execute("CREATE TABLE gone (a)")
        db.execute("DROP TABLE gone")
    db.close()
    assert "no tables" in fail(path)


def test_odd_file_names(tmp_path):
    path = write(tmp_path / "it's \"odd\" ; DROP.csv", "a\n1\n")
    assert load_table(path).row_count == 1


# ---------------------------------------------------------------- the user's file is only read


def test_source_files_unchanged(tmp_path):
    csv_path = write(tmp_path / "a.csv", MESSY)
    json_path = write(tmp_path / "a.jsonl", '{"a": 1}\n')
    xlsx_path = tmp_path / "a.xlsx"
    make_workbook(xlsx_path)
    db_path = tmp_path / "a.sqlite"
    with sqlite3.connect(db_path) as db:
        db.execute("CREATE TABLE a (x)")
    db.close()
    paths = [csv_path, json_path, xlsx_path, db_path]
    before = {p: sha256(p) for p in paths}
    listing = sorted(p.name for p in tmp_path.iterdir())
    for path in paths:
        table = load_table(path)
        assert table.fingerprint == hashlib.sha256(
            path.read_bytes() + (b"\0" + table.title.encode() if path.suffix in
                                 (".xlsx", ".sqlite") else b"")).hexdigest()
    assert {p: sha256(p) for p in paths} == before
    assert sorted(p.name for p in tmp_path.iterdir()) == listing


def test_fingerprint_follows_content(tmp_path):
    a = load_table(write(tmp_path / "a.csv", "x\n1\n"))
    b = load_table(write(tmp_path / "b.csv", "x\n1\n"))
    c = load_table(write(tmp_path / "c.csv", "x\n2\n"))
    assert a.fingerprint == b.fingerprint != c.fingerprint


# ---------------------------------------------------------------- the connection is locked


def test_external_access_blocked(tmp_path):
    table = load_table(write(tmp_path / "a.csv", "x\n1\n"))
    target = tmp_path / "pwned.csv"
    for sql in (f"COPY (SELECT 1) TO '{target}'", "SELECT * FROM read_csv('/etc/passwd')",
                "SET enable_external_access = true", "SET threads = 8",
                f"ATTACH '{tmp_path / 'x.db'}'", "INSTALL sqlite"):
        with pytest.raises(duckdb.Error):
            table.con.execute(sql)
    assert not target.exists() and not (tmp_path / "x.db").exists()
    threads, spill, memory = rows(table, "SELECT current_setting('threads'), "
                                  "current_setting('temp_directory'), "
                                  "current_setting('memory_limit')")[0]
    assert (threads, spill) == (limits.threads(), "")
    assert 1 <= threads <= limits.THREADS_CAP
    mib = float(memory.split()[0]) * (1024 if memory.endswith("GiB") else 1)
    assert abs(mib - limits.memory_limit() / 2**20) / mib < 0.05   # as DuckDB shows the limit
    assert rows(table, f"SELECT count(*) FROM {TABLE}") == [(1,)]


def test_interrupt_still_works_after_lock(tmp_path):
    table = load_table(write(tmp_path / "a.csv", "x\n1\n"))
    timer = threading.Timer(0.2, table.con.interrupt)
    timer.start()
    with pytest.raises(duckdb.InterruptException):
        table.con.execute("SELECT sum(a.range * b.range) FROM range(1000000) a, range(1000000) b")
    timer.join()
    assert rows(table, f"SELECT x FROM {TABLE}") == [(1,)]


# ---------------------------------------------------------------- an outside source


def test_palmer_penguins_against_pandas():
    # Source: the palmerpenguins package (Horst, Hill & Gorman 2020, Palmer Archipelago penguin
    # data), whose CSV ships inside the package; pandas reads the same file for comparison.
    import pandas as pd
    from palmerpenguins import load_penguins

    path = importlib.resources.files("palmerpenguins") / "data" / "penguins.csv"
    frame = pd.read_csv(path)
    table = load_table(path)
    assert table.row_count == 344 == len(frame) == len(load_penguins())
    species = table.column("species")
    assert set(species.values) == set(frame["species"].unique())
    assert species.distinct == frame["species"].nunique() == 3
    # "NA" cells are missing values, so the measurements are numbers, as pandas reads them.
    bill = table.column("bill_length_mm")
    assert bill.kind == "number" and bill.nulls == int(frame["bill_length_mm"].isna().sum())
    assert bill.maximum == pytest.approx(frame["bill_length_mm"].max())
    got = rows(table, f"SELECT species, count(*) FROM {TABLE} GROUP BY 1")
    assert dict(got) == frame["species"].value_counts().to_dict()


# ---------------------------------------------------------------- formatted amounts and dates


@pytest.mark.parametrize("text, mark, value", [
    ("$1,234.50", ".", 1234.5), ("(1,200.00)", ".", -1200.0), ("1.234,50 €", ",", 1234.5),
    ("-12,5 %", ",", -12.5), ("EUR 300", ".", 300.0), ("1 200-", ".", -1200.0),
    ("1,234", ",", 1.234), ("€ 12,50", ",", 12.5), ("-$1,200", ".", -1200.0),
    ("1'234.5", ".", 1234.5), ("12 pcs", ".", None), ("(5", ".", None), ("+-3", ".", None),
    ("02139", ".", None), ("0.5", ".", 0.5), ("0,50", ",", 0.5),   # a leading zero is a code
])
def test_parse_amount(text, mark, value):
    assert values.parse_amount(text, mark) == value


def test_decimal_mark_is_settled_by_the_cells_that_can():
    assert values.decimal_mark(["1.234,50", "7"]) == ","
    assert values.decimal_mark(["1,234,567", "12"]) == "."
    assert values.decimal_mark(["1,234", "7"]) is None           # fits both readings
    assert values.decimal_mark(["01.02.2026", "1.2.3"]) is None  # dates and versions say nothing


# Rows whose sums are worked out here, then written in the ways exports write them.
AMOUNTS = [1234.5, -1200.0, 12.25, 99999.0, -0.5, 3.0]


def _european(x: float) -> str:
    text = f"{abs(x):,.2f}".replace(",", " ").replace(".", ",").replace(" ", ".")
    return f"-{text}" if x < 0 else text


def _accounting(x: float) -> str:
    return f"({abs(x):,.2f})" if x < 0 else f"${x:,.2f}"


@pytest.mark.parametrize("cap", [None, 2])   # 2: the SQL path for very varied columns
def test_amount_columns_are_numbers(tmp_path, monkeypatch, cap):
    if cap:
        monkeypatch.setattr(retype, "VIEW_DISTINCT_CAP", cap)
    semi = "id;amount\n" + "".join(f"{i};{_european(x)}\n" for i, x in enumerate(AMOUNTS))
    comma = "id,amount\n" + "".join(f'{i},"{_accounting(x)}"\n' for i, x in enumerate(AMOUNTS))
    for name, text in (("eu.csv", semi), ("acc.csv", comma)):
        table = load_table(write(tmp_path / name, text))
        assert table.column("amount").kind == "number", name
        (total,), = rows(table, f"SELECT sum(amount) FROM {TABLE}")
        assert total == pytest.approx(sum(AMOUNTS)), name


def test_numeric_dates_read_the_way_the_column_settles(tmp_path):
    days = [datetime.date(2026, 3, d) for d in (2, 13, 28)]
    for order, fmt in ((True, "%d/%m/%Y"), (False, "%m/%d/%Y")):
        # "n/a" keeps DuckDB's own date sniffing out of it: tabq's retyping decides the order
        text = "id,day\n" + "".join(f"{i},{d.strftime(fmt)}\n" for i, d in enumerate(days))
        table = load_table(write(tmp_path / f"d{order}.csv", text + "9,n/a\n"))
        assert rows(table, f"SELECT day FROM {TABLE} ORDER BY {ROW}") == \
            [(d,) for d in days] + [(None,)]
        assert ("day first" if order else "month first") in table.report.columns[1].how


def test_wide_tables_load_or_are_refused_in_one_line(tmp_path):
    # 1,000 columns of 4 rows: one distinct count per column in one scan took DuckDB past 4 GB
    header = ",".join(f"c{i}" for i in range(1000))
    body = "".join(",".join(str(r * i % 97) for i in range(1000)) + "\n" for r in range(4))
    table = load_table(write(tmp_path / "wide.csv", header + "\n" + body))
    assert (table.row_count, len(table.columns)) == (4, 1000)
    assert table.column("c999").maximum == max(r * 999 % 97 for r in range(4))
    wider = ",".join(f"c{i}" for i in range(limits.COLUMNS_MAX + 1))
    message = fail(write(tmp_path / "wider.csv", wider + "\n" + wider + "\n"))
    assert f"{limits.COLUMNS_MAX + 1:,} columns" in message


def test_a_cell_past_the_staging_limit_is_one_line(tmp_path):
    from tabq.readers.staging import LINE_MAX
    text = "note,n\n\"" + "z" * (LINE_MAX + 10) + "\",1\n"
    message = fail(write(tmp_path / "long.csv", text))
    assert "too long to read" in message and "line 2" in message


# ---------------------------------------------------------------- the layout of delimited text


def test_preamble_lines_above_the_header_are_left_out_and_said(tmp_path):
    text = ("Stock count, east store\nCounted by the night shift,,\n\n"
            "item,shelf,qty\nbolts,A1,30\nnuts,A2,12\n")
    table = load_table(write(tmp_path / "count.csv", text))
    assert [c.name for c in table.columns] == ["item", "shelf", "qty"]
    assert (table.row_count, table.report.header_line) == (2, 4)
    assert [(s.why, s.lines) for s in table.report.skipped] == [("preamble", (1, 2))]


def test_a_trailing_delimiter_keeps_the_header(tmp_path):
    table = load_table(write(tmp_path / "trail.csv", "name,qty\nbolt,3,\nnut,5,\n"))
    assert [c.name for c in table.columns] == ["name", "qty"] and table.row_count == 2
    assert not table.report.notes()


def test_a_long_last_line_never_becomes_the_header(tmp_path):
    body = "".join(f"k{i},{i}\n" for i in range(30))
    table = load_table(write(tmp_path / "long.csv", "key,n\n" + body + "k30,30,stray\n"))
    assert [c.name for c in table.columns] == ["key", "n"] and table.row_count == 31
    assert rows(table, f"SELECT sum(n) FROM {TABLE}") == [(sum(range(31)),)]
    assert any("line 32" in note for note in table.report.notes())


def test_codes_get_no_number_view(tmp_path):
    """Ids such as "HF-20074" hold digits but no amount: a number view of them would stand in for
    a measure ("the heaviest parcel" ranked by id). Amounts with a unit keep theirs."""
    lines = ["parcel,weight"] + [f"HF-{20000 + i},{i + 1} kg" for i in range(12)]
    table = load_table(write(tmp_path / "parcels.csv", "\n".join(lines) + "\n"))
    assert "parcel__number" not in names(table) and "parcel__year" not in names(table)
    assert rows(table, f"SELECT max(weight__number) FROM {TABLE}") == [(12,)]
