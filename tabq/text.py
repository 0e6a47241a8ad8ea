"""Words of a question: tokens with stems, numbers (digits, words, ordinals), dates and quotes.

Pure functions over a string; nothing here knows about tables.
"""

from __future__ import annotations

import re
import unicodedata
from dataclasses import dataclass
from functools import lru_cache

import snowballstemmer

_STEMMER = snowballstemmer.stemmer("english")

STOPWORDS = frozenset(
    """a an the of in on at to for from by with and or is are was were be been being do does did
    has have had what which who whom whose when where how this that these those there their its it
    as than then me my we our you your i they them he she his her all any some each every per
    please tell show give list find get much many s among amongst into onto about across within
    via through""".split()
)

UNITS = {
    "zero": 0, "one": 1, "two": 2, "three": 3, "four": 4, "five": 5, "six": 6, "seven": 7,
    "eight": 8, "nine": 9, "ten": 10, "eleven": 11, "twelve": 12, "thirteen": 13,
    "fourteen": 14, "fifteen": 15, "sixteen": 16, "seventeen": 17, "eighteen": 18,
    "nineteen": 19, "twenty": 20, "thirty": 30, "forty": 40, "fifty": 50, "sixty": 60,
    "seventy": 70, "eighty": 80, "ninety": 90, "dozen": 12, "hundred": 100, "thousand": 1000,
    "million": 1_000_000,
}
_MULTIPLIERS = ("dozen", "hundred", "thousand", "million")
ORDINAL_WORDS = {
    "first": 1, "second": 2, "third": 3, "fourth": 4, "fifth": 5, "sixth": 6, "seventh": 7,
    "eighth": 8, "ninth": 9, "tenth": 10, "eleventh": 11, "twelfth": 12, "thirteenth": 13,
    "fourteenth": 14, "fifteenth": 15, "twentieth": 20,
}
MONTHS = {
    name: i + 1
    for i, names in enumerate(
        [("january", "jan"), ("february", "feb"), ("march", "mar"), ("april", "apr"),
         ("may",), ("june", "jun"), ("july", "jul"), ("august", "aug"),
         ("september", "sep", "sept"), ("october", "oct"), ("november", "nov"),
         ("december", "dec")]
    )
    for name in names
}
# Short month names that are also everyday words count as months only beside a day or year.
_AMBIGUOUS_MONTHS = {"mar", "may", "jun", "dec", "sep", "oct", "jan", "aug", "apr"}

_TOKEN = re.compile(
    r"\d{4}-\d{2}-\d{2}"                 # ISO date
    r"|\d{1,2}/\d{1,2}/\d{2,4}"          # 30/06/2025
    r"|\d+(?:st|nd|rd|th)\b"             # 4th
    r"|(?<![\w.])[-−–](?:\d{1,3}(?:,\d{3})+|\d+)(?:\.\d+)?(?![\w-])"   # -3, −2.5: signed
    r"|[$€£]?(?:\d{1,3}(?:,\d{3})+|\d+)(?:\.\d+)?%?"   # 7,169  3.5  $40  40%
    r"|[^\W\d_]+(?:['’][^\W\d_]+)?"      # words, with an apostrophe inside
    r"|(?<!\w)'(?:[^']|'(?=\w))*'(?!\w)"  # quoted text; an apostrophe before a letter stays
    r"|‘(?:[^’]|’(?=\w))*’(?!\w)"        # inside it: 'O'Brien's yard'
    r"|\"[^\"]*\"|“[^”]*”"
    r"|\S",
    re.UNICODE,
)
_SIGNED = re.compile(r"[-−–]\d")
_NEGATIVE_WORDS = ("minus", "negative")   # "minus 3" is -3
_QUOTES = {"'": "'", '"': '"', "“": "”", "‘": "’"}


@dataclass(frozen=True)
class Token:
    text: str      # lower-cased, as in the question
    stem: str
    index: int
    stop: bool     # a function word that carries no content


@dataclass(frozen=True)
class NumberMention:
    value: float
    start: int     # token span [start, end)
    end: int
    ordinal: bool = False
    year: bool = False   # a four-digit whole number that reads as a year


