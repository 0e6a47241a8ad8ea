"""load: a table file in, a DuckDB table plus a profile of its columns out.

The user's file is only ever read. Rows keep their file order in the hidden column ROW (0-based),
so that "first", "last", "next" and "previous" mean what they mean in the file.

The stage runs in four steps, each its own module:
0. `inputs` turns what the user named (a file, "-" for standard input, a folder or a pattern, a
   .gz or .zst file) into the files to read, writing only into a private temporary folder;
1. `files` checks each file (a regular file, not empty, within the size budget, text or the
   right magic bytes), then hashes it;
2. a reader of `readers`, one per format, copies the rows in file order into a staging table;
3. `retype` types, cleans and writes the columns as TABLE, leaving out total rows (`totals`);
4. `profile` measures the columns; then the connection is locked (no file access, no settings).
"""

from __future__ import annotations

import functools
from pathlib import Path

import duckdb

from .errors import TableFileError, TabqError
from .files import one_line
from .inputs import Given, Part, given, shown_given
from .limits import memory_limit, threads, too_wide
from .profile import profile
from .readers import LISTERS, READERS, Source
from .readers.several import read_several
from .retype import build
from .table import Con, ReadChoices, Table


def load_table(path: str | Path, table: str | None = None,
               choices: ReadChoices | None = None) -> Table:
    """Read a table file into an in-memory DuckDB table: CSV/TSV, Parquet, JSON lines, Excel,
    SQLite, DuckDB or Arrow IPC, or one of these compressed (.gz, .zst); "-" for standard input;
    a folder or a glob pattern for several files of the same columns, read as one table.

    `table` names a table of a database file or a sheet; other formats hold one table and ignore
    it. `choices` overrule tabq's own reading guesses (header line, decimal mark, encoding).
    Every failure is a TabqError with a one-line message that names the file.
    """
    name = shown_given(path)
    try:
        with given(path) as what:
            return _load(what, table, choices)
    except TabqError:
        raise
    except (MemoryError, duckdb.OutOfMemoryException) as exc:
        raise TableFileError(f"{name}: too large to load "
                             f"(memory limit {memory_limit() >> 20} MB)") from exc
    except Exception as exc:   # a person gets one line, never a traceback
        raise TableFileError(f"{name}: cannot read it ({one_line(exc)})") from exc


def table_names(path: str | Path) -> list[str]:
    """The tables of a database file or the sheets of a workbook, in the order `load_table`
    offers them; an empty list for formats that hold one table, and for folders and patterns."""
    with given(path) as what:
        part = what.parts[0]
        lister = LISTERS.get(part.kind)
        if lister is None or what.several:
            return []
        try:
            return lister(part.path)
        except TabqError as exc:
            raise type(exc)(part.unstaged(str(exc))) from None
        except Exception as exc:   # a damaged file: one line, as load_table says it
            raise TableFileError(f"{part.shown}: cannot list its tables "
                                 f"({part.unstaged(one_line(exc))})") from exc


def _load(what: Given, table: str | None, choices: ReadChoices | None) -> Table:
    con = connect()
    try:
        if what.several:
            read_one = functools.partial(_read_part, choices=choices)
            source = read_several(con, what.parts, table, read_one, what.title)
        else:
            source = _read_part(con, what.parts[0], table, choices)
        if reason := too_wide(len(source.headers)):
            raise TableFileError(f"{what.shown}: {reason}")
        plans, row_count = build(con, source.headers, source.report,
                                 forced=bool(choices and choices.decimal_mark))
        columns = profile(con, plans, row_count)
        lock(con)
    except BaseException:
        con.close()
        raise
    digest = what.fingerprint()
    if source.table is not None:
        digest.update(b"\0" + source.table.encode())
    return Table(con=con, columns=columns, row_count=row_count, path=what.origin,
                 title=source.title, fingerprint=digest.hexdigest(),
                 name=source.table, report=source.report, reading=choices)


def _read_part(con: Con, part: Part, table: str | None,
               choices: ReadChoices | None = None) -> Source:
    """One file by its format's reader. A reader given a private copy or link names it in
    its messages: they are made to name the user's file."""
    try:
        source = READERS[part.kind](con, part.path, part.head, table, choices)
    except TabqError as exc:
        if not part.staged:
            raise
        raise type(exc)(part.unstaged(str(exc))) from None
    except (MemoryError, duckdb.OutOfMemoryException, duckdb.InterruptException):
        raise
    except Exception as exc:
        raise TableFileError(f"{part.shown}: cannot read it "
                             f"({part.unstaged(one_line(exc))})") from exc
    source.report.format = source.report.format or part.kind   # a reader's own word wins
    if source.title == part.path.stem:     # a one-table file: titled by the user's name
        source.title = part.title
    return source


def connect() -> Con:
    """An in-memory database, bounded from the start so loading a huge file cannot run away."""
    con = duckdb.connect(":memory:")
    con.execute(f"SET memory_limit = '{memory_limit() >> 20}MiB'")
    con.execute(f"SET threads = {threads()}")
    con.execute("SET temp_directory = ''")           # never spill next to the user's files
    con.execute("SET preserve_insertion_order = true")   # rowid of a staging table = file order
    con.execute("SET autoinstall_known_extensions = false")
    con.execute("SET autoload_known_extensions = false")
    return con


def lock(con: Con) -> None:
    """After loading, queries may read only TABLE: no files, no network, no changed settings.

    `con.interrupt()` keeps working, so the executor can still stop a query at its deadline.
    """
    con.execute("SET enable_external_access = false")
    con.execute("SET lock_configuration = true")
