"""staging: what every reader shares — the staging table `_src` its rows go into, in file order,
and the `Source` it returns beside them."""

from __future__ import annotations

import csv
import json
import tempfile
from collections.abc import Iterable
from dataclasses import dataclass, field
from pathlib import Path

from ..errors import UnknownTableError
from ..table import Con, ReadReport, ident

CHUNK = 50_000        # rows per insert from the Python readers
# Longest staged line DuckDB accepts. DuckDB 1.x asks for 16 times this in one block: 4 MiB keeps
# that within tabq's smallest memory limit (256 MiB) on every DuckDB it allows (docs/packaging.md)
LINE_MAX = 1 << 22


@dataclass
class Source:
    """What a reader leaves besides the staging table: headers in file order, a title, and its
    part of the report on how the file was read."""

    headers: list[str]
    title: str
    table: str | None = None       # the chosen SQLite table or sheet, part of the fingerprint
    report: ReadReport = field(default_factory=ReadReport)


def insert_rows(con: Con, width: int, rows: Iterable[list]) -> None:
    """Rows from a Python reader into `_src` as text, in order. They pass through a CSV file in
    a temporary folder, written by the csv module and read by DuckDB: both are C code, many
    times faster than handing DuckDB Python lists cell by cell. Rows must have `width` cells;
    cells are text, numbers, booleans, dates or None, and build types the columns later."""
    columns = {f"c{i}": "VARCHAR" for i in range(width)}
    with tempfile.TemporaryDirectory(prefix="tabq-") as tmp:
        staged = Path(tmp) / "rows.csv"
        with staged.open("w", encoding="utf-8", errors="replace", newline="") as f:
            csv.writer(f, lineterminator="\n").writerows(rows)
        con.execute("CREATE TABLE _src AS SELECT * FROM read_csv(?, columns = ?, header = false, "
                    "auto_detect = false, delim = ',', quote = '\"', escape = '\"', "
                    "new_line = '\\n', max_line_size = ?)", [str(staged), columns, LINE_MAX])


def staging_names(con: Con) -> list[str]:
    """The column names DuckDB's reader gave `_src`. A column called "rowid" is renamed, as it
    would hide the rowid that carries the file order."""
    names = [row[0] for row in con.execute("DESCRIBE _src").fetchall()]
    for i, name in enumerate(names):
        if name.casefold() == "rowid":
            con.execute(f"ALTER TABLE _src RENAME COLUMN {ident(name)} TO {ident(f'_rowid{i}')}")
    return names


def choose(names: list[str], wanted: str, where: str, what: str) -> str:
    """The table or sheet called `wanted`, matched exactly or else ignoring case."""
    if wanted in names:
        return wanted
    folded = [n for n in names if n.casefold() == wanted.casefold()]
    if len(folded) == 1:
        return folded[0]
    raise UnknownTableError(f"{where}: no {what} named {wanted!r}; it has: {listing(names)}")


def listing(names: list[str], cap: int = 20) -> str:
    if not names:
        return "none"
    more = f" and {len(names) - cap} more" if len(names) > cap else ""
    return ", ".join(repr(n) for n in names[:cap]) + more


def cell_text(value: object) -> str | None:
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


FLATTEN_MAX = 1_000   # most columns nested objects may unfold into; beyond, they stay JSON text


def flatten_objects(con: Con, headers: list[str]) -> list[str]:
    """Nested objects (STRUCT columns, as JSON and Parquet give them) unfolded into a column per
    field, named by their path: {"customer": {"city": …}} gives the column "customer city".
    Lists stay one column, as their JSON text. The headers of the new `_src`."""
    relation = con.table("_src")
    fields = [leaf for name, kind in zip(relation.columns, relation.dtypes, strict=True)
              for leaf in _leaves([name], kind)]
    if len(fields) == len(relation.columns) or len(fields) > FLATTEN_MAX:
        return headers
    top = dict(zip(relation.columns, headers, strict=True))
    selects = [".".join(ident(p) for p in path) + f" AS {ident(f'c{i}')}"
               for i, path in enumerate(fields)]
    con.execute(f"CREATE TABLE _flat AS SELECT {', '.join(selects)} FROM _src ORDER BY rowid")
    con.execute("DROP TABLE _src")
    con.execute("ALTER TABLE _flat RENAME TO _src")
    return [" ".join([top[path[0]], *path[1:]]) for path in fields]


def _leaves(path: list[str], kind) -> list[list[str]]:
    if kind.id != "struct" or not kind.children:
        return [path]
    return [leaf for name, child in kind.children for leaf in _leaves(path + [name], child)]
