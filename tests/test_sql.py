"""tabq.sql: every form compiles to quoted, re-parsable SQL whose answer is the right one.

Expected answers are computed independently in plain Python over the ROWS list below (list
comprehensions, sorted(), sum(), statistics.median); the second SQL engine for the cross-engine
check is Python's built-in sqlite3.
"""

import datetime
import sqlite3
import statistics
from collections import defaultdict
from dataclasses import dataclass

import duckdb
import pytest
import sqlglot
from sqlglot import exp

from tabq import logic as L
from tabq.table import ROW, TABLE
from tabq.sql import compile_form, render

D = datetime.date
ATTACK = "x'; DROP TABLE t; --"
COLUMNS = (ROW, "rider", "route", "fare", "seats", "sailed_on", "select", "order")
TYPES = ("INTEGER", "VARCHAR", "VARCHAR", "DOUBLE", "INTEGER", "DATE", "VARCHAR", "INTEGER")
ROWS = [
    dict(zip(COLUMNS, values))
    for values in [
        (0, "Quilla Marsh", "Fenwick Loop", 12.5, 2, D(2025, 3, 4), "alpha", 3),
        (1, "Oren Bellweather", "Harrow Spur", None, 1, D(2025, 3, 19), "epsilon", 1),
        (2, "Tamsin Greaves", "Fenwick Loop", 30.0, 4, D(2025, 6, 30), "beta", None),
        (3, ATTACK, "Harrow Spur", 7.25, 1, None, "alpha", 2),
        (4, "Ned Ashdown", None, 30.0, 3, D(2024, 3, 11), "gamma", 5),
        (5, "Pell Corvid", "Osric Lane", 18.0, None, D(2025, 7, 2), "beta", 4),
        (6, None, "Osric Lane", 9.0, 2, D(2025, 12, 1), "delta", 6),
        (7, "Wren Halloway", "Fenwick Loop", 21.0, 5, D(2025, 3, 27), "alpha", 7),
    ]
]


# ── independent computation in plain Python ───────────────────────────────────────────────────
def where(pred, rows=ROWS):
    return [r for r in rows if pred(r)]


def values(col, rows):
    """A column's non-missing values in file order."""
    return [r[col] for r in rows if r[col] is not None]


def groups(key, rows=ROWS):
    """key value → its rows, for rows whose key is present."""
    out = defaultdict(list)
    for r in rows:
        if r[key] is not None:
            out[r[key]].append(r)
    return dict(out)


def total(col, rows):
    """SQL's SUM: None when the group has no values."""
    present = values(col, rows)
    return sum(present) if present else None


def ranked(scores: dict, direction: str) -> list:
    """Keys by score, best first; a missing score sorts last either way."""
    sign = -1 if direction == "max" else 1
    return sorted((k for k in scores if scores[k] is not None), key=lambda k: sign * scores[k]) + [
        k for k in scores if scores[k] is None]


def best(scores: dict, direction: str) -> list:
    """Keys whose score is the best present score (ties kept, key order)."""
    pick = max if direction == "max" else min
    top = pick(v for v in scores.values() if v is not None)
    return [k for k, v in scores.items() if v == top]


def fenwick(r):
    return r["route"] == "Fenwick Loop"


def harrow(r):
    return r["route"] == "Harrow Spur"


def not_(pred):
    """SQL's "not" on a missing cell: the row does not match."""
    return lambda r: not pred(r)


def gt(col, bound):
    return lambda r: r[col] is not None and r[col] > bound


def _by(period, rows=ROWS) -> dict:
    """Rows with a sailing date by period(date): a year-month text or a year."""
    out = defaultdict(list)
    for r in rows:
        if r["sailed_on"] is not None:
            out[period(r["sailed_on"])].append(r)
    return dict(out)


WEEK = [D(2024, 1, day).strftime("%A") for day in range(1, 8)]   # 1 January 2024: a Monday
WEEKDAY_COUNT = {k: len(rs) for k, rs in _by(lambda d: d.strftime("%A")).items()}

FENWICK = L.Eq("route", "Fenwick Loop")
HARROW = L.Eq("route", "Harrow Spur")

