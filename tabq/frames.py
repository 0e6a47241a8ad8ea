"""Data frames in and out: a pandas, polars or Arrow table (or a DuckDB relation) opened as a
table to ask, and an answer given back as a pandas, Arrow or polars frame.

None of these libraries is required: each is imported when it is used, and a missing one is a
`MissingPackageError` that names it and how to install it.
"""

from __future__ import annotations

import hashlib
import threading
from pathlib import Path

from . import load
from .errors import InputError, TabqError
from .execute import QUERY_SECONDS
from .readers.staging import flatten_objects, staging_names
from .retype import build
from .profile import profile
from .table import ReadReport, Table
from .tabular import answer_table, column_names

FETCH_SECONDS = 12 * QUERY_SECONDS   # a whole answer, fetched again for a frame
HASH_BATCH = 10_000                  # rows hashed at a time for a frame's fingerprint
INSTALL = {"pandas": "pip install 'tabq[frames]' (or pandas)",
           "pyarrow": "pip install 'tabq[frames]' (or pyarrow)", "polars": "pip install polars"}


class MissingPackageError(TabqError, ImportError):
    """An optional package a call needs is not installed (catchable as an ImportError too)."""


def need(package: str, why: str):
    """Import an optional package, or say plainly which one to install."""
    import importlib
    try:
        return importlib.import_module(package)
    except ImportError:
        raise MissingPackageError(f"{why} needs {package}: {INSTALL[package]}") from None


# ── frames in ─────────────────────────────────────────────────────────────────────────────────
def is_frame(data: object) -> bool:
    """Whether `data` is a table in memory that `load_frame` takes, rather than a path."""
    return _kind(data) is not None


def _kind(data: object) -> str | None:
    module = type(data).__module__.split(".")[0]
    name = type(data).__name__
    if module == "pandas" and name == "DataFrame":
        return "pandas"
    if module == "polars" and name in ("DataFrame", "LazyFrame"):
        return "polars"
    if module == "pyarrow" and name in ("Table", "RecordBatch"):
        return "arrow"
    if module in ("duckdb", "_duckdb") and name == "DuckDBPyRelation":   # 1.x: _duckdb
        return "duckdb"
    return None


def load_frame(data: object, title: str | None = None) -> Table:
    """Copy a frame into tabq's own in-memory DuckDB table, typed and profiled as a file's rows
    are, so questions go through the same stages. The fingerprint hashes the frame's headers
    and rows, so the model log can tell one frame's content from another's."""
    kind = _kind(data)
    if kind is None:
        raise InputError(f"tabq.open takes a path or a pandas, polars or Arrow table or a DuckDB "
                         f"relation, not {type(data).__name__}")
    con = load.connect()
    try:
        con.register("_frame", _scannable(kind, data))
        try:
            con.execute("CREATE TABLE _src AS SELECT * FROM _frame")
        finally:
            con.unregister("_frame")
        headers = flatten_objects(con, staging_names(con))
        fingerprint = _fingerprint(con, headers)
        report = ReadReport(format=kind)
        plans, row_count = build(con, headers, report)
        columns = profile(con, plans, row_count)
        load.lock(con)
    except BaseException:
        con.close()
        raise
    return Table(con=con, columns=columns, row_count=row_count, path=Path(f"<{kind} frame>"),
                 title=title or "table", fingerprint=fingerprint, name=title, report=report)


def _scannable(kind: str, data: object) -> object:
    """What DuckDB can scan: pandas as it is (a meaningful index kept as columns), the others
    as Arrow."""
    if kind == "pandas":
        index = data.index
        plain = type(index).__name__ == "RangeIndex" and index.name is None
        return data if plain else data.reset_index()
    if kind == "polars":
        need("pyarrow", "opening a polars frame")
        return (data.collect() if hasattr(data, "collect") else data).to_arrow()
    if kind == "duckdb":
        need("pyarrow", "opening a DuckDB relation")
        return _arrow_of(data)
    return data


def _fingerprint(con, headers: list[str]) -> str:
    """sha256 of the headers and every row's values in order: the same data, the same print."""
    digest = hashlib.sha256(b"tabq-frame\0" + "\0".join(headers).encode())
    cursor = con.execute("SELECT * FROM _src ORDER BY rowid")
    while rows := cursor.fetchmany(HASH_BATCH):
        for row in rows:
            digest.update(repr(row).encode() + b"\n")
    return digest.hexdigest()


def _arrow_of(source):
    """An Arrow table from a DuckDB relation: DuckDB 2 renamed fetch_arrow_table."""
    fetch = getattr(source, "to_arrow_table", None) or source.fetch_arrow_table
    return fetch()


# ── frames out ────────────────────────────────────────────────────────────────────────────────
def to_pandas(result):
    """The best answer, whole, as a pandas DataFrame with named columns."""
    pandas = need("pandas", "Result.to_pandas()")
    fetched = _fetch(result, "df")
    if fetched is not None:
        return fetched
    shown = _shown(result)
    return pandas.DataFrame.from_records(list(shown.rows), columns=list(shown.columns))


def to_arrow(result):
    """The best answer, whole, as a pyarrow Table with named columns."""
    pa = need("pyarrow", "Result.to_arrow()")
    fetched = _fetch(result, "arrow")
    if fetched is not None:
        return fetched
    shown = _shown(result)
    return pa.table({name: [row[i] for row in shown.rows]
                     for i, name in enumerate(shown.columns)})


def to_polars(result):
    """The best answer, whole, as a polars DataFrame with named columns."""
    polars = need("polars", "Result.to_polars()")
    return polars.from_arrow(to_arrow(result))


def _shown(result):
    best = _best(result)
    return answer_table(best, result.table, every=True)


def _best(result):
    best = result.best
    if best is None:
        raise TabqError("no reading of this question fits the table: there is no answer to give")
    if best.error:
        raise TabqError(f"the best reading's query failed: {best.error}")
    return best


def _fetch(result, how: str):
    """The best reading run again on its table by DuckDB straight into a frame (its own column
    types: dates stay dates), cut to the answer's columns and renamed; None without a table."""
    best = _best(result)
    table = result.table
    if table is None:
        return None
    names = list(column_names(best.form, table))
    timer = threading.Timer(FETCH_SECONDS, table.con.interrupt)
    timer.start()
    try:
        relation = table.con.sql(best.sql)
        frame = relation.df() if how == "df" else _arrow_of(relation)
    finally:
        timer.cancel()
    if how == "df":
        frame = frame.iloc[:, :len(names)].copy()
        frame.columns = names
        for name in names:          # tabq's enum of a text column is a plain column to a user
            if str(frame[name].dtype) == "category":
                frame[name] = frame[name].astype(frame[name].cat.categories.dtype)
        return frame
    frame = frame.select(list(range(len(names)))).rename_columns(names)
    pa = need("pyarrow", "Result.to_arrow()")
    columns = [c.cast(c.type.value_type) if pa.types.is_dictionary(c.type) else c
               for c in frame.columns]
    return pa.table(columns, names=names)
