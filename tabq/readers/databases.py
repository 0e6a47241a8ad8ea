"""databases: one table or view of a SQLite file, opened read-only and never written beside."""

from __future__ import annotations

import contextlib
import shutil
import sqlite3
import tempfile
import urllib.parse
from collections.abc import Iterator
from pathlib import Path

from ..errors import TableFileError, UnknownTableError
from ..files import one_line, shown
from ..table import Con, ident
from .staging import CHUNK, Source, cell_text, choose, insert_rows, listing

def read_sqlite(con: Con, path: Path, head: bytes,
                 table: str | None) -> Source:
    """One table (or view) of a SQLite file, opened read-only with Python's sqlite3."""
    name = shown(path)
    try:
        with sqlite_open(path) as db:
            listed = db.execute("SELECT name, type FROM sqlite_master WHERE type IN "
                                "('table', 'view') AND name NOT LIKE 'sqlite_%' "
                                "ORDER BY type, name").fetchall()
            tables = [n for n, t in listed if t == "table"]
            if table is not None:
                chosen = choose([n for n, _ in listed], table, name, "table")
            elif len(tables) == 1:
                chosen = tables[0]
            elif not tables:
                raise TableFileError(f"{name}: the SQLite file has no tables")
            else:
                raise UnknownTableError(f"{name}: holds several tables, choose one: "
                                        f"{listing(tables)}")
            headers = _copy_sqlite_table(con, db, chosen)
    except sqlite3.Error as exc:
        raise TableFileError(f"{name}: not a readable SQLite database ({one_line(exc)})") from None
    return Source(headers, chosen, chosen)


@contextlib.contextmanager
def sqlite_open(path: Path) -> Iterator[sqlite3.Connection]:
    """Open without writing next to the file: even mode=ro creates -wal/-shm files for a WAL
    database. With no -wal file the database is complete and opened immutable; with one, a copy
    of both in a temporary folder is opened instead."""
    wal = path.with_name(path.name + "-wal")
    with tempfile.TemporaryDirectory(prefix="tabq-") as tmp:
        source, params = path.absolute(), "mode=ro&immutable=1"
        if wal.exists():
            source = Path(tmp) / "copy.db"
            shutil.copyfile(path, source)
            shutil.copyfile(wal, Path(tmp) / "copy.db-wal")
            params = "mode=ro"
        db = sqlite3.connect(f"file:{urllib.parse.quote(str(source))}?{params}", uri=True)
        try:
            yield db
        finally:
            db.close()


def _copy_sqlite_table(con: Con, db: sqlite3.Connection, name: str) -> list[str]:
    """The table's rows into `_src`; its column names. Text that is not valid UTF-8 is read
    again with replacement characters rather than failing the whole table."""
    sql = f"SELECT * FROM {ident(name)}"
    try:
        cursor = db.execute(sql)
        insert_rows(con, len(cursor.description), _sqlite_rows(cursor))
    except sqlite3.OperationalError as exc:
        if "decode" not in str(exc):
            raise
        db.text_factory = lambda data: data.decode("utf-8", errors="replace")
        cursor = db.execute(sql)
        insert_rows(con, len(cursor.description), _sqlite_rows(cursor))
    return [d[0] for d in cursor.description]


def _sqlite_rows(cursor: sqlite3.Cursor) -> Iterator[tuple | list]:
    """Rows as sqlite3 gives them, except that BLOB cells (rare) become text."""
    while batch := cursor.fetchmany(CHUNK):
        for row in batch:
            yield [cell_text(v) for v in row] if bytes in map(type, row) else row


def sqlite_tables(path: Path) -> list[str]:
    """The tables of a SQLite file, by name."""
    with sqlite_open(path) as db:
        listed = db.execute("SELECT name FROM sqlite_master WHERE type = 'table' AND "
                            "name NOT LIKE 'sqlite_%' ORDER BY name").fetchall()
    return [n for (n,) in listed]
