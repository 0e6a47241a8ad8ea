"""rules: what each composition of the grammar means, one specification per rule alias.

`grammar/question.lark` says which compositions exist; each alternative's alias names a `Spec`
here, registered by `@specify` on the alternative's builder. The spec holds everything known
about the rule: the builder that makes its logical form (or refuses an ill-typed one), which
sub-forms and slot fillings it can take, and what the features need (its fragments of meaning,
its column's role, flags). `derive.rules()` raises when the grammar and the specs disagree, so
a new composition is one grammar line plus one decorated builder.
"""

from __future__ import annotations

import datetime
from collections.abc import Callable
from dataclasses import dataclass, replace
from typing import Any

from . import logic as L

# Operator slots and the values `analyse` offers for each, whatever the question says (the
# lexical features decide which one a word asks for).
OPERATORS = {
    "CMP": ("gt", "lt", "ge", "le"), "AGG": ("sum", "avg", "min", "max", "median"),
    "DIR": ("max", "min"), "POS": ("first", "last"), "STEP": ("next", "prev"),
    "COUNT": ("count",), "COUNTD": ("count_distinct",), "DISTINCT": ("distinct",),
    "NOT": ("not",), "OR": ("or",), "MISSING": ("missing",), "PRESENT": ("present",),
    "ALL": ("all",), "YESNO": ("yes_no",), "GROUP": ("group",),
    "SHARE": ("percent", "fraction"), "UNIT": ("month", "year", "weekday"),
}
# The operator slots whose value is a fragment of meaning, and the fragments it may stand for
# ("{DIR}" is the atom's value, as in `Spec.fragments`): the chart ranks such an atom by the
# best of them before any rule applies it.
OPERATOR_FRAGMENTS = {"AGG": ("{AGG}",), "DIR": ("dir:{DIR}", "extreme:{DIR}"),
                      "CMP": ("cmp:{CMP}",), "POS": ("{POS}",), "STEP": ("{STEP}",),
                      "SHARE": ("share:{SHARE}",), "UNIT": ("per:{UNIT}",)}

Builder = Callable[..., "L.Form | None"]


@dataclass(frozen=True)
class Spec:
    """Everything known about one grammar rule alias.

    `build(a, *values)` takes the question's analysis and one value per symbol of the
    alternative, in order (an atom's value for a slot, a sub-form for `rows`), and returns the
    form or None to refuse it. The chart gives it only sub-forms that `accepts` lets through.
    """

    build: Builder
    # Pieces of meaning the step adds, paired with question words by the lexical features;
    # "{CMP}" is the value of the step's CMP atom (see OPERATOR_FRAGMENTS).
    fragments: tuple[str, ...] = ()
    # What the rule's column does (values, measure, key, filter, datefilter, order), for the
    # column-match features.
    role: str = "other"
    # Which sub-forms the rule may take at all. The chart filters before cutting each side to
    # its beam, so this shapes the candidates; None takes any.
    accepts: Callable[[L.Form], bool] | None = None
    # Which slot fillings can ever build, dropped before any sub-form is tried. Only saves
    # tries: the builder refuses them too (tests/test_analyse_derive.py checks it).
    fits: Callable[..., bool] | None = None
    head: bool = False              # its column is what "how many X" / "which X" names
    aggregating: bool = False       # aggregates its rows: over one picked row it is suspect
    superlative: bool = False       # picks by order: another pick inside is rarely meant
    compares_numbers: bool = False  # a NUMBER against its NUMCOL: outside the range is suspect


SPECS: dict[str, Spec] = {}
# A step of no rule (derive scores a lone atom as a "probe" step) adds nothing.
NO_RULE = Spec(lambda a, *values: None)


def specify(**details: Any) -> Callable[[Builder], Builder]:
    """Register the decorated builder's spec under the builder's name, the grammar alias."""
    def register(build: Builder) -> Builder:
        SPECS[build.__name__] = Spec(build, **details)
        return build
    return register


def spec_of(alias: str) -> Spec:
    """The spec of a rule alias (NO_RULE for a step no rule made)."""
    return SPECS.get(alias, NO_RULE)


# ── what sub-forms and fillings rules take ───────────────────────────────────────────────────
def simple(rows: L.Form) -> bool:
    """A row set picked by one condition on cells (not by position or by another set)."""
    return isinstance(rows, (L.Eq, L.Cmp, L.Between, L.Contains, L.Missing, L.Period,
                             L.DayOfWeek, L.Defined))


