"""Periods of a date column (issue 16): which month, year or day of the week had the most or
the least (`period_best`, `period_top`), and conditions on the day of the week (`day_of_week`).

The table is an invented ferry booking office's bookings over two years, built here. Every
expected answer is computed by pandas from the same rows (the `pandas:` comment beside each
check), never by tabq and never typed by hand. The model is the untaught prior.
"""

from __future__ import annotations

import datetime
import random

import pandas as pd
import pytest

import tabq
from tabq import logic as L
from tabq.answers import matches


def booking_rows() -> list[dict]:
    """300 bookings from March 2023 to February 2025: busier in summer and at weekends; three
    clerks; no booking on a Tuesday (the office is shut)."""
    rng = random.Random(1616)
    start = datetime.date(2023, 3, 1)
    days = [start + datetime.timedelta(days=k) for k in range(731)]
    weights = [(2.5 if d.isoweekday() >= 6 else 1.0) * (2.0 if d.month in (6, 7, 8) else 1.0)
               * (0.0 if d.isoweekday() == 2 else 1.0) for d in days]
    rows = []
    for i, day in enumerate(sorted(rng.choices(days, weights=weights, k=300))):
        rows.append({"ref": f"B-{i + 1:04d}", "booked_for": day.isoformat(),
                     "clerk": rng.choice(["Ilse Moberg", "Kwame Asante", "Dora Pelham"]),
                     "crossing": rng.choice(["Harbour run", "Island hop", "Estuary loop"]),
                     "passengers": rng.randint(1, 9),
                     "fare": round(rng.uniform(8, 60), 2),
                     "refunded": rng.choice(["yes", "no", "no", "no", "no"])})
    return rows


@pytest.fixture(scope="module")
def frame() -> pd.DataFrame:
    df = pd.DataFrame(booking_rows())
    df["booked_for"] = pd.to_datetime(df["booked_for"])
    return df


@pytest.fixture(scope="module")
def bookings(tmp_path_factory):
    path = tmp_path_factory.mktemp("bookings") / "bookings.csv"
    pd.DataFrame(booking_rows()).to_csv(path, index=False)
    return tabq.open(path, model=tabq.Model.prior())


def check(table, question: str, expected: list):
    result = table.ask(question)
    assert matches(result.answer, expected), (
        f"{question!r}: got {result.answer[:8]} from {result.best and result.best.form}, "
        f"want {expected[:8]}")
    return result


def months(df: pd.DataFrame) -> pd.Series:
    return df.booked_for.dt.strftime("%Y-%m")


def only_best(s: pd.Series, largest: bool = True) -> list:
    """The label(s) of a Series' best value, ties kept (as the answer keeps them)."""
    return list(s[s == (s.max() if largest else s.min())].index)


# ── which period had the most or the least ────────────────────────────────────────────────────
def test_month_with_the_most_bookings(bookings, frame):
    expected = only_best(months(frame).value_counts())          # pandas: value_counts max
    result = check(bookings, "Which month had the most bookings?", expected)
    assert isinstance(result.best.form, L.PeriodBest) and "month" in result.paraphrase


def test_month_with_the_fewest_refunded_bookings(bookings, frame):
    refunded = frame[frame.refunded == "yes"]
    counts = months(refunded).value_counts()
    expected = only_best(counts, largest=False)                 # pandas: value_counts min
    check(bookings, "In which month were the fewest bookings refunded?", expected)


def test_year_with_the_highest_total_fare(bookings, frame):
    sums = frame.fare.groupby(frame.booked_for.dt.year).sum()
    expected = [int(y) for y in only_best(sums)]               # pandas: groupby year sum
    check(bookings, "Which year had the highest total fare?", expected)


def test_month_with_the_highest_average_passengers(bookings, frame):
    means = frame.passengers.groupby(months(frame)).mean()
    expected = only_best(means)                                 # pandas: groupby mean max
    check(bookings, "the month with the highest average passengers", expected)


def test_busiest_day_of_the_week(bookings, frame):
    counts = frame.booked_for.dt.day_name().value_counts()
    expected = only_best(counts)                                # pandas: day_name counts
    check(bookings, "Which day of the week is the busiest?", expected)
    check(bookings, "which weekday had the most bookings", expected)


def test_month_of_one_year(bookings, frame):
    in_2024 = frame[frame.booked_for.dt.year == 2024]
    expected = only_best(months(in_2024).value_counts())        # pandas: one year's months
    check(bookings, "Which month of 2024 had the most bookings?", expected)


def test_the_n_busiest_months(bookings, frame):
    counts = months(frame).value_counts().sort_values(ascending=False)
    assert counts.iloc[1] != counts.iloc[2]                     # no tie at the cut
    expected = list(counts.index[:2])                           # pandas: top 2 counts
    check(bookings, "What were the 2 busiest months?", expected)


# ── conditions on the day of the week ─────────────────────────────────────────────────────────
def test_count_on_one_day(bookings, frame):
    expected = [int((frame.booked_for.dt.day_of_week == 5).sum())]   # pandas: Saturday is 5
    check(bookings, "How many bookings were for Saturdays?", expected)


def test_none_on_a_closed_day(bookings, frame):
    expected = ["yes" if (frame.booked_for.dt.day_of_week == 1).any() else "no"]   # pandas
    check(bookings, "Were any bookings made for a Tuesday?", expected)


def test_weekend_and_working_week(bookings, frame):
    weekend = frame.booked_for.dt.day_of_week >= 5                # pandas: Saturday, Sunday
    check(bookings, "How many bookings were at the weekend?", [int(weekend.sum())])
    check(bookings, "How many weekday bookings were there?", [int((~weekend).sum())])


def test_a_day_composes_with_another_condition(bookings, frame):
    mask = (frame.booked_for.dt.day_of_week == 4) & (frame.refunded == "yes")   # pandas
    check(bookings, "How many refunded bookings were there on Fridays?", [int(mask.sum())])
    sunday = frame.booked_for.dt.day_of_week == 6
    expected = [frame.fare[sunday].sum()]                      # pandas: sum over Sundays
    check(bookings, "What was the total fare of Sunday bookings?", expected)


# ── nearby readings that must stay ───────────────────────────────────────────────────────────
def test_a_per_month_table_stays_a_table(bookings, frame):
    counts = months(frame).value_counts().sort_index()
    expected = [(k, int(v)) for k, v in counts.items()]         # pandas: value_counts by month
    result = check(bookings, "How many bookings were there each month?", expected)
    assert result.best.is_table


def test_the_busiest_clerk_is_a_clerk(bookings, frame):
    expected = only_best(frame.clerk.value_counts())            # pandas: value_counts max
    check(bookings, "Which clerk took the most bookings?", expected)
