"""structured: Parquet and JSON, formats that carry their own columns."""

from __future__ import annotations

import json
from pathlib import Path

import duckdb

from ..errors import TableFileError
from ..files import decode, shown
from ..table import Con
from .staging import Source, cell_text, insert_rows, staging_names

def read_parquet(con: Con, path: Path, head: bytes,
                  table: str | None) -> Source:
    con.execute("CREATE TABLE _src AS SELECT * FROM read_parquet(?)", [str(path)])
    return Source(staging_names(con), path.stem)


def read_json(con: Con, path: Path, head: bytes, table: str | None) -> Source:
    """JSON lines or an array of objects: DuckDB's reader, Python's json module as a fallback."""
    try:
        con.execute("CREATE TABLE _src AS SELECT * FROM read_json(?)", [str(path)])
        if con.execute("SELECT count(*) FROM _src").fetchone()[0]:
            return Source(staging_names(con), path.stem)
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
