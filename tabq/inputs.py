"""inputs: what the user named, as the files a reader may read — before step 1's checks decide
their format.

A table argument is a file; or "-", standard input; or a folder, or a glob pattern tabq expands
itself, whose files are read as one table. A compressed file (.gz, .zst) is read as the file it
holds. Whatever has to be written on the way (standard input, a decompressed file, a link with a
name DuckDB's readers take literally) goes into one private temporary folder, removed when
loading ends: never beside the user's file.
"""

from __future__ import annotations

import contextlib
import glob
import gzip
import hashlib
import os
import re
import sys
import tempfile
import zlib
from collections.abc import Callable, Iterator
from dataclasses import dataclass, field
from pathlib import Path
from typing import BinaryIO

from .errors import TableFileError
from .files import (COMPRESSIONS, FILE_BUDGET, compression_of, fingerprint, has_glob,
                    is_table_name, kind_of, one_line, read_head, shown, size_text)

# Most bytes tabq writes to its temporary folder for one input (standard input, or what a
# compressed file unpacks to): the memory limit's cap (limits.MEMORY_LIMIT_CAP). A table this
# large as text would not fit in memory anyway, and a gzip bomb stops here.
UNPACK_BUDGET = 4 << 30
MAX_FILES = 1000      # files of a folder or pattern read as one table
STDIN = "-"
# Read by DuckDB, which takes "*?[" in a path as a pattern and cannot be given a name that is
# not UTF-8: such a path is read through a link with a plain name in the temporary folder.
_LINKED_KINDS = ("csv", "parquet", "json", "arrow")
_CHUNK = 1 << 20


@dataclass
class Part:
    """One file to read: `path` is what the reader opens (the user's file, or a private copy or
    link), `shown` how messages name it, `name` what the source-file column says."""

    path: Path
    shown: str
    name: str
    kind: str
    head: bytes
    digest: hashlib._Hash          # sha256 of the user's file (compressed or not)
    title: str                     # "sales" for sales.csv.gz; "stdin"

    @property
    def staged(self) -> bool:
        return self.shown != shown(self.path)

    def unstaged(self, text: str) -> str:
        """A message about the private copy, about the user's file instead."""
        return text.replace(shown(self.path), self.shown).replace(str(self.path), self.shown)


@dataclass
class Given:
    """What the table argument named: its files, in reading order, and how to show it."""

    origin: Path                   # Table.path: the file, folder or pattern ("<stdin>")
    shown: str
    title: str
    several: bool                  # a folder or pattern: one table of all its files
    parts: list[Part] = field(default_factory=list)

    def fingerprint(self) -> hashlib._Hash:
        """A file's own sha256 (as before folders and patterns existed); of several files,
        their names and sha256s in order."""
        if not self.several:
            return self.parts[0].digest.copy()
        digest = hashlib.sha256()
        for part in self.parts:
            digest.update(os.fsencode(part.name) + b"\0" + part.digest.digest())
        return digest


def shown_given(path: str | Path) -> str:
    return "<stdin>" if str(path) == STDIN else shown(Path(path))


@contextlib.contextmanager
def given(path: str | Path, stdin: BinaryIO | None = None) -> Iterator[Given]:
    """The files `path` names, ready to read; the temporary folder lives as long as this."""
    with tempfile.TemporaryDirectory(prefix="tabq-") as tmp:
        yield _resolve(str(path), Path(tmp), stdin)


def _resolve(text: str, tmp: Path, stdin: BinaryIO | None) -> Given:
    if text == STDIN:
        source = _from_stdin(stdin or sys.stdin.buffer, tmp)
        return Given(Path("<stdin>"), "<stdin>", "stdin", False,
                     [_part(source, "<stdin>", "<stdin>", tmp, "s")])
    path = Path(text)
    if path.is_dir():
        files = _folder_files(path)
        return Given(path.absolute(), shown(path), path.absolute().name, True,
                     _parts(files, path, tmp))
    if not os.path.lexists(path) and has_glob(text):
        files = _pattern_files(path)
        return Given(path.absolute(), shown(path), _plain_stem(path), True,
                     _parts(files, None, tmp))
    return Given(path.absolute(), shown(path), _plain_stem(path), False,
                 [_part(path, shown(path), path.name, tmp, "0")])


def _inner(path: Path) -> Path:
    """The name of what a compressed file holds: "sales.csv" for "sales.csv.gz"."""
    if path.suffix.lower() in COMPRESSIONS and path.stem:
        return Path(path.stem)
    return Path(path.name)


def _plain_stem(path: Path) -> str:
    """The title of a one-table file: "sales" for "sales.csv" and "sales.csv.gz"."""
    return _inner(path).stem


def _part(path: Path, name_shown: str, name: str, tmp: Path, slot: str) -> Part:
    """Check one file, unpack or link it when a reader cannot take it as it is, tell its kind,
    and hash it — in that order, so nothing is read whole before it is known to be a table."""
    inner = _inner(path) if path.suffix.lower() in COMPRESSIONS else Path("table")
    read = tmp / slot / ("table" + _safe_suffix(inner))
    try:
        head = read_head(path)
        compression = compression_of(path, head)
        if compression:
            _unpack(path, compression, read)
            head = read_head(read)
            kind = kind_of(inner, head)
        else:
            kind = kind_of(path, head)
            read = _linked(path, read) if kind in _LINKED_KINDS and not _plain(path) else path
        title = "stdin" if name_shown == "<stdin>" else _plain_stem(path)
        return Part(read, name_shown, name, kind, head, fingerprint(path), title)
    except TableFileError as exc:   # about a private file or an inner name: name the user's
        message = str(exc)
        for said in (shown(read), shown(inner), shown(path)):
            if message.startswith(said + ": "):
                message = name_shown + message[len(said):]
                break
        raise TableFileError(message) from None


