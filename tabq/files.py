"""files: step 1 of loading — the file itself, before any reader sees it.

Checks that the path is a readable, non-empty regular file of a size tabq can hold, tells its
format from its extension checked against its first bytes, and only then hashes it (the
fingerprint a confirmation records): a FIFO, a device or a huge sparse file is refused before
anything reads it whole.
"""

from __future__ import annotations

import codecs
import contextlib
import hashlib
import os
import stat
from collections.abc import Iterator
from pathlib import Path
from typing import BinaryIO

from .errors import TableFileError

HEAD = 1 << 16        # bytes looked at to tell text from binary
# Largest file tabq reads: four times the memory limit's cap (limits.MEMORY_LIMIT_CAP, 4 GiB), so
# any table that could fit in memory passes, and a 50 GB (perhaps sparse) file is refused before
# it is hashed or copied.
FILE_BUDGET = 16 << 30
GLOB_CHARS = "*?["    # what makes a path a pattern, to Python's glob and to DuckDB's readers


def shown(path: Path) -> str:
    """The path as typed, with control characters escaped so a message stays on one line."""
    return "".join(c if c.isprintable() else repr(c)[1:-1] for c in str(path))


def one_line(exc: BaseException) -> str:
    lines = str(exc).strip().splitlines()
    text = lines[0] if lines else type(exc).__name__
    return text if len(text) <= 200 else text[:197] + "..."


def check_file(path: Path, budget: int = FILE_BUDGET) -> os.stat_result:
    """The file's status, once it is known to be a non-empty regular file within the budget.
    Only `stat` is called: opening a FIFO would wait for a writer."""
    name = shown(path)
    try:
        status = path.stat()
    except FileNotFoundError:
        raise TableFileError(f"{name}: no such file") from None
    except PermissionError:
        raise TableFileError(f"{name}: no permission to read it") from None
    except OSError as exc:
        raise TableFileError(f"{name}: cannot open it ({exc.strerror or exc})") from None
    if stat.S_ISDIR(status.st_mode):
        raise TableFileError(f"{name}: is a folder, not a table file")
    if not stat.S_ISREG(status.st_mode):
        raise TableFileError(f"{name}: not a regular file (a pipe, device or socket)")
    if status.st_size == 0:
        raise TableFileError(f"{name}: the file is empty")
    if status.st_size > budget:
        raise TableFileError(f"{name}: too large to read ({size_text(status.st_size)}; "
                             f"tabq reads files up to {size_text(budget)})")
    return status


def size_text(size: int) -> str:
    return f"{size / (1 << 30):.1f} GB" if size >= 1 << 30 else f"{size / (1 << 20):.1f} MB"


def read_head(path: Path) -> bytes:
    """The first bytes of a checked regular file (see `check_file`)."""
    check_file(path)
    with _opened(path) as f:
        head = f.read(HEAD)
    if len(head) < HEAD and not head.strip():
        raise TableFileError(f"{shown(path)}: the file holds only blank lines")
    return head


def fingerprint(path: Path, budget: int = FILE_BUDGET) -> hashlib._Hash:
    """The sha256 of the file, streamed; a file that grows past the budget is refused."""
    digest, total = hashlib.sha256(), 0
    with _opened(path) as f:
        for chunk in iter(lambda: f.read(1 << 20), b""):
            total += len(chunk)
            if total > budget:
                raise TableFileError(f"{shown(path)}: grew past {size_text(budget)} "
                                     "while being read")
            digest.update(chunk)
    return digest


@contextlib.contextmanager
def _opened(path: Path) -> Iterator[BinaryIO]:
    """The file opened without blocking (a path swapped for a FIFO after `check_file` does not
    hang us), checked again to be a regular file; OSErrors become one line."""
    name = shown(path)
    try:
        fd = os.open(path, os.O_RDONLY | getattr(os, "O_NONBLOCK", 0))
    except PermissionError:
        raise TableFileError(f"{name}: no permission to read it") from None
    except OSError as exc:
        raise TableFileError(f"{name}: cannot open it ({exc.strerror or exc})") from None
    with os.fdopen(fd, "rb") as f:
        if not stat.S_ISREG(os.fstat(fd).st_mode):
            raise TableFileError(f"{name}: not a regular file (a pipe, device or socket)")
        yield f


def has_glob(text: str) -> bool:
    return any(c in text for c in GLOB_CHARS)


_EXTENSIONS = {
    ".csv": "csv", ".tsv": "csv", ".tab": "csv", ".txt": "csv",
    ".parquet": "parquet", ".pq": "parquet",
    ".jsonl": "json", ".ndjson": "json", ".json": "json",
    ".xlsx": "xlsx", ".xlsm": "xlsx", ".ods": "ods", ".xlsb": "xlsb", ".xls": "xls",
    ".sqlite": "sqlite", ".sqlite3": "sqlite", ".db": "sqlite",
    ".duckdb": "duckdb", ".ddb": "duckdb",
    ".arrow": "arrow", ".feather": "arrow", ".ipc": "arrow",
}

