"""several: the files of a folder or a pattern as one table — each read by its own format's
reader, in file-name order, its rows in file order, with the file's name as an extra column.

Files whose columns differ are refused, naming the first that differs, rather than joined by
name: a column missing from one export is more often a sign that the files are not the same
table than a gap to fill with empty cells.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from typing import Protocol

from ..errors import TableFileError
from ..table import Con, ReadReport, ident
from .staging import Source, listing, staging_names

SOURCE_HEADER = "source file"      # the extra column's header; its name becomes source_file


class Part(Protocol):
    shown: str
    name: str
    kind: str


ReadOne = Callable[[Con, "Part", "str | None"], Source]


def read_several(con: Con, parts: Sequence[Part], table: str | None, read_one: ReadOne,
                 title: str) -> Source:
    """Every part into `_src`, one after another, each row followed by its file's name."""
    first: Source | None = None
    report = ReadReport()
    for part in parts:
        source = read_one(con, part, table)
        staging_names(con)                     # a column called rowid is renamed first
        con.execute("ALTER TABLE _src RENAME TO _part")
        if first is None:
            first = source
            _start(con)
        else:
            _check_fits(part, source, parts[0], first)
            _widen(con)
        _append(con, part.name)
        con.execute("DROP TABLE _part")
        report.guesses.extend(f"{part.name}: {note}" for note in source.report.notes())
    assert first is not None
    con.execute("ALTER TABLE _all RENAME TO _src")
    for kept in ("encoding", "delimiter", "decimal_mark", "header_line"):
        setattr(report, kept, getattr(first.report, kept))    # as the first file was read
    report.sources = tuple(p.name for p in parts)
    report.guesses.insert(0, _joined(report.sources))
    report.format = "+".join(dict.fromkeys(p.kind for p in parts))
    return Source(first.headers + [SOURCE_HEADER], title, first.table, report)


def _joined(names: tuple[str, ...]) -> str:
    """The note that says several files were read as one: a reader should know it."""
    if len(names) == 1:
        return f"1 file read from the folder or pattern ({names[0]}), with a column " \
            f"{SOURCE_HEADER!r}"
    which = f"{names[0]}, {names[1]}" if len(names) == 2 else f"{names[0]} … {names[-1]}"
    return f"{len(names)} files read as one table ({which}), in file-name order; the column " \
        f"{SOURCE_HEADER!r} names each row's file"


def _columns(con: Con, table: str) -> list[tuple[str, str]]:
    return [(row[0], row[1]) for row in con.execute(f"DESCRIBE {table}").fetchall()]


def _start(con: Con) -> None:
    """The combined table: the first file's columns and types, then the file name, empty."""
    names = [name for name, _ in _columns(con, "_part")]
    columns = ", ".join(ident(n) for n in names)
    con.execute(f"CREATE TABLE _all AS SELECT {columns}, CAST(NULL AS VARCHAR) AS "
                f"{ident(_source_name(names))} FROM _part LIMIT 0")


def _source_name(names: list[str]) -> str:
    """A staging name for the file-name column that no column of the files has."""
    name, n = "source_file", 2
    while name in names:
        name, n = f"source_file_{n}", n + 1
    return name


def _check_fits(part: Part, source: Source, first_part: Part, first: Source) -> None:
    if [_norm(h) for h in source.headers] != [_norm(h) for h in first.headers]:
        raise TableFileError(f"{part.shown}: its columns ({listing(source.headers, 8)}) differ "
                             f"from those of {first_part.shown} ({listing(first.headers, 8)}); "
                             "the files of a folder or pattern must have the same columns")


def _norm(header: str | None) -> str:
    return " ".join((header or "").split()).casefold()


def _widen(con: Con) -> None:
    """A column typed differently in two files is kept as text; retyping reads it again."""
    combined = _columns(con, "_all")[:-1]
    for (name, had), (_, has) in zip(combined, _columns(con, "_part")):
        if had != has and had != "VARCHAR":
            con.execute(f"ALTER TABLE _all ALTER {ident(name)} TYPE VARCHAR")


def _append(con: Con, file_name: str) -> None:
    """This file's rows after the earlier files', in file order (rowid is file order)."""
    targets = _columns(con, "_all")[:-1]
    cells = ", ".join(f"CAST({ident(name)} AS {kind})"
                      for (name, _), (_, kind) in zip(_columns(con, "_part"), targets))
    con.execute(f"INSERT INTO _all SELECT {cells}, ? FROM _part ORDER BY rowid", [file_name])
