"""load: a table file in, a DuckDB table plus a profile of its columns out.

The user's file is only ever read. Rows keep their file order in the hidden column ROW (0-based),
so that "first", "last", "next" and "previous" mean what they mean in the file.

The stage runs in four steps:
1. check the file (exists, not empty, text or the right magic bytes) and hash it;
2. a reader per format copies the rows, in file order, into a staging table `_src`: DuckDB's own
   readers for CSV, Parquet and JSON; Python (csv, openpyxl, sqlite3, json) for the rest, as text;
3. `_build` types each column: DuckDB's types are kept; a text column whose every real cell is a
   clean number, date or boolean is retyped; other text columns get typed views ("7,169" → 7169)
   where most cells parse. Each distinct text is handled once, in Python, and a small mapping
   table joined back gives TABLE;
4. the columns are profiled and the connection is locked (no file access, no setting changes).
"""

from __future__ import annotations

import codecs
import contextlib
import csv
import datetime
import hashlib
import io
import json
import os
import re
import shutil
import sqlite3
import tempfile
import unicodedata
import urllib.parse
from collections.abc import Iterable, Iterator
from dataclasses import dataclass, field
from pathlib import Path

import duckdb

from tabq import values
from tabq.errors import TableFileError, TabqError, UnknownTableError

ROW = "__row"          # hidden 0-based position of a row in the file
TABLE = "t"            # the DuckDB relation that holds the rows
VALUE_CAP = 5000       # distinct values kept per column for linking question words to cells

VIEW_SHARE = 0.7             # share of a text column's real cells that must parse to get a view
VIEW_DISTINCT_CAP = 50_000   # above this many distinct texts, views are skipped (parsing cost)
MEMORY_LIMIT_CAP = 4 << 30   # bytes; hard cap: temp_directory is '' so DuckDB cannot spill
THREADS_CAP = 4              # more threads than this buy little on one table and starve the UI
ENUM_MAX = 10_000            # text columns with at most this many labels are stored as ENUMs

_HEAD = 1 << 16        # bytes looked at to tell text from binary
_CHUNK = 50_000        # rows per insert from the Python readers
_NAME_MAX = 60         # longest clean column name
_Con = duckdb.DuckDBPyConnection


@dataclass(frozen=True)
class Column:
    """One queryable column: a base column of the file, or a typed view of a messy text column."""

    name: str                      # identifier in the DuckDB table, e.g. "price_eur", "distance__number"
    header: str                    # the original header text, for display
    kind: str                      # "number" | "date" | "text" | "bool"
    base: str                      # name of the base column this reads (its own name for a base column)
    view: str | None = None        # None for a base column; "number", "number2", "date" or "year" for a view
    distinct: int = 0              # distinct non-null values
    nulls: int = 0                 # missing cells
    values: tuple[str, ...] = ()   # text/bool columns: distinct values as text, most frequent first
    minimum: float | str | None = None   # number: float; date: ISO text
    maximum: float | str | None = None
    integer: bool = False          # a number column whose values are all whole


@dataclass(frozen=True)
class TableRef:
    """Which table a question was about: the file, the table or sheet in it, its content."""

    path: str
    name: str | None               # a SQLite table or a sheet; None for one-table formats
    fingerprint: str | None        # sha256 of the file (and the name), None when unknown


@dataclass
class Table:
    """A loaded table: DuckDB connection holding relation TABLE, and the profile of its columns."""

    con: duckdb.DuckDBPyConnection
    columns: tuple[Column, ...]
    row_count: int
    path: Path
    title: str                     # file stem, or the SQLite table name
    fingerprint: str               # stable id of the content, for the model's log
    total_row: int | None = None   # ROW of a trailing "Total"-like row, if there is one
    cache: dict = field(default_factory=dict)   # answers by SQL, for the life of the table
    name: str | None = None        # the SQLite table or sheet read; None for one-table formats

    @property
    def reference(self) -> TableRef:
        """What a confirmation records so that it can be asked of this same table again."""
        return TableRef(str(self.path), self.name, self.fingerprint)

    def column(self, name: str) -> Column:
        by_name = self.cache.get("columns")
        if by_name is None:   # asked thousands of times per question by the features
            by_name = self.cache["columns"] = {col.name: col for col in self.columns}
        return by_name[name]


def load_table(path: str | Path, table: str | None = None) -> Table:
    """Read a CSV/TSV, Parquet, JSON-lines, Excel or SQLite file into an in-memory DuckDB table.

    `table` names a SQLite table or an Excel sheet; other formats hold one table and ignore it.
    Every failure is a TabqError with a one-line message that names the file.
    """
    path = Path(path)
    try:
        return _load(path, table)
    except TabqError:
        raise
    except (MemoryError, duckdb.OutOfMemoryException) as exc:
        raise TableFileError(f"{_show(path)}: too large to load "
                             f"(memory limit {memory_limit() >> 20} MB)") from exc
    except Exception as exc:   # a person gets one line, never a traceback
        raise TableFileError(f"{_show(path)}: cannot read it ({_one_line(exc)})") from exc


def table_names(path: str | Path) -> list[str]:
    """The tables of a SQLite file or the sheets of a workbook, in the order `load_table`
    offers them; an empty list for formats that hold one table."""
    path = Path(path)
    head, _ = _read_bytes(path)
    kind = _kind_of(path, head)
    try:
        if kind == "sqlite":
            with _sqlite_open(path) as db:
                listed = db.execute("SELECT name FROM sqlite_master WHERE type = 'table' AND "
                                    "name NOT LIKE 'sqlite_%' ORDER BY name").fetchall()
            return [n for (n,) in listed]
        if kind == "xlsx":
            import openpyxl
            book = openpyxl.load_workbook(path, read_only=True)
            try:
                return list(book.sheetnames)
            finally:
                book.close()
    except TabqError:
        raise
    except Exception as exc:   # a damaged file: one line, as load_table says it
        raise TableFileError(f"{_show(path)}: cannot list its tables ({_one_line(exc)})") from exc
    return []


# ---------------------------------------------------------------- the stage, start to end


@dataclass
class _Source:
    """What a reader leaves besides the staging table: headers in file order and a title."""

    headers: list[str]
    title: str
    table: str | None = None       # the chosen SQLite table or sheet, part of the fingerprint


