"""compile: a logical form → a sqlglot tree → SQL text.

Only sqlglot's builders make SQL here: identifiers through `exp.to_identifier(..., quoted=True)`,
values through literal builders. Nothing a person typed is ever parsed as SQL.
"""

from __future__ import annotations

import datetime
from collections.abc import Iterable
from functools import lru_cache

from sqlglot import exp

from . import logic as L
from .table import ROW, TABLE

AGGREGATES = {
    "sum": exp.Sum, "avg": exp.Avg, "min": exp.Min, "max": exp.Max, "median": exp.Median,
}
COMPARISONS = {"gt": exp.GT, "lt": exp.LT, "ge": exp.GTE, "le": exp.LTE}


def column(name: str) -> exp.Column:
    return exp.Column(this=exp.to_identifier(name, quoted=True))


def literal(value: L.Literal) -> exp.Expression:
    if value is None:
        return exp.Null()
    if isinstance(value, datetime.date):
        return exp.cast(exp.Literal.string(value.isoformat()), "DATE")
    if isinstance(value, bool):
        return exp.Boolean(this=value)
    if isinstance(value, (int, float)):
        if isinstance(value, float) and value.is_integer():
            value = int(value)
        return exp.Literal.number(value)
    return exp.Literal.string(str(value))


def _table() -> exp.Table:
    return exp.Table(this=exp.to_identifier(TABLE, quoted=True))


def _select(*projections: exp.Expression, where: exp.Expression | None = None) -> exp.Select:
    query = exp.Select(expressions=list(projections)).from_(_table(), copy=False)
    return query.where(where, copy=False) if where is not None else query


def select(*projections: exp.Expression, where: exp.Expression | None = None) -> exp.Select:
    """SELECT projections FROM the table [WHERE where]."""
    return _select(*projections, where=where)


def _paren(query: exp.Expression) -> exp.Subquery:
    return exp.Subquery(this=query)


# ── row sets → conditions ─────────────────────────────────────────────────────────────────────
def condition(rows: L.Rows) -> exp.Expression:
    """The WHERE condition that selects a row set from the table."""
    return _CONDITIONS[type(rows)](rows)


def where(rows: L.Rows) -> exp.Expression | None:
    """The WHERE condition of a row set, or None for all rows."""
    return None if isinstance(rows, L.All) else condition(rows)


_where = where


def _not(rows: L.Not) -> exp.Expression:
    # a row whose condition is unknown (a missing cell) counts as "not" matching
    inner = exp.Coalesce(this=exp.Paren(this=condition(rows.rows)), expressions=[exp.false()])
    return exp.Not(this=inner)


def _extreme(rows: L.Extreme) -> exp.Expression:
    agg = exp.Max if rows.direction == "max" else exp.Min
    best = _select(agg(this=column(rows.col)), where=_where(rows.rows))
    match = exp.EQ(this=column(rows.col), expression=_paren(best))
    return match if isinstance(rows.rows, L.All) else exp.and_(condition(rows.rows), match)


def _position(rows: L.Position) -> exp.Expression:
    agg = exp.Min if rows.which == "first" else exp.Max
    pick = _select(agg(this=column(ROW)), where=_where(rows.rows))
    return exp.EQ(this=column(ROW), expression=_paren(pick))


def _neighbour(rows: L.Neighbour) -> exp.Expression:
    step = exp.Add if rows.step == "next" else exp.Sub
    shifted = _select(step(this=column(ROW), expression=exp.Literal.number(1)),
                      where=_where(rows.rows))
    return exp.In(this=column(ROW), query=_paren(shifted))


def _period(rows: L.Period) -> exp.Expression:
    parts = []
    if rows.year is not None:
        parts.append(exp.EQ(this=exp.Year(this=column(rows.col)), expression=literal(rows.year)))
    if rows.month is not None:
        parts.append(exp.EQ(this=exp.Month(this=column(rows.col)), expression=literal(rows.month)))
    return exp.and_(*parts) if parts else exp.true()


def _day_of_week(rows: L.DayOfWeek) -> exp.Expression:
    day = exp.DayOfWeekIso(this=column(rows.col))
    if rows.first == rows.last:
        return exp.EQ(this=day, expression=literal(rows.first))
    return exp.Between(this=day, low=literal(rows.first), high=literal(rows.last))


def _in_set(rows: L.InSet) -> exp.Expression:
    return exp.In(this=column(rows.col), expressions=[literal(v) for v in rows.values])


