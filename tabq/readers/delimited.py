"""delimited: CSV, TSV and other delimited text, as analysts receive it.

Before any rows are read, a sample of the file decides what the file itself does not say: its
encoding (a detector for text that is not UTF-8; a private UTF-8 copy is read instead), its
delimiter, which line is the header (title and note lines above it are a report's preamble), and
its decimal mark. DuckDB's reader then reads the rows with those choices; Python's csv module
reads what DuckDB rejects (ragged rows), padding short rows and reporting long ones. Every choice
goes into the report, so that an answer can say how its table was read.
"""

from __future__ import annotations

import codecs
import contextlib
import csv
import io
import math
import tempfile
from collections import Counter
from collections.abc import Iterator
from dataclasses import dataclass, field
from pathlib import Path

import duckdb

from .. import values
from ..errors import InputError, TableFileError
from ..files import shown
from ..limits import too_wide
from ..table import Con, ReadChoices, ReadReport
from .staging import LINE_MAX, Source, insert_rows, staging_names

SAMPLE_BYTES = 1 << 20   # bytes looked at to choose encoding, delimiter, header and decimal mark
SAMPLE_RECORDS = 500     # records of the sample used for the layout
PREAMBLE_MAX = 30        # most records above a header taken for a report's title and notes
DELIMITERS = ",;\t|"
# Encodings a detector's ties are settled in favour of, most common in office exports first.
_USUAL = ("cp1252", "cp1251", "cp1250", "latin_1")
_BOMS = ((codecs.BOM_UTF32_LE, "utf-32"), (codecs.BOM_UTF32_BE, "utf-32"),
         (codecs.BOM_UTF8, "utf-8-sig"), (codecs.BOM_UTF16_LE, "utf-16"),
         (codecs.BOM_UTF16_BE, "utf-16"))


def read_csv(con: Con, path: Path, head: bytes, table: str | None,
             choices: ReadChoices | None = None) -> Source:
    """The rows of a delimited text file, read the way its own sample says it is written."""
    csv.field_size_limit(LINE_MAX)   # a longer cell could not be staged: refused while read
    report, choices = ReadReport(), choices or ReadChoices()
    encoding = _codec(choices.encoding) if choices.encoding else text_encoding(_sample_bytes(path))
    with _utf8(path, encoding) as readable:
        layout = _layout(_sample_text(readable), path.suffix.lower(), choices.header_line)
        if choices.decimal_mark:
            layout.decimal = choices.decimal_mark
        if reason := too_wide(layout.width):
            raise TableFileError(f"{shown(path)}: {reason}")
        _note_layout(report, encoding, layout)
        headers = None
        try:
            headers = _duckdb_csv(con, readable, layout, report)
        except duckdb.Error as exc:
            if isinstance(exc, (duckdb.OutOfMemoryException, duckdb.InterruptException)):
                raise
        if headers is None:
            con.execute("DROP TABLE IF EXISTS _src")
            headers = _python_csv(con, readable, layout, report)
    return Source(headers, path.stem, report=report)


# ---------------------------------------------------------------- encoding


def text_encoding(sample: bytes) -> str:
    """The Python codec for text that starts with `sample`: from its byte-order mark, UTF-8 when
    it decodes as such, else the detector's choice (ties going to the usual office encodings)."""
    for bom, encoding in _BOMS:
        if sample.startswith(bom):
            return encoding
    try:
        codecs.getincrementaldecoder("utf-8")().decode(sample, final=False)
        return "utf-8"
    except UnicodeDecodeError:
        pass
    import charset_normalizer  # imported here: only text that is not UTF-8 needs it
    matches = list(charset_normalizer.from_bytes(sample))
    if not matches:
        return "cp1252"
    calm = min(m.chaos for m in matches)
    usual = [m.encoding for m in matches if m.chaos <= calm and m.encoding in _USUAL]
    return min(usual, key=_USUAL.index) if usual else matches[0].encoding


def _codec(name: str) -> str:
    """The codec a person named, checked: an unknown name is one clean line."""
    try:
        return codecs.lookup(name).name
    except LookupError:
        raise InputError(f"unknown encoding {name!r} (try utf-8, cp1252, cp1251, latin-1)") \
            from None


def _sample_bytes(path: Path) -> bytes:
    with path.open("rb") as f:
        return f.read(SAMPLE_BYTES)


