"""workbook_bounds: .ods and .xls workbooks measured before calamine opens them.

calamine reads every sheet of these two formats when it opens the file (even to list the sheet
names), each as one dense rectangle from its first to its farthest cell, and it trusts sizes the
file declares: a 5 KB .xls with cells at A1 and IV65536 took 1 GB to open, three such sheets
1.5 GB; an .ods whose row claims to repeat a million times is a million rows. So the cells are
measured here first, over all sheets together, against the budgets of `sheets`:
- .ods: content.xml is streamed through expat (inflated by `sheets._inflate`, so its unpacked
  size is bounded), summing `table:number-rows-repeated` and `table:number-columns-repeated` up
  to the farthest cell with a value. Empty cells and rows repeated past the last value (what
  LibreOffice writes to the sheet's edge, ~1M rows × 16k columns) are not read by calamine and
  do not count.
- .xls: the OLE2 container is walked (every declared count and size checked against the file's
  size, chains against loops) to the Workbook stream, whose BIFF records are read as calamine
  reads them: the sheets where BOUNDSHEET points, each to its EOF record; the cells of the
  records calamine keeps, and the DIMENSIONS it reserves room for; the shared strings' count.
"""

from __future__ import annotations

import mmap
import struct
import zipfile
from collections.abc import Iterator
from dataclasses import dataclass
from pathlib import Path
from xml.parsers import expat

from ..errors import TableFileError
from ..files import size_text
from ..limits import COLUMNS_MAX

CELL_BUDGET = 5_000_000       # as sheets.CELL_BUDGET: cells calamine holds at once, all sheets
STRING_BUDGET = CELL_BUDGET
# An .xls is read whole into memory by calamine, with a copy of its Workbook stream. A sheet of
# 5M cells (the cell budget) is at most ~100 MB of records, so a bigger file cannot be one tabq
# reads; 256 MB leaves room for strings and formatting.
XLS_BUDGET = 256 << 20

OLE2 = b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1"
ODS_MIMETYPE = b"application/vnd.oasis.opendocument.spreadsheet"


def _too_many(name: str, cells: int) -> TableFileError:
    return TableFileError(f"{name}: its sheets span at least {cells:,} cells; tabq reads at "
                          f"most {CELL_BUDGET:,} cells of a workbook")


def _too_wide(name: str, width: int) -> TableFileError:
    return TableFileError(f"{name}: a sheet reaches column {width:,}; tabq reads at most "
                          f"{COLUMNS_MAX:,} columns")


# ---------------------------------------------------------------- .ods


_ROW, _CELL, _COVERED, _TABLE = ("table:table-row", "table:table-cell",
                                 "table:covered-table-cell", "table:table")
# Attributes that give a cell a value or a formula in calamine (value-type alone is counted
# too: a cell that has it is not one LibreOffice writes for an empty cell).
_VALUED = ("office:value", "office:string-value", "office:date-value", "office:time-value",
           "office:boolean-value", "office:value-type", "table:formula")


@dataclass
class _Sheet:
    """One table:table being measured: rows from its first row with a value to its last."""
    height: int = 0        # rows from the first valued row to the last, repeats included
    pending: int = 0       # empty rows since the last valued row: counted if one follows
    width: int = 0         # columns up to the farthest valued cell
    repeats: int = 1       # the current row's repeats
    col: int = 0           # columns so far in the current row
    reach: int = 0         # columns up to its last valued cell


class _OdsMeasure:
    """expat handlers over content.xml. Names are matched with their usual prefixes, as
    calamine matches them: a table under another prefix is one calamine does not read."""

    def __init__(self, name: str) -> None:
        self.name, self.stack, self.total = name, [], 0

    def start(self, tag: str, attrs: dict[str, str]) -> None:
        if not tag.startswith("table:"):     # most elements (text:p): out first, it is hot
            return
        if tag == _TABLE:
            self.stack.append(_Sheet())
        elif not self.stack:
            return
        elif tag == _ROW:
            sheet = self.stack[-1]
            sheet.repeats, sheet.col, sheet.reach = _count(attrs, "table:number-rows-repeated"), 0, 0
        elif tag in (_CELL, _COVERED):
            sheet = self.stack[-1]
            sheet.col += _count(attrs, "table:number-columns-repeated")
            if any(a in attrs for a in _VALUED):
                sheet.reach = sheet.col
                if sheet.reach > COLUMNS_MAX:
                    raise _too_wide(self.name, sheet.reach)

    def end(self, tag: str) -> None:
        if not self.stack or tag not in (_ROW, _TABLE):
            return
        sheet = self.stack[-1]
        if tag == _ROW:
            if not sheet.reach:                 # an empty row: only counts between values
                sheet.pending += sheet.repeats if sheet.height else 0
                return
            sheet.height += sheet.pending + sheet.repeats
            sheet.pending, sheet.width = 0, max(sheet.width, sheet.reach)
            if self.total + sheet.height * sheet.width > CELL_BUDGET:
                raise _too_many(self.name, self.total + sheet.height * sheet.width)
        elif tag == _TABLE:
            self.stack.pop()
            self.total += sheet.height * sheet.width


