"""databases: one table or view of a SQLite or DuckDB file, opened read-only and never written
beside.

A view is a query, and a query can run for ever (a recursive view) or give endless rows: a view
is read for at most VIEW_SECONDS and VIEW_ROWS rows, then refused with one line.
"""

from __future__ import annotations

import contextlib
import os
import sqlite3
import stat
import tempfile
import threading
import time
import urllib.parse
from collections.abc import Iterator
from pathlib import Path

import duckdb

from ..errors import TableFileError, UnknownTableError
from ..files import FILE_BUDGET, one_line, shown, size_text
from ..table import Con, ReadChoices, ident
from .staging import CHUNK, Source, cell_text, choose, insert_rows, listing, staging_names

VIEW_SECONDS = 120.0    # longest a view of a database file may take to give its rows
VIEW_ROWS = 20_000_000  # most rows read from a view: more is a runaway query, not a table


def read_sqlite(con: Con, path: Path, head: bytes,
                 table: str | None,
                 choices: ReadChoices | None = None) -> Source:
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
            is_view = dict(listed)[chosen] == "view"
            with _bounded(db, name, chosen, is_view):
                headers = _copy_sqlite_table(con, db, chosen, VIEW_ROWS if is_view else None)
    except sqlite3.Error as exc:
        raise TableFileError(f"{name}: not a readable SQLite database ({one_line(exc)})") from None
    return Source(headers, chosen, chosen)


@contextlib.contextmanager
def sqlite_open(path: Path) -> Iterator[sqlite3.Connection]:
    """Open without writing next to the file: even mode=ro creates -wal/-shm files for a WAL
    database. With no -wal file the database is complete and opened immutable; with one, a copy
    of both in a temporary folder is opened instead."""
    wal = _side_file(path, "-wal")
    with tempfile.TemporaryDirectory(prefix="tabq-") as tmp:
        source, params = path.absolute(), "mode=ro&immutable=1"
        if wal is not None:
            source = Path(tmp) / "copy.db"
            _copy_bounded(path, source)
            _copy_bounded(wal, Path(tmp) / "copy.db-wal")
            params = "mode=ro"
        # quoted as bytes: a file name that is not UTF-8 (surrogates in Python) still opens
        db = sqlite3.connect(f"file:{urllib.parse.quote(os.fsencode(source))}?{params}",
                             uri=True)
        try:
            yield db
        finally:
            db.close()


def _side_file(path: Path, suffix: str) -> Path | None:
    """The write-ahead log beside a database, if it has one worth reading. One that is not a
    regular file (a link to /dev/zero, a FIFO) or is larger than any table tabq reads is
    refused: the database without it may be missing rows, and with it could never be copied."""
    side = path.with_name(path.name + suffix)
    try:
        status = side.stat()
    except FileNotFoundError:
        return None       # none, or a dangling link: the database file is all there is
    except OSError as exc:
        raise TableFileError(f"{shown(path)}: cannot read its {suffix.lstrip('-.')} file "
                             f"({exc.strerror or exc})") from None
    if not stat.S_ISREG(status.st_mode):
        raise TableFileError(f"{shown(path)}: its {suffix} file {shown(side)} is not a regular "
                             "file; tabq does not read the database without it")
    if status.st_size > FILE_BUDGET:
        raise TableFileError(f"{shown(path)}: its {suffix} file is too large to read "
                             f"({size_text(status.st_size)})")
    return side if status.st_size else None


def _copy_bounded(source: Path, target: Path) -> None:
    """Copy at most the size the file had when checked: a file that grows is cut there."""
    left = source.stat().st_size
    with open(source, "rb") as f, open(target, "xb") as out:
        while left > 0 and (chunk := f.read(min(left, 1 << 20))):
            out.write(chunk)
            left -= len(chunk)


def _copy_sqlite_table(con: Con, db: sqlite3.Connection, name: str,
                       cap: int | None) -> list[str]:
    """The table's rows into `_src`; its column names. Text that is not valid UTF-8 is read
    again with replacement characters rather than failing the whole table."""
    sql = f"SELECT * FROM {ident(name)}"
    try:
        cursor = db.execute(sql)
        insert_rows(con, len(cursor.description), _sqlite_rows(cursor, name, cap))
    except sqlite3.OperationalError as exc:
        if "decode" not in str(exc):
            raise
        db.text_factory = lambda data: data.decode("utf-8", errors="replace")
        cursor = db.execute(sql)
        insert_rows(con, len(cursor.description), _sqlite_rows(cursor, name, cap))
    return [d[0] for d in cursor.description]


def _sqlite_rows(cursor: sqlite3.Cursor, name: str, cap: int | None) -> Iterator[tuple | list]:
    """Rows as sqlite3 gives them, except that BLOB cells (rare) become text."""
    count = 0
    while batch := cursor.fetchmany(CHUNK):
        count += len(batch)
        if cap is not None and count > cap:
            raise _runaway(name, f"more than {cap:,} rows")
        for row in batch:
            yield [cell_text(v) for v in row] if bytes in map(type, row) else row


class _Runaway(TableFileError):
    """A view that did not finish within its bounds."""


def _runaway(view: str, what: str) -> _Runaway:
    return _Runaway(f"the view {view!r} did not finish ({what}); a view that never ends (a "
                    "recursive one?) is not a table tabq can read")


