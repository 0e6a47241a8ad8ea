"""retype: step 3 of loading — the staging table's columns typed, cleaned and written as TABLE.

DuckDB's types are kept; a text column whose every real cell is a clean number, date or boolean
is retyped; other text columns get typed views ("7,169" → 7169) where most cells parse. Each
distinct text is handled once, in Python, and a small mapping table joined back gives TABLE.
"""

from __future__ import annotations

import datetime
import functools
import re
import unicodedata
from collections.abc import Callable
from dataclasses import dataclass, field

from . import values
from .table import ROW, TABLE, VALUE_CAP, ColumnRead, Con, ReadReport, ident, literal
from .totals import find_totals

VIEW_SHARE = 0.7             # share of a text column's real cells that must parse to get a view


VIEW_DISTINCT_CAP = 50_000   # above this many distinct texts, views are skipped (parsing cost)


ENUM_MAX = 10_000            # text columns with at most this many labels are stored as ENUMs


_NAME_MAX = 60         # longest clean column name


_TRANSLIT = str.maketrans({
    "ß": "ss", "æ": "ae", "Æ": "ae", "ø": "o", "Ø": "o", "œ": "oe", "Œ": "oe", "ł": "l",
    "Ł": "l", "đ": "d", "Đ": "d", "ð": "d", "Ð": "d", "þ": "th", "Þ": "th", "ı": "i",
    "%": " pct ", "&": " and ", "#": " num ",
})


def clean_name(header: str, position: int) -> str:
    """A lowercase identifier for a header: "Price (€)" → "price"; "" → "column_3" (1-based).

    Latin letters lose their accents; other scripts are dropped. Runs of other characters become
    one underscore, so a clean name never holds "__" (which marks views) and never equals ROW.
    """
    text = unicodedata.normalize("NFKD", header.translate(_TRANSLIT))
    text = text.encode("ascii", "ignore").decode().lower()
    name = re.sub(r"[^a-z0-9]+", "_", text).strip("_")[:_NAME_MAX].rstrip("_")
    if not name:
        return f"column_{position}"
    return f"c_{name}" if name[0].isdigit() else name


def clean_names(headers: list[str]) -> list[str]:
    """Clean names for a header row, repeats numbered: "name", "name" → "name", "name_2"."""
    taken: set[str] = set()
    names = []
    for position, header in enumerate(headers, 1):
        base = name = clean_name(header, position)
        suffix = 2
        while name in taken:
            name = f"{base}_{suffix}"
            suffix += 1
        taken.add(name)
        names.append(name)
    return names


_NUMBER_TYPES = ("TINYINT", "SMALLINT", "INTEGER", "BIGINT", "HUGEINT", "UTINYINT", "USMALLINT",
                 "UINTEGER", "UBIGINT", "UHUGEINT", "FLOAT", "DOUBLE", "DECIMAL")


INTEGER_TYPES = _NUMBER_TYPES[:10]


_KINDS = {**dict.fromkeys(_NUMBER_TYPES, "number"), "BOOLEAN": "bool", "DATE": "date",
          **dict.fromkeys(("TIMESTAMP", "TIMESTAMP_S", "TIMESTAMP_MS", "TIMESTAMP_NS",
                           "TIMESTAMP WITH TIME ZONE"), "date")}


_VIEW_TYPES = {"number": "DOUBLE", "number2": "DOUBLE", "date": "DATE", "year": "BIGINT"}


VIEW_KINDS = {"number": "number", "number2": "number", "date": "date", "year": "number"}


_HAS_DIGIT = re.compile(r"[0-9]")
# A code such as "HF-20074" or "SKU_118": letters joined to digits. Its digits number rows or
# things, so they get no number, date or year view (a parcel id is no measure).
_CODE = re.compile(r"[A-Za-z]{1,6}[-_/#.]?[0-9]{2,}[A-Za-z]?")


# Strict shapes for retyping a text column whose every real cell is a clean value. Valid both as
# Python and as RE2 (DuckDB) patterns. No leading zeros, so codes like "02139" stay text; at most
# 18 digits, so every integer fits a BIGINT.
_INT_RE = re.compile(r"[-+]?(0|[1-9][0-9]{0,17})")


_FLOAT_RE = re.compile(r"[-+]?((0|[1-9][0-9]*)(\.[0-9]*)?|\.[0-9]+)([eE][-+]?[0-9]+)?")


