"""structured: Parquet, JSON and Arrow IPC (Feather), formats that carry their own columns.

DuckDB's readers take a path with "*?[" in it as a pattern: `inputs` hands these readers a
plain-named link instead, so the path given here is read literally.
"""

from __future__ import annotations

import json
from pathlib import Path

import duckdb

from ..errors import TableFileError
from ..files import decode, shown
from ..limits import memory_limit
from ..table import Con, ReadChoices
from .staging import Source, cell_text, flatten_objects, insert_rows, staging_names


def read_parquet(con: Con, path: Path, head: bytes, table: str | None,
                 choices: ReadChoices | None = None) -> Source:
    con.execute("CREATE TABLE _src AS SELECT * FROM read_parquet(?)", [str(path)])
    return Source(flatten_objects(con, staging_names(con)), path.stem)


def read_json(con: Con, path: Path, head: bytes, table: str | None,
              choices: ReadChoices | None = None) -> Source:
    """JSON lines or an array of objects: DuckDB's reader, Python's json module as a fallback."""
    try:
        con.execute("CREATE TABLE _src AS SELECT * FROM read_json(?)", [str(path)])
        if con.execute("SELECT count(*) FROM _src").fetchone()[0]:
            return Source(flatten_objects(con, staging_names(con)), path.stem)
    except duckdb.Error as exc:
        if isinstance(exc, (duckdb.OutOfMemoryException, duckdb.InterruptException)):
            raise
    con.execute("DROP TABLE IF EXISTS _src")
    records = _json_records(path)
    keys = list(dict.fromkeys(k for r in records for k in r))
    if not keys:
        raise TableFileError(f"{shown(path)}: no JSON objects with fields")
    insert_rows(con, len(keys), ([cell_text(r.get(k)) for k in keys] for r in records))
    return Source(keys, path.stem)


def _json_records(path: Path) -> list[dict]:
    text = decode(path.read_bytes())
    try:
        data = json.loads(text)
        records = data if isinstance(data, list) else [data]
    except json.JSONDecodeError:
        try:
            records = [json.loads(line) for line in text.splitlines() if line.strip()]
        except json.JSONDecodeError as exc:
            raise TableFileError(f"{shown(path)}: not JSON lines or a JSON array ({exc})") from None
    if not all(isinstance(r, dict) for r in records):
        raise TableFileError(f"{shown(path)}: JSON rows must be objects")
    return records


def read_arrow(con: Con, path: Path, head: bytes, table: str | None,
               choices: ReadChoices | None = None) -> Source:
    """An Arrow IPC file (Feather v2) or a Feather v1 file, through pyarrow when it is
    installed: DuckDB reads Arrow IPC files only through an extension it would download."""
    try:
        from pyarrow import feather
    except ImportError:
        raise TableFileError(f"{shown(path)}: reading Arrow/Feather files needs pyarrow "
                             "(pip install pyarrow)") from None
    size, limit = path.stat().st_size, memory_limit()
    if size > limit:   # read outside DuckDB's memory limit: refuse what could not fit anyway
        raise TableFileError(f"{shown(path)}: too large to load "
                             f"(memory limit {limit >> 20} MB)")
    arrow_table = feather.read_table(str(path), memory_map=True)   # not copied: mapped
    con.register("_arrow", arrow_table)
    try:
        con.execute("CREATE TABLE _src AS SELECT * FROM _arrow")
    finally:
        con.unregister("_arrow")
    return Source(staging_names(con), path.stem)