@dataclass(frozen=True)
class DateMention:
    year: int | None
    month: int | None
    day: int | None
    start: int
    end: int

    def iso(self) -> str | None:
        if self.year and self.month and self.day:
            return f"{self.year:04d}-{self.month:02d}-{self.day:02d}"
        return None


@dataclass(frozen=True)
class Words:
    """A question split into what the rest of the pipeline needs."""

    question: str
    tokens: tuple[Token, ...]
    numbers: tuple[NumberMention, ...]
    dates: tuple[DateMention, ...]
    quoted: tuple[tuple[str, int], ...]   # (text, token index of the quote)


def normalise(text: str) -> str:
    """Unicode-fold, lower-case and collapse spaces: the form used to compare text."""
    text = unicodedata.normalize("NFKC", text).replace("\u00a0", " ").lower()
    return re.sub(r"\s+", " ", text).strip()


@lru_cache(maxsize=65536)
def stem(word: str) -> str:
    word = word.replace("’", "'")
    if word.endswith("'s"):
        word = word[:-2]
    return _STEMMER.stemWord(word)


def is_word(text: str) -> bool:
    """A token that says something — a word or a number, signed ones too — not punctuation."""
    return text[0].isalnum() or bool(_SIGNED.match(text))


def split_words(text: str) -> list[str]:
    """The word tokens of a header or cell, lower-cased (no quotes, no punctuation)."""
    return [t for t in _TOKEN.findall(normalise(text)) if is_word(t) or t[0] in "$€£"]


_CONTRACTIONS = {"won't": ("will", "n't"), "can't": ("can", "n't"), "cannot": ("can", "n't"),
                 "what's": ("what", "is"), "who's": ("who", "is"), "where's": ("where", "is"),
                 "that's": ("that", "is"), "there's": ("there", "is"), "how's": ("how", "is")}


def _expand(raw: list[str]) -> list[str]:
    """Split contractions so that "aren't" says "not" and "what's" says "what is"."""
    out = []
    for text in raw:
        if text[0] in _QUOTES and len(text) > 1:   # quoted text is kept as written
            out.append(text)
            continue
        text = text.replace("’", "'")
        if text in _CONTRACTIONS:
            out.extend(_CONTRACTIONS[text])
        elif text.endswith("n't") and len(text) > 3:
            out.extend((text[:-3], "n't"))
        else:
            out.append(text)
    return out


def read_question(question: str) -> Words:
    """Tokenise a question and find the numbers, dates and quoted strings in it."""
    raw = _expand(_TOKEN.findall(normalise(question)))
    tokens: list[Token] = []
    quoted: list[tuple[str, int]] = []
    for text in raw:
        if text[0] in _QUOTES and len(text) >= 2 and text[-1] == _QUOTES[text[0]]:
            inner = text[1:-1].strip()
            if inner:
                quoted.append((inner, len(tokens)))
            text = inner or text
        tokens.append(Token(text, stem(text), len(tokens), text in STOPWORDS or not is_word(text)))
    dates = _find_dates(tokens)
    in_date = {i for d in dates for i in range(d.start, d.end) if d.day or d.month}
    numbers = [n for n in _find_numbers(tokens) if n.start not in in_date]
    return Words(question, tuple(tokens), tuple(numbers), tuple(dates), tuple(quoted))


def parse_number_token(text: str) -> float | None:
    """'7,169' → 7169, '$40' → 40, '40%' → 40, '4th' → 4, '-3' → -3; None for anything else."""
    m = re.fullmatch(r"([-−–]?)[$€£]?(\d[\d,]*(?:\.\d+)?)%?", text)
    if m:
        value = float(m.group(2).replace(",", ""))
        return -value if m.group(1) else value
    m = re.fullmatch(r"(\d+)(?:st|nd|rd|th)", text)
    return float(m.group(1)) if m else None


def _find_numbers(tokens: list[Token]) -> list[NumberMention]:
    found: list[NumberMention] = []
    i = 0
    while i < len(tokens):
        text = tokens[i].text
        value = parse_number_token(text)
        if value is not None and value < 0 and found and found[-1].end == i:
            value = -value   # "3 –5": a dash after a number joins a range, it is no sign
        if value is not None:
            ordinal = bool(re.fullmatch(r"\d+(st|nd|rd|th)", text))
            year = bool(re.fullmatch(r"1\d{3}|20\d{2}", text))
            found.append(NumberMention(value, i, i + 1, ordinal, year))
            i += 1
        elif text in ORDINAL_WORDS:
            found.append(NumberMention(float(ORDINAL_WORDS[text]), i, i + 1, ordinal=True))
            i += 1
        elif text in UNITS and not (text == "one" and _next(tokens, i) in {"of"}):
            value, j = _number_words(tokens, i)
            found.append(NumberMention(float(value), i, j))
            i = j
        else:
            i += 1
    return [_signed(n, tokens) for n in found]


