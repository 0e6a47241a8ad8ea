"""Cell values: small pure parsers for the messy text found in real tables.

The loader uses them to build typed views of text columns ("7,169" → 7169, "26 March 1944*" →
1944-03-26); question analysis may reuse them on the words of a question. Each function takes one
string and returns None (or an empty list) when the text holds no such value.
"""

from __future__ import annotations

import datetime
import re
import unicodedata

# Whitespace that real cells carry around their text: NBSP, thin/narrow spaces, zero-width, BOM.
SPACES = " \t\r\n\f\v\u00a0\u2007\u2009\u202f\u200b\ufeff"

# Cells that mean "no value". Compared after trimming and case folding.
PLACEHOLDERS = frozenset({
    "", "-", "--", "---", "—", "–", "−", "―", "‐", "n/a", "n.a.", "n.a", "na", "nan", "null",
    "none", "?", "??", "???", "tba", "tbd", "tbc", "#n/a", "#value!", "#ref!", "#div/0!", "#num!",
    "#name?", "#null!",
})

# Footnote marks: "[27]", "[a]", "[note 3]", "[citation needed]", and symbol marks like "*", "†".
_FOOTNOTE_REF = re.compile(r"\[(?:[0-9]{1,3}|[a-zA-Z]|note [0-9a-z]+|nb [0-9]+|citation needed)\]")
_FOOTNOTE_MARKS = "*†‡§¶#^~"

# A number: optional sign, then 1,234,567(.89) with thousands separators, or plain digits.
# The lookbehind keeps digits glued to a word ("U23") or to a decimal point out, and keeps a dash
# between two numbers ("13–17", "1944-03-26") a separator rather than a minus sign.
_NUMBER = re.compile(
    r"(?<![\w.])(?P<sign>[-−–+])?"
    r"(?P<num>[0-9]{1,3}(?:[,\u2009\u202f][0-9]{3})+(?![0-9])(?:\.[0-9]+)?"
    r"|[0-9]+(?:\.[0-9]+)?|\.[0-9]+)"
)
_GROUP_SEPARATORS = str.maketrans("", "", ",\u2009\u202f")

_MONTHS = {
    "january": 1, "february": 2, "march": 3, "april": 4, "may": 5, "june": 6, "july": 7,
    "august": 8, "september": 9, "october": 10, "november": 11, "december": 12,
    "jan": 1, "feb": 2, "mar": 3, "apr": 4, "jun": 6, "jul": 7, "aug": 8, "sep": 9, "sept": 9,
    "oct": 10, "nov": 11, "dec": 12,
}
_MONTH = r"(?P<month>" + "|".join(sorted(_MONTHS, key=len, reverse=True)) + r")\.?"
_WEEKDAY = re.compile(
    r"^(?:mon|tue|tues|wed|thu|thur|thurs|fri|sat|sun)(?:day|nesday|sday|urday)?\.?,?\s+"
)
_ORDINAL_DAY = re.compile(r"\b([0-9]{1,2})(?:st|nd|rd|th)\b")
_TIME = r"(?:[t ][0-9]{1,2}:[0-9]{2}(?::[0-9]{2}(?:\.[0-9]+)?)?\s*(?:z|[-+][0-9]{2}:?[0-9]{2})?)?"
_ISO_DATE = re.compile(r"(?P<y>[0-9]{4})[-/.](?P<m>[0-9]{1,2})[-/.](?P<d>[0-9]{1,2})" + _TIME)
_DAY_MONTH_YEAR = re.compile(r"(?P<d>[0-9]{1,2})[ \-/.]+" + _MONTH + r"[ \-/.]+(?P<y>[0-9]{4})")
_MONTH_DAY_YEAR = re.compile(_MONTH + r" +(?P<d>[0-9]{1,2}) +(?P<y>[0-9]{4})")
_NUMERIC_DATE = re.compile(
    r"(?P<a>[0-9]{1,2})(?P<sep>[-/.])(?P<b>[0-9]{1,2})(?P=sep)(?P<y>[0-9]{4})")
_TRAILING_PAREN = re.compile(r"\s*\([^()]*\)$")
# Every date parse_date reads has a month name or three numbers joined by "-", "/" or ".": a
# cheap test that spares the full parse for most cells of most columns.
_DATE_HINT = re.compile(r"[a-z]{3}|[0-9][-/.][0-9]{1,2}[-/.][0-9]", re.IGNORECASE)

# A year on its own: four digits, not part of a longer number, an amount or a decimal.
_YEAR = re.compile(r"(?<![0-9$€£¥.,])([0-9]{4})(?![0-9%]|[.,][0-9])")
YEAR_MIN, YEAR_MAX = 1000, 2100


def clean_cell(text: str | None) -> str | None:
    """A cell as stored: outer whitespace and NBSP trimmed; an empty cell is None."""
    if text is None:
        return None
    text = text.strip(SPACES)
    return text or None