_DATE_RE = re.compile(r"([0-9]{4})-([0-9]{2})-([0-9]{2})")


_STAMP_RE = re.compile(r"([0-9]{4})-([0-9]{2})-([0-9]{2})[ T]([0-9]{2}):([0-9]{2})"
                       r"(?::([0-9]{2})(?:\.([0-9]{1,9}))?)?")


def _to_int(text: str) -> int | None:
    return int(text) if _INT_RE.fullmatch(text) else None


def _to_float(text: str) -> float | None:
    return float(text) if _FLOAT_RE.fullmatch(text) else None


def _to_date(text: str) -> datetime.date | None:
    m = _DATE_RE.fullmatch(text)
    try:
        return datetime.date(*map(int, m.groups())) if m else None
    except ValueError:   # "2001-02-30"
        return None


def _to_stamp(text: str) -> datetime.datetime | None:
    m = _STAMP_RE.fullmatch(text)
    if not m:
        return None
    y, mo, d, h, mi, sec, frac = m.groups()
    try:
        return datetime.datetime(int(y), int(mo), int(d), int(h), int(mi), int(sec or 0),
                                 int((frac or "0")[:6].ljust(6, "0")))
    except ValueError:
        return None


def _to_bool(text: str) -> bool | None:
    return {"true": True, "false": False}.get(text.lower())


def _sql_cast(pattern: re.Pattern, sql_type: str) -> str:
    # CASE, not AND: DuckDB then casts only the cells that have the shape.
    return (f"CASE WHEN regexp_full_match({{e}}, {literal(pattern.pattern)}) "
            f"THEN TRY_CAST({{e}} AS {sql_type}) END")


@dataclass(frozen=True)
class _Retype:
    """One way a text column can be retyped: a Python converter for its distinct texts, the same
    in SQL for columns too varied to convert in Python ({e} = the text), and how to say it."""

    kind: str
    sql_type: str
    convert: Callable[[str], object]
    sql: str
    how: str = ""


# Clean values, tried first and in order: a column of them needs no reading choice.
_STRICT = (
    _Retype("number", "BIGINT", _to_int, _sql_cast(_INT_RE, "BIGINT")),
    _Retype("number", "DOUBLE", _to_float, _sql_cast(_FLOAT_RE, "DOUBLE")),
    _Retype("date", "DATE", _to_date, _sql_cast(_DATE_RE, "DATE")),
    _Retype("date", "TIMESTAMP", _to_stamp, _sql_cast(_STAMP_RE, "TIMESTAMP")),
    _Retype("bool", "BOOLEAN", _to_bool,
            "CASE lower({e}) WHEN 'true' THEN true WHEN 'false' THEN false END"),
)


@dataclass(frozen=True)
class Hints:
    """What the file as a whole says about its numbers and dates, for columns that do not."""

    decimal: str | None = None      # "." or ",", from the reader's look at the whole file
    dayfirst: bool | None = None
    forced: bool = False            # the decimal mark was a person's choice: no column decides


def _retypes(texts: list[str], hints: Hints) -> tuple[_Retype, ...]:
    """The strict retypes, then formatted amounts and numeric dates read the way this column's
    own cells settle it (else the file's way, else the common default)."""
    mark = (hints.forced and hints.decimal) or values.decimal_mark(texts) or hints.decimal or "."
    order = values.numeric_date_order(texts)
    dayfirst = order if order is not None else bool(hints.dayfirst)
    # with a decimal comma, "1.234" is a thousand and more: the plain float reading is wrong
    strict = _STRICT if mark == "." else tuple(r for r in _STRICT if r.convert is not _to_float)
    return strict + (
        _Retype("number", "DOUBLE", functools.partial(values.parse_amount, decimal=mark),
                _amount_sql(mark), _amount_how(texts, mark)),
        _Retype("date", "DATE", functools.partial(values.parse_numeric_date, dayfirst=dayfirst),
                _numeric_date_sql(dayfirst),
                ("day first" if dayfirst else "month first")
                + ("" if order is not None else " (guessed: no cell settles it)")),
    )


def _amount_how(texts: list[str], mark: str) -> str:
    """The formatting an amount column carried, in words, for the report."""
    sample = " ".join(texts[:200])
    found = [("decimal comma", mark == ","), ("currency", bool(_MONEY.search(sample))),
             ("brackets for negatives", "(" in sample), ("percent", "%" in sample)]
    return ", ".join(what for what, present in found if present) or "thousands separators"