def _in_run(part: exp.Expression, first: int, last: int) -> exp.Expression:
    """`part` from first to last, wrapping past its largest value when first > last."""
    if first <= last:
        return exp.Between(this=part, low=literal(first), high=literal(last))
    return exp.Paren(this=exp.or_(exp.GTE(this=part, expression=literal(first)),
                                  exp.LTE(this=part.copy(), expression=literal(last))))


def _hours(rows: L.Hours) -> exp.Expression:
    hour = exp.Extract(this=exp.var("HOUR"), expression=exp.cast(column(rows.col), "TIMESTAMP"))
    return _in_run(hour, rows.first, rows.last)


def _months(rows: L.Months) -> exp.Expression:
    return _in_run(exp.Month(this=column(rows.col)), rows.first, rows.last)


def _in_groups(rows: L.InGroups) -> exp.Expression:
    # The measure over all the key's rows, each aggregate taking only the rows of `rows`, so a
    # group none of whose rows match still counts 0 ("fewer than 3 late orders").
    measure = aggregate(rows.fn, rows.measure, _where(rows.rows))
    having = COMPARISONS[rows.op](this=measure, expression=literal(rows.value))
    groups = _grouped(rows.key, L.All()).having(having, copy=False)
    return exp.In(this=column(rows.key), query=_paren(groups))


def _cmp_agg(rows: L.CmpAgg) -> exp.Expression:
    whole = _select(AGGREGATES[rows.fn](this=column(rows.col)))
    return COMPARISONS[rows.op](this=column(rows.col), expression=_paren(whole))


_CONDITIONS = {
    L.All: lambda r: exp.true(),
    L.Eq: lambda r: exp.EQ(this=column(r.col), expression=literal(r.value)),
    L.Cmp: lambda r: COMPARISONS[r.op](this=column(r.col), expression=literal(r.value)),
    L.Between: lambda r: exp.Between(this=column(r.col), low=literal(r.low), high=literal(r.high)),
    L.Contains: lambda r: exp.GT(
        this=exp.StrPosition(this=exp.Lower(this=exp.cast(column(r.col), "TEXT")),
                             substr=exp.Literal.string(str(r.value).lower())),
        expression=exp.Literal.number(0)),
    L.Missing: lambda r: exp.Is(this=column(r.col), expression=exp.Null()),
    L.Period: _period,
    L.DayOfWeek: _day_of_week,
    L.InSet: _in_set,
    L.Hours: _hours,
    L.Months: _months,
    L.Defined: lambda r: exp.Paren(this=condition(r.rows)),
    L.And: lambda r: exp.and_(condition(r.left), condition(r.right)),
    L.Or: lambda r: exp.Paren(this=exp.or_(condition(r.left), condition(r.right))),
    L.Not: _not,
    L.Extreme: _extreme,
    L.Position: _position,
    L.Neighbour: _neighbour,
    L.InGroups: _in_groups,
    L.CmpAgg: _cmp_agg,
}


# ── answers → queries ─────────────────────────────────────────────────────────────────────────
def aggregate(fn: str, col: str | None, when: exp.Expression | None = None) -> exp.Expression:
    """An aggregate of a column (or of rows, for count); with `when`, of the rows where it holds
    only (see `only_when`), so aggregates of different rows can share one scan."""
    if fn == "count":
        one = exp.Literal.number(1)
        return exp.Count(this=exp.Star() if when is None else only_when(when, one))
    arg = column(col) if when is None else only_when(when, column(col))
    if fn == "count_distinct":
        return exp.Count(this=exp.Distinct(expressions=[arg]))
    return AGGREGATES[fn](this=arg)


def only_when(when: exp.Expression, value: exp.Expression) -> exp.Case:
    """CASE WHEN when THEN value END: NULL where the condition is false or unknown, and every
    aggregate skips NULLs, so agg(only_when(c, x)) over all rows is agg(x) WHERE c."""
    return exp.Case(ifs=[exp.If(this=when, true=value)])


def any_row(when: exp.Expression | None = None) -> exp.Case:
    """'yes' when there is a row (where `when` holds), else 'no'."""
    present = aggregate("count", None, when)
    return exp.Case(ifs=[exp.If(this=exp.GT(this=present, expression=exp.Literal.number(0)),
                                true=exp.Literal.string("yes"))],
                    default=exp.Literal.string("no"))


def _not_null(col: str, rows: L.Rows) -> exp.Expression:
    present = exp.Not(this=exp.Is(this=column(col), expression=exp.Null()))
    where = _where(rows)
    return present if where is None else exp.and_(where, present)


def _values(form: L.Values) -> exp.Select:
    return _select(column(form.col), where=_not_null(form.col, form.rows)).order_by(
        column(ROW), copy=False)


