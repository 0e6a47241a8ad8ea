"""files: step 1 of loading — the file itself, before any reader sees it.

Checks that the path is a readable, non-empty regular file, hashes it (the fingerprint a
confirmation records), and tells its format from its extension checked against its first bytes.
"""

from __future__ import annotations

import codecs
import hashlib
from pathlib import Path

from .errors import TableFileError

HEAD = 1 << 16        # bytes looked at to tell text from binary


def shown(path: Path) -> str:
    """The path as typed, with control characters escaped so a message stays on one line."""
    return "".join(c if c.isprintable() else repr(c)[1:-1] for c in str(path))


def one_line(exc: BaseException) -> str:
    lines = str(exc).strip().splitlines()
    text = lines[0] if lines else type(exc).__name__
    return text if len(text) <= 200 else text[:197] + "..."


def read_head(path: Path) -> tuple[bytes, hashlib._Hash]:
    """The file's first bytes and the sha256 of all of them, streamed."""
    name = shown(path)
    try:
        if path.is_dir():
            raise TableFileError(f"{name}: is a folder, not a table file")
        if not path.exists():
            raise TableFileError(f"{name}: no such file")
        if not path.is_file():
            raise TableFileError(f"{name}: not a regular file")
        if path.stat().st_size == 0:
            raise TableFileError(f"{name}: the file is empty")
        digest = hashlib.sha256()
        with path.open("rb") as f:
            head = f.read(HEAD)
            digest.update(head)
            for chunk in iter(lambda: f.read(1 << 20), b""):
                digest.update(chunk)
        if len(head) < HEAD and not head.strip():
            raise TableFileError(f"{name}: the file holds only blank lines")
    except PermissionError:
        raise TableFileError(f"{name}: no permission to read it") from None
    except OSError as exc:
        raise TableFileError(f"{name}: cannot open it ({exc.strerror or exc})") from None
    return head, digest


_EXTENSIONS = {
    ".csv": "csv", ".tsv": "csv", ".tab": "csv", ".txt": "csv",
    ".parquet": "parquet", ".pq": "parquet",
    ".jsonl": "json", ".ndjson": "json", ".json": "json",
    ".xlsx": "xlsx", ".xlsm": "xlsx",
    ".sqlite": "sqlite", ".sqlite3": "sqlite", ".db": "sqlite",
}


_MAGIC = {b"SQLite format 3\0": "sqlite", b"PAR1": "parquet", b"PK\x03\x04": "xlsx"}


_TEXT_BOMS = (codecs.BOM_UTF16_LE, codecs.BOM_UTF16_BE)


_CONTROL_BYTES = bytes(b for b in range(32) if b not in (9, 10, 12, 13)) + b"\x7f"


def kind_of(path: Path, head: bytes) -> str:
    """The format by extension, checked against the content; by content for other extensions."""
    name = shown(path)
    magic = next((kind for sig, kind in _MAGIC.items() if head.startswith(sig)), None)
    kind = _EXTENSIONS.get(path.suffix.lower())
    if kind is None:
        if magic:
            return magic
        if is_text(head):
            return "csv"
        raise TableFileError(f"{name}: not a kind of table file tabq reads "
                             "(.csv, .tsv, .parquet, .jsonl, .json, .xlsx, .sqlite)")
    if kind in ("csv", "json") and not is_text(head):
        raise TableFileError(f"{name}: binary content, not {kind.upper()} text")
    if kind in ("sqlite", "parquet") and magic != kind:
        what = "SQLite database" if kind == "sqlite" else "Parquet file"
        raise TableFileError(f"{name}: not a {what}")
    if kind == "xlsx" and magic != "xlsx":
        raise TableFileError(f"{name}: not an Excel .xlsx workbook (not a zip archive)")
    return kind


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
