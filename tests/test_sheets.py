"""Workbooks: the header found past a title, a note and a blank row; a normal sheet read as it
was; typed cells (dates, numbers, booleans, errors, merged cells); hostile workbooks refused
quickly with one line. Each expected answer is worked out from the Python rows before they are
written, never by reading the file back.

The scenario is invented: the order book of a small furniture workshop, Harrow & Finch.
"""

from __future__ import annotations

import datetime
import io
import random
import resource
import subprocess
import sys
import time
import zipfile
from pathlib import Path

import pytest

import tabq
from tabq.errors import TableFileError
from tabq.load import load_table, table_names
from tabq.readers import sheets, workbook_bounds

openpyxl = pytest.importorskip("openpyxl", reason="the tests write their workbooks with openpyxl")

HEADER = ["Order", "Placed", "Piece", "Wood", "Qty", "Price", "Paid"]
PREAMBLE = [["Orders — Harrow & Finch furniture workshop"],
            ["Exported from the order book on 2 May 2024; prices in pounds"],
            []]


def orders(n: int = 40, seed: int = 4) -> list[list]:
    rnd = random.Random(seed)
    rows = []
    for i in range(n):
        placed = datetime.date(2024, 1, 3) + datetime.timedelta(days=rnd.randrange(120))
        rows.append([f"HF-{1000 + i}", placed, rnd.choice(["dining table", "rocking chair",
                                                            "bookcase", "bench"]),
                     rnd.choice(["oak", "walnut", "ash", "cherry"]), rnd.randrange(1, 6),
                     round(rnd.uniform(90, 2400), 2), rnd.random() < 0.6])
    return rows


def write_book(path: Path, rows: list[list], preamble: list[list] = ()) -> Path:
    book = openpyxl.Workbook()
    sheet = book.active
    sheet.title = "Orders"
    for row in [*preamble, HEADER, *rows]:
        sheet.append(row)
    book.save(path)
    return path


def base(table) -> list:
    """The table's own columns, without the typed views of messy text ("HF-1000" → 1000)."""
    return [c for c in table.columns if c.view is None]


def answer(path: Path, question: str) -> list:
    return tabq.open(path, model=tabq.Model.prior()).ask(question).answer


ROWS = orders()
COUNT = len(ROWS)
QTY = sum(r[4] for r in ROWS)
MARCH = sum(1 for r in ROWS if r[1].month == 3)
PRICE = round(sum(r[5] for r in ROWS), 2)
WALNUT = sum(1 for r in ROWS if r[3] == "walnut")


# ---------------------------------------------------------------- the header past a preamble


@pytest.fixture(scope="module")
def preamble_book(tmp_path_factory) -> Path:
    return write_book(tmp_path_factory.mktemp("pre") / "orders.xlsx", ROWS, PREAMBLE)


@pytest.fixture(scope="module")
def plain_book(tmp_path_factory) -> Path:
    return write_book(tmp_path_factory.mktemp("plain") / "orders.xlsx", ROWS)


def test_preamble_is_not_the_header(preamble_book):
    table = load_table(preamble_book)
    assert [c.header for c in base(table)] == HEADER
    assert table.row_count == COUNT
    assert table.report.header_line == 4
    assert [(s.why, s.rows, s.lines) for s in table.report.skipped] == [("preamble", 2, (1, 2))]
    assert {c.name: c.kind for c in base(table)} == {
        "order": "text", "placed": "date", "piece": "text", "wood": "text", "qty": "number",
        "price": "number", "paid": "bool"}


@pytest.mark.parametrize("question, expected", [
    ("How many orders are there?", COUNT),
    ("What is the total qty?", QTY),
    ("How many orders were placed in March?", MARCH),
    ("What is the total price?", PRICE),
])
def test_preamble_sheet_answers(preamble_book, question, expected):
    got = answer(preamble_book, question)
    assert got == [pytest.approx(expected)]


def test_normal_sheet_keeps_its_header(plain_book):
    table = load_table(plain_book)
    assert [c.header for c in base(table)] == HEADER
    assert table.row_count == COUNT and table.report.header_line == 1
    assert table.report.skipped == []
    assert answer(plain_book, "How many orders were placed in March?") == [MARCH]
    assert answer(plain_book, "What is the total qty?") == [QTY]


