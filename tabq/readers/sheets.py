"""sheets: Excel workbooks, one worksheet at a time."""

from __future__ import annotations

import re
from pathlib import Path

from ..errors import TableFileError
from ..files import one_line, shown
from ..table import Con
from .staging import Source, choose, insert_rows

def read_xlsx(con: Con, path: Path, head: bytes, table: str | None) -> Source:
    """The first worksheet, or the one `table` names; the first non-empty row is the header."""
    import openpyxl  # imported here: it is slow to import and only Excel files need it

    name = shown(path)
    try:
        book = openpyxl.load_workbook(path, read_only=True, data_only=True)
    except Exception as exc:   # openpyxl raises many kinds for a damaged file
        raise TableFileError(f"{name}: not a readable Excel workbook ({one_line(exc)})") from None
    try:
        sheets = {ws.title: ws for ws in book.worksheets}
        if not sheets:
            raise TableFileError(f"{name}: the workbook has no worksheets")
        chosen = choose(list(sheets), table, name, "sheet") if table else next(iter(sheets))
        rows = (r for r in sheets[chosen].iter_rows(values_only=True)
                if any(v is not None and v != "" for v in r))
        first = next(rows, None)
        if first is None:
            raise TableFileError(f"{name}: sheet {chosen!r} is empty")
        header = ["" if v is None else str(v) for v in first]
        width = len(header)
        insert_rows(con, width, ((list(r) + [None] * width)[:width] for r in rows))
    finally:
        book.close()
    default = re.fullmatch(r"sheet\s*\d*", chosen.strip(), re.IGNORECASE)
    return Source(header, path.stem if default else chosen, chosen)


def sheet_names(path: Path) -> list[str]:
    """The worksheets of a workbook, in its own order."""
    import openpyxl
    book = openpyxl.load_workbook(path, read_only=True)
    try:
        return list(book.sheetnames)
    finally:
        book.close()