def scoped(rows: L.Form) -> bool:
    """A row set not already cut down to picked rows (a superlative, position or neighbour)."""
    return not isinstance(rows, (L.Extreme, L.Position, L.Neighbour))


def _filters_on(rows: L.Rows, col: str) -> bool:
    return isinstance(rows, L.Eq) and rows.col == col


def _two(first: tuple, second: tuple) -> tuple | None:
    """Two values of one column, in a fixed order (the column first), or None."""
    (c1, v1), (c2, v2) = first, second
    if c1 != c2 or v1 == v2:
        return None
    return (c1, *sorted((v1, v2), key=str))


def _count_n(n: float) -> int | None:
    return int(n) if float(n).is_integer() and 2 <= n <= 100 else None


# ── row sets ──────────────────────────────────────────────────────────────────────────────────
@specify()
def all_rows(a, _) -> L.Rows | None:
    return L.All()


@specify(fragments=("eq",))
def has_value(a, entity: tuple) -> L.Rows | None:
    col, value = entity
    return None if value is None else L.Eq(col, value)


@specify()
def team_word(a, defined: L.Defined) -> L.Rows | None:
    return defined   # a team's word for a row set, taught (see definitions.py)


@specify(fragments=("contains",))
def contains(a, entity: tuple) -> L.Rows | None:
    return L.Contains(*entity)


@specify(fragments=("cmp:{CMP}",), role="filter", compares_numbers=True)
def compare(a, col: str, op: str, number: float) -> L.Rows | None:
    return L.Cmp(col, op, number)


@specify(fragments=("cmp:{CMP}",), role="datefilter")
def compare_date(a, col: str, op: str, date) -> L.Rows | None:
    # "after October 2024" is after its last day, "before" before its first; so for a year
    bound = _day(date, last=op in ("gt", "le"))
    return None if bound is None else L.Cmp(col, op, bound)


@specify(fragments=("between",), role="datefilter")
def between_dates(a, col: str, start, end) -> L.Rows | None:
    # "between March and June 2023" runs from March's first day to June's last, both kept
    low, high = _day(start, last=False), _day(end, last=True)
    if low is None or high is None or (start.year, start.month, start.day) == (
            end.year, end.month, end.day):
        return None
    if low > high:
        low, high = _day(end, last=False), _day(start, last=True)
    return L.Between(col, low, high)