_MONEY = re.compile(r"[$€£¥₹₽₩₺₪₴₦฿]|\b[A-Z]{3}\b")


def _amount_sql(mark: str) -> str:
    """values.parse_amount in SQL, for columns too varied to convert in Python."""
    pattern = literal(values.amount_pattern(mark))
    part = "regexp_extract({e}, " + pattern + ", {g})"
    groups = {name: part.replace("{g}", str(g)) for g, name in enumerate(
        ("open", "sign", "sign2", "num", "percent", "trail", "close"), 1)}
    digits = f"regexp_replace({groups['num']}, '[^0-9{re.escape(mark)}]', '', 'g')"
    number = f"TRY_CAST(replace({digits}, '{mark}', '.') AS DOUBLE)"
    negative = (f"({groups['open']} <> '' OR {groups['trail']} <> '' OR "
                f"{groups['sign']} IN ('-', '−') OR {groups['sign2']} IN ('-', '−'))")
    fits = (f"regexp_full_match({{e}}, {pattern}) AND ({groups['open']} = '') = "
            f"({groups['close']} = '') AND NOT ({groups['sign']} <> '' AND {groups['sign2']} <> '')")
    return f"CASE WHEN {fits} THEN CASE WHEN {negative} THEN -{number} ELSE {number} END END"


def _numeric_date_sql(dayfirst: bool) -> str:
    """values.parse_numeric_date in SQL."""
    pattern = literal(r"([0-9]{1,2})([-/.])([0-9]{1,2})[-/.]([0-9]{4})")
    day, month = (1, 3) if dayfirst else (3, 1)
    part = "regexp_extract({e}, " + pattern + ", {g})"
    iso = (f"printf('%s-%02d-%02d', {part.replace('{g}', '4')}, "
           f"TRY_CAST({part.replace('{g}', str(month))} AS INT), "
           f"TRY_CAST({part.replace('{g}', str(day))} AS INT))")
    return (f"CASE WHEN regexp_full_match({{e}}, {pattern}) AND {part.replace('{g}', '2')} IN "
            f"('-', '/', '.') THEN TRY_CAST({iso} AS DATE) END")


# values.PLACEHOLDERS as a DuckDB list literal (this module's constants, not user text).
_PLACEHOLDERS = "[" + ", ".join(literal(p) for p in sorted(values.PLACEHOLDERS)) + "]"


# The columns of the mapping table `_m`: which column, which raw text, and what it becomes.
_MAPPED = {"col": "INTEGER", "k": "VARCHAR", "text": "VARCHAR", **_VIEW_TYPES,
           **{f"as_{r.sql_type}": r.sql_type for r in _STRICT}}


@dataclass
class Plan:
    """How one base column of TABLE is made, and what is known of it before TABLE exists."""

    header: str
    name: str
    kind: str
    expr: str                       # SQL giving the column's cells, over _src and its join
    alias: str | None = None        # the mapping rows joined for this column, if any …
    join: str = ""                  # … and how they are joined
    nonnull: int = 0
    distinct: int = 0
    values: tuple[str, ...] = ()
    views: tuple[str, ...] = ()     # "number", "number2", "date", "year" columns it carries
    parsed: dict[str, float] = field(default_factory=dict)   # view → share of cells it read
    how: str = ""                   # the reading choice a retyped column needed, in words
    missing: tuple[int, tuple[str, ...]] = (0, ())   # cells spelled as missing, and spellings