FARE_SUM = {k: total("fare", g) for k, g in groups("select").items()}   # epsilon: None
ROUTE_COUNT = {k: len(g) for k, g in groups("route").items()}


@dataclass(frozen=True)
class Case:
    name: str
    form: L.Answer
    expected: list
    ordered: bool = False      # the SQL promises this order


CASES = [
    # row sets, read through Values (file order)
    Case("eq", L.Values("rider", FENWICK), values("rider", where(fenwick)), True),
    Case("cmp_gt", L.Values("rider", L.Cmp("fare", "gt", 15)),
         values("rider", where(gt("fare", 15))), True),
    Case("cmp_date", L.Values("rider", L.Cmp("sailed_on", "lt", D(2025, 3, 20))),
         values("rider", where(lambda r: r["sailed_on"] and r["sailed_on"] < D(2025, 3, 20))),
         True),
    Case("between", L.Values("rider", L.Between("fare", 9, 18)),
         values("rider", where(lambda r: r["fare"] is not None and 9 <= r["fare"] <= 18)), True),
    Case("contains", L.Values("rider", L.Contains("rider", "ASH")),
         values("rider", where(lambda r: "ash" in (r["rider"] or "").lower())), True),
    Case("contains_date_text", L.Values("rider", L.Contains("sailed_on", "-03-")),
         values("rider", where(lambda r: r["sailed_on"] and r["sailed_on"].month == 3)), True),
    Case("missing", L.Values("rider", L.Missing("fare")),
         values("rider", where(lambda r: r["fare"] is None)), True),
    Case("period_year_month", L.Values("rider", L.Period("sailed_on", 2025, 3)),
         values("rider", where(lambda r: r["sailed_on"] and (r["sailed_on"].year,
                                                              r["sailed_on"].month) == (2025, 3))),
         True),
    Case("period_month", L.Values("rider", L.Period("sailed_on", None, 3)),
         values("rider", where(lambda r: r["sailed_on"] and r["sailed_on"].month == 3)), True),
    Case("period_year", L.Values("rider", L.Period("sailed_on", 2024, None)),
         values("rider", where(lambda r: r["sailed_on"] and r["sailed_on"].year == 2024)), True),
    Case("and", L.Values("rider", L.And(FENWICK, L.Cmp("seats", "ge", 4))),
         values("rider", where(lambda r: fenwick(r) and r["seats"] >= 4)), True),
    Case("or", L.Values("rider", L.Or(L.Eq("route", "Osric Lane"), L.Cmp("fare", "lt", 10))),
         values("rider", where(lambda r: r["route"] == "Osric Lane"
                               or (r["fare"] is not None and r["fare"] < 10))), True),
    Case("not_keeps_missing_cells", L.Values("rider", L.Not(L.Cmp("fare", "gt", 15))),
         values("rider", where(not_(gt("fare", 15)))), True),
    Case("not_or", L.Values("rider", L.Not(L.Or(FENWICK, HARROW))),
         values("rider", where(lambda r: not (fenwick(r) or harrow(r)))), True),
    Case("extreme_over_filter", L.Values("rider", L.Extreme(FENWICK, "fare", "max")),
         [r["rider"] for r in where(fenwick)
          if r["fare"] == max(values("fare", where(fenwick)))], True),
    Case("extreme_ties_kept", L.Values("rider", L.Extreme(L.All(), "fare", "max")),
         values("rider", where(lambda r: r["fare"] == max(values("fare", ROWS)))), True),
    Case("extreme_min_date", L.Values("rider", L.Extreme(L.All(), "sailed_on", "min")),
         values("rider", where(lambda r: r["sailed_on"] == min(values("sailed_on", ROWS)))), True),
    Case("position_first", L.Values("rider", L.Position(L.All(), "first")),
         [ROWS[0]["rider"]], True),
    Case("position_last_of_filter", L.Values("rider", L.Position(HARROW, "last")),
         [where(harrow)[-1]["rider"]], True),
    Case("neighbour_next", L.Values("rider", L.Neighbour(L.Eq("rider", "Tamsin Greaves"), "next")),
         [ROWS[values(ROW, where(lambda r: r["rider"] == "Tamsin Greaves"))[0] + 1]["rider"]],
         True),
    Case("neighbour_prev_of_several", L.Values("rider", L.Neighbour(FENWICK, "prev")),
         values("rider", [ROWS[r[ROW] - 1] for r in where(fenwick) if r[ROW] > 0]), True),
    Case("neighbour_past_the_end", L.Values("rider", L.Neighbour(L.Position(L.All(), "last"),
                                                                 "next")), [], True),
    # answers
    Case("values_reserved_names", L.Values("select", L.Cmp("order", "ge", 5)),
         values("select", where(gt("order", 4))), True),
    Case("values_attack_as_data", L.Values("route", L.Eq("rider", ATTACK)),
         values("route", where(lambda r: r["rider"] == ATTACK)), True),
    Case("distinct_first_seen_order", L.Distinct("route", L.All()), list(groups("route")), True),
    Case("distinct_reserved", L.Distinct("select", L.Not(L.Missing("fare"))),
         list(groups("select", where(lambda r: r["fare"] is not None))), True),
    Case("count", L.Aggregate("count", None, HARROW), [len(where(harrow))]),
    Case("count_all", L.Aggregate("count", None, L.All()), [len(ROWS)]),
    Case("count_distinct", L.Aggregate("count_distinct", "select", L.All()),
         [len(set(values("select", ROWS)))]),
    Case("sum", L.Aggregate("sum", "fare", L.All()), [sum(values("fare", ROWS))]),
    Case("avg", L.Aggregate("avg", "fare", FENWICK),
         [statistics.mean(values("fare", where(fenwick)))]),
    Case("min", L.Aggregate("min", "seats", L.Not(FENWICK)),
         [min(values("seats", where(not_(fenwick))))]),
    Case("max_date", L.Aggregate("max", "sailed_on", L.All()), [max(values("sailed_on", ROWS))]),
    Case("median", L.Aggregate("median", "fare", L.All()),
         [statistics.median(values("fare", ROWS))]),
    Case("difference_counts", L.Difference(L.Aggregate("count", None, HARROW),
                                           L.Aggregate("count", None, FENWICK)),
         [abs(len(where(harrow)) - len(where(fenwick)))]),
    Case("difference_spread", L.Difference(L.Aggregate("max", "fare", L.All()),
                                           L.Aggregate("min", "fare", L.All())),
         [max(values("fare", ROWS)) - min(values("fare", ROWS))]),
    Case("which_of_sum_max", L.WhichOf("route", "Fenwick Loop", "Osric Lane", "sum", "fare", "max"),
         [max(["Fenwick Loop", "Osric Lane"],
              key=lambda k: sum(values("fare", groups("route")[k])))]),
    Case("which_of_count_min", L.WhichOf("route", "Fenwick Loop", "Harrow Spur", "count", None,
                                         "min"),
         [min(["Fenwick Loop", "Harrow Spur"], key=ROUTE_COUNT.get)]),
    Case("which_of_missing_measure", L.WhichOf("select", "epsilon", "delta", "sum", "fare", "min"),
         [k for k in ranked(FARE_SUM, "min") if k in ("epsilon", "delta")][:1]),
    Case("group_best_count", L.GroupBest("route", "count", None, L.All(), "max"),
         best(ROUTE_COUNT, "max"), True),
    Case("group_best_ties_kept", L.GroupBest("route", "count", None, L.All(), "min"),
         best(ROUTE_COUNT, "min"), True),
    Case("group_best_sum_filtered", L.GroupBest("select", "sum", "fare", L.Cmp("order", "le", 5),
                                                "min"),
         best({k: total("fare", g) for k, g in groups("select", where(
             lambda r: r["order"] is not None and r["order"] <= 5)).items()}, "min")),
    Case("group_top", L.GroupTop("select", "sum", "fare", 2, L.All(), "max"),
         ranked(FARE_SUM, "max")[:2], True),
    Case("group_top_missing_last", L.GroupTop("select", "sum", "fare", 5, L.All(), "min"),
         ranked(FARE_SUM, "min"), True),
    Case("top_n_min", L.TopN("route", 2, L.All(), "fare", "min"),
         [r["route"] for r in sorted(where(lambda r: r["fare"] is not None),
                                     key=lambda r: r["fare"])[:2]], True),
    Case("top_n_filtered_max", L.TopN("rider", 2, FENWICK, "seats", "max"),
         [r["rider"] for r in sorted(where(fenwick), key=lambda r: -r["seats"])[:2]], True),
    Case("top_n_reserved", L.TopN("select", 3, L.All(), "order", "max"),
         [r["select"] for r in sorted(where(lambda r: r["order"] is not None),
                                      key=lambda r: -r["order"])[:3]], True),
    Case("yes_no_yes", L.YesNo(L.And(L.Eq("route", "Osric Lane"), L.Missing("rider"))),
         ["yes" if where(lambda r: r["route"] == "Osric Lane" and r["rider"] is None) else "no"]),
    Case("yes_no_no", L.YesNo(L.And(HARROW, L.Cmp("fare", "gt", 20))),
         ["yes" if where(lambda r: harrow(r) and (r["fare"] or 0) > 20) else "no"]),
    Case("per_group", L.GroupTable("route", "count", None, L.All()),
         [(k, len(g)) for k, g in groups("route").items()]),
    Case("per_group_sum", L.GroupTable("select", "sum", "fare", L.Not(L.Missing("seats"))),
         [(k, total("fare", g))
          for k, g in groups("select", where(lambda r: r["seats"] is not None)).items()]),
    # filters on groups, comparisons with the average, shares, per-period tables
    Case("in_groups_count", L.Distinct("route", L.InGroups("route", "count", None,
                                                           L.Cmp("fare", "gt", 10), "ge", 2)),
         [k for k, g in groups("route").items() if len(where(gt("fare", 10), g)) >= 2], True),
    Case("in_groups_counts_empty_groups",
         L.Distinct("route", L.InGroups("route", "count", None, L.Cmp("fare", "gt", 25), "lt", 1)),
         [k for k, g in groups("route").items() if not where(gt("fare", 25), g)], True),
    Case("in_groups_avg_counted",
         L.Aggregate("count_distinct", "select", L.InGroups("select", "avg", "fare", L.All(),
                                                             "gt", 15)),
         [sum(1 for g in groups("select").values()
              if values("fare", g) and statistics.mean(values("fare", g)) > 15)]),
    Case("cmp_avg", L.Values("rider", L.CmpAgg("fare", "gt", "avg")),
         values("rider", where(gt("fare", statistics.mean(values("fare", ROWS))))), True),
    Case("cmp_median_and", L.Aggregate("count", None, L.And(L.CmpAgg("seats", "le", "median"),
                                                            L.Not(FENWICK))),
         [len(where(lambda r: r["seats"] is not None and not fenwick(r)
                    and r["seats"] <= statistics.median(values("seats", ROWS))))]),
    Case("share_percent", L.Share("percent", FENWICK, L.All()),
         [100 * len(where(fenwick)) / len(ROWS)]),
    Case("share_within", L.Share("fraction", L.Cmp("fare", "gt", 10), L.Not(L.Missing("rider"))),
         [len(where(gt("fare", 10), where(lambda r: r["rider"] is not None)))
          / len(where(lambda r: r["rider"] is not None))]),
    Case("share_of_no_rows", L.Share("fraction", FENWICK, L.Eq("route", "Nowhere")), [None]),
    Case("per_month_keeps_years_apart", L.PeriodTable("sailed_on", "month", "count", None, L.All()),
         sorted((m, len(rs)) for m, rs in _by(lambda d: f"{d.year}-{d.month:02d}").items()),
         True),
    Case("per_year_sum", L.PeriodTable("sailed_on", "year", "sum", "fare", FENWICK),
         sorted((y, total("fare", rs)) for y, rs in _by(lambda d: d.year, where(fenwick)).items()),
         True),
    Case("team_word_set", L.Values("rider", L.Defined("the spurs", L.InSet(
        "route", ("Harrow Spur", "Osric Lane")))),
         values("rider", where(lambda r: r["route"] in ("Harrow Spur", "Osric Lane"))), True),
    Case("team_word_months_across_new_year", L.Aggregate("count", None, L.Months(
        "sailed_on", 11, 3)),
         [len(where(lambda r: r["sailed_on"] and r["sailed_on"].month in (11, 12, 1, 2, 3)))]),
    Case("team_word_hours_past_midnight", L.Aggregate("count", None, L.Hours(
        "sailed_on", 22, 2)),   # a DATE is at midnight, hour 0
         [len(where(lambda r: r["sailed_on"] is not None))]),
    Case("day_of_week_one_day", L.Values("rider", L.DayOfWeek("sailed_on", 1, 1)),
         values("rider", where(lambda r: r["sailed_on"] and r["sailed_on"].isoweekday() == 1)),
         True),
    Case("day_of_week_working_week", L.Aggregate("count", None, L.And(
        L.DayOfWeek("sailed_on", 1, 5), L.Not(FENWICK))),
         [len(where(lambda r: r["sailed_on"] and r["sailed_on"].isoweekday() <= 5
                    and not fenwick(r)))]),
    Case("period_best_month_count",
         L.PeriodBest("sailed_on", "month", "count", None, None, L.All(), "max"),
         best({m: len(rs) for m, rs in _by(lambda d: f"{d.year}-{d.month:02d}").items()}, "max")),
    Case("period_best_weekday_ties_in_week_order",   # Tuesday and Thursday: one sailing each
         L.PeriodBest("sailed_on", "weekday", "count", None, None, L.All(), "min"),
         sorted(best(WEEKDAY_COUNT, "min"), key=WEEK.index), True),
    Case("period_best_year_sum", L.PeriodBest("sailed_on", "year", "sum", "fare", None, L.All(),
                                              "min"),
         best({y: total("fare", rs) for y, rs in _by(lambda d: d.year).items()}, "min")),
    Case("period_top_months_by_sum",
         L.PeriodBest("sailed_on", "month", "sum", "fare", 2, L.All(), "max"),
         [m for m, _ in sorted(((m, rs) for m, rs in _by(
             lambda d: f"{d.year}-{d.month:02d}").items()),
             key=lambda kv: (-(total("fare", kv[1]) or 0), min(r["sailed_on"] for r in kv[1])))][:2],
         True),
    Case("per_weekday_in_week_order", L.PeriodTable("sailed_on", "weekday", "count", None,
                                                     L.All()),
         [(name, len(rs)) for name, rs in sorted(
             _by(lambda d: d.strftime("%A")).items(),
             key=lambda kv: WEEK.index(kv[0]))], True),
]
IDS = [case.name for case in CASES]


