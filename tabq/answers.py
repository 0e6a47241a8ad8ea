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
        if math.isnan(value) or math.isinf(value):
            return None
        if value.is_integer() and abs(value) < 1e15:
            return int(value)
        return round(value, 10)
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
