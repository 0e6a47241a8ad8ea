"""sheets: workbooks (.xlsx, .xlsm, .xls, .ods), one worksheet at a time, read by calamine.

calamine (Rust) reads a sheet about 13 times faster than openpyxl, and gives dates as dates,
numbers as numbers and booleans as booleans; an error cell (#DIV/0!) and an empty cell come back
as "" and are missing cells here. The format is told from the content (`workbook_format`), as
calamine will parse it. .xlsb is refused: its binary records are not measured yet. .xls and .ods
are measured whole before calamine opens them (`workbook_bounds`); what follows is for .xlsx.

Reading is bounded before calamine sees the file, because calamine builds the whole sheet as one
dense rectangle in memory and a cell far away ("XFD1048576") makes it abort the process:
- every part it parses is inflated here first, from its compressed bytes (a zip's declared sizes
  can lie), and the bytes must stay within UNPACKED_BUDGET;
- the shared strings are counted (STRING_BUDGET), the sheet's cells too (CELL_BUDGET), and the
  rectangle from A1 to the farthest cell must hold at most CELL_BUDGET cells;
- a sheet wider than COLUMN_BUDGET columns is refused with a one-line error rather than read.
A `<dimension>` element is never trusted: only the cells themselves count.

Sheets written for people often have a title, a note and a blank row above the header. The
header is found from the sheet's own cells (`header_row`); the rows above it are recorded as
"preamble" in the report, with the header's row, so a reader can check the choice.
"""

from __future__ import annotations

import posixpath
import re
import statistics
import struct
import zipfile
import zlib
from collections.abc import Callable, Iterable, Iterator
from dataclasses import dataclass
from pathlib import Path
from typing import TypeVar
from xml.etree import ElementTree

from ..errors import InputError, TableFileError
from ..files import one_line, shown
from ..limits import COLUMNS_MAX
from ..table import Con, ReadChoices
from . import workbook_bounds
from .staging import Source, choose, insert_rows

# Bytes of XML the parts calamine parses may unpack to. A real 1M-row × 8-column sheet is about
# 300 MB of XML; a zip bomb of ~1 MB unpacks to far more than this. Inflating 512 MB to check it
# takes about two seconds, so a bomb is refused quickly.
UNPACKED_BUDGET = 512 << 20

# Cells of one sheet, counted as calamine stores them: a dense rectangle of about 70 bytes a cell
# while it reads (measured: 8M cells took 575 MB). 5M cells is ~350 MB at most, and is a table of
# 625,000 rows × 8 columns: bigger sheets are refused rather than risk a machine's memory.
CELL_BUDGET = 5_000_000

# Shared strings (each ~50 bytes in calamine's memory even when empty): as many as cells.
STRING_BUDGET = CELL_BUDGET

# Columns of one sheet: as for every table (limits.COLUMNS_MAX).
COLUMN_BUDGET = COLUMNS_MAX

# Small parts (the workbook's sheet list and its links) are parsed as XML here: they stay small.
SMALL_PART = 16 << 20

PEEK_ROWS = 40        # rows looked at to find the header
PREAMBLE_MAX = 10     # non-blank rows above the header that may be titles or notes
_CHUNK = 4 << 20      # bytes of XML scanned at a time


def read_xlsx(con: Con, path: Path, head: bytes, table: str | None,
              choices: ReadChoices | None = None) -> Source:
    """The first worksheet, or the one `table` names; its header found past any preamble."""
    name = shown(path)
    fmt = workbook_format(path, name)
    parts = _check_book(path, name, fmt)
    book = _calamine(lambda: _open(path), f"{name}: not a readable {_WHAT[fmt]}")
    try:
        names = list(book.sheet_names)
        if not names:
            raise TableFileError(f"{name}: the workbook has no worksheets")
        chosen = choose(names, table, name, "sheet") if table else names[0]
        if fmt == "xlsx":      # the other formats were measured whole, before opening
            _check_sheet(path, name, chosen, parts.get(chosen))
        sheet = _calamine(lambda: book.get_sheet_by_name(chosen),
                          f"{name}: cannot read sheet {chosen!r}")
        source = _calamine(lambda: _stage(con, sheet, name, chosen, choices),
                           f"{name}: cannot read sheet {chosen!r}")
    finally:
        book.close()
    default = re.fullmatch(r"sheet\s*\d*", chosen.strip(), re.IGNORECASE)
    source.title = path.stem if default else chosen
    source.report.format = fmt
    return source