def _load(path: Path, table: str | None) -> Table:
    head, digest = _read_bytes(path)
    kind = _kind_of(path, head)
    con = _connect()
    try:
        source = _READERS[kind](con, path, head, table)
        columns, row_count, total_row = _build(con, source.headers)
        _lock(con)
    except BaseException:
        con.close()
        raise
    if source.table is not None:
        digest.update(b"\0" + source.table.encode())
    return Table(con=con, columns=columns, row_count=row_count, path=path.absolute(),
                 title=source.title, fingerprint=digest.hexdigest(), total_row=total_row,
                 name=source.table)


def _connect() -> _Con:
    """An in-memory database, bounded from the start so loading a huge file cannot run away."""
    con = duckdb.connect(":memory:")
    con.execute(f"SET memory_limit = '{memory_limit() >> 20}MiB'")
    con.execute(f"SET threads = {threads()}")
    con.execute("SET temp_directory = ''")           # never spill next to the user's files
    con.execute("SET preserve_insertion_order = true")   # rowid of a staging table = file order
    con.execute("SET autoinstall_known_extensions = false")
    con.execute("SET autoload_known_extensions = false")
    return con


def threads() -> int:
    """The cores this process may use, at most THREADS_CAP."""
    try:
        cores = len(os.sched_getaffinity(0))
    except (AttributeError, OSError):
        cores = os.cpu_count() or 1
    return max(1, min(THREADS_CAP, cores))


