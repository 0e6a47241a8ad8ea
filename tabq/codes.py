"""codes: columns that write well-known things by their codes, and the names a question says.

A column of US state codes (OH, IL), of ISO 3166 country codes (DK, DNK) or of country names
holds things a question names in words ("in Ohio", "not in the United States"). `names_of`
gives, for such a column, each name (normalised, and as its stems) and the value it stands for.
The codes and names come from the pycountry package (ISO 3166-1 countries, ISO 3166-2
subdivisions, so US-OH is Ohio), what a country's people are called ("Danish") from the
pycountryinfo package's data; nothing here is typed by hand.

It costs nothing for other columns: a column is looked up only when most of its values look
like codes or names (`_plausible`), and pycountry's tables are loaded once, on first need
(countries about 10 ms and their people's names about 40 ms, subdivisions about 70 ms).
"""

from __future__ import annotations

import json
from collections import Counter
from functools import lru_cache

from .table import Column
from .text import normalise, split_words, stem

MIN_SHARE = 0.8         # of a column's distinct values that must be known codes or names
MIN_KNOWN = 2           # known values, at least: one value says nothing of its kind
MAX_VALUES = 400        # more distinct values than there are countries: not a column of them
CODE_LETTERS = (2, 3)   # the lengths of the codes read


@lru_cache(maxsize=1024)
def names_of(col: Column) -> dict[str, str]:
    """Each name a question may say (normalised text, and its stems joined by spaces) → the
    column's value it stands for; {} when the column holds no known codes or names. Kept per
    column: each question asks again. Callers must not change the dict."""
    values = [str(v) for v in col.values]
    if col.kind != "text" or col.view is not None or not _plausible(values):
        return {}
    best: dict[str, tuple[str, ...]] = {}
    for kind in (_countries(), *_subdivision_kinds(values)):
        found = {v: kind[_key(v)] for v in values if _key(v) in kind}
        if len(found) >= MIN_KNOWN and len(found) >= MIN_SHARE * len(values) \
                and len(found) > len(best):
            best = found
    return _spoken(best)


def _plausible(values: list[str]) -> bool:
    """Whether a column may hold codes or names of places: few values, mostly letters."""
    if not MIN_KNOWN <= len(values) <= MAX_VALUES:
        return False
    lettered = sum(1 for v in values if v.replace(" ", "").replace(",", "").isalpha())
    return lettered >= MIN_SHARE * len(values)


def _key(value: str) -> str:
    return normalise(value)


def _spoken(found: dict[str, tuple[str, ...]]) -> dict[str, str]:
    """The names of each value, each under its text and its stems; a name two values share
    (Dominica, the Dominican Republic, "Dominican") is left out, as it says neither."""
    spoken: dict[str, set[str]] = {}
    for value, names in found.items():
        for name in names:
            words = split_words(normalise(name))
            for key in {" ".join(words), " ".join(stem(w) for w in words)}:
                if key and key != _key(value):
                    spoken.setdefault(key, set()).add(value)
    return {key: next(iter(vals)) for key, vals in spoken.items() if len(vals) == 1}


@lru_cache(maxsize=1)
def _countries() -> dict[str, tuple[str, ...]]:
    """A country's codes and names (ISO 3166-1) → its names and what its people are called
    ("Danish" for Denmark)."""
    import pycountry
    demonyms = _demonyms()
    kind: dict[str, tuple[str, ...]] = {}
    for country in pycountry.countries:
        names = tuple(dict.fromkeys(n for n in (
            getattr(country, "common_name", None), country.name,
            getattr(country, "official_name", None),
            *demonyms.get(country.alpha_2, ())) if n))
        for key in (country.alpha_2, country.alpha_3, *names):
            kind.setdefault(_key(key), names)
    return kind


def _demonyms() -> dict[str, tuple[str, ...]]:
    """Per ISO alpha-2 code, what the country's people are called, from the data file of the
    pycountryinfo package. Only its data package (empty) is imported: its countryinfo module
    imports requests, a web client tabq has no use for. "Antiguan or Barbudan" is two."""
    from importlib import resources
    try:
        from pycountryinfo import data as country_data
        text = (resources.files(country_data) / "countries.json").read_text("utf-8")
        entries = json.loads(text)
    except (ModuleNotFoundError, OSError, ValueError):
        return {}
    demonyms = {}
    for entry in entries:
        code = (entry.get("iso_codes") or {}).get("alpha_2")
        said = entry.get("nationality")
        if code and isinstance(said, str) and said:
            demonyms[code] = tuple(part.strip() for part in said.split(" or ") if part.strip())
    return demonyms


def _subdivision_kinds(values: list[str]) -> list[dict[str, tuple[str, ...]]]:
    """The subdivisions (ISO 3166-2) of the countries whose codes the values best cover: a
    column of OH, IL, WI is US states. Read only when the values look like such codes."""
    codes = [_key(v) for v in values]
    if sum(1 for c in codes if len(c) in CODE_LETTERS) < MIN_SHARE * len(codes):
        return []
    by_country = _subdivisions()
    cover = Counter(country for code in set(codes)
                    for country in by_country.get("code:" + code, ()))
    return [by_country[country] for country, _ in cover.most_common(2)]


@lru_cache(maxsize=1)
def _subdivisions() -> dict[str, dict]:
    """Per country code, its subdivisions' codes and names → names; and per subdivision code
    (the part after the country's, "oh" of US-OH) under "code:", the countries using it."""
    import pycountry
    by: dict = {}
    for sub in pycountry.subdivisions:
        country, _, code = sub.code.partition("-")
        kind = by.setdefault(country, {})
        kind[_key(code)] = (sub.name,)
        kind.setdefault(_key(sub.name), (sub.name,))
        by.setdefault("code:" + _key(code), set()).add(country)
    return by