# A compressed file is read as the file it holds: "sales.csv.gz" is a CSV.
COMPRESSIONS = {".gz": "gzip", ".zst": "zstd"}
_COMPRESSED_MAGIC = {b"\x1f\x8b": "gzip", b"\x28\xb5\x2f\xfd": "zstd"}


# A zip is a workbook (.xlsx, .ods or .xlsb: the sheets reader tells which from its members);
# OLE2, the container of .xls, is told by its own signature.
_MAGIC = {b"SQLite format 3\0": "sqlite", b"PAR1": "parquet", b"PK\x03\x04": "xlsx",
          b"ARROW1": "arrow", b"FEA1": "arrow", b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1": "xls"}
_ZIPPED = ("xlsx", "ods", "xlsb")


_TEXT_BOMS = (codecs.BOM_UTF16_LE, codecs.BOM_UTF16_BE)


_CONTROL_BYTES = bytes(b for b in range(32) if b not in (9, 10, 12, 13)) + b"\x7f"


def kind_of(path: Path, head: bytes) -> str:
    """The format by extension, checked against the content; by content for other extensions."""
    name = shown(path)
    magic = magic_kind(head)
    kind = _EXTENSIONS.get(path.suffix.lower())
    if kind is None:
        if magic:
            return magic
        if is_text(head):
            return "json" if _looks_json(head) else "csv"
        raise TableFileError(f"{name}: not a kind of table file tabq reads (.csv, .tsv, "
                             ".parquet, .jsonl, .json, .xlsx, .xls, .ods, .sqlite, .duckdb, "
                             ".arrow, "
                             "or one of these .gz or .zst)")
    if kind in ("csv", "json") and not is_text(head):
        raise TableFileError(f"{name}: binary content, not {kind.upper()} text")
    if kind in _BINARY and magic != kind:
        raise TableFileError(f"{name}: not {_BINARY[kind]}")
    if kind in _ZIPPED and magic != "xlsx":
        raise TableFileError(f"{name}: not a {path.suffix.lower()} workbook (not a zip archive)")
    return kind


def is_table_name(path: Path) -> bool:
    """Whether the extension is one of a table file tabq reads (compression aside)."""
    return path.suffix.lower() in _EXTENSIONS


_BINARY = {"sqlite": "a SQLite database", "parquet": "a Parquet file",
           "duckdb": "a DuckDB database", "arrow": "an Arrow IPC (Feather) file",
           "xls": "an Excel 97-2003 .xls workbook"}


def magic_kind(head: bytes) -> str | None:
    """The format the first bytes announce, if any. A DuckDB file says DUCK at offset 8."""
    if head[8:12] == b"DUCK":
        return "duckdb"
    return next((kind for sig, kind in _MAGIC.items() if head.startswith(sig)), None)


def compression_of(path: Path, head: bytes) -> str | None:
    """"gzip" or "zstd" when the file is compressed: by its last extension, which its first
    bytes must confirm; by those bytes alone when the name says nothing (standard input)."""
    magic = next((kind for sig, kind in _COMPRESSED_MAGIC.items() if head.startswith(sig)), None)
    named = COMPRESSIONS.get(path.suffix.lower())
    if named is not None and magic != named:
        raise TableFileError(f"{shown(path)}: not {named}-compressed, as its name says")
    if named is None and (path.suffix.lower() in _EXTENSIONS or magic_kind(head)):
        return None
    return magic


def _looks_json(head: bytes) -> bool:
    """JSON lines or an array of objects: "{", or "[" then "{", at the start."""
    text = head.lstrip(b"\xef\xbb\xbf \t\r\n")
    return text.startswith(b"{") or (text.startswith(b"[") and
                                     text[1:].lstrip(b" \t\r\n").startswith((b"{", b"]")))


def is_text(head: bytes) -> bool:
    """Text has no NUL bytes and next to no control characters; random bytes have plenty."""
    if head.startswith(_TEXT_BOMS):
        return True
    if b"\0" in head:
        return False
    controls = sum(head.count(bytes([b])) for b in _CONTROL_BYTES)
    return controls <= len(head) // 200


def is_utf8(head: bytes) -> bool:
    try:
        codecs.getincrementaldecoder("utf-8")().decode(head, final=False)
    except UnicodeDecodeError:
        return False
    return not head.startswith(_TEXT_BOMS)


def decode(data: bytes) -> str:
    """UTF-8 or UTF-16/32 with a byte-order mark; else Windows-1252, else Latin-1 (never fails)."""
    for bom, encoding in ((codecs.BOM_UTF32_LE, "utf-32"), (codecs.BOM_UTF32_BE, "utf-32"),
                          (codecs.BOM_UTF8, "utf-8-sig"), (codecs.BOM_UTF16_LE, "utf-16"),
                          (codecs.BOM_UTF16_BE, "utf-16")):
        if data.startswith(bom):
            return data.decode(encoding, errors="replace")
    for encoding in ("utf-8", "cp1252"):
        try:
            return data.decode(encoding)
        except UnicodeDecodeError:
            pass
    return data.decode("latin-1")
