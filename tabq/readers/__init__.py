"""readers: step 2 of loading — one reader per format copies a file's rows, in file order, into
the staging table `_src` and says what their headers are.

DuckDB's own readers serve CSV, Parquet and JSON; Python (csv, openpyxl, sqlite3, json) the rest,
as text. A format that holds several tables also says which ones it has.
"""

from __future__ import annotations

from collections.abc import Callable
from pathlib import Path

from ..table import Con
from .databases import read_sqlite, sqlite_tables
from .delimited import read_csv
from .sheets import read_xlsx, sheet_names
from .staging import Source
from .structured import read_json, read_parquet

Reader = Callable[[Con, Path, bytes, "str | None"], Source]

READERS: dict[str, Reader] = {"csv": read_csv, "parquet": read_parquet, "json": read_json,
                              "xlsx": read_xlsx, "sqlite": read_sqlite}
# formats that hold several tables: how to list them, in the order a reader offers them
LISTERS: dict[str, Callable[[Path], list[str]]] = {"sqlite": sqlite_tables, "xlsx": sheet_names}

__all__ = ["LISTERS", "READERS", "Source"]
