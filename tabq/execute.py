"""execute: candidate forms → SQL → DuckDB → answers, fused, bounded in time and cached by SQL.

Candidates that share a scan are run as one query (`run_many`):
- aggregates over the same rows (and yes/no questions about them): one SELECT per distinct WHERE
  carrying all their aggregates, at most FUSE_WIDTH a query (long lists of aggregates get slow);
- aggregates each alone on its rows: one SELECT over the whole table, each aggregate of
  CASE WHEN its condition (conditions that join the table to itself are kept apart: in a CASE
  they cost more than a query of their own);
- "which group has the most/the top n groups by" over the same key and rows: one GROUP BY with
  every measure, the best groups picked in Python exactly as the form's SQL picks them.
Every answer is cached under the form's own SQL for the life of the open table, and every form
keeps its own SQL for display: fusion changes how an answer is computed, never what it is.
"""

from __future__ import annotations

import threading
import time
from collections import defaultdict

import duckdb
from sqlglot import exp

from . import logic as L
from .answers import Denotation, clean
from .errors import QueryError
from .table import ROW, Table
from .sql import aggregate, any_row, column, on_rows, only_when, render, select, where

QUERY_SECONDS = 5.0
MAX_ROWS = 1000          # rows of one answer kept; more is not an answer anyone reads
FUSE_WIDTH = 32          # aggregates in one fused SELECT
GROUP_FUSE_LIMIT = 10_000   # key columns with more distinct values are grouped form by form


def run(table: Table, form: L.Answer, seconds: float = QUERY_SECONDS) -> Denotation:
    """The answer of one form on the table; failures become an empty answer with the error."""
    sql = render(form)
    cache = _answers(table)
    if sql not in cache:
        cache[sql] = _execute(table, _limited(sql), seconds, form.tabular)
    return cache[sql]


def run_many(table: Table, forms: list[L.Answer], seconds: float = QUERY_SECONDS,
             deadline: float | None = None) -> list[Denotation | None]:
    """The answers of many forms, those that share a scan computed together.

    `deadline` (a time.monotonic() value) stops the work between queries; forms not reached by
    then get None.
    """
    cache = _answers(table)
    todo = [f for f in dict.fromkeys(forms) if render(f) not in cache]
    scalars: dict[str, list[L.Answer]] = defaultdict(list)
    groups: dict[tuple, list[L.Answer]] = defaultdict(list)
    single = []
    for form in todo:
        if isinstance(form, (L.Aggregate, L.YesNo)):
            scalars[render_condition(form.rows)].append(form)
        elif isinstance(form, (L.GroupBest, L.GroupTop)) and _groupable(table, form.key):
            groups[(form.key, render_condition(form.rows))].append(form)
        else:
            single.append(form)
    shared = [forms for forms in scalars.values() if len(forms) > 1]
    alone = [forms[0] for forms in scalars.values() if len(forms) == 1]
    jobs = [(_run_scalars, batch) for batch in _batches(shared)]
    jobs += [(_run_conditional, batch) for batch in _batches(
        [[f for f in alone if _shares_scan(f.rows)]])]
    jobs += [(_run_scalars, [f]) for f in alone if not _shares_scan(f.rows)]
    jobs += [(_run_groups, batch) for batch in groups.values()]
    jobs += [(_run_single, [form]) for form in single]
    order = {form: i for i, form in enumerate(todo)}
    jobs.sort(key=lambda job: min(order[f] for f in job[1]))   # best candidates first
    for fn, batch in jobs:
        if deadline is not None and time.monotonic() >= deadline:
            break
        fn(table, batch, _seconds(seconds, deadline))
    return [cache.get(render(f)) for f in forms]


def _answers(table: Table) -> dict[str, Denotation]:
    return table.cache.setdefault("answers", {})


def _seconds(seconds: float, deadline: float | None) -> float:
    if deadline is None:
        return seconds
    return max(0.05, min(seconds, deadline - time.monotonic()))


def _limited(sql: str) -> str:
    """The query with a LIMIT just past what is kept, so DuckDB can stop early or keep a top-n
    instead of sorting everything (the rows it returns are the first ones all the same)."""
    return f"SELECT * FROM ({sql}) LIMIT {MAX_ROWS}"


# ── the three ways of running ─────────────────────────────────────────────────────────────────
def _run_single(table: Table, forms: list[L.Answer], seconds: float) -> None:
    for form in forms:
        run(table, form, seconds)


def _run_scalars(table: Table, forms: list[L.Aggregate | L.YesNo], seconds: float) -> None:
    """Forms of one value over the same rows: one SELECT with all their expressions."""
    projections = [_scalar(table, f) for f in forms]
    query = select(*projections, where=where(forms[0].rows))
    _store_values(table, forms, query, seconds)


def _run_conditional(table: Table, forms: list[L.Aggregate | L.YesNo], seconds: float) -> None:
    """Forms of one value over different rows: one SELECT over all rows, each aggregate taking
    only the rows of its own condition."""
    projections = [_scalar(table, f, when=where(f.rows)) for f in forms]
    _store_values(table, forms, select(*projections), seconds)


def _store_values(table: Table, forms: list[L.Aggregate | L.YesNo], query: exp.Select,
                  seconds: float) -> None:
    rows = _fetch(table, query.sql(dialect="duckdb", copy=False), seconds)
    if isinstance(rows, Denotation) and len(forms) > 1:
        for form in forms:   # one bad expression spoils the lot: run them alone
            _run_scalars(table, [form], seconds)
        return
    cache = _answers(table)
    for i, form in enumerate(forms):
        cache[render(form)] = rows if isinstance(rows, Denotation) else Denotation(
            (clean(rows[0][i]),))