def test_pandas_agrees_on_the_sum(preamble_book):
    """An outside reader, told where the header is, gives the same total as tabq."""
    pandas = pytest.importorskip("pandas")
    frame = pandas.read_excel(preamble_book, skiprows=len(PREAMBLE), engine="openpyxl")
    assert list(frame.columns) == HEADER
    assert round(float(frame["Price"].sum()), 2) == PRICE
    assert answer(preamble_book, "What is the total price?") == [pytest.approx(PRICE)]


@pytest.mark.parametrize("rows, header", [
    # a two-column table: a header with an empty cell is still the header
    ([["Wood", None], ["oak", 3], ["ash", 4]], 0),
    # a title set apart by a blank row above a two-column table is not
    ([["Stock count"], [], ["Wood", "Boards"], ["oak", 3], ["ash", 4]], 1),
    # a one-column table keeps its header
    ([["Wood"], ["oak"], ["ash"]], 0),
    # a header narrower than the rows, but of three labels, is the header
    ([["Wood", "Boards", "Shelf"], ["oak", 3, "A", 1, 2, 7], ["ash", 4, "B", 5, 6, 8]], 0),
])
def test_header_row_rules(rows, header):
    numbered = [(i, r) for i, r in enumerate(rows) if any(v is not None for v in r)]
    assert sheets.header_row(numbered) == header


# ---------------------------------------------------------------- cells


def test_cells_keep_their_types(tmp_path):
    """Dates as dates, whole numbers as integers, booleans, an error cell as missing, and a
    workshop merged over three orders counted for each of them."""
    rows = [["HF-1", datetime.date(2024, 3, 1), "York", 2, 150.5, True],
            ["HF-2", datetime.date(2024, 3, 9), None, 1, "#DIV/0!", False],
            ["HF-3", datetime.date(2024, 4, 2), None, 3, 99.0, None],
            ["HF-4", datetime.date(2024, 2, 5), "Leeds", 1, 310.0, True]]
    book = openpyxl.Workbook()
    sheet = book.active
    sheet.append(["Order", "Placed", "Workshop", "Qty", "Price", "Paid"])
    for row in rows:
        sheet.append(row)
    sheet.merge_cells("C2:C4")   # York made the first three
    path = tmp_path / "cells.xlsx"
    book.save(path)
    table = load_table(path)
    kinds = {c.name: c.kind for c in base(table)}
    assert kinds == {"order": "text", "placed": "date", "workshop": "text",
                     "qty": "number", "price": "number", "paid": "bool"}
    got = table.con.execute("SELECT workshop, qty, price, paid FROM t ORDER BY __row").fetchall()
    assert got == [("York", 2, 150.5, True), ("York", 1, None, False), ("York", 3, 99.0, None),
                   ("Leeds", 1, 310.0, True)]
    assert table.column("qty").integer
    assert answer(path, "How many orders were made in York?") == [3]
    assert answer(path, "How many orders were placed in March?") == [2]


def test_leading_blank_rows_and_columns(tmp_path):
    """A table that starts at C3: its rows are numbered as the sheet numbers them."""
    book = openpyxl.Workbook()
    sheet = book.active
    sheet["C3"], sheet["D3"] = "Wood", "Boards"
    sheet["C4"], sheet["D4"] = "oak", 12
    sheet["C5"], sheet["D5"] = "ash", 7
    path = tmp_path / "offset.xlsx"
    book.save(path)
    table = load_table(path)
    assert [c.header for c in base(table)] == ["Wood", "Boards"]
    assert table.report.header_line == 3 and table.row_count == 2
    sheet.insert_rows(1, 60)   # more blank rows than the header search looks at
    book.save(path)
    table = load_table(path)
    assert table.report.header_line == 63 and table.row_count == 2


# ---------------------------------------------------------------- hostile workbooks


_SHEET_HEAD = (b'<?xml version="1.0" encoding="UTF-8"?><worksheet xmlns='
               b'"http://schemas.openxmlformats.org/spreadsheetml/2006/main">')


def _book_bytes() -> bytes:
    book = openpyxl.Workbook()
    book.active.append(["Wood", "Boards"])
    book.active.append(["oak", 1])
    sink = io.BytesIO()
    book.save(sink)
    return sink.getvalue()


def hostile(path: Path, sheet_parts: list[bytes], strings: list[bytes] | None = None) -> Path:
    """A real workbook whose sheet (and shared strings) are swapped for the given XML, written
    piece by piece so a bomb never sits whole in memory."""
    source = zipfile.ZipFile(io.BytesIO(_book_bytes()))
    with zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED, compresslevel=9) as z:
        for info in source.infolist():
            if info.filename in ("xl/worksheets/sheet1.xml", "xl/sharedStrings.xml"):
                continue
            if not info.filename.startswith(("xl/theme", "docProps")):
                z.writestr(info.filename, source.read(info.filename))
        for part, pieces in (("xl/worksheets/sheet1.xml", sheet_parts),
                             ("xl/sharedStrings.xml", strings)):
            if pieces is not None:
                with z.open(part, "w") as out:
                    for piece in pieces:
                        out.write(piece)
    return path


