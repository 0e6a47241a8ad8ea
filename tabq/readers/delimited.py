"""delimited: CSV, TSV and other delimited text — DuckDB's reader and sniffer first, Python's csv
module for what DuckDB rejects."""

from __future__ import annotations

import csv
import io
from pathlib import Path

import duckdb

from .. import values
from ..errors import TableFileError
from ..files import HEAD, decode, is_utf8, shown
from ..table import Con
from .staging import Source, insert_rows, staging_names

def read_csv(con: Con, path: Path, head: bytes, table: str | None) -> Source:
    """DuckDB's reader and sniffer first; Python's csv module for what DuckDB rejects."""
    headers = None
    if is_utf8(head):
        try:
            headers = _duckdb_csv(con, path)
        except duckdb.Error as exc:
            if isinstance(exc, (duckdb.OutOfMemoryException, duckdb.InterruptException)):
                raise
    if headers is None:
        con.execute("DROP TABLE IF EXISTS _src")
        headers = _python_csv(con, path)
    return Source(headers, path.stem)


def _duckdb_csv(con: Con, path: Path) -> list[str] | None:
    """Read with DuckDB; None when its sniffer saw one column in what looks delimited."""
    delim, quote, escape, skip, columns = con.execute(
        "SELECT Delimiter, Quote, Escape, SkipRows, Columns FROM sniff_csv(?, header = true)",
        [str(path)]).fetchone()
    delim, quote, escape = (("" if v == "(empty)" else v) for v in (delim, quote, escape))
    first_line = _first_line(path, skip)
    if len(columns) == 1 and any(d in first_line for d in ",;\t|"):
        return None   # e.g. ragged rows: DuckDB gives up on the delimiter, Python pads them
    options = [str(path), delim, quote, escape, skip]
    read = "read_csv(?, header = true, delim = ?, quote = ?, escape = ?, skip = ?{})"
    try:
        con.execute(f"CREATE TABLE _src AS SELECT * FROM {read.format('')}", options)
    except duckdb.ConversionException:
        # A late cell broke the type guessed from the sample: read all as text, retype in build.
        con.execute(f"CREATE TABLE _src AS SELECT * FROM {read.format(', all_varchar = true')}",
                    options)
    names = staging_names(con)
    header = _header_record(path, delim, quote, escape, skip)
    if header is None:
        header = names
    return (header + [""] * len(names))[: len(names)]


def _first_line(path: Path, skip: int) -> str:
    with path.open(encoding="utf-8-sig", errors="replace", newline="") as f:
        for _ in range(skip):
            f.readline()
        return f.readline(HEAD)


def _header_record(path: Path, delim: str, quote: str, escape: str, skip: int) -> list[str] | None:
    """The header cells as written (DuckDB renames repeated and empty ones), read by Python."""
    if len(delim) != 1 or len(quote) > 1 or len(escape) > 1:
        return None
    with path.open(encoding="utf-8-sig", errors="replace", newline="") as f:
        for _ in range(skip):
            f.readline()
        options: dict = {"delimiter": delim}
        if quote:
            options["quotechar"] = quote
            if escape and escape != quote:
                options.update(escapechar=escape, doublequote=False)
        else:
            options["quoting"] = csv.QUOTE_NONE
        return next(csv.reader(f, **options), None)


def _python_csv(con: Con, path: Path) -> list[str]:
    """Any delimited text: decoded leniently, ragged rows padded or cut to the header's width."""
    text = decode(path.read_bytes())
    if "\0" in text:
        raise TableFileError(f"{shown(path)}: binary content, not CSV text")
    delim = _sniff_delimiter(text[:HEAD], path.suffix.lower())
    csv.field_size_limit(max(csv.field_size_limit(), 1 << 30))
    records = (r for r in csv.reader(io.StringIO(text, newline=""), delimiter=delim)
               if any(cell.strip(values.SPACES) for cell in r))
    header = next(records, None)
    if header is None:
        raise TableFileError(f"{shown(path)}: no header row")
    width = len(header)
    insert_rows(con, width, ((r + [None] * width)[:width] for r in records))
    return header


def _sniff_delimiter(sample: str, suffix: str) -> str:
    if suffix in (".tsv", ".tab"):
        return "\t"
    lines = sample.splitlines()[:50]
    try:
        return csv.Sniffer().sniff("\n".join(lines), delimiters=",;\t|").delimiter
    except csv.Error:
        first = lines[0] if lines else ""
        return max(",;\t|", key=first.count) if any(d in first for d in ",;\t|") else ","