def sheet_names(path: Path) -> list[str]:
    """The worksheets of a workbook, in its own order."""
    name = shown(path)
    fmt = workbook_format(path, name)
    _check_book(path, name, fmt)
    book = _calamine(lambda: _open(path), f"{name}: not a readable {_WHAT[fmt]}")
    try:
        return list(book.sheet_names)
    finally:
        book.close()


def _open(path: Path):
    from python_calamine import CalamineWorkbook  # imported here: only workbooks need it

    return CalamineWorkbook.from_path(str(path))


T = TypeVar("T")


def _calamine(call: Callable[[], T], what: str) -> T:
    """`call`, with calamine's failures as one line. A Rust panic reaches Python as pyo3's
    PanicException, a BaseException: it is caught by name so Ctrl-C still stops tabq."""
    from python_calamine import CalamineError

    try:
        return call()
    except (CalamineError, OSError, ValueError) as exc:
        raise TableFileError(f"{what} ({one_line(exc)})") from None
    except BaseException as exc:
        if type(exc).__name__ != "PanicException":
            raise
        raise TableFileError(f"{what} (calamine failed: {one_line(exc)})") from None


# ---------------------------------------------------------------- rows into the staging table


def _stage(con: Con, sheet, name: str, chosen: str, choices: ReadChoices | None) -> Source:
    """The sheet's rows into `_src`: the header row found (or the one a person chose), the rows
    above it recorded."""
    rows = _numbered(sheet)
    peeked, filled = _peek(rows)
    if not filled:
        raise TableFileError(f"{name}: sheet {chosen!r} is empty")
    wanted = choices.header_line if choices else None
    at = header_row(filled) if wanted is None else _chosen_row(filled, wanted, name, chosen)
    line, first = filled[at]
    header = ["" if _blank(v) else str(_cell(v)) for v in first]
    width = len(header)
    if width > COLUMN_BUDGET:
        raise TableFileError(f"{name}: sheet {chosen!r} has {width:,} columns; tabq reads "
                             f"at most {COLUMN_BUDGET:,}")
    body = (r for i, r in peeked if i > line)
    merged = _merges(sheet, line)
    cells = _filled(_chain(body, (r for _, r in rows)), merged, line + 1)
    insert_rows(con, width, (_row(r, width) for r in cells))
    source = Source(header, chosen, chosen)
    source.report.header_line = line + 1
    source.report.skip("preamble", [i + 1 for i, _ in filled[:at]])
    return source


def _peek(rows: Iterator[tuple[int, list]]) -> tuple[list, list]:
    """The first rows, up to PEEK_ROWS non-blank ones, and those non-blank ones. Blank rows
    before them are kept too (their number is bounded by CELL_BUDGET, checked earlier)."""
    peeked, filled = [], []
    for number, row in rows:
        peeked.append((number, row))
        if _count(row):
            filled.append((number, row))
            if len(filled) == PEEK_ROWS:
                break
    return peeked, filled


def _numbered(sheet) -> Iterator[tuple[int, list]]:
    """(0-based sheet row, cells) for each row calamine gives. Columns start at the first one
    used; rows start at A1's row in the calamine tabq is tested with, at the first filled row in
    others, so the blank rows before the first filled one tell which."""
    start = (sheet.start or (0, 0))[0]
    rows = iter(sheet.iter_rows())
    lead: list[list] = []
    for row in rows:
        if _count(row):
            offset = 0 if len(lead) >= start else start - len(lead)
            yield from enumerate(_chain(lead, [row], rows), offset)
            return
        lead.append(row)
    yield from enumerate(lead)


def _chain(*parts: Iterable[list]) -> Iterator[list]:
    for part in parts:
        yield from part


