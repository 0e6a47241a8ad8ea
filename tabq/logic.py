"""Logical forms: what a question asks, as small frozen dataclasses.

Every form has one canonical text form (`to_text`, read back by `from_text` with the lark grammar
`grammar/logic.lark`) and one English reading (`paraphrase`). Row sets (`Rows`) say which rows;
answers (`Answer`) say what to compute from them. Columns are referred to by their name in the
loaded table; `ROW` stands for a row's position in the file.
"""

from __future__ import annotations

import datetime
import json
from dataclasses import dataclass, fields
from functools import lru_cache
from typing import Callable, Union

from lark import Lark, Transformer

from .errors import TabqError

Literal = Union[str, float, int, datetime.date, None]

# Fields that hold names (columns, operators) rather than values; printed bare, not quoted.
SYMBOLS = frozenset({"col", "op", "fn", "key", "measure", "by", "direction", "which", "step",
                     "unit"})


class Form:
    """Base of all logical forms."""

    tag = ""

    def to_text(self) -> str:
        return to_text(self)

    def __str__(self) -> str:
        return to_text(self)


class Rows(Form):
    """A set of rows of the table."""


class Answer(Form):
    """Something computed from rows: the answer to a question."""

    tabular = False     # answers with a table (rows of a key and a measure), not a list


# ── row sets ──────────────────────────────────────────────────────────────────────────────────
@dataclass(frozen=True)
class All(Rows):
    tag = "all"


@dataclass(frozen=True)
class Eq(Rows):
    col: str
    value: Literal
    tag = "eq"


@dataclass(frozen=True)
class Cmp(Rows):
    col: str
    op: str            # gt, lt, ge, le
    value: Literal     # a number, or an ISO date for a date column
    tag = "cmp"


@dataclass(frozen=True)
class Between(Rows):
    col: str
    low: Literal
    high: Literal
    tag = "between"


@dataclass(frozen=True)
class Contains(Rows):
    col: str
    value: str
    tag = "contains"


@dataclass(frozen=True)
class Missing(Rows):
    col: str
    tag = "missing"


@dataclass(frozen=True)
class Period(Rows):
    col: str                # a date column
    year: int | None
    month: int | None
    tag = "period"


@dataclass(frozen=True)
class DayOfWeek(Rows):
    """The rows whose date in `col` falls on an ISO day of the week from `first` to `last`
    (Monday 1 … Sunday 7): one day, the weekend (6-7) or the working week (1-5)."""

    col: str
    first: int
    last: int
    tag = "day_of_week"


@dataclass(frozen=True)
class And(Rows):
    left: Rows
    right: Rows
    tag = "and"


@dataclass(frozen=True)
class Or(Rows):
    left: Rows
    right: Rows
    tag = "or"


@dataclass(frozen=True)
class Not(Rows):
    rows: Rows
    tag = "not"


@dataclass(frozen=True)
class Extreme(Rows):
    """The rows of `rows` with the highest (max) or lowest (min) value of `col`; ties kept."""

    rows: Rows
    col: str
    direction: str
    tag = "extreme"


@dataclass(frozen=True)
class Position(Rows):
    """The first or last row of `rows` in file order."""

    rows: Rows
    which: str
    tag = "position"


@dataclass(frozen=True)
class Neighbour(Rows):
    """The rows right after (next) or before (prev) the rows of `rows`."""

    rows: Rows
    step: str
    tag = "neighbour"


@dataclass(frozen=True)
class InGroups(Rows):
    """The rows of the groups of `key` whose fn(measure) over their rows in `rows` compares
    (`op`) with `value`: HAVING. A group with no row in `rows` counts 0 rows."""

    key: str
    fn: str
    measure: str | None
    rows: Rows
    op: str
    value: Literal
    tag = "in_groups"


@dataclass(frozen=True)
class CmpAgg(Rows):
    """The rows whose `col` compares (`op`) with fn(col) over the whole table: above average."""

    col: str
    op: str
    fn: str             # avg or median
    tag = "cmp_agg"


@dataclass(frozen=True)
class InSet(Rows):
    """The rows whose `col` is one of `values`: a team word for a set ("the river wards")."""

    col: str
    values: tuple
    tag = "in_set"