def normal_text(text: str) -> str:
    """The form used to compare texts: NFKC, case folded, any run of spaces (NBSP too) as one."""
    text = unicodedata.normalize("NFKC", text).casefold()
    return " ".join(text.replace("\u200b", "").split())


def is_placeholder(text: str | None) -> bool:
    """True for cells that stand for a missing value: "", "—", "-", "n/a", "?", "TBA", …"""
    return text is None or text.strip(SPACES).casefold() in PLACEHOLDERS


def strip_footnotes(text: str) -> str:
    """Remove footnote references and marks: "26 March 1944*" → "26 March 1944"."""
    text = _FOOTNOTE_REF.sub(" ", text)
    text = text.translate({ord(c): " " for c in _FOOTNOTE_MARKS})
    return text.strip(SPACES)


def parse_numbers(text: str | None) -> list[float]:
    """All numbers in a cell, in order: "8.9 km (5.5 mi)" → [8.9, 5.5]; "L 13–17" → [13, 17]."""
    if not text:
        return []
    text = _FOOTNOTE_REF.sub(" ", text)
    found = []
    for m in _NUMBER.finditer(text):
        value = float(m["num"].translate(_GROUP_SEPARATORS))
        sign = m["sign"]
        # An en dash is a minus only when it opens the cell ("–5"); elsewhere it joins a range.
        if sign in ("-", "−") or (sign == "–" and not text[: m.start()].strip(SPACES)):
            value = -value
        found.append(value)
    return found


def parse_number(text: str | None) -> float | None:
    """The first number in a cell: "7,169" → 7169; "4th" → 4; "$1.2 million" → 1.2; "−5" → -5."""
    numbers = parse_numbers(text)
    return numbers[0] if numbers else None


def _make_date(year: int, month: int, day: int) -> datetime.date | None:
    try:
        return datetime.date(year, month, day)
    except ValueError:
        return None


def _date_text(text: str) -> str:
    """Lower case, footnotes, weekday, ordinal suffixes, commas and a trailing aside removed."""
    text = strip_footnotes(text).casefold()
    text = _TRAILING_PAREN.sub("", text)
    text = _WEEKDAY.sub("", text)
    text = _ORDINAL_DAY.sub(r"\1", text)
    text = text.replace(",", " ")
    return " ".join(text.split()).strip(" .")


def parse_date(text: str | None, dayfirst: bool | None = None) -> datetime.date | None:
    """A full calendar date: "26 March 1944*", "March 26, 1944", "1944-03-26", "26/03/1944".

    For all-numeric dates like "03/04/1944", `dayfirst` picks the reading; None means: day first
    when the first part cannot be a month or the separator is a dot, month first otherwise.
    A year alone or a month and year ("March 1944") is not a full date: see parse_year.
    """
    if not text or not _DATE_HINT.search(text):
        return None
    text = _date_text(text)
    if m := _ISO_DATE.fullmatch(text):
        return _make_date(int(m["y"]), int(m["m"]), int(m["d"]))
    if m := _DAY_MONTH_YEAR.fullmatch(text):
        return _make_date(int(m["y"]), _MONTHS[m["month"]], int(m["d"]))
    if m := _MONTH_DAY_YEAR.fullmatch(text):
        return _make_date(int(m["y"]), _MONTHS[m["month"]], int(m["d"]))
    if m := _NUMERIC_DATE.fullmatch(text):
        a, b, year = int(m["a"]), int(m["b"]), int(m["y"])
        if dayfirst is None:
            dayfirst = a > 12 or (b <= 12 and m["sep"] == ".")
        day, month = (a, b) if dayfirst else (b, a)
        return _make_date(year, month, day)
    return None


def numeric_date_order(texts: list[str]) -> bool | None:
    """Whether all-numeric dates in a column put the day first: True, False, or None if unclear.

    One cell like "26/03/1944" settles it for its whole column, where "03/04/1944" alone cannot.
    """
    day_first = month_first = 0
    for text in texts:
        if m := _NUMERIC_DATE.search(text):
            a, b = int(m["a"]), int(m["b"])
            day_first += a > 12 >= b
            month_first += b > 12 >= a
    if day_first == month_first:
        return None
    return day_first > month_first


def parse_year(text: str | None) -> int | None:
    """The first year (1000–2100) written in a cell: "2006–Present" → 2006; "1998 season" → 1998.

    Full dates give their year too ("26 March 1944" → 1944); a caller that wants the date itself
    tries parse_date first.
    """
    if not text:
        return None
    for m in _YEAR.finditer(_FOOTNOTE_REF.sub(" ", text)):
        year = int(m.group(1))
        if YEAR_MIN <= year <= YEAR_MAX:
            return year
    return None


# ---------------------------------------------------------------- formatted amounts

# Currency signs and codes a money cell may carry before or after its number. Codes are listed,
# not any three letters, so "12 pcs" stays text. Case is ignored.
_CURRENCY = (r"[$€£¥₹₽₩₺₪₴₦฿]|r\$|us\$|fr\.|kr\.?|zł|kč|руб\.?|"
             r"usd|eur|gbp|jpy|chf|cad|aud|nzd|sek|nok|dkk|pln|czk|huf|rub|uah|inr|cny|rmb|hkd|"
             r"sgd|krw|brl|mxn|zar|try|ils|aed|sar")