def build(con: Con, headers: list[str], report: ReadReport,
          forced: bool = False) -> tuple[list[Plan], int]:
    """Staging table in; TABLE out, with how each column was made and the row count. How each
    column was read goes into `report`, whose decimal mark also guides columns that do not
    settle their own; with `forced` (a person chose it), every column."""
    hints = Hints(report.decimal_mark, report.decimal_mark == "," or None, forced)
    described = con.execute("DESCRIBE _src").fetchall()
    headers = [values.clean_cell(h) or "" for h in headers]
    headers = (headers + [""] * len(described))[: len(described)]
    names = clean_names(headers)
    refs = [f"_src.{ident(row[0])}" for row in described]
    kinds = [_KINDS.get(row[1].split("(")[0]) for row in described]
    typed = [i for i, kind in enumerate(kinds) if kind]
    texts = [i for i, kind in enumerate(kinds) if not kind]
    plans: dict[int, Plan] = {}
    if typed:
        counts = con.execute(f"SELECT {', '.join(f'count({refs[i]})' for i in typed)} FROM _src")
        for i, nonnull in zip(typed, counts.fetchone(), strict=True):
            plans[i] = Plan(headers[i], names[i], kinds[i], refs[i], nonnull=nonnull)
    mapping: dict[str, list] = {name: [] for name in _MAPPED}
    raw = {i: _as_text(refs[i], described[i][1]) for i in texts}
    for i, (distinct, rows) in _value_counts(con, raw).items():
        if distinct > VIEW_DISTINCT_CAP:
            plans[i] = _varied_text_plan(con, headers[i], names[i], raw[i], hints)
        else:
            views = described[i][1] in ("VARCHAR", "JSON") or described[i][1].startswith("ENUM")
            plans[i] = _text_plan(i, headers[i], names[i], raw[i], rows, views, mapping,
                                  hints)
    ordered = [plans[i] for i in range(len(described))]
    # A column with neither a header nor a cell is spreadsheet padding, not data.
    ordered = [p for p in ordered if p.header or p.nonnull] or ordered[:1]
    _write_table(con, ordered, mapping)
    row_count = con.execute(f"SELECT count(*) FROM {TABLE}").fetchone()[0]
    row_count -= _leave_out_totals(con, ordered, row_count, report)
    _categories_as_enums(con, ordered, row_count)
    report.columns = [read for plan in ordered for read in _reads(plan)]
    report.guesses += [note for plan in ordered for note in _choices(plan)]
    return ordered, row_count


def _choices(plan: Plan) -> list[str]:
    """What a reader should know about how a typed column's cells were read, in words."""
    said = []
    if plan.kind == "date" and "first" in plan.how:
        said.append(f"{plan.header or plan.name}: dates read {plan.how}")
    cells, spellings = plan.missing
    if cells:
        shown = ", ".join(f'"{s}"' for s in spellings)
        said.append(f"{plan.header or plan.name}: {cells} cell{'s' if cells > 1 else ''} "
                    f"written {shown} read as missing")
    return said


def _reads(plan: Plan) -> list[ColumnRead]:
    """How a column was read: the column itself, then each typed view with its parse share."""
    reads = [ColumnRead(plan.header, plan.name, plan.kind, how=plan.how)]
    return reads + [ColumnRead(plan.header, f"{plan.name}__{view}", VIEW_KINDS[view], share)
                    for view, share in plan.parsed.items()]


def _as_text(ref: str, sql_type: str) -> str:
    """A column of any other type as text: JSON values unquoted, nested values as JSON text."""
    if sql_type == "JSON":
        return f"json_extract_string({ref}, '$')"
    if sql_type.startswith(("STRUCT", "MAP", "UNION")) or sql_type.endswith("]"):
        return f"CAST(to_json({ref}) AS VARCHAR)"
    return f"CAST({ref} AS VARCHAR)"


def _value_counts(con: Con,
                  raw: dict[int, str]) -> dict[int, tuple[int, list[tuple[str, int, int]]]]:
    """For each text column: its number of distinct texts and, if that is at most
    VIEW_DISTINCT_CAP, every (text, cells, first ROW), most frequent first. One query for all."""
    found: dict[int, tuple[int, list]] = {i: (0, []) for i in raw}
    if not raw:
        return found
    parts = [f"SELECT {i} AS col, v, n, first, count(*) OVER () AS d, "
             "row_number() OVER (ORDER BY n DESC, first) AS k FROM ("
             f"SELECT {expr} AS v, count(*) AS n, min(_src.rowid) AS first FROM _src "
             f"WHERE {expr} IS NOT NULL GROUP BY 1)" for i, expr in raw.items()]
    rows = con.execute(f"SELECT col, v, n, first, d FROM ({' UNION ALL '.join(parts)}) "
                       "WHERE d <= ? OR k = 1 ORDER BY col, k", [VIEW_DISTINCT_CAP]).fetchall()
    for col, v, n, first, d in rows:
        if d <= VIEW_DISTINCT_CAP:
            found[col][1].append((v, n, first))
        found[col] = (d, found[col][1])
    return found