def _blank(value: object) -> bool:
    return value is None or (isinstance(value, str) and not value.strip())


def _count(row: list) -> int:
    return sum(1 for v in row if not _blank(v))


_EXACT = 2.0 ** 53     # floats below this are exact integers when whole


def _cell(value: object) -> object:
    """A cell for the staging CSV: a whole float as an integer ("3", not "3.0"), as Excel
    shows it; calamine gives every xlsx number as a float. "" (empty, or an error such as
    #DIV/0!) is written as an empty field, a missing cell."""
    if value.__class__ is float and value.is_integer() and -_EXACT < value < _EXACT:
        return int(value)
    return value


def _row(row: list, width: int) -> list:
    """`_cell` inlined: this runs once for every cell of the sheet."""
    cells = [int(v) if v.__class__ is float and v.is_integer() and -_EXACT < v < _EXACT else v
             for v in row[:width]]
    return cells + [None] * (width - len(cells))


# ---------------------------------------------------------------- where the header is


def _chosen_row(rows: list[tuple[int, list]], wanted: int, name: str, sheet: str) -> int:
    """The filled row a person named as the header (1-based, as the sheet numbers rows)."""
    for i, (line, _) in enumerate(rows):
        if line + 1 == wanted:
            return i
    raise InputError(f"{name}: sheet {sheet!r} has no header on row {wanted}: that row is blank "
                     "or past the first rows tabq looks at")


def header_row(rows: list[tuple[int, list]]) -> int:
    """Which of the sheet's first non-blank rows, given with their sheet row numbers, is the
    header (an index into `rows`).

    A row above the header is a title or a note: it has one or two cells where the rows below
    have more. Row k is taken as preamble when it has at most 2 cells and either fewer than
    half the typical row below it, or fewer than the next non-blank row with a blank row
    between them (a title set apart). The first row that is neither is the header, so the
    header of a normal sheet, as wide as its rows, is never dropped; and when more than
    PREAMBLE_MAX rows would be preamble, nothing is.
    """
    counts = [_count(r) for _, r in rows]
    for k in range(len(rows) - 1):
        if k == PREAMBLE_MAX:
            return 0
        narrow = 2 * counts[k] < statistics.median(counts[k + 1:k + 21])
        set_apart = rows[k + 1][0] > rows[k][0] + 1 and counts[k] < counts[k + 1]
        if counts[k] > 2 or not (narrow or set_apart):
            return k
    return 0


# ---------------------------------------------------------------- merged cells


@dataclass
class _Merge:
    top: int
    bottom: int
    left: int
    right: int
    value: object = None


def _merges(sheet, header: int) -> list[_Merge]:
    """The merged ranges below the header, in sheet coordinates relative to the first column."""
    found = sheet.merged_cell_ranges or []   # None for a format without merges
    left = (sheet.start or (0, 0))[1]
    merges = [_Merge(r0, r1, c0 - left, c1 - left) for (r0, c0), (r1, c1) in found
              if r0 > header and (r1 > r0 or c1 > c0)]
    return sorted(merges, key=lambda m: m.top)


def _filled(rows: Iterable[list], merges: list[_Merge], first: int) -> Iterator[list]:
    """Rows with each merged range's value in all its cells: "York" merged over three orders
    is the workshop of all three, not of the first alone. Only what is read is filled, so the
    work is bounded by the rows read, not by what the ranges claim."""
    if not merges:
        yield from rows
        return
    pending = iter(merges)
    upcoming = next(pending, None)
    active: list[_Merge] = []
    for number, row in enumerate(rows, first):
        while upcoming is not None and upcoming.top <= number:
            if upcoming.top == number and 0 <= upcoming.left < len(row):
                upcoming.value = row[upcoming.left]
                active.append(upcoming)
            upcoming = next(pending, None)
        active = [m for m in active if m.bottom >= number]
        if active:
            row = list(row)
            for m in active:
                for c in range(max(m.left, 0), min(m.right + 1, len(row))):
                    row[c] = m.value
        yield row


# ---------------------------------------------------------------- which format, as calamine sees it


