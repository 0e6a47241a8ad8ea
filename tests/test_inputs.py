"""What the table argument may be (issue 15, inputs): compressed files, folders and patterns,
literal names with pattern characters, DuckDB and Arrow files, standard input — and hostile
ones (a FIFO, /dev/zero, a 50 GB sparse file, a -wal linked to /dev/zero, a view that never
ends), which give one clean line quickly.

Every table is invented here, from Python rows whose answers are worked out before the file is
written: a harbour ferry's ticket log (route, fare). Nothing is ever read back to get them.
"""

from __future__ import annotations

import csv
import gzip
import io
import json
import os
import random
import sqlite3
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import duckdb
import pytest

import tabq
from tabq import inputs
from tabq.errors import TableFileError, UnknownTableError
from tabq.files import HEAD
from tabq.load import load_table, table_names
from tabq.readers import READERS, databases
from tabq.table import ROW, TABLE

ROUTES = ("Kestrel Point", "Gull Quay", "Otter Steps")
HEADER = ("ticket", "route", "fare")


# ---------------------------------------------------------------- helpers


def tickets(n: int, seed: int, start: int = 1) -> list[tuple[int, str, int]]:
    rng = random.Random(seed)
    return [(start + i, rng.choice(ROUTES), rng.randint(3, 40)) for i in range(n)]


def csv_bytes(rows, delimiter: str = ",", header=HEADER) -> bytes:
    out = io.StringIO()
    writer = csv.writer(out, delimiter=delimiter, lineterminator="\n")
    writer.writerow(header)
    writer.writerows(rows)
    return out.getvalue().encode()


def jsonl_bytes(rows) -> bytes:
    return "".join(json.dumps(dict(zip(HEADER, r))) + "\n" for r in rows).encode()


def total(rows) -> int:
    return sum(r[2] for r in rows)


def on_route(rows, route: str) -> int:
    return sum(1 for r in rows if r[1] == route)


def ask(path, question: str, **kwargs):
    return tabq.open(path, model=tabq.Model.prior(), **kwargs).ask(question).answer


def listing(folder: Path) -> list[str]:
    return sorted(os.listdir(folder))


def fail(path, error=TableFileError, **kwargs) -> str:
    """The one-line error load_table gives, within a few seconds."""
    start = time.monotonic()
    with pytest.raises(error) as caught:
        load_table(path, **kwargs)
    assert time.monotonic() - start < 30
    message = str(caught.value)
    assert "\n" not in message
    return message


def _bytes_read() -> int | None:
    """What this process has read through system calls so far (Linux's /proc/self/io), or None
    where that count is not kept. Bytes, not seconds, show whether a file was read: a time
    limit would also fail a refusal that was only slowed by a loaded machine."""
    try:
        return int(Path("/proc/self/io").read_text().split("rchar:")[1].split()[0])
    except (OSError, IndexError, ValueError):
        return None


def cli(*args, stdin: bytes | None = None, env: dict | None = None, timeout: float = 120):
    return subprocess.run([sys.executable, "-m", "tabq", *map(str, args)], input=stdin,
                          capture_output=True, timeout=timeout, env={**os.environ, **(env or {})})


@pytest.fixture
def private_tmp(tmp_path, monkeypatch) -> Path:
    """tabq's temporary folders go here, so a test can see that they are gone afterwards."""
    folder = tmp_path / "tmp"
    folder.mkdir()
    monkeypatch.setattr(tempfile, "tempdir", str(folder))
    return folder


def zstd_compress(data: bytes) -> bytes:
    try:
        import zstandard
        return zstandard.ZstdCompressor().compress(data)
    except ImportError:
        pyarrow = pytest.importorskip("pyarrow")
        if not pyarrow.Codec.is_available("zstd"):
            pytest.skip("no zstd codec")
        sink = pyarrow.BufferOutputStream()
        with pyarrow.CompressedOutputStream(sink, "zstd") as out:
            out.write(data)
        return sink.getvalue().to_pybytes()


# ---------------------------------------------------------------- compressed files


def test_gzip_csv_answers_as_pandas_reads_it(tmp_path, private_tmp):
    rows = tickets(120, seed=1)
    path = tmp_path / "ferry.csv.gz"
    path.write_bytes(gzip.compress(csv_bytes(rows)))
    before = listing(tmp_path)
    assert ask(path, "what is the total fare") == [total(rows)]
    assert ask(path, "how many tickets were sold on Gull Quay") == [on_route(rows, "Gull Quay")]
    pandas = pytest.importorskip("pandas")
    assert int(pandas.read_csv(path)["fare"].sum()) == total(rows)
    table = load_table(path)
    assert table.title == "ferry" and table.report.format == "csv"
    assert listing(tmp_path) == before and listing(private_tmp) == []