@dataclass(frozen=True)
class Hours(Rows):
    """The rows whose time in `col` falls in the hours `first` to `last` (0-23; past midnight
    when first > last): "the small hours", "the evening shift"."""

    col: str
    first: int
    last: int
    tag = "hours"


@dataclass(frozen=True)
class Months(Rows):
    """The rows whose date in `col` falls in the months `first` to `last` (1-12; across the
    new year when first > last): "the tourist season", "the winter months"."""

    col: str
    first: int
    last: int
    tag = "months"


@dataclass(frozen=True)
class Defined(Rows):
    """A team's word for a row set, taught by confirmed answers: `word` stands for `rows`."""

    word: str
    rows: Rows
    tag = "defined"


# ── answers ───────────────────────────────────────────────────────────────────────────────────
@dataclass(frozen=True)
class Values(Answer):
    col: str
    rows: Rows
    tag = "values"


@dataclass(frozen=True)
class Distinct(Answer):
    col: str
    rows: Rows
    tag = "distinct"


@dataclass(frozen=True)
class Aggregate(Answer):
    """count (col None: rows), count_distinct, sum, avg, min, max or median of a column."""

    fn: str
    col: str | None
    rows: Rows
    tag = "aggregate"


@dataclass(frozen=True)
class Difference(Answer):
    """How far apart two aggregates are (always positive)."""

    left: Aggregate
    right: Aggregate
    tag = "difference"


@dataclass(frozen=True)
class WhichOf(Answer):
    """Which of two values of `col` has the larger (max) or smaller (min) fn(measure)."""

    col: str
    first: Literal
    second: Literal
    fn: str
    measure: str | None
    direction: str
    tag = "which_of"


@dataclass(frozen=True)
class GroupBest(Answer):
    """The value(s) of `key` whose group has the largest/smallest fn(measure); ties kept."""

    key: str
    fn: str
    measure: str | None
    rows: Rows
    direction: str
    tag = "group_best"


@dataclass(frozen=True)
class TopN(Answer):
    """The `col` values of the n rows with the highest/lowest `by`."""

    col: str
    n: int
    rows: Rows
    by: str
    direction: str
    tag = "top_n"


@dataclass(frozen=True)
class GroupTop(Answer):
    """The n values of `key` whose groups have the largest/smallest fn(measure)."""

    key: str
    fn: str
    measure: str | None
    n: int
    rows: Rows
    direction: str
    tag = "group_top"


@dataclass(frozen=True)
class YesNo(Answer):
    """'yes' when `rows` holds at least one row."""

    rows: Rows
    tag = "yes_no"


@dataclass(frozen=True)
class GroupTable(Answer):
    """fn(measure) for every value of `key`: a table for analysts."""

    key: str
    fn: str
    measure: str | None
    rows: Rows
    tag = "per_group"
    tabular = True


@dataclass(frozen=True)
class Share(Answer):
    """The share of the rows of `within` that are in `rows` (a row whose condition is unknown
    is not): 0 to 1 for unit "fraction", 0 to 100 for "percent"."""

    unit: str
    rows: Rows
    within: Rows
    tag = "share"


@dataclass(frozen=True)
class PeriodTable(Answer):
    """fn(measure) for every month (as year-month: months of different years stay apart) or
    year of the date column `col`, in time order: a table for analysts."""

    col: str
    unit: str           # month, year or weekday
    fn: str
    measure: str | None
    rows: Rows
    tag = "per_period"
    tabular = True


@dataclass(frozen=True)
class PeriodBest(Answer):
    """The month(s), year(s) or day(s) of the week of the date column `col` whose rows have the
    largest/smallest fn(measure): with `n` None the best, ties kept; else the n best. Named as
    a `PeriodTable` names them (a month as year-month text, a year as a number, a day of the
    week by its English name)."""

    col: str
    unit: str           # month, year or weekday
    fn: str
    measure: str | None
    n: int | None
    rows: Rows
    direction: str
    tag = "period_best"


FORMS: dict[str, type] = {
    cls.tag: cls
    for cls in (All, Eq, Cmp, Between, Contains, Missing, Period, DayOfWeek, InSet, Hours, Months,
                Defined, And, Or, Not, Extreme, Position, Neighbour, InGroups, CmpAgg, Values, Distinct, Aggregate,
                Difference, WhichOf, GroupBest, GroupTop, TopN, YesNo, GroupTable, Share,
                PeriodTable, PeriodBest)
}