# ── engines ───────────────────────────────────────────────────────────────────────────────────
def make_duckdb() -> duckdb.DuckDBPyConnection:
    con = duckdb.connect()
    cols = ", ".join(f'"{c}" {t}' for c, t in zip(COLUMNS, TYPES))
    con.execute(f'CREATE TABLE "{TABLE}" ({cols})')
    con.executemany(f'INSERT INTO "{TABLE}" VALUES ({", ".join("?" * len(COLUMNS))})',
                    [tuple(r.values()) for r in ROWS])
    return con


def make_sqlite() -> sqlite3.Connection:
    con = sqlite3.connect(":memory:")
    cols = ", ".join(f'"{c}"' for c in COLUMNS)
    con.execute(f'CREATE TABLE "{TABLE}" ({cols})')
    con.executemany(f'INSERT INTO "{TABLE}" VALUES ({", ".join("?" * len(COLUMNS))})',
                    [tuple(v.isoformat() if isinstance(v, D) else v for v in r.values())
                     for r in ROWS])
    return con


@pytest.fixture(scope="module")
def duck():
    con = make_duckdb()
    yield con
    con.close()


def answer(rows: list[tuple], form: L.Answer) -> list:
    """Rows of a result as the answer: whole rows for a per-group table, else the first column."""
    return [tuple(r) for r in rows] if form.tabular else [r[0] for r in rows]


