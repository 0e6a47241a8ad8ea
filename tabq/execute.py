"""execute: candidate forms → SQL → DuckDB → answers, bounded in time and cached by SQL."""

from __future__ import annotations

import threading

import duckdb

from . import logic as L
from .answers import Denotation, clean
from .errors import QueryError
from .load import Table
from .sql import on_rows, render

QUERY_SECONDS = 5.0
MAX_ROWS = 1000          # rows of one answer kept; more is not an answer anyone reads


def run(table: Table, form: L.Answer, seconds: float = QUERY_SECONDS) -> Denotation:
    """The answer of one form on the table; failures become an empty answer with the error."""
    sql = render(form)
    cache = table.cache.setdefault("answers", {})
    if sql not in cache:
        cache[sql] = _execute(table, sql, seconds, isinstance(form, L.GroupTable))
    return cache[sql]


def run_on_rows(table: Table, form: L.Answer, rows: tuple[int, ...],
                seconds: float = QUERY_SECONDS) -> Denotation:
    """The answer of a form on some rows of the table only (listed by ROW), cached by SQL."""
    sql = on_rows(form, rows)
    cache = table.cache.setdefault("answers", {})
    if sql not in cache:
        cache[sql] = _execute(table, sql, seconds, isinstance(form, L.GroupTable))
    return cache[sql]


def _execute(table: Table, sql: str, seconds: float, is_table: bool) -> Denotation:
    timer = threading.Timer(seconds, table.con.interrupt)
    timer.start()
    try:
        rows = table.con.execute(sql).fetchmany(MAX_ROWS)
    except (duckdb.InterruptException, KeyboardInterrupt):
        return Denotation((), error=f"the query ran past {seconds:g} s and was stopped")
    except duckdb.Error as err:
        return Denotation((), error=str(err).splitlines()[0][:200])
    finally:
        timer.cancel()
    if is_table:
        return Denotation(tuple(tuple(clean(v) for v in row) for row in rows), is_table=True)
    return Denotation(tuple(clean(row[0]) for row in rows))


def run_sql(table: Table, sql: str, seconds: float = QUERY_SECONDS) -> list[tuple]:
    """Rows of SQL that tabq built itself (never text from a person)."""
    timer = threading.Timer(seconds, table.con.interrupt)
    timer.start()
    try:
        return table.con.execute(sql).fetchall()
    except duckdb.Error as err:
        raise QueryError(str(err).splitlines()[0][:200]) from err
    finally:
        timer.cancel()
