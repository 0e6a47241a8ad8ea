"""readers: step 2 of loading — one reader per format copies a file's rows, in file order, into
the staging table `_src` and says what their headers are.

DuckDB's own readers serve CSV, Parquet, JSON and DuckDB files; Python (csv, calamine, sqlite3,
json, pyarrow) the rest. Several files of a folder or pattern are read one by one into one table
by `several`. A format that holds several tables also says which ones it has.
"""

from __future__ import annotations

from collections.abc import Callable
from pathlib import Path

from ..table import Con, ReadChoices
from .databases import duckdb_tables, read_duckdb, read_sqlite, sqlite_tables
from .delimited import read_csv
from .sheets import read_xlsx, sheet_names
from .staging import Source
from .structured import read_arrow, read_json, read_parquet

Reader = Callable[[Con, Path, bytes, str | None, ReadChoices | None], Source]

READERS: dict[str, Reader] = {"csv": read_csv, "parquet": read_parquet, "json": read_json,
                              "xlsx": read_xlsx, "sqlite": read_sqlite, "duckdb": read_duckdb,
                              "arrow": read_arrow}
# formats that hold several tables: how to list them, in the order a reader offers them
LISTERS: dict[str, Callable[[Path], list[str]]] = {"sqlite": sqlite_tables, "xlsx": sheet_names,
                                                   "duckdb": duckdb_tables}
# every workbook is read by calamine, which tells the format from the content
for _kind in ("xls", "ods", "xlsb"):
    READERS[_kind], LISTERS[_kind] = read_xlsx, sheet_names

__all__ = ["LISTERS", "READERS", "Source"]