def _text_plan(i: int, header: str, name: str, raw: str, rows: list[tuple[str, int, int]],
               views: bool, mapping: dict[str, list], hints: Hints) -> Plan:
    """A text column of at most VIEW_DISTINCT_CAP distinct texts, decided in Python on those
    texts: trimmed, retyped if every real cell is a clean value, else given typed views. What a
    raw text becomes is added to `mapping` (parallel lists), joined when TABLE is written."""
    clean = {text: values.clean_cell(text) for text, _, _ in rows}
    counts: dict[str, list[int]] = {}        # clean text → [cells, first ROW]
    for text, n, first in rows:
        if (c := clean[text]) is not None:
            seen = counts.setdefault(c, [0, first])
            seen[0] += n
            seen[1] = min(seen[1], first)
    order = sorted(counts, key=lambda c: (-counts[c][0], counts[c][1]))
    real = [c for c in order if not values.is_placeholder(c)]
    alias = f"_m{i}"
    join = f"LEFT JOIN _m AS {alias} ON {alias}.col = {i} AND {alias}.k = {raw}"
    # Placeholders ("—", "n/a", "NA") are missing values: they do not keep a number column text.
    for retype in _retypes(real, hints):
        converted = _convert_all(retype.convert, real)
        if converted is not None:
            keys = [text for text, c in clean.items() if c in converted]
            column = f"as_{retype.sql_type}"
            _add_mapping(mapping, i, keys, {column: [converted[clean[k]] for k in keys]})
            spelled = [c for c in order if c not in converted]   # placeholders, most used first
            return Plan(header, name, retype.kind, f"{alias}.{column}", alias, join,
                        nonnull=sum(counts[c][0] for c in real), how=retype.how,
                        missing=(sum(counts[c][0] for c in spelled), tuple(spelled[:3])))
    weights = [(c, counts[c][0]) for c in order]
    found = derive_views(weights) if views else {}
    # a placeholder in a text column is a missing cell too, so "no sex recorded" finds it
    plan = Plan(header, name, "text", raw, nonnull=sum(counts[c][0] for c in real),
                distinct=len(real), values=tuple(real[:VALUE_CAP]), views=tuple(found),
                parsed={view: _share(parsed, weights) for view, parsed in found.items()})
    if found or len(real) < len(order) or any(text != c for text, c in clean.items()):
        keys = [text for text, c in clean.items() if c is not None]
        cells = [clean[k] for k in keys]
        texts = [None if values.is_placeholder(c) else c for c in cells]
        _add_mapping(mapping, i, keys, {"text": texts, **{
            view: [parsed.get(c) for c in cells] for view, parsed in found.items()}})
        plan.expr, plan.alias, plan.join = f"{alias}.text", alias, join
    return plan


def _share(parsed: dict[str, object], weights: list[tuple[str, int]]) -> float:
    """The share of a column's real cells that a view parsed."""
    real = [(text, n) for text, n in weights if not values.is_placeholder(text)]
    total = sum(n for _, n in real)
    return sum(n for text, n in real if text in parsed) / total if total else 0.0


def _convert_all(convert, texts: list[str]) -> dict[str, object] | None:
    """Every text converted, or None as soon as one does not convert (or there are none)."""
    converted = {}
    for text in texts:
        if (value := convert(text)) is None:
            return None
        converted[text] = value
    return converted or None


def _add_mapping(mapping: dict[str, list], col: int, keys: list[str],
                 cells: dict[str, list]) -> None:
    """Rows for column `col`: raw text → its clean text, typed value or views; None elsewhere."""
    for name, column in mapping.items():
        column.extend([col] * len(keys) if name == "col" else keys if name == "k" else
                      cells.get(name, [None] * len(keys)))