def comparable(items: list) -> list:
    def one(v):
        if isinstance(v, tuple):
            return tuple(one(x) for x in v)
        return round(float(v), 9) if isinstance(v, (int, float)) else v
    return [one(v) for v in items]


def as_bag(items: list) -> list:
    return sorted(comparable(items), key=repr)


# ── tests ─────────────────────────────────────────────────────────────────────────────────────
def test_cases_cover_every_form_class():
    assert {type(node) for case in CASES for node in L.walk(case.form)} == set(L.FORMS.values())


@pytest.mark.parametrize("case", CASES, ids=IDS)
def test_sql_reparses_as_duckdb(case):
    sql = render(case.form)
    tree = sqlglot.parse_one(sql, read="duckdb")
    assert isinstance(tree, exp.Select)
    assert tree.sql(dialect="duckdb") == sql


@pytest.mark.parametrize("case", CASES, ids=IDS)
def test_every_identifier_is_double_quoted(case):
    sql = render(case.form)
    for col in {*L.columns_of(case.form), TABLE}:
        assert f'"{col}"' in sql
    identifiers = list(sqlglot.parse_one(sql, read="duckdb").find_all(exp.Identifier))
    assert identifiers and all(ident.quoted for ident in identifiers)


@pytest.mark.parametrize("case", CASES, ids=IDS)
def test_answer_is_the_python_answer(duck, case):
    got = answer(duck.execute(render(case.form)).fetchall(), case.form)
    if case.ordered:
        assert comparable(got) == comparable(case.expected)
    else:
        assert as_bag(got) == as_bag(case.expected)