def _repeat(piece: bytes, times: int, batch: int = 100_000) -> list[bytes]:
    block = piece * batch
    return [block] * (times // batch) + [piece * (times % batch)]


def _sheet(*rows: bytes) -> list[bytes]:
    return [_SHEET_HEAD, *rows, b"</sheetData></worksheet>"]


def refused(path: Path) -> str:
    start = time.perf_counter()
    with pytest.raises(TableFileError) as caught:
        load_table(path)
    assert time.perf_counter() - start < 10
    message = str(caught.value)
    assert "\n" not in message and path.name in message
    return message


def test_lying_dimension_is_not_believed(tmp_path):
    path = hostile(tmp_path / "lie.xlsx", _sheet(
        b'<dimension ref="A1:XFD1048576"/><sheetData>',
        b'<row r="1"><c r="A1" t="inlineStr"><is><t>Wood</t></is></c>'
        b'<c r="B1" t="inlineStr"><is><t>Boards</t></is></c></row>',
        b'<row r="2"><c r="A2" t="inlineStr"><is><t>oak</t></is></c><c r="B2"><v>4</v></c></row>'))
    assert path.stat().st_size < 3000
    table = load_table(path)
    assert table.row_count == 1 and [c.header for c in base(table)] == ["Wood", "Boards"]


def test_far_cell_is_refused(tmp_path):
    """Two cells, A1 and XFD1048576: calamine would build the rectangle between them."""
    path = hostile(tmp_path / "far.xlsx", _sheet(
        b'<sheetData><row r="1"><c r="A1"><v>1</v></c></row>',
        b'<row r="1048576"><c r="XFD1048576"><v>2</v></c></row>'))
    assert "column" in refused(path)


def test_far_row_is_refused(tmp_path):
    path = hostile(tmp_path / "deep.xlsx", _sheet(
        b'<sheetData><row r="1"><c r="A1"><v>1</v></c><c r="AZ1"><v>1</v></c></row>',
        b'<row r="1048576"><c r="A1048576"><v>2</v></c></row>'))
    assert "rows" in refused(path)


def test_row_bomb_is_refused(tmp_path):
    """8M rows in well under a megabyte."""
    path = hostile(tmp_path / "rows.xlsx",
                   _sheet(b"<sheetData>", *_repeat(b'<row><c t="n"><v>1</v></c></row>', 8_000_000)))
    assert path.stat().st_size < 1_500_000
    assert "cells" in refused(path)


def test_shared_string_bomb_is_refused(tmp_path):
    """20M shared strings in under a megabyte."""
    start = (b'<?xml version="1.0"?><sst xmlns="http://schemas.openxmlformats.org/'
             b'spreadsheetml/2006/main">')
    strings = [start, *_repeat(b"<si><t>x</t></si>", 20_000_000), b"</sst>"]
    path = hostile(tmp_path / "strings.xlsx",
                   _sheet(b'<sheetData><row r="1"><c r="A1" t="s"><v>0</v></c></row>'), strings)
    assert path.stat().st_size < 1_500_000
    assert "shared strings" in refused(path)


def test_declared_size_that_lies_is_not_believed(tmp_path):
    """The archive says the sheet is 200 bytes; it inflates to 200 MB."""
    path = hostile(tmp_path / "liar.xlsx",
                   _sheet(b"<sheetData>", *_repeat(b'<row><c t="n"><v>1</v></c></row>', 8_000_000)))
    data = bytearray(path.read_bytes())
    name = b"xl/worksheets/sheet1.xml"
    at = data.rfind(b"PK\x01\x02", 0, data.rfind(name))   # its central directory entry
    data[at + 24:at + 28] = (200).to_bytes(4, "little")
    path.write_bytes(bytes(data))
    assert zipfile.ZipFile(path).getinfo(name.decode()).file_size in (200, 0xFFFFFFFF)
    refused(path)


def test_wide_sheet_is_refused_with_a_clear_line(tmp_path):
    """A real 16,000-column sheet (xlsx allows 16,384): refused by its width, not read."""
    book = openpyxl.Workbook(write_only=True)
    sheet = book.create_sheet("Survey")
    sheet.append([f"q{i}" for i in range(16_000)])
    for _ in range(3):
        sheet.append(list(range(16_000)))
    path = tmp_path / "wide.xlsx"
    book.save(path)
    assert "columns" in refused(path)


def test_bomb_through_the_cli_is_one_line_and_small(tmp_path):
    path = hostile(tmp_path / "rows.xlsx",
                   _sheet(b"<sheetData>", *_repeat(b'<row><c t="n"><v>1</v></c></row>', 8_000_000)))
    out = subprocess.run([sys.executable, "-m", "tabq", "ask", str(path), "how many rows"],
                         capture_output=True, text=True, timeout=120, check=False)
    assert out.returncode == 2 and out.stdout == ""
    assert out.stderr.startswith("tabq: ") and out.stderr.count("\n") == 1
    assert "rows.xlsx" in out.stderr
    peak = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss   # KiB on Linux
    assert peak < (1 << 30) >> 10
    assert sorted(p.name for p in tmp_path.iterdir()) == ["rows.xlsx"]


# ---------------------------------------------------------------- other workbook formats
# A beekeeping co-op's honey sales (invented): the same rows as .ods and as .xls.

HONEY_HEADER = ["Jar", "Sold", "Apiary", "Kind", "Grams", "Price"]


def honey(n: int = 30, seed: int = 11) -> list[list]:
    rnd = random.Random(seed)
    return [[f"J-{200 + i}", datetime.date(2024, 1, 5) + datetime.timedelta(days=rnd.randrange(110)),
             rnd.choice(["Ridge", "Orchard", "Meadow"]), rnd.choice(["clover", "heather", "lime"]),
             rnd.choice([227, 340, 454]), rnd.randrange(5, 19)] for i in range(n)]


_ODS_NS = ('xmlns:office="urn:oasis:names:tc:opendocument:xmlns:office:1.0" '
           'xmlns:table="urn:oasis:names:tc:opendocument:xmlns:table:1.0" '
           'xmlns:text="urn:oasis:names:tc:opendocument:xmlns:text:1.0"')


def _ods_cell(value: object) -> str:
    if isinstance(value, datetime.date):
        return (f'<table:table-cell office:value-type="date" office:date-value="{value}">'
                f"<text:p>{value}</text:p></table:table-cell>")
    if isinstance(value, int):
        return (f'<table:table-cell office:value-type="float" office:value="{value}">'
                f"<text:p>{value}</text:p></table:table-cell>")
    return f'<table:table-cell office:value-type="string"><text:p>{value}</text:p></table:table-cell>'


def ods_row(cells: list, repeat: int = 1, tail: str = "") -> str:
    return (f'<table:table-row table:number-rows-repeated="{repeat}">'
            + "".join(map(_ods_cell, cells)) + tail + "</table:table-row>")


def write_ods(path: Path, *sheets: tuple[str, str]) -> Path:
    """An .ods by hand: the mimetype first and stored, and each sheet's rows as XML."""
    tables = "".join(f'<table:table table:name="{name}">{rows}</table:table>'
                     for name, rows in sheets)
    xml = (f'<?xml version="1.0" encoding="UTF-8"?><office:document-content {_ODS_NS}>'
           f"<office:body><office:spreadsheet>{tables}</office:spreadsheet></office:body>"
           "</office:document-content>")
    with zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as z:
        z.writestr(zipfile.ZipInfo("mimetype"), "application/vnd.oasis.opendocument.spreadsheet")
        z.writestr("content.xml", xml)
        z.writestr("META-INF/manifest.xml", '<?xml version="1.0" encoding="UTF-8"?><manifest:'
                   'manifest xmlns:manifest="urn:oasis:names:tc:opendocument:xmlns:manifest:1.0"/>')
    return path


def honey_answers(rows: list[list]) -> tuple[int, int, int]:
    return (sum(r[2] == "Ridge" for r in rows), sum(r[5] for r in rows),
            sum(r[1].month == 3 for r in rows))


def check_honey(path: Path, rows: list[list], fmt: str) -> None:
    ridge, total, march = honey_answers(rows)
    assert load_table(path).report.format == fmt
    table = tabq.open(path, model=tabq.Model.prior())
    assert table.ask("How many jars came from the Ridge apiary?").answer == [ridge]
    assert table.ask("What is the total price?").answer == [total]
    assert table.ask("How many jars were sold in March?").answer == [march]


def test_ods_is_read_and_its_sheets_listed(tmp_path):
    rows = honey()
    path = write_ods(tmp_path / "honey.ods", ("Sales", ods_row(HONEY_HEADER) +
                                              "".join(ods_row(r) for r in rows)),
                     ("Hives", ods_row(["Hive", "Frames"]) + ods_row(["H1", 9])))
    check_honey(path, rows, "ods")
    assert table_names(path) == ["Sales", "Hives"]
    assert load_table(path, table="Hives").row_count == 1


def test_libreoffice_trailing_empty_repeats_read_fine(tmp_path):
    """LibreOffice writes the empty rest of a sheet as rows and cells repeated to its edge."""
    rows = honey(12)
    empty_tail = '<table:table-cell table:number-columns-repeated="16378"/>'
    body = (ods_row(HONEY_HEADER, tail=empty_tail)
            + "".join(ods_row(r, tail=empty_tail) for r in rows)
            + '<table:table-row table:number-rows-repeated="1048563">'
              '<table:table-cell table:number-columns-repeated="16384"/></table:table-row>')
    path = write_ods(tmp_path / "lo.ods", ("Sales", body))
    started = time.monotonic()
    check_honey(path, rows, "ods")
    assert time.monotonic() - started < 20


def _far(value: int, skip: int) -> str:
    """A row whose one value sits `skip` empty cells to the right."""
    return (f'<table:table-row><table:table-cell table:number-columns-repeated="{skip}"/>'
            f"{_ods_cell(value)}</table:table-row>")


_EMPTY_ROWS = ('<table:table-row table:number-rows-repeated="1048574"><table:table-cell/>'
               "</table:table-row>")


@pytest.mark.parametrize("body, says", [
    (ods_row(list("abcdefgh")) + ods_row(["x", 1, 2, "y", 3, "z", 4, "w"], repeat=1_048_575),
     "5,000,000 cells"),
    (ods_row(["Jar"]) + _EMPTY_ROWS + _far(1, 4), "5,000,000 cells"),   # A1 and E1048576
    (ods_row(["Jar"]) + _far(7, 16_383), "columns"),
])
def test_hostile_ods_is_refused_quickly(tmp_path, body, says):
    """Repeats that claim a million rows of values, or a far corner: tiny files, one line."""
    path = write_ods(tmp_path / "claims.ods", ("Sales", body))
    assert path.stat().st_size < 5_000
    started = time.monotonic()
    assert says in refused(path)
    with pytest.raises(TableFileError):
        table_names(path)
    assert time.monotonic() - started < 10


def test_xlsb_and_mislabelled_workbooks_are_refused_in_one_line(tmp_path):
    xlsb = tmp_path / "book.xlsb"
    with zipfile.ZipFile(xlsb, "w") as z:
        z.writestr("xl/workbook.bin", b"\x83\x01\x00")
    assert "save it as .xlsx" in refused(xlsb)
    ods = write_ods(tmp_path / "honey.ods", ("Sales", ods_row(["a"]) + ods_row([1])))
    renamed = tmp_path / "honey.xlsx"
    renamed.write_bytes(ods.read_bytes())
    assert "OpenDocument" in refused(renamed)


def _xlwt():
    return pytest.importorskip("xlwt", reason="the .xls tests write their workbooks with xlwt")


def test_xls_is_read(tmp_path):
    xlwt = _xlwt()
    rows = honey()
    book = xlwt.Workbook()
    sheet = book.add_sheet("Sales")
    day = xlwt.easyxf(num_format_str="YYYY-MM-DD")
    for c, head in enumerate(HONEY_HEADER):
        sheet.write(0, c, head)
    for r, row in enumerate(rows, 1):
        for c, value in enumerate(row):
            sheet.write(r, c, value, day) if c == 1 else sheet.write(r, c, value)
    book.add_sheet("Hives").write(0, 0, "Hive")
    path = tmp_path / "honey.xls"
    book.save(str(path))
    check_honey(path, rows, "xls")
    assert table_names(path) == ["Sales", "Hives"]


def test_xls_far_corner_is_refused_before_calamine(tmp_path):
    """A1 and IV65536: 5 KB that calamine opened into 1 GB. Refused in one line, quickly."""
    book = _xlwt().Workbook()
    sheet = book.add_sheet("Sales")
    sheet.write(0, 0, "Jar")
    sheet.write(65_535, 255, 1)
    path = tmp_path / "corner.xls"
    book.save(str(path))
    assert "5,000,000 cells" in refused(path)


def test_budgets_agree():
    assert workbook_bounds.CELL_BUDGET == sheets.CELL_BUDGET
