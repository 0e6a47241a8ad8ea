"""Answers (denotations): normalised values, and the one place answers are compared.

Two answers match when they are equal as multisets after normalising each value: Unicode NFKC,
lower case, spaces collapsed, surrounding punctuation stripped; a value that reads as a number
("12,467", "12467.0") compares as a number with a relative tolerance of 1e-6; dates compare by
their ISO text. Booleans read as yes/no.
"""

from __future__ import annotations

import datetime
import decimal
import math
import re
import unicodedata
from dataclasses import dataclass

SIGNIFICANT = 10         # digits of a float shown and returned; float noise lives past 15
_NUMBER = re.compile(r"^[+-]?(\d{1,3}(,\d{3})+|\d+)?(\.\d+)?$")


@dataclass(frozen=True)
class Denotation:
    """What a query returned: a tuple of values (rows of a per-group table are tuples)."""

    values: tuple
    is_table: bool = False
    error: str | None = None

    @property
    def kind(self) -> str:
        """number / text / date / yesno / table — the type the question word is checked against."""
        if self.is_table:
            return "table"
        first = next((v for v in self.values if v is not None), None)
        if isinstance(first, bool) or first in ("yes", "no"):
            return "yesno"
        if isinstance(first, (int, float)):
            return "number"
        if isinstance(first, str) and re.fullmatch(r"\d{4}-\d{2}-\d{2}", first):
            return "date"
        return "text"

    def key(self) -> tuple:
        """A hashable key: answers with the same key are the same answer."""
        return tuple(sorted((norm(v) for v in self.values), key=repr))


def clean(value):
    """A DuckDB value as a plain Python value for people and JSON."""
    if hasattr(value, "item") and not isinstance(value, (list, tuple, str, bytes)):
        value = value.item()   # a numpy scalar
    if isinstance(value, decimal.Decimal):
        value = float(value)
    if isinstance(value, float):
        return tidy(value) if math.isfinite(value) else None
    if isinstance(value, (datetime.datetime, datetime.date)):
        if isinstance(value, datetime.datetime) and value.time() == datetime.time():
            value = value.date()
        return value.isoformat()
    if isinstance(value, bool):
        return "yes" if value else "no"
    if isinstance(value, (list, tuple)):
        return tuple(clean(v) for v in value)
    if isinstance(value, (datetime.time, datetime.timedelta)):
        return str(value)
    if isinstance(value, (bytes, bytearray)):
        return value.hex()
    return value


def tidy(value: float) -> float | int:
    """A float as people write it: binary noise dropped (0.1 + 0.2 is 0.3, a sum of money
    503042.0600000001 is 503042.06), a whole number as an int.

    Kept: SIGNIFICANT digits, and never fewer than two decimals, so that the cents of a large
    sum survive; a tiny number keeps its digits (rounding to fixed decimals would zero it).
    Whole values past 2**53 stay floats: as ints they would print digits the float never held.
    """
    if not math.isfinite(value) or value == 0:
        return 0 if value == 0 else value          # -0.0 is 0
    before_point = math.floor(math.log10(abs(value))) + 1
    rounded = round(value, max(SIGNIFICANT - before_point, 2))
    if rounded.is_integer() and abs(rounded) < 2 ** 53:
        return int(rounded)
    return rounded


def norm(value) -> tuple:
    """The comparable form of one value: ("n", float) or ("s", text)."""
    if isinstance(value, (tuple, list)):   # a row of a per-group table (a list once in JSON)
        return ("t", tuple(norm(v) for v in value))
    if isinstance(value, bool):
        return ("s", "yes" if value else "no")
    if isinstance(value, (int, float)):
        return ("n", round(float(value), 6))
    if value is None:
        return ("s", "")
    text = unicodedata.normalize("NFKC", str(value)).strip().lower()
    text = re.sub(r"\s+", " ", text).strip(" .,;:!?\"'")
    compact = text.replace(" ", "")
    if compact and _NUMBER.match(compact) and any(ch.isdigit() for ch in compact):
        return ("n", round(float(compact.replace(",", "")), 6))
    return ("s", text)


def _same(a: tuple, b: tuple) -> bool:
    if a[0] == b[0] == "n":
        return math.isclose(a[1], b[1], rel_tol=1e-6, abs_tol=1e-9)
    return a == b


def matches(answer, gold) -> bool:
    """Whether an answer (a list of values) is the gold answer (a list of values), as sets."""
    left = [norm(v) for v in answer]
    right = [norm(v) for v in gold]
    if len(left) != len(right):
        return False
    for g in right:
        for i, p in enumerate(left):
            if _same(p, g):
                del left[i]
                break
        else:
            return False
    return True