_WHAT = {"xlsx": "Excel workbook", "xls": "Excel 97-2003 .xls workbook",
         "ods": "OpenDocument spreadsheet", "xlsb": "Excel binary .xlsb workbook"}
# calamine picks its parser by the path's extension, as written (case matters); without one of
# these it tries .xls, .xlsx, .xlsb and .ods in turn, the order `workbook_format` follows.
_CALAMINE_EXTENSIONS = {".xls": "xls", ".xla": "xls", ".xlsx": "xlsx", ".xlsm": "xlsx",
                        ".xlam": "xlsx", ".xlsb": "xlsb", ".ods": "ods"}


def workbook_format(path: Path, name: str) -> str:
    """The format calamine will parse the file as, told from its content: the bounds must be
    those of that format. A name that says another format is refused."""
    with path.open("rb") as f:
        magic = f.read(8)
    found = "xlsx"                     # not a zip nor OLE2: calamine refuses it
    if magic == workbook_bounds.OLE2:
        found = "xls"
    elif zipfile.is_zipfile(path):
        found = _zip_format(path)
    named = _CALAMINE_EXTENSIONS.get(path.suffix)
    if named is not None and named != found:
        raise TableFileError(f"{name}: not an {_WHAT[named]}, as its name says (its content "
                             f"is an {_WHAT[found]})")
    if found == "xlsb":
        raise TableFileError(f"{name}: tabq does not read .xlsb workbooks yet; save it as "
                             ".xlsx and ask again")
    return found


def _zip_format(path: Path) -> str:
    try:
        with zipfile.ZipFile(path) as z:
            members = set(z.namelist())
            if "xl/workbook.xml" in members:
                return "xlsx"
            if "xl/workbook.bin" in members:
                return "xlsb"
            if "mimetype" not in members:
                return "xlsx"
            with z.open("mimetype") as f:
                kind = f.read(len(workbook_bounds.ODS_MIMETYPE) + 1)
    except (zipfile.BadZipFile, OSError, RuntimeError, NotImplementedError):
        return "xlsx"                  # left to calamine, whose bounds are xlsx's
    return "ods" if kind.strip() == workbook_bounds.ODS_MIMETYPE else "xlsx"


def _check_book(path: Path, name: str, fmt: str) -> dict[str, str]:
    """The whole workbook measured before calamine opens it; for .xlsx, which reads its
    sheets one at a time, which part holds each sheet (measured when it is chosen)."""
    if fmt == "xls":
        workbook_bounds.check_xls(path, name)
        return {}
    parts = _check_workbook(path, name)
    if fmt == "ods":
        workbook_bounds.check_ods(path, name, lambda f, info: _chunks(f, info, name))
    return parts


# ---------------------------------------------------------------- bounds, checked before reading


def _check_workbook(path: Path, name: str) -> dict[str, str]:
    """The parts calamine parses on opening, checked against the budgets; which part holds each
    sheet. A file that is not a zip workbook is left to calamine to refuse."""
    try:
        with zipfile.ZipFile(path) as z:
            infos = {i.filename: i for i in z.infolist()}
            declared = sum(i.file_size for i in infos.values() if _parsed(i.filename))
            if declared > UNPACKED_BUDGET:
                raise _too_big(name, declared)
            with path.open("rb") as f:
                strings = infos.get("xl/sharedStrings.xml")
                if strings is not None:
                    found = _scan(f, strings, name, (b"<si>", b"<si ", b":si>", b":si "),
                                  budget=(4, STRING_BUDGET))
                    if sum(found.counts) > STRING_BUDGET:
                        raise TableFileError(f"{name}: more than {STRING_BUDGET:,} shared "
                                             "strings, more than tabq reads")
                return _sheet_parts(f, infos, name)
    except zipfile.BadZipFile:
        return {}


def _parsed(part: str) -> bool:
    """Parts calamine may parse (XML and binary records), not pictures or embedded files."""
    return part.endswith((".xml", ".rels", ".bin")) and "/media/" not in part \
        and "/embeddings/" not in part and not part.endswith("vbaProject.bin")