@contextlib.contextmanager
def _bounded(db: sqlite3.Connection, name: str, view: str, is_view: bool) -> Iterator[None]:
    """A view is stopped after VIEW_SECONDS by SQLite's progress handler."""
    if not is_view:
        yield
        return
    deadline = time.monotonic() + VIEW_SECONDS
    db.set_progress_handler(lambda: int(time.monotonic() > deadline), 10_000)
    try:
        yield
    except sqlite3.OperationalError as exc:
        if time.monotonic() <= deadline:
            raise
        raise TableFileError(f"{name}: " + str(_runaway(
            view, f"still running after {VIEW_SECONDS:g} s"))) from exc
    except _Runaway as exc:
        raise TableFileError(f"{name}: {exc}") from None
    finally:
        db.set_progress_handler(None, 0)


def sqlite_tables(path: Path) -> list[str]:
    """The tables of a SQLite file, by name."""
    with sqlite_open(path) as db:
        listed = db.execute("SELECT name FROM sqlite_master WHERE type = 'table' AND "
                            "name NOT LIKE 'sqlite_%' ORDER BY name").fetchall()
    return [n for (n,) in listed]


# ---------------------------------------------------------------- DuckDB database files

_ATTACHED = "_tabq_file"


def read_duckdb(con: Con, path: Path, head: bytes, table: str | None,
                choices: ReadChoices | None = None) -> Source:
    """One table (or view) of a DuckDB database file, attached read-only: DuckDB then writes
    nothing beside it, and reads a .wal beside it without replaying it into the file."""
    name = shown(path)
    with _attached(con, path):
        listed = _duckdb_listed(con)
        tables = [n for n, (kind, _) in listed.items() if kind == "table"]
        if table is not None:
            chosen = choose(list(listed), table, name, "table")
        elif len(tables) == 1:
            chosen = tables[0]
        elif not tables:
            raise TableFileError(f"{name}: the DuckDB file has no tables")
        else:
            raise UnknownTableError(f"{name}: holds several tables, choose one: "
                                    f"{listing(tables)}")
        kind, relation = listed[chosen]
        _copy_duckdb_table(con, name, chosen, relation, kind == "view")
    return Source(staging_names(con), chosen, chosen)


def duckdb_tables(path: Path) -> list[str]:
    """The tables of a DuckDB file, by name (those of a schema other than main as schema.name)."""
    con = duckdb.connect(":memory:")
    try:
        with _attached(con, path):
            return [n for n, (kind, _) in _duckdb_listed(con).items() if kind == "table"]
    finally:
        con.close()


@contextlib.contextmanager
def _attached(con: Con, path: Path) -> Iterator[None]:
    """The file attached read-only. A name DuckDB cannot take (not UTF-8) is attached through
    links with a plain name, its .wal linked beside, in a private temporary folder."""
    wal = _side_file(path, ".wal")
    with tempfile.TemporaryDirectory(prefix="tabq-") as tmp:
        source = path.absolute()
        try:
            str(source).encode("utf-8")
        except UnicodeEncodeError:
            source = Path(tmp) / "table.duckdb"
            source.symlink_to(path.absolute())
            if wal is not None:
                Path(tmp, "table.duckdb.wal").symlink_to(wal.absolute())
        try:
            con.execute(f"ATTACH ? AS {_ATTACHED} (READ_ONLY)", [str(source)])
        except duckdb.Error as exc:
            raise TableFileError(f"{shown(path)}: not a readable DuckDB database "
                                 f"({one_line(exc)})") from None
        try:
            yield
        finally:
            con.execute(f"DETACH {_ATTACHED}")


def _duckdb_listed(con: Con) -> dict[str, tuple[str, str]]:
    """Name → ("table" or "view", its SQL relation); tables first, as SQLite's are listed."""
    rows = con.execute("SELECT schema_name, table_name, 'table' FROM duckdb_tables() "
                       "WHERE database_name = ? UNION ALL "
                       "SELECT schema_name, view_name, 'view' FROM duckdb_views() "
                       "WHERE database_name = ? AND NOT internal",
                       [_ATTACHED, _ATTACHED]).fetchall()
    named = sorted(((t if s == "main" else f"{s}.{t}", kind, s, t) for s, t, kind in rows),
                   key=lambda row: (row[1], row[0]))
    return {n: (kind, f"{_ATTACHED}.{ident(s)}.{ident(t)}") for n, kind, s, t in named}


def _copy_duckdb_table(con: Con, name: str, chosen: str, relation: str, is_view: bool) -> None:
    """Rows into `_src` in the file's order; a view with at most VIEW_ROWS rows, stopped after
    VIEW_SECONDS (DuckDB's interrupt, from a timer)."""
    if not is_view:
        con.execute(f"CREATE TABLE _src AS SELECT * FROM {relation}")
        return
    timer = threading.Timer(VIEW_SECONDS, con.interrupt)
    timer.start()
    try:
        con.execute(f"CREATE TABLE _src AS SELECT * FROM {relation} LIMIT {VIEW_ROWS + 1}")
    except duckdb.InterruptException:
        raise TableFileError(f"{name}: " + str(_runaway(
            chosen, f"still running after {VIEW_SECONDS:g} s"))) from None
    finally:
        timer.cancel()
    if con.execute("SELECT count(*) FROM _src").fetchone()[0] > VIEW_ROWS:
        raise TableFileError(f"{name}: " + str(_runaway(chosen, f"more than {VIEW_ROWS:,} rows")))