def _distinct(form: L.Distinct) -> exp.Select:
    query = _select(column(form.col), where=_not_null(form.col, form.rows))
    return query.group_by(column(form.col), copy=False).order_by(
        exp.Min(this=column(ROW)), copy=False)


def _aggregate(form: L.Aggregate) -> exp.Select:
    return _select(aggregate(form.fn, form.col), where=_where(form.rows))


def _difference(form: L.Difference) -> exp.Select:
    gap = exp.Sub(this=_paren(_aggregate(form.left)), expression=_paren(_aggregate(form.right)))
    return exp.Select(expressions=[exp.Abs(this=gap)])


def _grouped(key: str, rows: L.Rows) -> exp.Select:
    return _select(column(key), where=_not_null(key, rows)).group_by(column(key), copy=False)


def _which_of(form: L.WhichOf) -> exp.Select:
    pair = exp.In(this=column(form.col), expressions=[literal(form.first), literal(form.second)])
    query = _select(column(form.col), where=pair).group_by(column(form.col), copy=False)
    order = exp.Ordered(this=aggregate(form.fn, form.measure), desc=form.direction == "max")
    first_seen = exp.Ordered(this=exp.Min(this=column(ROW)))   # ties: the one met first
    return query.order_by(order, first_seen, copy=False).limit(1, copy=False)


def _group_best(form: L.GroupBest) -> exp.Select:
    # The measure is computed once, in the grouping: computed twice (for the best value too),
    # a float sum summed in parallel can differ in its last bits and match no group at all.
    # The helper names start with __, as no clean column name does.
    per_group = _grouped(form.key, form.rows).select(
        exp.alias_(exp.Min(this=column(ROW)), "__first", quoted=True),
        exp.alias_(aggregate(form.fn, form.measure), "__m", quoted=True), copy=False)
    best_fn = exp.Max if form.direction == "max" else exp.Min
    best = exp.Window(this=best_fn(this=exp.column("__m", quoted=True)))
    ranked = exp.Select(expressions=[
        column(form.key), exp.column("__first", quoted=True), exp.column("__m", quoted=True),
        exp.alias_(best, "__best", quoted=True)]).from_(
        _paren(per_group).as_("g", quoted=True), copy=False)
    is_best = exp.EQ(this=exp.column("__m", quoted=True),
                     expression=exp.column("__best", quoted=True))
    return exp.Select(expressions=[column(form.key)]).from_(
        _paren(ranked).as_("b", quoted=True), copy=False).where(is_best, copy=False).order_by(
        exp.column("__first", quoted=True), copy=False)


def _group_top(form: L.GroupTop) -> exp.Select:
    order = exp.Ordered(this=aggregate(form.fn, form.measure), desc=form.direction == "max",
                        nulls_first=False)
    first_seen = exp.Ordered(this=exp.Min(this=column(ROW)))
    return _grouped(form.key, form.rows).order_by(order, first_seen, copy=False).limit(
        form.n, copy=False)


def _top_n(form: L.TopN) -> exp.Select:
    query = _select(column(form.col), where=_not_null(form.by, form.rows))
    order = exp.Ordered(this=column(form.by), desc=form.direction == "max", nulls_first=False)
    return query.order_by(order, exp.Ordered(this=column(ROW)), copy=False).limit(
        form.n, copy=False)


def _yes_no(form: L.YesNo) -> exp.Select:
    return _select(any_row(), where=_where(form.rows))


def _per_group(form: L.GroupTable) -> exp.Select:
    measure = aggregate(form.fn, form.measure)
    query = _grouped(form.key, form.rows).select(measure, copy=False)
    return query.order_by(exp.Ordered(this=measure.copy(), desc=True), copy=False)


def _share(form: L.Share) -> exp.Select:
    # 100.0 or 1.0 first: the division is a float one in every engine (SQLite's is not)
    scale = exp.Literal.number("100.0" if form.unit == "percent" else "1.0")
    part = exp.Mul(this=scale, expression=aggregate("count", None, condition(form.rows)))
    rows = exp.Nullif(this=exp.Count(this=exp.Star()), expression=exp.Literal.number(0))
    return _select(exp.Div(this=part, expression=rows), where=_where(form.within))


def _period_key(col: str, unit: str) -> exp.Expression:
    """A date's period as answers name it: a year (a number), a year-month (text 2024-03) or
    a day of the week by name (a CASE, not a locale's strftime)."""
    if unit == "year":
        return exp.Year(this=column(col))
    if unit == "weekday":
        day = exp.DayOfWeekIso(this=column(col))
        return exp.Case(this=day, ifs=[
            exp.If(this=literal(i), true=exp.Literal.string(name))
            for i, name in enumerate(L.DAY_NAMES, start=1)])
    return exp.TimeToStr(this=column(col), format=exp.Literal.string("%Y-%m"))