def _too_big(name: str, size: int) -> TableFileError:
    return TableFileError(f"{name}: unpacks to more than {size >> 20:,} MB of XML; tabq reads "
                          f"workbooks of at most {UNPACKED_BUDGET >> 20:,} MB unpacked")


def _sheet_parts(f, infos: dict[str, zipfile.ZipInfo], name: str) -> dict[str, str]:
    """Sheet name → the zip part holding its cells, from the workbook and its links."""
    book, links = infos.get("xl/workbook.xml"), infos.get("xl/_rels/workbook.xml.rels")
    if book is None or links is None:
        return {}
    try:
        sheets = ElementTree.fromstring(_small(f, book, name))
        rels = ElementTree.fromstring(_small(f, links, name))
    except ElementTree.ParseError:
        return {}
    targets = {r.get("Id"): r.get("Target", "") for r in rels.iter() if r.get("Id")}
    parts = {}
    for sheet in sheets.iter():
        rid = next((v for k, v in sheet.attrib.items() if k.endswith("}id")), None)
        if sheet.tag.endswith("}sheet") and rid in targets:
            target = targets[rid]
            part = target.lstrip("/") if target.startswith("/") else \
                posixpath.normpath(posixpath.join("xl", target))
            parts[sheet.get("name", "")] = part
    return parts


def _small(f, info: zipfile.ZipInfo, name: str) -> bytes:
    return b"".join(_inflate(f, info, name, SMALL_PART))


def _check_sheet(path: Path, name: str, sheet: str, part: str | None) -> None:
    """The sheet's cells counted, and the rectangle calamine will build for them measured,
    before calamine reads it. Without the sheet's part (an odd workbook), every sheet is."""
    with zipfile.ZipFile(path) as z:
        infos = {i.filename: i for i in z.infolist()}
    if part not in infos:
        checked = [i for n, i in infos.items() if n.startswith("xl/worksheets/") and
                   n.endswith(".xml")]
    else:
        checked = [infos[part]]
    with path.open("rb") as f:
        for info in checked:
            _check_cells(f, info, name, sheet)


_CELL_MARKS = (b"<c ", b"<c>", b":c ", b":c>", b"<row", b":row", b' r="')
# A reference past column Z or row 99,999: the few cells that can make the rectangle big.
_FAR = re.compile(rb' r="([A-Z]{2,}[0-9]*|[A-Z]?[0-9]{6,})"')
_REF = re.compile(rb' r="([A-Z]*)([0-9]+)"')


def _check_cells(f, info: zipfile.ZipInfo, name: str, sheet: str) -> None:
    found = _scan(f, info, name, _CELL_MARKS, _FAR, budget=(4, CELL_BUDGET))
    cells, rows, refs = sum(found.counts[:4]), sum(found.counts[4:6]), found.counts[6]
    if cells > CELL_BUDGET:
        raise TableFileError(f"{name}: sheet {sheet!r} has more than {CELL_BUDGET:,} cells; "
                             "tabq reads no more")
    height, width, exact = _extent(found.far)
    unplaced = refs < cells + rows   # calamine puts cells and rows without a reference next
    if unplaced:                     # to the one before: count those too
        height, width = height + rows, width + _widest_row(f, info, name)
    if width > COLUMN_BUDGET:
        raise TableFileError(f"{name}: sheet {sheet!r} reaches column {width:,}; tabq reads "
                             f"at most {COLUMN_BUDGET:,} columns")
    if height * width > CELL_BUDGET and not exact:
        height = _last_row(f, info, name) + (rows if unplaced else 0)
    if height * width > CELL_BUDGET:
        raise TableFileError(f"{name}: sheet {sheet!r} spans {height:,} rows × {width:,} "
                             f"columns; tabq reads at most {CELL_BUDGET:,} cells")


def _extent(far: set[bytes]) -> tuple[int, int, bool]:
    """Rows and columns from A1 to the farthest reference, and whether the rows are exact:
    with no far reference, at most 99,999 rows and 26 columns (column Z), the rows refined
    later only when that bound is too many."""
    height, width = 99_999, 26
    for ref in far:
        letters = ref.rstrip(b"0123456789")
        if len(ref) - len(letters) >= 6:
            height = max(height, int(ref[len(letters):]))
        if len(letters) >= 2:
            width = max(width, _column(letters))
    return height, width, height > 99_999