def _signed(number: NumberMention, tokens: list[Token]) -> NumberMention:
    """"minus 3", "negative four": the word before a number is its sign, and part of it."""
    at = number.start - 1
    if at < 0 or tokens[at].text not in _NEGATIVE_WORDS or number.ordinal or number.value < 0:
        return number
    return NumberMention(-number.value, at, number.end)


def _next(tokens: list[Token], i: int) -> str:
    return tokens[i + 1].text if i + 1 < len(tokens) else ""


def _number_words(tokens: list[Token], i: int) -> tuple[int, int]:
    """Read 'twenty five', 'a dozen', 'two hundred' starting at token i."""
    total, current, j = 0, 0, i
    while j < len(tokens) and (tokens[j].text in UNITS or tokens[j].text == "-"):
        word = tokens[j].text
        if word == "-":
            j += 1
            continue
        value = UNITS[word]
        if word in _MULTIPLIERS:   # "two dozen" is 24; "a dozen", with no number before, 12
            current = max(current, 1) * value
            if value > 100:
                total, current = total + current, 0
        else:
            current += value
        j += 1
    return total + current, j


def _find_dates(tokens: list[Token]) -> list[DateMention]:
    found: list[DateMention] = []
    i = 0
    while i < len(tokens):
        mention = _date_at(tokens, i)
        if mention:
            found.append(mention)
            i = mention.end
        else:
            i += 1
    return found


def _int(text: str) -> int | None:
    return int(text) if text.isdigit() else None


def _year(text: str) -> int | None:
    value = _int(text)
    return value if value is not None and 1000 <= value <= 2100 and len(text) == 4 else None


def _day(text: str) -> int | None:
    m = re.fullmatch(r"(\d{1,2})(?:st|nd|rd|th)?", text)
    return int(m.group(1)) if m and 1 <= int(m.group(1)) <= 31 else None


def _date_at(tokens: list[Token], i: int) -> DateMention | None:
    text = tokens[i].text
    m = re.fullmatch(r"(\d{4})-(\d{2})-(\d{2})", text)
    if m:
        return DateMention(int(m.group(1)), int(m.group(2)), int(m.group(3)), i, i + 1)
    m = re.fullmatch(r"(\d{1,2})/(\d{1,2})/(\d{2,4})", text)
    if m:  # day/month/year, as written outside the US; month/day when day > 12 says so
        a, b, y = int(m.group(1)), int(m.group(2)), int(m.group(3))
        day, month = (b, a) if b > 12 else (a, b)
        year = y + 2000 if y < 100 else y
        if 1 <= month <= 12:
            return DateMention(year, month, day, i, i + 1)
    words = [t.text for t in tokens[i : i + 4]] + ["", "", "", ""]
    if text in MONTHS:  # "march", "march 2025", "march 3", "march 3, 2025"
        month = MONTHS[text]
        j, day, year = i + 1, None, None
        if _day(words[1]) and not _year(words[1]):
            day, j = _day(words[1]), j + 1
            if words[2] == ",":
                j += 1
        if j < len(tokens) and _year(tokens[j].text):
            year, j = _year(tokens[j].text), j + 1
        if text in _AMBIGUOUS_MONTHS and not (day or year):
            return None
        return DateMention(year, month, day, i, j)
    gap = 1 if words[1] == "of" else 0
    if _day(text) and words[1 + gap] in MONTHS:  # "3 march", "3rd of march 2025"
        j, year = i + 2 + gap, None
        if j < len(tokens) and _year(tokens[j].text):
            year, j = _year(tokens[j].text), j + 1
        return DateMention(year, MONTHS[words[1 + gap]], _day(text), i, j)
    if _year(text):
        return DateMention(_year(text), None, None, i, i + 1)
    return None
