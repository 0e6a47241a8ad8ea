"""totals: rows of a table that add up other rows ("Total", "Subtotal North", "Grand total").

Counted or summed with the rows they add up, such a row doubles an answer, so the load stage
leaves them out of TABLE and says so. A row is taken for a total only on good evidence:
- the last row, labelled "Total", "Totals", "Grand total" in any text cell, or in its first text
  cell "Sum", "All", "Total seats", "Career total" and the like;
- any other row whose first text cell says total or subtotal, when one of its numbers is the sum
  of the rows above it, back to the previous total (so "Total Recall" in a list of films stays).
"""

from __future__ import annotations

import re

from . import values
from .table import ROW, TABLE, Con, ident

CANDIDATES_MAX = 1000   # labelled rows checked at most: more than this is a list, not totals
TOLERANCE = 0.005       # relative difference allowed between a subtotal and its rows' sum

_TOTAL_LABEL = re.compile(r"(?:grand |overall )?totals?(?: \(.*\))?")
_FIRST_TOTAL_LABEL = re.compile(r"sum|all|(?:grand |overall )?totals?\b.*|.*\btotals?")
_SUBTOTAL_LABEL = re.compile(r"(?:sub[- ]?)?totals?\b.*|.*\b(?:sub[- ]?)?totals?\b.*")
# the same test in SQL, loose: Python checks each candidate it finds
_SQL_HINT = r"(?i).*\b(sub[- ]?)?totals?\b.*|\s*(sum|all)\W*"


def label(text: str | None) -> str:
    """A cell as a total's label is compared: folded, footnotes and closing marks removed."""
    return values.normal_text(values.strip_footnotes(text or "")).strip(" :.")


def find_totals(con: Con, texts: list[str], numbers: list[str], row_count: int) -> list[int]:
    """The ROWs of TABLE that are totals or subtotals, in order. `texts` and `numbers` are the
    names of its text and number columns."""
    if row_count < 2 or not texts:
        return []
    first_text = f"coalesce({', '.join(f'CAST({ident(t)} AS VARCHAR)' for t in texts)})"
    candidates = con.execute(
        f"SELECT {ident(ROW)}, {first_text}, {', '.join(ident(t) for t in texts)} FROM {TABLE} "
        f"WHERE regexp_full_match({first_text}, ?) OR {ident(ROW)} = ? "
        f"ORDER BY {ident(ROW)} LIMIT ?", [_SQL_HINT, row_count - 1, CANDIDATES_MAX + 1]
    ).fetchall()
    if len(candidates) > CANDIDATES_MAX:
        return []
    found: list[int] = []
    for row, first, *cells in candidates:
        if row == row_count - 1 and _last_total(first, cells):
            found.append(row)
        elif _SUBTOTAL_LABEL.fullmatch(label(first)) and _adds_up(con, numbers, found, row):
            found.append(row)
    return found


def _last_total(first: str | None, cells: list) -> bool:
    labels = [label(str(c)) for c in cells if c is not None]
    return bool(labels) and (bool(_FIRST_TOTAL_LABEL.fullmatch(label(first)))
                             or any(_TOTAL_LABEL.fullmatch(text) for text in labels))


def _adds_up(con: Con, numbers: list[str], found: list[int], row: int) -> bool:
    """Whether some number of `row` is the sum of the rows above it back to the last total."""
    if not numbers:
        return False
    since = found[-1] if found else -1
    sums = ", ".join(f"sum({ident(n)}) FILTER (WHERE {ident(ROW)} > ? AND {ident(ROW)} < ?), "
                     f"max({ident(n)}) FILTER (WHERE {ident(ROW)} = ?)" for n in numbers)
    got = con.execute(f"SELECT {sums} FROM {TABLE}", [since, row, row] * len(numbers)).fetchone()
    pairs = zip(got[::2], got[1::2], strict=True)
    return any(total is not None and value is not None and value != 0
               and abs(float(total) - float(value)) <= TOLERANCE * abs(float(value))
               for total, value in pairs)