# ── canonical text ────────────────────────────────────────────────────────────────────────────
def to_text(form: Form) -> str:
    """`(aggregate count _ (eq route "lantern bay"))`: one line, parsable by `from_text`."""
    parts = [form.tag]
    for name in field_names(type(form)):
        value = getattr(form, name)
        if isinstance(value, Form):
            parts.append(to_text(value))
        elif value is None:
            parts.append("_")
        elif isinstance(value, datetime.date):
            parts.append("@" + value.isoformat())
        elif isinstance(value, tuple):
            parts.append("[" + " ".join(json.dumps(v, ensure_ascii=False) for v in value) + "]")
        elif name in SYMBOLS:
            parts.append(value)
        else:
            parts.append(json.dumps(value, ensure_ascii=False))
    return "(" + " ".join(parts) + ")"


class _Build(Transformer):
    def form(self, children):
        tag, *args = children
        cls = FORMS.get(str(tag))
        if cls is None or len(args) != len(fields(cls)):
            raise LogicTextError(f"unknown form or wrong arity: {tag}")
        return cls(*args)

    def symbol(self, children):
        return None if str(children[0]) == "_" else str(children[0])

    def string(self, children):
        return json.loads(children[0])

    def date(self, children):
        return datetime.date.fromisoformat(str(children[0])[1:])

    def items(self, children):
        return tuple(children)

    def number(self, children):
        text = str(children[0])
        return int(text) if text.lstrip("-").isdigit() else float(text)


class LogicTextError(TabqError):
    """A logical form's text could not be read."""


@lru_cache(maxsize=1)
def _parser() -> Lark:
    return Lark.open("grammar/logic.lark", rel_to=__file__, start="form", parser="lalr")


def from_text(text: str) -> Form:
    """Read the canonical text form back into a logical form."""
    try:
        return _Build().transform(_parser().parse(text))
    except LogicTextError:
        raise
    except Exception as err:  # lark's own errors carry positions; one line is enough here
        raise LogicTextError(f"not a logical form: {text[:80]!r}") from err


# ── walking ───────────────────────────────────────────────────────────────────────────────────
@lru_cache(maxsize=None)
def field_names(cls: type) -> tuple[str, ...]:
    return tuple(f.name for f in fields(cls))


def children(form: Form) -> list[Form]:
    return [v for name in field_names(type(form)) if isinstance(v := getattr(form, name), Form)]


def walk(form: Form):
    """Every node of a form, parents before children."""
    yield form
    for child in children(form):
        yield from walk(child)


def columns_of(form: Form) -> list[str]:
    """The columns a form reads, with repeats (a column used twice is a sign of a wrong reading)."""
    cols = []
    for node in walk(form):
        for name in ("col", "key", "measure", "by"):
            value = getattr(node, name, None)
            if isinstance(value, str):
                cols.append(value)
    return cols


def size(form: Form) -> int:
    return sum(1 for _ in walk(form))


# ── English reading ───────────────────────────────────────────────────────────────────────────
# A period of a date column: its word, its plural, and how the answers name it
PERIOD_WORDS = {"month": ("month", "months", " (as year-month: months of different years "
                                             "kept apart)"),
                "year": ("year", "years", ""), "weekday": ("day of the week", "days of the week",
                                                           "")}
OPS = {"gt": "is more than", "lt": "is less than", "ge": "is at least", "le": "is at most"}
COUNT_OPS = {"gt": "more than", "lt": "fewer than", "ge": "at least", "le": "at most"}
FN_WORDS = {"count": "the number of rows", "count_distinct": "the number of different",
            "sum": "the total", "avg": "the average", "min": "the lowest", "max": "the highest",
            "median": "the median"}
DAY_NAMES = ["Monday", "Tuesday", "Wednesday", "Thursday", "Friday", "Saturday", "Sunday"]
MONTH_NAMES = ["January", "February", "March", "April", "May", "June", "July", "August",
               "September", "October", "November", "December"]


def paraphrase(form: Form, label: Callable[[str], str] = str) -> str:
    """One English reading of a form; `label` turns a column name into its header for people."""
    return _Reader(label).read(form)