def _count(attrs: dict[str, str], key: str) -> int:
    """A repeat count; one that is not a number is one calamine refuses, so it counts once."""
    try:
        return max(int(attrs.get(key, "1")), 1)
    except ValueError:
        return 1


def _no_dtd(*_: object) -> None:
    raise TableFileError("a DTD")    # entities could expand; calamine does not read them


def check_ods(path: Path, name: str, chunks) -> int:
    """The cells calamine will hold for every sheet of an .ods (refused past the budgets);
    `chunks(f, info)` yields content.xml inflated and bounded."""
    measure = _OdsMeasure(name)
    parser = expat.ParserCreate()
    parser.StartElementHandler, parser.EndElementHandler = measure.start, measure.end
    parser.StartDoctypeDeclHandler = _no_dtd
    with zipfile.ZipFile(path) as z:
        try:
            info = z.getinfo("content.xml")
        except KeyError:
            raise TableFileError(f"{name}: not a readable OpenDocument spreadsheet "
                                 "(no content.xml)") from None
    try:
        with path.open("rb") as f:
            for chunk in chunks(f, info):
                parser.Parse(chunk, False)
            parser.Parse(b"", True)
    except expat.ExpatError as exc:
        raise TableFileError(f"{name}: not a readable OpenDocument spreadsheet "
                             f"({expat.ErrorString(exc.code)})") from None
    except TableFileError as exc:
        if str(exc) == "a DTD":
            raise TableFileError(f"{name}: content.xml declares a DTD; tabq does not read "
                                 "it") from None
        raise
    return measure.total


# ---------------------------------------------------------------- .xls: the OLE2 container


_END, _FREE = 0xFFFFFFFE, 0xFFFFFFFF


class _Ole:
    """Just enough of an OLE2 (compound file) reader to find a stream, trusting no count."""

    def __init__(self, data: mmap.mmap | bytes, name: str) -> None:
        self.data, self.name = data, name
        shift = _u16(data, 30)
        if len(data) < 512 or data[:8] != OLE2 or shift not in (9, 12) or _u16(data, 32) != 6:
            raise self.bad("damaged header")
        self.size = 1 << shift
        self.sectors = len(data) // self.size - 1
        counts = struct.unpack_from("<IIIIIIIII", data, 40)
        dir_len, fat_len, mini_len, difat_len = counts[0], counts[1], counts[6], counts[8]
        if max(dir_len, fat_len, mini_len, difat_len) > self.sectors:
            raise self.bad("it declares more sectors than it holds")
        self.fat = self._fat(counts[7])
        self.entries = self._entries(counts[2])
        root_start, root_len = self.entries[0][1:] if self.entries else (_END, 0)
        self.mini = self.chain(root_start, self.fat, self.sector)[:root_len]
        self.minifat = _u32s(self.chain(counts[5], self.fat, self.sector))

    def bad(self, why: str) -> TableFileError:
        return TableFileError(f"{self.name}: not a readable Excel .xls workbook ({why})")

    def sector(self, sid: int) -> bytes:
        if sid >= self.sectors:
            raise self.bad("a sector past its end")
        at = (sid + 1) * self.size
        return bytes(self.data[at:at + self.size])

    def mini_sector(self, sid: int) -> bytes:
        if sid * 64 + 64 > len(self.mini):
            raise self.bad("a mini sector past its end")
        return self.mini[sid * 64:sid * 64 + 64]

    def chain(self, sid: int, table: list[int], read) -> bytes:
        """The sectors from `sid` on; a chain longer than there are sectors loops."""
        parts, seen = [], 0
        most = self.sectors if read == self.sector else len(self.mini) // 64
        while sid not in (_END, _FREE):
            seen += 1
            if seen > most or sid >= len(table):
                raise self.bad("a broken sector chain")
            parts.append(read(sid))
            sid = table[sid]
        return b"".join(parts)

    def _fat(self, difat_start: int) -> list[int]:
        ids = list(_u32s(bytes(self.data[76:512])))
        sid, seen = difat_start, 0
        while sid not in (_END, _FREE):
            seen += 1
            if seen > self.sectors:
                raise self.bad("a broken sector chain")
            more = _u32s(self.sector(sid))
            ids.extend(more[:-1])
            sid = more[-1]
        return _u32s(b"".join(self.sector(i) for i in ids if i != _FREE))

    def _entries(self, dir_start: int) -> list[tuple[str, int, int]]:
        """(name, first sector, size) of each directory entry; no size past the file's."""
        raw = self.chain(dir_start, self.fat, self.sector)
        entries = []
        for at in range(0, len(raw) - 127, 128):
            entry = raw[at:at + 128]
            label = entry[:64].decode("utf-16-le", "ignore").split("\0")[0]
            start = struct.unpack_from("<I", entry, 116)[0]
            size = struct.unpack_from("<I" if self.size == 512 else "<Q", entry, 120)[0]
            if size > len(self.data):
                raise self.bad("a stream larger than the file")
            entries.append((label, start, size))
        return entries

    def stream(self, *names: str) -> bytes:
        """The first of `names` found, looked for in that order, as calamine does."""
        for wanted in names:
            for label, start, size in self.entries:
                if label == wanted:
                    if size < 4096:
                        return self.chain(start, self.minifat, self.mini_sector)[:size]
                    return self.chain(start, self.fat, self.sector)[:size]
        raise self.bad("no Workbook stream")