def _column(letters: bytes) -> int:
    number = 0
    for ch in letters:
        number = number * 26 + ch - 64
    return number


def _last_row(f, info: zipfile.ZipInfo, name: str) -> int:
    """The largest row any reference names (a slower scan, for sheets that need it)."""
    last = 0
    for chunk in _chunks(f, info, name):
        rows = {digits for _, digits in _REF.findall(chunk)}
        last = max([last, *map(int, rows)])
    return last


def _widest_row(f, info: zipfile.ZipInfo, name: str) -> int:
    """The most cells any one row holds (for sheets whose cells have no references)."""
    widest = 0
    for chunk in _chunks(f, info, name):
        for piece in re.split(rb"<(?:\w+:)?row[\s>]", chunk):
            widest = max(widest, sum(piece.count(m) for m in _CELL_MARKS[:4]))
    return widest


@dataclass
class _Found:
    counts: list[int]
    far: set[bytes]


def _scan(f, info: zipfile.ZipInfo, name: str, marks: tuple[bytes, ...],
          pattern: re.Pattern | None = None, budget: tuple[int, int] = (1, 1 << 62)) -> _Found:
    """Occurrences of each mark, and the distinct matches of `pattern`, in one pass. The scan
    stops early once the first budget[0] marks together pass budget[1]: a bomb is refused
    without inflating the rest of it."""
    found = _Found([0] * len(marks), set())
    for chunk in _chunks(f, info, name):
        for k, mark in enumerate(marks):
            found.counts[k] += chunk.count(mark)
        if pattern is not None:
            found.far.update(pattern.findall(chunk))
        if sum(found.counts[:budget[0]]) > budget[1]:
            break
    return found


def _chunks(f, info: zipfile.ZipInfo, name: str) -> Iterator[bytes]:
    """The part's XML in pieces that each end before a "<", so no tag is ever split."""
    carry = b""
    for data in _inflate(f, info, name, UNPACKED_BUDGET):
        data = carry + data
        cut = data.rfind(b"<")
        if cut <= 0 or len(data) - cut > _CHUNK:
            cut = len(data)
        carry = data[cut:]
        yield data[:cut]
    if carry:
        yield carry


def _inflate(f, info: zipfile.ZipInfo, name: str, budget: int) -> Iterator[bytes]:
    """A part's bytes, inflated here from its compressed bytes: what calamine's zip reader will
    see, whatever size the archive declares. Stops with an error past `budget` bytes."""
    f.seek(info.header_offset)
    local = f.read(30)
    if len(local) < 30 or local[:4] != b"PK\x03\x04":
        raise TableFileError(f"{name}: not a readable Excel workbook (damaged zip)")
    name_len, extra_len = struct.unpack("<HH", local[26:30])
    f.seek(info.header_offset + 30 + name_len + extra_len)
    if info.flag_bits & 1:
        raise TableFileError(f"{name}: the workbook is encrypted")
    if info.compress_type not in (zipfile.ZIP_STORED, zipfile.ZIP_DEFLATED):
        raise TableFileError(f"{name}: not a readable Excel workbook (unusual compression)")
    inflater = zlib.decompressobj(-15) if info.compress_type == zipfile.ZIP_DEFLATED else None
    left, total = info.compress_size, 0
    while left > 0:
        raw = f.read(min(1 << 20, left))
        if not raw:
            break
        left -= len(raw)
        while raw:
            if inflater is None:
                out, raw = raw, b""
            else:
                try:
                    out = inflater.decompress(raw, _CHUNK)
                except zlib.error as exc:
                    raise TableFileError(f"{name}: not a readable Excel workbook "
                                         f"({one_line(exc)})") from None
                raw = inflater.unconsumed_tail
            total += len(out)
            if total > budget:
                raise _too_big(name, total)
            if out:
                yield out
