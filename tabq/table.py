"""table: what a loaded table is — the DuckDB relation, the profile of its columns, and how a
question's log record names it. `load` makes these; every later stage only reads them."""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path

import duckdb

ROW = "__row"          # hidden 0-based position of a row in the file


TABLE = "t"            # the DuckDB relation that holds the rows


VALUE_CAP = 5000       # distinct values kept per column for linking question words to cells


Con = duckdb.DuckDBPyConnection


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


def ident(name: str) -> str:
    """A quoted SQL identifier: names come from the file and may hold quotes or keywords."""
    return '"' + name.replace('"', '""') + '"'


def literal(text: str) -> str:
    """A SQL string literal, for this module's own constants only (user values are parameters)."""
    return "'" + text.replace("'", "''") + "'"