def _u16(data, at: int) -> int:
    return int.from_bytes(data[at:at + 2], "little")


def _u32s(data: bytes) -> list[int]:
    return list(struct.unpack(f"<{len(data) // 4}I", data[:len(data) // 4 * 4]))


# ---------------------------------------------------------------- .xls: the BIFF records


_EOF, _BOUNDSHEET, _SST, _DIMENSIONS, _MULRK = 0x000A, 0x0085, 0x00FC, 0x0200, 0x00BD
# Records calamine turns into cells (Number, Label, BoolErr, RK, LabelSst, MulRk, Formula);
# it skips Blank and MulBlank, which formatting alone writes.
_CELLS = frozenset((0x0203, 0x0204, 0x0205, 0x027E, 0x00FD, _MULRK, 0x0006))


def _records(stream: bytes, at: int) -> Iterator[tuple[int, bytes]]:
    while at + 4 <= len(stream):
        kind, size = struct.unpack_from("<HH", stream, at)
        yield kind, stream[at + 4:at + 4 + size]
        at += 4 + size


def check_xls(path: Path, name: str) -> int:
    """The cells calamine will hold for every sheet of an .xls (refused past the budgets)."""
    size = path.stat().st_size
    if size > XLS_BUDGET:
        raise TableFileError(f"{name}: too large for an .xls workbook ({size_text(size)}; tabq "
                             f"reads .xls files up to {size_text(XLS_BUDGET)})")
    with path.open("rb") as f, mmap.mmap(f.fileno(), 0, access=mmap.ACCESS_READ) as data:
        stream = _Ole(data, name).stream("Workbook", "Book")
    total = 0
    for at in _sheet_starts(stream, name):
        total += _sheet_cells(stream, at, name)
        if total > CELL_BUDGET:
            raise _too_many(name, total)
    return total


def _sheet_starts(stream: bytes, name: str) -> list[int]:
    """Where each sheet's records start (BOUNDSHEET), from the workbook's global records."""
    starts = []
    for kind, data in _records(stream, 0):
        if kind == _EOF:
            break
        if kind == _BOUNDSHEET and len(data) >= 4:
            starts.append(struct.unpack_from("<I", data)[0])
        elif kind == _SST and len(data) >= 8 and struct.unpack_from("<i", data, 4)[0] > \
                STRING_BUDGET:   # calamine makes room for as many strings as this says
            raise TableFileError(f"{name}: more than {STRING_BUDGET:,} shared strings, more "
                                 "than tabq reads")
    return [at for at in starts if at < len(stream)]


def _sheet_cells(stream: bytes, at: int, name: str) -> int:
    """Cells calamine holds for one sheet: its rectangle from A1 to the farthest cell, or the
    cells it reserved room for (DIMENSIONS) or kept, whichever is most."""
    rows = cols = kept = reserved = 0
    for kind, data in _records(stream, at):
        if kind == _EOF:
            break
        if kind == _DIMENSIONS:
            reserved = max(reserved, _dimensions(data))
        elif kind in _CELLS and len(data) >= 4:
            row, col = struct.unpack_from("<HH", data)
            last = max(col, _u16(data, len(data) - 2)) if kind == _MULRK else col
            rows, cols, kept = max(rows, row + 1), max(cols, last + 1), kept + last - col + 1
            if cols > COLUMNS_MAX:
                raise _too_wide(name, cols)
    return max(rows * cols, kept, reserved)


def _dimensions(data: bytes) -> int:
    """The cells calamine reserves for a DIMENSIONS record, with its unsigned 32-bit sums (a
    last row before the first wraps round to about 4 billion)."""
    if len(data) == 10:
        first_row, last_row, first_col, last_col = struct.unpack_from("<HHHH", data)
    elif len(data) == 14:
        first_row, last_row, first_col, last_col = struct.unpack_from("<IIHH", data)
    else:
        return 0
    if last_row < 1 or last_col < 1:
        return 1
    rows = (last_row - 1 - first_row + 1) % (1 << 32)
    cols = (last_col - 1 - first_col + 1) % (1 << 32)
    return rows * cols