# No leading zero before more digits ("02139" is a code, not 2139); RE2 and Python alike.
_GROUPED = {   # a number with its thousands grouped, by decimal mark
    ".": r"[1-9][0-9]{0,2}(?:[,' \x{a0}\x{202f}\x{2009}][0-9]{3})+(?:\.[0-9]+)?",
    ",": r"[1-9][0-9]{0,2}(?:[. \x{a0}\x{202f}\x{2009}][0-9]{3})+(?:,[0-9]+)?",
}
_PLAIN = {".": r"(?:0|[1-9][0-9]*)(?:\.[0-9]+)?|\.[0-9]+",
          ",": r"(?:0|[1-9][0-9]*)(?:,[0-9]+)?|,[0-9]+"}


def amount_pattern(decimal: str) -> str:
    """The shape of a whole cell that is one amount written with `decimal` as its decimal mark:
    "$1,234.50", "(1,200.00)", "1.234,50 €", "-12,5 %", "EUR 300", "1 200-". Groups: open,
    sign, num, percent, trail, close. Valid in Python's re (after `python_pattern`) and RE2."""
    number = f"(?P<num>{_GROUPED[decimal]}|{_PLAIN[decimal]})"
    money = f"(?:{_CURRENCY})"
    return (r"(?i)^(?P<open>\()?\s*(?P<sign>[-+−])?\s*" + f"{money}?" + r"\s*(?P<sign2>[-+−])?\s*"
            + number + r"\s*" + f"{money}?" + r"\s*(?P<percent>%)?\s*(?P<trail>-)?\s*(?P<close>\))?$")


def python_pattern(pattern: str) -> str:
    """An RE2 pattern as Python's re spells it (RE2 writes code points as \\x{…})."""
    return re.sub(r"\\x\{([0-9a-f]+)\}", lambda m: f"\\u{int(m[1], 16):04x}", pattern)


_AMOUNT = {mark: re.compile(python_pattern(amount_pattern(mark))) for mark in _GROUPED}
_NOT_DIGIT = re.compile(r"[^0-9]")


def parse_amount(text: str | None, decimal: str = ".") -> float | None:
    """A cell that is one amount: "$1,234.50" → 1234.5, "(1,200.00)" → -1200, "1.234,50 €" →
    1234.5 with decimal ",", "12.5%" → 12.5 (percentages keep the number written). None if the
    cell is anything else, or its brackets or signs do not pair up."""
    m = _AMOUNT[decimal].match(text.strip(SPACES)) if text else None
    if not m or bool(m["open"]) != bool(m["close"]) or (m["sign"] and m["sign2"]):
        return None
    whole, _, fraction = m["num"].partition(decimal)
    value = float(_NOT_DIGIT.sub("", whole or "0") + "." + (fraction or "0"))
    negative = (m["sign"] or m["sign2"] or "+") in "-−" or bool(m["open"]) or bool(m["trail"])
    return -value if negative else value


def decimal_mark(texts: list[str]) -> str | None:
    """Which decimal mark the numbers in these texts use, "." or ",", from the cells that settle
    it ("1.234,50", "12,5", "1,234,567"); None when none does ("1,234" and "7" fit both)."""
    votes = {".": 0, ",": 0, None: 0}
    for text in texts:
        for m in _SETTLING.finditer(text):
            votes[_settles(m.group())] += 1
    if votes["."] == votes[","]:
        return None
    return "." if votes["."] > votes[","] else ","


_SETTLING = re.compile(r"[0-9][0-9.,]*[.,][0-9]+")


def _settles(number: str) -> str | None:
    """The decimal mark one written number shows, if it shows one."""
    if "." in number and "," in number:
        return "," if number.rfind(",") > number.rfind(".") else "."
    mark = "." if "." in number else ","
    if number.count(mark) > 1:   # repeated, it groups thousands: "1.234.567", not "01.02.2026"
        groups = number.split(mark)
        if len(groups[0]) <= 3 and all(len(g) == 3 for g in groups[1:]):
            return "," if mark == "." else "."
        return None
    return None if len(number) - number.rfind(mark) - 1 == 3 else mark


_NUMERIC_DATE_CELL = re.compile(r"([0-9]{1,2})([-/.])([0-9]{1,2})\2([0-9]{4})")


def parse_numeric_date(text: str | None, dayfirst: bool) -> datetime.date | None:
    """A cell that is only an all-numeric date, "13/03/2026" or "03-13-2026", read day first or
    month first as the column's own cells decided (see numeric_date_order)."""
    m = _NUMERIC_DATE_CELL.fullmatch(text.strip(SPACES)) if text else None
    if not m:
        return None
    a, b, year = int(m[1]), int(m[3]), int(m[4])
    day, month = (a, b) if dayfirst else (b, a)
    return _make_date(year, month, day)