def test_render_is_compile_form_as_duckdb():
    form = L.Values("rider", FENWICK)
    assert render(form) == compile_form(form).sql(dialect="duckdb")


def test_values_are_literals_not_sql(duck):
    sql = render(L.Values("route", L.Eq("rider", ATTACK)))
    statements = sqlglot.parse(sql, read="duckdb")
    assert len(statements) == 1
    literal = statements[0].find(exp.Literal)
    assert literal.is_string and literal.this == ATTACK


def test_table_survives_a_hostile_value(duck):
    duck.execute(render(L.Aggregate("count", None, L.Eq("rider", ATTACK)))).fetchall()
    duck.execute(render(L.YesNo(L.Contains("route", ATTACK)))).fetchall()
    assert duck.execute(f'SELECT count(*) FROM "{TABLE}"').fetchone()[0] == len(ROWS)


def test_hostile_value_is_found_as_data(duck):
    sql = render(L.Aggregate("count", None, L.Contains("rider", "DROP TABLE")))
    assert duck.execute(sql).fetchone()[0] == sum("drop table" in (r["rider"] or "").lower()
                                                  for r in ROWS)


def test_date_value_is_cast_to_date():
    sql = render(L.Aggregate("count", None, L.Cmp("sailed_on", "gt", D(2025, 6, 30))))
    assert "CAST('2025-06-30' AS DATE)" in sql


