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
class ReadChoices:
    """Reading choices a person made because tabq's own guess was wrong; None = let tabq decide.
    A confirmation keeps them, so what was taught is asked again of the table as it was read."""

    header_line: int | None = None    # 1-based line (or sheet row) of the header
    decimal_mark: str | None = None   # "." or ","
    encoding: str | None = None       # a Python codec name, for text files

    def as_dict(self) -> dict:
        return {k: v for k, v in vars(self).items() if v is not None}

    @classmethod
    def of(cls, data: dict | None) -> ReadChoices | None:
        """From `as_dict`'s form; None for no choices."""
        known = {k: data[k] for k in ("header_line", "decimal_mark", "encoding")
                 if isinstance(data, dict) and data.get(k) is not None}
        return cls(**known) if known else None


@dataclass(frozen=True)
class Skipped:
    """Rows of the file that are not rows of TABLE, and why: so the reader can check them."""

    why: str                       # "preamble", "blank", "ragged", "total", "subtotal", ...
    rows: int                      # how many
    lines: tuple[int, ...] = ()    # the first few, as 1-based lines (text) or rows (sheets)


@dataclass(frozen=True)
class ColumnRead:
    """How one column's cells were read: its kind and what share of its real cells parsed."""

    header: str
    name: str
    kind: str                      # as Column.kind
    parsed: float = 1.0            # share of non-missing cells read as `kind` (1.0 when typed)
    how: str = ""                  # a reading choice worth showing: "decimal comma", "day first"


@dataclass
class ReadReport:
    """How a file became TABLE. Each step of loading adds what it decided; `notes` says in plain
    words whatever was skipped, excluded or guessed, for the one-line note under an answer."""

    format: str = ""               # "csv", "xlsx", "sqlite", ...
    encoding: str | None = None    # text formats: the encoding the bytes were decoded with
    delimiter: str | None = None
    decimal_mark: str | None = None   # "." or "," when numbers were read from text
    header_line: int | None = None    # 1-based line (or sheet row) the header was taken from
    sources: tuple[str, ...] = ()     # several files read as one table: their names
    skipped: list[Skipped] = field(default_factory=list)
    columns: list[ColumnRead] = field(default_factory=list)
    guesses: list[str] = field(default_factory=list)   # choices that could be wrong, in words

    def skip(self, why: str, lines: list[int]) -> None:
        """Record rows left out of TABLE (a no-op for none)."""
        if lines:
            self.skipped.append(Skipped(why, len(lines), tuple(lines[:5])))

    def notes(self) -> list[str]:
        """Plain sentences for whatever a reader should know before trusting an answer."""
        said = [f"{s.rows} {s.why} row{'s' if s.rows != 1 else ''} left out"
                + (f" (line{'s' if s.rows != 1 else ''} "
                   f"{', '.join(map(str, s.lines))}{', ...' if s.rows > len(s.lines) else ''})"
                   if s.lines else "") for s in self.skipped]
        return said + list(self.guesses)


@dataclass(frozen=True)
class TableRef:
    """Which table a question was about: the file, the table or sheet in it, its content."""

    path: str
    name: str | None               # a SQLite table or a sheet; None for one-table formats
    fingerprint: str | None        # sha256 of the file (and the name), None when unknown
    reading: ReadChoices | None = None   # reading choices the table was loaded with


@dataclass
class Table:
    """A loaded table: DuckDB connection holding relation TABLE, and the profile of its columns."""

    con: duckdb.DuckDBPyConnection
    columns: tuple[Column, ...]
    row_count: int
    path: Path
    title: str                     # file stem, or the SQLite table name
    fingerprint: str               # stable id of the content, for the model's log
    cache: dict = field(default_factory=dict)   # answers by SQL, for the life of the table
    name: str | None = None        # the SQLite table or sheet read; None for one-table formats
    report: ReadReport | None = None   # how the file was read (None for tables made in memory)
    reading: ReadChoices | None = None   # choices the person made for reading it

    @property
    def reference(self) -> TableRef:
        """What a confirmation records so that it can be asked of this same table again."""
        return TableRef(str(self.path), self.name, self.fingerprint, self.reading)

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