@contextlib.contextmanager
def _utf8(path: Path, encoding: str) -> Iterator[Path]:
    """The file itself if it is UTF-8, else a UTF-8 copy in a private temporary folder."""
    if encoding in ("utf-8", "utf-8-sig"):
        yield path
        return
    with tempfile.TemporaryDirectory(prefix="tabq-") as tmp:
        copy = Path(tmp) / "table.csv"
        with path.open(encoding=encoding, errors="replace", newline="") as src, \
                copy.open("w", encoding="utf-8", newline="") as dst:
            for chunk in iter(lambda: src.read(1 << 20), ""):
                dst.write(chunk)
        yield copy


def _sample_text(path: Path) -> str:
    with path.open(encoding="utf-8-sig", errors="replace", newline="") as f:
        text = f.read(SAMPLE_BYTES)
    if "\0" in text:
        raise TableFileError(f"{shown(path)}: binary content, not CSV text")
    return text


# ---------------------------------------------------------------- layout


@dataclass
class _Layout:
    """What the sample says: delimiter, the header record's line, the lines above it, its width
    and the decimal mark its numbers use."""

    delimiter: str
    header_line: int = 0            # 0-based physical line where the header record starts
    width: int = 1
    preamble: list[int] = field(default_factory=list)   # 1-based lines of title and notes
    decimal: str | None = None


def _layout(sample: str, suffix: str, header_line: int | None = None) -> _Layout:
    """The sample's layout; `header_line` (1-based), when a person chose it, is the header."""
    delimiter = _delimiter(sample, suffix)
    records = _records(sample, delimiter)
    if not records:
        return _Layout(delimiter)
    width = _usual_width([cells for _, cells in records])
    at = _header_index(records, width) if header_line is None else _chosen(records, header_line)
    line, header = records[at]
    preamble = [line + 1 for line, cells in records[:at] if _filled(cells)]
    body = [cell for _, cells in records[at + 1:] for cell in cells]
    return _Layout(delimiter, line, len(header), preamble, values.decimal_mark(body))


def _records(sample: str, delimiter: str) -> list[tuple[int, list[str]]]:
    """(0-based start line, cells) of the sample's complete, non-blank records."""
    reader = csv.reader(io.StringIO(sample, newline=""), delimiter=delimiter)
    found, start = [], 0
    try:
        for cells in reader:
            if len(found) >= SAMPLE_RECORDS:
                break
            if _filled(cells):
                found.append((start, cells))
            start = reader.line_num
    except csv.Error:
        pass
    if found and not sample.endswith(("\n", "\r")) and len(sample) >= SAMPLE_BYTES:
        found.pop()   # the sample may have cut the last record short
    return found


def _chosen(records: list[tuple[int, list[str]]], header_line: int) -> int:
    """The record that starts on the chosen header line."""
    for i, (line, _) in enumerate(records):
        if line + 1 == header_line:
            return i
    raise InputError(f"no header on line {header_line}: that line is blank, inside a record or "
                     "past the first records tabq looks at")


def _filled(cells: list[str]) -> int:
    """How many cells hold something."""
    return sum(bool(c.strip(values.SPACES)) for c in cells)


def _usual_width(rows: list[list[str]]) -> int:
    """The width most records have, up to their last filled cell (a trailing delimiter adds
    nothing): a table's rows outnumber its title and notes."""
    return Counter(_reach(cells) for cells in rows).most_common(1)[0][0]


def _reach(cells: list[str]) -> int:
    """How far a record's cells go: the position of its last filled cell."""
    return max((i + 1 for i, c in enumerate(cells) if c.strip(values.SPACES)), default=0)


def _header_index(records: list[tuple[int, list[str]]], width: int) -> int:
    """The first record reaching as far as the table with at least half its cells filled: title
    and note lines above it are narrower ("Sales, North depot") or mostly empty ("Sales,,,,")."""
    least = max(1, math.ceil(width / 2))
    for i, (_, cells) in enumerate(records[:PREAMBLE_MAX + 1]):
        if _reach(cells) >= width and _filled(cells) >= least:
            return i
    return 0


def _delimiter(sample: str, suffix: str) -> str:
    """The delimiter that splits the most lines into the same number of cells (more than one)."""
    if suffix in (".tsv", ".tab"):
        return "\t"
    lines = [line for line in sample.splitlines()[:SAMPLE_RECORDS] if line.strip()]

    def fit(delimiter: str) -> tuple[int, int]:
        widths = Counter(len(cells) for cells in csv.reader(lines, delimiter=delimiter))
        width, count = max(widths.items(), key=lambda wc: (wc[1], wc[0]), default=(1, 0))
        return (count, width) if width > 1 else (0, 0)

    return max(DELIMITERS, key=fit)