def test_whole_float_value_renders_as_int():
    assert '"seats" = 3 ' in render(L.Values("rider", L.Eq("seats", 3.0))) + " "


# ── a second engine: the same sqlglot tree transpiled for Python's sqlite3 ────────────────────
CROSS_ENGINE = [case for case in CASES if not any(
    isinstance(node, L.Period) or getattr(node, "fn", None) == "median"
    or "sailed_on" in L.columns_of(node) for node in L.walk(case.form))]


def test_cross_engine_sample_is_broad():
    kinds = {type(node) for case in CROSS_ENGINE for node in L.walk(case.form)}
    # periods read dates, which SQLite keeps as text (no YEAR, another STRFTIME)
    assert kinds == set(L.FORMS.values()) - {L.Period, L.PeriodTable, L.DayOfWeek,
                                              L.PeriodBest, L.Months, L.Hours}


@pytest.fixture(scope="module")
def lite():
    con = make_sqlite()
    yield con
    con.close()


@pytest.mark.parametrize("case", CROSS_ENGINE, ids=[c.name for c in CROSS_ENGINE])
def test_sqlite_gives_the_duckdb_answer(duck, lite, case):
    in_duckdb = answer(duck.execute(render(case.form, "duckdb")).fetchall(), case.form)
    in_sqlite = answer(lite.execute(render(case.form, "sqlite")).fetchall(), case.form)
    assert as_bag(in_sqlite) == as_bag(in_duckdb)