def _day(date, last: bool) -> datetime.date | None:
    """The first (or last) day of what a date mention names: a day, a month of a year or a
    year; None for a mention with no year or no real day."""
    if not date.year:
        return None
    month = date.month or (12 if last else 1)
    try:
        if date.month and date.day:
            return datetime.date(date.year, month, date.day)
        if not last:
            return datetime.date(date.year, month, 1)
        following = datetime.date(date.year + month // 12, month % 12 + 1, 1)
        return following - datetime.timedelta(days=1)
    except ValueError:
        return None


# A log that keeps its dates as numbers (month 1-12, day 1-31, a year: `Analysis.date_parts`):
# "before July" is month < 7, "after 20 August" month > 8 or month 8 after day 20, "before June
# 2024" year < 2024 or year 2024 before month 6; compared only as the word before the date says
# (`analyse.ComparedDate.ops`). A date without a year in a log of several years is left out
# (month and day alone would mix the years), as is a year the log has no column for.
@specify(fragments=("cmp:{CMP}",), role="datefilter",
         fits=lambda col, op, date: op in getattr(date, "ops", ()))
def compare_month_day(a, col: str, op: str, date) -> L.Rows | None:
    month, day, year = (a.date_parts.get(p) for p in ("month", "day", "year"))
    if col != month or op not in getattr(date, "ops", ()) or (date.day and not day):
        return None
    if (date.year and not year) or (not date.year and year
                                    and a.table.column(year).distinct > 1):
        return None
    said = [(c, v) for c, v in ((year, date.year), (month, date.month), (day, date.day)) if v]
    return _compare_in_order(said, op)


# "between May and July", "from 1 June to 15 August" in such a log: both ends kept.
@specify(fragments=("between",), role="datefilter",
         fits=lambda col, start, end: "from" in getattr(start, "ops", ())
         and "to" in getattr(end, "ops", ()))
def between_month_days(a, col: str, start, end) -> L.Rows | None:
    if "from" not in getattr(start, "ops", ()) or "to" not in getattr(end, "ops", ()):
        return None
    low = compare_month_day(a, col, "ge", replace(start, ops=("ge",)))
    high = compare_month_day(a, col, "le", replace(end, ops=("le",)))
    if low is None or high is None:
        return None
    if isinstance(low, L.Cmp) and isinstance(high, L.Cmp):   # months alone
        return L.Between(col, low.value, high.value) if low.value < high.value else None
    return L.And(low, high)


def _compare_in_order(parts: list[tuple[str, int]], op: str) -> L.Rows:
    """Parts of a date compared most significant first: (year, month) before (2024, 6) is
    year < 2024, or year 2024 and month < 6."""
    (col, value), rest = parts[0], parts[1:]
    if not rest:
        return L.Cmp(col, op, value)
    strict = "lt" if op in ("lt", "le") else "gt"
    return L.Or(L.Cmp(col, strict, value), L.And(L.Eq(col, value), _compare_in_order(rest, op)))


@specify(fragments=("between",), role="filter", compares_numbers=True)
def between(a, col: str, low: float, high: float) -> L.Rows | None:
    return L.Between(col, min(low, high), max(low, high)) if low != high else None


@specify(fragments=("period",), role="datefilter")
def period(a, col: str, date) -> L.Rows | None:
    return L.Period(col, date.year, date.month)


# "on Mondays", "at the weekend", "weekday orders": the day of the week of a date column
@specify(fragments=("day_of_week",), role="datefilter")
def day_of_week(a, col: str, days: tuple[int, int]) -> L.Rows | None:
    return L.DayOfWeek(col, *days)


@specify(fragments=("missing",), role="filter")
def missing(a, col: str, _) -> L.Rows | None:
    return L.Missing(col) if a.table.column(col).nulls else None


@specify(fragments=("present",), role="filter")
def present(a, col: str, _) -> L.Rows | None:
    return L.Not(L.Missing(col)) if a.table.column(col).nulls else None


@specify(fragments=("and",), accepts=lambda f: scoped(f) and not isinstance(f, L.All))
def both(a, left: L.Rows, right: L.Rows) -> L.Rows | None:
    if left == right:
        return None
    if isinstance(left, L.Eq) and isinstance(right, L.Eq) and left.col == right.col:
        return None
    averages = _averages(left), _averages(right)
    if sum(averages) > max(*averages, _averages_said(a)):
        return None                   # one "than the average" read as two comparisons
    left, right = sorted((left, right), key=str)
    return L.And(left, right)


def _averages(rows: L.Rows) -> int:
    return sum(isinstance(node, L.CmpAgg) for node in L.walk(rows))


def _averages_said(a) -> int:
    """How many words of the question name an average or median ("above-average" is one)."""
    return sum(any(word in token.text for word in ("average", "mean", "avg", "median"))
               for token in a.words.tokens)


@specify(fragments=("or",), accepts=simple)
def either(a, left: L.Rows, _, right: L.Rows) -> L.Rows | None:
    if left == right:
        return None
    left, right = sorted((left, right), key=str)
    return L.Or(left, right)


@specify(fragments=("not",), accepts=lambda f: simple(f) or _present(f))
def negate(a, _, rows: L.Rows) -> L.Rows | None:
    if _present(rows):
        return rows.rows        # "not returned", "don't have a rating": the cell is missing
    return None if isinstance(rows, L.Missing) else L.Not(rows)   # `present` says that


def _present(rows: L.Form) -> bool:
    return isinstance(rows, L.Not) and isinstance(rows.rows, L.Missing)


@specify(fragments=("extreme:{DIR}",), role="order", accepts=scoped, superlative=True)
def extreme(a, rows: L.Rows, col: str, direction: str) -> L.Rows | None:
    return L.Extreme(rows, col, direction)


@specify(fragments=("{POS}",), accepts=scoped, superlative=True)
def position(a, rows: L.Rows, which: str) -> L.Rows | None:
    return L.Position(rows, which)


@specify(fragments=("{STEP}",), accepts=lambda f: not isinstance(f, (L.All, L.Neighbour)))
def neighbour(a, rows: L.Rows, step: str) -> L.Rows | None:
    return L.Neighbour(rows, step)


# "above the average price": the column against its own average (or median) over the table.
# The question must name the column: no word stands on the comparison or the average, so an
# unnamed column would let any number column be compared, and stacked, for the same words.
@specify(fragments=("cmp:{CMP}", "than:{AGG}"), role="filter",
         fits=lambda col, op, fn: fn in ("avg", "median"))
def compare_average(a, col: str, op: str, fn: str) -> L.Rows | None:
    return L.CmpAgg(col, op, fn) if fn in ("avg", "median") and col in a.spans else None


# ── answers ───────────────────────────────────────────────────────────────────────────────────
@specify(fragments=("values",), role="values", head=True)
def values(a, col: str, rows: L.Rows) -> L.Answer | None:
    return None if _filters_on(rows, col) else L.Values(col, rows)


@specify(fragments=("distinct",), role="values", head=True)
def distinct(a, col: str, rows: L.Rows, _) -> L.Answer | None:
    if _filters_on(rows, col) or a.table.column(col).distinct >= max(a.table.row_count, 2):
        return None
    return L.Distinct(col, rows)


# "count" twice: as the rule and as what every counting rule adds (the prior was set with both).
@specify(fragments=("count", "count"), aggregating=True)
def count(a, _, rows: L.Rows) -> L.Answer | None:
    return L.Aggregate("count", None, rows)


@specify(fragments=("count_distinct",), role="values", head=True, aggregating=True)
def count_distinct(a, _, col: str, rows: L.Rows) -> L.Answer | None:
    return None if _filters_on(rows, col) else L.Aggregate("count_distinct", col, rows)


@specify(fragments=("{AGG}",), role="measure", head=True, aggregating=True)
def aggregate(a, fn: str, col: str, rows: L.Rows) -> L.Answer | None:
    return L.Aggregate(fn, col, rows)


# "when did we last …", "the date of the most recent …": the latest date itself, which no
# row order stands for (a table need not be sorted by date), written as its cells write it
@specify(fragments=("date_extreme", "dir:{DIR}"), role="values", head=True, superlative=True)
def date_extreme(a, col: str, rows: L.Rows, direction: str) -> L.Answer | None:
    if _filters_on(rows, col):
        return None
    return L.Distinct(a.table.column(col).base, L.Extreme(rows, col, direction))


@specify(fragments=("difference", "count"), accepts=simple)
def count_difference(a, _, left: L.Rows, right: L.Rows) -> L.Answer | None:
    if left == right:
        return None
    left, right = sorted((left, right), key=str)
    return L.Difference(L.Aggregate("count", None, left), L.Aggregate("count", None, right))


@specify(fragments=("difference", "{AGG}"), role="measure", accepts=simple)
def aggregate_difference(a, fn: str, col: str, left: L.Rows, right: L.Rows) -> L.Answer | None:
    if left == right or fn == "median":
        return None
    left, right = sorted((left, right), key=str)
    return L.Difference(L.Aggregate(fn, col, left), L.Aggregate(fn, col, right))


@specify(fragments=("difference", "max", "min"), role="measure", superlative=True,
         fits=lambda fn1, fn2, col: (fn1, fn2) == ("max", "min"))
def spread(a, fn1: str, fn2: str, col: str, rows: L.Rows) -> L.Answer | None:
    if {fn1, fn2} != {"max", "min"} or fn1 != "max":
        return None
    return L.Difference(L.Aggregate("max", col, rows), L.Aggregate("min", col, rows))


# "How many more late deliveries did Ashcombe have than Dunholt": two values of one column
# compared within the rows of a condition on another ("late"), which both sides keep.
def _contrast(common: L.Rows, left: L.Rows, right: L.Rows) -> tuple | None:
    cols = [_column_of(rows) for rows in (common, left, right)]
    if left == right or cols[1] is None or cols[1] != cols[2] or cols[0] == cols[1]:
        return None
    return tuple(sorted((_and(common, left), _and(common, right)), key=str))


def _column_of(rows: L.Rows) -> str | None:
    """The one column a condition reads; a team word's is its definition's ("the tourist
    season" and "the small hours" both read the start time)."""
    return _column_of(rows.rows) if isinstance(rows, L.Defined) else getattr(rows, "col", None)


def _and(first: L.Rows, second: L.Rows) -> L.Rows:
    return L.And(*sorted((first, second), key=str))


@specify(fragments=("difference", "count", "and"), accepts=simple)
def count_difference_within(a, _, common: L.Rows, left: L.Rows,
                            right: L.Rows) -> L.Answer | None:
    pair = _contrast(common, left, right)
    return pair and L.Difference(L.Aggregate("count", None, pair[0]),
                                 L.Aggregate("count", None, pair[1]))


@specify(fragments=("difference", "{AGG}", "and"), role="measure", accepts=simple)
def aggregate_difference_within(a, fn: str, col: str, common: L.Rows, left: L.Rows,
                                right: L.Rows) -> L.Answer | None:
    pair = None if fn == "median" else _contrast(common, left, right)
    return pair and L.Difference(L.Aggregate(fn, col, pair[0]), L.Aggregate(fn, col, pair[1]))


@specify(fragments=("which_of", "count", "dir:{DIR}"), superlative=True,
         fits=lambda first, second, *_: _two(first, second) is not None)
def which_of_count(a, first: tuple, second: tuple, _, direction: str) -> L.Answer | None:
    pair = _two(first, second)
    return pair and L.WhichOf(pair[0], pair[1], pair[2], "count", None, direction)


@specify(fragments=("which_of", "dir:{DIR}"), role="measure", superlative=True,
         fits=lambda first, second, col, _: _two(first, second) is not None and first[0] != col)
def which_of_value(a, first: tuple, second: tuple, col: str, direction: str) -> L.Answer | None:
    pair = _two(first, second)
    if not pair or pair[0] == col:
        return None
    return L.WhichOf(pair[0], pair[1], pair[2], "sum", col, direction)


@specify(fragments=("which_of", "{POS}"), superlative=True,
         fits=lambda first, second, _: _two(first, second) is not None)
def which_of_position(a, first: tuple, second: tuple, which: str) -> L.Answer | None:
    pair = _two(first, second)
    direction = "min" if which == "first" else "max"
    return pair and L.WhichOf(pair[0], pair[1], pair[2], "min", "__row", direction)


# In the group rules an aggregate measures groups ("group:sum"): "most tickets" is a sum there.
@specify(fragments=("group_best", "count", "dir:{DIR}"), role="key", head=True,
         superlative=True)
def group_best_count(a, key: str, _, rows: L.Rows, direction: str) -> L.Answer | None:
    return None if _filters_on(rows, key) else L.GroupBest(key, "count", None, rows, direction)


@specify(fragments=("group_best", "group:{AGG}", "dir:{DIR}"), role="key", head=True,
         superlative=True)
def group_best(a, key: str, fn: str, col: str, rows: L.Rows, direction: str) -> L.Answer | None:
    if key == col or _filters_on(rows, key):
        return None
    return L.GroupBest(key, fn, col, rows, direction)


@specify(fragments=("top_n", "dir:{DIR}"), role="values", accepts=scoped, head=True,
         superlative=True)
def top_n(a, col: str, n: float, rows: L.Rows, by: str, direction: str) -> L.Answer | None:
    if not float(n).is_integer() or not 2 <= n <= 100:
        return None
    return L.TopN(col, int(n), rows, by, direction)


# Takes any rows (declaring `accepts` would widen its beam of sub-forms, so change candidates),
# and refuses the picked ones itself.
@specify(fragments=("top_n", "dir:{DIR}"), role="values", head=True, superlative=True)
def top_values(a, col: str, n: float, rows: L.Rows, direction: str) -> L.Answer | None:
    return top_n(a, col, n, rows, col, direction) if scoped(rows) else None


@specify(fragments=("group_top", "count", "dir:{DIR}"), role="key", head=True,
         superlative=True)
def group_top_count(a, key: str, n: float, _, rows: L.Rows, direction: str) -> L.Answer | None:
    n = _count_n(n)
    if n is None or _filters_on(rows, key) or not scoped(rows):
        return None
    return L.GroupTop(key, "count", None, n, rows, direction)


@specify(fragments=("group_top", "group:{AGG}", "dir:{DIR}"), role="key", head=True,
         superlative=True)
def group_top(a, key: str, n: float, fn: str, col: str, rows: L.Rows,
              direction: str) -> L.Answer | None:
    n = _count_n(n)
    if n is None or key == col or _filters_on(rows, key) or not scoped(rows):
        return None
    return L.GroupTop(key, fn, col, n, rows, direction)


@specify(fragments=("yes_no",), accepts=lambda f: not isinstance(f, L.All))
def yes_no(a, _, rows: L.Rows) -> L.Answer | None:
    return L.YesNo(rows)


# "count" twice, as a plain count has it: else "how many jobs per mechanic" counted all rows
@specify(fragments=("per_group", "count", "count"), role="key")
def per_group_count(a, key: str, _, rows: L.Rows, __) -> L.Answer | None:
    return None if _filters_on(rows, key) else L.GroupTable(key, "count", None, rows)


@specify(fragments=("per_group", "group:{AGG}"), role="key")
def per_group(a, key: str, fn: str, col: str, rows: L.Rows, _) -> L.Answer | None:
    if key == col or _filters_on(rows, key):
        return None
    return L.GroupTable(key, fn, col, rows)


# Filters on groups (HAVING): "depots with more than 20 late deliveries" lists the groups,
# "how many depots have …" counts them. The groups are a row set (`InGroups`), so the answer is
# the distinct values of the key, or their count, over it.
def _groups(a, key: str, fn: str, col: str | None, rows: L.Rows, op: str,
            n: float) -> L.InGroups | None:
    if key == col or _filters_on(rows, key) or not scoped(rows):
        return None
    if a.table.column(key).distinct >= a.table.row_count:
        return None                   # a group per row: an id ("orders with over 20 plants")
    # The comparison words stand on no span, so one "at least" would read as both comparisons
    # ("at least 3 products under 10"); the same comparison twice is rarely what was asked.
    if any(isinstance(node, L.Cmp) and node.op == op for node in L.walk(rows)):
        return None
    if fn == "count" and not (float(n).is_integer() and n >= 0):
        return None
    return L.InGroups(key, fn, col, rows, op, n)


@specify(fragments=("having", "count", "cmp:{CMP}"), role="key", head=True)
def groups_with_count(a, key: str, _, rows: L.Rows, op: str, n: float) -> L.Answer | None:
    groups = _groups(a, key, "count", None, rows, op, n)
    return groups and L.Distinct(key, groups)


@specify(fragments=("having", "group:{AGG}", "cmp:{CMP}"), role="key", head=True)
def groups_with(a, key: str, fn: str, col: str, rows: L.Rows, op: str,
                n: float) -> L.Answer | None:
    groups = _groups(a, key, fn, col, rows, op, n)
    return groups and L.Distinct(key, groups)


@specify(fragments=("count_distinct", "having", "count", "cmp:{CMP}"), role="key", head=True,
         aggregating=True)
def count_groups_with_count(a, _, key: str, __, rows: L.Rows, op: str,
                            n: float) -> L.Answer | None:
    groups = _groups(a, key, "count", None, rows, op, n)
    return groups and L.Aggregate("count_distinct", key, groups)


@specify(fragments=("count_distinct", "having", "group:{AGG}", "cmp:{CMP}"), role="key",
         head=True, aggregating=True)
def count_groups_with(a, _, key: str, fn: str, col: str, rows: L.Rows, op: str,
                      n: float) -> L.Answer | None:
    groups = _groups(a, key, fn, col, rows, op, n)
    return groups and L.Aggregate("count_distinct", key, groups)


# Shares: "what share of orders were returned" (of all rows), "what fraction of Tuesday orders
# were paid by card" (of the rows of another condition). The unit is the SHARE atom's: percent
# (0 to 100) or fraction (0 to 1).
def _a_condition(rows: L.Form) -> bool:
    return scoped(rows) and not isinstance(rows, L.All)


@specify(fragments=("share:{SHARE}",), accepts=_a_condition)
def share(a, unit: str, rows: L.Rows) -> L.Answer | None:
    return L.Share(unit, rows, L.All())


@specify(fragments=("share:{SHARE}",), accepts=_a_condition)
def share_within(a, unit: str, whole: L.Rows, part: L.Rows) -> L.Answer | None:
    if whole == part or (isinstance(whole, L.Eq) and isinstance(part, L.Eq)
                         and whole.col == part.col):
        return None                   # the same rows, or none of them
    said = _said_at(a, whole), _said_at(a, part)
    if None not in said and said[1] < said[0]:
        return None                   # "share of Tuesday orders paid by card": the whole first
    return L.Share(unit, part, whole)


def _said_at(a, rows: L.Rows) -> int | None:
    """Where the question first names one of a row set's conditions (its value, number or
    period, else its column), or None when no word of it is found."""
    found = []
    for node in L.walk(rows):
        if isinstance(node, (L.Eq, L.Contains)):
            slot = "ENTITY" if isinstance(node, L.Eq) else "CONTAINS"
            found += [atom.span[0] for atom in a.atoms.get(slot, ())
                      if atom.span and atom.value == (node.col, node.value)]
        elif isinstance(node, (L.Cmp, L.Between)):
            values = {getattr(node, f, None) for f in ("value", "low", "high")}
            found += [atom.span[0] for atom in a.atoms.get("NUMBER", ()) if atom.value in values]
        elif isinstance(node, L.Period):
            found += [atom.span[0] for atom in a.atoms.get("PERIOD", ())
                      if (atom.value.year, atom.value.month) == (node.year, node.month)]
        if not found and isinstance(getattr(node, "col", None), str) and node.col in a.spans:
            found.append(a.spans[node.col][0])
    return min(found) if found else None


# Per-month and per-year tables: a month is a year-month, so months of different years are
# never added together. Like a date filter's, the column may go unnamed: "per month" says it.
@specify(fragments=("per_group", "per:{UNIT}", "count"), role="datefilter", accepts=scoped)
def per_period_count(a, col: str, unit: str, _, rows: L.Rows) -> L.Answer | None:
    return None if _one_period(col, unit, rows) else L.PeriodTable(col, unit, "count", None, rows)


@specify(fragments=("per_group", "per:{UNIT}", "group:{AGG}"), role="datefilter",
         accepts=scoped)
def per_period(a, col: str, unit: str, fn: str, measure: str, rows: L.Rows) -> L.Answer | None:
    # the measure must be named: the date filter's role spares an unnamed column its cost
    if measure not in a.spans or _one_period(col, unit, rows):
        return None
    return L.PeriodTable(col, unit, fn, measure, rows)


def _one_period(col: str, unit: str, rows: L.Rows) -> bool:
    """Whether the rows already fix the period of `col` that the answer groups by: a year
    filtered to one year ("which month of 2023" is no year), a month to one month, a day of
    the week to some days."""
    for node in L.walk(rows):
        if getattr(node, "col", None) != col:
            continue
        if isinstance(node, L.DayOfWeek) and unit == "weekday":
            return True
        if isinstance(node, L.Period) and (unit == "year" and node.year is not None
                                           or unit == "month" and node.month is not None):
            return True
    return False


# "Which month had the most orders", "the year with the highest total sales", "the 3 busiest
# months": the periods of a date column picked by a count or a measure, named as the per-period
# tables name them. Like those, the date column may go unnamed: the period word says it.
def _period_pick(a, col: str, unit: str, fn: str, measure: str | None, n: int | None,
                 rows: L.Rows, direction: str) -> L.Answer | None:
    if _one_period(col, unit, rows) or (measure is not None and measure not in a.spans):
        return None
    return L.PeriodBest(col, unit, fn, measure, n, rows, direction)


@specify(fragments=("group_best", "per:{UNIT}", "count", "dir:{DIR}"), role="datefilter",
         accepts=scoped, superlative=True)
def period_best_count(a, col: str, unit: str, _, rows: L.Rows,
                      direction: str) -> L.Answer | None:
    return _period_pick(a, col, unit, "count", None, None, rows, direction)


@specify(fragments=("group_best", "per:{UNIT}", "group:{AGG}", "dir:{DIR}"), role="datefilter",
         accepts=scoped, superlative=True)
def period_best(a, col: str, unit: str, fn: str, measure: str, rows: L.Rows,
                direction: str) -> L.Answer | None:
    return _period_pick(a, col, unit, fn, measure, None, rows, direction)


@specify(fragments=("group_top", "per:{UNIT}", "count", "dir:{DIR}"), role="datefilter",
         accepts=scoped, superlative=True)
def period_top_count(a, col: str, unit: str, n: float, _, rows: L.Rows,
                     direction: str) -> L.Answer | None:
    n = _count_n(n)
    return n and _period_pick(a, col, unit, "count", None, n, rows, direction)


@specify(fragments=("group_top", "per:{UNIT}", "group:{AGG}", "dir:{DIR}"), role="datefilter",
         accepts=scoped, superlative=True)
def period_top(a, col: str, unit: str, n: float, fn: str, measure: str, rows: L.Rows,
               direction: str) -> L.Answer | None:
    n = _count_n(n)
    return n and _period_pick(a, col, unit, fn, measure, n, rows, direction)