class _Reader:
    def __init__(self, label: Callable[[str], str]):
        self.label = lambda name: "row position" if name == "__row" else label(name)

    def read(self, form: Form) -> str:
        if isinstance(form, Rows):
            return "rows where " + self.cond(form)
        return getattr(self, form.tag)(form)

    def where(self, rows: Rows) -> str:
        return "" if isinstance(rows, All) else " where " + self.cond(rows)

    def cond(self, r: Rows) -> str:
        return getattr(self, "c_" + r.tag)(r)

    def value(self, v: Literal) -> str:
        if isinstance(v, float) and v.is_integer():
            v = int(v)
        if isinstance(v, float):
            v = round(v, 4)
        return f'"{v}"' if isinstance(v, str) else str(v)

    # conditions
    def c_all(self, r: All) -> str:
        return "any row"

    def c_eq(self, r: Eq) -> str:
        return f"{self.label(r.col)} is {self.value(r.value)}"

    def c_cmp(self, r: Cmp) -> str:
        return f"{self.label(r.col)} {OPS[r.op]} {self.value(r.value)}"

    def c_between(self, r: Between) -> str:
        return f"{self.label(r.col)} is between {self.value(r.low)} and {self.value(r.high)}"

    def c_contains(self, r: Contains) -> str:
        return f"{self.label(r.col)} contains {self.value(r.value)}"

    def c_missing(self, r: Missing) -> str:
        return f"{self.label(r.col)} is missing"

    def c_period(self, r: Period) -> str:
        when = " ".join(x for x in (MONTH_NAMES[r.month - 1] if r.month else "",
                                    str(r.year) if r.year else "") if x)
        return f"{self.label(r.col)} is in {when}"

    def c_day_of_week(self, r: DayOfWeek) -> str:
        first, last = DAY_NAMES[r.first - 1], DAY_NAMES[r.last - 1]
        days = (first if r.first == r.last else f"{first} or {last}" if r.last == r.first + 1
                else f"day from {first} to {last}")
        return f"{self.label(r.col)} falls on a {days}"

    def c_in_groups(self, r: InGroups) -> str:
        return f"{self.label(r.key)} {self.having(r, 'has')}"

    def having(self, r: InGroups, verb: str) -> str:
        """"has more than 7 rows where …", "has an average amount over rows where … that is
        more than 600"."""
        if r.fn == "count":
            return f"{verb} {COUNT_OPS[r.op]} {self.value(r.value)} rows{self.where(r.rows)}"
        measure = self.agg(r.fn, r.measure).removeprefix("the ")
        scope = "" if isinstance(r.rows, All) else f" over rows where {self.cond(r.rows)}"
        article = "an" if measure[0] in "aeiou" else "a"
        return f"{verb} {article} {measure}{scope} that {OPS[r.op]} {self.value(r.value)}"

    def c_cmp_agg(self, r: CmpAgg) -> str:
        return (f"{self.label(r.col)} {OPS[r.op]} {FN_WORDS[r.fn]} {self.label(r.col)} "
                f"of the whole table")

    def c_in_set(self, r: InSet) -> str:
        shown = [self.value(v) for v in r.values]
        listed = shown[0] if len(shown) == 1 else ", ".join(shown[:-1]) + " or " + shown[-1]
        return f"{self.label(r.col)} is {listed}"

    def c_hours(self, r: Hours) -> str:
        return f"the hour of {self.label(r.col)} is from {r.first} to {r.last}"

    def c_months(self, r: Months) -> str:
        first, last = MONTH_NAMES[r.first - 1], MONTH_NAMES[r.last - 1]
        return f"{self.label(r.col)} is in {first}" + ("" if r.first == r.last else f" to {last}")

    def c_defined(self, r: Defined) -> str:
        return f"{r.word} ({self.cond(r.rows)})"

    def c_and(self, r: And) -> str:
        return f"{self.cond(r.left)} and {self.cond(r.right)}"

    def c_or(self, r: Or) -> str:
        return f"({self.cond(r.left)} or {self.cond(r.right)})"

    def c_not(self, r: Not) -> str:
        return f"not ({self.cond(r.rows)})"

    def c_extreme(self, r: Extreme) -> str:
        word = "highest" if r.direction == "max" else "lowest"
        scope = "" if isinstance(r.rows, All) else f" among rows where {self.cond(r.rows)}"
        return f"{self.label(r.col)} is the {word}{scope}"

    def c_position(self, r: Position) -> str:
        scope = "" if isinstance(r.rows, All) else f" where {self.cond(r.rows)}"
        return f"it is the {r.which} row{scope}"

    def c_neighbour(self, r: Neighbour) -> str:
        word = "right after" if r.step == "next" else "right before"
        return f"the row comes {word} a row where {self.cond(r.rows)}"

    # answers
    def values(self, f: Values) -> str:
        return f"the {self.label(f.col)}{self.where(f.rows)}"

    def distinct(self, f: Distinct) -> str:
        if isinstance(f.rows, InGroups) and f.rows.key == f.col:
            return f"the {self.label(f.col)} values that {self.having(f.rows, 'have')}"
        if isinstance(f.rows, Extreme) and f.rows.col.split("__")[0] == f.col:
            # "the latest date": a column's own extreme (or its typed view's), as its cells say it
            ranked = f.rows
            scope = "" if isinstance(ranked.rows, All) else \
                f" among rows where {self.cond(ranked.rows)}"
            word = "highest" if ranked.direction == "max" else "lowest"
            return f"the {self.label(f.col)} that is the {word}{scope}"
        return f"the different values of {self.label(f.col)}{self.where(f.rows)}"

    def aggregate(self, f: Aggregate) -> str:
        if f.fn == "count_distinct" and isinstance(f.rows, InGroups) and f.rows.key == f.col:
            return f"the number of {self.label(f.col)} values that {self.having(f.rows, 'have')}"
        return self.agg(f.fn, f.col) + self.where(f.rows)

    def agg(self, fn: str, col: str | None) -> str:
        if fn == "count":
            return "the number of rows"
        if fn == "count_distinct":
            return f"the number of different {self.label(col)} values"
        return f"{FN_WORDS[fn]} {self.label(col)}"

    def difference(self, f: Difference) -> str:
        return f"the difference between {self.read(f.left)} and {self.read(f.right)}"

    def which_of(self, f: WhichOf) -> str:
        word = "larger" if f.direction == "max" else "smaller"
        return (f"which of {self.value(f.first)} and {self.value(f.second)} ({self.label(f.col)}) "
                f"has the {word} {self.agg(f.fn, f.measure).removeprefix('the ')}")

    def group_best(self, f: GroupBest) -> str:
        word = "largest" if f.direction == "max" else "smallest"
        return (f"the {self.label(f.key)} with the {word} "
                f"{self.agg(f.fn, f.measure).removeprefix('the ')}{self.where(f.rows)}")

    def group_top(self, f: GroupTop) -> str:
        word = "largest" if f.direction == "max" else "smallest"
        return (f"the {f.n} {self.label(f.key)} values with the {word} "
                f"{self.agg(f.fn, f.measure).removeprefix('the ')}{self.where(f.rows)}")

    def top_n(self, f: TopN) -> str:
        word = "highest" if f.direction == "max" else "lowest"
        return f"the {self.label(f.col)} of the {f.n} rows with the {word} {self.label(f.by)}" + (
            self.where(f.rows))

    def yes_no(self, f: YesNo) -> str:
        return f"whether there is any row where {self.cond(f.rows)}"

    def share(self, f: Share) -> str:
        name = "percentage (0 to 100)" if f.unit == "percent" else "fraction (0 to 1)"
        if isinstance(f.within, All):
            return f"the {name} of all rows where {self.cond(f.rows)}"
        return f"among rows where {self.cond(f.within)}, the {name} where {self.cond(f.rows)}"

    def per_period(self, f: PeriodTable) -> str:
        each = ("each month of {}, as year-month (months of different years kept apart)"
                if f.unit == "month" else f"each {PERIOD_WORDS[f.unit][0]} of {{}}").format(
            self.label(f.col))
        return f"{self.agg(f.fn, f.measure)}{self.where(f.rows)}, for {each}"

    def period_best(self, f: PeriodBest) -> str:
        word, words, named = PERIOD_WORDS[f.unit]
        which = f"the {word}" if f.n is None else f"the {f.n} {words}"
        most = "largest" if f.direction == "max" else "smallest"
        return (f"{which} of {self.label(f.col)}{named} with the {most} "
                f"{self.agg(f.fn, f.measure).removeprefix('the ')}{self.where(f.rows)}")

    def per_group(self, f: GroupTable) -> str:
        return (f"{self.agg(f.fn, f.measure)} for each {self.label(f.key)}{self.where(f.rows)}")