def test_gzip_tsv_and_zstd_json_lines(tmp_path):
    rows = tickets(80, seed=2)
    tsv = tmp_path / "ferry.tsv.gz"
    tsv.write_bytes(gzip.compress(csv_bytes(rows, "\t")))
    assert ask(tsv, "what is the total fare") == [total(rows)]
    jsonl = tmp_path / "ferry.jsonl.zst"
    jsonl.write_bytes(zstd_compress(jsonl_bytes(rows)))
    table = load_table(jsonl)
    assert table.report.format == "json" and table.row_count == len(rows)
    assert ask(jsonl, "how many tickets were sold on Otter Steps") == [
        on_route(rows, "Otter Steps")]


def test_the_fingerprint_is_the_compressed_file_s(tmp_path):
    import hashlib
    path = tmp_path / "ferry.csv.gz"
    path.write_bytes(gzip.compress(csv_bytes(tickets(5, seed=3))))
    assert load_table(path).fingerprint == hashlib.sha256(path.read_bytes()).hexdigest()


def test_a_gzip_bomb_stops_at_the_budget(tmp_path, private_tmp, monkeypatch):
    monkeypatch.setattr(inputs, "UNPACK_BUDGET", 1 << 20)
    path = tmp_path / "bomb.csv.gz"
    path.write_bytes(gzip.compress(csv_bytes(tickets(10, seed=4)) + b"0,x,1\n" * 2_000_000))
    message = fail(path)
    assert message.startswith(f"{path}: decompresses to more than 1.0 MB")
    assert listing(private_tmp) == []


_CUT = gzip.compress(csv_bytes(tickets(2000, seed=25)))