def _run_groups(table: Table, forms: list[L.GroupBest | L.GroupTop], seconds: float) -> None:
    """Best groups over the same key and rows: one GROUP BY with every measure and the first
    row of each group; each form then picks its groups as its own SQL would."""
    cache = _answers(table)
    if len(forms) == 1:
        return _run_single(table, forms, seconds)
    first = forms[0]
    measures = list(dict.fromkeys((f.fn, f.measure) for f in forms))
    query = select(column(first.key), exp.Min(this=column(ROW)),
                   *(aggregate(fn, col) for fn, col in measures),
                   where=_not_null_where(first.key, first.rows)).group_by(column(first.key))
    rows = _fetch(table, query.sql(dialect="duckdb", copy=False), seconds,
                  keep=GROUP_FUSE_LIMIT + 1)
    if isinstance(rows, Denotation) or len(rows) > GROUP_FUSE_LIMIT:
        return _run_single(table, forms, seconds)
    for form in forms:
        at = 2 + measures.index((form.fn, form.measure))
        groups = [(row[0], row[1], row[at]) for row in rows]
        picked = _best_groups(groups, form.direction) if isinstance(form, L.GroupBest) else (
            _top_groups(groups, form.direction, form.n))
        cache[render(form)] = Denotation(tuple(clean(key) for key in picked))


def _best_groups(groups: list[tuple], direction: str) -> list:
    """HAVING measure = (best measure), in order of each group's first row; NULLs never equal."""
    measured = [g for g in groups if g[2] is not None]
    if not measured:
        return []
    best = (max if direction == "max" else min)(g[2] for g in measured)
    return [key for key, _, _ in sorted((g for g in measured if g[2] == best), key=lambda g: g[1])]


def _top_groups(groups: list[tuple], direction: str, n: int) -> list:
    """ORDER BY measure (DESC for max) NULLS LAST, then first row; LIMIT n."""
    by_row = sorted(groups, key=lambda g: g[1])
    measured = sorted((g for g in by_row if g[2] is not None), key=lambda g: g[2],
                      reverse=direction == "max")   # sorting is stable, reversed or not
    ordered = measured + [g for g in by_row if g[2] is None]
    return [key for key, _, _ in ordered[:n]]


# ── which forms fuse ──────────────────────────────────────────────────────────────────────────
def _scalar(table: Table, form: L.Aggregate | L.YesNo,
            when: exp.Expression | None = None) -> exp.Expression:
    """The one projection of a form that is `SELECT <aggregate> FROM t [WHERE …]`; with `when`,
    of the rows where it holds only.

    COUNT(DISTINCT c) of a column whose values are all different (the profile says so) is
    COUNT(c) on any rows: the same number without a hash set of a million ids."""
    if isinstance(form, L.YesNo):
        return any_row(when)
    if form.fn == "count_distinct" and _unique(table, form.col):
        present = column(form.col)
        return exp.Count(this=present if when is None else only_when(when, present))
    return aggregate(form.fn, form.col, when)


def _shares_scan(rows: L.Rows) -> bool:
    """Whether a condition is cheap inside a CASE: not one that joins the table to itself."""
    return not any(isinstance(r, L.Neighbour) for r in L.walk(rows))


def _unique(table: Table, name: str) -> bool:
    try:
        col = table.column(name)
    except KeyError:
        return False
    return col.distinct > 0 and col.distinct + col.nulls == table.row_count


def render_condition(rows: L.Rows) -> str:
    cond = where(rows)
    return "" if cond is None else cond.sql(dialect="duckdb", copy=False)


def _not_null_where(key: str, rows: L.Rows) -> exp.Expression:
    present = exp.Not(this=exp.Is(this=column(key), expression=exp.Null()))
    cond = where(rows)
    return present if cond is None else exp.and_(cond, present)


def _groupable(table: Table, key: str) -> bool:
    try:
        return table.column(key).distinct <= GROUP_FUSE_LIMIT
    except KeyError:
        return False


def _batches(groups) -> list[list[L.Answer]]:
    out = []
    for forms in groups:
        out += [forms[i:i + FUSE_WIDTH] for i in range(0, len(forms), FUSE_WIDTH)]
    return out


def run_on_rows(table: Table, form: L.Answer, rows: tuple[int, ...],
                seconds: float = QUERY_SECONDS) -> Denotation:
    """The answer of a form on some rows of the table only (listed by ROW), cached by SQL."""
    sql = on_rows(form, rows)
    cache = _answers(table)
    if sql not in cache:
        cache[sql] = _execute(table, sql, seconds, form.tabular)
    return cache[sql]


# ── DuckDB, bounded ───────────────────────────────────────────────────────────────────────────
def _fetch(table: Table, sql: str, seconds: float, keep: int = MAX_ROWS) -> list | Denotation:
    """Rows of a query, or a Denotation carrying the error when it fails or runs too long."""
    timer = threading.Timer(seconds, table.con.interrupt)
    timer.start()
    try:
        rows = table.con.execute(sql).fetchmany(keep)
        # DuckDB 2 holds the rows past `keep` until told, refusing other work on the connection
        # meanwhile (a frame fetched later); 1.x drops them by itself and has no abort()
        finish = getattr(table.con, "abort", None)
        if finish is not None:
            finish()
        return rows
    except (duckdb.InterruptException, KeyboardInterrupt):
        return Denotation((), error=f"the query ran past {seconds:g} s and was stopped")
    except duckdb.Error as err:
        return Denotation((), error=str(err).splitlines()[0][:200])
    finally:
        timer.cancel()


def _execute(table: Table, sql: str, seconds: float, is_table: bool) -> Denotation:
    rows = _fetch(table, sql, seconds)
    if isinstance(rows, Denotation):
        return rows
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