def _plain(path: Path) -> bool:
    """DuckDB's readers take this path literally: no pattern characters, and UTF-8."""
    text = str(path.absolute())
    try:
        text.encode("utf-8")
    except UnicodeEncodeError:
        return False
    return not has_glob(text) and "{" not in text


def _safe_suffix(path: Path) -> str:
    suffix = path.suffix.lower()
    return suffix if re.fullmatch(r"\.[a-z0-9]{1,10}", suffix) else ""


def _linked(path: Path, link: Path) -> Path:
    """A link to the user's file with a plain name; the readers follow it, nothing is copied."""
    link = link.with_name("table" + _safe_suffix(path))
    link.parent.mkdir(exist_ok=True)
    link.symlink_to(path.absolute())
    return link


def _unpack(path: Path, compression: str, target: Path) -> None:
    """Decompress into `target`, at most UNPACK_BUDGET bytes."""
    target.parent.mkdir(exist_ok=True)
    try:
        with _decompressed(path, compression) as stream:
            _copy_bounded(stream.read, target, shown(path), "decompresses to")
    except TableFileError:
        raise
    except (OSError, EOFError, zlib.error, ValueError) as exc:
        raise TableFileError(f"{shown(path)}: not a readable {compression} file "
                             f"({one_line(exc)})") from None


@contextlib.contextmanager
def _decompressed(path: Path, compression: str) -> Iterator[BinaryIO]:
    with open(path, "rb") as raw:
        if compression == "gzip":
            with gzip.GzipFile(fileobj=raw) as stream:
                yield stream
            return
        with _zstd_reader(path, raw) as stream:
            yield stream


def _zstd_reader(path: Path, raw: BinaryIO):
    """A streaming zstandard decompressor (a declared dependency: imported here, as only .zst
    files need it)."""
    import zstandard
    return zstandard.ZstdDecompressor().stream_reader(raw)


def _copy_bounded(read: Callable[[int], bytes], target: Path, name: str, what: str) -> None:
    """Copy a stream into a new private file (0600), refusing more than UNPACK_BUDGET bytes."""
    total = 0
    fd = os.open(target, os.O_WRONLY | os.O_CREAT | os.O_EXCL, 0o600)
    with os.fdopen(fd, "wb") as out:
        while chunk := read(_CHUNK):
            total += len(chunk)
            if total > UNPACK_BUDGET:
                raise TableFileError(f"{name}: {what} more than {size_text(UNPACK_BUDGET)}, "
                                     "the most tabq unpacks")
            out.write(chunk)


def _from_stdin(stream: BinaryIO, tmp: Path) -> Path:
    """Standard input into a private file: its format is told from its content."""
    target = tmp / "stdin"          # no extension: its kind is told from its content
    try:
        _copy_bounded(stream.read, target, "<stdin>", "holds")
    except OSError as exc:
        raise TableFileError(f"<stdin>: cannot read it ({one_line(exc)})") from None
    return target


def _folder_files(folder: Path) -> list[Path]:
    """The table files of a folder: not hidden, not sub-folders, with a table extension (so a
    README beside the exports is not read as a table)."""
    try:
        entries = list(folder.iterdir())
    except OSError as exc:
        raise TableFileError(f"{shown(folder)}: cannot list it ({exc.strerror or exc})") from None
    files = [p for p in entries if not p.name.startswith(".") and p.is_file()
             and is_table_name(_inner(p))]
    if not files:
        raise TableFileError(f"{shown(folder)}: is a folder with no table files in it")
    return files


def _pattern_files(pattern: Path) -> list[Path]:
    """The files a pattern matches, expanded by Python (never by DuckDB)."""
    matched = [Path(p) for p in glob.glob(str(pattern), recursive=True)]
    files = [p for p in matched if p.is_file()]
    if not files:
        raise TableFileError(f"{shown(pattern)}: no such file, and as a pattern it matches none")
    return files


def _parts(files: list[Path], folder: Path | None, tmp: Path) -> list[Part]:
    if len(files) > MAX_FILES:
        raise TableFileError(f"{shown(files[0].parent)}: {len(files)} files; tabq reads at most "
                             f"{MAX_FILES} as one table")
    base = folder or Path(os.path.commonpath([p.absolute() for p in files]))
    if len(files) == 1 and folder is None:
        base = files[0].absolute().parent
    named = sorted(((os.path.relpath(p.absolute(), base), p) for p in files),
                   key=lambda pair: _natural(pair[0]))
    total = sum(p.stat().st_size for _, p in named)
    if total > FILE_BUDGET:
        raise TableFileError(f"{shown(folder or files[0])}: its files hold "
                             f"{size_text(total)}; tabq reads up to {size_text(FILE_BUDGET)}")
    return [_part(p, shown(p), name, tmp, str(i)) for i, (name, p) in enumerate(named)]


def _natural(name: str) -> list:
    """File-name order as a person reads it: sales_2 before sales_10."""
    return [(0, int(t), t) if t.isdigit() else (1, 0, t.casefold())
            for t in re.split(r"(\d+)", name) if t]