@pytest.mark.parametrize("content, says", [
    (b"ticket,route\n1,Gull Quay\n", "not gzip-compressed"),
    (_CUT[: len(_CUT) // 2], "not a readable gzip"),
], ids=["plain text", "cut short"])
def test_a_bad_gzip_is_one_line(tmp_path, content, says):
    path = tmp_path / "ferry.csv.gz"
    path.write_bytes(content)
    assert says in fail(path)


# ---------------------------------------------------------------- names with * ? [ in them


@pytest.mark.parametrize("name, decoy", [
    ("ferry[1].csv", "ferry1.csv"), ("star*.csv", "starfish.csv"), ("q?.jsonl", "qa.jsonl"),
    ("star*.parquet", "star_2.parquet"),
])
def test_a_name_with_pattern_characters_is_read_literally(tmp_path, name, decoy):
    mine, other = tickets(30, seed=5), tickets(45, seed=6)
    for file_name, rows in ((name, mine), (decoy, other)):
        path = tmp_path / file_name
        if path.suffix == ".parquet":
            con = duckdb.connect()
            con.execute("CREATE TABLE x (ticket INT, route VARCHAR, fare INT)")
            con.executemany("INSERT INTO x VALUES (?, ?, ?)", rows)
            con.execute(f"COPY x TO '{tmp_path / 'staged.parquet'}' (FORMAT parquet)")
            (tmp_path / "staged.parquet").rename(path)
        else:
            path.write_bytes(jsonl_bytes(rows) if path.suffix == ".jsonl" else csv_bytes(rows))
    before = listing(tmp_path)
    table = load_table(tmp_path / name)
    assert table.row_count == len(mine) and table.title == Path(name).stem
    assert ask(tmp_path / name, "what is the total fare") == [total(mine)]
    assert listing(tmp_path) == before


def test_a_pattern_character_name_through_the_cli(tmp_path):
    mine = tickets(25, seed=7)
    (tmp_path / "ferry[1].csv").write_bytes(csv_bytes(mine))
    (tmp_path / "ferry1.csv").write_bytes(csv_bytes(tickets(60, seed=8)))
    out = cli("ask", tmp_path / "ferry[1].csv", "what is the total fare", "--json")
    assert out.returncode == 0, out.stderr
    assert json.loads(out.stdout)["answers"][0]["answer"] == [total(mine)]


# ---------------------------------------------------------------- folders and patterns


def _exports(folder: Path) -> dict[str, list]:
    folder.mkdir()
    parts = {"ferry_2.csv": tickets(12, seed=9, start=100), "ferry_10.csv": tickets(7, seed=10),
             "ferry_1.csv": tickets(20, seed=11, start=200)}
    for name, rows in parts.items():
        (folder / name).write_bytes(csv_bytes(rows))
    return parts


def test_a_folder_is_one_table_in_file_name_order(tmp_path, private_tmp):
    parts = _exports(tmp_path / "exports")
    (tmp_path / "exports" / "README.md").write_text("# ferry exports\n")
    (tmp_path / "exports" / ".hidden.csv").write_text("nothing,here\n1,2\n")
    order = ["ferry_1.csv", "ferry_2.csv", "ferry_10.csv"]
    every = [row for name in order for row in parts[name]]
    before = listing(tmp_path / "exports")
    table = load_table(tmp_path / "exports")
    assert table.report.sources == tuple(order)
    assert table.row_count == len(every)
    got = table.con.execute(f"SELECT ticket, source_file FROM {TABLE} ORDER BY {ROW}").fetchall()
    assert got == [(row[0], name) for name in order for row in parts[name]]
    assert table.column("source_file").header == "source file"
    assert table.report.notes()[0].startswith("3 files read as one table (ferry_1.csv … "
                                              "ferry_10.csv)")
    assert ask(tmp_path / "exports", "what is the total fare") == [total(every)]
    assert listing(tmp_path / "exports") == before and listing(private_tmp) == []


def test_a_pattern_reads_only_the_files_it_matches(tmp_path):
    parts = _exports(tmp_path / "exports")
    (tmp_path / "exports" / "other.csv").write_bytes(csv_bytes(tickets(99, seed=12)))
    every = [row for rows in parts.values() for row in rows]
    pattern = tmp_path / "exports" / "ferry_*.csv"
    assert ask(pattern, "how many tickets are there") == [len(every)]
    out = cli("ask", pattern, "how many tickets were sold on Kestrel Point", "--json")
    assert out.returncode == 0, out.stderr
    answer = json.loads(out.stdout)["answers"][0]["answer"]
    assert answer == [on_route(every, "Kestrel Point")]


def test_files_of_several_formats_and_compressions_join(tmp_path):
    folder = tmp_path / "mixed"
    folder.mkdir()
    first, second = tickets(10, seed=13), tickets(14, seed=14)
    (folder / "a.csv").write_bytes(csv_bytes(first))
    (folder / "b.jsonl.gz").write_bytes(gzip.compress(jsonl_bytes(second)))
    table = load_table(folder)
    assert table.report.sources == ("a.csv", "b.jsonl.gz")
    assert ask(folder, "what is the total fare") == [total(first) + total(second)]


def test_files_whose_columns_differ_name_the_first_misfit(tmp_path):
    parts = _exports(tmp_path / "exports")
    odd = tmp_path / "exports" / "ferry_3.csv"
    odd.write_bytes(csv_bytes([(r[0], r[1], r[2], "") for r in parts["ferry_2.csv"]],
                              header=(*HEADER, "captain")))
    message = fail(tmp_path / "exports")
    assert message.startswith(str(odd)) and "ferry_1.csv" in message and "differ" in message


def test_a_pattern_that_matches_nothing(tmp_path):
    assert "matches none" in fail(tmp_path / "ferry_*.csv")


def test_an_empty_folder(tmp_path):
    (tmp_path / "empty").mkdir()
    assert "no table files" in fail(tmp_path / "empty")


# ---------------------------------------------------------------- DuckDB and Arrow files


def _duckdb_file(path: Path, rows, checkpointed: int) -> None:
    """A DuckDB database of two tables and a view; rows after `checkpointed` stay in its .wal."""
    con = duckdb.connect(str(path))
    con.execute("CREATE TABLE tickets (ticket INT, route VARCHAR, fare INT)")
    con.execute("CREATE TABLE crew (name VARCHAR)")
    con.execute("CREATE VIEW dear AS SELECT * FROM tickets WHERE fare > 30")
    con.executemany("INSERT INTO tickets VALUES (?, ?, ?)", rows[:checkpointed])
    con.execute("CHECKPOINT")
    con.execute("PRAGMA disable_checkpoint_on_shutdown")
    if rows[checkpointed:]:
        con.executemany("INSERT INTO tickets VALUES (?, ?, ?)", rows[checkpointed:])
    con.close()


def test_a_duckdb_file_read_only_with_its_wal(tmp_path, private_tmp):
    rows = tickets(50, seed=15)
    folder = tmp_path / "data"
    folder.mkdir()
    path = folder / "ferry.duckdb"
    _duckdb_file(path, rows, checkpointed=40)
    assert (folder / "ferry.duckdb.wal").exists()
    before = {p: p.stat().st_mtime_ns for p in folder.iterdir()}
    with pytest.raises(UnknownTableError, match="'crew', 'tickets'"):
        load_table(path)
    assert table_names(path) == ["crew", "tickets"]
    assert ask(path, "what is the total fare", table="tickets") == [total(rows)]
    dear = load_table(path, "dear")
    assert dear.row_count == sum(1 for r in rows if r[2] > 30)
    check = duckdb.connect(str(path), read_only=True)
    assert check.execute("SELECT count(*) FROM tickets").fetchone()[0] == len(rows)
    check.close()
    assert {p: p.stat().st_mtime_ns for p in folder.iterdir()} == before
    assert listing(private_tmp) == []


def test_a_duckdb_file_known_by_content(tmp_path):
    rows = tickets(9, seed=16)
    path = tmp_path / "ferry.data"
    _duckdb_file(path, rows, checkpointed=9)
    assert load_table(path, "tickets").row_count == len(rows)


def test_an_arrow_ipc_file_and_a_feather_file(tmp_path):
    pyarrow = pytest.importorskip("pyarrow")
    from pyarrow import feather
    rows = tickets(33, seed=17)
    arrow_table = pyarrow.table({h: [r[i] for r in rows] for i, h in enumerate(HEADER)})
    feather.write_feather(arrow_table, tmp_path / "ferry.feather")
    with pyarrow.ipc.new_file(tmp_path / "ferry.arrow", arrow_table.schema) as writer:
        writer.write_table(arrow_table)
    for name in ("ferry.feather", "ferry.arrow"):
        assert (tmp_path / name).read_bytes()[:6] == b"ARROW1"
        assert ask(tmp_path / name, "what is the total fare") == [total(rows)]
    assert load_table(tmp_path / "ferry.arrow").report.format == "arrow"


# ---------------------------------------------------------------- standard input


def test_standard_input_through_the_cli(tmp_path):
    rows = tickets(40, seed=18)
    private = tmp_path / "tmp"
    private.mkdir()
    for data in (csv_bytes(rows), gzip.compress(csv_bytes(rows)), jsonl_bytes(rows)):
        out = cli("ask", "-", "what is the total fare", "--json", stdin=data,
                  env={"TMPDIR": str(private)})
        assert out.returncode == 0, out.stderr
        assert json.loads(out.stdout)["answers"][0]["answer"] == [total(rows)]
    assert listing(private) == []


def test_empty_standard_input_is_named_stdin(tmp_path):
    out = cli("ask", "-", "how many tickets", stdin=b"")
    assert out.returncode == 2
    assert out.stderr.decode().strip() == "tabq: <stdin>: the file is empty"


class _Stdin:
    def __init__(self, data: bytes) -> None:
        self.buffer = io.BytesIO(data)


def test_standard_input_goes_to_a_private_file(private_tmp, monkeypatch):
    rows = tickets(15, seed=19)
    monkeypatch.setattr(sys, "stdin", _Stdin(csv_bytes(rows)))
    seen = {}
    read_csv = READERS["csv"]

    def spy(con, path, head, table, choices=None):
        seen.update(file=path.stat().st_mode & 0o777, folder=path.parent.stat().st_mode & 0o777)
        return read_csv(con, path, head, table, choices)

    monkeypatch.setitem(READERS, "csv", spy)
    table = load_table("-")
    assert seen == {"file": 0o600, "folder": 0o700}
    assert table.row_count == len(rows) and str(table.path) == "<stdin>"
    assert listing(private_tmp) == []


def test_standard_input_over_the_budget(private_tmp, monkeypatch):
    monkeypatch.setattr(inputs, "UNPACK_BUDGET", 1 << 16)
    monkeypatch.setattr(sys, "stdin", _Stdin(csv_bytes(tickets(10_000, seed=20))))
    assert fail("-").startswith("<stdin>: holds more than")
    assert listing(private_tmp) == []


# ---------------------------------------------------------------- hostile inputs


def test_a_fifo_is_refused_without_waiting(tmp_path):
    fifo = tmp_path / "ferry.csv"
    os.mkfifo(fifo)
    out = cli("ask", fifo, "how many tickets", timeout=60)
    assert out.returncode == 2
    assert out.stderr.decode().strip() == f"tabq: {fifo}: not a regular file (a pipe, device " \
        "or socket)"


def test_dev_zero_is_refused():
    assert "not a regular file" in fail(Path("/dev/zero"))


def test_a_50_gb_sparse_file_is_refused_before_it_is_read(tmp_path):
    path = tmp_path / "huge.csv"
    with path.open("wb") as f:
        f.truncate(50 << 30)
    before = _bytes_read()
    assert "too large to read (50.0 GB" in fail(path)
    if before is not None:     # not even the first bytes tabq looks at (the size is enough)
        assert _bytes_read() - before < HEAD


def _sqlite_file(path: Path, rows) -> None:
    db = sqlite3.connect(path)
    db.execute("CREATE TABLE tickets (ticket INTEGER, route TEXT, fare INTEGER)")
    db.executemany("INSERT INTO tickets VALUES (?, ?, ?)", rows)
    db.execute("CREATE VIEW forever AS WITH RECURSIVE n(x) AS (SELECT 1 UNION ALL "
               "SELECT x + 1 FROM n) SELECT x FROM n")
    db.execute("CREATE VIEW endless_count AS WITH RECURSIVE n(x) AS (SELECT 1 UNION ALL "
               "SELECT x + 1 FROM n) SELECT count(*) AS c FROM n")
    db.execute("CREATE VIEW kestrel AS SELECT * FROM tickets WHERE route = 'Kestrel Point'")
    db.commit()
    db.close()


@pytest.mark.parametrize("wal", ["/dev/zero", "fifo"])
def test_a_wal_that_is_not_a_regular_file_is_refused(tmp_path, wal):
    path = tmp_path / "ferry.sqlite"
    _sqlite_file(path, tickets(10, seed=21))
    side = tmp_path / "ferry.sqlite-wal"
    if wal == "fifo":
        os.mkfifo(side)
    else:
        side.symlink_to(wal)
    before = listing(tmp_path)
    message = fail(path, table="tickets")
    assert "-wal file" in message and "not a regular file" in message
    assert listing(tmp_path) == before


def test_a_duckdb_wal_linked_to_dev_zero_is_refused(tmp_path):
    path = tmp_path / "ferry.duckdb"
    _duckdb_file(path, tickets(5, seed=22), checkpointed=5)
    (tmp_path / "ferry.duckdb.wal").symlink_to("/dev/zero")
    assert "not a regular file" in fail(path, table="tickets")


def test_views_that_never_end_stop_cleanly(tmp_path, monkeypatch):
    rows = tickets(30, seed=23)
    path = tmp_path / "ferry.sqlite"
    _sqlite_file(path, rows)
    monkeypatch.setattr(databases, "VIEW_ROWS", 200_000)
    assert "did not finish (more than 200,000 rows)" in fail(path, table="forever")
    monkeypatch.setattr(databases, "VIEW_SECONDS", 1.0)
    assert "did not finish (still running after 1 s)" in fail(path, table="endless_count")
    assert load_table(path, "kestrel").row_count == on_route(rows, "Kestrel Point")
    assert [p.name for p in tmp_path.iterdir()] == ["ferry.sqlite"]


def test_a_name_that_is_not_utf8_loads_as_sqlite_and_as_csv(tmp_path):
    rows = tickets(21, seed=24)
    try:
        csv_path = tmp_path / os.fsdecode(b"ferry\xff.csv")
        csv_path.write_bytes(csv_bytes(rows))
    except (OSError, UnicodeError):
        pytest.skip("this file system takes only UTF-8 names")
    sqlite_path = tmp_path / os.fsdecode(b"ferry\xff.sqlite")
    _sqlite_file(sqlite_path, rows)
    duck_path = tmp_path / os.fsdecode(b"ferry\xff.duckdb")
    _duckdb_file(tmp_path / "plain.duckdb", rows, checkpointed=len(rows))   # DuckDB needs UTF-8
    (tmp_path / "plain.duckdb").rename(duck_path)
    for path, name in ((csv_path, None), (sqlite_path, "tickets"), (duck_path, "tickets")):
        assert ask(path, "what is the total fare", table=name) == [total(rows)]
    reference = sqlite3.connect(sqlite_path).execute("SELECT count(*) FROM tickets").fetchone()
    assert reference == (len(rows),)