def _period_order(col: str, unit: str) -> exp.Expression:
    """The time order of periods grouped by their key: Monday first for days of the week."""
    if unit == "weekday":
        return exp.Min(this=exp.DayOfWeekIso(this=column(col)))
    return exp.Min(this=column(col))


def _per_period(form: L.PeriodTable) -> exp.Select:
    key = _period_key(form.col, form.unit)
    query = _select(key, aggregate(form.fn, form.measure), where=_not_null(form.col, form.rows))
    order = _period_order(form.col, form.unit) if form.unit == "weekday" else key.copy()
    return query.group_by(key.copy(), copy=False).order_by(order, copy=False)


def _period_best(form: L.PeriodBest) -> exp.Select:
    # as _group_best: the measure computed once per period, the best picked by a window (ties
    # kept), or the n best by order; periods listed in time order
    key = _period_key(form.col, form.unit)
    per_period = _select(
        exp.alias_(key, "__k", quoted=True),
        exp.alias_(_period_order(form.col, form.unit), "__first", quoted=True),
        exp.alias_(aggregate(form.fn, form.measure), "__m", quoted=True),
        where=_not_null(form.col, form.rows)).group_by(key.copy(), copy=False)
    measure, first = exp.column("__m", quoted=True), exp.column("__first", quoted=True)
    if form.n is not None:
        best = exp.Ordered(this=measure, desc=form.direction == "max", nulls_first=False)
        return exp.Select(expressions=[exp.column("__k", quoted=True)]).from_(
            _paren(per_period).as_("g", quoted=True), copy=False).order_by(
            best, exp.Ordered(this=first.copy()), copy=False).limit(form.n, copy=False)
    best_fn = exp.Max if form.direction == "max" else exp.Min
    ranked = exp.Select(expressions=[
        exp.column("__k", quoted=True), first, measure,
        exp.alias_(exp.Window(this=best_fn(this=measure.copy())), "__best", quoted=True)]).from_(
        _paren(per_period).as_("g", quoted=True), copy=False)
    is_best = exp.EQ(this=measure.copy(), expression=exp.column("__best", quoted=True))
    return exp.Select(expressions=[exp.column("__k", quoted=True)]).from_(
        _paren(ranked).as_("b", quoted=True), copy=False).where(is_best, copy=False).order_by(
        first.copy(), copy=False)


_QUERIES = {
    L.Values: _values, L.Distinct: _distinct, L.Aggregate: _aggregate,
    L.Difference: _difference, L.WhichOf: _which_of, L.GroupBest: _group_best,
    L.GroupTop: _group_top, L.TopN: _top_n, L.YesNo: _yes_no, L.GroupTable: _per_group,
    L.Share: _share, L.PeriodTable: _per_period, L.PeriodBest: _period_best,
}


def compile_form(form: L.Answer) -> exp.Expression:
    """The sqlglot tree of an answer form."""
    return _QUERIES[type(form)](form)


@lru_cache(maxsize=20000)
def render(form: L.Answer, dialect: str = "duckdb") -> str:
    """SQL text of a form, rendered once per form and dialect."""
    return compile_form(form).sql(dialect=dialect, copy=False)   # a fresh tree: no copy needed


def on_rows(form: L.Answer, rows: Iterable[int], dialect: str = "duckdb") -> str:
    """SQL of a form run on some rows only: each reference to the table becomes a subquery of
    the rows whose ROW is listed (how the app finds rows where two readings differ)."""
    listed = [exp.Literal.number(int(r)) for r in rows]
    subset = _select(exp.Star(), where=exp.In(this=column(ROW), expressions=listed))

    def restrict(node: exp.Expression) -> exp.Expression:
        if isinstance(node, exp.Table) and node.name == TABLE:
            return exp.Subquery(this=subset.copy(), alias=exp.TableAlias(
                this=exp.to_identifier(TABLE, quoted=True)))
        return node

    return compile_form(form).transform(restrict, copy=False).sql(dialect=dialect, copy=False)


def has_value(col: str, value: L.Literal) -> str:
    """SQL that returns a row when some cell of `col` equals `value` (for value linking)."""
    match = exp.EQ(this=column(col), expression=literal(value))
    return _select(exp.Literal.number(1), where=match).limit(1, copy=False).sql(dialect="duckdb")
