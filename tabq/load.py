"""load: a table file in, a DuckDB table plus a profile of its columns out.

The user's file is only ever read. Rows keep their file order in the hidden column ROW (0-based),
so that "first", "last", "next" and "previous" mean what they mean in the file.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path

import duckdb

ROW = "__row"          # hidden 0-based position of a row in the file
TABLE = "t"            # the DuckDB relation that holds the rows
VALUE_CAP = 5000       # distinct values kept per column for linking question words to cells


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

    def column(self, name: str) -> Column:
        for col in self.columns:
            if col.name == name:
                return col
        raise KeyError(name)


def load_table(path: str | Path, table: str | None = None) -> Table:
    """Read a CSV/TSV, Parquet, JSON-lines, Excel or SQLite file into an in-memory DuckDB table."""
    raise NotImplementedError