def memory_limit() -> int:
    """Half the machine's memory, at most MEMORY_LIMIT_CAP, in bytes (the cap if unknown)."""
    try:
        total = os.sysconf("SC_PAGE_SIZE") * os.sysconf("SC_PHYS_PAGES")
    except (AttributeError, ValueError, OSError):
        return MEMORY_LIMIT_CAP
    return max(256 << 20, min(MEMORY_LIMIT_CAP, total // 2))


def _lock(con: _Con) -> None:
    """After loading, queries may read only TABLE: no files, no network, no changed settings.

    `con.interrupt()` keeps working, so the executor can still stop a query at its deadline.
    """
    con.execute("SET enable_external_access = false")
    con.execute("SET lock_configuration = true")


# ---------------------------------------------------------------- small helpers


def _ident(name: str) -> str:
    """A quoted SQL identifier: names come from the file and may hold quotes or keywords."""
    return '"' + name.replace('"', '""') + '"'


def _literal(text: str) -> str:
    """A SQL string literal, for this module's own constants only (user values are parameters)."""
    return "'" + text.replace("'", "''") + "'"


def _show(path: Path) -> str:
    """The path as typed, with control characters escaped so a message stays on one line."""
    return "".join(c if c.isprintable() else repr(c)[1:-1] for c in str(path))


def _one_line(exc: BaseException) -> str:
    lines = str(exc).strip().splitlines()
    text = lines[0] if lines else type(exc).__name__
    return text if len(text) <= 200 else text[:197] + "..."


# ---------------------------------------------------------------- step 1: the file itself


def _read_bytes(path: Path) -> tuple[bytes, hashlib._Hash]:
    """The file's first bytes and the sha256 of all of them, streamed."""
    name = _show(path)
    try:
        if path.is_dir():
            raise TableFileError(f"{name}: is a folder, not a table file")
        if not path.exists():
            raise TableFileError(f"{name}: no such file")
        if not path.is_file():
            raise TableFileError(f"{name}: not a regular file")
        if path.stat().st_size == 0:
            raise TableFileError(f"{name}: the file is empty")
        digest = hashlib.sha256()
        with path.open("rb") as f:
            head = f.read(_HEAD)
            digest.update(head)
            for chunk in iter(lambda: f.read(1 << 20), b""):
                digest.update(chunk)
        if len(head) < _HEAD and not head.strip():
            raise TableFileError(f"{name}: the file holds only blank lines")
    except PermissionError:
        raise TableFileError(f"{name}: no permission to read it") from None
    except OSError as exc:
        raise TableFileError(f"{name}: cannot open it ({exc.strerror or exc})") from None
    return head, digest


_EXTENSIONS = {
    ".csv": "csv", ".tsv": "csv", ".tab": "csv", ".txt": "csv",
    ".parquet": "parquet", ".pq": "parquet",
    ".jsonl": "json", ".ndjson": "json", ".json": "json",
    ".xlsx": "xlsx", ".xlsm": "xlsx",
    ".sqlite": "sqlite", ".sqlite3": "sqlite", ".db": "sqlite",
}
_MAGIC = {b"SQLite format 3\0": "sqlite", b"PAR1": "parquet", b"PK\x03\x04": "xlsx"}
_TEXT_BOMS = (codecs.BOM_UTF16_LE, codecs.BOM_UTF16_BE)
_CONTROL_BYTES = bytes(b for b in range(32) if b not in (9, 10, 12, 13)) + b"\x7f"


def _kind_of(path: Path, head: bytes) -> str:
    """The format by extension, checked against the content; by content for other extensions."""
    name = _show(path)
    magic = next((kind for sig, kind in _MAGIC.items() if head.startswith(sig)), None)
    kind = _EXTENSIONS.get(path.suffix.lower())
    if kind is None:
        if magic:
            return magic
        if _is_text(head):
            return "csv"
        raise TableFileError(f"{name}: not a kind of table file tabq reads "
                             "(.csv, .tsv, .parquet, .jsonl, .json, .xlsx, .sqlite)")
    if kind in ("csv", "json") and not _is_text(head):
        raise TableFileError(f"{name}: binary content, not {kind.upper()} text")
    if kind in ("sqlite", "parquet") and magic != kind:
        what = "SQLite database" if kind == "sqlite" else "Parquet file"
        raise TableFileError(f"{name}: not a {what}")
    if kind == "xlsx" and magic != "xlsx":
        raise TableFileError(f"{name}: not an Excel .xlsx workbook (not a zip archive)")
    return kind


def _is_text(head: bytes) -> bool:
    """Text has no NUL bytes and next to no control characters; random bytes have plenty."""
    if head.startswith(_TEXT_BOMS):
        return True
    if b"\0" in head:
        return False
    controls = sum(head.count(bytes([b])) for b in _CONTROL_BYTES)
    return controls <= len(head) // 200


def _is_utf8(head: bytes) -> bool:
    try:
        codecs.getincrementaldecoder("utf-8")().decode(head, final=False)
    except UnicodeDecodeError:
        return False
    return not head.startswith(_TEXT_BOMS)


# ---------------------------------------------------------------- step 2: readers


def _read_csv(con: _Con, path: Path, head: bytes, table: str | None) -> _Source:
    """DuckDB's reader and sniffer first; Python's csv module for what DuckDB rejects."""
    headers = None
    if _is_utf8(head):
        try:
            headers = _duckdb_csv(con, path)
        except duckdb.Error as exc:
            if isinstance(exc, (duckdb.OutOfMemoryException, duckdb.InterruptException)):
                raise
    if headers is None:
        con.execute("DROP TABLE IF EXISTS _src")
        headers = _python_csv(con, path)
    return _Source(headers, path.stem)


def _duckdb_csv(con: _Con, path: Path) -> list[str] | None:
    """Read with DuckDB; None when its sniffer saw one column in what looks delimited."""
    delim, quote, escape, skip, columns = con.execute(
        "SELECT Delimiter, Quote, Escape, SkipRows, Columns FROM sniff_csv(?, header = true)",
        [str(path)]).fetchone()
    delim, quote, escape = (("" if v == "(empty)" else v) for v in (delim, quote, escape))
    first_line = _first_line(path, skip)
    if len(columns) == 1 and any(d in first_line for d in ",;\t|"):
        return None   # e.g. ragged rows: DuckDB gives up on the delimiter, Python pads them
    options = [str(path), delim, quote, escape, skip]
    read = "read_csv(?, header = true, delim = ?, quote = ?, escape = ?, skip = ?{})"
    try:
        con.execute(f"CREATE TABLE _src AS SELECT * FROM {read.format('')}", options)
    except duckdb.ConversionException:
        # A late cell broke the type guessed from the sample: read all as text, retype in _build.
        con.execute(f"CREATE TABLE _src AS SELECT * FROM {read.format(', all_varchar = true')}",
                    options)
    names = _staging_names(con)
    header = _header_record(path, delim, quote, escape, skip)
    if header is None:
        header = names
    return (header + [""] * len(names))[: len(names)]


def _first_line(path: Path, skip: int) -> str:
    with path.open(encoding="utf-8-sig", errors="replace", newline="") as f:
        for _ in range(skip):
            f.readline()
        return f.readline(_HEAD)


def _header_record(path: Path, delim: str, quote: str, escape: str, skip: int) -> list[str] | None:
    """The header cells as written (DuckDB renames repeated and empty ones), read by Python."""
    if len(delim) != 1 or len(quote) > 1 or len(escape) > 1:
        return None
    with path.open(encoding="utf-8-sig", errors="replace", newline="") as f:
        for _ in range(skip):
            f.readline()
        options: dict = {"delimiter": delim}
        if quote:
            options["quotechar"] = quote
            if escape and escape != quote:
                options.update(escapechar=escape, doublequote=False)
        else:
            options["quoting"] = csv.QUOTE_NONE
        return next(csv.reader(f, **options), None)


def _python_csv(con: _Con, path: Path) -> list[str]:
    """Any delimited text: decoded leniently, ragged rows padded or cut to the header's width."""
    text = _decode(path.read_bytes())
    if "\0" in text:
        raise TableFileError(f"{_show(path)}: binary content, not CSV text")
    delim = _sniff_delimiter(text[:_HEAD], path.suffix.lower())
    csv.field_size_limit(max(csv.field_size_limit(), 1 << 30))
    records = (r for r in csv.reader(io.StringIO(text, newline=""), delimiter=delim)
               if any(cell.strip(values.SPACES) for cell in r))
    header = next(records, None)
    if header is None:
        raise TableFileError(f"{_show(path)}: no header row")
    width = len(header)
    _insert_rows(con, width, ((r + [None] * width)[:width] for r in records))
    return header


def _decode(data: bytes) -> str:
    """UTF-8 or UTF-16/32 with a byte-order mark; else Windows-1252, else Latin-1 (never fails)."""
    for bom, encoding in ((codecs.BOM_UTF32_LE, "utf-32"), (codecs.BOM_UTF32_BE, "utf-32"),
                          (codecs.BOM_UTF8, "utf-8-sig"), (codecs.BOM_UTF16_LE, "utf-16"),
                          (codecs.BOM_UTF16_BE, "utf-16")):
        if data.startswith(bom):
            return data.decode(encoding, errors="replace")
    for encoding in ("utf-8", "cp1252"):
        try:
            return data.decode(encoding)
        except UnicodeDecodeError:
            pass
    return data.decode("latin-1")


def _sniff_delimiter(sample: str, suffix: str) -> str:
    if suffix in (".tsv", ".tab"):
        return "\t"
    lines = sample.splitlines()[:50]
    try:
        return csv.Sniffer().sniff("\n".join(lines), delimiters=",;\t|").delimiter
    except csv.Error:
        first = lines[0] if lines else ""
        return max(",;\t|", key=first.count) if any(d in first for d in ",;\t|") else ","


def _read_parquet(con: _Con, path: Path, head: bytes,
                  table: str | None) -> _Source:
    con.execute("CREATE TABLE _src AS SELECT * FROM read_parquet(?)", [str(path)])
    return _Source(_staging_names(con), path.stem)


def _read_json(con: _Con, path: Path, head: bytes, table: str | None) -> _Source:
    """JSON lines or an array of objects: DuckDB's reader, Python's json module as a fallback."""
    try:
        con.execute("CREATE TABLE _src AS SELECT * FROM read_json(?)", [str(path)])
        if con.execute("SELECT count(*) FROM _src").fetchone()[0]:
            return _Source(_staging_names(con), path.stem)
    except duckdb.Error as exc:
        if isinstance(exc, (duckdb.OutOfMemoryException, duckdb.InterruptException)):
            raise
    con.execute("DROP TABLE IF EXISTS _src")
    records = _json_records(path)
    keys = list(dict.fromkeys(k for r in records for k in r))
    if not keys:
        raise TableFileError(f"{_show(path)}: no JSON objects with fields")
    _insert_rows(con, len(keys), ([_cell_text(r.get(k)) for k in keys] for r in records))
    return _Source(keys, path.stem)


def _json_records(path: Path) -> list[dict]:
    text = _decode(path.read_bytes())
    try:
        data = json.loads(text)
        records = data if isinstance(data, list) else [data]
    except json.JSONDecodeError:
        try:
            records = [json.loads(line) for line in text.splitlines() if line.strip()]
        except json.JSONDecodeError as exc:
            raise TableFileError(f"{_show(path)}: not JSON lines or a JSON array ({exc})") from None
    if not all(isinstance(r, dict) for r in records):
        raise TableFileError(f"{_show(path)}: JSON rows must be objects")
    return records


def _read_xlsx(con: _Con, path: Path, head: bytes, table: str | None) -> _Source:
    """The first worksheet, or the one `table` names; the first non-empty row is the header."""
    import openpyxl  # imported here: it is slow to import and only Excel files need it

    name = _show(path)
    try:
        book = openpyxl.load_workbook(path, read_only=True, data_only=True)
    except Exception as exc:   # openpyxl raises many kinds for a damaged file
        raise TableFileError(f"{name}: not a readable Excel workbook ({_one_line(exc)})") from None
    try:
        sheets = {ws.title: ws for ws in book.worksheets}
        if not sheets:
            raise TableFileError(f"{name}: the workbook has no worksheets")
        chosen = _choose(list(sheets), table, name, "sheet") if table else next(iter(sheets))
        rows = (r for r in sheets[chosen].iter_rows(values_only=True)
                if any(v is not None and v != "" for v in r))
        first = next(rows, None)
        if first is None:
            raise TableFileError(f"{name}: sheet {chosen!r} is empty")
        header = ["" if v is None else str(v) for v in first]
        width = len(header)
        _insert_rows(con, width, ((list(r) + [None] * width)[:width] for r in rows))
    finally:
        book.close()
    default = re.fullmatch(r"sheet\s*\d*", chosen.strip(), re.IGNORECASE)
    return _Source(header, path.stem if default else chosen, chosen)


def _read_sqlite(con: _Con, path: Path, head: bytes,
                 table: str | None) -> _Source:
    """One table (or view) of a SQLite file, opened read-only with Python's sqlite3."""
    name = _show(path)
    try:
        with _sqlite_open(path) as db:
            listed = db.execute("SELECT name, type FROM sqlite_master WHERE type IN "
                                "('table', 'view') AND name NOT LIKE 'sqlite_%' "
                                "ORDER BY type, name").fetchall()
            tables = [n for n, t in listed if t == "table"]
            if table is not None:
                chosen = _choose([n for n, _ in listed], table, name, "table")
            elif len(tables) == 1:
                chosen = tables[0]
            elif not tables:
                raise TableFileError(f"{name}: the SQLite file has no tables")
            else:
                raise UnknownTableError(f"{name}: holds several tables, choose one: "
                                        f"{_listing(tables)}")
            headers = _copy_sqlite_table(con, db, chosen)
    except sqlite3.Error as exc:
        raise TableFileError(f"{name}: not a readable SQLite database ({_one_line(exc)})") from None
    return _Source(headers, chosen, chosen)


@contextlib.contextmanager
def _sqlite_open(path: Path) -> Iterator[sqlite3.Connection]:
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


def _copy_sqlite_table(con: _Con, db: sqlite3.Connection, name: str) -> list[str]:
    """The table's rows into `_src`; its column names. Text that is not valid UTF-8 is read
    again with replacement characters rather than failing the whole table."""
    sql = f"SELECT * FROM {_ident(name)}"
    try:
        cursor = db.execute(sql)
        _insert_rows(con, len(cursor.description), _sqlite_rows(cursor))
    except sqlite3.OperationalError as exc:
        if "decode" not in str(exc):
            raise
        db.text_factory = lambda data: data.decode("utf-8", errors="replace")
        cursor = db.execute(sql)
        _insert_rows(con, len(cursor.description), _sqlite_rows(cursor))
    return [d[0] for d in cursor.description]


def _sqlite_rows(cursor: sqlite3.Cursor) -> Iterator[tuple | list]:
    """Rows as sqlite3 gives them, except that BLOB cells (rare) become text."""
    while batch := cursor.fetchmany(_CHUNK):
        for row in batch:
            yield [_cell_text(v) for v in row] if bytes in map(type, row) else row


def _choose(names: list[str], wanted: str, where: str, what: str) -> str:
    """The table or sheet called `wanted`, matched exactly or else ignoring case."""
    if wanted in names:
        return wanted
    folded = [n for n in names if n.casefold() == wanted.casefold()]
    if len(folded) == 1:
        return folded[0]
    raise UnknownTableError(f"{where}: no {what} named {wanted!r}; it has: {_listing(names)}")


def _listing(names: list[str], cap: int = 20) -> str:
    if not names:
        return "none"
    more = f" and {len(names) - cap} more" if len(names) > cap else ""
    return ", ".join(repr(n) for n in names[:cap]) + more


def _cell_text(value: object) -> str | None:
    """A JSON value or SQLite BLOB as text (the csv module writes other cells well enough)."""
    if value is None or isinstance(value, str):
        return value
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, bytes):
        try:
            return value.decode("utf-8")
        except UnicodeDecodeError:
            return value.hex()
    if isinstance(value, (dict, list)):
        return json.dumps(value, ensure_ascii=False)
    return str(value)


def _insert_rows(con: _Con, width: int, rows: Iterable[list]) -> None:
    """Rows from a Python reader into `_src` as text, in order. They pass through a CSV file in
    a temporary folder, written by the csv module and read by DuckDB: both are C code, many
    times faster than handing DuckDB Python lists cell by cell. Rows must have `width` cells;
    cells are text, numbers, booleans, dates or None, and _build types the columns later."""
    columns = {f"c{i}": "VARCHAR" for i in range(width)}
    with tempfile.TemporaryDirectory(prefix="tabq-") as tmp:
        staged = Path(tmp) / "rows.csv"
        with staged.open("w", encoding="utf-8", errors="replace", newline="") as f:
            csv.writer(f, lineterminator="\n").writerows(rows)
        con.execute("CREATE TABLE _src AS SELECT * FROM read_csv(?, columns = ?, header = false, "
                    "auto_detect = false, delim = ',', quote = '\"', escape = '\"', "
                    "new_line = '\\n', max_line_size = ?)", [str(staged), columns, 1 << 30])


def _staging_names(con: _Con) -> list[str]:
    """The column names DuckDB's reader gave `_src`. A column called "rowid" is renamed, as it
    would hide the rowid that carries the file order."""
    names = [row[0] for row in con.execute("DESCRIBE _src").fetchall()]
    for i, name in enumerate(names):
        if name.casefold() == "rowid":
            con.execute(f"ALTER TABLE _src RENAME COLUMN {_ident(name)} TO {_ident(f'_rowid{i}')}")
    return names


_READERS = {"csv": _read_csv, "parquet": _read_parquet, "json": _read_json,
            "xlsx": _read_xlsx, "sqlite": _read_sqlite}


# ---------------------------------------------------------------- clean headers


_TRANSLIT = str.maketrans({
    "ß": "ss", "æ": "ae", "Æ": "ae", "ø": "o", "Ø": "o", "œ": "oe", "Œ": "oe", "ł": "l",
    "Ł": "l", "đ": "d", "Đ": "d", "ð": "d", "Ð": "d", "þ": "th", "Þ": "th", "ı": "i",
    "%": " pct ", "&": " and ", "#": " num ",
})


def clean_name(header: str, position: int) -> str:
    """A lowercase identifier for a header: "Price (€)" → "price"; "" → "column_3" (1-based).

    Latin letters lose their accents; other scripts are dropped. Runs of other characters become
    one underscore, so a clean name never holds "__" (which marks views) and never equals ROW.
    """
    text = unicodedata.normalize("NFKD", header.translate(_TRANSLIT))
    text = text.encode("ascii", "ignore").decode().lower()
    name = re.sub(r"[^a-z0-9]+", "_", text).strip("_")[:_NAME_MAX].rstrip("_")
    if not name:
        return f"column_{position}"
    return f"c_{name}" if name[0].isdigit() else name


def clean_names(headers: list[str]) -> list[str]:
    """Clean names for a header row, repeats numbered: "name", "name" → "name", "name_2"."""
    taken: set[str] = set()
    names = []
    for position, header in enumerate(headers, 1):
        base = name = clean_name(header, position)
        suffix = 2
        while name in taken:
            name = f"{base}_{suffix}"
            suffix += 1
        taken.add(name)
        names.append(name)
    return names


# ---------------------------------------------------------------- step 3: types, views, TABLE


_NUMBER_TYPES = ("TINYINT", "SMALLINT", "INTEGER", "BIGINT", "HUGEINT", "UTINYINT", "USMALLINT",
                 "UINTEGER", "UBIGINT", "UHUGEINT", "FLOAT", "DOUBLE", "DECIMAL")
_INTEGER_TYPES = _NUMBER_TYPES[:10]
_KINDS = {**dict.fromkeys(_NUMBER_TYPES, "number"), "BOOLEAN": "bool", "DATE": "date",
          **dict.fromkeys(("TIMESTAMP", "TIMESTAMP_S", "TIMESTAMP_MS", "TIMESTAMP_NS",
                           "TIMESTAMP WITH TIME ZONE"), "date")}
_VIEW_TYPES = {"number": "DOUBLE", "number2": "DOUBLE", "date": "DATE", "year": "BIGINT"}
_VIEW_KINDS = {"number": "number", "number2": "number", "date": "date", "year": "number"}
_HAS_DIGIT = re.compile(r"[0-9]")

# Strict shapes for retyping a text column whose every real cell is a clean value. Valid both as
# Python and as RE2 (DuckDB) patterns. No leading zeros, so codes like "02139" stay text; at most
# 18 digits, so every integer fits a BIGINT.
_INT_RE = re.compile(r"[-+]?(0|[1-9][0-9]{0,17})")
_FLOAT_RE = re.compile(r"[-+]?((0|[1-9][0-9]*)(\.[0-9]*)?|\.[0-9]+)([eE][-+]?[0-9]+)?")
_DATE_RE = re.compile(r"([0-9]{4})-([0-9]{2})-([0-9]{2})")
_STAMP_RE = re.compile(r"([0-9]{4})-([0-9]{2})-([0-9]{2})[ T]([0-9]{2}):([0-9]{2})"
                       r"(?::([0-9]{2})(?:\.([0-9]{1,9}))?)?")


def _to_int(text: str) -> int | None:
    return int(text) if _INT_RE.fullmatch(text) else None


def _to_float(text: str) -> float | None:
    return float(text) if _FLOAT_RE.fullmatch(text) else None


def _to_date(text: str) -> datetime.date | None:
    m = _DATE_RE.fullmatch(text)
    try:
        return datetime.date(*map(int, m.groups())) if m else None
    except ValueError:   # "2001-02-30"
        return None


def _to_stamp(text: str) -> datetime.datetime | None:
    m = _STAMP_RE.fullmatch(text)
    if not m:
        return None
    y, mo, d, h, mi, sec, frac = m.groups()
    try:
        return datetime.datetime(int(y), int(mo), int(d), int(h), int(mi), int(sec or 0),
                                 int((frac or "0")[:6].ljust(6, "0")))
    except ValueError:
        return None


def _to_bool(text: str) -> bool | None:
    return {"true": True, "false": False}.get(text.lower())


def _sql_cast(pattern: re.Pattern, sql_type: str) -> str:
    # CASE, not AND: DuckDB then casts only the cells that have the shape.
    return (f"CASE WHEN regexp_full_match({{e}}, {_literal(pattern.pattern)}) "
            f"THEN TRY_CAST({{e}} AS {sql_type}) END")


# How a text column can be retyped, tried in order: (kind, DuckDB type, Python converter for
# the distinct texts, SQL converter for columns too varied to convert in Python; {e} = the text).
_RETYPES = (
    ("number", "BIGINT", _to_int, _sql_cast(_INT_RE, "BIGINT")),
    ("number", "DOUBLE", _to_float, _sql_cast(_FLOAT_RE, "DOUBLE")),
    ("date", "DATE", _to_date, _sql_cast(_DATE_RE, "DATE")),
    ("date", "TIMESTAMP", _to_stamp, _sql_cast(_STAMP_RE, "TIMESTAMP")),
    ("bool", "BOOLEAN", _to_bool,
     "CASE lower({e}) WHEN 'true' THEN true WHEN 'false' THEN false END"),
)
# values.PLACEHOLDERS as a DuckDB list literal (this module's constants, not user text).
_PLACEHOLDERS = "[" + ", ".join(_literal(p) for p in sorted(values.PLACEHOLDERS)) + "]"
# The columns of the mapping table `_m`: which column, which raw text, and what it becomes.
_MAPPED = {"col": "INTEGER", "k": "VARCHAR", "text": "VARCHAR", **_VIEW_TYPES,
           **{f"as_{t}": t for _, t, _, _ in _RETYPES}}


@dataclass
class _Plan:
    """How one base column of TABLE is made, and what is known of it before TABLE exists."""

    header: str
    name: str
    kind: str
    expr: str                       # SQL giving the column's cells, over _src and its join
    alias: str | None = None        # the mapping rows joined for this column, if any …
    join: str = ""                  # … and how they are joined
    nonnull: int = 0
    distinct: int = 0
    values: tuple[str, ...] = ()
    views: tuple[str, ...] = ()     # "number", "number2", "date", "year" columns it carries


def _build(con: _Con,
           headers: list[str]) -> tuple[tuple[Column, ...], int, int | None]:
    """Staging table in; TABLE, its profile, its row count and its total row out."""
    described = con.execute("DESCRIBE _src").fetchall()
    headers = [values.clean_cell(h) or "" for h in headers]
    headers = (headers + [""] * len(described))[: len(described)]
    names = clean_names(headers)
    refs = [f"_src.{_ident(row[0])}" for row in described]
    kinds = [_KINDS.get(row[1].split("(")[0]) for row in described]
    typed = [i for i, kind in enumerate(kinds) if kind]
    texts = [i for i, kind in enumerate(kinds) if not kind]
    plans: dict[int, _Plan] = {}
    if typed:
        counts = con.execute(f"SELECT {', '.join(f'count({refs[i]})' for i in typed)} FROM _src")
        for i, nonnull in zip(typed, counts.fetchone(), strict=True):
            plans[i] = _Plan(headers[i], names[i], kinds[i], refs[i], nonnull=nonnull)
    mapping: dict[str, list] = {name: [] for name in _MAPPED}
    raw = {i: _as_text(refs[i], described[i][1]) for i in texts}
    for i, (distinct, rows) in _value_counts(con, raw).items():
        if distinct > VIEW_DISTINCT_CAP:
            plans[i] = _varied_text_plan(con, headers[i], names[i], raw[i])
        else:
            views = described[i][1] in ("VARCHAR", "JSON") or described[i][1].startswith("ENUM")
            plans[i] = _text_plan(i, headers[i], names[i], raw[i], rows, views, mapping)
    ordered = [plans[i] for i in range(len(described))]
    # A column with neither a header nor a cell is spreadsheet padding, not data.
    ordered = [p for p in ordered if p.header or p.nonnull] or ordered[:1]
    _write_table(con, ordered, mapping)
    row_count = con.execute(f"SELECT count(*) FROM {TABLE}").fetchone()[0]
    _categories_as_enums(con, ordered, row_count)
    return _profile(con, ordered, row_count), row_count, _total_row(con, ordered, row_count)


def _as_text(ref: str, sql_type: str) -> str:
    """A column of any other type as text: JSON values unquoted, nested values as JSON text."""
    if sql_type == "JSON":
        return f"json_extract_string({ref}, '$')"
    if sql_type.startswith(("STRUCT", "MAP", "UNION")) or sql_type.endswith("]"):
        return f"CAST(to_json({ref}) AS VARCHAR)"
    return f"CAST({ref} AS VARCHAR)"


def _value_counts(con: _Con,
                  raw: dict[int, str]) -> dict[int, tuple[int, list[tuple[str, int, int]]]]:
    """For each text column: its number of distinct texts and, if that is at most
    VIEW_DISTINCT_CAP, every (text, cells, first ROW), most frequent first. One query for all."""
    found: dict[int, tuple[int, list]] = {i: (0, []) for i in raw}
    if not raw:
        return found
    parts = [f"SELECT {i} AS col, v, n, first, count(*) OVER () AS d, "
             "row_number() OVER (ORDER BY n DESC, first) AS k FROM ("
             f"SELECT {expr} AS v, count(*) AS n, min(_src.rowid) AS first FROM _src "
             f"WHERE {expr} IS NOT NULL GROUP BY 1)" for i, expr in raw.items()]
    rows = con.execute(f"SELECT col, v, n, first, d FROM ({' UNION ALL '.join(parts)}) "
                       "WHERE d <= ? OR k = 1 ORDER BY col, k", [VIEW_DISTINCT_CAP]).fetchall()
    for col, v, n, first, d in rows:
        if d <= VIEW_DISTINCT_CAP:
            found[col][1].append((v, n, first))
        found[col] = (d, found[col][1])
    return found


def _text_plan(i: int, header: str, name: str, raw: str, rows: list[tuple[str, int, int]],
               views: bool, mapping: dict[str, list]) -> _Plan:
    """A text column of at most VIEW_DISTINCT_CAP distinct texts, decided in Python on those
    texts: trimmed, retyped if every real cell is a clean value, else given typed views. What a
    raw text becomes is added to `mapping` (parallel lists), joined when TABLE is written."""
    clean = {text: values.clean_cell(text) for text, _, _ in rows}
    counts: dict[str, list[int]] = {}        # clean text → [cells, first ROW]
    for text, n, first in rows:
        if (c := clean[text]) is not None:
            seen = counts.setdefault(c, [0, first])
            seen[0] += n
            seen[1] = min(seen[1], first)
    order = sorted(counts, key=lambda c: (-counts[c][0], counts[c][1]))
    real = [c for c in order if not values.is_placeholder(c)]
    alias = f"_m{i}"
    join = f"LEFT JOIN _m AS {alias} ON {alias}.col = {i} AND {alias}.k = {raw}"
    # Placeholders ("—", "n/a", "NA") are missing values: they do not keep a number column text.
    for kind, sql_type, convert, _ in _RETYPES:
        converted = _convert_all(convert, real)
        if converted is not None:
            keys = [text for text, c in clean.items() if c in converted]
            _add_mapping(mapping, i, keys, {f"as_{sql_type}": [converted[clean[k]] for k in keys]})
            return _Plan(header, name, kind, f"{alias}.as_{sql_type}", alias, join,
                         nonnull=sum(counts[c][0] for c in real))
    found = derive_views([(c, counts[c][0]) for c in order]) if views else {}
    # a placeholder in a text column is a missing cell too, so "no sex recorded" finds it
    plan = _Plan(header, name, "text", raw, nonnull=sum(counts[c][0] for c in real),
                 distinct=len(real), values=tuple(real[:VALUE_CAP]), views=tuple(found))
    if found or len(real) < len(order) or any(text != c for text, c in clean.items()):
        keys = [text for text, c in clean.items() if c is not None]
        cells = [clean[k] for k in keys]
        texts = [None if values.is_placeholder(c) else c for c in cells]
        _add_mapping(mapping, i, keys, {"text": texts, **{
            view: [parsed.get(c) for c in cells] for view, parsed in found.items()}})
        plan.expr, plan.alias, plan.join = f"{alias}.text", alias, join
    return plan


def _convert_all(convert, texts: list[str]) -> dict[str, object] | None:
    """Every text converted, or None as soon as one does not convert (or there are none)."""
    converted = {}
    for text in texts:
        if (value := convert(text)) is None:
            return None
        converted[text] = value
    return converted or None


def _add_mapping(mapping: dict[str, list], col: int, keys: list[str],
                 cells: dict[str, list]) -> None:
    """Rows for column `col`: raw text → its clean text, typed value or views; None elsewhere."""
    for name, column in mapping.items():
        column.extend([col] * len(keys) if name == "col" else keys if name == "k" else
                      cells.get(name, [None] * len(keys)))


def _varied_text_plan(con: _Con, header: str, name: str, raw: str) -> _Plan:
    """A text column with more than VIEW_DISTINCT_CAP distinct texts (ids, free text): trimmed,
    placeholders made missing and retyped in SQL, profiled from its distinct texts, and given no
    views (parsing each of its texts in Python would cost seconds). Trimming and the placeholder
    test are applied to each row only if some distinct text needs them."""
    con.execute(f"CREATE OR REPLACE TABLE _vc AS SELECT raw, n, first, {_trimmed('raw')} AS v, "
                f"coalesce(list_contains({_PLACEHOLDERS}, lower({_trimmed('raw')})), false) "
                "AS missing "
                f"FROM (SELECT {raw} AS raw, count(*) AS n, min(_src.rowid) AS first FROM _src "
                "WHERE raw IS NOT NULL GROUP BY 1)")
    trimmed, missing = con.execute(
        "SELECT bool_or(v IS DISTINCT FROM raw), bool_or(missing) FROM _vc").fetchone()
    real = "FROM _vc WHERE v IS NOT NULL AND NOT missing"
    top = [v for (v,) in con.execute(f"SELECT v {real} GROUP BY v ORDER BY sum(n) DESC, "
                                     "min(first) LIMIT ?", [VALUE_CAP]).fetchall()]
    distinct, nonnull = con.execute(f"SELECT count(DISTINCT v), coalesce(sum(n), 0) {real}"
                                    ).fetchone()
    text = _trimmed(raw) if trimmed else raw
    # The most frequent texts rule most types out at once; SQL checks the others on every text.
    for kind, _, convert, sql in _RETYPES:
        if not top or _convert_all(convert, top) is None:
            continue
        misfits = f"SELECT count(*) {real} AND ({sql.replace('{e}', 'v')}) IS NULL"
        if not con.execute(misfits).fetchone()[0]:
            return _Plan(header, name, kind, sql.replace("{e}", text), nonnull=nonnull)
    if missing:
        text = f"CASE WHEN list_contains({_PLACEHOLDERS}, lower({text})) THEN NULL ELSE {text} END"
    return _Plan(header, name, "text", text, nonnull=nonnull, distinct=distinct,
                 values=tuple(top))


def _trimmed(expr: str) -> str:
    """SQL for a text without outer whitespace or NBSP; None if nothing is left."""
    return f"NULLIF(trim({expr}, {_literal(values.SPACES)}), '')"


def derive_views(counts: list[tuple[str, int]]) -> dict[str, dict[str, object]]:
    """Typed views of a text column from its (text, cell count) pairs: view → {text: value}.

    A view exists when at least VIEW_SHARE of the real (non-placeholder) cells parse. A column
    of dates gets only the date view: its day as a "number" would mislead.
    """
    real = [(text, n) for text, n in counts if not values.is_placeholder(text)]
    total = sum(n for _, n in real)
    if not total:
        return {}
    digits = [(text, n) for text, n in real if _HAS_DIGIT.search(text)]   # no digit, no value
    dayfirst = values.numeric_date_order([text for text, _ in digits])
    parsed: dict[str, dict[str, object]] = {"number": {}, "number2": {}, "date": {}, "year": {}}
    for text, _ in digits:
        numbers = values.parse_numbers(text)
        found = {"number": numbers[0] if numbers else None,
                 "number2": numbers[1] if len(numbers) > 1 else None,
                 "date": values.parse_date(text, dayfirst), "year": values.parse_year(text)}
        for view, value in found.items():
            if value is not None:
                parsed[view][text] = value
    weight = dict(real)
    views = {view: found for view, found in parsed.items()
             if sum(weight[t] for t in found) >= VIEW_SHARE * total}
    return {"date": views["date"]} if "date" in views else views


def _write_table(con: _Con, plans: list[_Plan],
                 mapping: dict[str, list]) -> None:
    """TABLE = ROW, the base columns and their views, in file order; then the staging is dropped."""
    columns = [f"unnest(?::{sql_type}[]) AS {name}" for name, sql_type in _MAPPED.items()]
    con.execute(f"CREATE TABLE _m AS SELECT {', '.join(columns)}", list(mapping.values()))
    selects = [f"_src.rowid AS {_ident(ROW)}"]
    for plan in plans:
        selects.append(f"{plan.expr} AS {_ident(plan.name)}")
        selects += [f"{plan.alias}.{view} AS {_ident(f'{plan.name}__{view}')}"
                    for view in plan.views]
    joins = " ".join(plan.join for plan in plans)
    con.execute(f"CREATE TABLE {TABLE} AS SELECT {', '.join(selects)} FROM _src {joins} "
                "ORDER BY _src.rowid")
    for name in ("_src", "_m", "_vc"):
        con.execute(f"DROP TABLE IF EXISTS {name}")
    _drop_empty_rows(con, plans)
    _stamps_to_dates(con)


def _categories_as_enums(con: _Con, plans: list[_Plan], row_count: int) -> None:
    """Text columns of repeated labels become ENUMs: filters and groups on them run several
    times faster than on text. The labels are sorted by their bytes, as text is, so that
    comparisons, min/max and ORDER BY give what they give on the text."""
    for i, plan in enumerate(plans):
        if plan.kind != "text" or not 1 < plan.distinct <= min(ENUM_MAX, row_count // 2):
            continue
        ref, enum = _ident(plan.name), _ident(f"_enum{i}")
        con.execute(f"CREATE TYPE {enum} AS ENUM (SELECT DISTINCT {ref} FROM {TABLE} "
                    f"WHERE {ref} IS NOT NULL ORDER BY {ref})")
        con.execute(f"ALTER TABLE {TABLE} ALTER COLUMN {ref} TYPE {enum}")


def _drop_empty_rows(con: _Con, plans: list[_Plan]) -> None:
    """Rows without a single cell (",,," lines, blank spreadsheet rows) are dropped, and ROW
    stays a dense 0-based position among the rows kept."""
    empty = " AND ".join(f"{_ident(p.name)} IS NULL" for p in plans)
    if not con.execute(f"SELECT count(*) FROM {TABLE} WHERE {empty}").fetchone()[0]:
        return
    row = _ident(ROW)
    con.execute(f"CREATE TABLE _kept AS SELECT row_number() OVER (ORDER BY {row}) - 1 AS {row}, "
                f"* EXCLUDE ({row}) FROM {TABLE} WHERE NOT ({empty}) ORDER BY {row}")
    con.execute(f"DROP TABLE {TABLE}")
    con.execute(f"ALTER TABLE _kept RENAME TO {TABLE}")


def _stamps_to_dates(con: _Con) -> None:
    """Timestamp columns that are all at midnight become dates: Excel and many CSV exports
    write plain dates that way, and "2001-05-06" reads better than "2001-05-06 00:00:00"."""
    stamps = [name for name, sql_type, *_ in con.execute(f"DESCRIBE {TABLE}").fetchall()
              if sql_type.startswith("TIMESTAMP") and "TIME ZONE" not in sql_type]
    if not stamps:
        return
    checks = ", ".join(f"coalesce(bool_and(date_trunc('day', {_ident(s)}) = {_ident(s)}), false)"
                       for s in stamps)
    found = con.execute(f"SELECT {checks} FROM {TABLE}").fetchone()
    for name, midnight in zip(stamps, found, strict=True):
        if midnight:
            con.execute(f"ALTER TABLE {TABLE} ALTER COLUMN {_ident(name)} TYPE DATE")


# ---------------------------------------------------------------- step 4: profile


def _profile(con: _Con, plans: list[_Plan],
             row_count: int) -> tuple[Column, ...]:
    """Columns in file order, each base column followed by its views; one scan for the stats."""
    columns = []
    for plan in plans:
        columns.append(Column(plan.name, plan.header, plan.kind, plan.name, distinct=plan.distinct,
                              nulls=row_count - plan.nonnull, values=plan.values))
        columns += [Column(f"{plan.name}__{view}", plan.header, _VIEW_KINDS[view], plan.name, view)
                    for view in plan.views]
    types = {row[0]: row[1] for row in con.execute(f"DESCRIBE {TABLE}").fetchall()}
    measured = [c for c in columns if c.kind != "text"]
    if not measured:
        return tuple(columns)
    parts = []
    for col in measured:
        ref, sql_type = _ident(col.name), types[col.name]
        real = f" FILTER (WHERE NOT isnan({ref}))" if sql_type in ("DOUBLE", "FLOAT") else ""
        whole = ("true" if sql_type in _INTEGER_TYPES else
                 f"coalesce(bool_and({ref} = trunc({ref})), false)" if col.kind == "number"
                 else "false")
        ends = f"min({ref}){real}, max({ref}){real}" if col.kind != "bool" else "NULL, NULL"
        parts.append(f"count(DISTINCT {ref}), count({ref}), {ends}, {whole}")
    stats = con.execute(f"SELECT {', '.join(parts)} FROM {TABLE}").fetchone()
    profiled = {}
    for i, col in enumerate(measured):
        distinct, nonnull, low, high, whole = stats[5 * i: 5 * i + 5]
        profiled[col.name] = Column(
            col.name, col.header, col.kind, col.base, col.view, distinct=distinct,
            nulls=row_count - nonnull, values=_bool_values(con, col) if col.kind == "bool" else (),
            minimum=_stat(low), maximum=_stat(high), integer=bool(whole) and nonnull > 0)
    return tuple(profiled.get(c.name, c) for c in columns)


def _stat(value: object) -> float | str | None:
    if value is None:
        return None
    if hasattr(value, "isoformat"):
        return value.isoformat()
    return float(value)


def _bool_values(con: _Con, col: Column) -> tuple[str, ...]:
    ref = _ident(col.name)
    rows = con.execute(f"SELECT CAST({ref} AS VARCHAR) FROM {TABLE} WHERE {ref} IS NOT NULL "
                       f"GROUP BY {ref} ORDER BY count(*) DESC, min({_ident(ROW)})").fetchall()
    return tuple(v for (v,) in rows)


_TOTAL_LABEL = re.compile(r"(?:grand |overall )?totals?(?: \(.*\))?")
_FIRST_TOTAL_LABEL = re.compile(r"sum|all|(?:grand |overall )?totals?\b.*|.*\btotals?")


def _total_row(con: _Con, plans: list[_Plan], row_count: int) -> int | None:
    """ROW of a last row labelled "Total", "Totals", "Grand total" in any text cell, or in its
    first text cell "Sum", "All", "Total seats", "Career total" and the like: such a row would be
    counted and summed with the others. (A last row titled "Total Recall" is taken too.)"""
    texts = [_ident(p.name) for p in plans if p.kind == "text"]
    if row_count < 2 or not texts:
        return None
    row = con.execute(f"SELECT {_ident(ROW)}, {', '.join(texts)} FROM {TABLE} "
                      f"ORDER BY {_ident(ROW)} DESC LIMIT 1").fetchone()
    labels = [values.normal_text(values.strip_footnotes(c)).strip(" :.") for c in row[1:] if c]
    if labels and (_FIRST_TOTAL_LABEL.fullmatch(labels[0])
                   or any(_TOTAL_LABEL.fullmatch(label) for label in labels)):
        return row[0]
    return None
