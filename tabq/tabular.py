"""An answer as a table of named columns: what the output formats (`tabq ask --format`), the data
frames (`Result.to_pandas` …) and the charts are made of.

A reading's answer holds values only; the names come from its logical form (a per-group answer
is its key's header and the measure, a list is the header of the column listed), so they read
as the question's words and not as DuckDB's (`count_star()`).
"""

from __future__ import annotations

from dataclasses import dataclass

from . import logic as L
from .answers import clean
from .execute import MAX_ROWS, run_sql
from .table import Table

MAX_LABEL = 80          # characters of a header used as a column name (a header can be a cell)
FUNCTION_WORDS = {"count": "count", "count_distinct": "distinct", "sum": "sum", "avg": "average",
                  "min": "min", "max": "max", "median": "median"}


@dataclass(frozen=True)
class AnswerTable:
    """An answer's rows under their column names. `complete` is false when the rows are the
    first MAX_ROWS kept while ranking and the query may have more."""

    columns: tuple[str, ...]
    rows: tuple[tuple, ...]
    complete: bool = True

    def records(self) -> list[dict]:
        """One dict a row, keyed by column name (for JSON lines)."""
        return [dict(zip(self.columns, row)) for row in self.rows]


def label(table: Table | None, name: str) -> str:
    """A column's header as people read it, with its typed view: "distance (number)"."""
    if table is None:
        return name
    try:
        col = table.column(name)
    except KeyError:
        return name
    header = col.header if len(col.header) <= MAX_LABEL else col.header[:MAX_LABEL - 1] + "…"
    return header + (f" ({col.view})" if col.view else "")


def column_names(form: L.Answer, table: Table | None) -> tuple[str, ...]:
    """The names of the columns a form answers with, unique, in the answer's order."""
    def named(col: str) -> str:
        return label(table, col)

    if isinstance(form, L.GroupTable):
        names = [named(form.key), _measure(form.fn, form.measure, named)]
    elif isinstance(form, L.PeriodTable):
        names = [form.unit, _measure(form.fn, form.measure, named)]
    elif isinstance(form, (L.Values, L.Distinct, L.TopN, L.WhichOf)):
        names = [named(form.col)]
    elif isinstance(form, (L.GroupBest, L.GroupTop)):
        names = [named(form.key)]
    elif isinstance(form, L.Aggregate):
        names = [_measure(form.fn, form.col, named)]
    elif isinstance(form, L.Share):
        names = [form.unit]
    elif isinstance(form, L.Difference):
        names = ["difference"]
    else:                     # yes/no, and any form added later
        names = ["answer"]
    return _unique(names)


def answer_table(reading, table: Table | None, every: bool = False) -> AnswerTable:
    """A reading's answer as named rows. With `every`, an answer cut at the MAX_ROWS kept while
    ranking is run again whole, so a file or a data frame holds all of it."""
    names = column_names(reading.form, table)
    rows = [tuple(r) if reading.is_table else (r,) for r in reading.answer]
    cut = len(rows) >= MAX_ROWS and not reading.error
    if cut and every and table is not None:
        fetched = run_sql(table, reading.sql, seconds=60.0)
        rows = [tuple(clean(v) for v in (r if reading.is_table else r[:1])) for r in fetched]
        cut = False
    return AnswerTable(names, tuple(rows), complete=not cut)


def _measure(fn: str, col: str | None, named) -> str:
    word = FUNCTION_WORDS.get(fn, fn)
    return word if col is None else f"{word} {named(col)}"


def _unique(names: list[str]) -> tuple[str, ...]:
    """Names made unique by a number ("price", "price 2"): a frame needs distinct columns."""
    seen: dict[str, int] = {}
    out = []
    for name in names:
        seen[name] = seen.get(name, 0) + 1
        out.append(name if seen[name] == 1 else f"{name} {seen[name]}")
    return tuple(out)