def _varied_text_plan(con: Con, header: str, name: str, raw: str, hints: Hints) -> Plan:
    """A text column with more than VIEW_DISTINCT_CAP distinct texts (ids, free text): trimmed,
    placeholders made missing and retyped in SQL, profiled from its distinct texts, and given no
    views (parsing each of its texts in Python would cost seconds). Trimming and the placeholder
    test are applied to each row only if some distinct text needs them."""
    con.execute(f"CREATE OR REPLACE TABLE _vc AS SELECT raw, n, first, {_trimmed('raw')} AS v, "
                f"coalesce(list_contains({_PLACEHOLDERS}, lower({_trimmed('raw')})), false) "
                "AS missing "
                f"FROM (SELECT {raw} AS raw, count(*) AS n, min(_src.rowid) AS first FROM _src "
                "WHERE raw IS NOT NULL GROUP BY 1)")
    trimmed, missing = con.execute(
        "SELECT bool_or(v IS DISTINCT FROM raw), bool_or(missing) FROM _vc").fetchone()
    real = "FROM _vc WHERE v IS NOT NULL AND NOT missing"
    top = [v for (v,) in con.execute(f"SELECT v {real} GROUP BY v ORDER BY sum(n) DESC, "
                                     "min(first) LIMIT ?", [VALUE_CAP]).fetchall()]
    distinct, nonnull = con.execute(f"SELECT count(DISTINCT v), coalesce(sum(n), 0) {real}"
                                    ).fetchone()
    text = _trimmed(raw) if trimmed else raw
    # The most frequent texts rule most types out at once; SQL checks the others on every text.
    for retype in _retypes(top, hints):
        if not top or _convert_all(retype.convert, top) is None:
            continue
        misfits = f"SELECT count(*) {real} AND ({retype.sql.replace('{e}', 'v')}) IS NULL"
        if not con.execute(misfits).fetchone()[0]:
            return Plan(header, name, retype.kind, retype.sql.replace("{e}", text),
                        nonnull=nonnull, how=retype.how)
    if missing:
        text = f"CASE WHEN list_contains({_PLACEHOLDERS}, lower({text})) THEN NULL ELSE {text} END"
    return Plan(header, name, "text", text, nonnull=nonnull, distinct=distinct,
                values=tuple(top))


def _trimmed(expr: str) -> str:
    """SQL for a text without outer whitespace or NBSP; None if nothing is left."""
    return f"NULLIF(trim({expr}, {literal(values.SPACES)}), '')"


def derive_views(counts: list[tuple[str, int]]) -> dict[str, dict[str, object]]:
    """Typed views of a text column from its (text, cell count) pairs: view → {text: value}.

    A view exists when at least VIEW_SHARE of the real (non-placeholder) cells parse. A column
    of dates gets only the date view: its day as a "number" would mislead.
    """
    real = [(text, n) for text, n in counts if not values.is_placeholder(text)]
    total = sum(n for _, n in real)
    if not total:
        return {}
    digits = [(text, n) for text, n in real                                 # no digit, no value
              if _HAS_DIGIT.search(text) and not _CODE.fullmatch(text)]
    dayfirst = values.numeric_date_order([text for text, _ in digits])
    parsed: dict[str, dict[str, object]] = {"number": {}, "number2": {}, "date": {}, "year": {}}
    for text, _ in digits:
        numbers = values.parse_numbers(text)
        found = {"number": numbers[0] if numbers else None,
                 "number2": numbers[1] if len(numbers) > 1 else None,
                 "date": values.parse_date(text, dayfirst), "year": values.parse_year(text)}
        for view, value in found.items():
            if value is not None:
                parsed[view][text] = value
    weight = dict(real)
    views = {view: found for view, found in parsed.items()
             if sum(weight[t] for t in found) >= VIEW_SHARE * total}
    return {"date": views["date"]} if "date" in views else views


def _write_table(con: Con, plans: list[Plan],
                 mapping: dict[str, list]) -> None:
    """TABLE = ROW, the base columns and their views, in file order; then the staging is dropped."""
    columns = [f"unnest(?::{sql_type}[]) AS {name}" for name, sql_type in _MAPPED.items()]
    con.execute(f"CREATE TABLE _m AS SELECT {', '.join(columns)}", list(mapping.values()))
    selects = [f"_src.rowid AS {ident(ROW)}"]
    for plan in plans:
        selects.append(f"{plan.expr} AS {ident(plan.name)}")
        selects += [f"{plan.alias}.{view} AS {ident(f'{plan.name}__{view}')}"
                    for view in plan.views]
    joins = " ".join(plan.join for plan in plans)
    con.execute(f"CREATE TABLE {TABLE} AS SELECT {', '.join(selects)} FROM _src {joins} "
                "ORDER BY _src.rowid")
    for name in ("_src", "_m", "_vc"):
        con.execute(f"DROP TABLE IF EXISTS {name}")
    _drop_empty_rows(con, plans)
    _stamps_to_dates(con)