def _note_layout(report: ReadReport, encoding: str, layout: _Layout) -> None:
    report.encoding = encoding
    report.delimiter = layout.delimiter
    report.header_line = layout.header_line + 1
    report.decimal_mark = layout.decimal
    report.skip("preamble", layout.preamble)
    if encoding not in ("utf-8", "utf-8-sig", "utf-16", "utf-32"):
        report.guesses.append(f"text decoded as {encoding}")
    if layout.decimal == ",":
        report.guesses.append('numbers read with a decimal comma ("1.234,50" is 1234.5)')


# ---------------------------------------------------------------- reading the rows


def _duckdb_csv(con: Con, path: Path, layout: _Layout, report: ReadReport) -> list[str] | None:
    """Read with DuckDB from the header line on; None when DuckDB sees another shape than the
    sample does (ragged rows, say), for Python to read instead. With a decimal comma, every
    column is read as text, for `retype` to read each one's numbers."""
    skip, all_text = layout.header_line, layout.decimal == ","
    quote, escape, columns, dates = con.execute(
        "SELECT Quote, Escape, Columns, DateFormat FROM sniff_csv(?, header = true, delim = ?, "
        "skip = ?)", [str(path), layout.delimiter, skip]).fetchone()
    if len(columns) != layout.width:
        return None
    order = _day_order(dates or "")
    typed = [c["name"] for c in columns if c["type"] == "DATE"]
    if order and typed and not all_text:
        report.guesses.append(f"{', '.join(typed)}: dates read {order}")
    quote, escape = ("" if v == "(empty)" else v for v in (quote, escape))
    options = [str(path), layout.delimiter, quote, escape, skip]
    read = "read_csv(?, header = true, delim = ?, quote = ?, escape = ?, skip = ?{})"
    text = ", all_varchar = true"
    try:
        con.execute(f"CREATE TABLE _src AS SELECT * FROM {read.format(text if all_text else '')}",
                    options)
    except duckdb.ConversionException:
        # A late cell broke the type guessed from the sample: read all as text, retype in build.
        con.execute(f"CREATE TABLE _src AS SELECT * FROM {read.format(text)}", options)
    names = staging_names(con)
    header = _header_record(path, layout.delimiter, quote, escape, skip)
    if header is None:
        header = names
    return (header + [""] * len(names))[: len(names)]


def _day_order(date_format: str) -> str | None:
    """"day first" or "month first" for a numeric date format DuckDB chose, else None."""
    if "%Y" in date_format[:2] or "%d" not in date_format or "%m" not in date_format:
        return None
    return "day first" if date_format.index("%d") < date_format.index("%m") else "month first"


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


def _python_csv(con: Con, path: Path, layout: _Layout, report: ReadReport) -> list[str]:
    """Any delimited text, streamed: short rows padded, long rows cut to the header's width and
    reported, blank lines left out."""
    long_rows: list[int] = []
    with path.open(encoding="utf-8-sig", errors="replace", newline="") as f:
        for _ in range(layout.header_line):
            f.readline()
        reader = csv.reader(f, delimiter=layout.delimiter)
        try:
            header = next((r for r in reader if _filled(r)), None)
            if header is None:
                raise TableFileError(f"{shown(path)}: no header row")
            width = len(header)

            def rows() -> Iterator[list]:
                for cells in reader:
                    if not _filled(cells):
                        continue
                    if len(cells) > width and _filled(cells[width:]):
                        long_rows.append(layout.header_line + reader.line_num)
                    yield (cells + [None] * width)[:width]

            insert_rows(con, width, rows())
        except csv.Error as exc:
            raise TableFileError(f"{shown(path)}: a cell or line near line "
                                 f"{layout.header_line + reader.line_num} is too long to read "
                                 f"(at most {LINE_MAX >> 20} MB; {exc})") from None
    if long_rows:
        lines = ", ".join(map(str, long_rows[:5])) + (", ..." if len(long_rows) > 5 else "")
        report.guesses.append(f"{len(long_rows)} row{'s' if len(long_rows) > 1 else ''} had "
                              f"more cells than the header (line {lines}); the extra cells "
                              "were left out")
    return header