def _categories_as_enums(con: Con, plans: list[Plan], row_count: int) -> None:
    """Text columns of repeated labels become ENUMs: filters and groups on them run several
    times faster than on text. The labels are sorted by their bytes, as text is, so that
    comparisons, min/max and ORDER BY give what they give on the text."""
    for i, plan in enumerate(plans):
        if plan.kind != "text" or not 1 < plan.distinct <= min(ENUM_MAX, row_count // 2):
            continue
        ref, enum = ident(plan.name), ident(f"_enum{i}")
        con.execute(f"CREATE TYPE {enum} AS ENUM (SELECT DISTINCT {ref} FROM {TABLE} "
                    f"WHERE {ref} IS NOT NULL ORDER BY {ref})")
        con.execute(f"ALTER TABLE {TABLE} ALTER COLUMN {ref} TYPE {enum}")


def _drop_empty_rows(con: Con, plans: list[Plan]) -> None:
    """Rows without a single cell (",,," lines, blank spreadsheet rows) are dropped."""
    empty = " AND ".join(f"{ident(p.name)} IS NULL" for p in plans)
    if con.execute(f"SELECT count(*) FROM {TABLE} WHERE {empty}").fetchone()[0]:
        _drop_rows(con, empty)


def _drop_rows(con: Con, where: str) -> None:
    """Rows matching `where` leave TABLE, and ROW stays a dense 0-based position among the rows
    kept (so "next" and "previous" still mean the neighbouring row)."""
    row = ident(ROW)
    con.execute(f"CREATE TABLE _kept AS SELECT row_number() OVER (ORDER BY {row}) - 1 AS {row}, "
                f"* EXCLUDE ({row}) FROM {TABLE} WHERE NOT ({where}) ORDER BY {row}")
    con.execute(f"DROP TABLE {TABLE}")
    con.execute(f"ALTER TABLE _kept RENAME TO {TABLE}")


def _leave_out_totals(con: Con, plans: list[Plan], row_count: int, report: ReadReport) -> int:
    """Total and subtotal rows leave TABLE, are reported, and no longer count in the columns'
    profiles; how many left."""
    texts = [p.name for p in plans if p.kind == "text"]
    numbers = [p.name for p in plans if p.kind == "number"]
    found = find_totals(con, texts, numbers, row_count)
    if not found:
        return 0
    rows = ", ".join(map(str, found))
    gone = con.execute(f"SELECT {', '.join(ident(p.name) for p in plans)} FROM {TABLE} "
                       f"WHERE {ident(ROW)} IN ({rows})").fetchall()
    _drop_rows(con, f"{ident(ROW)} IN ({rows})")
    first_data_line = (report.header_line or 1) + 1
    report.skip("total", [first_data_line + row for row in found])
    for i, plan in enumerate(plans):
        cells = [r[i] for r in gone if r[i] is not None]
        plan.nonnull -= len(cells)
        if plan.kind == "text" and cells:
            _forget_values(con, plan, {str(c) for c in cells})
    return len(found)


def _forget_values(con: Con, plan: Plan, texts: set[str]) -> None:
    """Labels only the left-out rows had are no longer values of the column."""
    ref = ident(plan.name)
    left = {v for (v,) in con.execute(f"SELECT DISTINCT CAST({ref} AS VARCHAR) FROM {TABLE} "
                                      f"WHERE CAST({ref} AS VARCHAR) IN (SELECT unnest(?))",
                                      [sorted(texts)]).fetchall()}
    lost = texts - left
    plan.distinct -= len(lost)
    plan.values = tuple(v for v in plan.values if v not in lost)


def _stamps_to_dates(con: Con) -> None:
    """Timestamp columns that are all at midnight become dates: Excel and many CSV exports
    write plain dates that way, and "2001-05-06" reads better than "2001-05-06 00:00:00"."""
    stamps = [name for name, sql_type, *_ in con.execute(f"DESCRIBE {TABLE}").fetchall()
              if sql_type.startswith("TIMESTAMP") and "TIME ZONE" not in sql_type]
    if not stamps:
        return
    checks = ", ".join(f"coalesce(bool_and(date_trunc('day', {ident(s)}) = {ident(s)}), false)"
                       for s in stamps)
    found = con.execute(f"SELECT {checks} FROM {TABLE}").fetchone()
    for name, midnight in zip(stamps, found, strict=True):
        if midnight:
            con.execute(f"ALTER TABLE {TABLE} ALTER COLUMN {ident(name)} TYPE DATE")
